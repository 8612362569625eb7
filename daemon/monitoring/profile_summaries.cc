#include "daemon/monitoring/profile_summaries.h"

#include <algorithm>
#include <cmath>
#include <fstream>
#include <limits>
#include <sstream>

#include "core/derived_estimate.h"
#include "core/profile_analysis.h"
#include "daemon/monitoring/snapshot_rows.h"
#include "daemon/presentation/analysis_report.h"
#include "daemon/presentation/number_format.h"
#include "daemon/presentation/json_writer.h"

namespace plateau {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// Three significant digits: positions and departures in sentences.
std::string Short(double value) { return PrintfNumber("%.3g", value); }

// A derived statistic (u_tau, Re_tau) as a monitored row.
SnapshotRow DerivedRow(const StatisticEstimate& e, const std::string& derived_from) {
  SnapshotRow row = EstimateRow(e);
  row.state = e.state == EstimateState::kEstimated       ? ConvergenceState::kMonitored
              : e.state == EstimateState::kNotEnoughData ? ConvergenceState::kNotEnoughData
                                                         : ConvergenceState::kNoData;
  row.state_reason = e.state == EstimateState::kEstimated ? "derived from " + derived_from
                                                          : e.state_reason;
  JsonWriter json;
  json.BeginObject();
  WriteEstimateFields(json, e, {});
  json.Field("state", ConvergenceStateName(row.state));
  json.Field("state_reason", row.state_reason);
  json.Field("derived_from", derived_from);
  json.EndObject();
  row.document = json.TakeDocument();
  return row;
}

}  // namespace

ProfileSummaries::ProfileSummaries(const RunConfig& config,
                                   const std::shared_ptr<spdlog::logger>& log)
    : config_(config) {
  for (const ProfileConfig& p : config_.profiles) {
    for (const auto& [quantity, path] : p.references) {
      std::ifstream in(path);
      std::stringstream text;
      text << in.rdbuf();
      Result<std::vector<std::pair<double, double>>> table =
          in ? ReadProfileTable(text.str()) : Status::Error("cannot read it");
      if (!table.ok()) {
        log->error("reference profile {} for {} {}: {}; left out", path, p.name, quantity,
                   table.error());
        continue;
      }
      references_[p.name + "/" + quantity] = std::move(table).value();
    }
  }
}

StatisticEstimate ProfileSummaries::FrictionVelocityOf(const std::vector<Entry>& entries) const {
  StatisticEstimate none;
  none.name = "u_tau";
  if (!config_.wall_units) return none;
  const WallUnitsConfig& w = *config_.wall_units;
  if (w.wall_shear.empty()) {
    // A known friction velocity: exact, no sampling error.
    StatisticEstimate known;
    known.name = "u_tau";
    known.state = EstimateState::kEstimated;
    known.value = w.friction_velocity;
    known.half_width = known.std_error = 0.0;
    known.relative_half_width = 0.0;
    return known;
  }
  for (const Entry& e : entries) {
    if (e.config->request.name == w.wall_shear && e.estimate->state == EstimateState::kEstimated &&
        e.estimate->value > 0.0) {
      return FrictionVelocity(*e.estimate, w.density);
    }
  }
  none.state_reason = "no estimate of the wall shear stress " + w.wall_shear + " yet";
  return none;
}

std::vector<SnapshotRow> ProfileSummaries::Rows(const std::vector<Entry>& entries) const {
  std::vector<SnapshotRow> rows;
  const StatisticEstimate u_tau = FrictionVelocityOf(entries);
  if (config_.wall_units) {
    const WallUnitsConfig& w = *config_.wall_units;
    const std::string from = w.wall_shear.empty() ? "the configured friction velocity"
                                                  : "sqrt(" + w.wall_shear + " / rho)";
    rows.push_back(DerivedRow(u_tau, from));
    if (!std::isnan(w.half_height) && u_tau.state == EstimateState::kEstimated) {
      rows.push_back(DerivedRow(FrictionReynolds(u_tau, w.half_height, w.viscosity),
                                "u_tau delta / nu"));
    }
  }
  for (const ProfileConfig& p : config_.profiles) {
    for (const std::string& q : p.quantities) {
      std::vector<Entry> points;
      for (const Entry& e : entries) {
        if (e.config->profile == p.name && e.config->quantity == q) points.push_back(e);
      }
      rows.push_back(QuantityRow(p, q, points, u_tau));
    }
    if (p.momentum_balance) rows.push_back(MomentumRow(p, entries, u_tau));
  }
  return rows;
}

SnapshotRow ProfileSummaries::QuantityRow(const ProfileConfig& p, const std::string& q,
                                          const std::vector<Entry>& points,
                                          const StatisticEstimate& u_tau) const {
  SnapshotRow row = BlankRow(p.name + ":" + q, RowKind::kProfileSummary);
  const bool wall_units = u_tau.state == EstimateState::kEstimated && config_.wall_units;
  const int power = WallUnitPower(q);
  const double scale = wall_units ? std::pow(u_tau.value, power) : 1.0;
  const auto reference = references_.find(p.name + "/" + q);
  int met = 0, targeted = 0, consistent = 0, compared = 0;
  const Entry* worst = nullptr;
  double worst_score = -1.0;
  double worst_difference = 0.0, worst_difference_at = kNaN;
  JsonWriter json;
  json.BeginObject();
  json.Field("name", row.statistic);
  json.Field("profile", p.name);
  json.Field("quantity", q);
  json.Field("wall_units", wall_units);
  json.Field("wall_unit_power", power);
  json.Key("points");
  json.BeginArray();
  for (const Entry& e : points) {
    const StatisticEstimate& s = *e.estimate;
    const double y_plus = wall_units ? YPlus(e.config->position, u_tau.value,
                                             config_.wall_units->viscosity)
                                     : kNaN;
    const double value_plus = s.value / scale;
    // The wall-unit half-width carries u_tau's own uncertainty, power times its relative part.
    const double relative_u = wall_units ? u_tau.relative_half_width : 0.0;
    const double half_width_plus =
        std::hypot(s.half_width / scale, power * std::fabs(value_plus) * relative_u);
    const bool point_met = e.row->state == ConvergenceState::kMet;
    if (e.config->target) {
      ++targeted;
      met += point_met;
    }
    const double score = e.config->target ? s.half_width / e.row->target_half_width
                                          : s.relative_half_width;
    if (!point_met && !std::isnan(score) && score > worst_score) {
      worst_score = score;
      worst = &e;
    }
    json.BeginObject();
    json.Field("point", e.config->point);
    json.Field("statistic", e.config->request.name);
    json.Field("position", e.config->position);
    json.Field("y_plus", y_plus);
    json.Field("value", s.value);
    json.Field("half_width", s.half_width);
    json.Field("relative_half_width", s.relative_half_width);
    json.Field("value_plus", wall_units ? value_plus : kNaN);
    json.Field("half_width_plus", wall_units ? half_width_plus : kNaN);
    json.Field("state", ConvergenceStateName(e.row->state));
    if (reference != references_.end()) {
      const double x = wall_units ? y_plus : e.config->position;
      const double expected = Interpolate(reference->second, x);
      const double shown = wall_units ? value_plus : s.value;
      const double width = wall_units ? half_width_plus : s.half_width;
      std::string verdict = "undetermined";
      if (!std::isnan(expected) && !std::isnan(width) && s.state == EstimateState::kEstimated) {
        ++compared;
        verdict = std::fabs(shown - expected) <= width ? "consistent" : "bias";
        consistent += verdict == "consistent";
        const double relative = expected != 0.0 ? (shown - expected) / std::fabs(expected) : kNaN;
        if (!std::isnan(relative) && std::fabs(relative) > std::fabs(worst_difference)) {
          worst_difference = relative;
          worst_difference_at = x;
        }
      }
      json.Key("reference");
      json.BeginObject();
      json.Field("value", expected);
      json.Field("difference", shown - expected);
      json.Field("verdict", verdict);
      json.EndObject();
    }
    json.EndObject();
  }
  json.EndArray();
  const int n = static_cast<int>(points.size());
  if (targeted == 0) {
    row.state = ConvergenceState::kMonitored;
    row.state_reason = std::to_string(n) + " points, no target";
  } else {
    row.state = met == targeted ? ConvergenceState::kMet : ConvergenceState::kConverging;
    row.state_reason = std::to_string(met) + " of " + std::to_string(targeted) + " points met";
  }
  if (worst) {
    const double y_plus = wall_units ? YPlus(worst->config->position, u_tau.value,
                                             config_.wall_units->viscosity)
                                     : kNaN;
    const std::string where = wall_units ? "y+ " + Short(y_plus)
                                         : "y " + Short(worst->config->position);
    row.state_reason +=
        (targeted > 0 ? "; worst at " : "; the widest relative interval at ") + where +
        " (point " + std::to_string(worst->config->point) + "): " +
        (targeted > 0 ? worst->row->state_reason
                      : FormatPercent(worst->estimate->relative_half_width) + " of the value");
    json.Field("worst_point", worst->config->point);
  }
  if (compared > 0) {
    std::string words = "vs reference: consistent at " + std::to_string(consistent) + " of " +
                        std::to_string(compared) + " points";
    if (consistent < compared) {
      words += ", the largest difference " + FormatPercent(worst_difference) + " at " +
               (wall_units ? "y+ " : "y ") + Short(worst_difference_at) +
               ": a bias that more averaging will not remove";
    }
    row.state_reason += "; " + words;
    row.reference_verdict = consistent == compared ? "consistent" : "bias";
    json.Field("reference_summary", words);
  }
  json.Field("points_met", met);
  json.Field("points_with_targets", targeted);
  json.Field("state", ConvergenceStateName(row.state));
  json.Field("state_reason", row.state_reason);
  json.EndObject();
  row.document = json.TakeDocument();
  return row;
}

SnapshotRow ProfileSummaries::MomentumRow(const ProfileConfig& p,
                                          const std::vector<Entry>& entries,
                                          const StatisticEstimate& u_tau) const {
  SnapshotRow row = BlankRow(p.name + ":momentum_balance", RowKind::kProfileSummary);
  row.state = ConvergenceState::kMonitored;
  std::vector<double> y, u, uv;
  for (std::size_t i = 0; i < p.positions.size(); ++i) {
    double u_i = kNaN, uv_i = kNaN;
    for (const Entry& e : entries) {
      if (e.config->profile != p.name || e.config->point != static_cast<int>(i)) continue;
      if (e.config->quantity == "U") u_i = e.estimate->value;
      if (e.config->quantity == "uv") uv_i = e.estimate->value;
    }
    y.push_back(p.positions[i]);
    u.push_back(u_i);
    uv.push_back(uv_i);
  }
  const bool ready = config_.wall_units && !std::isnan(config_.wall_units->half_height) &&
                     u_tau.state == EstimateState::kEstimated &&
                     std::none_of(u.begin(), u.end(), [](double v) { return std::isnan(v); }) &&
                     std::none_of(uv.begin(), uv.end(), [](double v) { return std::isnan(v); });
  JsonWriter json;
  json.BeginObject();
  json.Field("name", row.statistic);
  json.Field("profile", p.name);
  if (!ready) {
    row.state_reason = "needs U and uv at every point, wall units with half_height, and u_tau";
  } else {
    const WallUnitsConfig& w = *config_.wall_units;
    const std::vector<double> departure =
        TotalStressDeparture(y, u, uv, w.viscosity, u_tau.value, w.half_height);
    std::size_t at = 0;
    for (std::size_t i = 0; i < departure.size(); ++i) {
      if (std::fabs(departure[i]) > std::fabs(departure[at])) at = i;
    }
    row.value = departure.empty() ? kNaN : departure[at];
    row.state_reason = "the total shear stress departs from u_tau^2 (1 - y/delta) by at most " +
                       Short(std::fabs(row.value)) + " in wall units, at y+ " +
                       Short(YPlus(y[at], u_tau.value, w.viscosity));
    json.Key("departure");
    json.BeginArray();
    for (double d : departure) json.Number(d);
    json.EndArray();
    json.Key("y_plus");
    json.BeginArray();
    for (double v : y) json.Number(YPlus(v, u_tau.value, w.viscosity));
    json.EndArray();
    json.Field("largest", std::fabs(row.value));
  }
  json.Field("state", ConvergenceStateName(row.state));
  json.Field("state_reason", row.state_reason);
  json.EndObject();
  row.document = json.TakeDocument();
  return row;
}

}  // namespace plateau
