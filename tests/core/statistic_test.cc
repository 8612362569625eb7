#include "core/statistic.h"

#include <gtest/gtest.h>

#include <cmath>
#include <random>

#include "tests/core/synthetic_series.h"

namespace plateau {
namespace {

Statistic Make(StatisticKind kind, std::vector<int> columns,
               std::size_t capacity = BlockHistory::kDefaultCapacity) {
  std::string error;
  auto formula = StatisticFormula::Make(kind, std::move(columns), &error);
  EXPECT_TRUE(formula.has_value()) << error;
  return Statistic("s", *formula, capacity);
}

void Feed(Statistic& s, const std::vector<std::vector<double>>& columns) {
  std::vector<double> row(columns.size());
  for (std::size_t t = 0; t < columns[0].size(); ++t) {
    for (std::size_t c = 0; c < columns.size(); ++c) row[c] = columns[c][t];
    s.Add(static_cast<double>(t), row.data());
  }
}

TEST(StatisticFormula, WrongColumnCountIsRefusedWithAReason) {
  std::string error;
  EXPECT_FALSE(StatisticFormula::Make(StatisticKind::kCovariance, {0}, &error).has_value());
  EXPECT_EQ(error, "covariance takes 2 columns, got 1");
}

TEST(Statistic, VarianceStandardErrorMatchesBartlettForGaussianAr1) {
  // For a Gaussian process Var(sample variance) ~ (2 gamma0^2 / N)(1 + 2 sum rho_k^2), which for
  // AR(1) is (2 gamma0^2 / N)(1 + phi^2)/(1 - phi^2) (Bartlett 1946; Priestley 1981, eq. 5.3.22).
  const double phi = 0.5;
  const std::size_t n = 1 << 18;
  Statistic s = Make(StatisticKind::kVariance, {0});
  Feed(s, {testing::Ar1(n, phi, 31)});
  const StatisticEstimate e = s.Evaluate(EvaluationOptions());
  ASSERT_EQ(e.state, EstimateState::kEstimated);
  const double gamma0 = 1.0 / (1.0 - phi * phi);
  EXPECT_NEAR(e.value, gamma0, 0.02 * gamma0);
  const double theory = std::sqrt(2.0 * gamma0 * gamma0 / n * (1 + phi * phi) / (1 - phi * phi));
  EXPECT_NEAR(e.std_error, theory, 0.15 * theory);
}

TEST(Statistic, RmsErrorIsTheVarianceErrorOverTwiceTheRms) {
  // Delta method: d sqrt(v) = dv / (2 sqrt(v)); both statistics see the same samples.
  const std::vector<double> x = testing::Ar1(50000, 0.8, 5, 2.0);
  Statistic variance = Make(StatisticKind::kVariance, {0});
  Statistic rms = Make(StatisticKind::kRms, {0});
  Feed(variance, {x});
  Feed(rms, {x});
  EvaluationOptions options;
  options.warmup = WarmupPolicy::kNone;  // MSER could cut the two at different blocks
  const StatisticEstimate v = variance.Evaluate(options);
  const StatisticEstimate r = rms.Evaluate(options);
  EXPECT_NEAR(r.value, std::sqrt(v.value), 1e-12);
  EXPECT_NEAR(r.se_autocorrelation, v.se_autocorrelation / (2.0 * r.value), 1e-9 * r.value);
  EXPECT_NEAR(r.integrated_time_geyer, v.integrated_time_geyer, 1e-9 * v.integrated_time_geyer);
}

// Three correlated, skewed AR(1)-driven signals: u, v = -0.4 u + ..., w with a quadratic part, so
// that covariances and third moments are all non-zero.
std::vector<std::vector<double>> Velocities(std::size_t n, std::uint64_t seed) {
  const std::vector<double> a = testing::Ar1(n, 0.8, seed);
  const std::vector<double> b = testing::Ar1(n, 0.6, seed + 7919);
  const std::vector<double> c = testing::Ar1(n, 0.7, seed + 104729);
  std::vector<std::vector<double>> u(3, std::vector<double>(n));
  for (std::size_t t = 0; t < n; ++t) {
    u[0][t] = 1.0 + a[t] + 0.2 * (a[t] * a[t] - 2.8);
    u[1][t] = -0.4 * a[t] + b[t];
    u[2][t] = c[t] + 0.3 * a[t] * b[t];
  }
  return u;
}

// The linearised standard error of each kind against the spread of the statistic over independent
// replications (Monte Carlo; 300 replications measure a standard deviation to about 4 %).
class LinearisedErrorMonteCarlo
    : public ::testing::TestWithParam<std::pair<StatisticKind, std::vector<int>>> {};

TEST_P(LinearisedErrorMonteCarlo, ReportedErrorMatchesTheSpreadOverReplications) {
  const auto& [kind, columns] = GetParam();
  const int replications = 300;
  double sum = 0.0, sum_sq = 0.0, reported = 0.0;
  for (int r = 0; r < replications; ++r) {
    Statistic s = Make(kind, columns);
    Feed(s, Velocities(1 << 13, 1000 + r));
    EvaluationOptions options;
    options.warmup = WarmupPolicy::kNone;
    const StatisticEstimate e = s.Evaluate(options);
    ASSERT_EQ(e.state, EstimateState::kEstimated);
    sum += e.value;
    sum_sq += e.value * e.value;
    reported += e.std_error;
  }
  const double mean = sum / replications;
  const double spread = std::sqrt((sum_sq - replications * mean * mean) / (replications - 1));
  EXPECT_NEAR(reported / replications, spread, 0.12 * spread) << KindName(kind);
}

INSTANTIATE_TEST_SUITE_P(
    Kinds, LinearisedErrorMonteCarlo,
    ::testing::Values(std::make_pair(StatisticKind::kMean, std::vector<int>{0}),
                      std::make_pair(StatisticKind::kVariance, std::vector<int>{0}),
                      std::make_pair(StatisticKind::kRms, std::vector<int>{1}),
                      std::make_pair(StatisticKind::kCovariance, std::vector<int>{0, 1}),
                      std::make_pair(StatisticKind::kThirdMoment, std::vector<int>{0, 0, 1}),
                      std::make_pair(StatisticKind::kThirdMoment, std::vector<int>{0, 1, 2}),
                      std::make_pair(StatisticKind::kTke, std::vector<int>{0, 1, 2})),
    [](const auto& info) {
      std::string name(KindName(info.param.first));
      for (int c : info.param.second) name += "_" + std::to_string(c);
      return name;
    });

TEST(Statistic, NoSamplesIsNoDataNotANumber) {
  const StatisticEstimate e = Make(StatisticKind::kMean, {0}).Evaluate(EvaluationOptions());
  EXPECT_EQ(e.state, EstimateState::kNoData);
  EXPECT_EQ(e.state_reason, "no samples yet");
}

TEST(Statistic, FewSamplesGiveAValueButNoInterval) {
  Statistic s = Make(StatisticKind::kMean, {0});
  Feed(s, {testing::Ar1(30, 0.5, 1, 7.0)});
  const StatisticEstimate e = s.Evaluate(EvaluationOptions());
  EXPECT_EQ(e.state, EstimateState::kNotEnoughData);
  EXPECT_FALSE(std::isnan(e.value));
  EXPECT_TRUE(std::isnan(e.half_width));
  EXPECT_NE(e.state_reason.find("only 30 samples"), std::string::npos);
}

TEST(Statistic, FixedWarmupTimeDiscardsEarlierSamples) {
  Statistic s = Make(StatisticKind::kMean, {0});
  Feed(s, {testing::Ar1(10000, 0.5, 2)});
  EvaluationOptions options;
  options.warmup = WarmupPolicy::kFixedTime;
  options.warmup_time = 2500.0;
  const StatisticEstimate e = s.Evaluate(options);
  EXPECT_EQ(e.warmup_end_time, 2500.0);
  EXPECT_EQ(e.samples_used, 7500u);
}

TEST(Statistic, AutomaticWarmupRemovesTheStartupBias) {
  std::vector<double> x = testing::Ar1(1 << 16, 0.9, 3, 10.0);
  for (std::size_t t = 0; t < x.size(); ++t) x[t] -= 40.0 * std::exp(-(t / 2000.0));
  Statistic s = Make(StatisticKind::kMean, {0});
  Feed(s, {x});
  EvaluationOptions none;
  none.warmup = WarmupPolicy::kNone;
  const StatisticEstimate biased = s.Evaluate(none);
  const StatisticEstimate cut = s.Evaluate(EvaluationOptions());
  // Kept, the transient shifts the mean by 40 * 2000 / 65536 = 1.2 (and inflates its interval).
  EXPECT_GT(std::fabs(biased.value - 10.0), 1.0);
  EXPECT_LT(cut.half_width, 0.5);
  EXPECT_LT(std::fabs(cut.value - 10.0), 3.0 * cut.half_width);
  EXPECT_GT(cut.warmup_end_time, 4000.0);
}

TEST(Statistic, DriftingMeanIsReportedAsDrifting) {
  std::vector<double> x = testing::Ar1(1 << 15, 0.5, 4);
  for (std::size_t t = 0; t < x.size(); ++t) x[t] += 1.0 * t / x.size();
  Statistic s = Make(StatisticKind::kMean, {0});
  Feed(s, {x});
  const StatisticEstimate e = s.Evaluate(EvaluationOptions());
  EXPECT_TRUE(e.drift_detected);
  ASSERT_FALSE(e.warnings.empty());
  EXPECT_NE(e.warnings.back().find("still drifting"), std::string::npos);
}

TEST(Statistic, ConstantSignalHasZeroErrorAndNoNaN) {
  Statistic s = Make(StatisticKind::kMean, {0});
  Feed(s, {std::vector<double>(5000, 0.125)});
  const StatisticEstimate e = s.Evaluate(EvaluationOptions());
  EXPECT_EQ(e.value, 0.125);
  EXPECT_EQ(e.half_width, 0.0);
  EXPECT_FALSE(std::isnan(e.integrated_time));
}

TEST(Statistic, VeryLongCorrelationMakesBatchesTooShortAndSaysSo) {
  Statistic s = Make(StatisticKind::kMean, {0});
  Feed(s, {testing::Ar1(1 << 15, 0.99, 6)});
  const StatisticEstimate e = s.Evaluate(EvaluationOptions());
  EXPECT_TRUE(e.decision.batches_too_short);
  EXPECT_EQ(e.decision.estimator, Estimator::kAutocorrelation);
}

TEST(Statistic, VortexSheddingSignalIsDecidedByTheLagWindow) {
  Statistic s = Make(StatisticKind::kMean, {0});
  Feed(s, {testing::SinePlusAr1(1 << 15, 40.0, 3.0, 0.9, 7)});
  const StatisticEstimate e = s.Evaluate(EvaluationOptions());
  EXPECT_TRUE(e.decision.periodic);
  EXPECT_EQ(e.decision.estimator, Estimator::kLagWindow);
}

TEST(Statistic, AnAverageOverFewOscillationCyclesSaysSo) {
  // A mean over 82 cycles of period 400: no note. Over 15 cycles of period 2000: the note, with
  // the count (the rule of tens of cycles is common practice). Counted in periods of the
  // statistic's own oscillation, which for a mean is the signal's.
  Statistic many = Make(StatisticKind::kMean, {0});
  Feed(many, {testing::SinePlusAr1(1 << 15, 400.0, 3.0, 0.5, 7)});
  const StatisticEstimate e = many.Evaluate(EvaluationOptions());
  EXPECT_NEAR(e.oscillation_cycles, static_cast<double>(e.samples_used) / 400.0,
              0.05 * e.oscillation_cycles);
  for (const std::string& w : e.warnings) EXPECT_EQ(w.find("periods of its oscillation"), std::string::npos) << w;

  Statistic few = Make(StatisticKind::kMean, {0});
  Feed(few, {testing::SinePlusAr1(30000, 2000.0, 3.0, 0.5, 8)});
  const StatisticEstimate f = few.Evaluate(EvaluationOptions());
  ASSERT_GT(f.oscillation_period, 0.0);
  EXPECT_LT(f.oscillation_cycles, Statistic::kMinimumCycles);
  bool noted = false;
  for (const std::string& w : f.warnings) noted = noted || w.find("periods of its oscillation") != std::string::npos;
  EXPECT_TRUE(noted) << f.oscillation_cycles;
}

}  // namespace
}  // namespace plateau
