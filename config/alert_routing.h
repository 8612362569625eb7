// Which alert channels take an event: the ways an alert leaves plateau, their names, and the rule
// that routes an event kind to them from the config's `alerts:`. Pure; stateless.
#ifndef PLATEAU_CONFIG_ALERT_ROUTING_H_
#define PLATEAU_CONFIG_ALERT_ROUTING_H_

#include <optional>
#include <string_view>
#include <vector>

#include "config/run_config.h"
#include "core/event_kind.h"

namespace plateau {

enum class AlertChannelKind {
  kEmail,     // alerts: email:, for the kinds in alerts: events:
  kCommand,   // alerts: command:, for the same kinds
  kStopFile,  // alerts: stop_file:, for run_met only
  kLog,       // the run's log: every event, always
};

// email, command, stop_file, log (the store's deliveries keep these names).
std::string_view AlertChannelKindName(AlertChannelKind channel);
std::optional<AlertChannelKind> AlertChannelKindFromName(std::string_view name);

// The channels whose deliveries are recorded with an event of `kind` and retried until they
// succeed (the log is written when the cycle is recorded and needs no delivery).
std::vector<AlertChannelKind> RecordedChannelsFor(EventKind kind, const AlertsConfig& alerts);

}  // namespace plateau

#endif  // PLATEAU_CONFIG_ALERT_ROUTING_H_
