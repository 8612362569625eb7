// The query socket: a Unix domain socket (mode 0600: the run's owner only) on which the daemon
// answers line-delimited JSON requests (see QueryRequest) from its memory: the last evaluation and
// what it has read since. Requests are bounded in size and connections in number; anything wrong
// gets a JSON error object, never a dropped daemon. Single-threaded: runs on the daemon's loop.
#ifndef PLATEAU_DAEMON_SERVING_QUERY_SERVER_H_
#define PLATEAU_DAEMON_SERVING_QUERY_SERVER_H_

#include <utility>  // before Asio: Boost 1.74's Asio in C++20 mode needs it

#include <boost/asio.hpp>
#include <spdlog/spdlog.h>

#include <functional>
#include <memory>
#include <string>

#include "core/status.h"
#include "daemon/serving/connection_count.h"
#include "daemon/monitoring/run_monitor.h"

namespace plateau {

class QueryServer {
 public:
  static constexpr std::size_t kMaxRequestBytes = 64 << 10;
  static constexpr int kMaxConnections = 16;

  // `reload` performs a config reload and returns what it did.
  QueryServer(boost::asio::io_context& io, RunMonitor& monitor,
              std::function<std::string()> reload, std::shared_ptr<spdlog::logger> log);
  ~QueryServer();

  // Listens at `path`, replacing a stale socket file that no daemon answers on.
  Status Start(const std::string& path);

  // The reply (one JSON line, no newline) to one request line.
  std::string Answer(std::string_view line);
  // Connections open now, counting those past the limit that are being turned away.
  int connections() const { return connections_.open(); }

 private:
  class Session;
  void Accept();

  boost::asio::io_context& io_;
  RunMonitor& monitor_;
  std::function<std::string()> reload_;
  std::shared_ptr<spdlog::logger> log_;
  boost::asio::local::stream_protocol::acceptor acceptor_;
  std::string path_;
  ConnectionCount connections_;
};

// The daemon's reply to `request` on the socket at `path`, within `timeout` seconds; nullopt when
// no daemon answers there (then the store is the fallback).
std::optional<std::string> AskDaemon(const std::string& path, const std::string& request,
                                     double timeout);

}  // namespace plateau

#endif  // PLATEAU_DAEMON_SERVING_QUERY_SERVER_H_
