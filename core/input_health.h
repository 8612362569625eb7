// Whether the solver still feeds the run: a stall (no new sample for longer than a limit), its end,
// and a rate of bad lines above a limit (something else writing into the probe files). Decisions
// only: the caller words the events. Pure (the caller passes wall-clock times); not thread-safe:
// one owner.
#ifndef PLATEAU_CORE_INPUT_HEALTH_H_
#define PLATEAU_CORE_INPUT_HEALTH_H_

#include <cstdint>
#include <vector>

namespace plateau {

struct InputHealthLimits {
  double stall_after = 1800.0;         // wall-clock seconds without a new sample
  double bad_lines_per_minute = 60.0;  // over one interval between observations
};

// What the reader saw by one evaluation.
struct InputObservation {
  double wall_time = 0.0;
  double newest_sample_wall = 0.0;  // when the newest sample was read; NaN before any
  std::uint64_t bad_lines = 0;      // counted since the run started
};

struct InputHealthEvent {
  enum class Kind { kStalled, kResumed, kBadLines };
  Kind kind;
  double quiet_seconds = 0.0;  // kStalled: since the newest sample was read
  std::uint64_t bad_lines = 0;  // kBadLines: since the previous observation
  double per_minute = 0.0;      // kBadLines: their rate
};

class InputHealth {
 public:
  InputHealth();
  // Events in this order: resumed, stalled, bad lines. A stall is reported once until samples
  // arrive again; a bad-line rate once until it falls below the limit.
  std::vector<InputHealthEvent> Observe(const InputObservation& seen, const InputHealthLimits& limits);
  // What follows a backlog says nothing about the bad-line rate: the next observation only sets a
  // baseline.
  void NoteCatchUp();
  // The system clock jumped: wall times held for measuring durations move with it.
  void ShiftWallClock(double seconds);

  bool stalled() const { return stalled_; }
  bool bad_lines_alarm() const { return bad_lines_alarm_; }
  double last_sample_wall() const { return last_sample_wall_; }
  // From a checkpoint (the bad-line baseline starts again).
  void Restore(bool stalled, double last_sample_wall, bool bad_lines_alarm);

 private:
  bool stalled_ = false;
  double last_sample_wall_;  // NaN before the first sample
  std::uint64_t bad_lines_seen_ = 0;
  double bad_lines_since_;  // wall time of bad_lines_seen_; NaN: no baseline yet
  bool bad_lines_alarm_ = false;
};

}  // namespace plateau

#endif  // PLATEAU_CORE_INPUT_HEALTH_H_
