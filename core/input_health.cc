#include "core/input_health.h"

#include <cmath>
#include <limits>

namespace plateau {

InputHealth::InputHealth()
    : last_sample_wall_(std::numeric_limits<double>::quiet_NaN()),
      bad_lines_since_(std::numeric_limits<double>::quiet_NaN()) {}

std::vector<InputHealthEvent> InputHealth::Observe(const InputObservation& seen,
                                                   const InputHealthLimits& limits) {
  std::vector<InputHealthEvent> events;
  const double newest = seen.newest_sample_wall;
  if (stalled_ && newest > last_sample_wall_) {
    stalled_ = false;
    events.push_back({InputHealthEvent::Kind::kResumed});
  }
  if (!std::isnan(newest)) last_sample_wall_ = newest;
  if (!stalled_ && !std::isnan(last_sample_wall_) &&
      seen.wall_time - last_sample_wall_ > limits.stall_after) {
    stalled_ = true;
    InputHealthEvent stall{InputHealthEvent::Kind::kStalled};
    stall.quiet_seconds = seen.wall_time - last_sample_wall_;
    events.push_back(stall);
  }
  if (!std::isnan(bad_lines_since_) && seen.wall_time > bad_lines_since_) {
    const std::uint64_t fresh = seen.bad_lines - bad_lines_seen_;
    const double per_minute =
        static_cast<double>(fresh) / (seen.wall_time - bad_lines_since_) * 60.0;
    const bool alarm = per_minute > limits.bad_lines_per_minute;
    if (alarm && !bad_lines_alarm_) {
      InputHealthEvent bad{InputHealthEvent::Kind::kBadLines};
      bad.bad_lines = fresh;
      bad.per_minute = per_minute;
      events.push_back(bad);
    }
    bad_lines_alarm_ = alarm;
  }
  bad_lines_seen_ = seen.bad_lines;
  bad_lines_since_ = seen.wall_time;
  return events;
}

void InputHealth::NoteCatchUp() { bad_lines_since_ = std::numeric_limits<double>::quiet_NaN(); }

void InputHealth::ShiftWallClock(double seconds) {
  last_sample_wall_ += seconds;
  bad_lines_since_ += seconds;
}

void InputHealth::Restore(bool stalled, double last_sample_wall, bool bad_lines_alarm) {
  stalled_ = stalled;
  last_sample_wall_ = last_sample_wall;
  bad_lines_alarm_ = bad_lines_alarm;
}

}  // namespace plateau
