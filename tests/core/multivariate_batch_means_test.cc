// Multivariate batch means and the joint confidence region (core/multivariate_batch_means.h) on a
// VAR(1) process, whose exact long-run covariance is (I - Phi)^-1 Sigma_e (I - Phi)^-T (standard
// result, e.g. Lütkepohl 2005, New Introduction to Multiple Time Series Analysis, Sec. 3.3).
#include "core/multivariate_batch_means.h"

#include <gtest/gtest.h>

#include <array>
#include <cmath>
#include <random>
#include <vector>

#include "core/batch_means.h"
#include "core/student_t.h"

namespace plateau {
namespace {

using Matrix3 = std::array<std::array<double, 3>, 3>;

// x_t = Phi x_{t-1} + L e_t with e_t ~ N(0, I) and L L^T = Sigma_e: eigenvalues of Phi 0.9, 0.6 and
// 0.3 (Phi is upper triangular), cross-correlated innovations.
constexpr Matrix3 kPhi = {{{0.9, 0.2, 0.1}, {0.0, 0.6, 0.2}, {0.0, 0.0, 0.3}}};
constexpr Matrix3 kInnovationFactor = {{{1.0, 0.0, 0.0}, {0.5, 0.8, 0.0}, {0.2, 0.3, 0.9}}};
constexpr std::array<double, 3> kMean = {1.0, -2.0, 0.5};

Matrix3 Multiply(const Matrix3& a, const Matrix3& b) {
  Matrix3 c{};
  for (int i = 0; i < 3; ++i) {
    for (int j = 0; j < 3; ++j) {
      for (int k = 0; k < 3; ++k) c[i][j] += a[i][k] * b[k][j];
    }
  }
  return c;
}

Matrix3 Transpose(const Matrix3& a) {
  Matrix3 t{};
  for (int i = 0; i < 3; ++i) {
    for (int j = 0; j < 3; ++j) t[i][j] = a[j][i];
  }
  return t;
}

// (I - Phi)^-1 by back substitution: I - Phi is upper triangular.
Matrix3 InverseOfIdentityMinusPhi() {
  Matrix3 m{};
  for (int i = 0; i < 3; ++i) {
    for (int j = 0; j < 3; ++j) m[i][j] = (i == j ? 1.0 : 0.0) - kPhi[i][j];
  }
  Matrix3 inverse{};
  for (int col = 0; col < 3; ++col) {
    for (int row = 2; row >= 0; --row) {
      double v = row == col ? 1.0 : 0.0;
      for (int k = row + 1; k < 3; ++k) v -= m[row][k] * inverse[k][col];
      inverse[row][col] = v / m[row][row];
    }
  }
  return inverse;
}

SquareMatrix ExactLongRunCovariance() {
  const Matrix3 sigma_e = Multiply(kInnovationFactor, Transpose(kInnovationFactor));
  const Matrix3 inverse = InverseOfIdentityMinusPhi();
  const Matrix3 sigma = Multiply(Multiply(inverse, sigma_e), Transpose(inverse));
  SquareMatrix flat;
  for (const auto& row : sigma) flat.insert(flat.end(), row.begin(), row.end());
  return flat;
}

// n values of each of the three components, after a burn-in of 1000 steps from the mean.
std::vector<std::vector<double>> Var1(std::size_t n, std::uint64_t seed) {
  std::mt19937_64 rng(seed);
  std::normal_distribution<double> normal(0.0, 1.0);
  std::array<double, 3> x{};
  std::vector<std::vector<double>> series(3, std::vector<double>(n));
  for (std::size_t t = 0; t < n + 1000; ++t) {
    const std::array<double, 3> e = {normal(rng), normal(rng), normal(rng)};
    std::array<double, 3> next{};
    for (int i = 0; i < 3; ++i) {
      for (int k = 0; k < 3; ++k) next[i] += kPhi[i][k] * x[k] + kInnovationFactor[i][k] * e[k];
    }
    x = next;
    if (t >= 1000) {
      for (int i = 0; i < 3; ++i) series[i][t - 1000] = kMean[i] + x[i];
    }
  }
  return series;
}

TEST(MultivariateBatchMeans, EstimatesTheVar1LongRunCovarianceWithinTenPerCent) {
  // N = 2^18 in 512 batches of 512 (b = sqrt(N), Vats, Flegal & Jones 2019, Sec. 4): the largest
  // integrated time here is about 20 samples.
  const SquareMatrix exact = ExactLongRunCovariance();
  for (std::uint64_t seed : {1u, 2u, 3u}) {
    const MultivariateBatchMeansResult r = MultivariateBatchMeans(Var1(1u << 18, seed), 512);
    ASSERT_EQ(r.batches, 512);
    double error = 0.0;
    double norm = 0.0;
    for (std::size_t i = 0; i < exact.size(); ++i) {
      error += std::pow(r.long_run_covariance[i] - exact[i], 2);
      norm += exact[i] * exact[i];
    }
    EXPECT_LT(std::sqrt(error / norm), 0.10) << "seed " << seed;
    for (int i = 0; i < 3; ++i) {  // each variance on its own
      EXPECT_NEAR(r.long_run_covariance[i * 4] / exact[i * 4], 1.0, 0.10) << "seed " << seed;
    }
  }
}

TEST(MultivariateBatchMeans, JointRegionCoversTheVar1MeanAtItsConfidence) {
  // The Hotelling T^2 ellipsoid from 32 batches of 256 values around the sample mean, 1000
  // replications: coverage within 93-97 % (issue 15's band; binomial sd 0.007 at 0.95).
  constexpr int kReplications = 1000;
  constexpr int kBatches = 32;
  const double quantile = HotellingQuantile(0.95, 3, kBatches);
  int covered = 0;
  for (int r = 0; r < kReplications; ++r) {
    const std::vector<std::vector<double>> series = Var1(kBatches * 256, 5000 + r);
    const MultivariateBatchMeansResult mbm = MultivariateBatchMeans(series, kBatches);
    std::vector<double> deviation(3);
    SquareMatrix covariance_of_mean = mbm.long_run_covariance;
    for (double& v : covariance_of_mean) v /= mbm.values;
    for (int i = 0; i < 3; ++i) {
      double sum = 0.0;
      for (double v : series[i]) sum += v;
      deviation[i] = sum / static_cast<double>(series[i].size()) - kMean[i];
    }
    if (QuadraticForm(covariance_of_mean, deviation) <= quantile) ++covered;
  }
  const double coverage = static_cast<double>(covered) / kReplications;
  EXPECT_GE(coverage, 0.93);
  EXPECT_LE(coverage, 0.97);
}

TEST(MultivariateBatchMeans, OneDimensionIsPlainBatchMeans) {
  const std::vector<std::vector<double>> series = Var1(4096, 77);
  const MultivariateBatchMeansResult mbm = MultivariateBatchMeans({series[0]}, 20);
  const BatchMeansResult bm = NonOverlappingBatchMeans(series[0], 20);
  EXPECT_NEAR(mbm.long_run_covariance[0] / mbm.values, bm.variance_of_mean,
              1e-12 * bm.variance_of_mean);
  // mESS = n lambda / sigma^2 in one dimension: the univariate effective sample size.
  EXPECT_NEAR(MultivariateEffectiveSamples(mbm),
              mbm.values * mbm.sample_covariance[0] / mbm.long_run_covariance[0], 1e-9 * mbm.values);
}

TEST(MultivariateBatchMeans, MismatchedOrShortSeriesGiveNoEstimate) {
  EXPECT_EQ(MultivariateBatchMeans({{1, 2, 3, 4}, {1, 2, 3}}, 2).batches, 0);
  EXPECT_EQ(MultivariateBatchMeans({{1, 2, 3}}, 2).batches, 0);
  EXPECT_EQ(MultivariateBatchMeans({}, 2).batches, 0);
}

TEST(JointRegionFormulas, MatchSciPy) {
  // tests/core/fixtures/make_joint_region_reference.py (SciPy's chi2, f and gammaln).
  EXPECT_NEAR(MinimumEffectiveSamples(1, 0.95, 0.05), 6146.334113110599, 1e-9 * 6146);
  EXPECT_NEAR(MinimumEffectiveSamples(3, 0.95, 0.05), 8122.684635651717, 1e-9 * 8122);
  EXPECT_NEAR(MinimumEffectiveSamples(12, 0.95, 0.1), 2206.4083486122977, 1e-9 * 2206);
  EXPECT_NEAR(MinimumEffectiveSamples(72, 0.95, 0.1), 2041.735425998596, 1e-9 * 2041);
  EXPECT_NEAR(HotellingQuantile(0.95, 3, 32), 9.409130335819585, 1e-9);
  EXPECT_NEAR(HotellingQuantile(0.95, 12, 40), 35.398674206760575, 1e-8);
  // In one dimension Hotelling's T^2 is Student's t squared (F(1, v) = t_v^2).
  EXPECT_NEAR(HotellingQuantile(0.95, 1, 20), std::pow(TwoSidedStudentQuantile(0.95, 19), 2), 1e-9);
  EXPECT_TRUE(std::isnan(HotellingQuantile(0.95, 5, 5)));
  // The unit disc and ball: pi and 4 pi / 3.
  EXPECT_NEAR(std::exp(LogUnitBallVolume(2)), M_PI, 1e-12);
  EXPECT_NEAR(std::exp(LogUnitBallVolume(3)), 4.0 * M_PI / 3.0, 1e-12);
}

TEST(JointRegionFormulas, DeterminantAndQuadraticFormByHand) {
  // [[4, 2], [2, 3]]: determinant 8; inverse [[3, -2], [-2, 4]] / 8, so (1, 1) gives 3 / 8.
  const SquareMatrix m = {4, 2, 2, 3};
  EXPECT_NEAR(LogDeterminant(m, 2), std::log(8.0), 1e-14);
  EXPECT_NEAR(QuadraticForm(m, {1.0, 1.0}), 3.0 / 8.0, 1e-14);
  EXPECT_TRUE(std::isnan(LogDeterminant({1, 2, 2, 4}, 2)));   // singular
  EXPECT_TRUE(std::isnan(LogDeterminant({1, 2, 2, 1}, 2)));   // indefinite: determinant -3
}

}  // namespace
}  // namespace plateau
