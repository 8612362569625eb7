// Presents an AnalysisResult: a table a person reads at a glance, or one JSON object with stable keys
// for scripts. Formatting only; every number was computed in core. Stateless.
#ifndef PLATEAU_DAEMON_PRESENTATION_ANALYSIS_REPORT_H_
#define PLATEAU_DAEMON_PRESENTATION_ANALYSIS_REPORT_H_

#include <string>
#include <vector>

#include "core/statistic_estimate.h"
#include "daemon/presentation/analysis_result.h"
#include "daemon/presentation/json_writer.h"

namespace plateau {

std::string FormatAnalysisTable(const AnalysisResult& result);
std::string FormatAnalysisJson(const AnalysisResult& result);

// The keys of one statistic, shared by every JSON output (analyze, later status): name, kind,
// columns, estimate_state, samples_total, samples_used, warmup_end_time, mean, std_error{...},
// integrated_time, effective_samples, confidence, half_width, relative_half_width, decided_by,
// drift{...}, warnings and the diagnostics beside them. Undefined numbers are null.
// The simulated-time scales (time_weighted, unit_time, integral_time_scale, averaging_time) and,
// when flow_through_time is a number, the same two in flow-throughs.
void WriteEstimateFields(JsonWriter& json, const StatisticEstimate& e,
                         const std::vector<std::string>& columns,
                         double flow_through_time = StatisticEstimate::kNaN);
// A source's weighting and the spread of its time spacing: weighting, requested, time_weighted,
// spacing{min, median, max}, gaps{count, last[{from, to}]}, description.
void WriteSpacing(JsonWriter& json, const SampleSpacing& spacing);

}  // namespace plateau

#endif  // PLATEAU_DAEMON_PRESENTATION_ANALYSIS_REPORT_H_
