// What an event of a run says happened: a statistic met or lost its target or drifts, the run met
// or lost every target, the input stalled, resumed or carries many bad lines. One name table for
// the config's `alerts: events:`, the store, JSON, the log and alert hooks.
#ifndef PLATEAU_CORE_EVENT_KIND_H_
#define PLATEAU_CORE_EVENT_KIND_H_

#include <optional>
#include <string_view>
#include <vector>

namespace plateau {

enum class EventKind { kMet, kLost, kRunMet, kRunLost, kDrift, kStalled, kResumed, kBadLines };

// met, lost, run_met, run_lost, drift, stalled, resumed, bad_lines.
std::string_view EventKindName(EventKind kind);
std::optional<EventKind> EventKindFromName(std::string_view name);
// Every kind, in the order above.
const std::vector<EventKind>& AllEventKinds();

}  // namespace plateau

#endif  // PLATEAU_CORE_EVENT_KIND_H_
