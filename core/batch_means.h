// Batch-means estimates of the variance of a series' mean: non-overlapping batches (Schmeiser 1982)
// and overlapping batches (Meketon & Schmeiser 1984). Pure numerics; stateless.
#ifndef PLATEAU_CORE_BATCH_MEANS_H_
#define PLATEAU_CORE_BATCH_MEANS_H_

#include <vector>

namespace plateau {

struct BatchMeansResult {
  int batches = 0;          // k
  int batch_size = 0;       // values per batch
  double variance_of_mean = 0.0;
};

// Splits the last k * floor(n / k) values into k batches (the oldest remainder, nearest the warm-up,
// is dropped) and returns Var(mean) = sum_j (B_j - Bbar)^2 / (k (k - 1)). Needs k >= 2 and n >= 2k;
// otherwise batches = 0 and the variance is NaN.
BatchMeansResult NonOverlappingBatchMeans(const std::vector<double>& series, int batches);

// Overlapping batch means with batches of `batch_size` values starting at every value:
// sigma^2 = n m / ((n - m + 1)(n - m)) sum_j (Y_j - Ybar)^2 and Var(mean) = sigma^2 / n, where Ybar is
// the mean of all n values (Meketon & Schmeiser 1984, eq. 2). Needs 1 <= m < n; otherwise NaN.
BatchMeansResult OverlappingBatchMeans(const std::vector<double>& series, int batch_size);

// Long-run variance per value (sigma^2 such that Var(mean of n values) ~ sigma^2 / n) of the
// series' second half, by overlapping batch means an eighth of that half long: the noise level of
// a series whose start may still carry a transient. NaN when that half has fewer than 2 values.
double SecondHalfLongRunVariance(const std::vector<double>& series);

}  // namespace plateau

#endif  // PLATEAU_CORE_BATCH_MEANS_H_
