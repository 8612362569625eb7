// Admits only samples whose time is after the last admitted one: a restarted solver rewrites a stretch
// of time already recorded, and those samples must not be counted twice. Pure; no I/O.
// Not thread-safe: one gate per source.
#ifndef PLATEAU_CORE_TIME_ORDER_GATE_H_
#define PLATEAU_CORE_TIME_ORDER_GATE_H_

#include <cstdint>
#include <limits>

namespace plateau {

class TimeOrderGate {
 public:
  // A stretch of rejected samples, for one log line "skipped times A .. B (N samples)".
  struct Overlap {
    double first_time = 0.0;
    double last_time = 0.0;
    std::uint64_t samples = 0;
  };

  // True when `time` is after the last admitted time (the first sample is always admitted).
  bool Admit(double time);

  double last_time() const { return last_time_; }
  std::uint64_t skipped() const { return skipped_; }
  // The current run of rejected samples; its count is 0 when the last sample was admitted.
  const Overlap& current_overlap() const { return overlap_; }
  // Takes the finished overlap run (samples > 0) once admission resumed; empty otherwise.
  Overlap TakeFinishedOverlap();

  // Restores the gate after a restart.
  void Resume(double last_time, std::uint64_t skipped);

 private:
  double last_time_ = -std::numeric_limits<double>::infinity();
  std::uint64_t skipped_ = 0;
  Overlap overlap_;
  Overlap finished_;
};

}  // namespace plateau

#endif  // PLATEAU_CORE_TIME_ORDER_GATE_H_
