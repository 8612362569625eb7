// `plateau report`: one self-contained HTML file of a run (inline SVG, no network, no JavaScript)
// from its store, and optionally the snapshot history as CSV. Reads the store only.
#ifndef PLATEAU_DAEMON_COMMANDS_REPORT_COMMAND_H_
#define PLATEAU_DAEMON_COMMANDS_REPORT_COMMAND_H_

#include <ostream>
#include <string>
#include <vector>

namespace plateau {

// 0 written; 2 no store, no evaluation yet, or a file that cannot be written.
int RunReportCommand(const std::vector<std::string>& args, std::ostream& out, std::ostream& err);
std::string ReportUsage();

}  // namespace plateau

#endif  // PLATEAU_DAEMON_COMMANDS_REPORT_COMMAND_H_
