// What identifies the meaning of a run's checkpointed estimator state: its sources and statistics,
// not its targets (those may change between restarts without re-reading anything). Pure.
#ifndef PLATEAU_DAEMON_MONITORING_RUN_FINGERPRINT_H_
#define PLATEAU_DAEMON_MONITORING_RUN_FINGERPRINT_H_

#include <string>

#include "config/run_config.h"

namespace plateau {

std::string RunFingerprint(const RunConfig& config);

}  // namespace plateau

#endif  // PLATEAU_DAEMON_MONITORING_RUN_FINGERPRINT_H_
