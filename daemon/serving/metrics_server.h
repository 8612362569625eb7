// The optional metrics endpoint: HTTP (Boost.Beast) serving GET /metrics in the Prometheus text
// exposition format (version 0.0.4), so that a group running hundreds of jobs watches them all
// with one scraper: per statistic its value, half-width, relative half-width, tau, n_eff and met;
// per source samples, bad lines and seconds since the last sample. Binds where the config says
// (127.0.0.1 unless told otherwise). Single-threaded: runs on the daemon's loop.
#ifndef PLATEAU_DAEMON_SERVING_METRICS_SERVER_H_
#define PLATEAU_DAEMON_SERVING_METRICS_SERVER_H_

#include <utility>  // before Asio: Boost 1.74's Asio in C++20 mode needs it

#include <boost/asio.hpp>
#include <spdlog/spdlog.h>

#include <memory>
#include <string>

#include "core/status.h"
#include "daemon/serving/connection_count.h"
#include "daemon/monitoring/run_monitor.h"

namespace plateau {

class MetricsServer {
 public:
  static constexpr int kMaxConnections = 16;

  MetricsServer(boost::asio::io_context& io, RunMonitor& monitor,
                std::shared_ptr<spdlog::logger> log);

  // Listens on "HOST:PORT"; an error says what and where.
  Status Start(const std::string& listen);
  // The port actually bound (for a configured port 0).
  unsigned short port() const;
  // Connections open now, counting those past the limit that are being turned away.
  int connections() const { return connections_.open(); }

  // The exposition text of the monitor's last cycle, at wall-clock time `now`.
  static std::string Exposition(const RunMonitor& monitor, double now);

 private:
  void Accept();

  boost::asio::io_context& io_;
  RunMonitor& monitor_;
  std::shared_ptr<spdlog::logger> log_;
  boost::asio::ip::tcp::acceptor acceptor_;
  ConnectionCount connections_;
};

}  // namespace plateau

#endif  // PLATEAU_DAEMON_SERVING_METRICS_SERVER_H_
