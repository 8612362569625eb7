#include "daemon/monitoring/input_event_words.h"

#include "daemon/presentation/number_format.h"

namespace plateau {

EventKind InputEventKind(InputHealthEvent::Kind kind) {
  switch (kind) {
    case InputHealthEvent::Kind::kStalled:
      return EventKind::kStalled;
    case InputHealthEvent::Kind::kResumed:
      return EventKind::kResumed;
    case InputHealthEvent::Kind::kBadLines:
      return EventKind::kBadLines;
  }
  return EventKind::kBadLines;
}

std::string InputEventMessage(const InputHealthEvent& e, double newest_time,
                              const InputHealthLimits& limits) {
  const std::string newest = FormatValue(newest_time);
  switch (e.kind) {
    case InputHealthEvent::Kind::kResumed:
      return "new samples arrive again (time " + newest + ")";
    case InputHealthEvent::Kind::kStalled:
      return "no new sample for " + FormatDuration(e.quiet_seconds) + " (the newest has time " +
             newest + "): has the solver stopped, crashed or hung?";
    case InputHealthEvent::Kind::kBadLines:
      return std::to_string(e.bad_lines) + " bad lines since the last evaluation (" +
             FormatValue(e.per_minute) + " a minute, above " +
             FormatValue(limits.bad_lines_per_minute) +
             "): is something else writing into the probe files?";
  }
  return "";
}

}  // namespace plateau
