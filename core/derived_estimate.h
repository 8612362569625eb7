// A statistic that is a smooth function of another one, such as the friction velocity
// u_tau = sqrt(tau_w / rho) of a mean wall shear stress: its value and its uncertainty by the delta
// method, f(x) and |f'(x)| times every standard error. The correlation time, the effective sample
// size, the warm-up and the drift verdict are the base statistic's. Pure; stateless.
#ifndef PLATEAU_CORE_DERIVED_ESTIMATE_H_
#define PLATEAU_CORE_DERIVED_ESTIMATE_H_

#include <string>

#include "core/statistic_estimate.h"

namespace plateau {

// `value` = f(base.value), `slope` = f'(base.value).
StatisticEstimate DeriveEstimate(const StatisticEstimate& base, std::string name, double value,
                                 double slope);

// u_tau = sqrt(tau_w / rho) from a mean wall shear stress (Pa and kg/m^3 give m/s).
StatisticEstimate FrictionVelocity(const StatisticEstimate& wall_shear, double density);
// Re_tau = u_tau delta / nu from a friction velocity, a half-height and a kinematic viscosity.
StatisticEstimate FrictionReynolds(const StatisticEstimate& friction_velocity, double half_height,
                                   double viscosity);

}  // namespace plateau

#endif  // PLATEAU_CORE_DERIVED_ESTIMATE_H_
