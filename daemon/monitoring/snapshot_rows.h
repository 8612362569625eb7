// The rows a cycle records, started the same way wherever they are built (statistics, derived
// statistics, profile summaries, groups): every number unknown until it is set, no target.
#ifndef PLATEAU_DAEMON_MONITORING_SNAPSHOT_ROWS_H_
#define PLATEAU_DAEMON_MONITORING_SNAPSHOT_ROWS_H_

#include <string>

#include "core/statistic_estimate.h"
#include "store/run_store.h"

namespace plateau {

// A row of `kind` named `name` whose numbers are all NaN.
SnapshotRow BlankRow(const std::string& name, RowKind kind);

// The row of a statistic's estimate: its numbers, its confidence; no target, no state yet.
SnapshotRow EstimateRow(const StatisticEstimate& e);

}  // namespace plateau

#endif  // PLATEAU_DAEMON_MONITORING_SNAPSHOT_ROWS_H_
