// The run's log as an alert channel: every event, one line each ("event run_met: ..."), written
// as soon as its cycle is recorded. It needs no delivery record: a log line cannot be retried
// more usefully than it is written.
#ifndef PLATEAU_DAEMON_ALERTS_LOG_CHANNEL_H_
#define PLATEAU_DAEMON_ALERTS_LOG_CHANNEL_H_

#include <spdlog/spdlog.h>

#include <memory>

#include "daemon/alerts/alert_channel.h"

namespace plateau {

class LogChannel : public AlertChannel {
 public:
  explicit LogChannel(std::shared_ptr<spdlog::logger> log) : log_(std::move(log)) {}

  AlertChannelKind kind() const override { return AlertChannelKind::kLog; }
  bool sends_digest() const override { return true; }
  void Deliver(const std::vector<EventRow>& events,
               std::function<void(const Status&)> done) override;

 private:
  std::shared_ptr<spdlog::logger> log_;
};

}  // namespace plateau

#endif  // PLATEAU_DAEMON_ALERTS_LOG_CHANNEL_H_
