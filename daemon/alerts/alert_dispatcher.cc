#include "daemon/alerts/alert_dispatcher.h"

#include <fcntl.h>
#include <unistd.h>

#include <algorithm>
#include <cerrno>
#include <cmath>
#include <cstring>

#include "daemon/alerts/alert_message.h"
#include "daemon/alerts/command_runner.h"
#include "daemon/alerts/smtp_client.h"
#include "daemon/runtime/wall_clock.h"

namespace plateau {
namespace {

// Writes the stop file (a solver that polls for it stops cleanly) with the event's message.
Status WriteStopFile(const std::string& path, const std::string& message) {
  const int fd = ::open(path.c_str(), O_WRONLY | O_CREAT | O_TRUNC | O_CLOEXEC, 0644);
  if (fd < 0) return Status::Error("cannot create the stop file " + path + ": " + std::strerror(errno));
  const std::string text = message + "\n";
  const bool written = ::write(fd, text.data(), text.size()) == static_cast<ssize_t>(text.size());
  ::close(fd);
  return written ? Status::Ok() : Status::Error("cannot write the stop file " + path);
}

std::string FirstLines(const std::string& output) {
  std::string shown = output.substr(0, 500);
  for (char& c : shown) c = c == '\n' ? '|' : c;
  return shown;
}

}  // namespace

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
  Status status;
  const std::vector<DeliveryRow> due = monitor_.store().DueDeliveries(WallSeconds(), &status);
  if (!status.ok()) {
    log_->error("cannot read the pending alerts: {}", status.message());
    return;
  }
  std::vector<DeliveryRow> mail;
  for (const DeliveryRow& d : due) {
    if (!in_flight_.insert({d.event.id, d.channel}).second) continue;
    if (d.channel == "email" && monitor_.config().alerts.email) {
      mail.push_back(d);
    } else {
      Deliver(d);
    }
  }
  if (!mail.empty()) DeliverMail(std::move(mail));
}

// Every e-mail due now goes in one message: a cycle that meets a profile's forty targets should
// not send forty messages. Each delivery is recorded on its own, with the one result.
void AlertDispatcher::DeliverMail(std::vector<DeliveryRow> due) {
  std::vector<EventRow> events;
  events.reserve(due.size());
  for (const DeliveryRow& d : due) events.push_back(d.event);
  SendAlertMail(io_, *monitor_.config().alerts.email, ComposeDigest(events, monitor_.config()),
                [this, due = std::move(due)](const Status& result) {
                  for (const DeliveryRow& d : due) Finish(d, result);
                });
}

void AlertDispatcher::Deliver(const DeliveryRow& d) {
  const RunConfig& config = monitor_.config();
  const AlertMessage message = ComposeAlert(d.event, config);
  if (d.channel == "command" && config.alerts.command) {
    RunAlertCommand(io_, *config.alerts.command, message.environment,
                    [this, d](const CommandResult& result) {
                      log_->info("alert command for event {} ({}): {}{}", d.event.id, d.event.kind,
                                 result.status.ok() ? "exit status 0" : result.status.message(),
                                 result.output.empty() ? "" : "; output: " + FirstLines(result.output));
                      Finish(d, result.status);
                    });
  } else if (d.channel == "stop_file" && !config.alerts.stop_file.empty()) {
    Finish(d, WriteStopFile(config.alerts.stop_file, d.event.message));
  } else {
    Finish(d, Status::Error("the " + d.channel + " channel is no longer configured"));
  }
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
