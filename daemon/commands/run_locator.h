// Finds the store that `status` and `check` read: from a config file, a store file, a folder, or
// the current folder. Reads only; stateless.
#ifndef PLATEAU_DAEMON_COMMANDS_RUN_LOCATOR_H_
#define PLATEAU_DAEMON_COMMANDS_RUN_LOCATOR_H_

#include <string>

namespace plateau {

struct LocatedRun {
  std::string store_path;   // empty when not found
  std::string socket_path;  // the daemon's query socket (the config's, or beside the store)
  std::string error;        // why not, for "cannot tell"
};

// `argument` may be a config (.yaml, .yml: its store), a store file, a folder (its plateau.db, or
// the store of its only config), or empty for the current folder.
LocatedRun LocateRun(const std::string& argument);

}  // namespace plateau

#endif  // PLATEAU_DAEMON_COMMANDS_RUN_LOCATOR_H_
