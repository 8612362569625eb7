#include "daemon/monitoring/config_reload.h"

#include <algorithm>

#include "daemon/monitoring/run_fingerprint.h"

namespace plateau {
namespace {

bool SameTarget(const std::optional<Target>& a, const std::optional<Target>& b) {
  if (a.has_value() != b.has_value()) return false;
  return !a || (a->kind == b->kind && a->value == b->value && a->confidence == b->confidence);
}

}  // namespace

ReloadOutcome ApplyReload(RunConfig& running, const RunConfig& fresh) {
  ReloadOutcome outcome;
  outcome.same_layout = RunFingerprint(fresh) == RunFingerprint(running);
  const bool confirmations_changed =
      running.stop_rule.confirmations != fresh.stop_rule.confirmations;
  for (StatisticConfig& mine : running.statistics) {
    const auto it = std::find_if(
        fresh.statistics.begin(), fresh.statistics.end(),
        [&](const StatisticConfig& s) { return s.request.name == mine.request.name; });
    if (it == fresh.statistics.end()) continue;
    if (!SameTarget(it->target, mine.target) || confirmations_changed) {
      outcome.retargeted.push_back(mine.request.name);
    }
    mine.target = it->target;
    mine.minimum_time = it->minimum_time;
    mine.reference = it->reference;
    mine.reference_statistic = it->reference_statistic;
    mine.reference_factor = it->reference_factor;
    mine.reference_difference = it->reference_difference;  // used only if it is tracked
  }
  running.alerts = fresh.alerts;
  running.stop_rule = fresh.stop_rule;
  running.evaluation.confidence = fresh.evaluation.confidence;
  running.evaluation.drift_p_value = fresh.evaluation.drift_p_value;
  running.evaluation.maximum_half_width_uncertainty =
      fresh.evaluation.maximum_half_width_uncertainty;
  running.evaluate_every = fresh.evaluate_every;
  running.poll_every = fresh.poll_every;
  running.planned_end_time = fresh.planned_end_time;
  running.cores = fresh.cores;
  if (outcome.same_layout) {
    running.groups = fresh.groups;
    running.wall_units = fresh.wall_units;
    for (std::size_t i = 0; i < running.profiles.size() && i < fresh.profiles.size(); ++i) {
      running.profiles[i].references = fresh.profiles[i].references;
      running.profiles[i].momentum_balance = fresh.profiles[i].momentum_balance;
    }
  }
  outcome.message = outcome.same_layout
                        ? "config reloaded: targets, alerts and intervals apply now"
                        : "config reloaded: targets, alerts and intervals apply now; the sources "
                          "or statistics changed too, which takes a restart of plateau watch";
  return outcome;
}

}  // namespace plateau
