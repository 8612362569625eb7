// A group's joint region (core/joint_region.h) over statistics fed by the same rows.
#include "core/joint_region.h"

#include <gtest/gtest.h>

#include <cmath>
#include <vector>

#include "core/batch_means.h"
#include "core/student_t.h"
#include "tests/core/synthetic_series.h"

namespace plateau {
namespace {

Statistic MeanOf(int column, const std::string& name) {
  std::string error;
  auto formula = StatisticFormula::Make(StatisticKind::kMean, {column}, &error);
  EXPECT_TRUE(formula.has_value()) << error;
  return Statistic(name, *formula);
}

// Three probes that see the same slow eddy (an AR(1) with phi = 0.95) plus each its own faster
// noise: strongly correlated means, as neighbouring points of a profile.
std::vector<std::vector<double>> NeighbouringProbes(std::size_t n) {
  const std::vector<double> eddy = testing::Ar1(n, 0.95, 11, 1.0);
  std::vector<std::vector<double>> columns;
  for (int i = 0; i < 3; ++i) {
    std::vector<double> own = testing::Ar1(n, 0.5, 20 + i);
    for (std::size_t t = 0; t < n; ++t) own[t] = eddy[t] + 0.5 * own[t];
    columns.push_back(std::move(own));
  }
  return columns;
}

struct Fed {
  std::vector<Statistic> statistics;
  std::vector<StatisticEstimate> estimates;
};

Fed FeedAndEvaluate(const std::vector<std::vector<double>>& columns, std::size_t members,
                    const EvaluationOptions& options) {
  Fed fed;
  for (std::size_t i = 0; i < members; ++i) {
    fed.statistics.push_back(MeanOf(static_cast<int>(i), "p" + std::to_string(i)));
  }
  std::vector<double> row(columns.size());
  for (std::size_t t = 0; t < columns[0].size(); ++t) {
    for (std::size_t c = 0; c < columns.size(); ++c) row[c] = columns[c][t];
    for (Statistic& s : fed.statistics) s.Add(static_cast<double>(t), row.data());
  }
  for (const Statistic& s : fed.statistics) fed.estimates.push_back(s.Evaluate(options));
  return fed;
}

std::vector<JointRegionMember> Members(const Fed& fed, double target) {
  std::vector<JointRegionMember> members;
  for (std::size_t i = 0; i < fed.statistics.size(); ++i) {
    members.push_back({&fed.statistics[i], &fed.estimates[i], target});
  }
  return members;
}

TEST(JointRegion, CorrelatedMembersNeedLessRunThanBonferroni) {
  EvaluationOptions options;
  const Fed fed = FeedAndEvaluate(NeighbouringProbes(200000), 3, options);
  const JointRegion region = EvaluateJointRegion(Members(fed, 0.02), options);
  ASSERT_TRUE(region.available) << region.reason;
  EXPECT_EQ(region.batches, 3 + kJointExtraBatches);
  // Correlation shrinks the region below the separate intervals' box ...
  EXPECT_LT(region.volume_ratio, region.members_ratio);
  // ... so the joint rule is limited by the members at 95 % each, and Bonferroni's 98.3 % costs
  // (t_0.9917 / t_0.975)^2, about 1.5 times the run.
  EXPECT_NEAR(region.joint_time_factor, region.members_ratio * region.members_ratio, 1e-12);
  EXPECT_GT(region.bonferroni_time_factor / region.joint_time_factor, 1.3);
  EXPECT_NE(region.reason.find("× as long)"), std::string::npos) << region.reason;
}

TEST(JointRegion, OneMemberIsTheBatchMeansIntervalAgainstItsTarget) {
  // p = 1: the ellipsoid is the interval mean +- t_{a-1} se from a batches, and the box is
  // [-h, h], so the volume ratio is t_{a-1} se / h exactly.
  EvaluationOptions options;
  options.warmup = WarmupPolicy::kNone;
  const Fed fed = FeedAndEvaluate({testing::Ar1(50000, 0.9, 3)}, 1, options);
  const JointRegion region = EvaluateJointRegion(Members(fed, 0.05), options);
  ASSERT_TRUE(region.available) << region.reason;
  const int batches = 1 + kJointExtraBatches;
  const BatchMeansResult bm =
      NonOverlappingBatchMeans(fed.statistics[0].LinearisedBlockSeries(0), batches);
  const double expected =
      TwoSidedStudentQuantile(0.95, batches - 1.0) * std::sqrt(bm.variance_of_mean) / 0.05;
  EXPECT_NEAR(region.volume_ratio, expected, 1e-9 * expected);
}

TEST(JointRegion, MembersOfDifferentRowsAreNamed) {
  EvaluationOptions options;
  const Fed a = FeedAndEvaluate({testing::Ar1(30000, 0.5, 1)}, 1, options);
  const Fed b = FeedAndEvaluate({testing::Ar1(40000, 0.5, 2)}, 1, options);
  std::vector<JointRegionMember> members = {{&a.statistics[0], &a.estimates[0], 0.1},
                                            {&b.statistics[0], &b.estimates[0], 0.1}};
  const JointRegion region = EvaluateJointRegion(members, options);
  EXPECT_FALSE(region.available);
  EXPECT_FALSE(region.small_enough);
  EXPECT_NE(region.reason.find("not fed by the same rows (40000 and 30000 samples)"),
            std::string::npos)
      << region.reason;
}

TEST(JointRegion, ARepeatedMemberIsSingular) {
  EvaluationOptions options;
  const std::vector<double> x = testing::Ar1(30000, 0.5, 4);
  const Fed fed = FeedAndEvaluate({x, x}, 2, options);
  const JointRegion region = EvaluateJointRegion(Members(fed, 0.1), options);
  EXPECT_FALSE(region.available);
  EXPECT_NE(region.reason.find("singular"), std::string::npos) << region.reason;
}

}  // namespace
}  // namespace plateau
