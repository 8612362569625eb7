// Multivariate batch means: the long-run covariance matrix of several series observed together (the
// points of a profile, the members of a group, fed by the same rows), and what follows from it
// (Vats, Flegal & Jones 2019, "Multivariate output analysis for Markov chain Monte Carlo",
// Biometrika 106(2)). Pure numerics; stateless.
#ifndef PLATEAU_CORE_MULTIVARIATE_BATCH_MEANS_H_
#define PLATEAU_CORE_MULTIVARIATE_BATCH_MEANS_H_

#include <vector>

namespace plateau {

// A p x p symmetric matrix, row-major.
using SquareMatrix = std::vector<double>;

struct MultivariateBatchMeansResult {
  int dimension = 0;   // p
  int batches = 0;     // a; 0 when there was too little data
  int batch_size = 0;  // b values
  int values = 0;      // n = a b values used (the oldest remainder is dropped)
  // Sigma: n Cov(mean vector) -> Sigma. Sigma = b / (a - 1) sum_k (Y_k - Ybar)(Y_k - Ybar)^T over
  // the batch-mean vectors Y_k (Vats, Flegal & Jones 2019, Sec. 2).
  SquareMatrix long_run_covariance;
  // Lambda: the sample covariance of the values (divisor n - 1).
  SquareMatrix sample_covariance;
};

// `series` holds p series of equal length n, one per dimension, time-aligned (value t of each comes
// from the same row). Needs a >= 2, n >= 2 a and equal lengths; otherwise batches = 0.
MultivariateBatchMeansResult MultivariateBatchMeans(const std::vector<std::vector<double>>& series,
                                                    int batches);

// log |M| of a symmetric positive definite p x p matrix (by Cholesky); NaN when it is not
// positive definite.
double LogDeterminant(const SquareMatrix& matrix, int dimension);

// x^T M^-1 x for a symmetric positive definite M; NaN when M is not positive definite.
double QuadraticForm(const SquareMatrix& matrix, const std::vector<double>& x);

// The multivariate effective sample size n (|Lambda| / |Sigma|)^(1/p) (Vats, Flegal & Jones 2019,
// eq. 3.2); NaN when either matrix is singular.
double MultivariateEffectiveSamples(const MultivariateBatchMeansResult& result);

// The smallest multivariate effective sample size for which the confidence ellipsoid's volume^(1/p)
// is below `tolerance` times |Lambda|^(1/(2p)): 2^(2/p) pi / (p Gamma(p/2))^(2/p) chi^2_{c,p} / eps^2
// (Vats, Flegal & Jones 2019, Theorem 2).
double MinimumEffectiveSamples(int dimension, double confidence, double tolerance);

// The 1 - alpha quantile of Hotelling's T^2 with a - 1 degrees of freedom for the covariance,
// p (a - 1) / (a - p) F_{p, a - p} (e.g. Anderson 2003, An Introduction to Multivariate Statistical
// Analysis, Sec. 5.2.2): (mean - mu)^T (Sigma / n)^-1 (mean - mu) stays below it with probability
// `confidence` when Sigma comes from a batches. NaN when a <= p.
double HotellingQuantile(double confidence, int dimension, int batches);

// Volume of the unit ball in p dimensions, pi^(p/2) / Gamma(p/2 + 1), as log.
double LogUnitBallVolume(int dimension);

}  // namespace plateau

#endif  // PLATEAU_CORE_MULTIVARIATE_BATCH_MEANS_H_
