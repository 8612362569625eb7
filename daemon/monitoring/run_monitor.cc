#include "daemon/monitoring/run_monitor.h"

#include <algorithm>
#include <cmath>
#include <limits>

#include "config/alert_routing.h"
#include "core/reference_check.h"
#include "core/time_to_target.h"
#include "daemon/monitoring/snapshot_rows.h"
#include "daemon/presentation/analysis_report.h"
#include "daemon/presentation/number_format.h"
#include "daemon/presentation/json_writer.h"

namespace plateau {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// The checkpoint item "run": the run's own state, one double per place (stores written by earlier
// versions hold the same five).
enum RunItem : std::size_t {
  kRunMet,
  kStalled,
  kFirstSampleWall,
  kLastSampleWall,
  kBadLinesAlarm,
  kRunItemSize
};

std::string_view TargetKindName(Target::Kind kind) {
  return kind == Target::Kind::kRelative ? "relative" : "absolute";
}

void WriteTimeToTarget(JsonWriter& json, double remaining, double wall_seconds,
                       double wall_time) {
  json.Key("time_to_target");
  if (std::isnan(remaining)) {
    json.Null();
    return;
  }
  json.BeginObject();
  json.Field("simulated", remaining);
  json.Field("wall_seconds", wall_seconds);
  json.Field("expected_at", wall_time + wall_seconds);
  json.EndObject();
}

// The status object of one statistic: the keys of `plateau analyze --json`, plus the stop rule's.
JsonDocument StatisticJson(const StatisticEstimate& e, const StatisticConfig& c,
                          const ConvergenceTracker& tracker, const SnapshotRow& row,
                          const std::optional<ReferenceComparison>& reference,
                          const SourceStatistics* source, double flow_through_time,
                          double wall_time) {
  const std::string_view state = ConvergenceStateName(row.state);
  const std::string& reason = row.state_reason;
  JsonWriter json;
  json.BeginObject();
  WriteEstimateFields(json, e, c.request.columns, flow_through_time);
  json.Field("source", c.source);
  if (source != nullptr) WriteSpacing(json, source->spacing());
  json.Field("state", state);
  json.Field("state_reason", reason);
  json.Key("target");
  if (c.target) {
    json.BeginObject();
    json.Field("kind", TargetKindName(c.target->kind));
    json.Field("value", c.target->value);
    json.Field("confidence", c.target->confidence);
    json.EndObject();
  } else {
    json.Null();
  }
  json.Field("target_half_width", tracker.TargetHalfWidth(e.value));
  json.Field("confirmations", tracker.consecutive());
  json.Key("met_at");
  if (tracker.met()) {
    json.BeginObject();
    json.Field("simulated_time", tracker.met_at_time());
    json.Field("wall_time", tracker.met_at_wall());
    json.EndObject();
  } else {
    json.Null();
  }
  json.Field("minimum_time", c.minimum_time);
  if (!c.profile.empty()) {
    json.Field("profile", c.profile);
    json.Field("point", c.point);
    json.Field("position", c.position);
    json.Field("quantity", c.quantity);
  }
  WriteTimeToTarget(json, row.remaining_time, row.remaining_wall, wall_time);
  json.Key("reference");
  if (reference) {
    const ReferenceComparison& r = *reference;
    json.BeginObject();
    json.Field("value", r.reference);
    if (!c.reference_statistic.empty()) {
      json.Field("statistic", c.reference_statistic);
      json.Field("factor", c.reference_factor);
    }
    json.Field("difference", r.difference);
    json.Field("relative_difference", r.relative_difference);
    json.Field("half_width", r.half_width);
    json.Field("method", r.method);
    json.Field("verdict", VerdictName(r.verdict));
    json.Field("words", r.words);
    json.EndObject();
  } else {
    json.Null();
  }
  json.EndObject();
  return json.TakeDocument();
}

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
      first_sample_wall_(kNaN) {
  for (const SourceConfig& source : config_.sources) {
    std::vector<StatisticRequest> requests;
    for (const StatisticConfig& s : config_.statistics) {
      if (s.source == source.name) requests.push_back(s.request);
    }
    tails_.push_back(std::make_unique<SourceTail>(source, requests, config_.blocks, log_));
  }
  for (StatisticConfig& s : config_.statistics) {
    tracked_.push_back(
        {&s, TailOf(s.source), ConvergenceTracker(s.request.name, s.target, SettingsFor(config_, s))});
  }
  AssignConfidences();
  summaries_ = std::make_unique<ProfileSummaries>(config_, log_);
}

void RunMonitor::AssignConfidences() {
  std::vector<std::string> names;
  std::vector<double> own;
  for (const Tracked& t : tracked_) {
    names.push_back(t.config->request.name);
    own.push_back(t.config->target ? t.config->target->confidence : config_.evaluation.confidence);
  }
  const std::vector<double> judged = JudgedConfidences(names, own, config_.groups);
  for (std::size_t i = 0; i < tracked_.size(); ++i) tracked_[i].confidence = judged[i];
}

SourceTail* RunMonitor::TailOf(const std::string& source) {
  for (auto& tail : tails_) {
    if (tail->config().name == source) return tail.get();
  }
  return nullptr;
}

std::string RunMonitor::Fingerprint(const RunConfig& config) {
  std::string f = "blocks=" + std::to_string(config.blocks);
  for (const SourceConfig& s : config.sources) {
    f += "|source=" + s.name + ";" + s.files + ";" + s.time_column + ";";
    for (const std::string& c : s.columns) f += c + ",";
  }
  for (const StatisticConfig& s : config.statistics) {
    f += "|statistic=" + s.request.name + ";" + s.source + ";" +
         std::string(KindName(s.request.kind)) + ";" + s.request.shared_history + ";";
    for (const std::string& c : s.request.columns) f += c + ",";
  }
  return f;
}

void RunMonitor::Restore() {
  Status status;
  const std::optional<StoredCheckpoint> checkpoint = store_->ReadCheckpoint(&status);
  if (!status.ok()) {
    log_->error("cannot read the checkpoint: {}; starting from the beginning of every file",
                status.message());
    return;
  }
  if (!checkpoint) {
    log_->info("new store {}: reading every file from its start", store_->path());
    return;
  }
  cycle_ = checkpoint->cycle;
  if (checkpoint->fingerprint != Fingerprint(config_)) {
    log_->warn("the sources or statistics changed since the checkpoint of cycle {}: reading "
               "every file again from its start",
               checkpoint->cycle);
    return;
  }
  for (auto& tail : tails_) tail->Restore(*checkpoint);
  for (Tracked& t : tracked_) {
    const auto state = checkpoint->items.find("tracker:" + t.config->request.name);
    if (state != checkpoint->items.end()) t.tracker.RestoreState(state->second);
  }
  const auto run = checkpoint->items.find("run");
  if (run != checkpoint->items.end() && run->second.size() == kRunItemSize) {
    const std::vector<double>& item = run->second;
    run_met_ = item[kRunMet] != 0.0;
    first_sample_wall_ = item[kFirstSampleWall];
    input_health_.Restore(item[kStalled] != 0.0, item[kLastSampleWall], item[kBadLinesAlarm] != 0.0);
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
  EventRow e;
  e.kind = kind;
  e.statistic = statistic;
  e.message = std::move(message);
  e.simulated_time = simulated_time;
  e.wall_time = wall_time;
  e.value = kNaN;
  e.half_width = kNaN;
  e.confidence = kNaN;
  e.progress_rate = rate_.PerHour();
  e.elapsed_wall = wall_time - first_sample_wall_;
  for (const AlertChannelKind channel : RecordedChannelsFor(kind, config_.alerts)) {
    e.channels.emplace_back(AlertChannelKindName(channel));
  }
  return e;
}

void RunMonitor::WatchInput(const CycleRecord& record, double wall_time,
                            std::vector<EventRow>& events) {
  InputObservation seen;
  seen.wall_time = wall_time;
  seen.newest_sample_wall = record.last_sample_wall_time;
  for (const auto& tail : tails_) seen.bad_lines += tail->bad_lines();
  const InputHealthLimits limits{config_.alerts.stall_after, config_.alerts.bad_lines_per_minute};
  const std::string newest = FormatValue(record.last_sample_time);
  for (const InputHealthEvent& e : input_health_.Observe(seen, limits)) {
    EventKind kind = EventKind::kResumed;
    std::string message;
    switch (e.kind) {
      case InputHealthEvent::Kind::kResumed:
        message = "new samples arrive again (time " + newest + ")";
        break;
      case InputHealthEvent::Kind::kStalled:
        kind = EventKind::kStalled;
        message = "no new sample for " + FormatDuration(e.quiet_seconds) + " (the newest has time " +
                  newest + "): has the solver stopped, crashed or hung?";
        break;
      case InputHealthEvent::Kind::kBadLines:
        kind = EventKind::kBadLines;
        message = std::to_string(e.bad_lines) + " bad lines since the last evaluation (" +
                  FormatValue(e.per_minute) + " a minute, above " +
                  FormatValue(limits.bad_lines_per_minute) +
                  "): is something else writing into the probe files?";
        break;
    }
    events.push_back(MakeEvent(kind, "", message, record.last_sample_time, wall_time));
  }
}

std::vector<RunMonitor::SourceCounters> RunMonitor::Counters() const {
  std::vector<SourceCounters> counters;
  for (const auto& tail : tails_) {
    SourceCounters c;
    c.source = tail->config().name;
    c.bad_lines = tail->bad_lines();
    c.last_sample_wall = tail->last_sample_wall_time();
    if (const SourceStatistics* s = tail->statistics()) {
      // Every statistic of a source sees every admitted row, and its count is checkpointed.
      for (const Statistic& statistic : s->statistics()) {
        c.samples = std::max<std::uint64_t>(c.samples, statistic.history().sample_count());
      }
    }
    counters.push_back(c);
  }
  return counters;
}

std::string RunMonitor::Reload(const RunConfig& fresh) {
  const bool same_layout = Fingerprint(fresh) == Fingerprint(config_);
  for (Tracked& t : tracked_) {
    const auto it = std::find_if(fresh.statistics.begin(), fresh.statistics.end(),
                                 [&](const StatisticConfig& s) {
                                   return s.request.name == t.config->request.name;
                                 });
    if (it == fresh.statistics.end()) continue;
    StatisticConfig& mine = *t.config;
    const bool target_changed =
        it->target.has_value() != mine.target.has_value() ||
        (it->target && (it->target->kind != mine.target->kind ||
                        it->target->value != mine.target->value ||
                        it->target->confidence != mine.target->confidence));
    mine.target = it->target;
    mine.minimum_time = it->minimum_time;
    mine.reference = it->reference;
    mine.reference_statistic = it->reference_statistic;
    mine.reference_factor = it->reference_factor;
    mine.reference_difference = it->reference_difference;  // used only if it is tracked
    if (target_changed || config_.stop_rule.confirmations != fresh.stop_rule.confirmations) {
      t.tracker.Retarget(mine.target, SettingsFor(fresh, mine));
    }
  }
  config_.alerts = fresh.alerts;
  config_.stop_rule = fresh.stop_rule;
  config_.evaluation.confidence = fresh.evaluation.confidence;
  config_.evaluation.drift_p_value = fresh.evaluation.drift_p_value;
  config_.evaluation.minimum_effective_samples = fresh.evaluation.minimum_effective_samples;
  config_.evaluate_every = fresh.evaluate_every;
  config_.poll_every = fresh.poll_every;
  config_.planned_end_time = fresh.planned_end_time;
  config_.cores = fresh.cores;
  if (same_layout) {
    config_.groups = fresh.groups;
    config_.wall_units = fresh.wall_units;
    for (std::size_t i = 0; i < config_.profiles.size() && i < fresh.profiles.size(); ++i) {
      config_.profiles[i].references = fresh.profiles[i].references;
      config_.profiles[i].momentum_balance = fresh.profiles[i].momentum_balance;
    }
  }
  AssignConfidences();
  summaries_ = std::make_unique<ProfileSummaries>(config_, log_);
  return same_layout ? "config reloaded: targets, alerts and intervals apply now"
                     : "config reloaded: targets, alerts and intervals apply now; the sources or "
                       "statistics changed too, which takes a restart of plateau watch";
}

void RunMonitor::ShiftWallClock(double seconds) {
  first_sample_wall_ += seconds;
  input_health_.ShiftWallClock(seconds);
  rate_.Shift(seconds);
  for (auto& tail : tails_) tail->ShiftWallClock(seconds);
}

bool RunMonitor::Poll(double wall_time) {
  bool more = false;
  for (auto& tail : tails_) more = tail->Poll(wall_time) || more;
  return more;
}

std::vector<std::string> RunMonitor::Folders() const {
  std::vector<std::string> folders;
  for (const auto& tail : tails_) {
    for (const std::string& f : tail->Folders()) folders.push_back(f);
  }
  std::sort(folders.begin(), folders.end());
  folders.erase(std::unique(folders.begin(), folders.end()), folders.end());
  return folders;
}

SnapshotRow RunMonitor::Snapshot(Tracked& t, double wall_time, std::vector<EventRow>& events,
                                 StatisticEstimate* estimate) {
  const StatisticConfig& c = *t.config;
  EvaluationOptions options = config_.evaluation;
  options.confidence = t.confidence;
  const Statistic* statistic = t.tail->Find(c.request.name);
  const std::string problem = t.tail->ProblemOf(c.request.name);
  StatisticEstimate e;
  if (statistic != nullptr) {
    e = statistic->Evaluate(options);
    t.tail->source()->AddTimeScales(e);
  } else {
    e.name = c.request.name;
    e.kind = c.request.kind;
    e.confidence = options.confidence;
    e.state_reason = problem.empty() ? "no file of source '" + c.source + "' has been read yet"
                                     : problem;
  }
  SnapshotRow row = EstimateRow(e);
  if (!problem.empty()) {
    row.state = ConvergenceState::kColumnMissing;
    row.state_reason = problem;
  } else {
    for (const ConvergenceEvent& event : t.tracker.Update(e, wall_time)) {
      EventRow event_row = MakeEvent(event.kind, event.statistic, event.message,
                                     event.simulated_time, event.wall_time);
      event_row.value = e.value;
      event_row.half_width = e.half_width;
      event_row.confidence = e.confidence;
      if (c.target) event_row.target = FormatTarget(c.target->kind, c.target->value);
      events.push_back(std::move(event_row));
    }
    row.state = t.tracker.state();
    row.state_reason = t.tracker.reason();
  }
  row.statistic = c.request.name;
  row.confidence = options.confidence;
  if (c.target) {
    row.target_kind = c.target->kind;
    row.target_value = c.target->value;
  }
  row.target_half_width = t.tracker.TargetHalfWidth(e.value);
  row.met_at_time = t.tracker.met() ? t.tracker.met_at_time() : kNaN;
  row.met_at_wall = t.tracker.met() ? t.tracker.met_at_wall() : kNaN;
  row.remaining_time = !c.target        ? kNaN
                       : t.tracker.met() ? 0.0
                                         : RemainingTimeToTarget(e, row.target_half_width);
  const double rate = rate_.PerHour();
  row.remaining_wall = rate > 0.0 ? row.remaining_time / rate * 3600.0 : kNaN;
  const std::optional<ReferenceComparison> reference = Reference(c, e, options);
  if (reference) row.reference_verdict = std::string(VerdictName(reference->verdict));
  row.profile = c.profile;
  row.document = StatisticJson(e, c, t.tracker, row, reference, t.tail->source(),
                           config_.flow_through_time, wall_time);
  *estimate = std::move(e);
  return row;
}

std::optional<ReferenceComparison> RunMonitor::Reference(const StatisticConfig& c,
                                                         const StatisticEstimate& e,
                                                         const EvaluationOptions& options) {
  if (c.reference) return CompareWithReference(e, *c.reference);
  if (c.reference_statistic.empty()) return std::nullopt;
  // The other statistic (and the joint difference) at this statistic's confidence.
  const auto evaluate = [&](const std::string& name) -> std::optional<StatisticEstimate> {
    for (const Tracked& t : tracked_) {
      if (t.config->request.name != name) continue;
      const Statistic* statistic = t.tail->Find(name);
      if (statistic != nullptr) return statistic->Evaluate(options);
    }
    return std::nullopt;
  };
  const std::optional<StatisticEstimate> reference = evaluate(c.reference_statistic);
  if (!reference) return std::nullopt;
  // A difference statistic a reload asked for is not tracked until the daemon restarts.
  const std::optional<StatisticEstimate> difference =
      c.reference_difference.empty() ? std::nullopt : evaluate(c.reference_difference);
  return CompareWithSeriesReference(e, *reference, c.reference_factor,
                                    difference ? &*difference : nullptr);
}

SnapshotRow RunMonitor::GroupSnapshot(const StatisticGroup& g,
                                      const std::vector<TargetStanding>& standings,
                                      double wall_time) const {
  const GroupStanding standing = JudgeGroup(g, standings);
  SnapshotRow row = BlankRow(g.name, RowKind::kGroup);
  row.confidence = g.confidence;
  row.state = standing.met ? ConvergenceState::kMet : ConvergenceState::kConverging;
  row.state_reason = standing.reason;
  row.remaining_time = standing.remaining_time;
  const double rate = rate_.PerHour();
  row.remaining_wall = rate > 0.0 ? row.remaining_time / rate * 3600.0 : kNaN;
  JsonWriter json;
  json.BeginObject();
  json.Field("name", g.name);
  json.Field("group", true);
  json.Key("members");
  json.BeginArray();
  for (const std::string& m : g.members) json.String(m);
  json.EndArray();
  json.Field("members_met", standing.members_met);
  json.Field("state", ConvergenceStateName(row.state));
  json.Field("state_reason", row.state_reason);
  json.Field("required", g.required);
  json.Field("bonferroni", g.bonferroni);
  json.Field("confidence", g.confidence);
  json.Field("member_confidence", standing.member_confidence);
  WriteTimeToTarget(json, row.remaining_time, row.remaining_wall, wall_time);
  json.EndObject();
  row.document = json.TakeDocument();
  return row;
}

Status RunMonitor::Evaluate(double wall_time) {
  CycleRecord record;
  record.cycle = cycle_ + 1;
  record.wall_time = wall_time;
  record.fingerprint = Fingerprint(config_);
  record.last_sample_time = kNaN;
  record.last_sample_wall_time = kNaN;
  for (const auto& tail : tails_) {
    const double t = tail->last_sample_time();
    if (!std::isnan(t) && !(t <= record.last_sample_time)) record.last_sample_time = t;
    const double w = tail->last_sample_wall_time();
    if (!std::isnan(w) && !(w <= record.last_sample_wall_time)) record.last_sample_wall_time = w;
  }
  if (std::isnan(first_sample_wall_)) first_sample_wall_ = record.last_sample_wall_time;
  rate_.Add(wall_time, record.last_sample_time);
  std::vector<EventRow> events;
  WatchInput(record, wall_time, events);
  std::vector<StatisticEstimate> estimates(tracked_.size());
  std::vector<TargetStanding> standings;
  for (std::size_t i = 0; i < tracked_.size(); ++i) {
    Tracked& t = tracked_[i];
    const SnapshotRow& row = record.snapshots.emplace_back(Snapshot(t, wall_time, events, &estimates[i]));
    standings.push_back({row.statistic, t.config->target.has_value(),
                         row.state == ConvergenceState::kMet,
                         std::string(ConvergenceStateName(row.state)), row.state_reason,
                         row.remaining_time});
  }
  record.remaining_time = RunRemainingTime(standings);
  const double rate = rate_.PerHour();
  record.remaining_wall = rate > 0.0 ? record.remaining_time / rate * 3600.0 : kNaN;
  std::vector<ProfileSummaries::Entry> entries;
  for (std::size_t i = 0; i < tracked_.size(); ++i) {
    entries.push_back({tracked_[i].config, &estimates[i], &record.snapshots[i]});
  }
  for (SnapshotRow& row : summaries_->Rows(entries)) record.snapshots.push_back(std::move(row));
  for (const StatisticGroup& g : config_.groups) {
    record.snapshots.push_back(GroupSnapshot(g, standings, wall_time));
  }
  const bool run_met = RunMet(standings, config_.groups);
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
  for (auto& tail : tails_) tail->Checkpoint(record);
  for (const Tracked& t : tracked_) {
    record.checkpoint["tracker:" + t.config->request.name] = t.tracker.SaveState();
  }
  std::vector<double>& run = record.checkpoint["run"];
  run.resize(kRunItemSize);
  run[kRunMet] = run_met_ ? 1.0 : 0.0;
  run[kStalled] = input_health_.stalled() ? 1.0 : 0.0;
  run[kFirstSampleWall] = first_sample_wall_;
  run[kLastSampleWall] = input_health_.last_sample_wall();
  run[kBadLinesAlarm] = input_health_.bad_lines_alarm() ? 1.0 : 0.0;

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
