// A group's joint confidence region (the config's `joint: multivariate`): multivariate batch means
// over the members' linearised series, Hotelling's T^2 ellipsoid at the group's confidence, and
// whether its volume fits the box of the members' target intervals; with how much longer the run
// would need under Bonferroni. Pure; stateless.
//
// The criterion is Vats, Flegal & Jones's (2019, Biometrika 106, Sec. 3) with the members' targets
// as the scale: the region is small enough when volume^(1/p) <= that of the box of target intervals
// [-h_i, h_i], which for one member is exactly "half-width <= target". Vats et al. scale by the
// sample covariance instead; a flow statistic's target is set against its value, not its
// fluctuations, so the targets are the natural scale here. The region's volume shrinks with the
// correlation between members, which is what a joint region gains over separate intervals.
#ifndef PLATEAU_CORE_JOINT_REGION_H_
#define PLATEAU_CORE_JOINT_REGION_H_

#include <limits>
#include <string>
#include <vector>

#include "core/evaluation_options.h"
#include "core/statistic.h"
#include "core/statistic_estimate.h"

namespace plateau {

struct JointRegionMember {
  const Statistic* statistic = nullptr;
  const StatisticEstimate* estimate = nullptr;  // evaluated at the group's confidence
  double target_half_width = 0.0;               // absolute, from the member's target
};

struct JointRegion {
  static constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

  bool available = false;
  std::string reason;  // what the region says, or why there is none
  int members = 0;
  int batches = 0;
  double batch_length = kNaN;  // samples
  // volume^(1/p) of the region over that of the targets' box: <= 1 is small enough.
  double volume_ratio = kNaN;
  // The largest member half-width over its target at the group's confidence, and at Bonferroni's
  // member confidence 1 - (1 - c) / p.
  double members_ratio = kNaN;
  double bonferroni_ratio = kNaN;
  // How many times the present averaging the run needs for the joint rule (its region and every
  // member at the group's confidence) and under Bonferroni: half-widths fall as 1 / sqrt(time).
  double joint_time_factor = kNaN;
  double bonferroni_time_factor = kNaN;
  bool small_enough = false;  // volume_ratio <= 1
  // Simulated time until the region alone is small enough: the members' averaging time (the
  // shortest, after the common cut) times volume_ratio^2 - 1, as the region's size falls as
  // 1 / sqrt(time); 0 once small enough; NaN while it is not trusted or the averaging time is
  // unknown.
  double remaining_time = kNaN;
};

// More batches than members by at least this many: Sigma's estimate then has enough degrees of
// freedom for Hotelling's quantile not to dominate (F_{p, a - p} with a - p >= 20).
inline constexpr int kJointExtraBatches = 20;

// Members must be fed by the same rows (one source): their blocks then line up in time. All are cut
// at the largest of their warm-up cuts.
JointRegion EvaluateJointRegion(const std::vector<JointRegionMember>& members,
                                const EvaluationOptions& options);

}  // namespace plateau

#endif  // PLATEAU_CORE_JOINT_REGION_H_
