#include "daemon/commands/watch_command.h"

#include <charconv>
#include <cmath>
#include <optional>

#include "config/config_loader.h"
#include "daemon/runtime/run_logger.h"
#include "daemon/monitoring/run_monitor.h"
#include "daemon/runtime/store_lock.h"
#include "daemon/serving/watch_loop.h"

namespace plateau {
namespace {

std::optional<double> PositiveSeconds(const std::string& text) {
  double value = 0.0;
  const auto [ptr, ec] = std::from_chars(text.data(), text.data() + text.size(), value);
  if (ec != std::errc() || ptr != text.data() + text.size() || !(value > 0.0) ||
      !std::isfinite(value)) {
    return std::nullopt;
  }
  return value;
}

}  // namespace

std::string WatchUsage() {
  return R"(usage: plateau watch CONFIG [options]

Follows the probe files the config names while the solver writes them, evaluates every statistic
against its target at each interval, and records snapshots, events and a checkpoint in the run's
SQLite store. Runs until SIGINT or SIGTERM, which write a final checkpoint. Restarted after a
crash (even kill -9), it resumes from the last checkpoint: nothing is counted twice or lost.

options:
  --evaluate-every SECONDS   evaluation interval (overrides evaluate_every)
  --poll-every SECONDS       file polling interval (overrides poll_every)
  --quiet                    log to the run's log file only, not to stderr

exit status: 0 after a clean stop; 2 when it cannot start; 3 when its store was deleted or moved
while it ran (the reason is on stderr either way).
)";
}

int RunWatchCommand(const std::vector<std::string>& args, std::ostream& out, std::ostream& err) {
  InstallEarlyStopHandler();
  std::string config_path;
  std::optional<double> evaluate_every;
  std::optional<double> poll_every;
  bool quiet = false;
  for (std::size_t i = 0; i < args.size(); ++i) {
    const std::string& a = args[i];
    if (a == "--help" || a == "-h") {
      out << WatchUsage();
      return 0;
    } else if (a == "--quiet") {
      quiet = true;
    } else if (a == "--evaluate-every" || a == "--poll-every") {
      const auto v = i + 1 < args.size() ? PositiveSeconds(args[++i]) : std::nullopt;
      if (!v) {
        err << "plateau watch: " << a << " takes a number of seconds above 0\n";
        return 2;
      }
      (a == "--evaluate-every" ? evaluate_every : poll_every) = v;
    } else if (!a.empty() && a[0] == '-') {
      err << "plateau watch: unknown option " << a << " (see plateau watch --help)\n";
      return 2;
    } else if (config_path.empty()) {
      config_path = a;
    } else {
      err << "plateau watch: one config file, please (got " << config_path << " and " << a
          << ")\n";
      return 2;
    }
  }
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

  Status status;
  std::unique_ptr<StoreLock> lock = StoreLock::Acquire(config->store_path, &status);
  if (!lock) {
    err << "plateau watch: " << status.message() << "\n";
    return 2;
  }
  std::unique_ptr<RunStore> store =
      RunStore::OpenForWriting(config->store_path, config->run_name, &status);
  if (!store) {
    err << "plateau watch: " << status.message() << "\n";
    return 2;
  }
  const auto log = MakeRunLogger(config->run_folder, config->run_name, quiet, config->alerts.syslog);
  log->info("watching run '{}': {} sources, {} statistics; store {}; polling every {} s, "
            "evaluating every {} s",
            config->run_name, config->sources.size(), config->statistics.size(),
            config->store_path, poll_every.value_or(config->poll_every),
            evaluate_every.value_or(config->evaluate_every));
  RunMonitor monitor(std::move(*config), std::move(store), log);
  monitor.Restore();
  WatchLoop loop(monitor, poll_every, evaluate_every, log);
  const int code = loop.Run();
  // The log file may have gone with the run folder: say why on stderr too.
  if (!loop.stop_reason().empty()) err << "plateau watch: " << loop.stop_reason() << "\n";
  log->info("stopped after cycle {}", monitor.cycle());
  return code;
}

}  // namespace plateau
