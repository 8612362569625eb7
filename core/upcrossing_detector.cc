#include "core/upcrossing_detector.h"

#include <cmath>

namespace plateau {

std::optional<double> UpcrossingDetector::Add(double time, double value, double level,
                                              double band) {
  const double offset = value - level;
  std::optional<double> crossing;
  if (offset < -band) {
    armed_ = true;
    candidate_ = kNaN;
  } else if (armed_) {
    if (previous_offset_ < 0.0 && offset >= 0.0) {
      // Linear interpolation between the two samples that straddle the level.
      const double share = -previous_offset_ / (offset - previous_offset_);
      candidate_ = previous_time_ + share * (time - previous_time_);
    }
    if (offset >= band && !std::isnan(candidate_)) {
      crossing = candidate_;
      armed_ = false;
      candidate_ = kNaN;
    }
  }
  previous_time_ = time;
  previous_offset_ = offset;
  return crossing;
}

}  // namespace plateau
