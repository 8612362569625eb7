#include "core/moment_layout.h"

#include <gtest/gtest.h>

#include <cmath>
#include <random>

#include "tests/core/synthetic_series.h"

namespace plateau {
namespace {

using testing::TwoPassCentralMoment;

std::vector<std::vector<double>> CorrelatedSignals(std::size_t n, double offset, double scale) {
  std::vector<std::vector<double>> s(3, std::vector<double>(n));
  std::mt19937_64 rng(7);
  std::normal_distribution<double> normal;
  for (std::size_t t = 0; t < n; ++t) {
    const double a = normal(rng), b = normal(rng), c = normal(rng);
    s[0][t] = offset + scale * a;
    s[1][t] = -2.0 * offset + scale * (0.6 * a + 0.8 * b);
    s[2][t] = 0.5 * offset + scale * (0.3 * a * a + c);  // skewed, for non-zero third moments
  }
  return s;
}

std::vector<double> Summarise(const MomentLayout& layout, const std::vector<std::vector<double>>& s,
                              std::size_t begin, std::size_t end) {
  std::vector<double> summary(layout.stride());
  layout.Clear(summary.data());
  for (std::size_t t = begin; t < end; ++t) {
    double row[3] = {0.0, 0.0, 0.0};
    for (std::size_t k = 0; k < s.size(); ++k) row[k] = s[k][t];
    layout.AddSample(summary.data(), static_cast<double>(t), row);
  }
  return summary;
}

TEST(MomentLayout, MergedChunksEqualTwoPassMomentsToOrderSix) {
  const MomentLayout layout(3, 6);
  const auto signals = CorrelatedSignals(20000, 3.0, 1.0);
  std::vector<double> merged(layout.stride());
  layout.Clear(merged.data());
  std::mt19937_64 rng(11);
  for (std::size_t begin = 0; begin < 20000;) {
    const std::size_t end = std::min<std::size_t>(20000, begin + 1 + rng() % 700);
    const std::vector<double> chunk = Summarise(layout, signals, begin, end);
    layout.Merge(merged.data(), chunk.data(), merged.data());
    begin = end;
  }
  EXPECT_EQ(layout.Count(merged.data()), 20000.0);
  for (const Powers alpha : {Powers{2, 0, 0}, Powers{1, 1, 0}, Powers{0, 1, 1}, Powers{2, 1, 0},
                             Powers{1, 1, 1}, Powers{0, 0, 3}, Powers{4, 0, 0}, Powers{2, 2, 2},
                             Powers{0, 3, 3}}) {
    const double expected = TwoPassCentralMoment(signals, {alpha[0], alpha[1], alpha[2]});
    EXPECT_NEAR(layout.CentralMoment(merged.data(), alpha), expected, 1e-12 * std::fabs(expected))
        << alpha[0] << alpha[1] << alpha[2];
  }
}

TEST(MomentLayout, MeanOfAMillionWithMilliFluctuationKeepsVarianceToSixDigits) {
  // shared/DESIGN.md: a signal of mean 1e6 and fluctuation 1e-3 keeps its variance to 6 significant
  // digits. Raw power sums would lose all of them (1e12 against 1e-6).
  const MomentLayout layout(1, 2);
  const auto signals = CorrelatedSignals(100000, 1e6, 1e-3);
  const std::vector<double> summary = Summarise(layout, {signals[0]}, 0, 100000);
  const double expected = TwoPassCentralMoment({signals[0]}, {2});
  EXPECT_NEAR(layout.CentralMoment(summary.data(), {2, 0, 0}), expected, 1e-6 * expected);
}

// With an offset 1e9 times the fluctuation, the stored mean itself is rounded by ulp(1e6) / 2 ~ 6e-11,
// i.e. 6e-8 of a fluctuation: that bounds any one-pass method in doubles. The requirement is six
// significant digits (shared/DESIGN.md).
TEST(MomentLayout, FourthOrderSurvivesLargeOffsetThroughMerges) {
  const MomentLayout layout(2, 4);
  const auto all = CorrelatedSignals(50000, 1e6, 1e-3);
  const std::vector<std::vector<double>> signals{all[0], all[1]};
  std::vector<double> a = Summarise(layout, signals, 0, 17000);
  const std::vector<double> b = Summarise(layout, signals, 17000, 50000);
  layout.Merge(a.data(), b.data(), a.data());
  for (const Powers alpha : {Powers{2, 0, 0}, Powers{1, 1, 0}, Powers{2, 2, 0}, Powers{0, 4, 0}}) {
    const double expected = TwoPassCentralMoment(signals, {alpha[0], alpha[1]});
    EXPECT_NEAR(layout.CentralMoment(a.data(), alpha), expected, 1e-6 * std::fabs(expected));
  }
}

TEST(MomentLayout, MomentAboutAnotherCentreEqualsDirectSum) {
  const MomentLayout layout(2, 4);
  const auto all = CorrelatedSignals(3000, 2.0, 0.5);
  const std::vector<double> summary = Summarise(layout, {all[0], all[1]}, 0, 3000);
  const double centre[2] = {2.1, -3.9};
  long double direct = 0.0L;
  for (std::size_t t = 0; t < 3000; ++t) {
    direct += (all[0][t] - centre[0]) * (all[0][t] - centre[0]) * (all[1][t] - centre[1]);
  }
  direct /= 3000;
  EXPECT_NEAR(layout.MomentAbout(summary.data(), {2, 1, 0}, centre), static_cast<double>(direct),
              1e-12 * std::fabs(static_cast<double>(direct)));
}

TEST(MomentLayout, MergeWithEmptySummaryIsIdentity) {
  const MomentLayout layout(1, 4);
  const auto all = CorrelatedSignals(100, 1.0, 1.0);
  const std::vector<double> summary = Summarise(layout, {all[0]}, 0, 100);
  std::vector<double> empty(layout.stride());
  layout.Clear(empty.data());
  std::vector<double> out(layout.stride());
  layout.Merge(empty.data(), summary.data(), out.data());
  EXPECT_EQ(out, summary);
  layout.Merge(summary.data(), empty.data(), out.data());
  EXPECT_EQ(out, summary);
  EXPECT_TRUE(std::isnan(layout.CentralMoment(empty.data(), {2, 0, 0})));
}

}  // namespace
}  // namespace plateau
