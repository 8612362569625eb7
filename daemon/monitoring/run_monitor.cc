#include "daemon/monitoring/run_monitor.h"

#include <algorithm>
#include <cmath>
#include <limits>

#include "core/reference_check.h"
#include "core/time_to_target.h"
#include "daemon/presentation/analysis_report.h"
#include "daemon/presentation/number_format.h"
#include "daemon/presentation/json_writer.h"

namespace plateau {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

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
std::string StatisticJson(const StatisticEstimate& e, const StatisticConfig& c,
                          const ConvergenceTracker& tracker, const SnapshotRow& row,
                          const std::optional<ReferenceComparison>& reference,
                          const SourceStatistics* source, double flow_through_time,
                          double wall_time) {
  const std::string& state = row.state;
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
  return json.text();
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
      first_sample_wall_(kNaN),
      last_sample_wall_(kNaN),
      bad_lines_since_(kNaN) {
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
  for (Tracked& t : tracked_) {
    t.confidence = t.config->target ? t.config->target->confidence : config_.evaluation.confidence;
  }
  for (const GroupConfig& g : config_.groups) {
    if (!g.bonferroni || g.members.empty()) continue;
    // Bonferroni: if each of m intervals misses with probability (1 - c) / m, any misses with at
    // most 1 - c.
    const double member = 1.0 - (1.0 - g.confidence) / static_cast<double>(g.members.size());
    for (Tracked& t : tracked_) {
      if (std::find(g.members.begin(), g.members.end(), t.config->request.name) != g.members.end()) {
        t.confidence = std::max(t.confidence, member);
      }
    }
  }
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
  if (run != checkpoint->items.end() && run->second.size() == 5) {
    run_met_ = run->second[0] != 0.0;
    stalled_ = run->second[1] != 0.0;
    first_sample_wall_ = run->second[2];
    last_sample_wall_ = run->second[3];
    bad_lines_alarm_ = run->second[4] != 0.0;
  }
  log_->info("resumed from the checkpoint of cycle {} ({} files)", checkpoint->cycle,
             checkpoint->files.size());
}

void RunMonitor::NoteCatchUp() {
  rate_.Restart();
  bad_lines_since_ = kNaN;
}

EventRow RunMonitor::MakeEvent(const std::string& kind, const std::string& statistic,
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
  const AlertsConfig& a = config_.alerts;
  if (std::find(a.events.begin(), a.events.end(), kind) != a.events.end()) {
    if (a.email) e.channels.push_back("email");
    if (a.command) e.channels.push_back("command");
  }
  if (kind == "run_met" && !a.stop_file.empty()) e.channels.push_back("stop_file");
  return e;
}

void RunMonitor::WatchInput(const CycleRecord& record, double wall_time,
                            std::vector<EventRow>& events) {
  const double newest = record.last_sample_wall_time;
  if (stalled_ && newest > last_sample_wall_) {
    stalled_ = false;
    events.push_back(MakeEvent("resumed", "", "new samples arrive again (time " +
                                                  FormatValue(record.last_sample_time) + ")",
                               record.last_sample_time, wall_time));
  }
  if (!std::isnan(newest)) last_sample_wall_ = newest;
  if (!stalled_ && !std::isnan(last_sample_wall_) &&
      wall_time - last_sample_wall_ > config_.alerts.stall_after) {
    stalled_ = true;
    events.push_back(MakeEvent("stalled", "",
                               "no new sample for " +
                                   FormatDuration(wall_time - last_sample_wall_) +
                                   " (the newest has time " + FormatValue(record.last_sample_time) +
                                   "): has the solver stopped, crashed or hung?",
                               record.last_sample_time, wall_time));
  }
  std::uint64_t bad = 0;
  for (const auto& tail : tails_) bad += tail->bad_lines();
  if (!std::isnan(bad_lines_since_) && wall_time > bad_lines_since_) {
    const double per_minute =
        static_cast<double>(bad - bad_lines_seen_) / (wall_time - bad_lines_since_) * 60.0;
    if (per_minute > config_.alerts.bad_lines_per_minute && !bad_lines_alarm_) {
      events.push_back(MakeEvent(
          "bad_lines", "",
          std::to_string(bad - bad_lines_seen_) + " bad lines since the last evaluation (" +
              FormatValue(per_minute) + " a minute, above " +
              FormatValue(config_.alerts.bad_lines_per_minute) +
              "): is something else writing into the probe files?",
          record.last_sample_time, wall_time));
    }
    bad_lines_alarm_ = per_minute > config_.alerts.bad_lines_per_minute;
  }
  bad_lines_seen_ = bad;
  bad_lines_since_ = wall_time;
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
  last_sample_wall_ += seconds;
  bad_lines_since_ += seconds;
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
  std::string state;
  std::string reason;
  if (!problem.empty()) {
    state = "column_missing";
    reason = problem;
  } else {
    for (const ConvergenceEvent& event : t.tracker.Update(e, wall_time)) {
      const char* kind = event.kind == ConvergenceEvent::Kind::kMet    ? "met"
                         : event.kind == ConvergenceEvent::Kind::kLost ? "lost"
                                                                       : "drift";
      EventRow row = MakeEvent(kind, event.statistic, event.message, event.simulated_time,
                               event.wall_time);
      row.value = e.value;
      row.half_width = e.half_width;
      row.confidence = e.confidence;
      if (c.target) {
        row.target = c.target->kind == Target::Kind::kRelative ? FormatPercent(c.target->value)
                                                               : FormatValue(c.target->value);
      }
      events.push_back(std::move(row));
    }
    state = std::string(ConvergenceStateName(t.tracker.state()));
    reason = t.tracker.reason();
  }
  SnapshotRow row;
  row.statistic = c.request.name;
  row.state = state;
  row.state_reason = reason;
  row.confidence = options.confidence;
  row.target_kind = c.target ? std::string(TargetKindName(c.target->kind)) : "";
  row.target_value = c.target ? c.target->value : kNaN;
  row.target_half_width = t.tracker.TargetHalfWidth(e.value);
  row.met_at_time = t.tracker.met() ? t.tracker.met_at_time() : kNaN;
  row.met_at_wall = t.tracker.met() ? t.tracker.met_at_wall() : kNaN;
  row.value = e.value;
  row.half_width = e.half_width;
  row.relative_half_width = e.relative_half_width;
  row.integrated_time = e.integrated_time;
  row.effective_samples = e.effective_samples;
  row.integral_time_scale = e.integral_time_scale;
  row.averaging_time = e.averaging_time;
  row.warmup_end_time = e.warmup_end_time;
  row.samples_used = static_cast<std::int64_t>(e.samples_used);
  row.last_time = e.last_time;
  row.remaining_time = !c.target        ? kNaN
                       : t.tracker.met() ? 0.0
                                         : RemainingTimeToTarget(e, row.target_half_width);
  const double rate = rate_.PerHour();
  row.remaining_wall = rate > 0.0 ? row.remaining_time / rate * 3600.0 : kNaN;
  const std::optional<ReferenceComparison> reference = Reference(c, e, options);
  if (reference) row.reference_verdict = std::string(VerdictName(reference->verdict));
  row.profile = c.profile;
  row.json = StatisticJson(e, c, t.tracker, row, reference, t.tail->source(),
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

SnapshotRow RunMonitor::GroupSnapshot(const GroupConfig& g, const std::vector<SnapshotRow>& rows,
                                      double wall_time) const {
  SnapshotRow row;
  row.statistic = g.name;
  row.target_kind = "group";
  row.value = row.half_width = row.relative_half_width = kNaN;
  row.integrated_time = row.effective_samples = row.warmup_end_time = row.last_time = kNaN;
  row.target_value = row.target_half_width = row.met_at_time = row.met_at_wall = kNaN;
  row.confidence = g.confidence;
  int met = 0;
  double remaining = 0.0;
  const SnapshotRow* first_unmet = nullptr;
  for (const std::string& member : g.members) {
    for (const SnapshotRow& r : rows) {
      if (r.statistic != member) continue;
      if (r.state == "met") {
        ++met;
      } else if (!first_unmet) {
        first_unmet = &r;
      }
      remaining = std::isnan(r.remaining_time) ? kNaN : std::max(remaining, r.remaining_time);
    }
  }
  const int size = static_cast<int>(g.members.size());
  row.state = met == size ? "met" : "converging";
  row.state_reason = std::to_string(met) + " of " + std::to_string(size) + " members met" +
                     (first_unmet ? "; " + first_unmet->statistic + " is " + first_unmet->state +
                                        ": " + first_unmet->state_reason
                                  : "");
  row.remaining_time = remaining;
  const double rate = rate_.PerHour();
  row.remaining_wall = rate > 0.0 ? remaining / rate * 3600.0 : kNaN;
  JsonWriter json;
  json.BeginObject();
  json.Field("name", g.name);
  json.Field("group", true);
  json.Key("members");
  json.BeginArray();
  for (const std::string& m : g.members) json.String(m);
  json.EndArray();
  json.Field("members_met", met);
  json.Field("state", row.state);
  json.Field("state_reason", row.state_reason);
  json.Field("required", g.required);
  json.Field("bonferroni", g.bonferroni);
  json.Field("confidence", g.confidence);
  json.Field("member_confidence",
             g.bonferroni ? 1.0 - (1.0 - g.confidence) / std::max(size, 1) : kNaN);
  WriteTimeToTarget(json, row.remaining_time, row.remaining_wall, wall_time);
  json.EndObject();
  row.json = json.text();
  return row;
}

bool RunMonitor::RunMet(const std::vector<SnapshotRow>& rows) const {
  const auto in_a_group = [&](const std::string& name) {
    for (const GroupConfig& g : config_.groups) {
      if (std::find(g.members.begin(), g.members.end(), name) != g.members.end()) return true;
    }
    return false;
  };
  int targets = 0;
  for (const SnapshotRow& r : rows) {
    const bool group = r.target_kind == "group";
    if (r.target_kind.empty() || r.target_kind == "profile" ||
        (!group && in_a_group(r.statistic))) {
      continue;
    }
    if (group) {
      const auto g = std::find_if(config_.groups.begin(), config_.groups.end(),
                                  [&](const GroupConfig& x) { return x.name == r.statistic; });
      if (g == config_.groups.end() || !g->required) continue;
    }
    ++targets;
    if (r.state != "met") return false;
  }
  return targets > 0;
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
  int targets = 0;
  int met = 0;
  record.remaining_time = 0.0;
  std::vector<StatisticEstimate> estimates(tracked_.size());
  for (std::size_t i = 0; i < tracked_.size(); ++i) {
    Tracked& t = tracked_[i];
    record.snapshots.push_back(Snapshot(t, wall_time, events, &estimates[i]));
    if (t.config->target) {
      ++targets;
      met += t.tracker.met();
      const double left = record.snapshots.back().remaining_time;
      record.remaining_time = std::isnan(left) ? kNaN : std::max(record.remaining_time, left);
    }
  }
  if (targets == 0) record.remaining_time = kNaN;
  const double rate = rate_.PerHour();
  record.remaining_wall = rate > 0.0 ? record.remaining_time / rate * 3600.0 : kNaN;
  const std::size_t statistic_rows = record.snapshots.size();
  std::vector<ProfileSummaries::Entry> entries;
  for (std::size_t i = 0; i < tracked_.size(); ++i) {
    entries.push_back({tracked_[i].config, &estimates[i], &record.snapshots[i]});
  }
  for (SnapshotRow& row : summaries_->Rows(entries)) record.snapshots.push_back(std::move(row));
  for (const GroupConfig& g : config_.groups) {
    record.snapshots.push_back(GroupSnapshot(
        g,
        std::vector<SnapshotRow>(record.snapshots.begin(), record.snapshots.begin() + statistic_rows),
        wall_time));
  }
  const bool run_met = RunMet(record.snapshots);
  if (run_met != run_met_) {
    events.push_back(MakeEvent(run_met ? "run_met" : "run_lost", "",
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
  record.checkpoint["run"] = {run_met_ ? 1.0 : 0.0, stalled_ ? 1.0 : 0.0, first_sample_wall_,
                              last_sample_wall_, bad_lines_alarm_ ? 1.0 : 0.0};

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
  for (const EventRow& e : pending_events_) log_->info("event {}: {}", e.kind, e.message);
  pending_events_.clear();
  log_->debug("cycle {}: {} of {} targets met", cycle_, met, targets);
  return status;
}

}  // namespace plateau
