#include "daemon/monitoring/run_monitor.h"

#include <algorithm>
#include <cmath>
#include <limits>

#include "daemon/monitoring/config_reload.h"
#include "daemon/monitoring/event_rows.h"
#include "daemon/monitoring/input_event_words.h"
#include "daemon/monitoring/run_fingerprint.h"
#include "daemon/monitoring/run_state.h"
#include "daemon/monitoring/snapshot_rows.h"
#include "daemon/monitoring/status_documents.h"

namespace plateau {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

StopRuleSettings SettingsFor(const RunConfig& config, const StatisticConfig& c) {
  StopRuleSettings settings = config.stop_rule;
  settings.minimum_time = c.minimum_time;
  return settings;
}

}  // namespace

RunMonitor::RunMonitor(RunConfig config, std::unique_ptr<RunStore> store,
                       std::shared_ptr<spdlog::logger> log)
    : config_(std::move(config)),
      store_(std::move(store)),
      log_(std::move(log)),
      tails_(config_, log_),
      first_sample_wall_(kNaN) {
  for (StatisticConfig& s : config_.statistics) {
    tracked_.emplace_back(&s, tails_.Find(s.source), SettingsFor(config_, s));
  }
  AssignConfidences();
  summaries_ = std::make_unique<ProfileSummaries>(config_, log_);
}

void RunMonitor::AssignConfidences() {
  std::vector<std::string> names;
  std::vector<double> own;
  for (const TrackedStatistic& t : tracked_) {
    names.push_back(t.name());
    own.push_back(t.config().target ? t.config().target->confidence
                                    : config_.evaluation.confidence);
  }
  const std::vector<double> judged = JudgedConfidences(names, own, config_.groups);
  for (std::size_t i = 0; i < tracked_.size(); ++i) tracked_[i].set_confidence(judged[i]);
}

void RunMonitor::Restore() {
  const Result<std::optional<StoredCheckpoint>> read = store_->ReadCheckpoint();
  if (!read.ok()) {
    log_->error("cannot read the checkpoint: {}; starting from the beginning of every file",
                read.error());
    return;
  }
  const std::optional<StoredCheckpoint>& checkpoint = *read;
  if (!checkpoint) {
    log_->info("new store {}: reading every file from its start", store_->path());
    return;
  }
  cycle_ = checkpoint->cycle;
  if (checkpoint->fingerprint != RunFingerprint(config_)) {
    log_->warn("the sources or statistics changed since the checkpoint of cycle {}: reading "
               "every file again from its start",
               checkpoint->cycle);
    return;
  }
  tails_.Restore(*checkpoint);
  for (TrackedStatistic& t : tracked_) {
    const auto state = checkpoint->items.find("tracker:" + t.name());
    if (state != checkpoint->items.end()) t.tracker().RestoreState(state->second);
  }
  const auto run = checkpoint->items.find("run");
  if (run != checkpoint->items.end()) {
    if (const std::optional<RunState> state = RunStateFromItem(run->second)) {
      run_met_ = state->run_met;
      first_sample_wall_ = state->first_sample_wall;
      input_health_.Restore(state->stalled, state->last_sample_wall, state->bad_lines_alarm);
    }
  }
  log_->info("resumed from the checkpoint of cycle {} ({} files)", checkpoint->cycle,
             checkpoint->files.size());
}

void RunMonitor::NoteCatchUp() {
  rate_.Restart();
  input_health_.NoteCatchUp();
}

EventRow RunMonitor::MakeEvent(EventKind kind, const std::string& statistic,
                               std::string message, double simulated_time,
                               double wall_time) const {
  return NewEventRow(kind, statistic, std::move(message), simulated_time, wall_time,
                     {config_.alerts, rate_.PerHour(), first_sample_wall_});
}

void RunMonitor::WatchInput(const CycleRecord& record, double wall_time,
                            std::vector<EventRow>& events) {
  InputObservation seen;
  seen.wall_time = wall_time;
  seen.newest_sample_wall = record.last_sample_wall_time;
  seen.bad_lines = tails_.bad_lines();
  const InputHealthLimits limits{config_.alerts.stall_after, config_.alerts.bad_lines_per_minute};
  for (const InputHealthEvent& e : input_health_.Observe(seen, limits)) {
    events.push_back(MakeEvent(InputEventKind(e.kind), "",
                               InputEventMessage(e, record.last_sample_time, limits),
                               record.last_sample_time, wall_time));
  }
}

std::string RunMonitor::Reload(const RunConfig& fresh) {
  const ReloadOutcome outcome = ApplyReload(config_, fresh);
  for (TrackedStatistic& t : tracked_) {
    const std::vector<std::string>& names = outcome.retargeted;
    if (std::find(names.begin(), names.end(), t.name()) != names.end()) {
      t.tracker().Retarget(t.config().target, SettingsFor(config_, t.config()));
    }
  }
  AssignConfidences();
  summaries_ = std::make_unique<ProfileSummaries>(config_, log_);
  return outcome.message;
}

void RunMonitor::ShiftWallClock(double seconds) {
  first_sample_wall_ += seconds;
  input_health_.ShiftWallClock(seconds);
  rate_.Shift(seconds);
  tails_.ShiftWallClock(seconds);
}

std::optional<StatisticEstimate> RunMonitor::EstimateOf(const std::string& name,
                                                        const EvaluationOptions& options) const {
  for (const TrackedStatistic& t : tracked_) {
    if (t.name() == name) return t.EstimateAt(options);
  }
  return std::nullopt;
}

SnapshotRow RunMonitor::Snapshot(TrackedStatistic& t, double wall_time,
                                 std::vector<EventRow>& events, StatisticEstimate* estimate) {
  EvaluationOptions options = config_.evaluation;
  options.confidence = t.confidence();
  TrackedStatistic::Evaluation evaluation = t.Evaluate(
      options, wall_time, rate_.PerHour(), config_.flow_through_time,
      [this](const std::string& name, const EvaluationOptions& at) { return EstimateOf(name, at); });
  const EventSetting setting{config_.alerts, rate_.PerHour(), first_sample_wall_};
  for (const ConvergenceEvent& event : evaluation.events) {
    events.push_back(StatisticEventRow(event, evaluation.estimate, t.config().target, setting));
  }
  *estimate = std::move(evaluation.estimate);
  return std::move(evaluation.row);
}

JointRegion RunMonitor::JointRegionOf(const StatisticGroup& group,
                                      const std::vector<StatisticEstimate>& estimates,
                                      const std::vector<SnapshotRow>& rows) const {
  std::vector<JointRegionMember> members;
  for (const std::string& name : group.members) {
    const auto t = std::find_if(tracked_.begin(), tracked_.end(),
                                [&](const TrackedStatistic& x) { return x.name() == name; });
    const std::size_t i = static_cast<std::size_t>(t - tracked_.begin());
    if (t == tracked_.end() || t->statistic() == nullptr) {
      JointRegion none;
      none.reason = "no joint region yet: " + name + " has no data";
      return none;
    }
    members.push_back({t->statistic(), &estimates[i], rows[i].target_half_width});
  }
  EvaluationOptions options = config_.evaluation;
  options.confidence = group.confidence;
  return EvaluateJointRegion(members, options);
}

SnapshotRow RunMonitor::GroupSnapshot(const StatisticGroup& g, const GroupStanding& standing,
                                      const JointRegion* region, double wall_time) const {
  SnapshotRow row = BlankRow(g.name, RowKind::kGroup);
  row.confidence = g.confidence;
  row.state = standing.met ? ConvergenceState::kMet : ConvergenceState::kConverging;
  row.state_reason = standing.reason;
  row.remaining_time = standing.remaining_time;
  row.remaining_wall = WallSecondsAt(row.remaining_time, rate_.PerHour());
  row.document = GroupDocument(g, standing, region, row, wall_time);
  return row;
}

Status RunMonitor::Evaluate(double wall_time) {
  CycleRecord record;
  record.cycle = cycle_ + 1;
  record.wall_time = wall_time;
  record.fingerprint = RunFingerprint(config_);
  record.last_sample_time = tails_.last_sample_time();
  record.last_sample_wall_time = tails_.last_sample_wall_time();
  if (std::isnan(first_sample_wall_)) first_sample_wall_ = record.last_sample_wall_time;
  rate_.Add(wall_time, record.last_sample_time);
  std::vector<EventRow> events;
  WatchInput(record, wall_time, events);
  std::vector<StatisticEstimate> estimates(tracked_.size());
  std::vector<TargetStanding> standings;
  for (std::size_t i = 0; i < tracked_.size(); ++i) {
    TrackedStatistic& t = tracked_[i];
    const SnapshotRow& row =
        record.snapshots.emplace_back(Snapshot(t, wall_time, events, &estimates[i]));
    standings.push_back({row.statistic, t.config().target.has_value(),
                         row.state == ConvergenceState::kMet,
                         std::string(ConvergenceStateName(row.state)), row.state_reason,
                         row.remaining_time});
  }
  record.remaining_time = RunRemainingTime(standings);
  record.remaining_wall = WallSecondsAt(record.remaining_time, rate_.PerHour());
  std::vector<ProfileSummaries::Entry> entries;
  for (std::size_t i = 0; i < tracked_.size(); ++i) {
    entries.push_back({&tracked_[i].config(), &estimates[i], &record.snapshots[i]});
  }
  for (SnapshotRow& row : summaries_->Rows(entries)) record.snapshots.push_back(std::move(row));
  std::vector<GroupStanding> group_standings;
  for (const StatisticGroup& g : config_.groups) {
    std::optional<JointRegion> region;
    std::optional<JointStanding> joint;
    if (g.multivariate) {
      region = JointRegionOf(g, estimates, record.snapshots);
      joint = JointStanding{region->small_enough, region->reason, region->remaining_time};
    }
    group_standings.push_back(JudgeGroup(g, standings, joint ? &*joint : nullptr));
    record.snapshots.push_back(
        GroupSnapshot(g, group_standings.back(), region ? &*region : nullptr, wall_time));
  }
  const bool run_met = RunMet(standings, config_.groups, group_standings);
  if (run_met != run_met_) {
    events.push_back(MakeEvent(run_met ? EventKind::kRunMet : EventKind::kRunLost, "",
                               run_met ? "every target of run " + config_.run_name +
                                             " is met: the solver can stop"
                                       : "run " + config_.run_name + " no longer meets every target",
                               record.last_sample_time, wall_time));
    run_met_ = run_met;
  }
  record.run_met = run_met_;
  for (EventRow& e : events) e.remaining_time = record.remaining_time;
  pending_events_.insert(pending_events_.end(), events.begin(), events.end());
  record.events = pending_events_;
  tails_.Checkpoint(record);
  for (const TrackedStatistic& t : tracked_) {
    record.checkpoint["tracker:" + t.name()] = t.tracker().SaveState();
  }
  record.checkpoint["run"] = RunStateItem({run_met_, input_health_.stalled(), first_sample_wall_,
                                           input_health_.last_sample_wall(),
                                           input_health_.bad_lines_alarm()});

  Status status = store_->WriteCycle(record);
  if (!status.ok()) {
    log_->error("cannot record cycle {}: {}; the state is kept in memory and written at the "
                "next evaluation",
                record.cycle, status.message());
    last_write_failed_ = true;
    return status;
  }
  if (last_write_failed_) log_->info("the store accepts writes again (cycle {})", record.cycle);
  last_write_failed_ = false;
  cycle_ = record.cycle;
  record.checkpoint.clear();  // kept in the store; memory keeps what status and metrics show
  last_cycle_ = std::move(record);
  pending_events_.clear();
  log_->debug("cycle {}: {} of {} statistics met", cycle_,
              std::count_if(standings.begin(), standings.end(),
                            [](const TargetStanding& s) { return s.met; }),
              standings.size());
  return status;
}

}  // namespace plateau
