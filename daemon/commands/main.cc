// The plateau binary: dispatches a subcommand. Every command returns its own exit code; nothing here
// does numerics.
#include <iostream>
#include <string>
#include <vector>

#include "daemon/commands/analyze_command.h"
#include "daemon/commands/init_command.h"
#include "daemon/commands/report_command.h"
#include "daemon/commands/status_command.h"
#include "daemon/commands/watch_command.h"

namespace {

constexpr const char* kVersion = "0.1.0";

void PrintUsage(std::ostream& out) {
  out << "usage: plateau COMMAND [options]\n\n"
         "Convergence monitor for the time averages of scale-resolving turbulence simulations.\n\n"
         "commands:\n"
         "  analyze FILE...   estimate time averages and their uncertainty from probe files\n"
         "  init GLOB...      write a starter config for the probe files found\n"
         "  validate CONFIG   check a config without starting anything\n"
         "  watch CONFIG      follow a running simulation (the daemon)\n"
         "  status [RUN]      every statistic as last evaluated\n"
         "  check [RUN]       stop or continue, as an exit status (0 stop, 1 continue, 2 unknown)\n"
         "  report [RUN]      one HTML file with plots of every statistic and profile\n"
         "  help [COMMAND]    this text, or a command's own\n"
         "  version           the program version\n\n"
         "Run 'plateau COMMAND --help' for a command's options.\n";
}

}  // namespace

int main(int argc, char** argv) {
  const std::vector<std::string> args(argv + 1, argv + argc);
  if (args.empty()) {
    PrintUsage(std::cerr);
    return 2;
  }
  const std::string& command = args[0];
  const std::vector<std::string> rest(args.begin() + 1, args.end());
  if (command == "analyze") return plateau::RunAnalyzeCommand(rest, std::cout, std::cerr);
  if (command == "init") return plateau::RunInitCommand(rest, std::cout, std::cerr);
  if (command == "validate") return plateau::RunValidateCommand(rest, std::cout, std::cerr);
  if (command == "watch") return plateau::RunWatchCommand(rest, std::cout, std::cerr);
  if (command == "status") return plateau::RunStatusCommand(rest, std::cout, std::cerr);
  if (command == "check") return plateau::RunCheckCommand(rest, std::cout, std::cerr);
  if (command == "report") return plateau::RunReportCommand(rest, std::cout, std::cerr);
  if (command == "version" || command == "--version") {
    std::cout << "plateau " << kVersion << "\n";
    return 0;
  }
  if (command == "help" || command == "--help" || command == "-h") {
    const std::string topic = rest.empty() ? "" : rest[0];
    if (topic == "analyze") {
      std::cout << plateau::AnalyzeUsage();
    } else if (topic == "init") {
      std::cout << plateau::InitUsage();
    } else if (topic == "validate") {
      std::cout << plateau::ValidateUsage();
    } else if (topic == "watch") {
      std::cout << plateau::WatchUsage();
    } else if (topic == "status") {
      std::cout << plateau::StatusUsage();
    } else if (topic == "check") {
      std::cout << plateau::CheckUsage();
    } else if (topic == "report") {
      std::cout << plateau::ReportUsage();
    } else {
      PrintUsage(std::cout);
    }
    return 0;
  }
  std::cerr << "plateau: unknown command '" << command << "'\n\n";
  PrintUsage(std::cerr);
  return 2;
}
