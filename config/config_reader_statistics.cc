#include <algorithm>

#include "config/config_reader.h"

namespace plateau {

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

void ConfigReader::ResolveReferenceSeries(const YAML::Node& statistics, RunConfig& c) {
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
    difference.request =
        MakeRequest(StatisticKind::kWeightedSum, columns, s.request.name + " - reference");
    difference.request.weights = weights;
    difference.source = s.source;
    s.reference_difference = difference.request.name;
    added.push_back(std::move(difference));
  }
  for (StatisticConfig& d : added) c.statistics.push_back(std::move(d));
}

std::optional<Target> ConfigReader::LoadTarget(const YAML::Node& node, double default_confidence) {
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

std::optional<StatisticConfig> ConfigReader::LoadStatistic(const YAML::Node& node,
                                                           const RunConfig& c) {
  if (!node.IsMap()) {
    Error(node, "a statistic must be a map with kind and columns");
    return std::nullopt;
  }
  CheckKeys(node,
            {"name", "source", "kind", "columns", "column", "target", "minimum_time", "reference"},
            "a statistic");
  StatisticConfig s;
  bool ok = true;
  const std::vector<std::string> kinds{"mean",         "variance", "rms",    "covariance",
                                       "third_moment", "tke",      "average"};
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

}  // namespace plateau
