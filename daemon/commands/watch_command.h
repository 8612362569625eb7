// `plateau watch CONFIG`: the daemon. Validates the config (refusing to start on any error), takes
// the store's lock, resumes from its checkpoint and runs the event loop until SIGINT or SIGTERM.
// Returns the process exit code.
#ifndef PLATEAU_DAEMON_COMMANDS_WATCH_COMMAND_H_
#define PLATEAU_DAEMON_COMMANDS_WATCH_COMMAND_H_

#include <ostream>
#include <string>
#include <vector>

namespace plateau {

// 0 after a clean stop; 2 for bad usage, an invalid config, a store held by another daemon or
// one that cannot be opened, each with its message on `err`.
int RunWatchCommand(const std::vector<std::string>& args, std::ostream& out, std::ostream& err);
std::string WatchUsage();

}  // namespace plateau

#endif  // PLATEAU_DAEMON_COMMANDS_WATCH_COMMAND_H_
