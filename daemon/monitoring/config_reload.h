// A reloaded config applied to a running one: targets, stop-rule settings, alerts and intervals
// take effect; sources and statistics cannot change without a restart (their estimator state
// would mean something else), so only the parts that keep the layout are taken. Pure.
#ifndef PLATEAU_DAEMON_MONITORING_CONFIG_RELOAD_H_
#define PLATEAU_DAEMON_MONITORING_CONFIG_RELOAD_H_

#include <string>
#include <vector>

#include "config/run_config.h"

namespace plateau {

struct ReloadOutcome {
  bool same_layout = true;  // sources and statistics as before
  // Statistics whose stop rule starts again (their target or the confirmations changed).
  std::vector<std::string> retargeted;
  std::string message;  // what the user is told
};

// Updates `running` from `fresh` in place; running.statistics keeps its size and order.
ReloadOutcome ApplyReload(RunConfig& running, const RunConfig& fresh);

}  // namespace plateau

#endif  // PLATEAU_DAEMON_MONITORING_CONFIG_RELOAD_H_
