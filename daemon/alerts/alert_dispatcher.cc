#include "daemon/alerts/alert_dispatcher.h"

#include <algorithm>
#include <cmath>
#include <map>

#include "daemon/alerts/alert_channels.h"
#include "daemon/runtime/wall_clock.h"

namespace plateau {

AlertDispatcher::AlertDispatcher(boost::asio::io_context& io, RunMonitor& monitor,
                                 std::shared_ptr<spdlog::logger> log)
    : io_(io), monitor_(monitor), log_(std::move(log)), check_timer_(io) {}

void AlertDispatcher::Start() {
  DispatchDue();
  ScheduleCheck();
}

void AlertDispatcher::ScheduleCheck() {
  check_timer_.expires_after(std::chrono::duration_cast<std::chrono::steady_clock::duration>(
      std::chrono::duration<double>(kCheckEverySeconds)));
  check_timer_.async_wait([this](const boost::system::error_code& error) {
    if (error) return;
    DispatchDue();
    ScheduleCheck();
  });
}

void AlertDispatcher::DispatchDue() {
  const Result<std::vector<DeliveryRow>> read = monitor_.store().DueDeliveries(WallSeconds());
  if (!read.ok()) {
    log_->error("cannot read the pending alerts: {}", read.error());
    return;
  }
  const std::vector<DeliveryRow>& due = *read;
  // Each channel is made once for what is due now; a null one is no longer configured.
  std::map<AlertChannelKind, std::unique_ptr<AlertChannel>> channels;
  std::map<AlertChannelKind, std::vector<DeliveryRow>> digests;
  for (const DeliveryRow& d : due) {
    if (!in_flight_.insert({d.event.id, d.channel}).second) continue;
    const std::optional<AlertChannelKind> kind = AlertChannelKindFromName(d.channel);
    AlertChannel* channel = nullptr;
    if (kind) {
      auto [it, made] = channels.try_emplace(*kind);
      if (made) it->second = MakeAlertChannel(*kind, io_, monitor_.config(), log_);
      channel = it->second.get();
    }
    if (channel == nullptr) {
      Finish(d, Status::Error("the " + d.channel + " channel is no longer configured"));
    } else if (channel->sends_digest()) {
      digests[*kind].push_back(d);
    } else {
      channel->Deliver({d.event}, [this, d](const Status& result) { Finish(d, result); });
    }
  }
  for (auto& [kind, deliveries] : digests) {
    std::vector<EventRow> events;
    for (const DeliveryRow& d : deliveries) events.push_back(d.event);
    // Each delivery is recorded on its own, with the one result.
    channels.at(kind)->Deliver(events,
                               [this, deliveries = std::move(deliveries)](const Status& result) {
                                 for (const DeliveryRow& d : deliveries) Finish(d, result);
                               });
  }
}

void AlertDispatcher::Announce(const std::vector<EventRow>& events) {
  if (events.empty()) return;
  MakeAlertChannel(AlertChannelKind::kLog, io_, monitor_.config(), log_)
      ->Deliver(events, [](const Status&) {});
}

void AlertDispatcher::Finish(const DeliveryRow& d, const Status& result) {
  in_flight_.erase({d.event.id, d.channel});
  const double now = WallSeconds();
  const int attempt = d.attempts + 1;
  const int limit = monitor_.config().alerts.max_attempts;
  double retry_at = std::nan("");
  if (result.ok()) {
    log_->info("alert delivered by {}: {}", d.channel, d.event.message);
  } else if (attempt < limit) {
    const double wait =
        std::min(kLongestRetrySeconds, kFirstRetrySeconds * std::pow(2.0, attempt - 1));
    retry_at = now + wait;
    log_->warn("alert by {} failed (attempt {} of {}): {}; retrying in {} s", d.channel, attempt,
               limit, result.message(), wait);
  } else {
    log_->error("alert by {} failed {} times and is given up: {}", d.channel, attempt,
                result.message());
  }
  const Status recorded =
      monitor_.store().RecordDelivery(d.event.id, d.channel, result.ok(), result.message(), now,
                                      retry_at);
  if (!recorded.ok()) log_->error("cannot record the alert delivery: {}", recorded.message());
}

}  // namespace plateau
