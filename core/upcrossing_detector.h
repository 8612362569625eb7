// Up-crossings of an oscillating signal through a level, with hysteresis (a Schmitt trigger): a
// crossing counts only once the signal has been below level - band since the last one and then
// reaches level + band, so that noise riding on a crossing cannot count it twice. The crossing's
// time is interpolated linearly where the signal last passed the level upwards before reaching
// level + band. Pure numerics; not thread-safe (one owner feeds it).
#ifndef PLATEAU_CORE_UPCROSSING_DETECTOR_H_
#define PLATEAU_CORE_UPCROSSING_DETECTOR_H_

#include <limits>
#include <optional>

namespace plateau {

class UpcrossingDetector {
 public:
  // Feeds the next sample; returns the time of an up-crossing when this sample confirms one.
  // `level` and `band` (>= 0) may change from sample to sample (a running mean and a share of the
  // running standard deviation).
  std::optional<double> Add(double time, double value, double level, double band);

 private:
  static constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
  bool armed_ = false;            // has been below level - band since the last crossing
  double candidate_ = kNaN;       // the last upward pass of the level while armed
  double previous_time_ = kNaN;
  double previous_offset_ = kNaN;  // previous value - level
};

}  // namespace plateau

#endif  // PLATEAU_CORE_UPCROSSING_DETECTOR_H_
