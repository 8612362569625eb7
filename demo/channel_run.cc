// Synthetic probe output of an invented wall-resolved LES of a water channel, for the demo.
// It writes what a solver's probe files look like: a start-up transient, autocorrelated turbulent
// fluctuations, a restart with overlapping times, and a few garbage lines. Numbers are invented;
// the orders of magnitude are common practice for a channel at a friction Reynolds number of a few
// hundred. Single-threaded; standard library only.
//
// The invented case: half-height delta = 25 mm, water (nu = 1.0e-6 m^2/s, rho = 998 kg/m^3),
// Re_tau = 420, so u_tau = Re_tau nu / delta = 0.0168 m/s and the wall shear stress fixed by the
// imposed pressure gradient is tau_w = rho u_tau^2 = 0.2817 Pa (dP/dx = -tau_w / delta).
// Probe columns: both wall shear stresses and the velocity at one point at y+ = 30.
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <random>
#include <string>

namespace {

constexpr double kNu = 1.0e-6;
constexpr double kRho = 998.0;
constexpr double kDelta = 0.025;
constexpr double kReTau = 420.0;
constexpr double kUTau = kReTau * kNu / kDelta;
constexpr double kTauWall = kRho * kUTau * kUTau;

// At y+ = 30 (log layer): U+ from the log law 1/0.41 ln(30) + 5.2 = 13.5; rms in wall units
// u 2.0, v 1.0, w 1.3, and a u-v correlation coefficient of -0.45 (common-practice magnitudes).
constexpr double kUMean = 13.5 * kUTau;
constexpr double kURms = 2.0 * kUTau;
constexpr double kVRms = 1.0 * kUTau;
constexpr double kWRms = 1.3 * kUTau;
constexpr double kUvCorrelation = -0.45;
// Wall shear stress fluctuations of 40 % of the mean, positively skewed (common practice).
constexpr double kTauIntensity = 0.4;

// Integral time scales (s) of each signal, and the start-up transient's time scale.
constexpr double kTauWallTime = 0.05;
constexpr double kUTime = 0.08;
constexpr double kVTime = 0.02;
constexpr double kWTime = 0.03;
// The run starts from a laminar-like field: the wall shear stress starts at a fifth of its
// turbulent value, the probe velocity 40 % high, and the fluctuations a third of their size.
constexpr double kStartupTime = 2.0;

struct Options {
  std::string out = "demo/out";
  double duration = 120.0;  // s of simulated time
  double dt = 0.002;        // s between probe samples
  double restart_at = 70.0;  // the first run ends (killed mid-line) here
  double restart_from = 66.0;  // the restarted run resumes from this checkpoint time
  unsigned seed = 2026;
};

// Unit-variance AR(1) with the autocorrelation exp(-dt / T) of an integral time scale T.
class Ar1Signal {
 public:
  Ar1Signal(double dt, double time_scale, std::mt19937_64& rng)
      : phi_(std::exp(-dt / time_scale)), rng_(rng) {
    state_ = normal_(rng_);
  }
  double Next() {
    state_ = phi_ * state_ + std::sqrt(1.0 - phi_ * phi_) * normal_(rng_);
    return state_;
  }

 private:
  double phi_;
  std::mt19937_64& rng_;
  std::normal_distribution<double> normal_;
  double state_;
};

class ChannelProbes {
 public:
  ChannelProbes(const Options& o, std::mt19937_64& rng)
      : lower_(o.dt, kTauWallTime, rng),
        upper_(o.dt, kTauWallTime, rng),
        u_(o.dt, kUTime, rng),
        v_(o.dt, kVTime, rng),
        w_(o.dt, kWTime, rng) {}

  // One row at time t: the transient scales the means and the fluctuation amplitudes.
  void Write(std::FILE* f, double t) {
    const double startup = std::exp(-t / kStartupTime);
    const double growth = 1.0 - 0.7 * startup;  // turbulence still developing early on
    const double tau_mean = kTauWall * (1.0 - 0.8 * startup);
    const double nu = u_.Next();
    std::fprintf(f, "%.4f %.6e %.6e %.6e %.6e %.6e\n", t,
                 tau_mean * (1.0 + growth * kTauIntensity * Skewed(lower_.Next())),
                 tau_mean * (1.0 + growth * kTauIntensity * Skewed(upper_.Next())),
                 kUMean * (1.0 + 0.4 * startup) + growth * kURms * nu,
                 growth * kVRms *
                     (kUvCorrelation * nu + std::sqrt(1 - kUvCorrelation * kUvCorrelation) *
                                                v_.Next()),
                 growth * kWRms * w_.Next());
  }

 private:
  // n + c (n^2 - 1), rescaled to unit variance: skewness about 6c for small c.
  static double Skewed(double n) {
    constexpr double c = 0.15;
    return (n + c * (n * n - 1.0)) / std::sqrt(1.0 + 2.0 * c * c);
  }

  Ar1Signal lower_, upper_, u_, v_, w_;
};

std::FILE* OpenProbeFile(const std::filesystem::path& path) {
  std::filesystem::create_directories(path.parent_path());
  std::FILE* f = std::fopen(path.c_str(), "w");
  if (f == nullptr) {
    std::fprintf(stderr, "demo_channel: cannot write %s\n", path.c_str());
    std::exit(1);
  }
  std::fprintf(f,
               "# plateau demo: invented water channel LES, delta = 25 mm, Re_tau = 420\n"
               "# probes: wall shear stress [Pa] on both walls, velocity [m/s] at y+ = 30\n"
               "# time tau_lower tau_upper u v w\n");
  return f;
}

Options Parse(int argc, char** argv) {
  Options o;
  for (int i = 1; i + 1 < argc; i += 2) {
    const std::string key = argv[i];
    const char* value = argv[i + 1];
    if (key == "--out") o.out = value;
    else if (key == "--duration") o.duration = std::atof(value);
    else if (key == "--dt") o.dt = std::atof(value);
    else if (key == "--seed") o.seed = static_cast<unsigned>(std::atoi(value));
    else std::fprintf(stderr, "demo_channel: ignoring unknown option %s\n", key.c_str());
  }
  o.restart_at = std::min(o.restart_at, 0.6 * o.duration);
  o.restart_from = o.restart_at - 4.0;
  return o;
}

}  // namespace

int main(int argc, char** argv) {
  const Options o = Parse(argc, argv);
  std::mt19937_64 rng(o.seed);
  ChannelProbes probes(o, rng);
  const std::filesystem::path out(o.out);

  // First run: killed at restart_at while writing a line; one log line landed in the probe file.
  std::FILE* first = OpenProbeFile(out / "run1" / "wall.dat");
  const long first_steps = std::lround(o.restart_at / o.dt);
  for (long i = 0; i < first_steps; ++i) {
    probes.Write(first, i * o.dt);
    if (i == first_steps / 3) std::fprintf(first, "*** time step reduced, CFL 1.3 ***\n");
  }
  std::fprintf(first, "%.4f 2.81", first_steps * o.dt);  // half a row, no newline
  std::fclose(first);

  // Restarted run: from the checkpoint at restart_from, into a new folder, rewriting the overlap.
  std::FILE* second = OpenProbeFile(out / "run2" / "wall.dat");
  const long restart_step = std::lround(o.restart_from / o.dt);
  const long last_step = std::lround(o.duration / o.dt);
  for (long i = restart_step; i < last_step; ++i) probes.Write(second, i * o.dt);
  std::fclose(second);

  std::printf("demo_channel: wrote %s/run1/wall.dat (0 to %.0f s) and %s/run2/wall.dat "
              "(restart from %.0f s to %.0f s); tau_w from the pressure gradient = %.4f Pa\n",
              out.c_str(), o.restart_at, out.c_str(), o.restart_from, o.duration, kTauWall);
  return 0;
}
