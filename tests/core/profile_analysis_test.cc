#include "core/profile_analysis.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>

#include "core/derived_estimate.h"
#include "core/statistic.h"
#include "tests/core/channel_dns.h"
#include "tests/core/synthetic_series.h"

namespace plateau {
namespace {

using testing::ReadChannelDns;

TEST(ProfileAnalysis, DnsTotalStressIsLinearToThreeThousandths) {
  // Moser, Kim & Mansour (1999), Re_tau = 178.12, in wall units (u_tau = 1, nu = 1 / Re_tau,
  // y = y/h): the departure from 1 - y/h is about 0.003 at most (the reference data's README).
  const testing::ChannelDns d = ReadChannelDns();
  ASSERT_EQ(d.y_over_h.size(), 65u);  // wall to centreline: half of the 129-point grid
  const std::vector<double> departure =
      TotalStressDeparture(d.y_over_h, d.u_plus, d.r_uv, 1.0 / 178.12, 1.0, 1.0);
  double largest = 0.0;
  for (double x : departure) largest = std::max(largest, std::fabs(x));
  EXPECT_LT(largest, 0.005);
  EXPECT_GT(largest, 0.0005);  // the published profile is not exactly linear either
}

TEST(ProfileAnalysis, DnsPeaksWhereCommonPracticeSaysTheyAre) {
  // Common-practice checks on the published profile: u_rms+ peaks at about 2.66 near y+ = 15, and
  // <u'v'>+ reaches below -0.7 near y+ = 30 (both quoted in the reference data's README).
  const testing::ChannelDns d = ReadChannelDns();
  const auto peak = std::max_element(d.r_uu.begin(), d.r_uu.end());
  const std::size_t at = peak - d.r_uu.begin();
  EXPECT_NEAR(std::sqrt(*peak), 2.66, 0.02);
  EXPECT_NEAR(d.y_plus[at], 15.0, 3.0);
  const auto low = std::min_element(d.r_uv.begin(), d.r_uv.end());
  EXPECT_LT(*low, -0.7);
  EXPECT_NEAR(d.y_plus[low - d.r_uv.begin()], 30.0, 6.0);
}

TEST(ProfileAnalysis, ThreePointDerivativeIsExactForAQuadraticOnAnySpacing) {
  const std::vector<double> y{0.0, 0.1, 0.35, 0.4, 1.0};
  std::vector<double> u, uv(5, 0.0);
  for (double v : y) u.push_back(3.0 * v * v - 2.0 * v);
  // nu = 1, u_tau = 1, delta = 1: departure = dU/dy - (1 - y) = 6y - 2 - 1 + y.
  const std::vector<double> d = TotalStressDeparture(y, u, uv, 1.0, 1.0, 1.0);
  for (std::size_t i = 0; i < y.size(); ++i) EXPECT_NEAR(d[i], 7.0 * y[i] - 3.0, 1e-12) << i;
}

TEST(ProfileAnalysis, WallUnitsAndInterpolation) {
  EXPECT_NEAR(YPlus(0.001, 0.1336, 1.5e-5), 8.9067, 1e-4);
  EXPECT_EQ(WallUnitPower("U"), 1);
  EXPECT_EQ(WallUnitPower("uv"), 2);
  EXPECT_EQ(WallUnitPower("k"), 2);
  EXPECT_EQ(WallUnitPower("uuv"), 3);
  EXPECT_EQ(WallUnitPower("p"), 0);
  const std::vector<std::pair<double, double>> table{{0.0, 0.0}, {10.0, 5.0}, {30.0, 13.0}};
  EXPECT_DOUBLE_EQ(Interpolate(table, 20.0), 9.0);
  EXPECT_TRUE(std::isnan(Interpolate(table, 31.0)));
  EXPECT_EQ(ReadProfileTable("# y+ U+\n1 1\n\n5 4.9\n")->size(), 2u);
  const auto bad = ReadProfileTable("1 x\n");
  EXPECT_FALSE(bad.ok());
  EXPECT_EQ(bad.error(), "line 1: expected two numbers, x and value");
}

TEST(DerivedEstimate, FrictionVelocityErrorMatchesAMonteCarloOfTheSameData) {
  // u_tau = sqrt(tau_w / rho) by linearisation against the spread of u_tau over 400 independent
  // replications of a skewed, correlated wall shear signal (Monte Carlo; 400 replications measure
  // a standard deviation to about 3.5 %).
  const double rho = 998.0, tau0 = 0.2817;
  double sum = 0.0, sum_sq = 0.0, reported = 0.0;
  const int replications = 400;
  for (int r = 0; r < replications; ++r) {
    const std::vector<double> n = testing::Ar1(1 << 13, 0.8, 700 + r);
    std::string error;
    Statistic s("tau_w", *StatisticFormula::Make(StatisticKind::kMean, {0}, &error));
    for (std::size_t t = 0; t < n.size(); ++t) {
      const double z = n[t] * std::sqrt(1 - 0.64);
      const double tau = tau0 * (1.0 + 0.4 * (z + 0.15 * (z * z - 1.0)));
      s.Add(static_cast<double>(t), &tau);
    }
    EvaluationOptions options;
    options.warmup = WarmupPolicy::kNone;
    const StatisticEstimate u = FrictionVelocity(s.Evaluate(options), rho);
    sum += u.value;
    sum_sq += u.value * u.value;
    reported += u.std_error;
  }
  const double mean = sum / replications;
  const double spread = std::sqrt((sum_sq - replications * mean * mean) / (replications - 1));
  EXPECT_NEAR(mean, std::sqrt(tau0 / rho), 0.002 * std::sqrt(tau0 / rho));
  EXPECT_NEAR(reported / replications, spread, 0.12 * spread);
}

TEST(DerivedEstimate, ReynoldsNumberScalesTheFrictionVelocity) {
  StatisticEstimate u;
  u.value = 0.0168;
  u.std_error = 1e-4;
  u.half_width = 2e-4;
  const StatisticEstimate re = FrictionReynolds(u, 0.025, 1.0e-6);
  EXPECT_NEAR(re.value, 420.0, 1e-9);
  EXPECT_NEAR(re.half_width, 5.0, 1e-9);
  EXPECT_NEAR(re.relative_half_width, 2e-4 / 0.0168, 1e-12);
}

}  // namespace
}  // namespace plateau
