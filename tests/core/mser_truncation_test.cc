#include "core/mser_truncation.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>

#include "core/statistic.h"
#include "tests/core/synthetic_series.h"

namespace plateau {
namespace {

TEST(MserTruncation, StepAtTheStartIsCutExactly) {
  std::vector<double> x(200, 1.0);
  for (int i = 0; i < 30; ++i) x[i] = 10.0;
  EXPECT_EQ(MserTruncation(x), 30);  // after the step every truncation scores zero: the earliest wins
}

TEST(MserTruncation, StationarySeriesIsNotCutMuch) {
  EXPECT_LT(MserTruncation(testing::Ar1(2000, 0.0, 3)), 200);
}

TEST(MserTruncation, NeverCutsMoreThanHalf) {
  std::vector<double> x(100);
  for (int i = 0; i < 100; ++i) x[i] = 100.0 - i;  // a run that is all transient
  EXPECT_LE(MserTruncation(x), 50);
}

// Expected MSER criterion on the batch means of a known transient b(t) plus AR(1) noise (White
// 1997: MSER estimates the minimiser of this expectation):
//   E MSER(d) = [sum_{j >= d} (bbar_j - Bbar_d)^2 + (n - d - 1) v_B] / (n - d)^2,
// with v_B the exact variance of an L-sample mean of AR(1) (Brockwell & Davis 1991, eq. 7.1.1).
double ExpectedMserCutTime(double amplitude, double time_scale, double phi, std::size_t samples,
                           std::size_t batch_length) {
  const std::size_t block_length = batch_length;
  const double gamma0 = 1.0 / (1.0 - phi * phi);
  const double L = static_cast<double>(block_length);
  double weights = 1.0;
  for (std::size_t k = 1; k < block_length; ++k) weights += 2.0 * (1.0 - k / L) * std::pow(phi, k);
  const double v_block = gamma0 / L * weights;
  const std::size_t n = samples / block_length;
  std::vector<double> transient(n, 0.0);
  for (std::size_t t = 0; t < samples; ++t) {
    transient[t / block_length] += amplitude * std::exp(-(t / time_scale)) / L;
  }
  double best = std::numeric_limits<double>::infinity();
  std::size_t best_d = 0;
  for (std::size_t d = 0; d <= n / 2; ++d) {
    double mean = 0.0;
    for (std::size_t j = d; j < n; ++j) mean += transient[j];
    mean /= static_cast<double>(n - d);
    double ss = 0.0;
    for (std::size_t j = d; j < n; ++j) ss += (transient[j] - mean) * (transient[j] - mean);
    const double m = static_cast<double>(n - d);
    const double value = (ss + (m - 1.0) * v_block) / (m * m);
    if (value < best) {
      best = value;
      best_d = d;
    }
  }
  return static_cast<double>(best_d * block_length);
}

// Over 20 noise realisations: the median cut within 10 % of the expected one, and at least 18 of the
// 20 within 20 % (the criterion is flat near its minimum, so single cuts scatter).
TEST(MserTruncation, ExponentialTransientEndIsFoundWithinTwentyPercent) {
  const double phi = 0.5;
  const double sigma = std::sqrt(1.0 / (1.0 - phi * phi));
  const double amplitude = 20.0 * sigma;
  const double time_scale = 1000.0;
  const std::size_t samples = 1 << 16;
  double expected = 0.0;
  std::vector<double> cuts;
  for (int seed = 1; seed <= 20; ++seed) {
    const std::vector<double> noise = testing::Ar1(samples, phi, seed);
    std::string error;
    Statistic statistic("x", *StatisticFormula::Make(StatisticKind::kMean, {0}, &error));
    for (std::size_t t = 0; t < samples; ++t) {
      const double value = noise[t] + amplitude * std::exp(-(t / time_scale));
      statistic.Add(static_cast<double>(t), &value);
    }
    EvaluationOptions mser_alone;  // the expectation is MSER's; the decay fit cuts further on purpose
    mser_alone.warmup_detector = WarmupDetector::kMser;
    const StatisticEstimate e = statistic.Evaluate(mser_alone);
    if (expected == 0.0) {
      ASSERT_GT(e.warmup_batch_length, 0u);
      expected = ExpectedMserCutTime(amplitude, time_scale, phi, samples, e.warmup_batch_length);
      ASSERT_GT(expected, 2.0 * time_scale);
    }
    cuts.push_back(e.warmup_end_time);
  }
  std::sort(cuts.begin(), cuts.end());
  EXPECT_NEAR(0.5 * (cuts[9] + cuts[10]), expected, 0.1 * expected);
  const auto within = std::count_if(cuts.begin(), cuts.end(), [&](double cut) {
    return std::fabs(cut - expected) <= 0.2 * expected;
  });
  EXPECT_GE(within, 18) << "cuts from " << cuts.front() << " to " << cuts.back() << ", expected "
                        << expected;
}

}  // namespace
}  // namespace plateau
