// The run's own state kept across restarts, beside each statistic's stop rule: whether it was met,
// whether its input was stalled, when its first and newest samples were read, whether the bad-line
// alarm was raised. Stored as the checkpoint item "run", one double per field in a fixed order
// (stores written by earlier versions hold the same five). Pure.
#ifndef PLATEAU_DAEMON_MONITORING_RUN_STATE_H_
#define PLATEAU_DAEMON_MONITORING_RUN_STATE_H_

#include <limits>
#include <optional>
#include <vector>

namespace plateau {

struct RunState {
  bool run_met = false;
  bool stalled = false;
  double first_sample_wall = std::numeric_limits<double>::quiet_NaN();
  double last_sample_wall = std::numeric_limits<double>::quiet_NaN();
  bool bad_lines_alarm = false;
};

std::vector<double> RunStateItem(const RunState& state);
// nullopt for an item of another length (not written by this layout).
std::optional<RunState> RunStateFromItem(const std::vector<double>& item);

}  // namespace plateau

#endif  // PLATEAU_DAEMON_MONITORING_RUN_STATE_H_
