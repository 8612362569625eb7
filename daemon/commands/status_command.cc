#include "daemon/commands/status_command.h"

#include <memory>
#include <optional>

#include "daemon/commands/command_line.h"
#include "daemon/presentation/json_document.h"
#include "daemon/serving/query_server.h"
#include "daemon/commands/run_locator.h"
#include "daemon/presentation/status_report.h"
#include "daemon/runtime/store_lock.h"
#include "daemon/runtime/wall_clock.h"
#include "store/run_store.h"

namespace plateau {
namespace {

constexpr double kAskSeconds = 2.0;

struct Reading {
  StatusContext context;
  std::optional<LatestView> view;
  std::string daemon_json;  // the document as the daemon sent it, when it answered
  std::string error;        // set when there is nothing to show
};

// From the daemon when it answers on its socket (fresher: it knows what it has read since its last
// evaluation), else from the store (the daemon may be dead; then the numbers say how old they are).
Reading Read(const std::string& argument) {
  Reading r;
  const LocatedRun located = LocateRun(argument);
  if (located.store_path.empty()) {
    r.error = located.error;
    return r;
  }
  r.context.now = WallSeconds();
  if (const auto reply = AskDaemon(located.socket_path, "{\"request\":\"status\"}", kAskSeconds)) {
    if (const Result<JsonDocument> document = ParseJsonDocument(*reply); document.ok()) {
      r.view = LatestViewFromJson(*document, &r.context);
      if (r.view) {
        r.daemon_json = *reply;
        return r;
      }
    }
  }
  r.context.store_path = located.store_path;
  r.context.answered_by = "store";
  const Result<std::unique_ptr<RunStore>> store = RunStore::OpenForReading(located.store_path);
  if (!store.ok()) {
    r.error = store.error();
    return r;
  }
  const Result<std::optional<LatestView>> latest = (*store)->ReadLatest();
  if (!latest.ok()) {
    r.error = latest.error();
  } else if (!(r.view = *latest)) {
    r.error = "store " + located.store_path + " has no evaluation yet";
  }
  r.context.daemon_pid = StoreLock::HolderPid(located.store_path);
  return r;
}

const char* kRunArgument = "the run: its config, its store or its folder (default: the current folder)";

// The command line of status, declared once: the parser and the --help text.
std::unique_ptr<CLI::App> StatusCommandLine(std::string& run, bool& json) {
  auto app = MakeCommandLine("status", R"(Every statistic as the daemon last evaluated it: value ± half-width, relative half-width against
its target, tau, n_eff, warm-up cut, state and when its target was met. Asks the running daemon on
its query socket, or reads the store when no daemon answers, so it works after the daemon stopped
too (and then says how old the numbers are). Without an argument it looks in the current folder
for plateau.db or a single config.)",
                             "");
  app->add_option("run", run, kRunArgument)->type_name("CONFIG|STORE|FOLDER");
  app->add_flag("--json", json, "one JSON object instead of the table");
  return app;
}

// The command line of check, declared once: the parser and the --help text.
std::unique_ptr<CLI::App> CheckCommandLine(std::string& run, std::string& stat) {
  auto app = MakeCommandLine("check", R"(Stop or continue, as an exit status, with one line on stderr saying why:
  0  every target is met: stop the solver
  1  not yet: continue
  2  cannot tell (no store, no evaluation yet, unreadable config, a statistic whose column is
     missing))",
                             "  until plateau check run.yaml; do sleep 600; done");
  app->add_option("run", run, kRunArgument)->type_name("CONFIG|STORE|FOLDER");
  app->add_option("--stat", stat, "the answer for this statistic only")
      ->type_name("NAME")
      ->multi_option_policy(CLI::MultiOptionPolicy::TakeLast);
  return app;
}

}  // namespace

std::string StatusUsage() {
  std::string run;
  bool json = false;
  return StatusCommandLine(run, json)->help();
}

std::string CheckUsage() {
  std::string run, stat;
  return CheckCommandLine(run, stat)->help();
}

int RunStatusCommand(const std::vector<std::string>& args, std::ostream& out, std::ostream& err) {
  std::string path;
  bool json = false;
  if (const auto exit_code = ParseCommandLine(*StatusCommandLine(path, json), args, out, err)) {
    return *exit_code;
  }
  const Reading r = Read(path);
  if (!r.view) {
    err << "plateau status: " << r.error << "\n";
    return 2;
  }
  if (json) {
    out << (r.daemon_json.empty() ? StatusJson(*r.view, r.context) : r.daemon_json) << "\n";
  } else {
    out << StatusTable(*r.view, r.context);
  }
  return 0;
}

int RunCheckCommand(const std::vector<std::string>& args, std::ostream& out, std::ostream& err) {
  std::string path;
  std::string stat;
  if (const auto exit_code = ParseCommandLine(*CheckCommandLine(path, stat), args, out, err)) {
    return *exit_code;
  }
  const Reading r = Read(path);
  if (!r.view) {
    err << "plateau check: cannot tell: " << r.error << "\n";
    return 2;
  }
  const CheckAnswer answer = Check(*r.view, r.context, stat);
  err << "plateau check: " << answer.message << "\n";
  return answer.exit_code;
}

}  // namespace plateau
