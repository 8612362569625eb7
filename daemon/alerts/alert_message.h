// What an alert says: a subject, a plain-text body and the PLATEAU_* environment of a command hook,
// from a recorded event and the run's configuration. Formatting only; stateless.
#ifndef PLATEAU_DAEMON_ALERTS_ALERT_MESSAGE_H_
#define PLATEAU_DAEMON_ALERTS_ALERT_MESSAGE_H_

#include <string>
#include <utility>
#include <vector>

#include "config/run_config.h"
#include "store/run_store.h"

namespace plateau {

struct AlertMessage {
  std::string subject;  // ASCII
  std::string body;     // UTF-8 text, lines ending in "\n"
  std::vector<std::pair<std::string, std::string>> environment;
};

// The body says what happened, the value ± half-width where there is one, how long it took, and,
// when the config gives planned_end_time and cores and the progress rate is known, the core-hours
// that stopping now saves against the planned end.
AlertMessage ComposeAlert(const EventRow& event, const RunConfig& config);

// One message for several events at once (an evaluation can meet forty targets of a profile):
// the most important event (run_met, run_lost, stalled, bad_lines, lost, drift, resumed, met) in
// full, then one line per other event, at most kDigestLines of them. One event: ComposeAlert.
AlertMessage ComposeDigest(std::vector<EventRow> events, const RunConfig& config);
constexpr std::size_t kDigestLines = 50;

}  // namespace plateau

#endif  // PLATEAU_DAEMON_ALERTS_ALERT_MESSAGE_H_
