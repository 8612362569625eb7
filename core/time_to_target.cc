#include "core/time_to_target.h"

#include <cmath>
#include <limits>

namespace plateau {

double RemainingTimeToTarget(const StatisticEstimate& e, double target_half_width) {
  constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
  const double averaged = e.last_time - e.warmup_end_time;
  if (e.state != EstimateState::kEstimated || e.drift_detected || !(averaged > 0.0) ||
      !(target_half_width > 0.0) || std::isnan(e.half_width)) {
    return kNaN;
  }
  if (e.half_width <= target_half_width) return 0.0;
  const double ratio = e.half_width / target_half_width;
  return averaged * (ratio * ratio - 1.0);
}

}  // namespace plateau
