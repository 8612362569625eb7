#include "daemon/commands/watch_command.h"

#include <optional>

#include "config/config_loader.h"
#include "daemon/commands/command_line.h"
#include "daemon/runtime/run_logger.h"
#include "daemon/monitoring/run_monitor.h"
#include "daemon/runtime/store_lock.h"
#include "daemon/serving/watch_loop.h"

namespace plateau {
namespace {

struct WatchOptions {
  std::string config_path;
  std::optional<double> evaluate_every;
  std::optional<double> poll_every;
  bool quiet = false;
};

// The command line of watch, declared once: the parser and the --help text.
std::unique_ptr<CLI::App> WatchCommandLine(WatchOptions& o) {
  auto app = MakeCommandLine("watch", R"(Follows the probe files the config names while the solver writes them, evaluates every statistic
against its target at each interval, and records snapshots, events and a checkpoint in the run's
SQLite store. Runs until SIGINT or SIGTERM, which write a final checkpoint. Restarted after a
crash (even kill -9), it resumes from the last checkpoint: nothing is counted twice or lost.)",
                             R"(exit status: 0 after a clean stop; 2 when it cannot start; 3 when its store was deleted or moved
while it ran (the reason is on stderr either way).)");
  app->add_option("config", o.config_path, "the run's config")->type_name("CONFIG");
  const auto seconds = [&](const char* name, std::optional<double>& value, const char* what) {
    app->add_option_function<double>(name, [&value](double v) { value = v; }, what)
        ->check(ValueCheck(
            [](const std::string& v) {
              const auto s = FiniteNumber(v);
              return s && *s > 0.0;
            },
            "takes a number of seconds above 0"))
        ->type_name("SECONDS")
        ->multi_option_policy(CLI::MultiOptionPolicy::TakeLast);
  };
  seconds("--evaluate-every", o.evaluate_every, "evaluation interval (overrides evaluate_every)");
  seconds("--poll-every", o.poll_every, "file polling interval (overrides poll_every)");
  app->add_flag("--quiet", o.quiet, "log to the run's log file only, not to stderr");
  return app;
}

}  // namespace

std::string WatchUsage() {
  WatchOptions ignored;
  return WatchCommandLine(ignored)->help();
}

int RunWatchCommand(const std::vector<std::string>& args, std::ostream& out, std::ostream& err) {
  InstallEarlyStopHandler();
  WatchOptions o;
  if (const auto exit_code = ParseCommandLine(*WatchCommandLine(o), args, out, err)) {
    return *exit_code;
  }
  const std::string& config_path = o.config_path;
  if (config_path.empty()) {
    err << "plateau watch: no config file given (see plateau watch --help)\n";
    return 2;
  }
  std::vector<ConfigError> errors;
  std::optional<RunConfig> config = LoadRunConfig(config_path, &errors);
  if (!config) {
    for (const ConfigError& e : errors) err << e.ToString() << "\n";
    err << "plateau watch: not starting: " << errors.size() << " problem"
        << (errors.size() == 1 ? "" : "s") << " in " << config_path << "\n";
    return 2;
  }

  const Result<std::unique_ptr<StoreLock>> lock = StoreLock::Acquire(config->store_path);
  if (!lock.ok()) {
    err << "plateau watch: " << lock.error() << "\n";
    return 2;
  }
  Result<std::unique_ptr<RunStore>> store =
      RunStore::OpenForWriting(config->store_path, config->run_name);
  if (!store.ok()) {
    err << "plateau watch: " << store.error() << "\n";
    return 2;
  }
  const auto log = MakeRunLogger(config->run_folder, config->run_name, o.quiet, config->alerts.syslog);
  log->info("watching run '{}': {} sources, {} statistics; store {}; polling every {} s, "
            "evaluating every {} s",
            config->run_name, config->sources.size(), config->statistics.size(),
            config->store_path, o.poll_every.value_or(config->poll_every),
            o.evaluate_every.value_or(config->evaluate_every));
  RunMonitor monitor(std::move(*config), std::move(store).value(), log);
  monitor.Restore();
  WatchLoop loop(monitor, o.poll_every, o.evaluate_every, log);
  const int code = loop.Run();
  // The log file may have gone with the run folder: say why on stderr too.
  if (!loop.stop_reason().empty()) err << "plateau watch: " << loop.stop_reason() << "\n";
  log->info("stopped after cycle {}", monitor.cycle());
  return code;
}

}  // namespace plateau
