// Alerts by e-mail: the events due at one moment as one message (ComposeDigest), sent by SMTP on
// the event loop (smtp_client.h).
#ifndef PLATEAU_DAEMON_ALERTS_EMAIL_CHANNEL_H_
#define PLATEAU_DAEMON_ALERTS_EMAIL_CHANNEL_H_

#include <utility>  // before Asio: Boost 1.74's Asio in C++20 mode needs it

#include <boost/asio.hpp>

#include "config/run_config.h"
#include "daemon/alerts/alert_channel.h"

namespace plateau {

class EmailChannel : public AlertChannel {
 public:
  // `config` must have alerts.email; it is read during Deliver only.
  EmailChannel(boost::asio::io_context& io, const RunConfig& config) : io_(io), config_(config) {}

  AlertChannelKind kind() const override { return AlertChannelKind::kEmail; }
  bool sends_digest() const override { return true; }
  void Deliver(const std::vector<EventRow>& events,
               std::function<void(const Status&)> done) override;

 private:
  boost::asio::io_context& io_;
  const RunConfig& config_;
};

}  // namespace plateau

#endif  // PLATEAU_DAEMON_ALERTS_EMAIL_CHANNEL_H_
