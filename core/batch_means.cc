#include "core/batch_means.h"

#include <algorithm>
#include <cmath>
#include <limits>

namespace plateau {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

}  // namespace

BatchMeansResult NonOverlappingBatchMeans(const std::vector<double>& series, int batches) {
  BatchMeansResult r;
  const int n = static_cast<int>(series.size());
  if (batches < 2 || n < 2 * batches) {
    r.variance_of_mean = kNaN;
    return r;
  }
  const int size = n / batches;
  const int skip = n - size * batches;
  std::vector<double> means(batches, 0.0);
  double grand = 0.0;
  for (int j = 0; j < batches; ++j) {
    double sum = 0.0;
    for (int i = 0; i < size; ++i) sum += series[skip + j * size + i];
    means[j] = sum / size;
    grand += means[j];
  }
  grand /= batches;
  double sum_sq = 0.0;
  for (double m : means) sum_sq += (m - grand) * (m - grand);
  r.batches = batches;
  r.batch_size = size;
  r.variance_of_mean = sum_sq / (static_cast<double>(batches) * (batches - 1));
  return r;
}

BatchMeansResult OverlappingBatchMeans(const std::vector<double>& series, int batch_size) {
  BatchMeansResult r;
  const int n = static_cast<int>(series.size());
  const int m = batch_size;
  if (m < 1 || m >= n) {
    r.variance_of_mean = kNaN;
    return r;
  }
  double mean = 0.0;
  for (double v : series) mean += v;
  mean /= n;
  // Sliding sums of deviations from the mean: no cancellation from large offsets.
  double window = 0.0;
  for (int i = 0; i < m; ++i) window += series[i] - mean;
  double sum_sq = 0.0;
  for (int j = 0;; ++j) {
    const double batch_deviation = window / m;
    sum_sq += batch_deviation * batch_deviation;
    if (j + m >= n) break;
    window += (series[j + m] - mean) - (series[j] - mean);
  }
  const double sigma2 = static_cast<double>(n) * m / ((n - m + 1.0) * (n - m)) * sum_sq;
  r.batches = n - m + 1;
  r.batch_size = m;
  r.variance_of_mean = sigma2 / n;
  return r;
}

BatchMeansResult LugsailBatchMeans(const std::vector<double>& series, int batch_size) {
  constexpr int kRatio = 3;  // r
  BatchMeansResult r;
  const int shorter = static_cast<int>(std::lround(static_cast<double>(batch_size) / kRatio));
  if (shorter < 1 || batch_size >= static_cast<int>(series.size())) {
    r.variance_of_mean = kNaN;
    return r;
  }
  const double c = static_cast<double>(shorter) / batch_size;
  r = OverlappingBatchMeans(series, batch_size);
  const double short_variance = OverlappingBatchMeans(series, shorter).variance_of_mean;
  r.variance_of_mean = (r.variance_of_mean - c * short_variance) / (1.0 - c);
  return r;
}

double LugsailDegreesOfFreedom(int batches) {
  constexpr double r = 3.0;
  constexpr double c = 1.0 / r;
  const double inflation = (1.0 + c * c / r - 2.0 * c / r) / ((1.0 - c) * (1.0 - c));
  return 1.5 * (batches - 1.0) / inflation;
}

double SecondHalfLongRunVariance(const std::vector<double>& series) {
  const std::vector<double> tail(series.begin() + static_cast<long>(series.size() / 2), series.end());
  const int batch = std::max(1, static_cast<int>(tail.size() / 8));
  const BatchMeansResult obm = OverlappingBatchMeans(tail, batch);
  return obm.variance_of_mean * static_cast<double>(tail.size());
}

}  // namespace plateau
