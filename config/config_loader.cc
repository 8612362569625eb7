#include "config/config_loader.h"

#include <yaml-cpp/yaml.h>

#include <algorithm>
#include <charconv>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <limits>
#include <map>
#include <set>
#include <sstream>

namespace plateau {
namespace {

namespace fs = std::filesystem;

std::string Join(const std::vector<std::string>& items, const std::string& last = "or") {
  std::string out;
  for (std::size_t i = 0; i < items.size(); ++i) {
    if (i > 0) out += (i + 1 == items.size()) ? " " + last + " " : ", ";
    out += items[i];
  }
  return out;
}

// Walks the YAML tree into a RunConfig, collecting every problem with its place.
class Loader {
 public:
  Loader(std::string file, std::vector<ConfigError>* errors)
      : file_(std::move(file)), errors_(errors) {}

  std::optional<RunConfig> Load(const YAML::Node& root);

 private:
  void Error(const YAML::Node& at, const std::string& message) {
    const YAML::Mark mark = at.Mark();
    errors_->push_back({file_, mark.is_null() ? 0 : mark.line + 1,
                        mark.is_null() ? 0 : mark.column + 1, message});
  }

  // Reports every key not in `allowed`, and repeated keys.
  void CheckKeys(const YAML::Node& map, const std::vector<std::string>& allowed,
                 const std::string& where) {
    std::set<std::string> seen;
    for (auto it = map.begin(); it != map.end(); ++it) {
      const std::string key = it->first.Scalar();
      if (std::find(allowed.begin(), allowed.end(), key) == allowed.end()) {
        Error(it->first, "unknown key '" + key + "' in " + where + "; expected one of " +
                             Join(allowed));
      } else if (!seen.insert(key).second) {
        Error(it->first, "key '" + key + "' appears twice in " + where);
      }
    }
  }

  std::optional<std::string> Text(const YAML::Node& node, const std::string& what) {
    if (!node.IsScalar() || node.Scalar().empty()) {
      Error(node, what + " must be a text value");
      return std::nullopt;
    }
    return node.Scalar();
  }

  // A number within [low, high] (exclusive where `open`); the message names the key and the range.
  std::optional<double> Number(const YAML::Node& node, const std::string& what, double low,
                               double high, bool open_low, const std::string& expected) {
    double value = 0.0;
    const std::string text = node.IsScalar() ? node.Scalar() : "";
    const auto [ptr, ec] = std::from_chars(text.data(), text.data() + text.size(), value);
    const bool parsed = node.IsScalar() && ec == std::errc() && ptr == text.data() + text.size() &&
                        std::isfinite(value);
    const bool in_range = parsed && (open_low ? value > low : value >= low) && value <= high;
    if (!in_range) {
      Error(node, what + " must be " + expected + ", got '" + (node.IsScalar() ? text : "a list") +
                      "'");
      return std::nullopt;
    }
    return value;
  }

  std::vector<std::string> TextList(const YAML::Node& node, const std::string& what) {
    std::vector<std::string> items;
    if (node.IsScalar()) {
      items.push_back(node.Scalar());
    } else if (node.IsSequence()) {
      for (const YAML::Node& item : node) {
        if (auto t = Text(item, what)) items.push_back(*t);
      }
    } else {
      Error(node, what + " must be a name or a list of names");
    }
    return items;
  }

  std::string Resolve(const std::string& path) const {
    const fs::path p(path);
    return p.is_absolute() ? p.string() : (folder_ / p).lexically_normal().string();
  }

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
  std::optional<WallUnitsConfig> LoadWallUnits(const YAML::Node& node, const RunConfig& c);
  // A profile, and the per-point statistics it expands into (appended to c.statistics).
  std::optional<ProfileConfig> LoadProfile(const YAML::Node& node, RunConfig& c);
  bool Flag(const YAML::Node& node, const std::string& what, bool* value) {
    if (node.IsScalar() && (node.Scalar() == "true" || node.Scalar() == "false")) {
      *value = node.Scalar() == "true";
      return true;
    }
    Error(node, what + " must be true or false");
    return false;
  }

  std::string file_;
  fs::path folder_;
  std::vector<ConfigError>* errors_;
};

void Loader::LoadWarmup(const YAML::Node& node, EvaluationOptions& options) {
  if (node.IsScalar() && node.Scalar() == "auto") {
    options.warmup = WarmupPolicy::kAuto;
  } else if (node.IsScalar() && node.Scalar() == "none") {
    options.warmup = WarmupPolicy::kNone;
  } else if (auto t = Number(node, "warmup", -1e300, 1e300, false,
                             "auto, none, or a simulated time")) {
    options.warmup = WarmupPolicy::kFixedTime;
    options.warmup_time = *t;
  }
}

void Loader::LoadSettings(const YAML::Node& root, RunConfig& c) {
  if (root["run"]) {
    if (auto name = Text(root["run"], "run")) c.run_name = *name;
  }
  if (root["store"]) {
    if (auto store = Text(root["store"], "store")) c.store_path = Resolve(*store);
  }
  const auto seconds = [&](const char* key, double& field) {
    if (root[key]) {
      if (auto v = Number(root[key], key, 0.0, 1e7, true, "a number of seconds above 0")) {
        field = *v;
      }
    }
  };
  seconds("evaluate_every", c.evaluate_every);
  seconds("poll_every", c.poll_every);
  if (root["confidence"]) {
    if (auto v = Number(root["confidence"], "confidence", 0.0, 0.999999, true,
                        "a fraction between 0 and 1, such as 0.95")) {
      c.evaluation.confidence = *v;
    }
  }
  if (root["batches"]) {
    if (auto v = Number(root["batches"], "batches", 2, 1000, false, "a whole number from 2 to 1000");
        v && *v == std::floor(*v)) {
      c.evaluation.batches = static_cast<int>(*v);
    } else if (v) {
      Error(root["batches"], "batches must be a whole number from 2 to 1000");
    }
  }
  if (root["warmup"]) LoadWarmup(root["warmup"], c.evaluation);
  if (root["confirmations"]) {
    if (auto v = Number(root["confirmations"], "confirmations", 1, 1000, false,
                        "a whole number of evaluations from 1")) {
      c.stop_rule.confirmations = static_cast<int>(*v);
    }
  }
  if (root["minimum_effective_samples"]) {
    if (auto v = Number(root["minimum_effective_samples"], "minimum_effective_samples", 0, 1e15,
                        false, "a number of samples, 0 or more")) {
      c.stop_rule.minimum_effective_samples = *v;
      c.evaluation.minimum_effective_samples = *v;
    }
  }
  if (root["drift_p_value"]) {
    if (auto v = Number(root["drift_p_value"], "drift_p_value", 0.0, 0.5, true,
                        "a probability above 0 and at most 0.5, such as 0.001")) {
      c.evaluation.drift_p_value = *v;
    }
  }
  c.planned_end_time = std::numeric_limits<double>::quiet_NaN();
  c.cores = std::numeric_limits<double>::quiet_NaN();
  c.flow_through_time = std::numeric_limits<double>::quiet_NaN();
  if (root["flow_through_time"]) {
    if (auto v = Number(root["flow_through_time"], "flow_through_time", 0.0, 1e300, true,
                        "the simulated time of one flow-through, above 0")) {
      c.flow_through_time = *v;
    }
  }
  if (root["planned_end_time"]) {
    if (auto v = Number(root["planned_end_time"], "planned_end_time", -1e300, 1e300, false,
                        "the simulated time the run was planned to reach")) {
      c.planned_end_time = *v;
    }
  }
  if (root["cores"]) {
    if (auto v = Number(root["cores"], "cores", 0.0, 1e9, true, "the solver job's core count")) {
      c.cores = *v;
    }
  }
  if (root["socket"]) {
    if (auto path = Text(root["socket"], "socket")) c.socket_path = Resolve(*path);
  }
  if (root["metrics"]) LoadMetrics(root["metrics"], c);
  if (root["alerts"]) LoadAlerts(root["alerts"], c.alerts);
  if (root["blocks"]) {
    if (auto v = Number(root["blocks"], "blocks", 64, 1 << 24, false,
                        "a whole number of blocks from 64")) {
      c.blocks = static_cast<std::size_t>(*v);
    }
  }
}

std::optional<SourceConfig> Loader::LoadSource(const YAML::Node& node) {
  if (!node.IsMap()) {
    Error(node, "a source must be a map with name and files");
    return std::nullopt;
  }
  CheckKeys(node, {"name", "files", "time_column", "columns", "scale", "weighting"}, "a source");
  SourceConfig s;
  bool ok = true;
  if (!node["name"]) {
    Error(node, "a source needs a name");
    ok = false;
  } else if (auto n = Text(node["name"], "name")) {
    s.name = *n;
  } else {
    ok = false;
  }
  if (!node["files"]) {
    Error(node, "source '" + s.name + "' needs files: a path or glob of its probe files");
    ok = false;
  } else if (auto f = Text(node["files"], "files")) {
    s.files = Resolve(*f);
  } else {
    ok = false;
  }
  if (node["time_column"]) {
    if (auto t = Text(node["time_column"], "time_column")) s.time_column = *t;
  }
  if (node["columns"]) s.columns = TextList(node["columns"], "columns");
  if (node["weighting"]) {
    const std::optional<std::string> w = Text(node["weighting"], "weighting");
    const std::optional<Weighting> weighting = w ? ParseWeighting(*w) : std::nullopt;
    if (weighting) {
      s.weighting = *weighting;
    } else {
      if (w) Error(node["weighting"], "weighting must be auto, time or samples, not '" + *w + "'");
      ok = false;
    }
  }
  if (const YAML::Node scale = node["scale"]) {
    if (!scale.IsMap()) {
      Error(scale, "scale must map columns to factors, such as {\"tau.x\": -1}");
      ok = false;
    } else {
      for (auto it = scale.begin(); it != scale.end(); ++it) {
        const auto factor = Number(it->second, "a scale factor", -1e300, 1e300, false,
                                   "a number other than 0, such as -1 or a density");
        if (!factor || *factor == 0.0) {
          if (factor) Error(it->second, "a scale factor of 0 would erase the column");
          ok = false;
          continue;
        }
        s.scales.push_back({it->first.Scalar(), *factor});
      }
    }
  }
  return ok ? std::optional<SourceConfig>(s) : std::nullopt;
}

namespace {

// The columns and weights of a statistic that is a linear function of column means; false for the
// other kinds.
bool AsWeightedMeans(const StatisticConfig& s, std::vector<std::string>* columns,
                     std::vector<double>* weights, double scale) {
  if (s.request.kind == StatisticKind::kMean) {
    columns->push_back(s.request.columns[0]);
    weights->push_back(scale);
    return true;
  }
  if (s.request.kind == StatisticKind::kAverage) {
    for (const std::string& column : s.request.columns) {
      columns->push_back(column);
      weights->push_back(0.5 * scale);
    }
    return true;
  }
  return false;
}

}  // namespace

void Loader::ResolveReferenceSeries(const YAML::Node& statistics, RunConfig& c) {
  // Positions in `statistics` match c.statistics only when every statistic loaded.
  if (!errors_->empty() || !statistics || !statistics.IsSequence()) return;
  std::vector<StatisticConfig> added;
  for (std::size_t i = 0; i < c.statistics.size(); ++i) {
    StatisticConfig& s = c.statistics[i];
    if (s.reference_statistic.empty()) continue;
    const YAML::Node where = statistics[i]["reference"];
    const auto other = std::find_if(c.statistics.begin(), c.statistics.end(), [&](const auto& o) {
      return o.request.name == s.reference_statistic;
    });
    if (other == c.statistics.end() || &*other == &s) {
      Error(where, "reference statistic '" + s.reference_statistic + "' is not " +
                       (other == c.statistics.end() ? "defined" : "another statistic"));
      continue;
    }
    // Joint when both are column means of one source: then value - factor * reference is
    // averaged sample by sample, and its interval carries their correlation.
    std::vector<std::string> columns;
    std::vector<double> weights;
    if (other->source != s.source || !AsWeightedMeans(s, &columns, &weights, 1.0) ||
        !AsWeightedMeans(*other, &columns, &weights, -s.reference_factor) ||
        columns.size() > static_cast<std::size_t>(KindColumnCount(StatisticKind::kWeightedSum))) {
      continue;
    }
    StatisticConfig difference;
    difference.request = MakeRequest(StatisticKind::kWeightedSum, columns,
                                     s.request.name + " - reference");
    difference.request.weights = weights;
    difference.source = s.source;
    s.reference_difference = difference.request.name;
    added.push_back(std::move(difference));
  }
  for (StatisticConfig& d : added) c.statistics.push_back(std::move(d));
}

std::optional<Target> Loader::LoadTarget(const YAML::Node& node, double default_confidence) {
  if (!node.IsMap()) {
    Error(node, "target must be a map such as {relative: 0.01} or {absolute: 0.002}");
    return std::nullopt;
  }
  CheckKeys(node, {"relative", "absolute", "confidence"}, "a target");
  Target t;
  t.confidence = default_confidence;
  if (node["relative"] && node["absolute"]) {
    Error(node, "a target takes relative or absolute, not both");
    return std::nullopt;
  }
  if (node["relative"]) {
    auto v = Number(node["relative"], "relative", 0.0, 1e6, true,
                    "a fraction of the value above 0, such as 0.01 for 1 %");
    if (!v) return std::nullopt;
    t.kind = Target::Kind::kRelative;
    t.value = *v;
  } else if (node["absolute"]) {
    auto v = Number(node["absolute"], "absolute", 0.0, 1e300, true,
                    "a half-width above 0 in the statistic's units");
    if (!v) return std::nullopt;
    t.kind = Target::Kind::kAbsolute;
    t.value = *v;
  } else {
    Error(node, "a target needs relative or absolute");
    return std::nullopt;
  }
  if (node["confidence"]) {
    auto c = Number(node["confidence"], "confidence", 0.0, 0.999999, true,
                    "a fraction between 0 and 1, such as 0.95");
    if (!c) return std::nullopt;
    t.confidence = *c;
  }
  return t;
}

std::optional<StatisticConfig> Loader::LoadStatistic(const YAML::Node& node, const RunConfig& c) {
  if (!node.IsMap()) {
    Error(node, "a statistic must be a map with kind and columns");
    return std::nullopt;
  }
  CheckKeys(node,
            {"name", "source", "kind", "columns", "column", "target", "minimum_time", "reference"},
            "a statistic");
  StatisticConfig s;
  bool ok = true;
  const std::vector<std::string> kinds{"mean", "variance", "rms", "covariance", "third_moment",
                                       "tke", "average"};
  if (!node["kind"]) {
    s.request.kind = StatisticKind::kMean;
  } else if (auto k = Text(node["kind"], "kind")) {
    if (auto parsed = ParseKind(*k)) {
      s.request.kind = *parsed;
    } else {
      Error(node["kind"], "kind '" + *k + "' is not known; expected " + Join(kinds));
      ok = false;
    }
  }
  if (node["columns"] && node["column"]) {
    Error(node, "a statistic takes columns or column, not both");
    ok = false;
  }
  const YAML::Node columns = node["columns"] ? node["columns"] : node["column"];
  if (!columns) {
    Error(node, "a statistic needs columns (or column)");
    ok = false;
  } else {
    s.request.columns = TextList(columns, "columns");
    const int wanted = KindColumnCount(s.request.kind);
    if (ok && static_cast<int>(s.request.columns.size()) != wanted) {
      Error(columns, std::string(KindName(s.request.kind)) + " takes " + std::to_string(wanted) +
                         (wanted == 1 ? " column" : " columns") + ", got " +
                         std::to_string(s.request.columns.size()));
      ok = false;
    }
  }
  if (node["name"]) {
    if (auto n = Text(node["name"], "name")) s.request.name = *n;
  } else {
    s.request.name = DefaultStatisticName(s.request.kind, s.request.columns);
  }
  if (node["source"]) {
    if (auto src = Text(node["source"], "source")) s.source = *src;
  } else if (c.sources.size() == 1) {
    s.source = c.sources.front().name;
  } else {
    // With no source loaded, the sources' own errors say what is wrong, not this one.
    if (!c.sources.empty()) {
      Error(node, "statistic '" + s.request.name + "' needs a source (there are several)");
    }
    ok = false;
  }
  if (!s.source.empty() &&
      std::none_of(c.sources.begin(), c.sources.end(),
                   [&](const SourceConfig& src) { return src.name == s.source; })) {
    std::vector<std::string> names;
    for (const SourceConfig& src : c.sources) names.push_back(src.name);
    Error(node["source"] ? node["source"] : node,
          "statistic '" + s.request.name + "' names source '" + s.source +
              "', which is not defined; sources: " + Join(names, "and"));
    ok = false;
  }
  if (node["target"]) {
    s.target = LoadTarget(node["target"], c.evaluation.confidence);
    ok = ok && s.target.has_value();
  }
  if (node["minimum_time"]) {
    auto v = Number(node["minimum_time"], "minimum_time", 0.0, 1e300, false,
                    "a simulated time, 0 or more");
    if (v) s.minimum_time = *v;
    ok = ok && v.has_value();
  }
  if (const YAML::Node reference = node["reference"]; reference && reference.IsMap()) {
    CheckKeys(reference, {"statistic", "factor"}, "a reference series");
    if (!reference["statistic"]) {
      Error(reference, "a reference map names a statistic: {statistic: dpdx, factor: -0.025}");
      ok = false;
    } else if (auto r = Text(reference["statistic"], "statistic")) {
      s.reference_statistic = *r;
    }
    if (reference["factor"]) {
      const auto f = Number(reference["factor"], "factor", -1e300, 1e300, false, "a number");
      if (f) s.reference_factor = *f;
      ok = ok && f.has_value();
    }
  } else if (reference) {
    s.reference = Number(reference, "reference", -1e300, 1e300, false,
                         "a number, or {statistic: NAME, factor: F} for a reference series");
    ok = ok && s.reference.has_value();
  }
  return ok ? std::optional<StatisticConfig>(s) : std::nullopt;
}

std::optional<EmailConfig> Loader::LoadEmail(const YAML::Node& node) {
  if (!node.IsMap()) {
    Error(node, "email must be a map with host, from and to");
    return std::nullopt;
  }
  CheckKeys(node,
            {"host", "port", "from", "to", "starttls", "username", "password_file",
             "password_env", "ca_file", "timeout"},
            "email");
  EmailConfig e;
  bool ok = true;
  for (const char* required : {"host", "from", "to"}) {
    if (!node[required]) {
      Error(node, std::string("email needs ") + required);
      ok = false;
    }
  }
  if (node["host"]) ok = (e.host = Text(node["host"], "host").value_or("")).size() > 0 && ok;
  if (node["from"]) ok = (e.from = Text(node["from"], "from").value_or("")).size() > 0 && ok;
  if (node["to"]) {
    e.to = TextList(node["to"], "to");
    ok = ok && !e.to.empty();
  }
  if (node["port"]) {
    if (auto p = Number(node["port"], "port", 1, 65535, false, "a port number from 1 to 65535")) {
      e.port = static_cast<int>(*p);
    } else {
      ok = false;
    }
  }
  if (node["starttls"]) ok = Flag(node["starttls"], "starttls", &e.starttls) && ok;
  if (node["username"]) e.username = Text(node["username"], "username").value_or("");
  if (node["password_file"]) {
    if (auto f = Text(node["password_file"], "password_file")) e.password_file = Resolve(*f);
  }
  if (node["password_env"]) e.password_env = Text(node["password_env"], "password_env").value_or("");
  if (node["ca_file"]) {
    if (auto f = Text(node["ca_file"], "ca_file")) e.ca_file = Resolve(*f);
  }
  if (!e.username.empty() && e.password_file.empty() && e.password_env.empty()) {
    Error(node, "email has a username but no password_file or password_env (the password never "
                "goes in the config itself)");
    ok = false;
  }
  if (node["timeout"]) {
    auto t = Number(node["timeout"], "timeout", 0.0, 3600, true, "seconds above 0");
    ok = ok && t.has_value();
    if (t) e.timeout = *t;
  }
  return ok ? std::optional<EmailConfig>(e) : std::nullopt;
}

std::optional<CommandConfig> Loader::LoadCommand(const YAML::Node& node) {
  CommandConfig c;
  const YAML::Node argv = node.IsMap() ? node["argv"] : node;
  if (node.IsMap()) CheckKeys(node, {"argv", "timeout"}, "command");
  if (!argv || !argv.IsSequence() || argv.size() == 0) {
    Error(node, "command must be a list of program and arguments, e.g. [/usr/bin/logger, -t, "
                "plateau], or a map with argv");
    return std::nullopt;
  }
  c.argv = TextList(argv, "argv");
  if (node.IsMap() && node["timeout"]) {
    auto t = Number(node["timeout"], "timeout", 0.0, 86400, true, "seconds above 0");
    if (!t) return std::nullopt;
    c.timeout = *t;
  }
  return c;
}

void Loader::LoadAlerts(const YAML::Node& node, AlertsConfig& a) {
  if (!node.IsMap()) {
    Error(node, "alerts must be a map");
    return;
  }
  CheckKeys(node,
            {"events", "stall_after", "bad_lines_per_minute", "max_attempts", "email", "command",
             "stop_file", "syslog"},
            "alerts");
  if (node["events"]) {
    std::vector<std::string> kinds;
    for (const EventKind k : AllEventKinds()) kinds.emplace_back(EventKindName(k));
    a.events.clear();
    for (const std::string& e : TextList(node["events"], "events")) {
      if (const std::optional<EventKind> kind = EventKindFromName(e)) {
        a.events.push_back(*kind);
      } else {
        Error(node["events"], "event '" + e + "' is not known; expected " + Join(kinds));
      }
    }
  }
  if (node["stall_after"]) {
    if (auto v = Number(node["stall_after"], "stall_after", 0.0, 1e9, true, "seconds above 0")) {
      a.stall_after = *v;
    }
  }
  if (node["bad_lines_per_minute"]) {
    if (auto v = Number(node["bad_lines_per_minute"], "bad_lines_per_minute", 0.0, 1e12, false,
                        "a rate, 0 or more")) {
      a.bad_lines_per_minute = *v;
    }
  }
  if (node["max_attempts"]) {
    if (auto v = Number(node["max_attempts"], "max_attempts", 1, 100, false,
                        "a whole number from 1 to 100")) {
      a.max_attempts = static_cast<int>(*v);
    }
  }
  if (node["email"]) a.email = LoadEmail(node["email"]);
  if (node["command"]) a.command = LoadCommand(node["command"]);
  if (node["stop_file"]) {
    if (auto f = Text(node["stop_file"], "stop_file")) a.stop_file = Resolve(*f);
  }
  if (node["syslog"]) Flag(node["syslog"], "syslog", &a.syslog);
}

std::optional<StatisticGroup> Loader::LoadGroup(const YAML::Node& node, const RunConfig& c) {
  if (!node.IsMap()) {
    Error(node, "a group must be a map with name and members");
    return std::nullopt;
  }
  CheckKeys(node, {"name", "members", "bonferroni", "confidence", "required"}, "a group");
  StatisticGroup g;
  g.confidence = c.evaluation.confidence;
  bool ok = true;
  if (!node["name"] || !node["members"]) {
    Error(node, "a group needs a name and members");
    return std::nullopt;
  }
  g.name = Text(node["name"], "name").value_or("");
  g.members = TextList(node["members"], "members");
  for (const std::string& m : g.members) {
    const auto s = std::find_if(c.statistics.begin(), c.statistics.end(),
                                [&](const StatisticConfig& x) { return x.request.name == m; });
    if (s == c.statistics.end()) {
      Error(node["members"], "group '" + g.name + "' names statistic '" + m +
                                 "', which is not defined");
      ok = false;
    } else if (!s->target) {
      Error(node["members"], "group '" + g.name + "' member '" + m +
                                 "' has no target: a group stops on its members' targets");
      ok = false;
    }
  }
  if (std::any_of(c.statistics.begin(), c.statistics.end(),
                  [&](const StatisticConfig& x) { return x.request.name == g.name; })) {
    Error(node["name"], "group name '" + g.name + "' is also a statistic's name");
    ok = false;
  }
  if (node["bonferroni"]) ok = Flag(node["bonferroni"], "bonferroni", &g.bonferroni) && ok;
  if (node["required"]) ok = Flag(node["required"], "required", &g.required) && ok;
  if (node["confidence"]) {
    auto v = Number(node["confidence"], "confidence", 0.0, 0.999999, true,
                    "a fraction between 0 and 1, such as 0.95");
    ok = ok && v.has_value();
    if (v) g.confidence = *v;
  }
  return ok ? std::optional<StatisticGroup>(g) : std::nullopt;
}

std::optional<WallUnitsConfig> Loader::LoadWallUnits(const YAML::Node& node, const RunConfig& c) {
  if (!node.IsMap()) {
    Error(node, "wall_units must be a map with viscosity and wall_shear or friction_velocity");
    return std::nullopt;
  }
  CheckKeys(node, {"viscosity", "density", "wall_shear", "friction_velocity", "half_height"},
            "wall_units");
  WallUnitsConfig w;
  w.friction_velocity = std::numeric_limits<double>::quiet_NaN();
  w.half_height = std::numeric_limits<double>::quiet_NaN();
  bool ok = true;
  const auto positive = [&](const char* key, const char* what, double* field) {
    if (!node[key]) return;
    const auto v = Number(node[key], key, 0.0, 1e300, true, what);
    ok = ok && v.has_value();
    if (v) *field = *v;
  };
  if (!node["viscosity"]) {
    Error(node, "wall_units needs viscosity: the kinematic viscosity nu, m^2/s");
    ok = false;
  }
  positive("viscosity", "a kinematic viscosity above 0, in m^2/s", &w.viscosity);
  positive("density", "a density above 0, in kg/m^3", &w.density);
  positive("friction_velocity", "a friction velocity above 0, in m/s", &w.friction_velocity);
  positive("half_height", "a channel half-height above 0", &w.half_height);
  if (node["wall_shear"]) w.wall_shear = Text(node["wall_shear"], "wall_shear").value_or("");
  if (w.wall_shear.empty() == std::isnan(w.friction_velocity)) {
    Error(node, "wall_units takes wall_shear (a statistic's name) or friction_velocity, one of "
                "them");
    return std::nullopt;
  }
  if (!w.wall_shear.empty()) {
    const auto s = std::find_if(c.statistics.begin(), c.statistics.end(),
                                [&](const StatisticConfig& x) { return x.request.name == w.wall_shear; });
    if (s == c.statistics.end()) {
      Error(node["wall_shear"], "wall_shear names statistic '" + w.wall_shear +
                                    "', which is not defined");
      ok = false;
    } else if (s->request.kind != StatisticKind::kMean &&
               s->request.kind != StatisticKind::kAverage) {
      Error(node["wall_shear"], "wall_shear must be a mean or an average of wall shear stresses");
      ok = false;
    }
    if (!node["density"]) {
      Error(node, "wall_units with wall_shear needs density (u_tau = sqrt(tau_w / rho))");
      ok = false;
    }
  }
  return ok ? std::optional<WallUnitsConfig>(w) : std::nullopt;
}

namespace {

// The kind and the columns of a profile quantity at one point (u, v, w its column names).
bool QuantityRequest(const std::string& q, const std::string& u, const std::string& v,
                     const std::string& w, StatisticRequest* r) {
  const auto column = [&](char c) { return c == 'u' ? u : c == 'v' ? v : w; };
  const bool letters = !q.empty() && q.find_first_not_of("uvw") == std::string::npos;
  if (q == "U" || q == "V" || q == "W") {
    *r = MakeRequest(StatisticKind::kMean, {q == "U" ? u : q == "V" ? v : w});
  } else if (q == "k") {
    *r = MakeRequest(StatisticKind::kTke, {u, v, w});
  } else if (letters && q.size() == 2) {
    *r = q[0] == q[1] ? MakeRequest(StatisticKind::kVariance, {column(q[0])})
                      : MakeRequest(StatisticKind::kCovariance, {column(q[0]), column(q[1])});
  } else if (letters && q.size() == 3) {
    *r = MakeRequest(StatisticKind::kThirdMoment, {column(q[0]), column(q[1]), column(q[2])});
  } else {
    return false;
  }
  return true;
}

std::string PointColumn(const std::string& pattern, int index) {
  std::string name = pattern;
  const std::size_t at = name.find("{i}");
  return name.replace(at, 3, std::to_string(index));
}

}  // namespace

std::optional<ProfileConfig> Loader::LoadProfile(const YAML::Node& node, RunConfig& c) {
  if (!node.IsMap()) {
    Error(node, "a profile must be a map with name, source, positions and columns");
    return std::nullopt;
  }
  CheckKeys(node,
            {"name", "source", "positions", "wall_at", "columns", "first_index", "quantities",
             "target", "targets", "reference", "momentum_balance"},
            "a profile");
  ProfileConfig p;
  bool ok = true;
  for (const char* required : {"name", "positions", "columns"}) {
    if (!node[required]) {
      Error(node, std::string("a profile needs ") + required);
      ok = false;
    }
  }
  if (!ok) return std::nullopt;
  p.name = Text(node["name"], "name").value_or("");
  if (node["source"]) {
    p.source = Text(node["source"], "source").value_or("");
  } else if (c.sources.size() == 1) {
    p.source = c.sources.front().name;
  }
  if (std::none_of(c.sources.begin(), c.sources.end(),
                   [&](const SourceConfig& s) { return s.name == p.source; })) {
    Error(node["source"] ? node["source"] : node, "profile '" + p.name + "' needs a defined source");
    ok = false;
  }
  if (!node["positions"].IsSequence() || node["positions"].size() < 2) {
    Error(node["positions"], "positions must list the wall distance of each point (at least two)");
    return std::nullopt;
  }
  // With wall_at, positions are coordinates (from a probe file's header, say) and the wall
  // distance is their distance from the wall's coordinate.
  double wall_at = 0.0;
  const bool coordinates = static_cast<bool>(node["wall_at"]);
  if (coordinates) {
    const auto w = Number(node["wall_at"], "wall_at", -1e300, 1e300, false,
                          "the wall's coordinate along the probe line");
    if (!w) return std::nullopt;
    wall_at = *w;
  }
  for (const YAML::Node& y : node["positions"]) {
    if (auto v = Number(y, "a position", -1e300, 1e300, false, "a wall distance")) {
      if (coordinates) *v = std::fabs(*v - wall_at);
      if (!p.positions.empty() && *v <= p.positions.back()) {
        Error(y, "positions must increase away from the wall");
        ok = false;
      }
      p.positions.push_back(*v);
    } else {
      ok = false;
    }
  }
  const YAML::Node columns = node["columns"];
  std::string patterns[3];
  if (!columns.IsMap()) {
    Error(columns, "columns must be a map such as {u: \"u{i}\", v: \"v{i}\", w: \"w{i}\"}");
    return std::nullopt;
  }
  CheckKeys(columns, {"u", "v", "w"}, "a profile's columns");
  const char* components[3] = {"u", "v", "w"};
  for (int k = 0; k < 3; ++k) {
    if (!columns[components[k]]) {
      Error(columns, std::string("a profile's columns need ") + components[k]);
      ok = false;
      continue;
    }
    patterns[k] = Text(columns[components[k]], components[k]).value_or("");
    if (patterns[k].find("{i}") == std::string::npos) {
      Error(columns[components[k]], "a column pattern needs {i} for the point's number, such as "
                                    "\"u{i}\"");
      ok = false;
    }
  }
  int first = 0;
  if (node["first_index"]) {
    if (auto v = Number(node["first_index"], "first_index", 0, 1e9, false, "0 or 1, or any whole number")) {
      first = static_cast<int>(*v);
    }
  }
  p.quantities = node["quantities"] ? TextList(node["quantities"], "quantities")
                                    : std::vector<std::string>{"U", "uu", "vv", "ww", "uv", "k"};
  // One target for every quantity, and/or one per quantity (which wins); a quantity with neither
  // is monitored.
  std::optional<Target> target;
  if (node["target"]) {
    target = LoadTarget(node["target"], c.evaluation.confidence);
    ok = ok && target.has_value();
  }
  std::map<std::string, Target> targets;
  if (const YAML::Node per = node["targets"]) {
    if (!per.IsMap()) {
      Error(per, "targets must map quantities to targets, such as {U: {relative: 0.02}}");
      ok = false;
    } else {
      for (auto it = per.begin(); it != per.end(); ++it) {
        if (auto t = LoadTarget(it->second, c.evaluation.confidence)) {
          targets[it->first.Scalar()] = *t;
        } else {
          ok = false;
        }
      }
    }
  }
  if (node["momentum_balance"]) ok = Flag(node["momentum_balance"], "momentum_balance", &p.momentum_balance) && ok;
  if (const YAML::Node reference = node["reference"]) {
    if (!reference.IsMap()) {
      Error(reference, "reference must map quantities to files, such as {U: dns/u_plus.dat}");
      ok = false;
    } else {
      for (auto it = reference.begin(); it != reference.end(); ++it) {
        if (auto f = Text(it->second, "a reference file")) {
          p.references.emplace_back(it->first.Scalar(), Resolve(*f));
        }
      }
    }
  }
  if (!ok) return std::nullopt;
  for (const std::string& q : p.quantities) {
    StatisticRequest probe;
    if (!QuantityRequest(q, "u", "v", "w", &probe)) {
      Error(node["quantities"], "quantity '" + q + "' is not known; expected U, V, W, k, or two "
                                "or three of u, v, w such as uv or uuv");
      return std::nullopt;
    }
  }
  for (std::size_t i = 0; i < p.positions.size(); ++i) {
    const int index = first + static_cast<int>(i);
    const std::string u = PointColumn(patterns[0], index);
    const std::string v = PointColumn(patterns[1], index);
    const std::string w = PointColumn(patterns[2], index);
    for (const std::string& q : p.quantities) {
      StatisticConfig s;
      QuantityRequest(q, u, v, w, &s.request);
      s.request.name = p.name + "[" + std::to_string(i) + "]/" + q;
      s.request.shared_history = p.name + "[" + std::to_string(i) + "]";
      s.request.shared_columns = {u, v, w};
      s.source = p.source;
      const auto own = targets.find(q);
      s.target = own != targets.end() ? std::optional<Target>(own->second) : target;
      s.profile = p.name;
      s.point = static_cast<int>(i);
      s.position = p.positions[i];
      s.quantity = q;
      c.statistics.push_back(std::move(s));
    }
  }
  return p;
}

void Loader::LoadMetrics(const YAML::Node& node, RunConfig& c) {
  if (!node.IsMap()) {
    Error(node, "metrics must be a map such as {listen: 127.0.0.1:9464}");
    return;
  }
  CheckKeys(node, {"listen"}, "metrics");
  if (!node["listen"]) {
    Error(node, "metrics needs listen: HOST:PORT, such as 127.0.0.1:9464");
    return;
  }
  const auto listen = Text(node["listen"], "listen");
  if (!listen) return;
  const std::size_t colon = listen->rfind(':');
  int port = 0;
  const std::string port_text = colon == std::string::npos ? "" : listen->substr(colon + 1);
  const auto [ptr, ec] =
      std::from_chars(port_text.data(), port_text.data() + port_text.size(), port);
  if (colon == 0 || colon == std::string::npos || ec != std::errc() ||
      ptr != port_text.data() + port_text.size() || port < 1 || port > 65535) {
    Error(node["listen"], "listen must be HOST:PORT, such as 127.0.0.1:9464, got '" + *listen +
                              "'");
    return;
  }
  c.metrics_listen = *listen;
}

std::optional<RunConfig> Loader::Load(const YAML::Node& root) {
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
            {"run", "store", "evaluate_every", "poll_every", "confidence", "batches", "warmup",
             "confirmations", "minimum_effective_samples", "drift_p_value", "blocks",
             "planned_end_time", "cores", "flow_through_time", "socket", "metrics", "alerts",
             "sources",
             "statistics", "groups", "wall_units", "profiles"},
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
    Error(root, "the query socket path " + c.socket_path + " is longer than 107 bytes; set "
                "socket: to a shorter path");
  }
  if (c.blocks < 4 * static_cast<std::size_t>(c.evaluation.batches)) {
    Error(root, "blocks must be at least four times batches");
  }
  if (!errors_->empty()) return std::nullopt;
  return c;
}

}  // namespace

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
                       e.mark.is_null() ? 0 : e.mark.column + 1,
                       "not valid YAML: " + e.msg});
    return std::nullopt;
  }
  try {
    return Loader(path, errors).Load(root);
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
