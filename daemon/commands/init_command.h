// `plateau init GLOB...` writes a commented starter config for the probe files found, and
// `plateau validate CONFIG` checks a config without starting anything. Return the exit code.
#ifndef PLATEAU_DAEMON_COMMANDS_INIT_COMMAND_H_
#define PLATEAU_DAEMON_COMMANDS_INIT_COMMAND_H_

#include <ostream>
#include <string>
#include <vector>

namespace plateau {

// 0 config written to `out`; 2 no readable probe file matched, or bad usage.
int RunInitCommand(const std::vector<std::string>& args, std::ostream& out, std::ostream& err);
// 0 valid (a summary on `out`); 2 invalid (every problem as FILE:LINE:COLUMN on `err`).
int RunValidateCommand(const std::vector<std::string>& args, std::ostream& out, std::ostream& err);
std::string InitUsage();
std::string ValidateUsage();

}  // namespace plateau

#endif  // PLATEAU_DAEMON_COMMANDS_INIT_COMMAND_H_
