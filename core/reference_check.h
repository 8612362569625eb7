// Sampling error or bias: compares a statistic with a value the user knows (an analytical wall shear
// stress, a published DNS value). A difference inside the confidence interval is consistent with
// sampling error; one outside it is a bias (mesh, model, domain or set-up) that more averaging
// will not remove, because averaging only narrows the interval around the simulation's own mean.
// Pure; stateless.
#ifndef PLATEAU_CORE_REFERENCE_CHECK_H_
#define PLATEAU_CORE_REFERENCE_CHECK_H_

#include <string>
#include <string_view>

#include "core/statistic_estimate.h"

namespace plateau {

struct ReferenceComparison {
  enum class Verdict { kUndetermined, kConsistent, kBias };
  Verdict verdict = Verdict::kUndetermined;
  double reference = 0.0;
  double difference = 0.0;           // value - reference
  double relative_difference = 0.0;  // difference / |reference| (NaN for a zero reference)
  double half_width = 0.0;           // of the difference: the estimate's own for a fixed value
  // How the difference's uncertainty was found: "value" (a fixed reference: the estimate's own
  // interval), "joint_series" (value - factor * reference averaged per sample over both series),
  // "independent" (the two intervals combined as if the series were independent).
  std::string method = "value";
  std::string words;                 // the verdict as a sentence
};

// Stable names: undetermined, consistent, bias.
std::string_view VerdictName(ReferenceComparison::Verdict verdict);

ReferenceComparison CompareWithReference(const StatisticEstimate& e, double reference);

// The reference is another statistic times `factor`: a wall shear stress against delta times the
// mean driving pressure gradient, which a solver holding the flow rate writes as a series. With
// `joint_difference` (the estimate of value - factor * reference formed per sample from both
// series at the same times) the verdict uses that interval: the two are correlated, and adding
// their variances would be wrong. Without it (the series are not sampled together) the two
// half-widths are combined as if independent, h = sqrt(h_e^2 + factor^2 h_ref^2), and the words
// say so. Undetermined while either has no interval or drifts.
ReferenceComparison CompareWithSeriesReference(const StatisticEstimate& e,
                                               const StatisticEstimate& reference, double factor,
                                               const StatisticEstimate* joint_difference);

}  // namespace plateau

#endif  // PLATEAU_CORE_REFERENCE_CHECK_H_
