#include "daemon/monitoring/status_documents.h"

#include <cmath>

#include "daemon/presentation/analysis_report.h"
#include "daemon/presentation/json_writer.h"

namespace plateau {
namespace {

std::string_view TargetKindName(Target::Kind kind) {
  return kind == Target::Kind::kRelative ? "relative" : "absolute";
}

void WriteTimeToTarget(JsonWriter& json, double remaining, double wall_seconds,
                       double wall_time) {
  json.Key("time_to_target");
  if (std::isnan(remaining)) {
    json.Null();
    return;
  }
  json.BeginObject();
  json.Field("simulated", remaining);
  json.Field("wall_seconds", wall_seconds);
  json.Field("expected_at", wall_time + wall_seconds);
  json.EndObject();
}

}  // namespace

JsonDocument StatisticDocument(const StatisticEstimate& e, const StatisticConfig& c,
                               const ConvergenceTracker& tracker, const SnapshotRow& row,
                               const std::optional<ReferenceComparison>& reference,
                               const SourceStatistics* source, double flow_through_time,
                               double wall_time) {
  const std::string_view state = ConvergenceStateName(row.state);
  const std::string& reason = row.state_reason;
  JsonWriter json;
  json.BeginObject();
  WriteEstimateFields(json, e, c.request.columns, flow_through_time);
  json.Field("source", c.source);
  if (source != nullptr) WriteSpacing(json, source->spacing());
  json.Field("state", state);
  json.Field("state_reason", reason);
  json.Key("target");
  if (c.target) {
    json.BeginObject();
    json.Field("kind", TargetKindName(c.target->kind));
    json.Field("value", c.target->value);
    json.Field("confidence", c.target->confidence);
    json.EndObject();
  } else {
    json.Null();
  }
  json.Field("target_half_width", tracker.TargetHalfWidth(e.value));
  json.Field("confirmations", tracker.consecutive());
  json.Key("met_at");
  if (tracker.met()) {
    json.BeginObject();
    json.Field("simulated_time", tracker.met_at_time());
    json.Field("wall_time", tracker.met_at_wall());
    json.EndObject();
  } else {
    json.Null();
  }
  json.Field("minimum_time", c.minimum_time);
  if (!c.profile.empty()) {
    json.Field("profile", c.profile);
    json.Field("point", c.point);
    json.Field("position", c.position);
    json.Field("quantity", c.quantity);
  }
  WriteTimeToTarget(json, row.remaining_time, row.remaining_wall, wall_time);
  json.Key("reference");
  if (reference) {
    const ReferenceComparison& r = *reference;
    json.BeginObject();
    json.Field("value", r.reference);
    if (!c.reference_statistic.empty()) {
      json.Field("statistic", c.reference_statistic);
      json.Field("factor", c.reference_factor);
    }
    json.Field("difference", r.difference);
    json.Field("relative_difference", r.relative_difference);
    json.Field("half_width", r.half_width);
    json.Field("method", r.method);
    json.Field("verdict", VerdictName(r.verdict));
    json.Field("words", r.words);
    json.EndObject();
  } else {
    json.Null();
  }
  json.EndObject();
  return json.TakeDocument();
}

namespace {

void WriteJointRegion(JsonWriter& json, const JointRegion& r) {
  json.Key("joint_region");
  json.BeginObject();
  json.Field("available", r.available);
  json.Field("small_enough", r.small_enough);
  json.Field("reason", r.reason);
  json.Field("batches", r.batches);
  json.Field("batch_length", r.batch_length);
  json.Field("volume_ratio", r.volume_ratio);
  json.Field("members_ratio", r.members_ratio);
  json.Field("bonferroni_ratio", r.bonferroni_ratio);
  json.Field("time_factor", r.joint_time_factor);
  json.Field("bonferroni_time_factor", r.bonferroni_time_factor);
  json.EndObject();
}

}  // namespace

JsonDocument GroupDocument(const StatisticGroup& g, const GroupStanding& standing,
                           const JointRegion* region, const SnapshotRow& row, double wall_time) {
  JsonWriter json;
  json.BeginObject();
  json.Field("name", g.name);
  json.Field("group", true);
  json.Key("members");
  json.BeginArray();
  for (const std::string& m : g.members) json.String(m);
  json.EndArray();
  json.Field("members_met", standing.members_met);
  json.Field("state", ConvergenceStateName(row.state));
  json.Field("state_reason", row.state_reason);
  json.Field("required", g.required);
  json.Field("bonferroni", g.bonferroni);
  json.Field("joint", g.multivariate ? "multivariate" : g.bonferroni ? "bonferroni" : "separate");
  json.Field("confidence", g.confidence);
  json.Field("member_confidence", standing.member_confidence);
  if (region != nullptr) WriteJointRegion(json, *region);
  WriteTimeToTarget(json, row.remaining_time, row.remaining_wall, wall_time);
  json.EndObject();
  return json.TakeDocument();
}

}  // namespace plateau
