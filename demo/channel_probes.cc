#include "demo/channel_probes.h"

#include <cmath>
#include <cstdio>

#include "demo/channel_case.h"
#include "demo/channel_profile_model.h"

namespace plateau_demo {
namespace {

constexpr double kPi = 3.14159265358979323846;
constexpr double kWallShearTime = 0.02;      // s, integral time of the wall shear stress
constexpr double kWallShearIntensity = 0.4;  // rms / mean (common practice: about 0.4)
constexpr double kDragNoise = 0.12, kDragTime = 0.04;
constexpr double kLiftNoise = 0.1, kLiftNoiseTime = 0.01;
constexpr double kLiftModulation = 0.15, kLiftModulationTime = 0.2;
constexpr double kPhaseDiffusion = 0.7;  // rad / sqrt(s): shedding loses coherence over ~4 s

// n + c (n^2 - 1), rescaled to unit variance: positively skewed like wall shear stress.
double Skewed(double n) {
  constexpr double c = 0.15;
  return (n + c * (n * n - 1.0)) / std::sqrt(1.0 + 2.0 * c * c);
}

// 1 at the start of the run, 0 once the flow is developed.
double Startup(double t) { return std::exp(-t / kStartupTime); }

void Append(std::string& row, double value) {
  char text[32];
  std::snprintf(text, sizeof text, " %.6e", value);
  row += text;
}

std::string TimeField(double t) {
  char text[32];
  std::snprintf(text, sizeof text, "%.4f", t);
  return text;
}

}  // namespace

ChannelProbes::ChannelProbes(double dt, unsigned seed)
    : dt_(dt),
      rng_(seed),
      tau_lower_(dt, kWallShearTime, rng_),
      tau_upper_(dt, kWallShearTime, rng_),
      drag_noise_(dt, kDragTime, rng_),
      lift_noise_(dt, kLiftNoiseTime, rng_),
      lift_amplitude_(dt, kLiftModulationTime, rng_) {
  for (double y : kLinePositions) {
    const double y_plus = y * kFrictionVelocity / kViscosity;
    const double time = ChannelProfileModel::IntegralTime(y_plus);
    const double u_rms = ChannelProfileModel::UrmsPlus(y_plus);
    const double v_rms = ChannelProfileModel::VrmsPlus(y_plus);
    line_.push_back({y_plus, kFrictionVelocity * ChannelProfileModel::MeanVelocityPlus(y_plus),
                     kFrictionVelocity * u_rms, kFrictionVelocity * v_rms,
                     kFrictionVelocity * ChannelProfileModel::WrmsPlus(y_plus),
                     ChannelProfileModel::ShearStressPlus(y_plus) / (u_rms * v_rms),
                     Ar1Signal(dt, time, rng_), Ar1Signal(dt, time, rng_),
                     Ar1Signal(dt, time, rng_)});
  }
}

std::string ChannelProbes::WallHeader() {
  return "# wall shear stress [Pa] on both walls\n# time tau_lower tau_upper\n";
}

std::string ChannelProbes::LineHeader() {
  // The layout solvers write for a set of probes: one location line per probe (x, y, z in m; the
  // lower wall at y = 0, so y is the wall distance), the probe numbers, then the time column's name.
  std::string header;
  char line[96];
  for (int i = 0; i < kLinePoints; ++i) {
    std::snprintf(line, sizeof line, "# Probe %d (0.3 %g 0.0125)\n", i, kLinePositions[i]);
    header += line;
  }
  header += "#           Probe";
  for (int i = 0; i < kLinePoints; ++i) header += "  " + std::to_string(i);
  return header + "\n#            Time\n";
}

std::string ChannelProbes::ForcesHeader() {
  return "# cylinder force coefficients\n# time cd cl\n";
}

std::string ChannelProbes::WallRow(double t) {
  const double s = Startup(t);
  const double mean = kWallShear * (1.0 - 0.6 * s);
  const double intensity = kWallShearIntensity * (1.0 - 0.7 * s);
  std::string row = TimeField(t);
  Append(row, mean * (1.0 + intensity * Skewed(tau_lower_.Next())));
  Append(row, mean * (1.0 + intensity * Skewed(tau_upper_.Next())));
  return row + "\n";
}

std::string ChannelProbes::LineRow(double t) {
  const double s = Startup(t);
  const double growth = 1.0 - 0.7 * s;
  std::string row = TimeField(t);
  for (LinePoint& p : line_) {
    const double a = p.a.Next();
    const double b = p.b.Next();
    const double r = p.uv_correlation;
    row += " (";
    Append(row, p.u_mean * (1.0 + 0.3 * s) + growth * p.u_rms * a);
    Append(row, growth * p.v_rms * (r * a + std::sqrt(1.0 - r * r) * b));
    Append(row, growth * p.w_rms * p.c.Next());
    row += ")";
  }
  return row + "\n";
}

std::string ChannelProbes::ForcesRow(double t) {
  const double s = Startup(t);
  lift_phase_ +=
      2.0 * kPi * kSheddingFrequency * dt_ + kPhaseDiffusion * std::sqrt(dt_) * phase_noise_(rng_);
  const double amplitude =
      kLiftAmplitude * (1.0 - 0.8 * s) * (1.0 + kLiftModulation * lift_amplitude_.Next());
  const double drag = kDragCoefficient * (1.0 - 0.5 * s) + 0.05 * std::sin(2.0 * lift_phase_) +
                      kDragNoise * drag_noise_.Next();
  std::string row = TimeField(t);
  Append(row, drag);
  Append(row, amplitude * std::sin(lift_phase_) + kLiftNoise * lift_noise_.Next());
  return row + "\n";
}

}  // namespace plateau_demo
