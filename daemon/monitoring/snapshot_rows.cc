#include "daemon/monitoring/snapshot_rows.h"

#include <limits>

namespace plateau {

SnapshotRow BlankRow(const std::string& name, RowKind kind) {
  constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
  SnapshotRow row;
  row.statistic = name;
  row.kind = kind;
  row.value = row.half_width = row.relative_half_width = kNaN;
  row.integrated_time = row.effective_samples = row.warmup_end_time = row.last_time = kNaN;
  row.integral_time_scale = row.averaging_time = kNaN;
  row.confidence = row.target_value = row.target_half_width = kNaN;
  row.met_at_time = row.met_at_wall = row.remaining_time = row.remaining_wall = kNaN;
  return row;
}

SnapshotRow EstimateRow(const StatisticEstimate& e) {
  SnapshotRow row = BlankRow(e.name, RowKind::kStatistic);
  row.value = e.value;
  row.half_width = e.half_width;
  row.relative_half_width = e.relative_half_width;
  row.integrated_time = e.integrated_time;
  row.effective_samples = e.effective_samples;
  row.integral_time_scale = e.integral_time_scale;
  row.averaging_time = e.averaging_time;
  row.warmup_end_time = e.warmup_end_time;
  row.samples_used = static_cast<std::int64_t>(e.samples_used);
  row.last_time = e.last_time;
  row.confidence = e.confidence;
  return row;
}

}  // namespace plateau
