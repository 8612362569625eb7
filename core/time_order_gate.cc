#include "core/time_order_gate.h"

namespace plateau {

bool TimeOrderGate::Admit(double time) {
  if (time > last_time_) {
    if (overlap_.samples > 0) {
      finished_ = overlap_;
      overlap_ = Overlap();
    }
    last_time_ = time;
    return true;
  }
  if (overlap_.samples == 0) overlap_.first_time = time;
  overlap_.last_time = time;
  ++overlap_.samples;
  ++skipped_;
  return false;
}

TimeOrderGate::Overlap TimeOrderGate::TakeFinishedOverlap() {
  Overlap taken = finished_;
  finished_ = Overlap();
  return taken;
}

void TimeOrderGate::Resume(double last_time, std::uint64_t skipped) {
  last_time_ = last_time;
  skipped_ = skipped;
  overlap_ = Overlap();
  finished_ = Overlap();
}

}  // namespace plateau
