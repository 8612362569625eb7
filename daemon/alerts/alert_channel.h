// One way an alert leaves plateau. The dispatcher hands a channel the events due for it and records
// the outcome it reports; a channel neither reads nor writes the store. Adding a channel: a class
// implementing this interface in its own file, its kind in config/alert_routing.h (name, routing)
// with its config key, and a case in MakeAlertChannel (alert_channels.cc).
#ifndef PLATEAU_DAEMON_ALERTS_ALERT_CHANNEL_H_
#define PLATEAU_DAEMON_ALERTS_ALERT_CHANNEL_H_

#include <functional>
#include <vector>

#include "config/alert_routing.h"
#include "core/status.h"
#include "store/run_store.h"

namespace plateau {

class AlertChannel {
 public:
  virtual ~AlertChannel() = default;

  virtual AlertChannelKind kind() const = 0;
  // Whether the events due at one moment go out as one message (an evaluation can meet forty
  // targets of a profile) rather than one delivery each.
  virtual bool sends_digest() const { return false; }
  // Delivers `events` (one, or every event due now when sends_digest) and calls `done` exactly
  // once with the outcome, on the event loop's thread, possibly before returning. The channel
  // object may be destroyed as soon as Deliver returns: what the delivery needs later it owns.
  virtual void Deliver(const std::vector<EventRow>& events,
                       std::function<void(const Status&)> done) = 0;
};

}  // namespace plateau

#endif  // PLATEAU_DAEMON_ALERTS_ALERT_CHANNEL_H_
