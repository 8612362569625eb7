#include "core/decay_fit_truncation.h"

#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <random>

#include "core/mser_truncation.h"

namespace plateau {
namespace {

// Batch means of a start-up transient level + A exp(-t / T) under independent normal noise of
// standard deviation `noise` (batch means of a long-correlated signal are nearly independent once
// batches are much longer than its integral time).
std::vector<double> TransientBatchMeans(std::size_t n, double amplitude, double efolding,
                                        double noise, std::uint64_t seed) {
  std::mt19937_64 rng(seed);
  std::normal_distribution<double> normal(0.0, noise);
  std::vector<double> y(n);
  for (std::size_t j = 0; j < n; ++j) {
    y[j] = 1.0 + amplitude * std::exp(-(static_cast<double>(j) + 0.5) / efolding) + normal(rng);
  }
  return y;
}

// The exact transient's mean over what a cut at d leaves, in units of the remaining mean's
// standard error.
double ResidueInStandardErrors(std::size_t n, std::size_t d, double amplitude, double efolding,
                               double noise) {
  double sum = 0.0;
  for (std::size_t j = d; j < n; ++j) {
    sum += amplitude * std::exp(-(static_cast<double>(j) + 0.5) / efolding);
  }
  const double remaining = static_cast<double>(n - d);
  return std::fabs(sum / remaining) / (noise / std::sqrt(remaining));
}

// Coverage of a 95 % normal interval whose centre is off by `bias` standard errors.
double CoverageUnderBias(double bias) {
  const auto phi = [](double z) { return 0.5 * std::erfc(-z / std::sqrt(2.0)); };
  return phi(1.959964 - bias) - phi(-1.959964 - bias);
}

TEST(DecayFit, RecoversANoiseFreeDecayToTheGridsResolution) {
  const std::vector<double> y = TransientBatchMeans(256, -0.6, 15.0, 0.0, 1);
  const DecayFit fit = FitStartupDecay(y, 1e-6);
  ASSERT_TRUE(fit.significant);
  EXPECT_NEAR(fit.efolding, 15.0, 0.4);  // 48 grid steps a decade: 5 % apart
  EXPECT_NEAR(fit.amplitude, -0.6, 0.03);
  EXPECT_NEAR(fit.level, 1.0, 1e-3);
}

TEST(DecayFit, FindsASlowTransientUnderNoiseAndCutsPastItsResidue) {
  // The stop-rule harness's hardest case at its design length on 256 batch means: 60 % of the mean,
  // e-folding 6 % of the run (15 batches), batch-mean noise 0.16. MSER alone stops where the
  // transient sinks into the noise and leaves about one standard error of bias.
  int found = 0;
  double coverage = 0.0, mser_coverage = 0.0;
  constexpr int kReplications = 200;
  for (int r = 0; r < kReplications; ++r) {
    const std::vector<double> y = TransientBatchMeans(256, -0.6, 15.0, 0.16, 100 + r);
    found += FitStartupDecay(y, 0.16 * 0.16).significant;
    const int mser = MserTruncation(y);
    const int cut = DecayFitTruncation(y, mser);
    EXPECT_GE(cut, mser);
    EXPECT_LE(cut, 128);
    coverage += CoverageUnderBias(ResidueInStandardErrors(256, cut, -0.6, 15.0, 0.16));
    mser_coverage += CoverageUnderBias(ResidueInStandardErrors(256, mser, -0.6, 15.0, 0.16));
  }
  coverage /= kReplications;
  mser_coverage /= kReplications;
  std::printf("slow transient: decay significant %d / %d; coverage the residue allows: %.3f after "
              "the decay cut, %.3f after MSER\n", found, kReplications, coverage, mser_coverage);
  EXPECT_EQ(found, kReplications);
  EXPECT_GE(coverage, 0.94);
  EXPECT_LT(mser_coverage, 0.90);  // what the decay fit adds to MSER
}

TEST(DecayFit, StationaryNoiseRarelyLooksLikeADecay) {
  // The false-alarm rate sets the waste on stationary runs; the threshold is far beyond what the
  // best of a grid of fits finds in noise.
  int significant = 0, extended = 0;
  constexpr int kReplications = 1000;
  for (int r = 0; r < kReplications; ++r) {
    const std::vector<double> y = TransientBatchMeans(256, 0.0, 1.0, 0.16, 5000 + r);
    significant += FitStartupDecay(y, 0.16 * 0.16).significant;
    const int mser = MserTruncation(y);
    extended += DecayFitTruncation(y, mser) > mser;
  }
  std::printf("stationary: decay significant in %d / %d, cut extended in %d\n", significant,
              kReplications, extended);
  EXPECT_LE(significant, kReplications / 100);
  EXPECT_LE(extended, kReplications / 100);
}

TEST(DecayFit, ShortSeriesKeepTheFloor) {
  const std::vector<double> y = TransientBatchMeans(12, -0.6, 3.0, 0.01, 7);
  EXPECT_EQ(DecayFitTruncation(y, 2), 2);
}

TEST(DecayFit, ATransientLongerThanHalfTheRunIsCutAtHalf) {
  const std::vector<double> y = TransientBatchMeans(200, -0.6, 150.0, 0.01, 8);
  EXPECT_EQ(DecayFitTruncation(y, MserTruncation(y)), 100);
}

}  // namespace
}  // namespace plateau
