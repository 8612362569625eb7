// A unit-variance first-order autoregressive signal: the simplest model of a turbulent
// fluctuation with an integral time scale T, whose autocorrelation is exp(-lag / T).
#pragma once

#include <cmath>
#include <random>

namespace plateau_demo {

class Ar1Signal {
 public:
  // dt: time between samples; time_scale: the integral time scale T (same units).
  Ar1Signal(double dt, double time_scale, std::mt19937_64& rng)
      : phi_(std::exp(-dt / time_scale)), innovation_(std::sqrt(1.0 - phi_ * phi_)), rng_(&rng) {
    state_ = normal_(*rng_);
  }

  double Next() {
    state_ = phi_ * state_ + innovation_ * normal_(*rng_);
    return state_;
  }

 private:
  double phi_;
  double innovation_;
  std::mt19937_64* rng_;
  std::normal_distribution<double> normal_;
  double state_;
};

}  // namespace plateau_demo
