// Every subcommand's command line comes from one CLI11 declaration (daemon/commands/
// command_line.h): its --help is generated from it, and a bad command line is answered the same
// way by all of them, with exit status 2 and nothing run.
#include "daemon/commands/command_line.h"

#include <gtest/gtest.h>

#include <functional>
#include <sstream>

#include "daemon/commands/analyze_command.h"
#include "daemon/commands/init_command.h"
#include "daemon/commands/report_command.h"
#include "daemon/commands/status_command.h"
#include "daemon/commands/watch_command.h"

namespace plateau {
namespace {

using Command = std::function<int(const std::vector<std::string>&, std::ostream&, std::ostream&)>;

struct NamedCommand {
  std::string name;
  Command run;
  std::function<std::string()> usage;
};

std::vector<NamedCommand> EveryCommand() {
  return {{"analyze", RunAnalyzeCommand, AnalyzeUsage},    {"init", RunInitCommand, InitUsage},
          {"validate", RunValidateCommand, ValidateUsage}, {"watch", RunWatchCommand, WatchUsage},
          {"status", RunStatusCommand, StatusUsage},       {"check", RunCheckCommand, CheckUsage},
          {"report", RunReportCommand, ReportUsage}};
}

TEST(CommandLine, EveryCommandRefusesAnUnknownOptionInTheSameWords) {
  for (const NamedCommand& c : EveryCommand()) {
    std::ostringstream out, err;
    EXPECT_EQ(c.run({"--frobnicate"}, out, err), 2) << c.name;
    EXPECT_EQ(err.str(), "plateau " + c.name + ": unknown option --frobnicate (see plateau " +
                             c.name + " --help)\n");
    EXPECT_EQ(out.str(), "") << c.name;
  }
}

TEST(CommandLine, EveryCommandPrintsItsGeneratedHelpAndExitsZero) {
  for (const NamedCommand& c : EveryCommand()) {
    for (const char* flag : {"--help", "-h"}) {
      std::ostringstream out, err;
      EXPECT_EQ(c.run({flag}, out, err), 0) << c.name;
      EXPECT_EQ(out.str(), c.usage()) << c.name;  // `plateau help NAME` prints the same text
      EXPECT_EQ(out.str().rfind("Usage: plateau " + c.name + " ", 0), 0u) << out.str();
      EXPECT_EQ(err.str(), "") << c.name;
    }
  }
}

TEST(CommandLine, AValueItsCheckRefusesNamesTheOptionWhatItTakesAndWhatCame) {
  std::ostringstream out, err;
  EXPECT_EQ(RunWatchCommand({"run.yaml", "--poll-every", "-3"}, out, err), 2);
  EXPECT_EQ(err.str(),
            "plateau watch: --poll-every: takes a number of seconds above 0; got '-3' (see "
            "plateau watch --help)\n");
}

TEST(CommandLine, OneArgumentTooManyIsNamed) {
  std::ostringstream out, err;
  EXPECT_EQ(RunValidateCommand({"a.yaml", "b.yaml"}, out, err), 2);
  EXPECT_EQ(err.str(),
            "plateau validate: unexpected argument b.yaml (see plateau validate --help)\n");
}

TEST(CommandLine, AMissingValueIsAnErrorNotTheNextOption) {
  std::ostringstream out, err;
  EXPECT_EQ(RunAnalyzeCommand({"probe.dat", "--time"}, out, err), 2);
  EXPECT_NE(err.str().find("plateau analyze: --time"), std::string::npos) << err.str();
}

TEST(CommandLine, FiniteNumberTakesWholeTextsOnly) {
  EXPECT_EQ(FiniteNumber("1e3"), 1000.0);
  EXPECT_EQ(FiniteNumber("-0.5"), -0.5);
  EXPECT_FALSE(FiniteNumber("1e3x"));
  EXPECT_FALSE(FiniteNumber("nan"));
  EXPECT_FALSE(FiniteNumber("inf"));
  EXPECT_FALSE(FiniteNumber(""));
}

}  // namespace
}  // namespace plateau
