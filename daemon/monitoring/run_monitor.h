// The watching daemon's logic without its event loop: restores from the store's checkpoint, polls
// every source, evaluates every statistic against its target, and records each cycle (snapshots,
// events, checkpoint) in one store transaction. A failed write (a full disk) loses nothing: the
// cycle's events stay pending and the next cycle writes the state again. Not thread-safe: the
// event loop owns it.
#ifndef PLATEAU_DAEMON_MONITORING_RUN_MONITOR_H_
#define PLATEAU_DAEMON_MONITORING_RUN_MONITOR_H_

#include <spdlog/spdlog.h>

#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "config/run_config.h"
#include "core/input_health.h"
#include "core/joint_region.h"
#include "core/progress_rate.h"
#include "core/run_verdict.h"
#include "core/status.h"
#include "daemon/ingest/source_tails.h"
#include "daemon/monitoring/profile_summaries.h"
#include "daemon/monitoring/tracked_statistic.h"
#include "store/run_store.h"

namespace plateau {

class RunMonitor {
 public:
  RunMonitor(RunConfig config, std::unique_ptr<RunStore> store,
             std::shared_ptr<spdlog::logger> log);

  // Resumes from the store's checkpoint when it was written for the same sources and statistics;
  // otherwise (a new store, or a changed config) every file is read from its start.
  void Restore();
  // Reads what the probe files gained. Returns true when more bytes are waiting.
  bool Poll(double wall_time) { return tails_.Poll(wall_time); }
  // Evaluates every statistic and writes one cycle to the store.
  Status Evaluate(double wall_time);
  // The loop is reading a backlog: what follows says nothing about the solver's speed or its
  // bad-line rate, so both measurements start again.
  void NoteCatchUp();
  // The system clock jumped by `seconds` (an NTP step, a suspended machine): every wall time held
  // for measuring durations (stall, progress rate, bad-line rate) moves with it. Recorded stamps
  // stay as they were.
  void ShiftWallClock(double seconds);

  bool run_met() const { return run_met_; }
  RunStore& store() { return *store_; }
  // The last cycle written (its snapshots and run fields; no checkpoint); cycle 0 before any.
  const CycleRecord& last_cycle() const { return last_cycle_; }

  std::vector<SourceCounters> Counters() const { return tails_.Counters(); }

  // Applies a reloaded config: targets, stop-rule settings, alerts and intervals take effect now,
  // keeping every estimate and the confirmations counted so far for unchanged targets. Sources
  // and statistics cannot change without a restart: when they differ, the rest is still applied
  // and the returned message says so.
  std::string Reload(const RunConfig& fresh);
  double progress_rate() const { return rate_.PerHour(); }
  std::int64_t cycle() const { return cycle_; }
  const RunConfig& config() const { return config_; }
  std::vector<std::string> Folders() const { return tails_.Folders(); }

 private:
  // A statistic's estimate at `options`, for the statistics judged against it.
  std::optional<StatisticEstimate> EstimateOf(const std::string& name,
                                              const EvaluationOptions& options) const;
  // The row of one statistic; its estimate goes to *estimate (profiles and wall units use it),
  // its stop rule's events to `events`.
  SnapshotRow Snapshot(TrackedStatistic& t, double wall_time, std::vector<EventRow>& events,
                       StatisticEstimate* estimate);
  SnapshotRow GroupSnapshot(const StatisticGroup& group, const GroupStanding& standing,
                            const JointRegion* region, double wall_time) const;
  // A multivariate group's joint region from its members' estimates and rows of this cycle
  // (`estimates` and `rows` in the order of tracked_).
  JointRegion JointRegionOf(const StatisticGroup& group,
                            const std::vector<StatisticEstimate>& estimates,
                            const std::vector<SnapshotRow>& rows) const;
  // Per statistic, the confidence it is judged at (Bonferroni groups make it stricter).
  void AssignConfidences();
  // An event with the details alerts need and the channels that take its kind.
  EventRow MakeEvent(EventKind kind, const std::string& statistic, std::string message,
                     double simulated_time, double wall_time) const;
  void WatchInput(const CycleRecord& record, double wall_time, std::vector<EventRow>& events);

  RunConfig config_;
  std::unique_ptr<RunStore> store_;
  std::shared_ptr<spdlog::logger> log_;
  SourceTails tails_;
  std::unique_ptr<ProfileSummaries> summaries_;
  std::vector<TrackedStatistic> tracked_;
  std::vector<EventRow> pending_events_;
  std::int64_t cycle_ = 0;
  bool run_met_ = false;
  bool last_write_failed_ = false;
  ProgressRate rate_;
  double first_sample_wall_;  // when the run's first sample was read
  InputHealth input_health_;
  CycleRecord last_cycle_;
};

}  // namespace plateau

#endif  // PLATEAU_DAEMON_MONITORING_RUN_MONITOR_H_
