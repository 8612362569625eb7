// How far the block-level estimates drift from the sample-level ones once blocks are merged: for
// 40 AR(1) series of 2^20 samples (phi 0.9) it prints the spread of Geyer's and Sokal's tau and of
// the autocorrelation standard error, at block capacities 4096, 8192 and 16384. The figures behind
// the tolerances of HeavilyMergedSeries in tests/core/estimator_reference_test.cc.
#include <algorithm>
#include <cmath>
#include <cstdio>

#include "core/autocorrelation.h"
#include "core/statistic.h"
#include "tests/core/reference_series.h"

using namespace plateau;

namespace {

void Summarise(const char* what, std::vector<double> ratios) {
  std::sort(ratios.begin(), ratios.end());
  double sum_sq = 0.0;
  for (double r : ratios) sum_sq += (r - 1.0) * (r - 1.0);
  const auto within = std::count_if(ratios.begin(), ratios.end(),
                                    [](double r) { return std::fabs(r - 1.0) < 0.05; });
  std::printf("  %-28s median %.3f  range %.3f .. %.3f  rms deviation %.3f  within 5 %%: %ld/%zu\n",
              what, ratios[ratios.size() / 2], ratios.front(), ratios.back(),
              std::sqrt(sum_sq / ratios.size()), static_cast<long>(within), ratios.size());
}

}  // namespace

int main() {
  for (std::size_t capacity : {4096, 8192, 16384}) {
    std::vector<double> geyer, sokal, se;
    for (int seed = 100; seed < 140; ++seed) {
      const std::vector<double> x = testing::ReferenceAr1(1 << 20, 0.9, seed);
      std::string error;
      Statistic s("x", *StatisticFormula::Make(StatisticKind::kMean, {0}, &error), capacity);
      for (std::size_t t = 0; t < x.size(); ++t) s.Add(static_cast<double>(t), &x[t]);
      EvaluationOptions options;
      options.warmup = WarmupPolicy::kNone;
      const StatisticEstimate e = s.Evaluate(options);
      const AutocorrelationResult r = AnalyseAutocorrelation(x);
      geyer.push_back(e.integrated_time_geyer / (r.sigma2_initial_monotone / r.gamma0));
      sokal.push_back(e.integrated_time_sokal / r.tau_sokal);
      se.push_back(e.se_autocorrelation / std::sqrt(r.sigma2_initial_monotone / x.size()));
    }
    std::printf("capacity %zu blocks (block-level over sample-level, 40 seeds):\n", capacity);
    Summarise("Geyer tau", geyer);
    Summarise("Sokal tau", sokal);
    Summarise("autocorrelation std error", se);
  }
  return 0;
}
