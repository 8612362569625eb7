// A run's configuration as plain structs: what to read, what to estimate, when to stop. Built by
// LoadRunConfig from YAML; no YAML node outlives loading. Plain data; copied freely between threads.
#ifndef PLATEAU_CONFIG_RUN_CONFIG_H_
#define PLATEAU_CONFIG_RUN_CONFIG_H_

#include <optional>
#include <string>
#include <vector>

#include "core/convergence_tracker.h"
#include "core/evaluation_options.h"
#include "core/statistic_request.h"

namespace plateau {

struct SourceConfig {
  std::string name;
  std::string files;        // glob, absolute (resolved against the config file's folder)
  std::string time_column;  // name or 1-based number; empty: the first column
  std::vector<std::string> columns;  // names to use instead of the files' header; empty: header
};

struct StatisticConfig {
  StatisticRequest request;  // kind, columns; request.name is always set after loading
  std::string source;
  std::optional<Target> target;
  double minimum_time = 0.0;
  std::optional<double> reference;
};

struct RunConfig {
  std::string config_path;  // absolute
  std::string run_folder;   // the config file's folder: logs go here
  std::string run_name;
  std::string store_path;   // absolute
  double evaluate_every = 60.0;  // seconds of wall-clock time
  double poll_every = 10.0;      // seconds
  EvaluationOptions evaluation;  // its confidence is the default target confidence
  StopRuleSettings stop_rule;    // minimum_time is per statistic
  std::size_t blocks = 4096;
  std::vector<SourceConfig> sources;
  std::vector<StatisticConfig> statistics;
};

// One problem found in a config file, as "run.yaml:12:5: what is wrong, what was expected".
struct ConfigError {
  std::string file;
  int line = 0;    // 1-based; 0 when the problem has no place (the file cannot be read)
  int column = 0;  // 1-based
  std::string message;
  std::string ToString() const;
};

}  // namespace plateau

#endif  // PLATEAU_CONFIG_RUN_CONFIG_H_
