#include "core/convergence_tracker.h"

#include <algorithm>
#include <array>
#include <cmath>
#include <limits>
#include <utility>

#include "core/message_number.h"
#include "core/name_table.h"

namespace plateau {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

std::string Percent(double fraction) { return MessageNumber(100.0 * fraction) + " %"; }

constexpr NameTable<ConvergenceState, 8> kStateNames{{
    {ConvergenceState::kNoData, "no_data"},
    {ConvergenceState::kNotEnoughData, "not_enough_data"},
    {ConvergenceState::kWarmingUp, "warming_up"},
    {ConvergenceState::kDrifting, "drifting"},
    {ConvergenceState::kConverging, "converging"},
    {ConvergenceState::kMet, "met"},
    {ConvergenceState::kMonitored, "monitored"},
    {ConvergenceState::kColumnMissing, "column_missing"},
}};

}  // namespace

std::string_view ConvergenceStateName(ConvergenceState state) {
  return NameIn(kStateNames, state);
}

std::optional<ConvergenceState> ConvergenceStateFromName(std::string_view name) {
  return ValueIn(kStateNames, name);
}

ConvergenceTracker::ConvergenceTracker(std::string statistic, std::optional<Target> target,
                                       const StopRuleSettings& settings)
    : statistic_(std::move(statistic)),
      target_(target),
      settings_(settings),
      met_at_time_(kNaN),
      met_at_wall_(kNaN) {}

double ConvergenceTracker::TargetHalfWidth(double value) const {
  if (!target_) return kNaN;
  return target_->kind == Target::Kind::kRelative ? target_->value * std::fabs(value)
                                                  : target_->value;
}

std::pair<ConvergenceState, std::string> ConvergenceTracker::Judge(
    const StatisticEstimate& e) const {
  using S = ConvergenceState;
  if (e.state == EstimateState::kNoData) return {S::kNoData, e.state_reason};
  if (e.state == EstimateState::kNotEnoughData) return {S::kNotEnoughData, e.state_reason};
  const double span = e.last_time - e.first_time;
  if (span > 0.0 && e.warmup_end_time - e.first_time >= kWarmupStillGoing * span) {
    return {S::kWarmingUp, "the start-up transient still fills nearly half of the data (cut at " +
                               MessageNumber(e.warmup_end_time) + ")"};
  }
  if (e.drift_detected) {
    return {S::kDrifting, "the mean still moves: Geweke z = " + MessageNumber(e.drift.z) + ", p = " +
                              MessageNumber(e.drift.p_value)};
  }
  if (!target_) return {S::kMonitored, "no target set"};
  const double wanted = TargetHalfWidth(e.value);
  if (!(e.half_width <= wanted)) {
    return {S::kConverging,
            target_->kind == Target::Kind::kRelative
                ? "half-width " + Percent(e.relative_half_width) + " of the value, target " +
                      Percent(target_->value)
                : "half-width " + MessageNumber(e.half_width) + ", target " + MessageNumber(target_->value)};
  }
  if (!(e.half_width_uncertainty <= settings_.maximum_half_width_uncertainty)) {
    return {S::kConverging, "the half-width is itself known only to ±" +
                                Percent(e.half_width_uncertainty) + ", the rule asks for ±" +
                                Percent(settings_.maximum_half_width_uncertainty)};
  }
  if (e.effective_samples < settings_.minimum_effective_samples) {
    return {S::kConverging, "only " + MessageNumber(e.effective_samples) +
                                " effective samples, the rule asks for " +
                                MessageNumber(settings_.minimum_effective_samples)};
  }
  if (e.decision.batches_too_short) {
    return {S::kConverging, "batches are shorter than ten integrated times"};
  }
  const double averaged = e.last_time - e.warmup_end_time;
  if (averaged < settings_.minimum_time) {
    return {S::kConverging, "averaged over " + MessageNumber(averaged) + " time units, the minimum is " +
                                MessageNumber(settings_.minimum_time)};
  }
  return {S::kMet, ""};
}

std::vector<ConvergenceEvent> ConvergenceTracker::Update(const StatisticEstimate& estimate,
                                                         double wall_time) {
  auto [state, reason] = Judge(estimate);
  std::vector<ConvergenceEvent> events;
  if (state == ConvergenceState::kMet) {
    if (estimate.samples_total > confirmed_samples_ || consecutive_ == 0) {
      ++consecutive_;
      confirmed_samples_ = estimate.samples_total;
    }
    if (consecutive_ < settings_.confirmations) {
      state = ConvergenceState::kConverging;
      reason = "target reached, confirmation " + std::to_string(consecutive_) + " of " +
               std::to_string(settings_.confirmations);
    } else if (!met_) {
      met_ = true;
      met_at_time_ = estimate.last_time;
      met_at_wall_ = wall_time;
      events.push_back({EventKind::kMet, statistic_, estimate.last_time, wall_time,
                        statistic_ + " met its target: " + MessageNumber(estimate.value) + " ± " +
                            MessageNumber(estimate.half_width) + " at " +
                            Percent(estimate.confidence) + " confidence"});
    }
  } else {
    consecutive_ = 0;
    if (met_) {
      met_ = false;
      events.push_back({EventKind::kLost, statistic_, estimate.last_time, wall_time,
                        statistic_ + " no longer meets its target: " + reason});
    }
  }
  if (estimate.state == EstimateState::kEstimated) {
    // Drift at start-up is what the warm-up cut and the drifting state are for; an event says
    // that a statistic which had settled moves again, so it needs a steady spell first.
    const bool steady_before = steady_evaluations_ >= settings_.confirmations;
    if (estimate.drift_detected) {
      steady_evaluations_ = 0;
    } else if (estimate.samples_total > steady_samples_) {
      ++steady_evaluations_;
    }
    steady_samples_ = std::max(steady_samples_, estimate.samples_total);
    if (estimate.drift_detected && !drift_reported_ && steady_before) {
      events.push_back({EventKind::kDrift, statistic_, estimate.last_time, wall_time,
                        statistic_ + " drifts: the mean of the first 10 % differs from the last "
                                     "50 % (Geweke z = " +
                            MessageNumber(estimate.drift.z) + ", p = " + MessageNumber(estimate.drift.p_value) +
                            ")"});
    }
    drift_reported_ = estimate.drift_detected && (drift_reported_ || steady_before);
  }
  state_ = state;
  reason_ = reason;
  return events;
}

void ConvergenceTracker::Retarget(std::optional<Target> target, const StopRuleSettings& settings) {
  target_ = target;
  settings_ = settings;
  consecutive_ = 0;
}

std::vector<double> ConvergenceTracker::SaveState() const {
  return {static_cast<double>(consecutive_), met_ ? 1.0 : 0.0, met_at_time_, met_at_wall_,
          static_cast<double>(state_), static_cast<double>(confirmed_samples_),
          drift_reported_ ? 1.0 : 0.0, static_cast<double>(steady_evaluations_),
          static_cast<double>(steady_samples_)};
}

bool ConvergenceTracker::RestoreState(const std::vector<double>& state) {
  // Checkpoints written before the steady spell was kept have 7 entries: count them as settled.
  if (state.size() != 7 && state.size() != 9) return false;
  drift_reported_ = state[6] != 0.0;
  steady_evaluations_ = state.size() == 9 ? static_cast<int>(state[7]) : settings_.confirmations;
  steady_samples_ = state.size() == 9 ? static_cast<std::uint64_t>(state[8]) : 0;
  confirmed_samples_ = static_cast<std::uint64_t>(state[5]);
  consecutive_ = static_cast<int>(state[0]);
  met_ = state[1] != 0.0;
  met_at_time_ = state[2];
  met_at_wall_ = state[3];
  state_ = static_cast<ConvergenceState>(static_cast<int>(state[4]));
  reason_ = "restored from the checkpoint";
  return true;
}

}  // namespace plateau
