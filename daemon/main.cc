// The plateau binary: dispatches a subcommand. Every command returns its own exit code; nothing here
// does numerics.
#include <iostream>
#include <string>
#include <vector>

#include "daemon/analyze_command.h"

namespace {

constexpr const char* kVersion = "0.1.0";

void PrintUsage(std::ostream& out) {
  out << "usage: plateau COMMAND [options]\n\n"
         "Convergence monitor for the time averages of scale-resolving turbulence simulations.\n\n"
         "commands:\n"
         "  analyze FILE...   estimate time averages and their uncertainty from probe files\n"
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
  if (command == "version" || command == "--version") {
    std::cout << "plateau " << kVersion << "\n";
    return 0;
  }
  if (command == "help" || command == "--help" || command == "-h") {
    if (!rest.empty() && rest[0] == "analyze") {
      std::cout << plateau::AnalyzeUsage();
    } else {
      PrintUsage(std::cout);
    }
    return 0;
  }
  std::cerr << "plateau: unknown command '" << command << "'\n\n";
  PrintUsage(std::cerr);
  return 2;
}
