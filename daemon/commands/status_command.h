// `plateau status` and `plateau check`: what the store says now, for a person (a table) or a
// script (JSON, or an exit code: stop or continue). They read the store only, so they work while
// the daemon runs (WAL readers never block it) and after it died (saying how old the data is).
#ifndef PLATEAU_DAEMON_COMMANDS_STATUS_COMMAND_H_
#define PLATEAU_DAEMON_COMMANDS_STATUS_COMMAND_H_

#include <ostream>
#include <string>
#include <vector>

namespace plateau {

// 0 printed; 2 no store or unreadable.
int RunStatusCommand(const std::vector<std::string>& args, std::ostream& out, std::ostream& err);
// 0 every target met (stop), 1 not yet (continue), 2 cannot tell; one line on `err` saying why.
int RunCheckCommand(const std::vector<std::string>& args, std::ostream& out, std::ostream& err);
std::string StatusUsage();
std::string CheckUsage();

}  // namespace plateau

#endif  // PLATEAU_DAEMON_COMMANDS_STATUS_COMMAND_H_
