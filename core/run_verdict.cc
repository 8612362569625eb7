#include "core/run_verdict.h"

#include <algorithm>
#include <cmath>
#include <limits>

namespace plateau {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

bool IsMember(const StatisticGroup& group, const std::string& name) {
  return std::find(group.members.begin(), group.members.end(), name) != group.members.end();
}

// NaN once any part is unknown.
double LargerOrUnknown(double so_far, double next) {
  return std::isnan(next) || std::isnan(so_far) ? kNaN : std::max(so_far, next);
}

}  // namespace

double BonferroniMemberConfidence(double joint_confidence, std::size_t members) {
  return 1.0 - (1.0 - joint_confidence) / static_cast<double>(std::max<std::size_t>(members, 1));
}

std::vector<double> JudgedConfidences(const std::vector<std::string>& names,
                                      const std::vector<double>& own,
                                      const std::vector<StatisticGroup>& groups) {
  std::vector<double> judged = own;
  for (const StatisticGroup& g : groups) {
    if (!(g.bonferroni || g.multivariate) || g.members.empty()) continue;
    const double member = g.multivariate
                              ? g.confidence
                              : BonferroniMemberConfidence(g.confidence, g.members.size());
    for (std::size_t i = 0; i < names.size(); ++i) {
      if (IsMember(g, names[i])) judged[i] = std::max(judged[i], member);
    }
  }
  return judged;
}

GroupStanding JudgeGroup(const StatisticGroup& group, const std::vector<TargetStanding>& statistics,
                         const JointStanding* joint) {
  GroupStanding standing;
  standing.members = static_cast<int>(group.members.size());
  standing.member_confidence =
      group.bonferroni ? BonferroniMemberConfidence(group.confidence, group.members.size()) : kNaN;
  const TargetStanding* first_unmet = nullptr;
  for (const std::string& member : group.members) {
    const auto s = std::find_if(statistics.begin(), statistics.end(),
                                [&](const TargetStanding& t) { return t.name == member; });
    if (s == statistics.end()) {
      standing.remaining_time = kNaN;
      continue;
    }
    if (s->met) {
      ++standing.members_met;
    } else if (first_unmet == nullptr) {
      first_unmet = &*s;
    }
    standing.remaining_time = LargerOrUnknown(standing.remaining_time, s->remaining_time);
  }
  standing.met = standing.members_met == standing.members;
  standing.reason = std::to_string(standing.members_met) + " of " +
                    std::to_string(standing.members) + " members met";
  if (first_unmet != nullptr) {
    standing.reason += "; " + first_unmet->name + " is " + first_unmet->state + ": " +
                       first_unmet->state_reason;
  }
  if (group.multivariate) {
    const bool small_enough = joint != nullptr && joint->small_enough;
    standing.met = standing.met && small_enough;
    standing.reason += "; " + (joint != nullptr ? joint->reason : std::string("no joint region yet"));
    standing.remaining_time = LargerOrUnknown(standing.remaining_time,
                                              joint != nullptr ? joint->remaining_time : kNaN);
  }
  return standing;
}

bool RunMet(const std::vector<TargetStanding>& statistics, const std::vector<StatisticGroup>& groups,
            const std::vector<GroupStanding>& group_standings) {
  int judged = 0;
  for (const TargetStanding& s : statistics) {
    if (!s.has_target) continue;
    const bool grouped = std::any_of(groups.begin(), groups.end(),
                                     [&](const StatisticGroup& g) { return IsMember(g, s.name); });
    if (grouped) continue;
    ++judged;
    if (!s.met) return false;
  }
  for (std::size_t i = 0; i < groups.size(); ++i) {
    if (!groups[i].required) continue;
    ++judged;
    if (i >= group_standings.size() || !group_standings[i].met) return false;
  }
  return judged > 0;
}

double RunRemainingTime(const std::vector<TargetStanding>& statistics) {
  double remaining = kNaN;
  bool any = false;
  for (const TargetStanding& s : statistics) {
    if (!s.has_target) continue;
    remaining = any ? LargerOrUnknown(remaining, s.remaining_time) : s.remaining_time;
    any = true;
  }
  return remaining;
}

}  // namespace plateau
