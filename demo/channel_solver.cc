// The demo's synthetic solver: writes the probe files of an invented LES of a water channel
// (demo/channel_case.h) in real time, faster than real time by --speed-up, the way a solver's
// probe output grows: a start-up transient, a restart into a new folder with a small overlap in
// time, and a few garbage lines. No CFD is done; the signals are modelled (channel_probes.h).
//
//   demo_channel_solver --out DIR [--speed-up X] [--duration S] [--restart-at S] [--overlap S]
//                       [--restart-pause WALL_S] [--dt S] [--seed N]
//
// Writes a solver's output tree, one folder per function and one per job's start time:
// DIR/output/{wallShear/0/wall.dat, probes/0/U, forces/0/forces.dat}, then after the "crash" the
// same under the restart time (DIR/output/wallShear/38/wall.dat, ...), and
// DIR/reichardt_u_plus.dat (the reference profile: y+ and U+ of Reichardt's law). Stops cleanly
// when DIR/STOP appears (as many solvers do), at --duration simulated seconds, or on SIGTERM.
#include <atomic>
#include <chrono>
#include <cmath>
#include <csignal>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <string>
#include <thread>

#include "demo/channel_case.h"
#include "demo/channel_probes.h"
#include "demo/channel_profile_model.h"

namespace {

using namespace plateau_demo;
using Clock = std::chrono::steady_clock;

struct Options {
  std::filesystem::path out = "demo/out";
  double speed_up = 2.0;       // simulated seconds per wall-clock second
  double duration = 600.0;     // simulated seconds at most
  double restart_at = 40.0;    // the first job dies here (mid-line)
  double overlap = 2.0;        // the restart resumes from a checkpoint this much earlier
  double restart_pause = 4.0;  // wall-clock seconds the "resubmitted job" waits in the queue
  double dt = 0.002;           // simulated seconds per time step (one row per file)
  unsigned seed = 1;
};

std::atomic<bool> g_terminate{false};

void OnTerminate(int) { g_terminate = true; }

[[noreturn]] void Usage(const std::string& problem) {
  std::fprintf(stderr, "demo_channel_solver: %s\n", problem.c_str());
  std::exit(2);
}

double PositiveNumber(const std::string& key, const char* text) {
  char* end = nullptr;
  const double v = std::strtod(text, &end);
  if (end == text || *end != '\0' || !(v >= 0.0)) Usage(key + " needs a number >= 0");
  return v;
}

Options Parse(int argc, char** argv) {
  Options o;
  for (int i = 1; i < argc; i += 2) {
    const std::string key = argv[i];
    if (i + 1 >= argc) Usage(key + " needs a value");
    const char* value = argv[i + 1];
    if (key == "--out")
      o.out = value;
    else if (key == "--speed-up")
      o.speed_up = PositiveNumber(key, value);
    else if (key == "--duration")
      o.duration = PositiveNumber(key, value);
    else if (key == "--restart-at")
      o.restart_at = PositiveNumber(key, value);
    else if (key == "--overlap")
      o.overlap = PositiveNumber(key, value);
    else if (key == "--restart-pause")
      o.restart_pause = PositiveNumber(key, value);
    else if (key == "--dt")
      o.dt = PositiveNumber(key, value);
    else if (key == "--seed")
      o.seed = static_cast<unsigned>(PositiveNumber(key, value));
    else
      Usage("unknown option " + key);
  }
  if (!(o.speed_up > 0.0) || !(o.dt > 0.0)) Usage("--speed-up and --dt must be > 0");
  return o;
}

std::FILE* OpenProbeFile(const std::filesystem::path& path, const std::string& header) {
  std::filesystem::create_directories(path.parent_path());
  std::FILE* f = std::fopen(path.c_str(), "w");
  if (f == nullptr) Usage("cannot write " + path.string());
  std::fprintf(f, "# plateau demo: invented water-channel LES, delta = 25 mm, Re_tau = 420\n%s",
               header.c_str());
  return f;
}

// Reichardt's law from the wall to the centre: the reference the demo's U+ is checked against.
void WriteReference(const std::filesystem::path& path) {
  std::filesystem::create_directories(path.parent_path());
  std::FILE* f = std::fopen(path.c_str(), "w");
  if (f == nullptr) Usage("cannot write " + path.string());
  std::fprintf(f,
               "# Reichardt's law of the wall (Reichardt 1951; kappa 0.41, C 7.8)\n"
               "# y+ U+\n");
  for (int i = 0; 0.5 * std::pow(1.05, i) <= kReTau; ++i) {
    const double y = 0.5 * std::pow(1.05, i);
    std::fprintf(f, "%.4f %.5f\n", y, ChannelProfileModel::ReichardtPlus(y));
  }
  std::fclose(f);
}

// One job of the solver: writes rows from `start` on into `folder`, paced to the wall clock,
// until `end`, STOP or SIGTERM. Returns the time reached. `die` leaves half a row in each file.
class SolverJob {
 public:
  SolverJob(const Options& o, ChannelProbes& probes, const std::filesystem::path& output,
            const std::string& start_time)
      : o_(o), probes_(probes) {
    // Each function of the solver writes into OUTPUT/<function>/<start time>/<file>.
    wall_ = OpenProbeFile(output / "wallShear" / start_time / "wall.dat",
                          ChannelProbes::WallHeader());
    line_ = OpenProbeFile(output / "probes" / start_time / "U", ChannelProbes::LineHeader());
    forces_ = OpenProbeFile(output / "forces" / start_time / "forces.dat",
                            ChannelProbes::ForcesHeader());
  }
  ~SolverJob() {
    for (std::FILE* f : {wall_, line_, forces_}) std::fclose(f);
  }
  SolverJob(const SolverJob&) = delete;
  SolverJob& operator=(const SolverJob&) = delete;

  // Returns the step reached; stops early (returns < end_step) on STOP or SIGTERM.
  long Run(long start_step, long end_step) {
    const auto started = Clock::now();
    long step = start_step;
    while (step < end_step && !StopRequested()) {
      const double elapsed = std::chrono::duration<double>(Clock::now() - started).count();
      const long due =
          std::min(end_step, start_step + static_cast<long>(elapsed * o_.speed_up / o_.dt));
      for (; step < due; ++step) WriteStep(step);
      for (std::FILE* f : {wall_, line_, forces_}) std::fflush(f);
      std::this_thread::sleep_for(std::chrono::milliseconds(50));
    }
    return step;
  }

  // The job is killed while writing: each file ends in half a row.
  void Die(long step) {
    std::fprintf(wall_, "%.4f 2.8", step * o_.dt);
    std::fprintf(line_, "%.4f (1.2e-02 3.", step * o_.dt);
    std::fprintf(forces_, "%.4f 1.1", step * o_.dt);
  }

  bool StopRequested() const { return g_terminate || std::filesystem::exists(o_.out / "STOP"); }

 private:
  void WriteStep(long step) {
    const double t = step * o_.dt;
    std::fputs(probes_.WallRow(t).c_str(), wall_);
    std::string line = probes_.LineRow(t);
    if (step == std::lround(25.0 / o_.dt)) line = TimeFieldWithNan(t);  // one diverged sample
    std::fputs(line.c_str(), line_);
    std::fputs(probes_.ForcesRow(t).c_str(), forces_);
    if (step == std::lround(12.0 / o_.dt)) {
      std::fputs("*** time step reduced: CFL 1.31 > 1.2 ***\n", wall_);  // solver chatter
    }
  }

  static std::string TimeFieldWithNan(double t) {
    std::string row = std::to_string(t);
    for (int i = 0; i < kLinePoints; ++i) row += " (nan nan nan)";
    return row + "\n";
  }

  const Options& o_;
  ChannelProbes& probes_;
  std::FILE* wall_;
  std::FILE* line_;
  std::FILE* forces_;
};

// The simulated time the resubmitted job restarts from (its checkpoint): names its folders.
double RestartTime(long crash_step, const Options& o) {
  return std::max(0L, crash_step - std::lround(o.overlap / o.dt)) * o.dt;
}

}  // namespace

int main(int argc, char** argv) {
  const Options o = Parse(argc, argv);
  std::signal(SIGTERM, OnTerminate);
  std::signal(SIGINT, OnTerminate);
  std::filesystem::create_directories(o.out);
  WriteReference(o.out / "reichardt_u_plus.dat");
  ChannelProbes probes(o.dt, o.seed);
  const long last_step = std::lround(o.duration / o.dt);
  const long crash_step = std::min(last_step, std::lround(o.restart_at / o.dt));
  std::printf(
      "demo_channel_solver: channel LES, delta %.3f m, Re_tau %.0f, dP/dx %.3f Pa/m, "
      "tau_w %.4f Pa; %g x real time\n",
      kHalfHeight, kReTau, kPressureGradient, kWallShear, o.speed_up);
  std::fflush(stdout);

  long step = 0;
  {
    SolverJob first(o, probes, o.out / "output", "0");
    step = first.Run(0, crash_step);
    if (first.StopRequested() || step >= last_step) {
      std::printf("demo_channel_solver: stopped at t = %.3f s\n", step * o.dt);
      return 0;
    }
    first.Die(step);
  }
  std::printf(
      "demo_channel_solver: job 1 died at t = %.3f s; resubmitted, restarting from the "
      "checkpoint at t = %.3f s into output/*/%g/\n",
      step * o.dt, step * o.dt - o.overlap, RestartTime(step, o));
  std::fflush(stdout);
  std::this_thread::sleep_for(std::chrono::duration<double>(o.restart_pause));

  const long restart_step = std::max(0L, step - std::lround(o.overlap / o.dt));
  char start_time[32];
  std::snprintf(start_time, sizeof start_time, "%g", RestartTime(step, o));
  SolverJob second(o, probes, o.out / "output", start_time);
  step = second.Run(restart_step, last_step);
  std::printf("demo_channel_solver: %s at t = %.3f s\n",
              second.StopRequested() ? "stopped" : "reached the planned end", step * o.dt);
  return 0;
}
