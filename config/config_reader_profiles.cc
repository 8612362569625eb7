#include <algorithm>
#include <cmath>
#include <limits>
#include <map>

#include "config/config_reader.h"

namespace plateau {

std::optional<StatisticGroup> ConfigReader::LoadGroup(const YAML::Node& node, const RunConfig& c) {
  if (!node.IsMap()) {
    Error(node, "a group must be a map with name and members");
    return std::nullopt;
  }
  CheckKeys(node, {"name", "members", "bonferroni", "joint", "confidence", "required"}, "a group");
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
      Error(node["members"],
            "group '" + g.name + "' names statistic '" + m + "', which is not defined");
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
  if (node["joint"]) ok = LoadJointRule(node["joint"], c, g) && ok;
  if (node["required"]) ok = Flag(node["required"], "required", &g.required) && ok;
  if (node["confidence"]) {
    auto v = Number(node["confidence"], "confidence", 0.0, 0.999999, true,
                    "a fraction between 0 and 1, such as 0.95");
    ok = ok && v.has_value();
    if (v) g.confidence = *v;
  }
  return ok ? std::optional<StatisticGroup>(g) : std::nullopt;
}

bool ConfigReader::LoadJointRule(const YAML::Node& node, const RunConfig& c, StatisticGroup& g) {
  const std::string rule = Text(node, "joint").value_or("");
  if (rule == "bonferroni") {
    g.bonferroni = true;
  } else if (rule == "multivariate") {
    g.multivariate = true;
  } else if (rule != "separate") {
    Error(node, "joint must be separate (each member at the group's confidence), bonferroni or "
                "multivariate (one confidence region over the members), not '" + rule + "'");
    return false;
  }
  if (g.multivariate && g.bonferroni) {
    Error(node, "group '" + g.name + "' is either bonferroni or joint: multivariate, not both");
    return false;
  }
  if (!g.multivariate) return true;
  // The joint region needs the members' samples from the same rows.
  std::string first_source;
  for (const std::string& m : g.members) {
    const auto s = std::find_if(c.statistics.begin(), c.statistics.end(),
                                [&](const StatisticConfig& x) { return x.request.name == m; });
    if (s == c.statistics.end()) continue;  // reported with the members
    if (first_source.empty()) first_source = s->source;
    if (s->source != first_source) {
      Error(node, "group '" + g.name + "' is joint: multivariate, so its members must come from "
                  "one source; '" + m + "' comes from '" + s->source + "', '" + g.members.front() +
                  "' from '" + first_source + "'");
      return false;
    }
  }
  return true;
}

std::optional<WallUnitsConfig> ConfigReader::LoadWallUnits(const YAML::Node& node,
                                                           const RunConfig& c) {
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
    Error(node,
          "wall_units takes wall_shear (a statistic's name) or friction_velocity, one of "
          "them");
    return std::nullopt;
  }
  if (!w.wall_shear.empty()) {
    const auto s =
        std::find_if(c.statistics.begin(), c.statistics.end(),
                     [&](const StatisticConfig& x) { return x.request.name == w.wall_shear; });
    if (s == c.statistics.end()) {
      Error(node["wall_shear"],
            "wall_shear names statistic '" + w.wall_shear + "', which is not defined");
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

// A profile point's history key, "line[3]", and its statistic's name, "line[3]/U".
std::string PointName(const ProfileConfig& p, std::size_t point) {
  return p.name + "[" + std::to_string(point) + "]";
}

std::string PointStatisticName(const ProfileConfig& p, std::size_t point, const std::string& q) {
  return PointName(p, point) + "/" + q;
}

std::string PointColumn(const std::string& pattern, int index) {
  std::string name = pattern;
  const std::size_t at = name.find("{i}");
  return name.replace(at, 3, std::to_string(index));
}

}  // namespace

std::optional<ProfileConfig> ConfigReader::LoadProfile(const YAML::Node& node, RunConfig& c) {
  if (!node.IsMap()) {
    Error(node, "a profile must be a map with name, source, positions and columns");
    return std::nullopt;
  }
  CheckKeys(node,
            {"name", "source", "positions", "wall_at", "columns", "first_index", "quantities",
             "target", "targets", "reference", "momentum_balance", "joint"},
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
    Error(node["source"] ? node["source"] : node,
          "profile '" + p.name + "' needs a defined source");
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
      Error(columns[components[k]],
            "a column pattern needs {i} for the point's number, such as "
            "\"u{i}\"");
      ok = false;
    }
  }
  int first = 0;
  if (node["first_index"]) {
    if (auto v = Number(node["first_index"], "first_index", 0, 1e9, false,
                        "0 or 1, or any whole number")) {
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
  if (node["momentum_balance"])
    ok = Flag(node["momentum_balance"], "momentum_balance", &p.momentum_balance) && ok;
  bool joint = false;
  if (const YAML::Node rule = node["joint"]) {
    const std::string text = Text(rule, "joint").value_or("");
    joint = text == "multivariate";
    if (!joint && text != "separate") {
      Error(rule, "a profile's joint must be separate (each point on its own) or multivariate "
                  "(one confidence region over the points of each quantity with a target), not '" +
                      text + "'");
      ok = false;
    }
  }
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
      Error(node["quantities"], "quantity '" + q +
                                    "' is not known; expected U, V, W, k, or two "
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
      s.request.name = PointStatisticName(p, i, q);
      s.request.shared_history = PointName(p, i);
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
  if (joint) AddJointProfileGroups(p, targets, target, c);
  return p;
}

void ConfigReader::AddJointProfileGroups(const ProfileConfig& p,
                                         const std::map<std::string, Target>& targets,
                                         const std::optional<Target>& target, RunConfig& c) {
  for (const std::string& q : p.quantities) {
    if (targets.count(q) == 0 && !target) continue;  // monitored: nothing to stop on
    StatisticGroup g;
    g.name = p.name + "/" + q;
    g.multivariate = true;
    g.confidence = c.evaluation.confidence;
    for (std::size_t i = 0; i < p.positions.size(); ++i) {
      g.members.push_back(PointStatisticName(p, i, q));
    }
    c.groups.push_back(std::move(g));
  }
}

}  // namespace plateau
