// The run's stop decision from its statistics' standings: which confidence each statistic is judged
// at (a Bonferroni group makes its members stricter), whether a group is met, whether the run is
// met, and how much longer the run needs. Pure; stateless.
#ifndef PLATEAU_CORE_RUN_VERDICT_H_
#define PLATEAU_CORE_RUN_VERDICT_H_

#include <cstddef>
#include <limits>
#include <string>
#include <vector>

namespace plateau {

// Statistics that stop jointly (the config's `groups:`): a group is met when all its members are.
struct StatisticGroup {
  std::string name;
  std::vector<std::string> members;
  bool bonferroni = false;
  double confidence = 0.95;  // of the group as a whole
  bool required = true;      // the run waits for it
  // `joint: multivariate`: members judged at the group's confidence, and the group met only when
  // their joint region is small enough too (core/joint_region.h); exclusive with bonferroni.
  bool multivariate = false;
};

// What a multivariate group's joint region says, for the verdict.
struct JointStanding {
  bool small_enough = false;
  std::string reason;
  // Simulated time until the region alone is small enough (0 when it is); NaN: unknown.
  double remaining_time = std::numeric_limits<double>::quiet_NaN();
};

// One statistic as the verdict sees it.
struct TargetStanding {
  std::string name;
  bool has_target = false;
  bool met = false;
  std::string state;         // its state name, for the group's reason
  std::string state_reason;
  double remaining_time = 0.0;  // simulated time still needed; NaN: unknown
};

struct GroupStanding {
  int members = 0;
  int members_met = 0;
  bool met = false;
  // "1 of 2 members met; tau_upper is converging: ..." (the first unmet member, in group order).
  std::string reason;
  double remaining_time = 0.0;  // the largest of the members'; NaN when any is unknown
  double member_confidence = 0.0;  // Bonferroni's; NaN without it
};

// Bonferroni: if each of m intervals misses with probability (1 - c) / m, any misses with at most
// 1 - c (Bonferroni's inequality; e.g. Miller 1981, Simultaneous Statistical Inference, ch. 1).
double BonferroniMemberConfidence(double joint_confidence, std::size_t members);

// Per statistic (`names`, with `own` confidences in the same order), the confidence it is judged
// at: its own, or its Bonferroni groups' member confidence when stricter.
std::vector<double> JudgedConfidences(const std::vector<std::string>& names,
                                      const std::vector<double>& own,
                                      const std::vector<StatisticGroup>& groups);

// A group's standing from its members' (members missing from `statistics` count as unmet and
// unknown); a multivariate group also needs its `joint` standing (unmet without one), whose reason
// ends the group's.
GroupStanding JudgeGroup(const StatisticGroup& group, const std::vector<TargetStanding>& statistics,
                         const JointStanding* joint = nullptr);

// The run is met when every required group is met and every statistic with a target outside any
// group is, and at least one of those exists. `group_standings` are the groups', in their order.
bool RunMet(const std::vector<TargetStanding>& statistics, const std::vector<StatisticGroup>& groups,
            const std::vector<GroupStanding>& group_standings);

// The run's remaining simulated time: the largest over the statistics with a target (0 for met
// ones); NaN when any of them is unknown or none has a target.
double RunRemainingTime(const std::vector<TargetStanding>& statistics);

}  // namespace plateau

#endif  // PLATEAU_CORE_RUN_VERDICT_H_
