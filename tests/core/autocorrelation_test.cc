#include "core/autocorrelation.h"

#include <gtest/gtest.h>

#include <cmath>

#include "core/statistic.h"
#include "tests/core/synthetic_series.h"

namespace plateau {
namespace {

TEST(Autocorrelation, FftAutocovarianceEqualsDirectSums) {
  const std::vector<double> x = testing::Ar1(1000, 0.7, 21, 5.0);
  const std::vector<double> gamma = Autocovariance(x);
  double mean = 0.0;
  for (double v : x) mean += v;
  mean /= 1000.0;
  for (int k : {0, 1, 7, 50, 999}) {
    double direct = 0.0;
    for (int t = 0; t + k < 1000; ++t) direct += (x[t] - mean) * (x[t + k] - mean);
    EXPECT_NEAR(gamma[k], direct / 1000.0, 1e-12 * gamma[0]) << k;
  }
}

TEST(Autocorrelation, DirectGeyerSumEqualsTheFftOne) {
  for (double phi : {0.0, 0.6, 0.95}) {
    const std::vector<double> x = testing::Ar1(3000, phi, 22, 1.0);
    const AutocorrelationResult r = AnalyseAutocorrelation(x);
    double gamma0 = 0.0;
    EXPECT_NEAR(GeyerInitialMonotoneSigma2(x, &gamma0), r.sigma2_initial_monotone,
                1e-10 * r.sigma2_initial_monotone);
    EXPECT_NEAR(gamma0, r.gamma0, 1e-12 * r.gamma0);
  }
}

// The spread of a sigma^2 estimate over independent replications against its stated degrees of
// freedom: a chi-square with nu degrees of freedom has Var/E^2 = 2/nu (Priestley 1981, Sec. 6.9,
// with the variance at frequency zero twice that elsewhere). Returns (observed Var/E^2) / (2/nu).
template <typename Estimate>
double SpreadOverStatedSpread(Estimate estimate, double phi = 0.5, std::size_t length = 4096) {
  constexpr int kReplications = 400;
  double sum = 0.0, sum_sq = 0.0, sum_dof = 0.0;
  for (int r = 0; r < kReplications; ++r) {
    const std::vector<double> x = testing::Ar1(length, phi, 7000 + r);
    double dof = 0.0;
    const double sigma2 = estimate(x, &dof);
    sum += sigma2;
    sum_sq += sigma2 * sigma2;
    sum_dof += dof;
  }
  const double mean = sum / kReplications;
  const double variance = (sum_sq - kReplications * mean * mean) / (kReplications - 1);
  return (variance / (mean * mean)) / (2.0 / (sum_dof / kReplications));
}

TEST(Autocorrelation, ParzenDegreesOfFreedomMatchTheSpreadOfItsEstimate) {
  // A window of 64 lags on 4096 values: nu = 4096 / (0.539 * 64) = 119. The ratio's own standard
  // error over 400 replications is about 0.07; the formula without the zero-frequency factor of
  // two would give a ratio near 2.
  const double ratio = SpreadOverStatedSpread([](const std::vector<double>& x, double* dof) {
    *dof = ParzenWindowDegreesOfFreedom(static_cast<int>(x.size()), 64);
    return ParzenLagWindowSigma2(AnalyseAutocorrelation(x), 64);
  });
  EXPECT_GT(ratio, 0.75);
  EXPECT_LT(ratio, 1.3);
}

TEST(Autocorrelation, GeyerDegreesOfFreedomAreOnTheSafeSide) {
  // The data choose where Geyer's sum stops, which adds spread beyond a fixed truncation; the
  // stated nu must not overstate how well sigma^2 is known (ratio not above 1 beyond the ratio's
  // own noise of about 0.07), nor be far too cautious. A short, strongly correlated series is the
  // hardest case measured (1.45 times a fixed truncation's spread).
  const auto geyer = [](const std::vector<double>& x, double* dof) {
    const AutocorrelationResult r = AnalyseAutocorrelation(x);
    *dof = GeyerDegreesOfFreedom(r);
    return r.sigma2_initial_monotone;
  };
  for (const auto& [phi, length] : {std::pair<double, std::size_t>{0.5, 4096}, {0.9, 1024}}) {
    const double ratio = SpreadOverStatedSpread(geyer, phi, length);
    EXPECT_GT(ratio, 0.5) << phi;
    EXPECT_LT(ratio, 1.1) << phi;
  }
}

TEST(Autocorrelation, ConstantSeriesHasZeroVarianceAndUnitTau) {
  const AutocorrelationResult r = AnalyseAutocorrelation(std::vector<double>(100, 3.25));
  EXPECT_EQ(r.gamma0, 0.0);
  EXPECT_EQ(r.sigma2_initial_monotone, 0.0);
  EXPECT_EQ(r.tau_sokal, 1.0);
}

TEST(Autocorrelation, Ar1AutocorrelationDecaysAsPhiToTheLag) {
  // rho_k = phi^k for AR(1) (standard result, e.g. Box & Jenkins 1976, eq. 3.2.28).
  const std::vector<double> x = testing::Ar1(1 << 18, 0.8, 4);
  const AutocorrelationResult r = AnalyseAutocorrelation(x);
  for (int k : {1, 2, 5}) EXPECT_NEAR(r.rho[k], std::pow(0.8, k), 0.02) << k;
}

// The asymptotic variance of the mean of AR(1) is sigma_e^2 / (1 - phi)^2 (standard time-series
// result, e.g. Brockwell & Davis 1991, "Time Series: Theory and Methods", Sec. 7.1). Through the
// whole pipeline with the default capacity (blocks merged); measured over 30 seeds the ratio is
// 1.03 +- 0.065 at every phi, so +-20 % is three standard deviations.
class Ar1Theory : public ::testing::TestWithParam<double> {};

TEST_P(Ar1Theory, AsymptoticVarianceOfTheMeanMatches) {
  const double phi = GetParam();
  const std::size_t n = phi > 0.95 ? (1 << 20) : (1 << 18);
  const std::vector<double> x = testing::Ar1(n, phi, 17);
  std::string error;
  Statistic statistic("x", *StatisticFormula::Make(StatisticKind::kMean, {0}, &error));
  for (std::size_t t = 0; t < n; ++t) statistic.Add(static_cast<double>(t), &x[t]);
  const StatisticEstimate e = statistic.Evaluate(EvaluationOptions());
  ASSERT_EQ(e.state, EstimateState::kEstimated);
  const double theory = 1.0 / ((1.0 - phi) * (1.0 - phi));
  EXPECT_NEAR(e.samples_used * e.std_error * e.std_error, theory, 0.2 * theory);
  EXPECT_NEAR(e.integrated_time, (1.0 + phi) / (1.0 - phi), 0.2 * (1.0 + phi) / (1.0 - phi));
}

INSTANTIATE_TEST_SUITE_P(Phis, Ar1Theory, ::testing::Values(0.0, 0.5, 0.9, 0.99));

TEST(Autocorrelation, ToneOnNoiseIsReportedAsOscillatingWithItsPeriod) {
  const std::vector<double> x = testing::SinePlusAr1(1 << 14, 40.0, 3.0, 0.5, 9);
  const AutocorrelationResult r = AnalyseAutocorrelation(x);
  EXPECT_NEAR(r.oscillation_period, 40, 2);
}

TEST(Autocorrelation, Ar1IsAlmostNeverMistakenForOscillation) {
  int flagged = 0;
  for (int seed = 0; seed < 100; ++seed) {
    flagged += AnalyseAutocorrelation(testing::Ar1(4096, 0.9, 1000 + seed)).oscillation_period > 0;
  }
  EXPECT_LE(flagged, 2);
}

TEST(Autocorrelation, ParzenWindowRemovesTheToneThatGeyerCounts) {
  // Exact asymptotic variance of the mean is the noise's alone (a tone has no power at frequency
  // zero): sigma_e^2 / (1 - phi)^2 = 4. Geyer's sum stops inside the first lobe and counts the tone.
  const std::vector<double> x = testing::SinePlusAr1(1 << 18, 40.0, 3.0, 0.5, 10);
  const AutocorrelationResult r = AnalyseAutocorrelation(x);
  EXPECT_NEAR(ParzenLagWindowSigma2(r, 4000), 4.0, 0.6);
  EXPECT_GT(r.sigma2_initial_monotone, 8.0);
}

}  // namespace
}  // namespace plateau
