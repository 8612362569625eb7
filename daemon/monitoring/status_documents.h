// The status objects a cycle records for each statistic and group: the keys of
// `plateau analyze --json` plus the stop rule's (state, target, confirmations, met at, time to
// target, the reference verdict), as scripts read them from `plateau status --json`. Pure.
#ifndef PLATEAU_DAEMON_MONITORING_STATUS_DOCUMENTS_H_
#define PLATEAU_DAEMON_MONITORING_STATUS_DOCUMENTS_H_

#include <optional>

#include "config/run_config.h"
#include "core/convergence_tracker.h"
#include "core/joint_region.h"
#include "core/reference_check.h"
#include "core/run_verdict.h"
#include "core/source_statistics.h"
#include "core/statistic_estimate.h"
#include "daemon/presentation/json_document.h"
#include "store/run_store.h"

namespace plateau {

// One statistic: its estimate `e`, its config and stop rule, the row the cycle records for it,
// the reference verdict (nullopt without a reference) and its source (nullptr before any file).
JsonDocument StatisticDocument(const StatisticEstimate& e, const StatisticConfig& c,
                               const ConvergenceTracker& tracker, const SnapshotRow& row,
                               const std::optional<ReferenceComparison>& reference,
                               const SourceStatistics* source, double flow_through_time,
                               double wall_time);

// One group: its members, how many are met, its joint rule (separate, bonferroni with the member
// confidence, multivariate with its region; `region` nullptr for the others).
JsonDocument GroupDocument(const StatisticGroup& group, const GroupStanding& standing,
                           const JointRegion* region, const SnapshotRow& row, double wall_time);

}  // namespace plateau

#endif  // PLATEAU_DAEMON_MONITORING_STATUS_DOCUMENTS_H_
