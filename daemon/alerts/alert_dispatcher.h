// Delivers alerts: every delivery the store holds as due (one per event and channel) is handed to
// its channel (alert_channel.h) on the event loop without blocking it (the e-mails due at one
// moment as one message); each outcome is recorded in the store, so that a restarted
// daemon neither loses a pending alert nor sends a delivered one again; a failure is retried with
// doubling back-off and given up after max_attempts. Single-threaded: the loop owns it.
#ifndef PLATEAU_DAEMON_ALERTS_ALERT_DISPATCHER_H_
#define PLATEAU_DAEMON_ALERTS_ALERT_DISPATCHER_H_

#include <utility>  // before Asio: Boost 1.74's Asio in C++20 mode needs it

#include <boost/asio.hpp>
#include <spdlog/spdlog.h>

#include <memory>
#include <set>
#include <string>
#include <vector>

#include "daemon/monitoring/run_monitor.h"

namespace plateau {

class AlertDispatcher {
 public:
  static constexpr double kFirstRetrySeconds = 10.0;
  static constexpr double kLongestRetrySeconds = 3600.0;
  static constexpr double kCheckEverySeconds = 5.0;

  AlertDispatcher(boost::asio::io_context& io, RunMonitor& monitor,
                  std::shared_ptr<spdlog::logger> log);

  // Starts the periodic check for due deliveries (retries come due between evaluations).
  void Start();
  // Starts every due delivery that is not already on its way.
  void DispatchDue();
  // Hands the events a cycle has just recorded to the channels that need no delivery record (the
  // log).
  void Announce(const std::vector<EventRow>& events);

 private:
  void Finish(const DeliveryRow& delivery, const Status& result);
  void ScheduleCheck();

  boost::asio::io_context& io_;
  RunMonitor& monitor_;
  std::shared_ptr<spdlog::logger> log_;
  boost::asio::steady_timer check_timer_;
  std::set<std::pair<std::int64_t, std::string>> in_flight_;
};

}  // namespace plateau

#endif  // PLATEAU_DAEMON_ALERTS_ALERT_DISPATCHER_H_
