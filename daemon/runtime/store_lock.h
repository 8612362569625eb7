// Exclusive ownership of a run's store by one daemon: an flock(2) on "<store>.lock", which holds the
// owner's pid. The kernel drops the lock when the process dies, even by SIGKILL, so a stale lock
// file never blocks a restart. Not thread-safe; one per daemon.
#ifndef PLATEAU_DAEMON_RUNTIME_STORE_LOCK_H_
#define PLATEAU_DAEMON_RUNTIME_STORE_LOCK_H_

#include <memory>
#include <string>

#include "core/result.h"

namespace plateau {

class StoreLock {
 public:
  // Takes the lock, or an error saying which process holds it.
  static Result<std::unique_ptr<StoreLock>> Acquire(const std::string& store_path);
  ~StoreLock();
  StoreLock(const StoreLock&) = delete;
  StoreLock& operator=(const StoreLock&) = delete;

  // The pid of the daemon holding the store's lock, or 0 when none does (for status).
  static long HolderPid(const std::string& store_path);

 private:
  explicit StoreLock(int fd) : fd_(fd) {}
  int fd_;
};

}  // namespace plateau

#endif  // PLATEAU_DAEMON_RUNTIME_STORE_LOCK_H_
