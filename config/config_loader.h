// Loads and validates a run configuration from a YAML file with yaml-cpp: every problem is reported
// with its line and column, unknown keys are errors (a typo must not silently change a run), and
// yaml-cpp's exceptions stop here. Stateless; safe from any thread.
#ifndef PLATEAU_CONFIG_CONFIG_LOADER_H_
#define PLATEAU_CONFIG_CONFIG_LOADER_H_

#include <optional>
#include <string>
#include <vector>

#include "config/run_config.h"

namespace plateau {

// Returns the config, or nullopt with every problem found in *errors (at least one).
std::optional<RunConfig> LoadRunConfig(const std::string& path, std::vector<ConfigError>* errors);

// The same from text, with `path` used for messages and for resolving relative paths.
std::optional<RunConfig> ParseRunConfig(const std::string& text, const std::string& path,
                                        std::vector<ConfigError>* errors);

}  // namespace plateau

#endif  // PLATEAU_CONFIG_CONFIG_LOADER_H_
