#include "daemon/ingest/probe_file_reader.h"

#include <fcntl.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>
#include <vector>

namespace plateau {
namespace {

constexpr std::size_t kChunkBytes = 1 << 20;

std::string SystemError(const std::string& what, const std::string& path) {
  return what + " " + path + ": " + std::strerror(errno);
}

}  // namespace

Result<std::uint64_t> ReadProbeFile(const std::string& path, std::uint64_t offset,
                                    RowParser& parser, RowSink& sink,
                                    const std::function<bool()>& keep_going) {
  const int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC);
  if (fd < 0) return Status::Error(SystemError("cannot open", path));
  std::uint64_t bytes = 0;
  Status status;
  std::vector<char> buffer(kChunkBytes);
  off_t position = static_cast<off_t>(offset);
  while (true) {
    const ssize_t n = ::pread(fd, buffer.data(), buffer.size(), position);
    if (n < 0) {
      if (errno == EINTR) continue;
      status = Status::Error(SystemError("cannot read", path));
      break;
    }
    if (n == 0) break;
    parser.Feed(std::string_view(buffer.data(), static_cast<std::size_t>(n)), sink);
    position += n;
    bytes += static_cast<std::uint64_t>(n);
    if (keep_going && !keep_going()) break;
  }
  ::close(fd);
  if (!status.ok()) return status;
  return bytes;
}

}  // namespace plateau
