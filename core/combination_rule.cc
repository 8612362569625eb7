#include "core/combination_rule.h"

#include <algorithm>
#include <cmath>
#include <limits>

#include "core/batch_means.h"
#include "core/message_number.h"

namespace plateau {
namespace {

constexpr double kInfinity = std::numeric_limits<double>::infinity();

double DegreesOfFreedom(const EstimatorEvidence& e, Estimator estimator) {
  switch (estimator) {
    case Estimator::kBatchMeans:
      return e.batches - 1.0;
    case Estimator::kOverlappingBatchMeans:
      return 1.5 * (e.batches - 1.0);
    case Estimator::kLugsailBatchMeans:
      return LugsailDegreesOfFreedom(e.batches);
    case Estimator::kAutocorrelation:  // unknown: the normal quantile
      return e.autocorrelation_dof > 0.0 ? e.autocorrelation_dof : kInfinity;
    case Estimator::kLagWindow:
      return e.lag_window_dof;
  }
  return kInfinity;
}

double ErrorOf(const EstimatorEvidence& e, Estimator estimator) {
  switch (estimator) {
    case Estimator::kBatchMeans:
      return e.se_batch_means;
    case Estimator::kOverlappingBatchMeans:
      return e.se_overlapping_batch_means;
    case Estimator::kLugsailBatchMeans:
      return e.se_lugsail_batch_means;
    case Estimator::kAutocorrelation:
      return e.se_autocorrelation;
    case Estimator::kLagWindow:
      return e.se_lag_window;
  }
  return std::numeric_limits<double>::quiet_NaN();
}

Decision Decide(const EstimatorEvidence& e, Estimator estimator, std::string reason) {
  Decision d;
  d.estimator = estimator;
  d.std_error = ErrorOf(e, estimator);
  d.degrees_of_freedom = DegreesOfFreedom(e, estimator);
  d.reason = std::move(reason);
  return d;
}

Estimator Largest(const EstimatorEvidence& e) {
  Estimator best = Estimator::kAutocorrelation;
  for (Estimator candidate : {Estimator::kBatchMeans, Estimator::kOverlappingBatchMeans,
                              Estimator::kLagWindow}) {
    if (ErrorOf(e, candidate) > ErrorOf(e, best)) best = candidate;
  }
  return best;
}

}  // namespace

std::string_view EstimatorName(Estimator estimator) {
  switch (estimator) {
    case Estimator::kBatchMeans:
      return "batch_means";
    case Estimator::kOverlappingBatchMeans:
      return "overlapping_batch_means";
    case Estimator::kLugsailBatchMeans:
      return "lugsail_batch_means";
    case Estimator::kAutocorrelation:
      return "autocorrelation";
    case Estimator::kLagWindow:
      return "lag_window";
  }
  return "unknown";
}

Decision CombineEstimators(const EstimatorEvidence& e) {
  double largest = 0.0;
  double smallest = kInfinity;
  for (double error : {e.se_batch_means, e.se_overlapping_batch_means, e.se_autocorrelation}) {
    if (std::isnan(error)) continue;
    largest = std::max(largest, error);
    smallest = std::min(smallest, error);
  }
  const double batch_side = std::max(e.se_batch_means, e.se_overlapping_batch_means);
  const bool periodic = e.oscillation_period > 0.0;
  const bool short_batches = e.batch_length < kBatchesPerTau * e.tau_autocorrelation;
  // NaN (not computable) compares false: the plain estimates decide.
  const double lugsail = e.se_lugsail_batch_means;

  Decision d;
  if (std::isnan(e.se_autocorrelation) || !(e.se_autocorrelation > 0.0)) {
    d = Decide(e, Estimator::kOverlappingBatchMeans,
               "the autocorrelation estimate is not available; overlapping batch means decide");
  } else if (periodic && e.lag_window >= kPeriodsPerWindow * e.oscillation_period) {
    d = Decide(e, Estimator::kLagWindow,
               "the autocorrelation oscillates with a period of " + MessageNumber(e.oscillation_period) +
                   " samples: the autocorrelation sum overstates the error and batch means keep a "
                   "residue of the oscillation; a Parzen lag window of " +
                   MessageNumber(e.lag_window / e.oscillation_period) + " periods decides");
  } else if (periodic) {
    d = Decide(e, Largest(e),
               "the autocorrelation oscillates with a period of " + MessageNumber(e.oscillation_period) +
                   " samples and the lag window spans fewer than " + MessageNumber(kPeriodsPerWindow) +
                   " periods: the largest estimate decides");
  } else if (short_batches && lugsail > kDisagreementFactor * e.se_autocorrelation) {
    d = Decide(e, Estimator::kLugsailBatchMeans,
               "batches of " + MessageNumber(e.batch_length) + " samples are shorter than " +
                   MessageNumber(kBatchesPerTau) + " integrated times, and even corrected for "
                   "that (lugsail) batch means exceed the autocorrelation estimate by a factor "
                   "of " + MessageNumber(lugsail / e.se_autocorrelation) +
                   ": slow variation beyond the autocorrelation window; the lugsail decides");
  } else if (short_batches) {
    d = Decide(e, Estimator::kAutocorrelation,
               "batches of " + MessageNumber(e.batch_length) + " samples are shorter than " +
                   MessageNumber(kBatchesPerTau) + " integrated times (tau = " +
                   MessageNumber(e.tau_autocorrelation) +
                   "), so batch means are biased low; the autocorrelation estimate decides");
  } else if (batch_side > kDisagreementFactor * e.se_autocorrelation) {
    const Estimator larger = e.se_overlapping_batch_means >= e.se_batch_means
                                 ? Estimator::kOverlappingBatchMeans
                                 : Estimator::kBatchMeans;
    const bool corrected = lugsail > 0.0;
    d = Decide(e, corrected ? Estimator::kLugsailBatchMeans : larger,
               "batch means exceed the autocorrelation estimate by a factor of " +
                   MessageNumber(batch_side / e.se_autocorrelation) +
                   ": slow variation beyond the autocorrelation window; " +
                   (corrected ? "batch means corrected for short batches (lugsail) decide"
                              : "batch means decide"));
  } else {
    d = Decide(e, Estimator::kAutocorrelation,
               "no known failure mode applies; the autocorrelation estimate has the smallest "
               "sampling variability");
  }
  d.periodic = periodic;
  d.batches_too_short = short_batches && !periodic;
  d.disagreement = smallest > 0.0 ? largest / smallest : kInfinity;
  return d;
}

}  // namespace plateau
