#include "core/bridge_test_truncation.h"

#include <gtest/gtest.h>

#include <cstdio>
#include <random>

#include "core/mser_truncation.h"

namespace plateau {
namespace {

std::vector<double> Normal(std::size_t n, std::uint64_t seed) {
  std::mt19937_64 rng(seed);
  std::normal_distribution<double> normal;
  std::vector<double> x(n);
  for (double& v : x) v = normal(rng);
  return x;
}

TEST(BridgeTest, NullDistributionHasTheBrownianBridgesMeanAndLevel) {
  // Under stationarity with the exact variance, the statistic tends to the integral of a squared
  // Brownian bridge: mean 1/6 (E B(t)^2 = t (1 - t)), and it exceeds 0.4614 with probability 0.05
  // (Anderson & Darling 1952; the quantile checked with SciPy's scipy.stats._hypotests._cdf_cvm_inf).
  constexpr int kReplications = 2000;
  double sum = 0.0;
  int rejected = 0;
  for (int r = 0; r < kReplications; ++r) {
    const double c = BridgeCramerVonMises(Normal(1000, 10 + r), 1.0);
    sum += c;
    rejected += c > 0.4614;
  }
  const double rate = static_cast<double>(rejected) / kReplications;
  std::printf("bridge statistic under the null: mean %.4f, rejection rate %.4f\n",
              sum / kReplications, rate);
  EXPECT_NEAR(sum / kReplications, 1.0 / 6.0, 0.01);
  EXPECT_NEAR(rate, 0.05, 0.015);  // binomial sd 0.005
}

TEST(BridgeTest, ALevelShiftAtTheStartIsCutInTenths) {
  std::vector<double> y = Normal(200, 3);
  for (int j = 0; j < 50; ++j) y[j] += 1.0;  // a quarter of the run, one noise level up
  const int cut = BridgeTestTruncation(y, 0);
  EXPECT_GE(cut, 40);
  EXPECT_EQ(cut % 20, 0);
  EXPECT_LE(cut, 100);
}

TEST(BridgeTest, StartsFromTheFloorAndStopsAtHalf) {
  std::vector<double> y(200);
  for (int j = 0; j < 200; ++j) y[j] = 0.01 * j;  // all trend: every remainder is rejected
  EXPECT_EQ(BridgeTestTruncation(y, 0), 100);
  EXPECT_GE(BridgeTestTruncation(Normal(200, 4), 30), 30);
}

}  // namespace
}  // namespace plateau
