#include "core/combination_rule.h"

#include <gtest/gtest.h>

#include <cmath>

#include "core/batch_means.h"

namespace plateau {
namespace {

EstimatorEvidence Agreeing() {
  EstimatorEvidence e;
  e.se_batch_means = 1.05;
  e.se_overlapping_batch_means = 1.0;
  e.se_autocorrelation = 0.98;
  e.se_lag_window = 1.01;
  e.batches = 20;
  e.batch_length = 2000;
  e.tau_autocorrelation = 20;
  e.lag_window = 4000;
  e.lag_window_dof = 37;
  return e;
}

TEST(CombinationRule, AgreeingEstimatorsLeaveItToTheAutocorrelation) {
  const Decision d = CombineEstimators(Agreeing());
  EXPECT_EQ(d.estimator, Estimator::kAutocorrelation);
  EXPECT_DOUBLE_EQ(d.std_error, 0.98);
  EXPECT_TRUE(std::isinf(d.degrees_of_freedom));
  EXPECT_LT(d.disagreement, kDisagreementFactor);
}

TEST(CombinationRule, TheAutocorrelationEstimateCarriesItsOwnDegreesOfFreedom) {
  EstimatorEvidence e = Agreeing();
  e.autocorrelation_dof = 85;
  EXPECT_DOUBLE_EQ(CombineEstimators(e).degrees_of_freedom, 85);
}

TEST(CombinationRule, ShortBatchesHandTheDecisionToTheAutocorrelation) {
  EstimatorEvidence e = Agreeing();
  e.tau_autocorrelation = 300;  // batches of 2000 < 10 tau
  e.se_batch_means = 0.7;
  e.se_autocorrelation = 1.2;
  const Decision d = CombineEstimators(e);
  EXPECT_EQ(d.estimator, Estimator::kAutocorrelation);
  EXPECT_TRUE(d.batches_too_short);
  EXPECT_GT(d.disagreement, kDisagreementFactor);
  EXPECT_NE(d.reason.find("shorter than"), std::string::npos);
}

TEST(CombinationRule, OscillationHandsTheDecisionToTheLagWindow) {
  EstimatorEvidence e = Agreeing();
  e.oscillation_period = 40;
  e.se_autocorrelation = 2.5;  // Geyer counts the first lobe
  const Decision d = CombineEstimators(e);
  EXPECT_EQ(d.estimator, Estimator::kLagWindow);
  EXPECT_DOUBLE_EQ(d.degrees_of_freedom, 37);
  EXPECT_TRUE(d.periodic);
}

TEST(CombinationRule, OscillationWithTooShortAWindowTakesTheLargest) {
  EstimatorEvidence e = Agreeing();
  e.oscillation_period = 1000;  // the window spans only 4 periods
  e.se_autocorrelation = 2.5;
  const Decision d = CombineEstimators(e);
  EXPECT_EQ(d.estimator, Estimator::kAutocorrelation);
  EXPECT_DOUBLE_EQ(d.std_error, 2.5);
}

TEST(CombinationRule, BatchMeansWellAboveTheAutocorrelationMeanSlowVariation) {
  EstimatorEvidence e = Agreeing();
  e.se_batch_means = 1.9;
  e.se_overlapping_batch_means = 1.7;
  const Decision d = CombineEstimators(e);
  EXPECT_EQ(d.estimator, Estimator::kBatchMeans);
  EXPECT_DOUBLE_EQ(d.degrees_of_freedom, 19);
}

TEST(CombinationRule, SlowVariationIsDecidedByBatchMeansCorrectedForTheirLength) {
  EstimatorEvidence e = Agreeing();
  e.se_batch_means = 1.9;
  e.se_overlapping_batch_means = 1.7;
  e.se_lugsail_batch_means = 2.1;
  const Decision d = CombineEstimators(e);
  EXPECT_EQ(d.estimator, Estimator::kLugsailBatchMeans);
  EXPECT_DOUBLE_EQ(d.std_error, 2.1);
  EXPECT_DOUBLE_EQ(d.degrees_of_freedom, LugsailDegreesOfFreedom(20));
  EXPECT_NE(d.reason.find("lugsail"), std::string::npos);
}

TEST(CombinationRule, ShortBatchesWhoseCorrectionExceedsTheAutocorrelationLetTheLugsailDecide) {
  EstimatorEvidence e = Agreeing();
  e.tau_autocorrelation = 300;   // batches of 2000 < 10 tau: plain batch means biased low
  e.se_batch_means = 1.2;
  e.se_lugsail_batch_means = 1.6;  // > 1.5 x 0.98 once corrected
  const Decision d = CombineEstimators(e);
  EXPECT_EQ(d.estimator, Estimator::kLugsailBatchMeans);
  EXPECT_TRUE(d.batches_too_short);
  e.se_lugsail_batch_means = 1.3;  // within the factor: the autocorrelation keeps it
  EXPECT_EQ(CombineEstimators(e).estimator, Estimator::kAutocorrelation);
}

TEST(CombinationRule, MissingAutocorrelationFallsBackToOverlappingBatchMeans) {
  EstimatorEvidence e = Agreeing();
  e.se_autocorrelation = std::nan("");
  EXPECT_EQ(CombineEstimators(e).estimator, Estimator::kOverlappingBatchMeans);
}

}  // namespace
}  // namespace plateau
