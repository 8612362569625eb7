// What the run's log and alerts say about its input's health (core/input_health.h decides).
// Formatting only; stateless.
#ifndef PLATEAU_DAEMON_MONITORING_INPUT_EVENT_WORDS_H_
#define PLATEAU_DAEMON_MONITORING_INPUT_EVENT_WORDS_H_

#include <string>

#include "core/event_kind.h"
#include "core/input_health.h"

namespace plateau {

EventKind InputEventKind(InputHealthEvent::Kind kind);

// The event's message; `newest_time` is the newest sample's simulated time.
std::string InputEventMessage(const InputHealthEvent& event, double newest_time,
                              const InputHealthLimits& limits);

}  // namespace plateau

#endif  // PLATEAU_DAEMON_MONITORING_INPUT_EVENT_WORDS_H_
