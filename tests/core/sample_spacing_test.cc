// Time weighting: weighted block summaries, the weighting choice, gaps, and the numbers against
// numpy's weighted average (fixtures/make_weighted_moments.py).
#include <gtest/gtest.h>

#include <cmath>
#include <fstream>
#include <map>
#include <random>
#include <sstream>
#include <string>
#include <vector>

#include "core/block_history.h"
#include "core/sample_spacing.h"
#include "core/source_statistics.h"
#include "core/statistic.h"
#include "tests/core/synthetic_series.h"

namespace plateau {
namespace {

void ExpectRelative(double actual, double expected, double tolerance, const std::string& what) {
  EXPECT_LE(std::fabs(actual - expected), tolerance * std::fabs(expected))
      << what << ": " << actual << " vs " << expected;
}

SourceStatistics MakeSource(const std::vector<std::string>& columns,
                            const std::vector<StatisticRequest>& requests, Weighting weighting) {
  Result<SourceStatistics> source = SourceStatistics::Make(columns, "", requests, 4096);
  EXPECT_TRUE(source.ok()) << source.error();
  EXPECT_TRUE(source->SetWeighting(weighting));
  return std::move(source).value();
}

EvaluationOptions NoWarmup() {
  EvaluationOptions options;
  options.warmup = WarmupPolicy::kNone;
  return options;
}

// Weighted summaries merged block by block against one weighted pass over the samples: Pébay
// (2008)'s merge formulas hold for real weights, so the two agree to rounding.
TEST(SampleSpacing, WeightedMergingEqualsOneWeightedPass) {
  BlockHistory history(MomentLayout(2, 4), 8);  // a small capacity: many splits and merges
  std::mt19937_64 rng(7);
  std::uniform_real_distribution<double> weight_of(0.3, 3.7);
  std::normal_distribution<double> normal(0.0, 1.0);
  std::vector<double> x, y, w;
  for (int i = 0; i < 5000; ++i) {
    const double a = 3.0 + normal(rng);
    const double b = -1.0 + 0.5 * a + normal(rng);
    x.push_back(a);
    y.push_back(b);
    w.push_back(weight_of(rng));
    const double values[2] = {a, b};
    history.Add(static_cast<double>(i), values, w.back());
  }
  const MomentLayout& layout = history.layout();
  for (std::size_t b = 0; b < history.block_count(); ++b) {
    ExpectRelative(layout.Count(history.block(b)), static_cast<double>(history.block_length()),
                   1e-12, "weight of block " + std::to_string(b));
  }
  std::vector<double> all(layout.stride());
  layout.Clear(all.data());
  for (std::size_t b = 0; b < history.block_count(); ++b) {
    layout.Merge(all.data(), history.block(b), all.data());
  }
  layout.Merge(all.data(), history.open_block(), all.data());

  double total = 0, mx = 0, my = 0;
  for (std::size_t i = 0; i < x.size(); ++i) {
    total += w[i];
    mx += w[i] * x[i];
    my += w[i] * y[i];
  }
  mx /= total;
  my /= total;
  const auto moment = [&](int px, int py) {
    double sum = 0;
    for (std::size_t i = 0; i < x.size(); ++i) {
      sum += w[i] * std::pow(x[i] - mx, px) * std::pow(y[i] - my, py);
    }
    return sum / total;
  };
  ExpectRelative(layout.Count(all.data()), total, 1e-12, "total weight");
  ExpectRelative(layout.Mean(all.data(), 0), mx, 1e-12, "weighted mean of x");
  ExpectRelative(layout.Mean(all.data(), 1), my, 1e-12, "weighted mean of y");
  ExpectRelative(layout.CentralMoment(all.data(), {2, 0, 0}), moment(2, 0), 1e-12, "var x");
  ExpectRelative(layout.CentralMoment(all.data(), {1, 1, 0}), moment(1, 1), 1e-12, "cov xy");
  ExpectRelative(layout.CentralMoment(all.data(), {2, 1, 0}), moment(2, 1), 1e-10, "m21");
  ExpectRelative(layout.CentralMoment(all.data(), {2, 2, 0}), moment(2, 2), 1e-12, "m22");
}

// numpy.average with weights on a probe file whose step follows a Courant-like rule
// (fixtures/make_weighted_moments.py made both files).
TEST(SampleSpacing, TimeWeightedMomentsEqualNumpysWeightedAverage) {
  std::map<std::string, double> expected;
  std::ifstream table(PLATEAU_TEST_DATA_DIR "/core/fixtures/weighted_moments_expected.tsv");
  for (std::string line; std::getline(table, line);) {
    if (line.empty() || line[0] == '#') continue;
    std::istringstream fields(line);
    std::string name;
    double value;
    fields >> name >> value;
    expected[name] = value;
  }
  ASSERT_EQ(expected.size(), 5u);
  const std::vector<StatisticRequest> requests = {
      MakeRequest(StatisticKind::kMean, {"u"}), MakeRequest(StatisticKind::kVariance, {"u"}),
      MakeRequest(StatisticKind::kCovariance, {"u", "v"})};
  SourceStatistics timed = MakeSource({"Time", "u", "v"}, requests, Weighting::kAuto);
  SourceStatistics counted = MakeSource({"Time", "u", "v"}, requests, Weighting::kSamples);
  std::ifstream data(PLATEAU_TEST_DATA_DIR "/core/fixtures/weighted_moments.dat");
  for (std::string line; std::getline(data, line);) {
    if (line.empty() || line[0] == '#') continue;
    std::istringstream fields(line);
    double row[3];
    fields >> row[0] >> row[1] >> row[2];
    timed.Add(row);
    counted.Add(row);
  }
  ASSERT_TRUE(timed.spacing().decided());
  EXPECT_TRUE(timed.spacing().time_weighted()) << timed.spacing().Describe();
  EXPECT_EQ(timed.spacing().unit_time(), expected["cell"]);
  EXPECT_EQ(timed.spacing().gap_count(), 0u);
  const EvaluationOptions options = NoWarmup();
  ExpectRelative(timed.statistics()[0].Evaluate(options).value, expected["mean_u"], 1e-12, "mean");
  ExpectRelative(timed.statistics()[1].Evaluate(options).value, expected["variance_u"], 1e-12,
                 "variance");
  ExpectRelative(timed.statistics()[2].Evaluate(options).value, expected["covariance_uv"], 1e-12,
                 "covariance");
  // Counted once each, the samples give numpy's plain mean, 2.6 % higher: the bias weighting removes.
  const double sample_mean = counted.statistics()[0].Evaluate(options).value;
  ExpectRelative(sample_mean, expected["sample_mean_u"], 1e-12, "sample mean");
  EXPECT_GT(std::fabs(sample_mean - expected["mean_u"]), 0.02 * expected["mean_u"]);
}

std::vector<double> EvenTimes(std::size_t n) {
  std::vector<double> t(n);
  for (std::size_t i = 0; i < n; ++i) t[i] = 1.0 + 0.002 * static_cast<double>(i);  // decimal
  return t;
}

// Evenly spaced runs: the automatic choice counts each sample once, and every number is the one an
// unweighted statistic gives, bit for bit.
TEST(SampleSpacing, EvenSpacingKeepsEveryNumberOfTheUnweightedStatistic) {
  // Not a power of two: at 2^15 samples an unweighted history merges its blocks, and a weighted
  // one whose total weight is 2^15 less a rounding would not yet, giving other (equally valid)
  // batches.
  const std::size_t n = 30000;
  const std::vector<double> x = testing::Ar1(n, 0.95, 11, 4.0);
  const std::vector<double> t = EvenTimes(n);
  SourceStatistics automatic = MakeSource({"t", "x"}, {MakeRequest(StatisticKind::kMean, {"x"})},
                                          Weighting::kAuto);
  SourceStatistics timed = MakeSource({"t", "x"}, {MakeRequest(StatisticKind::kMean, {"x"})},
                                      Weighting::kTime);
  std::string error;
  Statistic plain("x", *StatisticFormula::Make(StatisticKind::kMean, {0}, &error));
  for (std::size_t i = 0; i < n; ++i) {
    const double row[2] = {t[i], x[i]};
    automatic.Add(row);
    timed.Add(row);
    plain.Add(t[i], &x[i]);
  }
  EXPECT_FALSE(automatic.spacing().time_weighted());
  EXPECT_FALSE(automatic.spacing().varies());
  const StatisticEstimate today = plain.Evaluate(EvaluationOptions());
  const StatisticEstimate a = automatic.statistics()[0].Evaluate(EvaluationOptions());
  EXPECT_EQ(a.value, today.value);
  EXPECT_EQ(a.half_width, today.half_width);
  EXPECT_EQ(a.integrated_time, today.integrated_time);
  EXPECT_EQ(a.warmup_end_time, today.warmup_end_time);
  // Weighted by time on purpose, the same run gives the same numbers to the rounding of the
  // printed times: each step t_i - t_{i-1} of times near 66 carries ~1e-11 of relative rounding.
  const StatisticEstimate w = timed.statistics()[0].Evaluate(EvaluationOptions());
  EXPECT_TRUE(timed.spacing().time_weighted());
  ExpectRelative(w.value, today.value, 1e-12, "value");
  ExpectRelative(w.half_width, today.half_width, 1e-9, "half-width");
  ExpectRelative(w.integrated_time, today.integrated_time, 1e-9, "integrated time");
  EXPECT_EQ(w.warmup_end_time, today.warmup_end_time);
}

// A solver paused for 100 steps: the sample after the pause stands for 5 median steps, not 100,
// and the gap is reported with its times.
TEST(SampleSpacing, GapOfAHundredStepsIsCappedAndReported) {
  SourceStatistics source = MakeSource({"t", "x"}, {MakeRequest(StatisticKind::kMean, {"x"})},
                                       Weighting::kTime);
  double time = 0.0;
  for (int i = 0; i < 400; ++i) {
    if (i == 200) time += 100 * 0.01;  // the pause: the next row comes 100 steps later
    const double row[2] = {time, i < 200 ? 1.0 : 3.0};
    source.Add(row);
    time += 0.01;
  }
  EXPECT_EQ(source.spacing().gap_count(), 1u);
  ASSERT_EQ(source.spacing().gaps().size(), 1u);
  EXPECT_NEAR(source.spacing().gaps()[0].from, 1.99, 1e-9);
  EXPECT_NEAR(source.spacing().gaps()[0].to, 3.00, 1e-9);
  EXPECT_NE(source.spacing().Describe().find("1 gap"), std::string::npos)
      << source.spacing().Describe();
  const StatisticEstimate e = source.statistics()[0].Evaluate(NoWarmup());
  // Weights: 200 of 1 before, 5 for the sample after the gap, 199 of 1 after (cells of 0.01).
  EXPECT_NEAR(e.value, (200.0 * 1.0 + 204.0 * 3.0) / 404.0, 1e-9);
  EXPECT_NEAR(static_cast<double>(e.samples_used), 404.0, 1.0);
}

TEST(SampleSpacing, AutomaticChoiceWeighsByTimeWhenTheStepVariesAndSaysWhy) {
  SampleSpacing even;
  even.Decide({0.0, 0.1, 0.2, 0.30000001, 0.4});  // jitter of printed times: not a varying step
  EXPECT_FALSE(even.time_weighted());
  SampleSpacing varying;
  varying.Decide({0.0, 0.1, 0.21, 0.30, 0.42});
  EXPECT_TRUE(varying.time_weighted());
  varying.Next(0.0);
  varying.Next(0.1);
  varying.Next(0.21);
  EXPECT_NE(varying.Describe().find("by simulated time"), std::string::npos) << varying.Describe();
  // Counted per sample although the step later varies: said, with what to do.
  SampleSpacing counted(Weighting::kSamples);
  for (double t : {0.0, 0.1, 0.2, 0.3, 0.35, 0.4}) counted.Next(t);
  EXPECT_TRUE(counted.varies());
  EXPECT_NE(counted.Describe().find("set weighting: time"), std::string::npos)
      << counted.Describe();
  // One step twice as long (a bad line skipped) among even ones is no varying step: found in the
  // demo, whose probe file carries a deliberately broken line.
  SampleSpacing one_odd_step(Weighting::kSamples);
  for (int i = 0; i <= 300; ++i) {
    if (i != 150) one_odd_step.Next(0.002 * i);
  }
  EXPECT_FALSE(one_odd_step.varies()) << one_odd_step.Describe();
  EXPECT_EQ(one_odd_step.Describe().find("set weighting"), std::string::npos)
      << one_odd_step.Describe();
}

// A checkpoint taken while rows are held back (the weighting not chosen yet) and one taken after:
// resumed, the numbers equal an uninterrupted run's.
TEST(SampleSpacing, WeightingStateRoundTripsWithTheRowsHeldBack) {
  const std::vector<StatisticRequest> requests = {MakeRequest(StatisticKind::kMean, {"x"})};
  const std::vector<double> x = testing::Ar1(3000, 0.9, 5, 1.0);
  const auto time_of = [](std::size_t i) { return 0.5 * std::sqrt(static_cast<double>(i)); };
  SourceStatistics whole = MakeSource({"t", "x"}, requests, Weighting::kAuto);
  for (std::size_t i = 0; i < x.size(); ++i) {
    const double row[2] = {time_of(i), x[i]};
    whole.Add(row);
  }
  for (const std::size_t stop : {std::size_t{10}, std::size_t{1000}}) {
    SourceStatistics first = MakeSource({"t", "x"}, requests, Weighting::kAuto);
    for (std::size_t i = 0; i < stop; ++i) {
      const double row[2] = {time_of(i), x[i]};
      first.Add(row);
    }
    // Made as a changed config would make it: the saved weighting goes on, its estimates use it.
    SourceStatistics resumed = MakeSource({"t", "x"}, requests, Weighting::kSamples);
    ASSERT_TRUE(resumed.RestoreWeightingState(first.SaveWeightingState()));
    EXPECT_EQ(resumed.spacing().requested(), Weighting::kAuto);
    ASSERT_TRUE(resumed.histories()[0].history->RestoreState(
        first.histories()[0].history->SaveState()));
    resumed.gate().Resume(first.gate().last_time(), first.gate().skipped());
    for (std::size_t i = stop; i < x.size(); ++i) {
      const double row[2] = {time_of(i), x[i]};
      resumed.Add(row);
    }
    EXPECT_TRUE(resumed.spacing().time_weighted());
    EXPECT_EQ(resumed.statistics()[0].Evaluate(EvaluationOptions()).value,
              whole.statistics()[0].Evaluate(EvaluationOptions()).value)
        << "stopped after " << stop << " rows";
  }
  SourceStatistics other = MakeSource({"t", "x", "y"}, {}, Weighting::kAuto);
  SourceStatistics held = MakeSource({"t", "x"}, requests, Weighting::kAuto);
  const double row[2] = {0.0, 1.0};
  held.Add(row);
  EXPECT_FALSE(other.RestoreWeightingState(held.SaveWeightingState()));  // rows of another width
}

}  // namespace
}  // namespace plateau
