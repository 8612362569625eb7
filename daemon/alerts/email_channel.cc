#include "daemon/alerts/email_channel.h"

#include "daemon/alerts/alert_message.h"
#include "daemon/alerts/smtp_client.h"

namespace plateau {

void EmailChannel::Deliver(const std::vector<EventRow>& events,
                           std::function<void(const Status&)> done) {
  SendAlertMail(io_, *config_.alerts.email, ComposeDigest(events, config_), std::move(done));
}

}  // namespace plateau
