#include "store/snapshot_columns.h"

#include <string>

namespace plateau {
namespace {

// The target_kind column holds the target's kind for a statistic ("relative", "absolute", or ""
// without one) and the row's kind for the others ("group", "profile"), as since schema 1.
std::string TargetKindColumn(const SnapshotRow& row) {
  if (row.kind == RowKind::kGroup) return "group";
  if (row.kind == RowKind::kProfileSummary) return "profile";
  if (!row.target_kind) return "";
  return *row.target_kind == Target::Kind::kRelative ? "relative" : "absolute";
}

void ReadTargetKindColumn(const std::string& text, SnapshotRow& row) {
  row.kind = text == "group"     ? RowKind::kGroup
             : text == "profile" ? RowKind::kProfileSummary
                                 : RowKind::kStatistic;
  row.target_kind = text == "relative"   ? std::optional(Target::Kind::kRelative)
                    : text == "absolute" ? std::optional(Target::Kind::kAbsolute)
                                         : std::nullopt;
}

// The states a store holds are those this build writes (the schema version guards the rest).
ConvergenceState StateColumn(const std::string& text) {
  return ConvergenceStateFromName(text).value_or(ConvergenceState::kNoData);
}

}  // namespace

const char* const kInsertSnapshot =
    "INSERT OR REPLACE INTO snapshots VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12, "
    "?13, ?14, ?15, ?16, ?17, ?18, ?19, ?20, ?21, ?22, ?23, ?24, ?25)";

void BindSnapshot(SqliteStatement& insert, std::int64_t cycle, std::int64_t position,
                  const SnapshotRow& row) {
  insert.Reset();
  insert.Bind(1, cycle);
  insert.Bind(2, position);
  insert.Bind(3, row.statistic);
  insert.Bind(4, std::string(ConvergenceStateName(row.state)));
  insert.Bind(5, row.state_reason);
  insert.Bind(6, row.value);
  insert.Bind(7, row.half_width);
  insert.Bind(8, row.relative_half_width);
  insert.Bind(9, row.integrated_time);
  insert.Bind(10, row.effective_samples);
  insert.Bind(11, row.warmup_end_time);
  insert.Bind(12, row.samples_used);
  insert.Bind(13, row.last_time);
  insert.Bind(14, row.confidence);
  insert.Bind(15, TargetKindColumn(row));
  insert.Bind(16, row.target_value);
  insert.Bind(17, row.target_half_width);
  insert.Bind(18, row.met_at_time);
  insert.Bind(19, row.met_at_wall);
  insert.Bind(20, row.remaining_time);
  insert.Bind(21, row.remaining_wall);
  insert.Bind(22, row.reference_verdict);
  insert.Bind(23, row.profile);
  insert.Bind(24, row.integral_time_scale);
  insert.Bind(25, row.averaging_time);
}

const char* const kSnapshotColumns =
    "s.statistic, s.state, s.state_reason, s.value, s.half_width, s.relative_half_width, "
    "s.integrated_time, s.effective_samples, s.warmup_end_time, s.samples_used, s.last_time, "
    "s.confidence, s.target_kind, s.target_value, s.target_half_width, s.met_at_time, "
    "s.met_at_wall, s.remaining_time, s.remaining_wall, s.reference_verdict, s.profile, "
    "s.integral_time_scale, s.averaging_time";

SnapshotRow SnapshotAt(const SqliteStatement& q, int first) {
  SnapshotRow row;
  row.statistic = q.ColumnText(first);
  row.state = StateColumn(q.ColumnText(first + 1));
  row.state_reason = q.ColumnText(first + 2);
  row.value = q.ColumnDouble(first + 3);
  row.half_width = q.ColumnDouble(first + 4);
  row.relative_half_width = q.ColumnDouble(first + 5);
  row.integrated_time = q.ColumnDouble(first + 6);
  row.effective_samples = q.ColumnDouble(first + 7);
  row.warmup_end_time = q.ColumnDouble(first + 8);
  row.samples_used = q.ColumnInt(first + 9);
  row.last_time = q.ColumnDouble(first + 10);
  row.confidence = q.ColumnDouble(first + 11);
  ReadTargetKindColumn(q.ColumnText(first + 12), row);
  row.target_value = q.ColumnDouble(first + 13);
  row.target_half_width = q.ColumnDouble(first + 14);
  row.met_at_time = q.ColumnDouble(first + 15);
  row.met_at_wall = q.ColumnDouble(first + 16);
  row.remaining_time = q.ColumnDouble(first + 17);
  row.remaining_wall = q.ColumnDouble(first + 18);
  row.reference_verdict = q.ColumnText(first + 19);
  row.profile = q.ColumnText(first + 20);
  row.integral_time_scale = q.ColumnDouble(first + 21);
  row.averaging_time = q.ColumnDouble(first + 22);
  return row;
}

}  // namespace plateau
