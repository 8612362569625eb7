// The stop file (alerts: stop_file:): created with the event's message when every target is met,
// so that a solver that polls for such a file stops cleanly.
#ifndef PLATEAU_DAEMON_ALERTS_STOP_FILE_CHANNEL_H_
#define PLATEAU_DAEMON_ALERTS_STOP_FILE_CHANNEL_H_

#include <string>

#include "daemon/alerts/alert_channel.h"

namespace plateau {

class StopFileChannel : public AlertChannel {
 public:
  explicit StopFileChannel(std::string path) : path_(std::move(path)) {}

  AlertChannelKind kind() const override { return AlertChannelKind::kStopFile; }
  void Deliver(const std::vector<EventRow>& events,
               std::function<void(const Status&)> done) override;

 private:
  std::string path_;
};

}  // namespace plateau

#endif  // PLATEAU_DAEMON_ALERTS_STOP_FILE_CHANNEL_H_
