#include "core/reference_check.h"

#include <cmath>
#include <limits>
#include <sstream>

namespace plateau {
namespace {

std::string Format(double value) {
  std::ostringstream out;
  out.precision(3);
  out << value;
  return out.str();
}

}  // namespace

std::string_view VerdictName(ReferenceComparison::Verdict verdict) {
  switch (verdict) {
    case ReferenceComparison::Verdict::kUndetermined:
      return "undetermined";
    case ReferenceComparison::Verdict::kConsistent:
      return "consistent";
    case ReferenceComparison::Verdict::kBias:
      return "bias";
  }
  return "undetermined";
}

ReferenceComparison CompareWithReference(const StatisticEstimate& e, double reference) {
  ReferenceComparison c;
  c.reference = reference;
  c.difference = e.value - reference;
  c.relative_difference = reference != 0.0 ? c.difference / std::fabs(reference)
                                           : std::numeric_limits<double>::quiet_NaN();
  c.half_width = e.half_width;
  const std::string relative =
      std::isnan(c.relative_difference) ? "" : " (" + Format(100.0 * c.relative_difference) + " %)";
  if (e.state != EstimateState::kEstimated || std::isnan(e.half_width)) {
    c.words = "no interval yet to compare with the reference " + Format(reference);
    return c;
  }
  if (e.drift_detected) {
    c.words = "the mean still drifts: no verdict against the reference " + Format(reference) + " yet";
    return c;
  }
  if (std::fabs(c.difference) <= e.half_width) {
    c.verdict = ReferenceComparison::Verdict::kConsistent;
    c.words = "consistent with the reference " + Format(reference) + ": the difference " +
              Format(c.difference) + relative + " is within the sampling uncertainty ±" +
              Format(e.half_width);
  } else {
    c.verdict = ReferenceComparison::Verdict::kBias;
    c.words = "differs from the reference " + Format(reference) + " by " + Format(c.difference) +
              relative + ", outside the sampling uncertainty ±" + Format(e.half_width) +
              ": a bias (mesh, model or set-up) that more averaging will not remove";
  }
  return c;
}

}  // namespace plateau
