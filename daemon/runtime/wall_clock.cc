#include "daemon/runtime/wall_clock.h"

#include <chrono>

namespace plateau {

double WallSeconds() {
  return std::chrono::duration<double>(std::chrono::system_clock::now().time_since_epoch())
      .count();
}

}  // namespace plateau
