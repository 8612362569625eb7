// How fast the solver advances: simulated time per wall-clock hour over the newest evaluations of a
// run being followed live. Reading a backlog says nothing about the solver's speed, so a catch-up
// restarts the window. Pure; the caller passes the clock. Not thread-safe: one owner.
#ifndef PLATEAU_CORE_PROGRESS_RATE_H_
#define PLATEAU_CORE_PROGRESS_RATE_H_

#include <cstddef>
#include <deque>
#include <utility>

namespace plateau {

// Wall-clock seconds that `simulated` time takes at `per_hour` simulated time per hour; NaN when
// the rate is unknown or not positive.
double WallSecondsAt(double simulated, double per_hour);

class ProgressRate {
 public:
  static constexpr std::size_t kWindow = 30;  // evaluations

  // One evaluation: its wall-clock time (seconds) and the newest simulated time. Points with a NaN
  // time or a wall time not after the previous one are ignored.
  void Add(double wall_seconds, double simulated_time);
  // Forget the window (after a catch-up).
  void Restart() { points_.clear(); }
  // The wall clock jumped by `seconds`: the window's wall times move with it.
  void Shift(double seconds);
  // Simulated time per wall-clock hour; NaN with fewer than two points or under a second apart.
  double PerHour() const;

 private:
  std::deque<std::pair<double, double>> points_;
};

}  // namespace plateau

#endif  // PLATEAU_CORE_PROGRESS_RATE_H_
