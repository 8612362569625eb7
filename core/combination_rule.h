// Chooses which variance estimate decides a statistic's half-width, from what is known about each
// estimator's failure modes (shared/DESIGN.md, "Combining the estimators"). Pure; stateless.
#ifndef PLATEAU_CORE_COMBINATION_RULE_H_
#define PLATEAU_CORE_COMBINATION_RULE_H_

#include <string>
#include <string_view>

namespace plateau {

enum class Estimator {
  kBatchMeans,
  kOverlappingBatchMeans,
  kLugsailBatchMeans,
  kAutocorrelation,
  kLagWindow
};

// Stable names used in JSON: batch_means, overlapping_batch_means, lugsail_batch_means,
// autocorrelation, lag_window.
std::string_view EstimatorName(Estimator estimator);

// Standard errors of the mean of the linearised series, and the facts the rule needs. All times are
// in samples. A standard error that could not be computed is NaN.
struct EstimatorEvidence {
  double se_batch_means = 0.0;
  double se_overlapping_batch_means = 0.0;
  double se_lugsail_batch_means = 0.0;  // bias-corrected (LugsailBatchMeans in batch_means.h)
  double se_autocorrelation = 0.0;  // Geyer's initial monotone sequence
  double se_lag_window = 0.0;       // Parzen lag window
  int batches = 0;                  // k of the non-overlapping batch means
  double lag_window = 0.0;          // samples spanned by the Parzen window
  double lag_window_dof = 0.0;      // its equivalent degrees of freedom
  double autocorrelation_dof = 0.0;  // those of the autocorrelation estimate (0: unknown, normal)
  double batch_length = 0.0;        // samples per batch
  double tau_autocorrelation = 0.0;
  double oscillation_period = 0.0;  // 0 when the autocorrelation does not oscillate
};

struct Decision {
  Estimator estimator = Estimator::kAutocorrelation;
  double std_error = 0.0;
  // Degrees of freedom of the Student t quantile that goes with the deciding estimator: k - 1 for
  // batch means, 1.5 (k - 1) for overlapping batch means (Meketon & Schmeiser 1984),
  // LugsailDegreesOfFreedom for the lugsail (batch_means.h), the equivalent
  // degrees of freedom of the lag window and of the autocorrelation estimate
  // (ParzenWindowDegreesOfFreedom, GeyerDegreesOfFreedom in autocorrelation.h); infinite (normal)
  // when the latter is unknown.
  double degrees_of_freedom = 0.0;
  std::string reason;           // one plain sentence for the user
  // Largest / smallest of the batch-means, overlapping and autocorrelation standard errors.
  double disagreement = 1.0;
  bool batches_too_short = false;
  bool periodic = false;
};

// Batches shorter than this many autocorrelation times bias batch means low by O(tau / b).
inline constexpr double kBatchesPerTau = 10.0;
// The lag window must span this many periods of an oscillating signal to average it out.
inline constexpr double kPeriodsPerWindow = 10.0;
// Estimators that differ by more than this factor are reported as disagreeing.
inline constexpr double kDisagreementFactor = 1.5;

// The rule, in order:
//  1. oscillating autocorrelation: Geyer's sequences stop after the first lobe and overstate the
//     error, and batch means leak a residue of the tone (a Bartlett window); the Parzen lag window
//     decides when it spans >= kPeriodsPerWindow periods, otherwise the largest estimate decides
//     (nothing is known to be safe);
//  2. batches shorter than kBatchesPerTau * tau: batch means are biased low, so the lugsail stands
//     for them; it decides when it exceeds the autocorrelation estimate by more than
//     kDisagreementFactor (slow variation beyond the autocorrelation's reach), otherwise the
//     autocorrelation estimate decides;
//  3. batch means above the autocorrelation estimate by more than kDisagreementFactor: slow variation
//     beyond the autocorrelation's reach, of a scale the batches are not known to be long against,
//     so the lugsail decides (the larger plain batch-means estimate when it has none);
//  4. otherwise the autocorrelation estimate, which has the smallest sampling variability.
Decision CombineEstimators(const EstimatorEvidence& evidence);

}  // namespace plateau

#endif  // PLATEAU_CORE_COMBINATION_RULE_H_
