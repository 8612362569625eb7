#include "config/config_reader.h"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <filesystem>
#include <limits>
#include <set>

namespace plateau {

std::string Join(const std::vector<std::string>& items, const std::string& last) {
  std::string out;
  for (std::size_t i = 0; i < items.size(); ++i) {
    if (i > 0) out += (i + 1 == items.size()) ? " " + last + " " : ", ";
    out += items[i];
  }
  return out;
}

void ConfigReader::Error(const YAML::Node& at, const std::string& message) {
  const YAML::Mark mark = at.Mark();
  errors_->push_back(
      {file_, mark.is_null() ? 0 : mark.line + 1, mark.is_null() ? 0 : mark.column + 1, message});
}

void ConfigReader::CheckKeys(const YAML::Node& map, const std::vector<std::string>& allowed,
                             const std::string& where) {
  std::set<std::string> seen;
  for (auto it = map.begin(); it != map.end(); ++it) {
    const std::string key = it->first.Scalar();
    if (std::find(allowed.begin(), allowed.end(), key) == allowed.end()) {
      Error(it->first,
            "unknown key '" + key + "' in " + where + "; expected one of " + Join(allowed));
    } else if (!seen.insert(key).second) {
      Error(it->first, "key '" + key + "' appears twice in " + where);
    }
  }
}

std::optional<std::string> ConfigReader::Text(const YAML::Node& node, const std::string& what) {
  if (!node.IsScalar() || node.Scalar().empty()) {
    Error(node, what + " must be a text value");
    return std::nullopt;
  }
  return node.Scalar();
}

std::optional<double> ConfigReader::Number(const YAML::Node& node, const std::string& what,
                                           double low, double high, bool open_low,
                                           const std::string& expected) {
  double value = 0.0;
  const std::string text = node.IsScalar() ? node.Scalar() : "";
  const auto [ptr, ec] = std::from_chars(text.data(), text.data() + text.size(), value);
  const bool parsed = node.IsScalar() && ec == std::errc() && ptr == text.data() + text.size() &&
                      std::isfinite(value);
  const bool in_range = parsed && (open_low ? value > low : value >= low) && value <= high;
  if (!in_range) {
    Error(node,
          what + " must be " + expected + ", got '" + (node.IsScalar() ? text : "a list") + "'");
    return std::nullopt;
  }
  return value;
}

std::vector<std::string> ConfigReader::TextList(const YAML::Node& node, const std::string& what) {
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

bool ConfigReader::Flag(const YAML::Node& node, const std::string& what, bool* value) {
  if (node.IsScalar() && (node.Scalar() == "true" || node.Scalar() == "false")) {
    *value = node.Scalar() == "true";
    return true;
  }
  Error(node, what + " must be true or false");
  return false;
}

std::string ConfigReader::Resolve(const std::string& path) const {
  const std::filesystem::path p(path);
  return p.is_absolute() ? p.string() : (folder_ / p).lexically_normal().string();
}

void ConfigReader::LoadWarmup(const YAML::Node& node, EvaluationOptions& options) {
  if (node.IsScalar() && node.Scalar() == "auto") {
    options.warmup = WarmupPolicy::kAuto;
  } else if (node.IsScalar() && node.Scalar() == "none") {
    options.warmup = WarmupPolicy::kNone;
  } else if (auto t =
                 Number(node, "warmup", -1e300, 1e300, false, "auto, none, or a simulated time")) {
    options.warmup = WarmupPolicy::kFixedTime;
    options.warmup_time = *t;
  }
}

void ConfigReader::LoadSettings(const YAML::Node& root, RunConfig& c) {
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
    if (auto v =
            Number(root["batches"], "batches", 2, 1000, false, "a whole number from 2 to 1000");
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
    }
  }
  if (root["max_half_width_uncertainty"]) {
    if (auto v = Number(root["max_half_width_uncertainty"], "max_half_width_uncertainty", 0.0, 10.0,
                        true, "a share above 0, such as 0.2 for ±20 %")) {
      c.stop_rule.maximum_half_width_uncertainty = *v;
      c.evaluation.maximum_half_width_uncertainty = *v;
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

std::optional<SourceConfig> ConfigReader::LoadSource(const YAML::Node& node) {
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

}  // namespace plateau
