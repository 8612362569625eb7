// The daemon's log: spdlog to the console and to a rotating file in the run folder. Made once at
// start-up; spdlog loggers are thread-safe (the _mt sinks).
#ifndef PLATEAU_DAEMON_RUNTIME_RUN_LOGGER_H_
#define PLATEAU_DAEMON_RUNTIME_RUN_LOGGER_H_

#include <spdlog/spdlog.h>

#include <memory>
#include <string>

namespace plateau {

// Logs to stderr (unless `quiet`), to "<run_folder>/<run_name>.plateau.log" (5 MiB, 3 files
// kept) and, with `syslog`, to the system log as "plateau". A log file that cannot be created
// leaves the other sinks and says so on them.
std::shared_ptr<spdlog::logger> MakeRunLogger(const std::string& run_folder,
                                              const std::string& run_name, bool quiet,
                                              bool syslog = false);

// A logger that drops everything, for tests and one-shot commands.
std::shared_ptr<spdlog::logger> MakeSilentLogger();

}  // namespace plateau

#endif  // PLATEAU_DAEMON_RUNTIME_RUN_LOGGER_H_
