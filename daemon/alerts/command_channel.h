// Alerts by a command of the user's (alerts: command:), one run per event with the event in
// PLATEAU_* environment variables (command_runner.h); its exit status is the outcome and its
// first output lines go to the log.
#ifndef PLATEAU_DAEMON_ALERTS_COMMAND_CHANNEL_H_
#define PLATEAU_DAEMON_ALERTS_COMMAND_CHANNEL_H_

#include <utility>  // before Asio: Boost 1.74's Asio in C++20 mode needs it

#include <boost/asio.hpp>
#include <spdlog/spdlog.h>

#include <memory>

#include "config/run_config.h"
#include "daemon/alerts/alert_channel.h"

namespace plateau {

class CommandChannel : public AlertChannel {
 public:
  // `config` must have alerts.command; it is read during Deliver only.
  CommandChannel(boost::asio::io_context& io, const RunConfig& config,
                 std::shared_ptr<spdlog::logger> log)
      : io_(io), config_(config), log_(std::move(log)) {}

  AlertChannelKind kind() const override { return AlertChannelKind::kCommand; }
  void Deliver(const std::vector<EventRow>& events,
               std::function<void(const Status&)> done) override;

 private:
  boost::asio::io_context& io_;
  const RunConfig& config_;
  std::shared_ptr<spdlog::logger> log_;
};

}  // namespace plateau

#endif  // PLATEAU_DAEMON_ALERTS_COMMAND_CHANNEL_H_
