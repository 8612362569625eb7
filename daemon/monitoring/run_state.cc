#include "daemon/monitoring/run_state.h"

#include <cstddef>

namespace plateau {
namespace {

enum Place : std::size_t {
  kRunMet,
  kStalled,
  kFirstSampleWall,
  kLastSampleWall,
  kBadLinesAlarm,
  kPlaces
};

}  // namespace

std::vector<double> RunStateItem(const RunState& state) {
  std::vector<double> item(kPlaces);
  item[kRunMet] = state.run_met ? 1.0 : 0.0;
  item[kStalled] = state.stalled ? 1.0 : 0.0;
  item[kFirstSampleWall] = state.first_sample_wall;
  item[kLastSampleWall] = state.last_sample_wall;
  item[kBadLinesAlarm] = state.bad_lines_alarm ? 1.0 : 0.0;
  return item;
}

std::optional<RunState> RunStateFromItem(const std::vector<double>& item) {
  if (item.size() != kPlaces) return std::nullopt;
  RunState state;
  state.run_met = item[kRunMet] != 0.0;
  state.stalled = item[kStalled] != 0.0;
  state.first_sample_wall = item[kFirstSampleWall];
  state.last_sample_wall = item[kLastSampleWall];
  state.bad_lines_alarm = item[kBadLinesAlarm] != 0.0;
  return state;
}

}  // namespace plateau
