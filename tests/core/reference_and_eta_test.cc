#include <gtest/gtest.h>

#include <cmath>
#include <random>

#include "core/reference_check.h"
#include "core/statistic.h"
#include "core/time_to_target.h"
#include "tests/core/synthetic_series.h"

namespace plateau {
namespace {

StatisticEstimate Estimated(double value, double half_width) {
  StatisticEstimate e;
  e.state = EstimateState::kEstimated;
  e.value = value;
  e.half_width = half_width;
  e.warmup_end_time = 10.0;
  e.last_time = 110.0;  // 100 time units averaged
  return e;
}

TEST(TimeToTarget, HalfWidthFallsLikeOneOverRootTime) {
  // Twice the target after 100 time units: four times as long in all, 300 more.
  EXPECT_DOUBLE_EQ(RemainingTimeToTarget(Estimated(1.0, 0.02), 0.01), 300.0);
  EXPECT_EQ(RemainingTimeToTarget(Estimated(1.0, 0.008), 0.01), 0.0);
  StatisticEstimate drifting = Estimated(1.0, 0.02);
  drifting.drift_detected = true;
  EXPECT_TRUE(std::isnan(RemainingTimeToTarget(drifting, 0.01)));
  EXPECT_TRUE(std::isnan(RemainingTimeToTarget(StatisticEstimate(), 0.01)));
}

TEST(TimeToTarget, PredictionFromAQuarterOfTheRunHoldsForTheWholeRun) {
  // AR(1): predict from the first 2^16 samples how long until the half-width halves, then check
  // the half-width at that length (the 1/sqrt(T) law; common practice for stationary series).
  const std::vector<double> x = testing::Ar1(1 << 18, 0.9, 12);
  std::string error;
  Statistic s("x", *StatisticFormula::Make(StatisticKind::kMean, {0}, &error));
  EvaluationOptions options;
  options.warmup = WarmupPolicy::kNone;
  std::size_t t = 0;
  for (; t < (1u << 16); ++t) s.Add(static_cast<double>(t), &x[t]);
  const StatisticEstimate early = s.Evaluate(options);
  const double remaining = RemainingTimeToTarget(early, early.half_width / 2.0);
  EXPECT_NEAR(remaining, 3.0 * ((1 << 16) - 1), 1e-6);  // averaged over times 0 .. 2^16 - 1
  for (; t < (1u << 16) + static_cast<std::size_t>(remaining); ++t) {
    s.Add(static_cast<double>(t), &x[t]);
  }
  const StatisticEstimate late = s.Evaluate(options);
  EXPECT_NEAR(late.half_width, early.half_width / 2.0, 0.2 * early.half_width / 2.0);
}

TEST(ReferenceCheck, InsideTheIntervalIsSamplingErrorOutsideIsBias) {
  const ReferenceComparison inside = CompareWithReference(Estimated(0.2790, 0.0030), 0.2817);
  EXPECT_EQ(inside.verdict, ReferenceComparison::Verdict::kConsistent);
  EXPECT_NEAR(inside.relative_difference, -0.0027 / 0.2817, 1e-12);
  EXPECT_NE(inside.words.find("within the sampling uncertainty"), std::string::npos);
  const ReferenceComparison outside = CompareWithReference(Estimated(0.2535, 0.0010), 0.2817);
  EXPECT_EQ(outside.verdict, ReferenceComparison::Verdict::kBias);
  EXPECT_NE(outside.words.find("(-10 %)"), std::string::npos) << outside.words;
  EXPECT_NE(outside.words.find("more averaging will not remove"), std::string::npos);
  StatisticEstimate drifting = Estimated(0.25, 0.001);
  drifting.drift_detected = true;
  EXPECT_EQ(CompareWithReference(drifting, 0.2817).verdict,
            ReferenceComparison::Verdict::kUndetermined);
}

}  // namespace
}  // namespace plateau
