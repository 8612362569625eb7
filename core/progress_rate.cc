#include "core/progress_rate.h"

#include <cmath>
#include <limits>

namespace plateau {

double WallSecondsAt(double simulated, double per_hour) {
  return per_hour > 0.0 ? simulated / per_hour * 3600.0 : std::numeric_limits<double>::quiet_NaN();
}

void ProgressRate::Add(double wall_seconds, double simulated_time) {
  if (std::isnan(wall_seconds) || std::isnan(simulated_time)) return;
  if (!points_.empty() && wall_seconds <= points_.back().first) return;
  points_.emplace_back(wall_seconds, simulated_time);
  if (points_.size() > kWindow) points_.pop_front();
}

void ProgressRate::Shift(double seconds) {
  for (auto& point : points_) point.first += seconds;
}

double ProgressRate::PerHour() const {
  if (points_.size() < 2) return std::numeric_limits<double>::quiet_NaN();
  const double wall = points_.back().first - points_.front().first;
  if (wall < 1.0) return std::numeric_limits<double>::quiet_NaN();
  return (points_.back().second - points_.front().second) / wall * 3600.0;
}

}  // namespace plateau
