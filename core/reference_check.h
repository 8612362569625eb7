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
  double half_width = 0.0;           // of the difference: the estimate's own
  std::string words;                 // the verdict as a sentence
};

// Stable names: undetermined, consistent, bias.
std::string_view VerdictName(ReferenceComparison::Verdict verdict);

ReferenceComparison CompareWithReference(const StatisticEstimate& e, double reference);

}  // namespace plateau

#endif  // PLATEAU_CORE_REFERENCE_CHECK_H_
