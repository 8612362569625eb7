#include "daemon/presentation/analysis_report.h"

#include <cmath>
#include <cstdio>
#include <ctime>

#include "daemon/presentation/number_format.h"
#include "daemon/presentation/text_table.h"

namespace plateau {
namespace {

std::string WarmupDescription(const EvaluationOptions& options) {
  switch (options.warmup) {
    case WarmupPolicy::kAuto:
      return "automatic (MSER, then a fitted decay)";
    case WarmupPolicy::kNone:
      return "none";
    case WarmupPolicy::kFixedTime:
      return "fixed, before time " + FormatValue(options.warmup_time);
  }
  return "";
}

std::string DriftCell(const StatisticEstimate& e) {
  if (!e.drift.available) return "untested";
  if (e.drift_detected) return "DRIFTING (p " + PrintfNumber("%.1g", e.drift.p_value) + ")";
  return "no";
}

std::string FileLine(const FileSummary& f) {
  std::string line = f.path + ": " + std::to_string(f.rows) + " rows";
  if (f.rows > 0) {
    line += ", time " + FormatValue(f.first_time) + " to " + FormatValue(f.last_time);
  }
  if (f.bad_lines > 0) {
    line += ", " + std::to_string(f.bad_lines) + (f.bad_lines == 1 ? " bad line" : " bad lines");
  }
  if (f.restart_overlap > 0) {
    line += ", " + std::to_string(f.restart_overlap) + " rows of restart overlap skipped";
  }
  return line;
}

void AddStatisticRow(TextTable& table, const StatisticEstimate& e) {
  if (e.state != EstimateState::kEstimated) {
    table.AddRow({e.name, FormatValue(e.value), "-", "-", "-", "-",
                  std::isnan(e.warmup_end_time) ? "-" : FormatValue(e.warmup_end_time), "-",
                  e.state == EstimateState::kNoData ? "no data" : "not enough data"});
    return;
  }
  table.AddRow({e.name, FormatValue(e.value), FormatHalfWidth(e.half_width),
                FormatPercent(e.relative_half_width), PrintfNumber("%.3g", e.integrated_time),
                PrintfNumber("%.0f", e.effective_samples), FormatValue(e.warmup_end_time), DriftCell(e),
                std::string(EstimatorName(e.decision.estimator))});
}

void WriteWarmup(JsonWriter& json, const EvaluationOptions& options) {
  json.Key("warmup");
  switch (options.warmup) {
    case WarmupPolicy::kAuto:
      json.String("auto");
      return;
    case WarmupPolicy::kNone:
      json.String("none");
      return;
    case WarmupPolicy::kFixedTime:
      json.Number(options.warmup_time);
      return;
  }
}

}  // namespace

void WriteSpacing(JsonWriter& json, const SampleSpacing& spacing) {
  json.Key("weighting");
  json.BeginObject();
  json.Field("requested", WeightingName(spacing.requested()));
  json.Field("decided", spacing.decided());
  json.Field("time_weighted", spacing.time_weighted());
  json.Field("unit_time", spacing.unit_time());
  json.Key("spacing");
  json.BeginObject();
  json.Field("min", spacing.min_spacing());
  json.Field("median", spacing.median_spacing());
  json.Field("max", spacing.max_spacing());
  json.Field("varies", spacing.varies());
  json.EndObject();
  json.Key("gaps");
  json.BeginObject();
  json.Field("count", spacing.gap_count());
  json.Key("last");
  json.BeginArray();
  for (const SampleSpacing::Gap& g : spacing.gaps()) {
    json.BeginObject();
    json.Field("from", g.from);
    json.Field("to", g.to);
    json.EndObject();
  }
  json.EndArray();
  json.EndObject();
  json.Field("description", spacing.Describe());
  json.EndObject();
}

void WriteEstimateFields(JsonWriter& json, const StatisticEstimate& e,
                         const std::vector<std::string>& columns, double flow_through_time) {
  json.Field("name", e.name);
  json.Field("kind", KindName(e.kind));
  json.Key("columns");
  json.BeginArray();
  for (const std::string& c : columns) json.String(c);
  json.EndArray();
  json.Field("estimate_state", EstimateStateName(e.state));
  if (!e.state_reason.empty()) json.Field("estimate_reason", e.state_reason);
  json.Field("samples_total", e.samples_total);
  json.Field("samples_used", e.samples_used);
  json.Field("first_time", e.first_time);
  json.Field("last_time", e.last_time);
  json.Field("warmup_end_time", e.warmup_end_time);
  json.Field("mean", e.value);
  json.Key("std_error");
  json.BeginObject();
  json.Field("batch_means", e.se_batch_means);
  json.Field("overlapping_batch_means", e.se_overlapping_batch_means);
  json.Field("lugsail_batch_means", e.se_lugsail_batch_means);
  json.Field("autocorrelation", e.se_autocorrelation);
  json.Field("autocorrelation_sokal", e.se_sokal);
  json.Field("lag_window", e.se_lag_window);
  json.EndObject();
  json.Field("integrated_time", e.integrated_time);
  json.Key("integrated_time_by");
  json.BeginObject();
  json.Field("geyer", e.integrated_time_geyer);
  json.Field("sokal", e.integrated_time_sokal);
  json.EndObject();
  json.Field("effective_samples", e.effective_samples);
  json.Field("time_weighted", e.time_weighted);
  json.Field("unit_time", e.unit_time);
  json.Field("integral_time_scale", e.integral_time_scale);
  json.Field("averaging_time", e.averaging_time);
  if (std::isfinite(flow_through_time)) {
    json.Field("integral_time_flow_throughs", e.integral_time_scale / flow_through_time);
    json.Field("averaging_flow_throughs", e.averaging_time / flow_through_time);
  }
  json.Field("confidence", e.confidence);
  json.Field("half_width", e.half_width);
  json.Field("relative_half_width", e.relative_half_width);
  const bool estimated = e.state == EstimateState::kEstimated;
  json.Key("decided_by");
  if (estimated) {
    json.String(EstimatorName(e.decision.estimator));
  } else {
    json.Null();
  }
  json.Field("decision_reason", estimated ? e.decision.reason : "");
  json.Field("degrees_of_freedom", estimated ? e.decision.degrees_of_freedom : StatisticEstimate::kNaN);
  json.Field("half_width_uncertainty", e.half_width_uncertainty);
  json.Field("estimators_disagree", estimated && e.decision.disagreement > kDisagreementFactor);
  json.Field("disagreement", estimated ? e.decision.disagreement : StatisticEstimate::kNaN);
  json.Field("batch_length", e.batch_length);
  json.Field("block_length", e.block_length);
  json.Field("oscillation_period", e.oscillation_period > 0 ? e.oscillation_period
                                                             : StatisticEstimate::kNaN);
  json.Field("oscillation_cycles", e.oscillation_cycles);
  json.Key("drift");
  json.BeginObject();
  json.Field("tested", e.drift.available);
  json.Field("detected", e.drift_detected);
  json.Field("geweke_z", e.drift.available ? e.drift.z : StatisticEstimate::kNaN);
  json.Field("p_value", e.drift.available ? e.drift.p_value : StatisticEstimate::kNaN);
  json.EndObject();
  json.Key("warnings");
  json.BeginArray();
  for (const std::string& w : e.warnings) json.String(w);
  json.EndArray();
  json.Key("autocorrelation");
  json.BeginObject();
  json.Field("lag_samples", e.autocorrelation_lag);
  json.Key("rho");
  json.BeginArray();
  for (double r : e.autocorrelation) json.Number(r);
  json.EndArray();
  json.EndObject();
}

namespace {

// Notes of one source: its own, its statistics' states and warnings, its files' bad lines.
std::vector<std::string> SourceNotes(const SourceAnalysis& source) {
  std::vector<std::string> notes = source.notes;
  for (const StatisticEstimate& e : source.estimates) {
    if (!e.state_reason.empty()) notes.push_back(e.name + ": " + e.state_reason);
    for (const std::string& w : e.warnings) notes.push_back(e.name + ": " + w);
  }
  for (const FileSummary& f : source.files) {
    for (const std::string& bad : f.bad_line_examples) notes.push_back("bad line " + bad);
    if (f.bad_lines > f.bad_line_examples.size()) {
      notes.push_back(f.path + ": " + std::to_string(f.bad_lines - f.bad_line_examples.size()) +
                      " more bad lines not shown");
    }
    if (f.unterminated_last_line) {
      notes.push_back(f.path + ": the last line has no newline yet (still being written?) and "
                               "was not used");
    }
  }
  return notes;
}

std::string SourceSection(const SourceAnalysis& source, const EvaluationOptions& options) {
  std::string out;
  for (const FileSummary& f : source.files) out += FileLine(f) + "\n";
  out += FormatPercent(options.confidence) + " confidence, warm-up " +
         WarmupDescription(options) + ", " + std::to_string(options.batches) +
         " batches, time column '" + source.time_column + "'\n" +
         "samples " + source.spacing.Describe() + "\n\n";
  using A = TextTable::Align;
  TextTable table({{"statistic", A::kLeft},
                   {"value", A::kRight},
                   {"± half-width", A::kRight},
                   {"relative", A::kRight},
                   {"τ [samples]", A::kRight},
                   {"n_eff", A::kRight},
                   {"warm-up ends", A::kRight},
                   {"drift", A::kLeft},
                   {"decided by", A::kLeft}});
  for (const StatisticEstimate& e : source.estimates) AddStatisticRow(table, e);
  out += table.Render();
  const std::vector<std::string> notes = SourceNotes(source);
  if (!notes.empty()) {
    out += "\nnotes:\n";
    for (const std::string& n : notes) out += "  " + n + "\n";
  }
  return out;
}

}  // namespace

std::string FormatAnalysisTable(const AnalysisResult& result) {
  // One section per series; a single series reads as it always did, without a heading.
  std::string out;
  const bool headings = result.sources.size() > 1;
  for (std::size_t i = 0; i < result.sources.size(); ++i) {
    const SourceAnalysis& source = result.sources[i];
    if (headings) {
      out += std::string(i == 0 ? "" : "\n") + "== source " + source.name + ": " +
             source.series + " ==\n";
    }
    out += SourceSection(source, result.options);
  }
  if (!result.left_out.empty() || !result.notes.empty()) {
    out += "\nfiles:\n";
    for (const std::string& n : result.notes) out += "  note: " + n + "\n";
    for (const LeftOutFile& f : result.left_out) {
      out += "  left out " + f.path + ": " + f.reason + "\n";
    }
  }
  return out;
}

std::string FormatAnalysisJson(const AnalysisResult& result) {
  // The keys of a one-series analysis stay where they always were (files, time_column,
  // statistics, notes); each file and statistic also carries its source, and `sources` and
  // `left_out` describe the grouping.
  JsonWriter json;
  json.BeginObject();
  json.Key("files");
  json.BeginArray();
  for (const SourceAnalysis& source : result.sources) {
    for (const FileSummary& f : source.files) {
      json.BeginObject();
      json.Field("path", f.path);
      json.Field("source", source.name);
      json.Field("rows", f.rows);
      json.Field("bad_lines", f.bad_lines);
      json.Field("restart_overlap", f.restart_overlap);
      json.Field("first_time", f.first_time);
      json.Field("last_time", f.last_time);
      json.Field("unterminated_last_line", f.unterminated_last_line);
      json.EndObject();
    }
  }
  json.EndArray();
  json.Field("time_column", result.sources.empty() ? "" : result.sources.front().time_column);
  json.Field("confidence", result.options.confidence);
  json.Field("batches", result.options.batches);
  WriteWarmup(json, result.options);
  json.Key("sources");
  json.BeginArray();
  for (const SourceAnalysis& source : result.sources) {
    json.BeginObject();
    json.Field("name", source.name);
    json.Field("series", source.series);
    json.Field("time_column", source.time_column);
    WriteSpacing(json, source.spacing);
    json.Key("columns");
    json.BeginArray();
    for (const std::string& c : source.columns) json.String(c);
    json.EndArray();
    json.EndObject();
  }
  json.EndArray();
  json.Key("statistics");
  json.BeginArray();
  for (const SourceAnalysis& source : result.sources) {
    for (std::size_t i = 0; i < source.estimates.size(); ++i) {
      json.BeginObject();
      json.Field("source", source.name);
      WriteEstimateFields(json, source.estimates[i], source.statistic_columns[i]);
      json.EndObject();
    }
  }
  json.EndArray();
  json.Key("left_out");
  json.BeginArray();
  for (const LeftOutFile& f : result.left_out) {
    json.BeginObject();
    json.Field("path", f.path);
    json.Field("reason", f.reason);
    json.EndObject();
  }
  json.EndArray();
  json.Key("notes");
  json.BeginArray();
  for (const std::string& n : result.notes) json.String(n);
  for (const SourceAnalysis& source : result.sources) {
    for (const std::string& n : source.notes) json.String(n);
  }
  json.EndArray();
  json.EndObject();
  return json.text() + "\n";
}

}  // namespace plateau
