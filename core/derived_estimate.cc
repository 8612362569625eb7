#include "core/derived_estimate.h"

#include <cmath>

namespace plateau {

StatisticEstimate DeriveEstimate(const StatisticEstimate& base, std::string name, double value,
                                 double slope) {
  StatisticEstimate e = base;
  e.name = std::move(name);
  e.value = value;
  const double factor = std::fabs(slope);
  for (double* se : {&e.se_batch_means, &e.se_overlapping_batch_means, &e.se_lugsail_batch_means,
                     &e.se_autocorrelation,
                     &e.se_sokal, &e.se_lag_window, &e.std_error, &e.half_width}) {
    *se *= factor;
  }
  e.decision.std_error *= factor;
  e.relative_half_width = value != 0.0 ? e.half_width / std::fabs(value) : StatisticEstimate::kNaN;
  return e;
}

StatisticEstimate FrictionVelocity(const StatisticEstimate& wall_shear, double density) {
  const double tau = wall_shear.value;
  const double u_tau = std::sqrt(tau / density);
  return DeriveEstimate(wall_shear, "u_tau", u_tau, 0.5 / std::sqrt(density * tau));
}

StatisticEstimate FrictionReynolds(const StatisticEstimate& friction_velocity, double half_height,
                                   double viscosity) {
  const double scale = half_height / viscosity;
  return DeriveEstimate(friction_velocity, "Re_tau", friction_velocity.value * scale, scale);
}

}  // namespace plateau
