#include "daemon/monitoring/tracked_statistic.h"

#include <limits>

#include "core/progress_rate.h"
#include "core/time_to_target.h"
#include "daemon/monitoring/snapshot_rows.h"
#include "daemon/monitoring/status_documents.h"

namespace plateau {

TrackedStatistic::TrackedStatistic(StatisticConfig* config, SourceTail* tail,
                                   const StopRuleSettings& settings)
    : config_(config), tail_(tail), tracker_(config->request.name, config->target, settings) {}

const Statistic* TrackedStatistic::statistic() const { return tail_->Find(name()); }

std::optional<StatisticEstimate> TrackedStatistic::EstimateAt(
    const EvaluationOptions& options) const {
  const Statistic* statistic = this->statistic();
  if (statistic == nullptr) return std::nullopt;
  return statistic->Evaluate(options);
}

TrackedStatistic::Evaluation TrackedStatistic::Evaluate(const EvaluationOptions& options,
                                                        double wall_time, double progress_rate,
                                                        double flow_through_time,
                                                        const EstimateOf& estimate_of) {
  constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
  const StatisticConfig& c = *config_;
  const std::string problem = tail_->ProblemOf(name());
  Evaluation out;
  StatisticEstimate& e = out.estimate;
  if (std::optional<StatisticEstimate> estimate = EstimateAt(options)) {
    e = std::move(*estimate);
    tail_->source()->AddTimeScales(e);
  } else {
    e.name = name();
    e.kind = c.request.kind;
    e.confidence = options.confidence;
    e.state_reason = problem.empty() ? "no file of source '" + c.source + "' has been read yet"
                                     : problem;
  }
  SnapshotRow& row = out.row;
  row = EstimateRow(e);
  row.statistic = name();
  if (!problem.empty()) {
    row.state = ConvergenceState::kColumnMissing;
    row.state_reason = problem;
  } else {
    out.events = tracker_.Update(e, wall_time);
    row.state = tracker_.state();
    row.state_reason = tracker_.reason();
  }
  row.confidence = options.confidence;
  if (c.target) {
    row.target_kind = c.target->kind;
    row.target_value = c.target->value;
  }
  row.target_half_width = tracker_.TargetHalfWidth(e.value);
  row.met_at_time = tracker_.met() ? tracker_.met_at_time() : kNaN;
  row.met_at_wall = tracker_.met() ? tracker_.met_at_wall() : kNaN;
  row.remaining_time = !c.target        ? kNaN
                       : tracker_.met() ? 0.0
                                        : RemainingTimeToTarget(e, row.target_half_width);
  row.remaining_wall = WallSecondsAt(row.remaining_time, progress_rate);
  const std::optional<ReferenceComparison> reference = Reference(e, options, estimate_of);
  if (reference) row.reference_verdict = std::string(VerdictName(reference->verdict));
  row.profile = c.profile;
  row.document = StatisticDocument(e, c, tracker_, row, reference, tail_->source(),
                                   flow_through_time, wall_time);
  return out;
}

std::optional<ReferenceComparison> TrackedStatistic::Reference(
    const StatisticEstimate& e, const EvaluationOptions& options,
    const EstimateOf& estimate_of) const {
  const StatisticConfig& c = *config_;
  if (c.reference) return CompareWithReference(e, *c.reference);
  if (c.reference_statistic.empty()) return std::nullopt;
  // The other statistic (and the joint difference) at this statistic's confidence.
  const std::optional<StatisticEstimate> reference = estimate_of(c.reference_statistic, options);
  if (!reference) return std::nullopt;
  // A difference statistic a reload asked for is not tracked until the daemon restarts.
  const std::optional<StatisticEstimate> difference =
      c.reference_difference.empty() ? std::nullopt : estimate_of(c.reference_difference, options);
  return CompareWithSeriesReference(e, *reference, c.reference_factor,
                                    difference ? &*difference : nullptr);
}

}  // namespace plateau
