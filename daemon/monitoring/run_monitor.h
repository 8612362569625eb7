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
#include "core/convergence_tracker.h"
#include "core/input_health.h"
#include "core/progress_rate.h"
#include "core/reference_check.h"
#include "core/run_verdict.h"
#include "core/status.h"
#include "daemon/monitoring/profile_summaries.h"
#include "daemon/ingest/source_tail.h"
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
  bool Poll(double wall_time);
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

  struct SourceCounters {
    std::string source;
    std::uint64_t samples = 0;  // admitted (after the restart-overlap gate)
    std::uint64_t bad_lines = 0;
    double last_sample_wall = 0.0;  // NaN before the first
  };
  std::vector<SourceCounters> Counters() const;

  // Applies a reloaded config: targets, stop-rule settings, alerts and intervals take effect now,
  // keeping every estimate and the confirmations counted so far for unchanged targets. Sources
  // and statistics cannot change without a restart: when they differ, the rest is still applied
  // and the returned message says so.
  std::string Reload(const RunConfig& fresh);
  double progress_rate() const { return rate_.PerHour(); }
  std::int64_t cycle() const { return cycle_; }
  const RunConfig& config() const { return config_; }
  std::vector<std::string> Folders() const;

  // What identifies the meaning of the checkpointed estimator state: sources and statistics, not
  // targets (those may change between restarts without re-reading anything).
  static std::string Fingerprint(const RunConfig& config);

 private:
  struct Tracked {
    StatisticConfig* config;  // into config_.statistics, which never changes size
    SourceTail* tail;
    ConvergenceTracker tracker;
    double confidence = 0.95;  // the target's, or stricter inside a Bonferroni group
  };
  SourceTail* TailOf(const std::string& source);
  // The row of one statistic; its estimate goes to *estimate (profiles and wall units use it).
  // The reference verdict of a statistic: against a value, or against another statistic's series
  // (jointly where the config formed their difference); nullopt without a reference or while the
  // reference statistic has no data.
  std::optional<ReferenceComparison> Reference(const StatisticConfig& c, const StatisticEstimate& e,
                                               const EvaluationOptions& options);
  SnapshotRow Snapshot(Tracked& t, double wall_time, std::vector<EventRow>& events,
                       StatisticEstimate* estimate);
  SnapshotRow GroupSnapshot(const StatisticGroup& group, const std::vector<TargetStanding>& standings,
                            double wall_time) const;
  // Per statistic, the confidence it is judged at (Bonferroni groups make it stricter).
  void AssignConfidences();
  // An event with the details alerts need and the channels that take its kind.
  EventRow MakeEvent(EventKind kind, const std::string& statistic, std::string message,
                     double simulated_time, double wall_time) const;
  void WatchInput(const CycleRecord& record, double wall_time, std::vector<EventRow>& events);

  RunConfig config_;
  std::unique_ptr<RunStore> store_;
  std::shared_ptr<spdlog::logger> log_;
  std::vector<std::unique_ptr<SourceTail>> tails_;
  std::unique_ptr<ProfileSummaries> summaries_;
  std::vector<Tracked> tracked_;
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
