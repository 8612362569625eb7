#include "daemon/presentation/status_report.h"

#include <cmath>
#include <limits>
#include <set>

#include "daemon/presentation/number_format.h"
#include "daemon/presentation/json_writer.h"
#include "daemon/presentation/text_table.h"

namespace plateau {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

std::string StateWords(ConvergenceState state) {
  std::string words(ConvergenceStateName(state));
  for (char& c : words) c = c == '_' ? ' ' : c;
  return words;
}

std::string TargetCell(const SnapshotRow& s) {
  return s.target_kind ? FormatTarget(*s.target_kind, s.target_value) : "-";
}

std::string DaemonLine(const StatusContext& c, double age) {
  if (c.daemon_pid > 0) return "the daemon is running (process " + std::to_string(c.daemon_pid) + ")";
  if (c.daemon_pid < 0) return "the daemon is running";
  return "the daemon is not running: these numbers are " + FormatDuration(age) + " old";
}

struct Tally {
  int targets = 0;
  int met = 0;
  const SnapshotRow* first_unmet = nullptr;
  const SnapshotRow* column_missing = nullptr;
};

bool IsGroup(const SnapshotRow& s) { return s.kind == RowKind::kGroup; }
bool IsProfileSummary(const SnapshotRow& s) { return s.kind == RowKind::kProfileSummary; }

// "300 time units (about 2.1 h, at 2026-12-02 10:15 UTC)", or "unknown".
std::string Prediction(double simulated, double wall_seconds, double now) {
  if (std::isnan(simulated)) return "unknown";
  if (simulated == 0.0) return "reached";
  std::string text = PrintfNumber("%.3g", simulated) + " time units";
  if (!std::isnan(wall_seconds)) {
    text += " (about " + FormatDuration(wall_seconds) + ", at " +
            FormatUtcTime(now + wall_seconds) + ")";
  }
  return text;
}

Tally Count(const LatestView& v) {
  Tally t;
  for (const SnapshotRow& s : v.statistics) {
    if (s.state == ConvergenceState::kColumnMissing && !t.column_missing) t.column_missing = &s;
    if (!s.target_kind || IsGroup(s) || IsProfileSummary(s)) continue;
    ++t.targets;
    if (s.state == ConvergenceState::kMet) {
      ++t.met;
    } else if (!t.first_unmet) {
      t.first_unmet = &s;
    }
  }
  return t;
}

// One line per source: how its samples are weighted and the spread of their spacing. Read from
// each statistic's weighting object (the first statistic of a source speaks for it).
std::string WeightingLines(const LatestView& v) {
  std::set<std::string> seen;
  std::string out;
  for (const SnapshotRow& s : v.statistics) {
    const JsonDocument& d = s.document;
    if (!d.is_object() || !d.contains("weighting")) continue;
    const JsonDocument& weighting = d["weighting"];
    const std::string source = TextOr(d, "source");
    if (!weighting.is_object() || !seen.insert(source).second) continue;
    out += "source " + source + ": samples " + TextOr(weighting, "description") + "\n";
  }
  return out;
}

// How well the half-width itself is known, "±8 %" (the document's half_width_uncertainty).
std::string HalfWidthUncertaintyCell(const SnapshotRow& s) {
  const double u = NumberOr(s.document, "half_width_uncertainty");
  return std::isnan(u) || std::isnan(s.half_width) ? "-" : "±" + PrintfNumber("%.2g", 100.0 * u) + " %";
}

}  // namespace

std::string StatusTable(const LatestView& v, const StatusContext& c) {
  std::string out = "run '" + v.run_name + "': cycle " + std::to_string(v.cycle) + ", evaluated " +
                    FormatDuration(c.now - v.wall_time) + " ago (" + FormatUtcTime(v.wall_time) +
                    "); " + DaemonLine(c, c.now - v.wall_time) + "\n";
  out += "newest sample: time " + FormatValue(v.last_sample_time) + ", read " +
         FormatDuration(c.now - v.last_sample_wall_time) + " ago\n\n";
  using A = TextTable::Align;
  TextTable table({{"statistic", A::kLeft},
                   {"value", A::kRight},
                   {"± half-width", A::kRight},
                   {"known to", A::kRight},
                   {"conf.", A::kRight},
                   {"relative", A::kRight},
                   {"target", A::kRight},
                   {"τ [samples]", A::kRight},
                   {"T_int [time]", A::kRight},
                   {"n_eff", A::kRight},
                   {"warm-up ends", A::kRight},
                   {"state", A::kLeft},
                   {"met at", A::kRight},
                   {"time to target", A::kRight},
                   {"vs reference", A::kLeft}});
  for (const SnapshotRow& s : v.statistics) {
    if (IsGroup(s) || IsProfileSummary(s) || !s.profile.empty()) continue;
    const std::string tau = PrintfNumber("%.3g", s.integrated_time);
    const std::string neff = PrintfNumber("%.0f", s.effective_samples);
    const bool estimated = !std::isnan(s.half_width);
    table.AddRow({s.statistic, FormatValue(s.value), FormatHalfWidth(s.half_width),
                  HalfWidthUncertaintyCell(s), FormatPercent(s.confidence), FormatPercent(s.relative_half_width), TargetCell(s),
                  estimated ? tau : "-",
                  estimated ? FormatValue(s.integral_time_scale) : "-", estimated ? neff : "-",
                  FormatValue(s.warmup_end_time),
                  StateWords(s.state), FormatValue(s.met_at_time),
                  s.state == ConvergenceState::kMet || !s.target_kind
                      ? "-"
                      : Prediction(s.remaining_time, s.remaining_wall, c.now),
                  s.reference_verdict.empty() ? "-"
                  : s.reference_verdict == "bias" ? "BIAS"
                                                  : s.reference_verdict});
  }
  out += table.Render() + "\n";
  out += WeightingLines(v);
  for (const SnapshotRow& s : v.statistics) {
    if (IsGroup(s)) out += "group " + s.statistic + ": " + StateWords(s.state) + ", " + s.state_reason + "\n";
  }
  for (const SnapshotRow& s : v.statistics) {
    if (IsProfileSummary(s)) {
      out += "profile " + s.statistic + ": " + StateWords(s.state) + ", " + s.state_reason + "\n";
    }
  }
  const Tally t = Count(v);
  if (t.targets == 0) {
    out += "no statistic has a target: nothing to stop on\n";
  } else if (v.run_met) {
    out += "every target is met (" + std::to_string(t.met) + " of " + std::to_string(t.targets) +
           "): stop the solver\n";
  } else {
    out += std::to_string(t.met) + " of " + std::to_string(t.targets) + " targets met: continue; " +
           (v.remaining_time == 0.0
                ? std::string("every half-width is within its target, waiting for confirmations")
            : std::isnan(v.remaining_time)
                ? std::string("no prediction yet of when every target is met (a statistic "
                              "drifts or has too few samples to extrapolate)")
                : "every target is expected to be met after " +
                      Prediction(v.remaining_time, v.remaining_wall, c.now)) +
           "\n";
  }
  bool header = false;
  for (const SnapshotRow& s : v.statistics) {
    if (IsGroup(s) || IsProfileSummary(s) || !s.profile.empty() || s.state == ConvergenceState::kMet ||
        s.state == ConvergenceState::kMonitored || s.state_reason.empty()) {
      continue;
    }
    if (!header) out += "\nnotes:\n";
    header = true;
    out += "  " + s.statistic + ": " + StateWords(s.state) + ": " + s.state_reason + "\n";
  }
  return out;
}

std::string StatusJson(const LatestView& v, const StatusContext& c) {
  const Tally t = Count(v);
  JsonWriter json;
  json.BeginObject();
  json.Field("run", v.run_name);
  json.Field("store", c.store_path);
  json.Field("answered_by", c.answered_by);
  json.Field("cycle", v.cycle);
  json.Field("evaluated_at", v.wall_time);
  json.Field("age_seconds", c.now - v.wall_time);
  json.Field("last_sample_time", v.last_sample_time);
  json.Field("last_sample_read_at", v.last_sample_wall_time);
  json.Field("last_sample_age_seconds", c.now - v.last_sample_wall_time);
  json.Key("daemon");
  json.BeginObject();
  json.Field("running", c.daemon_pid != 0);
  json.Key("pid");
  if (c.daemon_pid > 0) {
    json.Integer(c.daemon_pid);
  } else {
    json.Null();
  }
  json.EndObject();
  json.Field("run_met", v.run_met);
  json.Field("targets", t.targets);
  json.Field("targets_met", t.met);
  json.Key("time_to_target");
  if (std::isnan(v.remaining_time)) {
    json.Null();
  } else {
    json.BeginObject();
    json.Field("simulated", v.remaining_time);
    json.Field("wall_seconds", v.remaining_wall);
    json.Field("expected_at", v.wall_time + v.remaining_wall);
    json.EndObject();
  }
  json.Key("statistics");
  json.BeginArray();
  for (const SnapshotRow& s : v.statistics) json.Value(s.document);
  json.EndArray();
  json.Key("files");
  json.BeginArray();
  for (const FileProgress& f : v.files) {
    json.BeginObject();
    json.Field("path", f.path);
    json.Field("source", f.source);
    json.Field("rows", f.rows);
    json.Field("bad_lines", f.bad_lines);
    json.Field("last_time", f.last_time);
    json.Field("vanished", f.vanished);
    json.EndObject();
  }
  json.EndArray();
  json.EndObject();
  return json.text();
}

std::optional<LatestView> LatestViewFromJson(const JsonDocument& d, StatusContext* c) {
  if (!d.is_object() || !d.contains("cycle") || !d.contains("statistics") ||
      !d["statistics"].is_array()) {
    return std::nullopt;
  }
  const auto flag = [](const JsonDocument& object, const char* key) {
    return object.is_object() && object.contains(key) && object[key].is_boolean() &&
           object[key].get<bool>();
  };
  LatestView v;
  v.run_name = TextOr(d, "run");
  v.cycle = static_cast<std::int64_t>(NumberOr(d, "cycle"));
  v.wall_time = NumberOr(d, "evaluated_at");
  v.last_sample_time = NumberOr(d, "last_sample_time");
  v.last_sample_wall_time = NumberOr(d, "last_sample_read_at");
  v.run_met = flag(d, "run_met");
  v.remaining_time = NumberOr(MemberOr(d, "time_to_target"), "simulated");
  v.remaining_wall = NumberOr(MemberOr(d, "time_to_target"), "wall_seconds");
  c->store_path = TextOr(d, "store");
  c->answered_by = TextOr(d, "answered_by");
  const JsonDocument& daemon = MemberOr(d, "daemon");
  const double pid = NumberOr(daemon, "pid");
  c->daemon_pid = !std::isnan(pid) ? static_cast<long>(pid) : (flag(daemon, "running") ? -1 : 0);
  for (const JsonDocument& s : d["statistics"]) {
    SnapshotRow row;
    row.document = s;  // as the store keeps it, so that both views render alike
    row.statistic = TextOr(s, "name");
    if (flag(s, "group")) row.kind = RowKind::kGroup;
    // A profile's summaries: per quantity (with "points") and its momentum balance.
    if (s.contains("points") || s.contains("departure")) row.kind = RowKind::kProfileSummary;
    if (s.contains("point")) row.profile = TextOr(s, "profile");
    row.state = ConvergenceStateFromName(TextOr(s, "state")).value_or(ConvergenceState::kNoData);
    row.state_reason = TextOr(s, "state_reason");
    row.value = NumberOr(s, "mean");
    row.half_width = NumberOr(s, "half_width");
    row.relative_half_width = NumberOr(s, "relative_half_width");
    row.integrated_time = NumberOr(s, "integrated_time");
    row.effective_samples = NumberOr(s, "effective_samples");
    row.integral_time_scale = NumberOr(s, "integral_time_scale");
    row.averaging_time = NumberOr(s, "averaging_time");
    row.warmup_end_time = NumberOr(s, "warmup_end_time");
    row.samples_used = static_cast<std::int64_t>(NumberOr(s, "samples_used"));
    row.last_time = NumberOr(s, "last_time");
    row.confidence = NumberOr(s, "confidence");
    row.remaining_time = NumberOr(MemberOr(s, "time_to_target"), "simulated");
    row.remaining_wall = NumberOr(MemberOr(s, "time_to_target"), "wall_seconds");
    row.reference_verdict = TextOr(MemberOr(s, "reference"), "verdict");
    if (MemberOr(s, "target").is_object()) {
      row.target_kind = TextOr(s["target"], "kind") == "relative" ? Target::Kind::kRelative
                                                                  : Target::Kind::kAbsolute;
      row.target_value = NumberOr(s["target"], "value");
    }
    row.target_half_width = NumberOr(s, "target_half_width");
    row.met_at_time = NumberOr(MemberOr(s, "met_at"), "simulated_time");
    row.met_at_wall = NumberOr(MemberOr(s, "met_at"), "wall_time");
    v.statistics.push_back(std::move(row));
  }
  for (const JsonDocument& f : MemberOr(d, "files").is_array() ? d["files"] : JsonDocument::array()) {
    FileProgress p;
    p.path = TextOr(f, "path");
    p.source = TextOr(f, "source");
    p.rows = static_cast<std::int64_t>(NumberOr(f, "rows"));
    p.bad_lines = static_cast<std::int64_t>(NumberOr(f, "bad_lines"));
    p.last_time = NumberOr(f, "last_time");
    p.vanished = flag(f, "vanished");
    v.files.push_back(std::move(p));
  }
  return v;
}

CheckAnswer Check(const LatestView& v, const StatusContext& c, const std::string& stat) {
  const std::string when = " (cycle " + std::to_string(v.cycle) + ", evaluated " +
                           FormatDuration(c.now - v.wall_time) + " ago" +
                           (c.daemon_pid == 0 ? "; the daemon is not running" : "") + ")";
  if (!stat.empty()) {
    for (const SnapshotRow& s : v.statistics) {
      if (s.statistic != stat) continue;
      // Groups and profile summaries are judged by their state; a statistic needs a target.
      const bool no_target = s.kind == RowKind::kStatistic && !s.target_kind;
      if (s.state == ConvergenceState::kColumnMissing || no_target) {
        return {2, "cannot tell: " + stat + " " + (no_target ? "has no target" : s.state_reason) +
                       when};
      }
      if (s.state == ConvergenceState::kMet) {
        return {0, "stop: " + stat + " met its target at time " + FormatValue(s.met_at_time) + when};
      }
      return {1, "continue: " + stat + " is " + StateWords(s.state) + ": " + s.state_reason + when};
    }
    return {2, "cannot tell: no statistic named '" + stat + "'"};
  }
  const Tally t = Count(v);
  if (t.column_missing) {
    return {2, "cannot tell: " + t.column_missing->statistic + ": " +
                   t.column_missing->state_reason + when};
  }
  if (t.targets == 0) return {2, "cannot tell: no statistic has a target" + when};
  if (v.run_met) {
    return {0, "stop: every target is met (" + std::to_string(t.met) + " of " +
                   std::to_string(t.targets) + ")" + when};
  }
  std::string message = "continue: " + std::to_string(t.met) + " of " +
                        std::to_string(t.targets) + " targets met";
  if (t.first_unmet) {
    message += "; " + t.first_unmet->statistic + " is " + StateWords(t.first_unmet->state) + ": " +
               t.first_unmet->state_reason;
  }
  return {1, message + when};
}

}  // namespace plateau
