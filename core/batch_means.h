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

// Lugsail batch means (Vats & Flegal 2021, "Lugsail lag windows for estimating time-average
// covariance matrices", Biometrika 109): sigma^2_L = (sigma^2_b - c sigma^2_s) / (1 - c) from
// overlapping batch means of b = `batch_size` values and of s = round(b / 3). Batch means are biased
// low by about K / b (K the sum of |lag| times the autocovariance); with c = s / b that first-order
// bias cancels (the lugsail's "flat-top" choice c = 1 / r), leaving O(1 / b^2). The price is a
// noisier estimate: LugsailDegreesOfFreedom. Needs 3 <= b < n; otherwise NaN.
BatchMeansResult LugsailBatchMeans(const std::vector<double>& series, int batch_size);

// Equivalent degrees of freedom 2 E[v]^2 / Var(v) of the lugsail estimate v on `batches` batches
// of b values: those of overlapping batch means, 1.5 (k - 1), divided by the variance the
// correction adds, (1 / (1 - c))^2 (1 + c^2 / r - 2 c / r) with r = 3, c = 1 / 3 (1.83; from the
// covariance of two batch-means variances on nested batches of Gaussian batch means, derived for
// this project and checked against replications in tests/core/batch_means_test.cc).
double LugsailDegreesOfFreedom(int batches);

// Long-run variance per value (sigma^2 such that Var(mean of n values) ~ sigma^2 / n) of the
// series' second half, by overlapping batch means an eighth of that half long: the noise level of
// a series whose start may still carry a transient. NaN when that half has fewer than 2 values.
double SecondHalfLongRunVariance(const std::vector<double>& series);

}  // namespace plateau

#endif  // PLATEAU_CORE_BATCH_MEANS_H_
