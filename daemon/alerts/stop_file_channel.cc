#include "daemon/alerts/stop_file_channel.h"

#include <fcntl.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>

namespace plateau {

void StopFileChannel::Deliver(const std::vector<EventRow>& events,
                              std::function<void(const Status&)> done) {
  const int fd = ::open(path_.c_str(), O_WRONLY | O_CREAT | O_TRUNC | O_CLOEXEC, 0644);
  if (fd < 0) {
    done(Status::Error("cannot create the stop file " + path_ + ": " + std::strerror(errno)));
    return;
  }
  const std::string text = events.front().message + "\n";
  const bool written = ::write(fd, text.data(), text.size()) == static_cast<ssize_t>(text.size());
  ::close(fd);
  done(written ? Status::Ok() : Status::Error("cannot write the stop file " + path_));
}

}  // namespace plateau
