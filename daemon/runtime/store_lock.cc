#include "daemon/runtime/store_lock.h"

#include <fcntl.h>
#include <sys/file.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>
#include <string>

namespace plateau {
namespace {

std::string LockPath(const std::string& store_path) { return store_path + ".lock"; }

long ReadPid(int fd) {
  char buffer[32] = {};
  const ssize_t n = ::pread(fd, buffer, sizeof buffer - 1, 0);
  return n > 0 ? std::strtol(buffer, nullptr, 10) : 0;
}

}  // namespace

Result<std::unique_ptr<StoreLock>> StoreLock::Acquire(const std::string& store_path) {
  const std::string path = LockPath(store_path);
  const int fd = ::open(path.c_str(), O_RDWR | O_CREAT | O_CLOEXEC, 0644);
  if (fd < 0) {
    return Status::Error("cannot create the lock file " + path + ": " + std::strerror(errno));
  }
  if (::flock(fd, LOCK_EX | LOCK_NB) != 0) {
    const long pid = ReadPid(fd);
    ::close(fd);
    return Status::Error("the store " + store_path + " is in use by another plateau watch" +
                         (pid > 0 ? " (process " + std::to_string(pid) + ")" : "") +
                         "; stop it first, or give this run its own store");
  }
  const std::string pid = std::to_string(::getpid()) + "\n";
  if (::ftruncate(fd, 0) != 0 || ::pwrite(fd, pid.data(), pid.size(), 0) < 0) {
    // The lock itself is what counts; a pid that could not be written only makes messages vaguer.
  }
  return std::unique_ptr<StoreLock>(new StoreLock(fd));
}

StoreLock::~StoreLock() { ::close(fd_); }

long StoreLock::HolderPid(const std::string& store_path) {
  const int fd = ::open(LockPath(store_path).c_str(), O_RDONLY | O_CLOEXEC);
  if (fd < 0) return 0;
  long pid = 0;
  if (::flock(fd, LOCK_SH | LOCK_NB) != 0) {
    pid = ReadPid(fd);
    if (pid == 0) pid = -1;  // held, pid unknown
  }
  ::close(fd);
  return pid;
}

}  // namespace plateau
