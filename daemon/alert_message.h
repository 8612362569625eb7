// What an alert says: a subject, a plain-text body and the PLATEAU_* environment of a command hook,
// from a recorded event and the run's configuration. Formatting only; stateless.
#ifndef PLATEAU_DAEMON_ALERT_MESSAGE_H_
#define PLATEAU_DAEMON_ALERT_MESSAGE_H_

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

}  // namespace plateau

#endif  // PLATEAU_DAEMON_ALERT_MESSAGE_H_
