// The run's stop decision (core/run_verdict.h): Bonferroni confidences, groups, the run verdict and
// its remaining time.
#include "core/run_verdict.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>

namespace plateau {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

TargetStanding Met(const std::string& name) {
  return {name, true, true, "met", "", 0.0};
}
TargetStanding Converging(const std::string& name, double remaining) {
  return {name, true, false, "converging", "half-width 2 % of 1 %", remaining};
}
TargetStanding Monitored(const std::string& name) {
  return {name, false, false, "monitored", "", kNaN};
}

TEST(RunVerdict, BonferroniSharesTheMissProbability) {
  // Bonferroni's inequality: two 97.5 % intervals cover jointly with at least 95 %.
  EXPECT_DOUBLE_EQ(BonferroniMemberConfidence(0.95, 2), 0.975);
  EXPECT_NEAR(BonferroniMemberConfidence(0.95, 72), 1.0 - 0.05 / 72, 1e-15);
  EXPECT_DOUBLE_EQ(BonferroniMemberConfidence(0.9, 1), 0.9);
}

TEST(RunVerdict, OnlyBonferroniMembersAreJudgedStricterAndNeverLooser) {
  const std::vector<StatisticGroup> groups = {
      {"walls", {"tau_lower", "tau_upper"}, true, 0.95, true},
      {"loose", {"cd"}, false, 0.5, true},
      {"strict_already", {"cl"}, true, 0.9, true}};
  const std::vector<double> judged =
      JudgedConfidences({"tau_lower", "tau_upper", "cd", "cl"}, {0.95, 0.95, 0.95, 0.99}, groups);
  EXPECT_DOUBLE_EQ(judged[0], 0.975);
  EXPECT_DOUBLE_EQ(judged[1], 0.975);
  EXPECT_DOUBLE_EQ(judged[2], 0.95);  // not Bonferroni
  EXPECT_DOUBLE_EQ(judged[3], 0.99);  // its own is stricter than the group's 0.9
}

TEST(RunVerdict, AGroupNamesItsFirstUnmetMemberAndWaitsForTheSlowest) {
  const StatisticGroup walls{"walls", {"tau_lower", "tau_upper", "tau_side"}, true, 0.95, true};
  const GroupStanding g = JudgeGroup(
      walls, {Met("tau_lower"), Converging("tau_upper", 12.0), Converging("tau_side", 30.0)});
  EXPECT_FALSE(g.met);
  EXPECT_EQ(g.members_met, 1);
  EXPECT_EQ(g.members, 3);
  EXPECT_EQ(g.reason, "1 of 3 members met; tau_upper is converging: half-width 2 % of 1 %");
  EXPECT_DOUBLE_EQ(g.remaining_time, 30.0);
  EXPECT_NEAR(g.member_confidence, 1.0 - 0.05 / 3, 1e-15);

  const GroupStanding unknown =
      JudgeGroup(walls, {Met("tau_lower"), Converging("tau_upper", kNaN), Met("tau_side")});
  EXPECT_TRUE(std::isnan(unknown.remaining_time));

  const GroupStanding all = JudgeGroup(walls, {Met("tau_lower"), Met("tau_upper"), Met("tau_side")});
  EXPECT_TRUE(all.met);
  EXPECT_EQ(all.reason, "3 of 3 members met");
  EXPECT_DOUBLE_EQ(all.remaining_time, 0.0);
}

// The run's verdict with each group judged on the same standings.
bool RunMetJudgingGroups(const std::vector<TargetStanding>& statistics,
                         const std::vector<StatisticGroup>& groups) {
  std::vector<GroupStanding> standings;
  for (const StatisticGroup& g : groups) standings.push_back(JudgeGroup(g, statistics));
  return RunMet(statistics, groups, standings);
}

TEST(RunVerdict, TheRunWaitsForUngroupedTargetsAndRequiredGroupsOnly) {
  const std::vector<StatisticGroup> groups = {
      {"walls", {"tau_lower", "tau_upper"}, true, 0.95, true},
      {"optional", {"cl"}, false, 0.95, false}};
  // An unmet member of a required group holds the run; an unmet member of an optional one does not.
  EXPECT_FALSE(RunMetJudgingGroups({Met("cd"), Met("tau_lower"), Converging("tau_upper", 1.0),
                       Converging("cl", 1.0)},
                      groups));
  EXPECT_TRUE(RunMetJudgingGroups({Met("cd"), Met("tau_lower"), Met("tau_upper"), Converging("cl", 1.0)}, groups));
  // An ungrouped target holds it; a statistic without a target never does.
  EXPECT_FALSE(RunMetJudgingGroups({Converging("cd", 1.0), Met("tau_lower"), Met("tau_upper")}, groups));
  EXPECT_TRUE(RunMetJudgingGroups({Met("cd"), Monitored("k"), Met("tau_lower"), Met("tau_upper")}, groups));
  // Nothing to judge: not met (a run without targets cannot be declared done).
  EXPECT_FALSE(RunMetJudgingGroups({Monitored("k")}, {}));
}

TEST(RunVerdict, RemainingTimeIsTheSlowestTargetsOrUnknown) {
  EXPECT_DOUBLE_EQ(RunRemainingTime({Met("a"), Converging("b", 4.0), Converging("c", 9.0),
                                     Monitored("d")}),
                   9.0);
  EXPECT_TRUE(std::isnan(RunRemainingTime({Converging("b", 4.0), Converging("c", kNaN)})));
  EXPECT_TRUE(std::isnan(RunRemainingTime({Monitored("d")})));
  EXPECT_DOUBLE_EQ(RunRemainingTime({Met("a")}), 0.0);
}

TEST(RunVerdict, AMultivariateGroupNeedsItsJointRegionAndJudgesMembersAtItsOwnConfidence) {
  StatisticGroup line{"line U", {"u0", "u1"}, false, 0.95, true};
  line.multivariate = true;
  const std::vector<double> judged = JudgedConfidences({"u0", "u1", "cd"}, {0.9, 0.99, 0.9}, {line});
  EXPECT_DOUBLE_EQ(judged[0], 0.95);  // raised to the group's, not Bonferroni's 0.975
  EXPECT_DOUBLE_EQ(judged[1], 0.99);
  EXPECT_DOUBLE_EQ(judged[2], 0.9);
  const std::vector<TargetStanding> both_met = {Met("u0"), Met("u1")};
  EXPECT_FALSE(JudgeGroup(line, both_met).met);  // no region evaluated
  const JointStanding wide{false, "joint region 1.3 of the targets' size"};
  const GroupStanding not_yet = JudgeGroup(line, both_met, &wide);
  EXPECT_FALSE(not_yet.met);
  EXPECT_EQ(not_yet.reason, "2 of 2 members met; joint region 1.3 of the targets' size");
  EXPECT_TRUE(std::isnan(not_yet.remaining_time));  // the region's time unknown
  const JointStanding growing{false, "joint region 1.3 of the targets' size", 5.0};
  EXPECT_DOUBLE_EQ(JudgeGroup(line, both_met, &growing).remaining_time, 5.0);
  EXPECT_DOUBLE_EQ(
      JudgeGroup(line, {Met("u0"), Converging("u1", 8.0)}, &growing).remaining_time, 8.0);
  const JointStanding small{true, "small", 0.0};
  EXPECT_TRUE(JudgeGroup(line, both_met, &small).met);
  EXPECT_FALSE(JudgeGroup(line, {Met("u0"), Converging("u1", 2.0)}, &small).met);
}

}  // namespace
}  // namespace plateau
