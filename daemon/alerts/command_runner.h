// Runs an alert's command: the configured argv executed directly (execvp, no shell, so nothing in an
// event's fields is ever interpreted), with the event's fields in PLATEAU_* environment variables,
// its output collected, and SIGKILL after the timeout. The child is watched from the daemon's event
// loop; `done` runs on that loop's thread.
#ifndef PLATEAU_DAEMON_ALERTS_COMMAND_RUNNER_H_
#define PLATEAU_DAEMON_ALERTS_COMMAND_RUNNER_H_

#include <utility>  // before Asio: Boost 1.74's Asio in C++20 mode needs it

#include <boost/asio.hpp>

#include <functional>
#include <string>
#include <vector>

#include "config/run_config.h"
#include "core/status.h"

namespace plateau {

struct CommandResult {
  Status status;       // ok for exit status 0; otherwise what happened
  std::string output;  // stdout and stderr, at most 64 KiB
};

void RunAlertCommand(boost::asio::io_context& io, const CommandConfig& config,
                     const std::vector<std::pair<std::string, std::string>>& environment,
                     std::function<void(CommandResult)> done);

}  // namespace plateau

#endif  // PLATEAU_DAEMON_ALERTS_COMMAND_RUNNER_H_
