// How much longer a statistic must be averaged to reach its target: once batches are long enough
// the half-width falls like 1/sqrt(T) in the averaging time T (the central limit theorem for a
// stationary process), so T_needed = T (h / h_target)^2. Pure; stateless.
#ifndef PLATEAU_CORE_TIME_TO_TARGET_H_
#define PLATEAU_CORE_TIME_TO_TARGET_H_

#include "core/statistic_estimate.h"

namespace plateau {

// Remaining simulated time (units of the time column) for `e` to reach `target_half_width`: 0
// when it already has, NaN when no prediction is possible (no interval yet, drift, no averaging
// time, no target).
double RemainingTimeToTarget(const StatisticEstimate& e, double target_half_width);

}  // namespace plateau

#endif  // PLATEAU_CORE_TIME_TO_TARGET_H_
