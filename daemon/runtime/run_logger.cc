#include "daemon/runtime/run_logger.h"

#include <spdlog/sinks/null_sink.h>
#include <spdlog/sinks/rotating_file_sink.h>
#include <spdlog/sinks/stdout_sinks.h>
#include <spdlog/sinks/syslog_sink.h>

#include <vector>

namespace plateau {

std::shared_ptr<spdlog::logger> MakeRunLogger(const std::string& run_folder,
                                              const std::string& run_name, bool quiet,
                                              bool syslog) {
  std::vector<spdlog::sink_ptr> sinks;
  if (!quiet) sinks.push_back(std::make_shared<spdlog::sinks::stderr_sink_mt>());
  if (syslog) {
    sinks.push_back(std::make_shared<spdlog::sinks::syslog_sink_mt>("plateau", LOG_PID, LOG_USER,
                                                                     false));
  }
  std::string file_problem;
  const std::string path = run_folder + "/" + run_name + ".plateau.log";
  try {
    sinks.push_back(
        std::make_shared<spdlog::sinks::rotating_file_sink_mt>(path, 5 << 20, 3, false));
  } catch (const spdlog::spdlog_ex& e) {
    file_problem = e.what();
  }
  auto logger = std::make_shared<spdlog::logger>("plateau", sinks.begin(), sinks.end());
  logger->set_pattern("%Y-%m-%d %H:%M:%S.%e %^%l%$ %v");
  logger->flush_on(spdlog::level::info);
  if (!file_problem.empty()) logger->warn("no log file {}: {}", path, file_problem);
  return logger;
}

std::shared_ptr<spdlog::logger> MakeSilentLogger() {
  return std::make_shared<spdlog::logger>("silent",
                                          std::make_shared<spdlog::sinks::null_sink_mt>());
}

}  // namespace plateau
