// `plateau analyze FILE...`: one-shot analysis of probe files that already exist (a finished,
// paused or still-growing run). Reads the files, runs the estimator engine, prints a table or JSON.
// Runs on the calling thread; returns the process exit code.
#ifndef PLATEAU_DAEMON_COMMANDS_ANALYZE_COMMAND_H_
#define PLATEAU_DAEMON_COMMANDS_ANALYZE_COMMAND_H_

#include <ostream>
#include <string>
#include <vector>

namespace plateau {

// Exit codes: 0 analysed (statistics without enough data say so in the output), 2 bad usage or
// unusable input (unreadable file, unknown column, no data rows), with one message on `err`.
int RunAnalyzeCommand(const std::vector<std::string>& args, std::ostream& out, std::ostream& err);

// The usage text of the command.
std::string AnalyzeUsage();

}  // namespace plateau

#endif  // PLATEAU_DAEMON_COMMANDS_ANALYZE_COMMAND_H_
