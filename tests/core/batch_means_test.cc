#include "core/batch_means.h"

#include <gtest/gtest.h>

#include <cmath>

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

}  // namespace
}  // namespace plateau
