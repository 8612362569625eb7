#include "core/multivariate_batch_means.h"

#include <boost/math/distributions/chi_squared.hpp>
#include <boost/math/distributions/fisher_f.hpp>
#include <boost/math/special_functions/gamma.hpp>
#include <cmath>
#include <cstddef>
#include <limits>
#include <numbers>
#include <optional>

namespace plateau {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
constexpr double kSingularPivot = 1e-10;

// The lower Cholesky factor L (L L^T = M, row-major); nullopt unless M is positive definite with a
// margin: a pivot below kSingularPivot of its diagonal element is round-off of a singular matrix.
// Written here because Boost.uBLAS, the chosen libraries' only dense solver, does not compile under
// C++20 in Debian 12's Boost 1.74 (it calls std::allocator::construct, removed in C++20).
std::optional<SquareMatrix> Cholesky(const SquareMatrix& m, std::size_t p) {
  SquareMatrix l(p * p, 0.0);
  for (std::size_t j = 0; j < p; ++j) {
    double diagonal = m[j * p + j];
    for (std::size_t k = 0; k < j; ++k) diagonal -= l[j * p + k] * l[j * p + k];
    if (!(diagonal > kSingularPivot * m[j * p + j])) return std::nullopt;
    l[j * p + j] = std::sqrt(diagonal);
    for (std::size_t i = j + 1; i < p; ++i) {
      double v = m[i * p + j];
      for (std::size_t k = 0; k < j; ++k) v -= l[i * p + k] * l[j * p + k];
      l[i * p + j] = v / l[j * p + j];
    }
  }
  return l;
}

// Sum over values of the outer product of deviations from `centre`, scaled by `scale`.
SquareMatrix ScatterMatrix(const std::vector<std::vector<double>>& rows,
                           const std::vector<double>& centre, double scale) {
  const std::size_t p = centre.size();
  SquareMatrix m(p * p, 0.0);
  for (const std::vector<double>& row : rows) {
    for (std::size_t i = 0; i < p; ++i) {
      const double di = row[i] - centre[i];
      for (std::size_t j = 0; j < p; ++j) m[i * p + j] += di * (row[j] - centre[j]);
    }
  }
  for (double& v : m) v *= scale;
  return m;
}

}  // namespace

MultivariateBatchMeansResult MultivariateBatchMeans(const std::vector<std::vector<double>>& series,
                                                    int batches) {
  MultivariateBatchMeansResult r;
  const std::size_t p = series.size();
  r.dimension = static_cast<int>(p);
  if (p == 0 || batches < 2) return r;
  const std::size_t n = series[0].size();
  for (const std::vector<double>& s : series) {
    if (s.size() != n) return r;
  }
  const std::size_t a = static_cast<std::size_t>(batches);
  if (n < 2 * a) return r;
  const std::size_t b = n / a;
  const std::size_t skip = n - a * b;
  std::vector<std::vector<double>> batch_means(a, std::vector<double>(p, 0.0));
  std::vector<std::vector<double>> values(a * b, std::vector<double>(p, 0.0));
  std::vector<double> grand(p, 0.0);
  for (std::size_t d = 0; d < p; ++d) {
    for (std::size_t k = 0; k < a; ++k) {
      double sum = 0.0;
      for (std::size_t i = 0; i < b; ++i) {
        const double v = series[d][skip + k * b + i];
        values[k * b + i][d] = v;
        sum += v;
      }
      batch_means[k][d] = sum / static_cast<double>(b);
      grand[d] += batch_means[k][d] / static_cast<double>(a);
    }
  }
  r.batches = batches;
  r.batch_size = static_cast<int>(b);
  r.values = static_cast<int>(a * b);
  r.long_run_covariance =
      ScatterMatrix(batch_means, grand, static_cast<double>(b) / static_cast<double>(a - 1));
  r.sample_covariance = ScatterMatrix(values, grand, 1.0 / static_cast<double>(a * b - 1));
  return r;
}

double LogDeterminant(const SquareMatrix& matrix, int dimension) {
  const std::size_t p = static_cast<std::size_t>(dimension);
  const std::optional<SquareMatrix> l = Cholesky(matrix, p);
  if (!l) return kNaN;
  double log_det = 0.0;
  for (std::size_t i = 0; i < p; ++i) log_det += 2.0 * std::log((*l)[i * p + i]);
  return log_det;
}

double QuadraticForm(const SquareMatrix& matrix, const std::vector<double>& x) {
  // x^T (L L^T)^-1 x = |L^-1 x|^2, by forward substitution.
  const std::size_t p = x.size();
  const std::optional<SquareMatrix> l = Cholesky(matrix, p);
  if (!l) return kNaN;
  std::vector<double> y(p);
  double form = 0.0;
  for (std::size_t i = 0; i < p; ++i) {
    double v = x[i];
    for (std::size_t k = 0; k < i; ++k) v -= (*l)[i * p + k] * y[k];
    y[i] = v / (*l)[i * p + i];
    form += y[i] * y[i];
  }
  return form;
}

double MultivariateEffectiveSamples(const MultivariateBatchMeansResult& result) {
  if (result.batches == 0) return kNaN;
  const double log_lambda = LogDeterminant(result.sample_covariance, result.dimension);
  const double log_sigma = LogDeterminant(result.long_run_covariance, result.dimension);
  return result.values * std::exp((log_lambda - log_sigma) / result.dimension);
}

double MinimumEffectiveSamples(int dimension, double confidence, double tolerance) {
  const double p = dimension;
  const double chi2 =
      boost::math::quantile(boost::math::chi_squared_distribution<double>(p), confidence);
  const double log_factor = (2.0 / p) * std::log(2.0) + std::log(std::numbers::pi) -
                            (2.0 / p) * (std::log(p) + boost::math::lgamma(p / 2.0));
  return std::exp(log_factor) * chi2 / (tolerance * tolerance);
}

double HotellingQuantile(double confidence, int dimension, int batches) {
  if (batches <= dimension || dimension < 1) return kNaN;
  const double p = dimension;
  const double a = batches;
  const double f = boost::math::quantile(boost::math::fisher_f_distribution<double>(p, a - p),
                                         confidence);
  return p * (a - 1.0) / (a - p) * f;
}

double LogUnitBallVolume(int dimension) {
  const double p = dimension;
  return 0.5 * p * std::log(std::numbers::pi) - boost::math::lgamma(0.5 * p + 1.0);
}

}  // namespace plateau
