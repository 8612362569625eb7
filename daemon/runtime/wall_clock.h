// The wall clock the daemon stamps cycles and events with, apart from the loop that reads it, so
// that alerts, the servers and the commands can read it without knowing the loop.
#ifndef PLATEAU_DAEMON_RUNTIME_WALL_CLOCK_H_
#define PLATEAU_DAEMON_RUNTIME_WALL_CLOCK_H_

namespace plateau {

// Seconds since the epoch, the wall-clock time stamped on cycles and events.
double WallSeconds();

}  // namespace plateau

#endif  // PLATEAU_DAEMON_RUNTIME_WALL_CLOCK_H_
