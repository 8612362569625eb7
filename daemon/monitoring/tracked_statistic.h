// One statistic the daemon follows: its config, the source it is read from, its stop rule and the
// confidence it is judged at. Each cycle it is evaluated once into its estimate, its row (with the
// status object) and the stop rule's events. Not thread-safe: the monitor owns it.
#ifndef PLATEAU_DAEMON_MONITORING_TRACKED_STATISTIC_H_
#define PLATEAU_DAEMON_MONITORING_TRACKED_STATISTIC_H_

#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "config/run_config.h"
#include "core/convergence_tracker.h"
#include "core/reference_check.h"
#include "daemon/ingest/source_tail.h"
#include "store/run_store.h"

namespace plateau {

class TrackedStatistic {
 public:
  // `config` points into the run's config (which never changes size); `tail` reads its source.
  TrackedStatistic(StatisticConfig* config, SourceTail* tail, const StopRuleSettings& settings);

  // What one cycle says of it.
  // Holds a document: why the next line is exempt is said at SnapshotRow (store/run_store.h).
  // NOLINTNEXTLINE(bugprone-exception-escape)
  struct Evaluation {
    StatisticEstimate estimate;
    SnapshotRow row;
    std::vector<ConvergenceEvent> events;  // met, lost, drift
  };
  // Another statistic's estimate at the given options; nullopt when it has none.
  using EstimateOf =
      std::function<std::optional<StatisticEstimate>(const std::string&, const EvaluationOptions&)>;

  // Evaluates at `options` (the run's, at this statistic's confidence), advances the stop rule,
  // and builds its row; `progress_rate` (simulated time per wall-clock hour; 0 unknown) turns the
  // remaining time into wall-clock seconds; `estimate_of` gives a reference statistic's estimate.
  Evaluation Evaluate(const EvaluationOptions& options, double wall_time, double progress_rate,
                      double flow_through_time, const EstimateOf& estimate_of);
  // The statistic its source feeds; nullptr before its source has it.
  const Statistic* statistic() const;
  // Its estimate at `options` without advancing anything; nullopt before its source has it.
  std::optional<StatisticEstimate> EstimateAt(const EvaluationOptions& options) const;

  const StatisticConfig& config() const { return *config_; }
  StatisticConfig& config() { return *config_; }
  const std::string& name() const { return config_->request.name; }
  ConvergenceTracker& tracker() { return tracker_; }
  const ConvergenceTracker& tracker() const { return tracker_; }
  double confidence() const { return confidence_; }
  void set_confidence(double confidence) { confidence_ = confidence; }

 private:
  // Against a value, or against another statistic's series (jointly where the config formed
  // their difference); nullopt without a reference or while the reference has no data.
  std::optional<ReferenceComparison> Reference(const StatisticEstimate& e,
                                               const EvaluationOptions& options,
                                               const EstimateOf& estimate_of) const;

  StatisticConfig* config_;
  SourceTail* tail_;
  ConvergenceTracker tracker_;
  double confidence_ = 0.95;  // the target's, or stricter inside a Bonferroni group
};

}  // namespace plateau

#endif  // PLATEAU_DAEMON_MONITORING_TRACKED_STATISTIC_H_
