// The event loop of `plateau watch`: a polling timer (always: network file systems do not report
// writes made on other nodes), inotify through an Asio descriptor where it works (to read sooner),
// an evaluation timer, and SIGINT/SIGTERM, which write a final cycle before exiting.
// Single-threaded: every handler runs on the one io_context thread.
#ifndef PLATEAU_DAEMON_SERVING_WATCH_LOOP_H_
#define PLATEAU_DAEMON_SERVING_WATCH_LOOP_H_

#include <utility>  // before Asio: Boost 1.74's Asio in C++20 mode needs it

#include <boost/asio.hpp>
#include <boost/asio/posix/stream_descriptor.hpp>
#include <spdlog/spdlog.h>

#include <array>
#include <chrono>
#include <memory>
#include <optional>
#include <set>
#include <string>

#include "daemon/alerts/alert_dispatcher.h"
#include "daemon/serving/metrics_server.h"
#include "daemon/serving/query_server.h"
#include "daemon/monitoring/run_monitor.h"

namespace plateau {

class WatchLoop {
 public:
  // Intervals come from the monitor's config unless given here (the command line's overrides,
  // which a reloaded config does not replace).
  WatchLoop(RunMonitor& monitor, std::optional<double> poll_override,
            std::optional<double> evaluate_override, std::shared_ptr<spdlog::logger> log);
  ~WatchLoop();

  // Runs until SIGINT or SIGTERM; returns the process exit code (0 after a clean stop, 3 when
  // the store vanished under it: stop_reason() says what happened).
  int Run();
  const std::string& stop_reason() const { return stop_reason_; }

 private:
  void StartInotify();
  void WatchNewFolders();
  void ReadInotify();
  void SchedulePoll(double seconds);
  void PollNow();
  void ScheduleEvaluation();
  void Stop(int signal);
  void WaitForHangUp();
  // Loads the config file again and applies what can change while running; returns what it did.
  std::string Reload();

  void Evaluate();
  // The system clock's time, after checking it against the steady clock: a jump of more than
  // kClockJumpSeconds since the last call is logged and passed to the monitor.
  double Now();

  RunMonitor& monitor_;
  std::optional<double> poll_override_;
  std::optional<double> evaluate_override_;
  double poll_seconds_;
  double evaluate_seconds_;
  std::shared_ptr<spdlog::logger> log_;
  boost::asio::io_context io_;
  boost::asio::steady_timer poll_timer_;
  boost::asio::steady_timer evaluate_timer_;
  boost::asio::signal_set signals_;
  boost::asio::signal_set hang_up_;
  AlertDispatcher alerts_;
  QueryServer query_;
  MetricsServer metrics_;
  std::optional<boost::asio::posix::stream_descriptor> inotify_;
  std::array<char, 4096> inotify_buffer_{};
  std::set<std::string> watched_;
  std::chrono::steady_clock::time_point next_poll_;
  bool catching_up_ = false;  // a backlog is being read in capped slices
  std::chrono::steady_clock::time_point catch_up_start_;
  int exit_code_ = 0;
  std::string stop_reason_;
  double last_wall_ = 0.0;  // Now()'s previous reading of both clocks; 0: none yet
  std::chrono::steady_clock::time_point last_steady_;
};

// Catches SIGINT and SIGTERM from the very start of the process (before the loop exists, while the
// config and the store are opened), so that a stop asked for early still ends cleanly: the loop
// sees it as soon as it runs. Returns the signal caught so far, or 0.
void InstallEarlyStopHandler();
int EarlyStopSignal();

}  // namespace plateau

#endif  // PLATEAU_DAEMON_SERVING_WATCH_LOOP_H_
