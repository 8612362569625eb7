// Reads the YAML tree of a run's config into a RunConfig, collecting every problem with its
// file:line:column. Private to config/ (the only place that sees yaml-cpp); one reader per load,
// on the calling thread. Its members live in config_reader*.cc by part of the config: settings
// and sources, statistics, alerts, profiles and wall units.
#ifndef PLATEAU_CONFIG_CONFIG_READER_H_
#define PLATEAU_CONFIG_CONFIG_READER_H_

#include <yaml-cpp/yaml.h>

#include <filesystem>
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "config/run_config.h"

namespace plateau {

// "a, b or c": the items of a message's list of choices.
std::string Join(const std::vector<std::string>& items, const std::string& last = "or");

class ConfigReader {
 public:
  ConfigReader(std::string file, std::vector<ConfigError>* errors)
      : file_(std::move(file)), errors_(errors) {}

  // The config, or nullopt when any problem was found (all of them in *errors).
  std::optional<RunConfig> Load(const YAML::Node& root);

 private:
  void Error(const YAML::Node& at, const std::string& message);
  // Reports every key not in `allowed`, and repeated keys.
  void CheckKeys(const YAML::Node& map, const std::vector<std::string>& allowed,
                 const std::string& where);
  std::optional<std::string> Text(const YAML::Node& node, const std::string& what);
  // A number within [low, high] (exclusive where `open`); the message names the key and the range.
  std::optional<double> Number(const YAML::Node& node, const std::string& what, double low,
                               double high, bool open_low, const std::string& expected);
  std::vector<std::string> TextList(const YAML::Node& node, const std::string& what);
  bool Flag(const YAML::Node& node, const std::string& what, bool* value);
  // A path of the config, relative to the config's folder.
  std::string Resolve(const std::string& path) const;

  void LoadSettings(const YAML::Node& root, RunConfig& c);
  void LoadWarmup(const YAML::Node& node, EvaluationOptions& options);
  std::optional<SourceConfig> LoadSource(const YAML::Node& node);
  // Checks every reference series and adds the joint difference statistics they can have.
  void ResolveReferenceSeries(const YAML::Node& statistics, RunConfig& c);
  std::optional<StatisticConfig> LoadStatistic(const YAML::Node& node, const RunConfig& c);
  std::optional<Target> LoadTarget(const YAML::Node& node, double default_confidence);
  void LoadAlerts(const YAML::Node& node, AlertsConfig& alerts);
  std::optional<EmailConfig> LoadEmail(const YAML::Node& node);
  std::optional<CommandConfig> LoadCommand(const YAML::Node& node);
  void LoadMetrics(const YAML::Node& node, RunConfig& c);
  std::optional<StatisticGroup> LoadGroup(const YAML::Node& node, const RunConfig& c);
  // The group's `joint:` rule into g (bonferroni / multivariate); multivariate members must share
  // a source.
  bool LoadJointRule(const YAML::Node& node, const RunConfig& c, StatisticGroup& g);
  std::optional<WallUnitsConfig> LoadWallUnits(const YAML::Node& node, const RunConfig& c);
  // A profile, and the per-point statistics it expands into (appended to c.statistics).
  std::optional<ProfileConfig> LoadProfile(const YAML::Node& node, RunConfig& c);
  // `joint: multivariate` on a profile: one multivariate group per quantity with a target, named
  // PROFILE/QUANTITY, over its points.
  void AddJointProfileGroups(const ProfileConfig& p, const std::map<std::string, Target>& targets,
                             const std::optional<Target>& target, RunConfig& c);

  std::string file_;
  std::filesystem::path folder_;
  std::vector<ConfigError>* errors_;
};

}  // namespace plateau

#endif  // PLATEAU_CONFIG_CONFIG_READER_H_
