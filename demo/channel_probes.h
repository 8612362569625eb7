// The probe rows of the demo's channel at one time step: the wall shear stress on both walls,
// the velocity at the probe line's points, and the cylinder's force coefficients. Fluctuations
// are first-order autoregressive signals (Ar1Signal) with the integral time scales of
// ChannelProfileModel; the start-up transient scales means and fluctuations early on. Points are
// independent of one another (a real line's neighbours are correlated; plateau does not assume
// either).
#pragma once

#include <random>
#include <string>
#include <vector>

#include "demo/ar1_signal.h"

namespace plateau_demo {

class ChannelProbes {
 public:
  ChannelProbes(double dt, unsigned seed);

  static std::string WallHeader();
  static std::string LineHeader();
  static std::string ForcesHeader();

  // Each call advances that file's signals by one time step and returns the row for time t
  // (in s from the start of the run), newline included.
  std::string WallRow(double t);
  std::string LineRow(double t);
  std::string ForcesRow(double t);

 private:
  struct LinePoint {
    double y_plus;
    double u_mean, u_rms, v_rms, w_rms, uv_correlation;  // m/s
    Ar1Signal a, b, c;
  };

  double dt_;
  std::mt19937_64 rng_;
  Ar1Signal tau_lower_, tau_upper_;
  std::vector<LinePoint> line_;
  Ar1Signal drag_noise_, lift_noise_, lift_amplitude_;
  std::normal_distribution<double> phase_noise_;
  double lift_phase_ = 0.0;
};

}  // namespace plateau_demo
