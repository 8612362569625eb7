#include "core/bridge_test_truncation.h"

#include <algorithm>
#include <cmath>

#include "core/batch_means.h"

namespace plateau {

double BridgeCramerVonMises(const std::vector<double>& series, double long_run_variance) {
  const std::size_t n = series.size();
  if (n == 0 || !(long_run_variance > 0.0)) return 0.0;
  double mean = 0.0;
  for (double y : series) mean += y;
  mean /= static_cast<double>(n);
  const double scale = std::sqrt(static_cast<double>(n) * long_run_variance);
  double partial = 0.0, sum_sq = 0.0;
  for (std::size_t k = 0; k < n; ++k) {
    partial += series[k] - mean;
    const double bridge = partial / scale;
    sum_sq += bridge * bridge;
  }
  return sum_sq / static_cast<double>(n);
}

int BridgeTestTruncation(const std::vector<double>& series, int floor_cut, double max_fraction) {
  const int n = static_cast<int>(series.size());
  if (n < 16) return floor_cut;
  const int step = std::max(1, n / 10);
  const int last_candidate = static_cast<int>(max_fraction * n);
  int cut = floor_cut;
  for (; cut < last_candidate; cut += step) {
    const std::vector<double> rest(series.begin() + cut, series.end());
    if (BridgeCramerVonMises(rest, SecondHalfLongRunVariance(rest)) <= kCramerVonMises95) return cut;
  }
  return std::max(floor_cut, last_candidate);
}

}  // namespace plateau
