#include "daemon/serving/watch_loop.h"

#include <sys/inotify.h>
#include <unistd.h>

#include <chrono>
#include <cmath>
#include <csignal>
#include <cstring>

#include "config/config_loader.h"
#include "daemon/presentation/number_format.h"
#include "daemon/runtime/wall_clock.h"

namespace plateau {
namespace {

constexpr double kInotifyDelay = 0.1;  // seconds: let a burst of writes settle before reading
// Between two readings the system clock may run off the steady clock by NTP's slewing (well under
// a second per minute); more than this is a step of the clock.
constexpr double kClockJumpSeconds = 2.0;

std::chrono::steady_clock::duration Seconds(double s) {
  return std::chrono::duration_cast<std::chrono::steady_clock::duration>(
      std::chrono::duration<double>(s));
}

volatile std::sig_atomic_t early_stop_signal = 0;

extern "C" void RememberStopSignal(int signal) { early_stop_signal = signal; }

}  // namespace

void InstallEarlyStopHandler() {
  struct sigaction action {};
  action.sa_handler = RememberStopSignal;
  sigemptyset(&action.sa_mask);
  sigaction(SIGINT, &action, nullptr);
  sigaction(SIGTERM, &action, nullptr);
  // A SIGHUP before the loop listens for it must not end the daemon (its default action).
  struct sigaction ignore {};
  ignore.sa_handler = SIG_IGN;
  sigaction(SIGHUP, &ignore, nullptr);
}

int EarlyStopSignal() { return early_stop_signal; }

WatchLoop::WatchLoop(RunMonitor& monitor, std::optional<double> poll_override,
                     std::optional<double> evaluate_override, std::shared_ptr<spdlog::logger> log)
    : monitor_(monitor),
      poll_override_(poll_override),
      evaluate_override_(evaluate_override),
      poll_seconds_(poll_override.value_or(monitor.config().poll_every)),
      evaluate_seconds_(evaluate_override.value_or(monitor.config().evaluate_every)),
      log_(std::move(log)),
      poll_timer_(io_),
      evaluate_timer_(io_),
      signals_(io_, SIGINT, SIGTERM),
      hang_up_(io_, SIGHUP),
      alerts_(io_, monitor, log_),
      query_(io_, monitor, [this] { return Reload(); }, log_),
      metrics_(io_, monitor, log_) {}

std::string WatchLoop::Reload() {
  std::vector<ConfigError> errors;
  const std::optional<RunConfig> fresh = LoadRunConfig(monitor_.config().config_path, &errors);
  if (!fresh) {
    std::string message = "config reload failed (" + std::to_string(errors.size()) +
                          " problems, the first: " + errors.front().ToString() +
                          "); the current config stays";
    log_->error("{}", message);
    return message;
  }
  std::string message = monitor_.Reload(*fresh);
  poll_seconds_ = poll_override_.value_or(monitor_.config().poll_every);
  evaluate_seconds_ = evaluate_override_.value_or(monitor_.config().evaluate_every);
  ScheduleEvaluation();
  log_->info("{}", message);
  return message;
}

void WatchLoop::WaitForHangUp() {
  hang_up_.async_wait([this](const boost::system::error_code& error, int) {
    if (error) return;
    log_->info("SIGHUP: reloading {}", monitor_.config().config_path);
    Reload();
    WaitForHangUp();
  });
}

double WatchLoop::Now() {
  const double wall = WallSeconds();
  const auto steady = std::chrono::steady_clock::now();
  if (last_wall_ > 0.0) {
    const double jump =
        (wall - last_wall_) - std::chrono::duration<double>(steady - last_steady_).count();
    if (std::fabs(jump) > kClockJumpSeconds) {
      log_->warn(
          "the system clock jumped {} by {}; durations (stall, progress rate) are measured "
          "across the jump, and recorded times follow the new clock",
          jump > 0 ? "forward" : "back", FormatDuration(std::fabs(jump)));
      monitor_.ShiftWallClock(jump);
    }
  }
  last_wall_ = wall;
  last_steady_ = steady;
  return wall;
}

void WatchLoop::Evaluate() {
  // Alerts go out right after the cycle that recorded their events.
  if (monitor_.Evaluate(Now()).ok()) {
    alerts_.Announce(monitor_.last_cycle().events);
    alerts_.DispatchDue();
  }
  // Writing on into a deleted file would lose every cycle from now on without a word. A moved
  // store has just received this cycle where it went; either way this daemon's place is gone.
  if (monitor_.store().HasMoved()) {
    stop_reason_ = "the store " + monitor_.store().path() +
                   " was deleted, moved or replaced while plateau ran (was the run folder "
                   "removed?); stopping after cycle " +
                   std::to_string(monitor_.cycle()) +
                   ", which went to the moved file if it still exists. Start plateau watch "
                   "again to go on with a new store";
    log_->error("{}", stop_reason_);
    exit_code_ = 3;
    io_.stop();
  }
}

WatchLoop::~WatchLoop() = default;

void WatchLoop::StartInotify() {
  const int fd = ::inotify_init1(IN_NONBLOCK | IN_CLOEXEC);
  if (fd < 0) {
    log_->warn("no inotify ({}): polling every {} s only", std::strerror(errno), poll_seconds_);
    return;
  }
  inotify_.emplace(io_, fd);
  WatchNewFolders();
  ReadInotify();
}

void WatchLoop::WatchNewFolders() {
  if (!inotify_) return;
  for (const std::string& folder : monitor_.Folders()) {
    if (watched_.count(folder) > 0) continue;
    const int wd = ::inotify_add_watch(inotify_->native_handle(), folder.c_str(),
                                       IN_MODIFY | IN_CREATE | IN_MOVED_TO | IN_CLOSE_WRITE |
                                           IN_DELETE | IN_ATTRIB);
    // A folder that does not exist yet is watched once it appears (polling finds it first).
    if (wd >= 0) watched_.insert(folder);
  }
}

void WatchLoop::ReadInotify() {
  inotify_->async_read_some(boost::asio::buffer(inotify_buffer_),
                            [this](const boost::system::error_code& error, std::size_t) {
                              if (error) {
                                if (error != boost::asio::error::operation_aborted) {
                                  log_->warn("inotify stopped ({}); polling only",
                                             error.message());
                                }
                                return;
                              }
                              // Never later than already planned: the store and the log live
                              // in the run folder, and their own writes raise events too.
                              const auto soon = std::chrono::steady_clock::now() +
                                                Seconds(kInotifyDelay);
                              if (soon < next_poll_) SchedulePoll(kInotifyDelay);
                              ReadInotify();
                            });
}

void WatchLoop::SchedulePoll(double seconds) {
  next_poll_ = std::chrono::steady_clock::now() + Seconds(seconds);
  poll_timer_.expires_at(next_poll_);
  poll_timer_.async_wait([this](const boost::system::error_code& error) {
    if (!error) PollNow();
  });
}

void WatchLoop::PollNow() {
  const bool more = monitor_.Poll(Now());
  WatchNewFolders();
  // A capped read means gigabytes of catch-up: continue at once, but through the loop, so that
  // signals and evaluations get their turn between slices. When the backlog is read, evaluate at
  // once rather than at the next interval: status is then current as soon as it can be.
  if (more) monitor_.NoteCatchUp();
  if (!catching_up_ && more) catch_up_start_ = std::chrono::steady_clock::now();
  if (catching_up_ && !more) {
    log_->info("caught up with the files in {:.1f} s",
               std::chrono::duration<double>(std::chrono::steady_clock::now() - catch_up_start_)
                   .count());
    Evaluate();
    ScheduleEvaluation();
  }
  catching_up_ = more;
  SchedulePoll(more ? 0.0 : poll_seconds_);
}

void WatchLoop::ScheduleEvaluation() {
  evaluate_timer_.expires_after(Seconds(evaluate_seconds_));
  evaluate_timer_.async_wait([this](const boost::system::error_code& error) {
    if (error) return;
    Evaluate();
    ScheduleEvaluation();
  });
}

void WatchLoop::Stop(int signal) {
  // No catch-up first: a batch system that sent SIGTERM sends SIGKILL soon after. What is unread
  // stays unread; the checkpoint's offsets say where to resume.
  log_->info("{}: writing a final cycle and stopping", signal == SIGINT ? "SIGINT" : "SIGTERM");
  // Alerts of this last cycle stay pending in the store: the next daemon sends them.
  if (monitor_.Evaluate(Now()).ok()) {
    alerts_.Announce(monitor_.last_cycle().events);
  } else {
    log_->error("the final cycle could not be written; the last recorded cycle ({}) stands",
                monitor_.cycle());
  }
  exit_code_ = 0;
  io_.stop();
}

int WatchLoop::Run() {
  signals_.async_wait([this](const boost::system::error_code& error, int signal) {
    if (!error) Stop(signal);
  });
  if (const int signal = EarlyStopSignal()) {
    Stop(signal);
    return exit_code_;
  }
  WaitForHangUp();
  const Status socket = query_.Start(monitor_.config().socket_path);
  if (!socket.ok()) log_->warn("{}; status and check read the store instead", socket.message());
  if (!monitor_.config().metrics_listen.empty()) {
    const Status metrics = metrics_.Start(monitor_.config().metrics_listen);
    if (metrics.ok()) {
      log_->info("metrics at http://{}/metrics", monitor_.config().metrics_listen);
    } else {
      log_->error("{}", metrics.message());
    }
  }
  StartInotify();
  PollNow();
  Evaluate();
  alerts_.Start();
  ScheduleEvaluation();
  io_.run();
  return exit_code_;
}

}  // namespace plateau
