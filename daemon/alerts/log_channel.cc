#include "daemon/alerts/log_channel.h"

namespace plateau {

void LogChannel::Deliver(const std::vector<EventRow>& events,
                         std::function<void(const Status&)> done) {
  for (const EventRow& e : events) log_->info("event {}: {}", EventKindName(e.kind), e.message);
  done(Status::Ok());
}

}  // namespace plateau
