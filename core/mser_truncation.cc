#include "core/mser_truncation.h"

#include <limits>

namespace plateau {

int MserTruncation(const std::vector<double>& series, double max_fraction) {
  const int n = static_cast<int>(series.size());
  if (n < 4) return 0;
  const int last_candidate = static_cast<int>(max_fraction * n);
  // Suffix accumulation with Welford's update from the end: stable for large offsets.
  double count = 0.0;
  double mean = 0.0;
  double sum_sq = 0.0;
  int best = 0;
  double best_value = std::numeric_limits<double>::infinity();
  for (int d = n - 1; d >= 0; --d) {
    count += 1.0;
    const double delta = series[d] - mean;
    mean += delta / count;
    sum_sq += delta * (series[d] - mean);
    if (d > last_candidate) continue;
    const double value = sum_sq / (count * count);
    if (value <= best_value) {
      best_value = value;
      best = d;
    }
  }
  return best;
}

}  // namespace plateau
