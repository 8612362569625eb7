#include "core/reference_check.h"

#include <cmath>
#include <limits>

#include "core/message_number.h"

namespace plateau {

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
      std::isnan(c.relative_difference) ? "" : " (" + MessageNumber(100.0 * c.relative_difference) + " %)";
  if (e.state != EstimateState::kEstimated || std::isnan(e.half_width)) {
    c.words = "no interval yet to compare with the reference " + MessageNumber(reference);
    return c;
  }
  if (e.drift_detected) {
    c.words = "the mean still drifts: no verdict against the reference " + MessageNumber(reference) + " yet";
    return c;
  }
  if (std::fabs(c.difference) <= e.half_width) {
    c.verdict = ReferenceComparison::Verdict::kConsistent;
    c.words = "consistent with the reference " + MessageNumber(reference) + ": the difference " +
              MessageNumber(c.difference) + relative + " is within the sampling uncertainty ±" +
              MessageNumber(e.half_width);
  } else {
    c.verdict = ReferenceComparison::Verdict::kBias;
    c.words = "differs from the reference " + MessageNumber(reference) + " by " + MessageNumber(c.difference) +
              relative + ", outside the sampling uncertainty ±" + MessageNumber(e.half_width) +
              ": a bias (mesh, model or set-up) that more averaging will not remove";
  }
  return c;
}

ReferenceComparison CompareWithSeriesReference(const StatisticEstimate& e,
                                               const StatisticEstimate& reference, double factor,
                                               const StatisticEstimate* joint_difference) {
  ReferenceComparison c;
  c.reference = factor * reference.value;
  c.difference = e.value - c.reference;
  c.relative_difference = c.reference != 0.0 ? c.difference / std::fabs(c.reference)
                                             : std::numeric_limits<double>::quiet_NaN();
  const std::string of = MessageNumber(factor) + " x " + reference.name + " = " + MessageNumber(c.reference);
  const std::string relative =
      std::isnan(c.relative_difference) ? "" : " (" + MessageNumber(100.0 * c.relative_difference) + " %)";
  const StatisticEstimate* lacking = nullptr;
  if (joint_difference != nullptr) {
    c.method = "joint_series";
    c.half_width = joint_difference->half_width;
    if (joint_difference->state != EstimateState::kEstimated || joint_difference->drift_detected) {
      lacking = joint_difference;
    }
  } else {
    c.method = "independent";
    c.half_width = std::hypot(e.half_width, factor * reference.half_width);
    for (const StatisticEstimate* s : {&e, &reference}) {
      if (s->state != EstimateState::kEstimated || s->drift_detected) lacking = s;
    }
  }
  if (lacking != nullptr || std::isnan(c.half_width)) {
    c.words = "no verdict against the reference " + of + " yet: " +
              (lacking != nullptr && lacking->drift_detected ? "a mean still drifts"
                                                             : "no interval of the difference yet");
    return c;
  }
  const std::string how = joint_difference != nullptr
                              ? "the difference averaged sample by sample over both series"
                              : "combined as if the two series were independent (they are not "
                                "sampled together), which ignores their correlation";
  if (std::fabs(c.difference) <= c.half_width) {
    c.verdict = ReferenceComparison::Verdict::kConsistent;
    c.words = "consistent with the reference " + of + ": the difference " + MessageNumber(c.difference) +
              relative + " is within its sampling uncertainty ±" + MessageNumber(c.half_width) + " (" +
              how + ")";
  } else {
    c.verdict = ReferenceComparison::Verdict::kBias;
    c.words = "differs from the reference " + of + " by " + MessageNumber(c.difference) + relative +
              ", outside its sampling uncertainty ±" + MessageNumber(c.half_width) + " (" + how +
              "): a bias (mesh, model or set-up) that more averaging will not remove";
  }
  return c;
}

}  // namespace plateau
