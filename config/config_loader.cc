#include "config/config_loader.h"

#include <yaml-cpp/yaml.h>

#include <filesystem>
#include <fstream>
#include <set>
#include <sstream>

#include "config/config_reader.h"

namespace plateau {

namespace fs = std::filesystem;

std::optional<RunConfig> ConfigReader::Load(const YAML::Node& root) {
  RunConfig c;
  const fs::path path = fs::absolute(file_);
  c.config_path = path.string();
  folder_ = path.parent_path();
  c.run_folder = folder_.string();
  c.run_name = path.stem().string();
  c.store_path = (folder_ / "plateau.db").string();
  c.socket_path.clear();
  if (!root.IsMap()) {
    Error(root, "the config must be a map of settings, sources and statistics");
    return std::nullopt;
  }
  CheckKeys(root,
            {"run",
             "store",
             "evaluate_every",
             "poll_every",
             "confidence",
             "batches",
             "warmup",
             "confirmations",
             "minimum_effective_samples",
             "max_half_width_uncertainty",
             "drift_p_value",
             "blocks",
             "planned_end_time",
             "cores",
             "flow_through_time",
             "socket",
             "metrics",
             "alerts",
             "sources",
             "statistics",
             "groups",
             "wall_units",
             "profiles"},
            "the run settings");
  LoadSettings(root, c);
  const YAML::Node sources = root["sources"];
  if (!sources || !sources.IsSequence() || sources.size() == 0) {
    Error(sources ? sources : root, "sources must be a list with at least one source");
  } else {
    std::set<std::string> names;
    for (const YAML::Node& node : sources) {
      if (auto s = LoadSource(node)) {
        if (!names.insert(s->name).second) Error(node, "source name '" + s->name + "' repeats");
        c.sources.push_back(*s);
      }
    }
  }
  const YAML::Node statistics = root["statistics"];
  if (!statistics || !statistics.IsSequence() || statistics.size() == 0) {
    Error(statistics ? statistics : root, "statistics must be a list with at least one statistic");
  } else {
    std::set<std::string> names;
    for (const YAML::Node& node : statistics) {
      if (auto s = LoadStatistic(node, c)) {
        if (!names.insert(s->request.name).second) {
          Error(node, "statistic name '" + s->request.name + "' repeats; give one a name");
        }
        c.statistics.push_back(*s);
      }
    }
  }
  ResolveReferenceSeries(statistics, c);
  if (const YAML::Node profiles = root["profiles"]) {
    if (!profiles.IsSequence()) {
      Error(profiles, "profiles must be a list of profiles");
    } else {
      for (const YAML::Node& node : profiles) {
        if (auto p = LoadProfile(node, c)) c.profiles.push_back(*p);
      }
    }
  }
  if (root["wall_units"]) c.wall_units = LoadWallUnits(root["wall_units"], c);
  if (const YAML::Node groups = root["groups"]) {
    if (!groups.IsSequence()) {
      Error(groups, "groups must be a list of groups");
    } else {
      for (const YAML::Node& node : groups) {
        if (auto g = LoadGroup(node, c)) c.groups.push_back(*g);
      }
    }
  }
  if (c.socket_path.empty()) c.socket_path = c.store_path + ".sock";
  // sockaddr_un holds 108 bytes with the terminating zero.
  if (c.socket_path.size() > 107) {
    Error(root, "the query socket path " + c.socket_path +
                    " is longer than 107 bytes; set "
                    "socket: to a shorter path");
  }
  if (c.blocks < 4 * static_cast<std::size_t>(c.evaluation.batches)) {
    Error(root, "blocks must be at least four times batches");
  }
  if (!errors_->empty()) return std::nullopt;
  return c;
}

std::string ConfigError::ToString() const {
  if (line == 0) return file + ": " + message;
  return file + ":" + std::to_string(line) + ":" + std::to_string(column) + ": " + message;
}

std::optional<RunConfig> ParseRunConfig(const std::string& text, const std::string& path,
                                        std::vector<ConfigError>* errors) {
  YAML::Node root;
  try {
    root = YAML::Load(text);
  } catch (const YAML::Exception& e) {
    errors->push_back({path, e.mark.is_null() ? 0 : e.mark.line + 1,
                       e.mark.is_null() ? 0 : e.mark.column + 1, "not valid YAML: " + e.msg});
    return std::nullopt;
  }
  try {
    return ConfigReader(path, errors).Load(root);
  } catch (const YAML::Exception& e) {
    errors->push_back({path, e.mark.is_null() ? 0 : e.mark.line + 1,
                       e.mark.is_null() ? 0 : e.mark.column + 1, e.msg});
    return std::nullopt;
  }
}

std::optional<RunConfig> LoadRunConfig(const std::string& path, std::vector<ConfigError>* errors) {
  std::ifstream in(path);
  if (!in) {
    errors->push_back({path, 0, 0, "cannot read the config file"});
    return std::nullopt;
  }
  std::stringstream text;
  text << in.rdbuf();
  return ParseRunConfig(text.str(), path, errors);
}

}  // namespace plateau
