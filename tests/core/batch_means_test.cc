#include "core/batch_means.h"

#include <gtest/gtest.h>

#include <cmath>

#include "tests/core/synthetic_series.h"

namespace plateau {
namespace {

TEST(BatchMeans, TwoBatchesOfFourByHand) {
  // Batch means 2.5 and 6.5, grand mean 4.5: sum of squares 8, / (k (k - 1)) = 4.
  const BatchMeansResult r = NonOverlappingBatchMeans({1, 2, 3, 4, 5, 6, 7, 8}, 2);
  EXPECT_EQ(r.batch_size, 4);
  EXPECT_DOUBLE_EQ(r.variance_of_mean, 4.0);
}

TEST(BatchMeans, RemainderIsDroppedFromTheOldestEnd) {
  const BatchMeansResult r = NonOverlappingBatchMeans({100, 1, 2, 3, 4, 5, 6, 7, 8}, 2);
  EXPECT_DOUBLE_EQ(r.variance_of_mean, 4.0);
}

TEST(BatchMeans, TooFewValuesGiveNoEstimate) {
  EXPECT_TRUE(std::isnan(NonOverlappingBatchMeans({1, 2, 3}, 2).variance_of_mean));
  EXPECT_TRUE(std::isnan(NonOverlappingBatchMeans({1, 2, 3, 4}, 1).variance_of_mean));
}

TEST(OverlappingBatchMeans, FourValuesBatchesOfTwoByHand) {
  // Meketon & Schmeiser (1984): batch means 1.5, 2.5, 3.5 about 2.5 give 2; sigma^2 =
  // n m / ((n - m + 1)(n - m)) * 2 = 8/3; Var(mean) = sigma^2 / n = 2/3.
  const BatchMeansResult r = OverlappingBatchMeans({1, 2, 3, 4}, 2);
  EXPECT_EQ(r.batches, 3);
  EXPECT_DOUBLE_EQ(r.variance_of_mean, 2.0 / 3.0);
}

TEST(OverlappingBatchMeans, LargeOffsetDoesNotCancel) {
  const BatchMeansResult r = OverlappingBatchMeans({1e9 + 1, 1e9 + 2, 1e9 + 3, 1e9 + 4}, 2);
  EXPECT_NEAR(r.variance_of_mean, 2.0 / 3.0, 1e-6);
}

// Exact Var(mean of n) of a stationary AR(1) with unit innovations: gamma_0 / n (1 + 2 sum_k
// (1 - k / n) phi^k), gamma_0 = 1 / (1 - phi^2) (standard result, e.g. Brockwell & Davis 1991,
// Sec. 7.1).
double Ar1VarianceOfMean(int n, double phi) {
  double sum = 1.0;
  double power = 1.0;
  for (int k = 1; k < n; ++k) {
    power *= phi;
    sum += 2.0 * (1.0 - static_cast<double>(k) / n) * power;
  }
  return sum / ((1.0 - phi * phi) * n);
}

TEST(LugsailBatchMeans, RemovesTheLowBiasOfShortBatchesAndCostsTheStatedDegreesOfFreedom) {
  // AR(1) phi = 0.9 (integrated time 19) in 20 batches of 60 values, about three integrated times:
  // overlapping batch means are biased low by O(tau / b) (Vats & Flegal 2021, Sec. 2), the lugsail
  // with c = 1 / r removes the first-order term.
  constexpr double kPhi = 0.9;
  constexpr int kBatches = 20;
  constexpr int kBatchSize = 60;
  constexpr int kReplications = 4000;
  const double exact = Ar1VarianceOfMean(kBatches * kBatchSize, kPhi);
  double obm_sum = 0.0;
  double lugsail_sum = 0.0;
  double lugsail_sum_sq = 0.0;
  for (int r = 0; r < kReplications; ++r) {
    const std::vector<double> x = testing::Ar1(kBatches * kBatchSize, kPhi, 9100 + r);
    obm_sum += OverlappingBatchMeans(x, kBatchSize).variance_of_mean / exact;
    const double lugsail = LugsailBatchMeans(x, kBatchSize).variance_of_mean / exact;
    lugsail_sum += lugsail;
    lugsail_sum_sq += lugsail * lugsail;
  }
  const double obm_mean = obm_sum / kReplications;
  const double lugsail_mean = lugsail_sum / kReplications;
  const double lugsail_variance = lugsail_sum_sq / kReplications - lugsail_mean * lugsail_mean;
  EXPECT_LT(obm_mean, 0.88);                   // the bias the lugsail is for
  EXPECT_NEAR(lugsail_mean, 1.0, 0.05);        // removed to within the replications' noise
  const double measured_dof = 2.0 * lugsail_mean * lugsail_mean / lugsail_variance;
  EXPECT_NEAR(measured_dof / LugsailDegreesOfFreedom(kBatches), 1.0, 0.25)
      << "measured " << measured_dof << ", stated " << LugsailDegreesOfFreedom(kBatches);
}

TEST(LugsailBatchMeans, BatchesTooShortToSplitGiveNoEstimate) {
  EXPECT_TRUE(std::isnan(LugsailBatchMeans({1, 2, 3, 4}, 1).variance_of_mean));
  EXPECT_TRUE(std::isnan(LugsailBatchMeans({1, 2, 3, 4}, 4).variance_of_mean));
}

}  // namespace
}  // namespace plateau
