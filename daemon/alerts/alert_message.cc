#include "daemon/alerts/alert_message.h"

#include <algorithm>
#include <cmath>
#include <iterator>

#include "daemon/presentation/number_format.h"

namespace plateau {
namespace {

std::string Headline(const EventRow& e, const RunConfig& c) {
  switch (e.kind) {
    case EventKind::kRunMet:
      return c.run_name + ": every target met, the solver can stop";
    case EventKind::kRunLost:
      return c.run_name + ": targets no longer all met";
    case EventKind::kMet:
      return c.run_name + ": " + e.statistic + " met its target";
    case EventKind::kLost:
      return c.run_name + ": " + e.statistic + " lost its target";
    case EventKind::kDrift:
      return c.run_name + ": " + e.statistic + " drifts";
    case EventKind::kStalled:
      return c.run_name + ": no new samples";
    case EventKind::kResumed:
      return c.run_name + ": samples arrive again";
    case EventKind::kBadLines:
      return c.run_name + ": many bad lines in the probe files";
  }
  return c.run_name + ": " + std::string(EventKindName(e.kind));
}

// Lower is more important: what a person must act on comes first.
int Importance(EventKind kind) {
  static constexpr EventKind kOrder[] = {EventKind::kRunMet, EventKind::kRunLost,
                                         EventKind::kStalled, EventKind::kBadLines,
                                         EventKind::kLost, EventKind::kDrift,
                                         EventKind::kResumed, EventKind::kMet};
  const auto at = std::find(std::begin(kOrder), std::end(kOrder), kind);
  return static_cast<int>(at - std::begin(kOrder));
}

}  // namespace

AlertMessage ComposeDigest(std::vector<EventRow> events, const RunConfig& c) {
  std::stable_sort(events.begin(), events.end(), [](const EventRow& a, const EventRow& b) {
    return Importance(a.kind) < Importance(b.kind);
  });
  AlertMessage m = ComposeAlert(events.front(), c);
  if (events.size() == 1) return m;
  const std::size_t others = events.size() - 1;
  m.subject += " (and " + std::to_string(others) + " more event" + (others == 1 ? ")" : "s)");
  std::string also = "\nAlso in this message:\n";
  const std::size_t shown = std::min(others, kDigestLines);
  for (std::size_t i = 1; i <= shown; ++i) also += "- " + events[i].message + "\n";
  if (shown < others) {
    also += "- ... and " + std::to_string(others - shown) +
            " more; `plateau status` shows every statistic\n";
  }
  const std::size_t footer = m.body.rfind("\nRun ");
  m.body.insert(footer == std::string::npos ? m.body.size() : footer, also);
  return m;
}

AlertMessage ComposeAlert(const EventRow& e, const RunConfig& c) {
  AlertMessage m;
  m.subject = "[plateau] " + Headline(e, c);
  std::string& b = m.body;
  b += e.message + "\n\n";
  if (!std::isnan(e.value)) {
    b += "Value: " + FormatValue(e.value) + " " + FormatHalfWidth(e.half_width) + " at " +
         FormatPercent(e.confidence) + " confidence" +
         (e.target.empty() ? "" : " (target half-width " + e.target + ")") + "\n";
  }
  b += "Simulated time: " + FormatValue(e.simulated_time) +
       "; wall-clock time: " + FormatUtcTime(e.wall_time) + "\n";
  if (!std::isnan(e.elapsed_wall)) {
    b += "Followed by plateau for " + FormatDuration(e.elapsed_wall) + " since its first sample.\n";
  }
  const double remaining = c.planned_end_time - e.simulated_time;
  if ((e.kind == EventKind::kRunMet || e.kind == EventKind::kMet) && std::isfinite(remaining) && remaining > 0 &&
      e.progress_rate > 0 && std::isfinite(c.cores)) {
    const double hours = remaining / e.progress_rate;
    // Whole core-hours, or tenths below ten: a short run must not read "saves about 0".
    const double saved = hours * c.cores;
    const double shown = saved >= 10.0 ? std::round(saved) : std::round(10.0 * saved) / 10.0;
    b += "The run was planned to reach time " + FormatValue(c.planned_end_time) + "; at the " +
         "observed " + FormatValue(e.progress_rate) + " time units per hour that is " +
         FormatDuration(hours * 3600.0) + " more on " + FormatValue(c.cores) +
         " cores: stopping now saves about " + FormatValue(shown) +
         " core-hours.\n";
  }
  if (e.kind != EventKind::kRunMet && std::isfinite(e.remaining_time) && e.remaining_time > 0) {
    b += "Every target is expected to be met after " + FormatValue(e.remaining_time) +
         " more time units" +
         (e.progress_rate > 0
              ? " (about " + FormatDuration(e.remaining_time / e.progress_rate * 3600.0) +
                    " at the observed rate)"
              : "") +
         ".\n";
  }
  b += "\nRun " + c.run_name + ", store " + c.store_path + "\n" +
       "plateau measures sampling error only: a converged average is not a validated one.\n";
  m.environment = {
      {"PLATEAU_RUN", c.run_name},
      {"PLATEAU_STORE", c.store_path},
      {"PLATEAU_EVENT", std::string(EventKindName(e.kind))},
      {"PLATEAU_EVENT_ID", std::to_string(e.id)},
      {"PLATEAU_STATISTIC", e.statistic},
      {"PLATEAU_MESSAGE", e.message},
      {"PLATEAU_VALUE", std::isnan(e.value) ? "" : FormatValue(e.value)},
      {"PLATEAU_HALF_WIDTH", std::isnan(e.half_width) ? "" : FormatValue(e.half_width)},
      {"PLATEAU_CONFIDENCE", std::isnan(e.confidence) ? "" : FormatValue(e.confidence)},
      {"PLATEAU_TARGET", e.target},
      {"PLATEAU_SIMULATED_TIME", FormatValue(e.simulated_time)},
      {"PLATEAU_WALL_TIME", FormatUtcTime(e.wall_time)},
  };
  return m;
}

}  // namespace plateau
