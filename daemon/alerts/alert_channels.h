// The channels the config sets up, made by kind.
#ifndef PLATEAU_DAEMON_ALERTS_ALERT_CHANNELS_H_
#define PLATEAU_DAEMON_ALERTS_ALERT_CHANNELS_H_

#include <utility>  // before Asio: Boost 1.74's Asio in C++20 mode needs it

#include <boost/asio.hpp>
#include <spdlog/spdlog.h>

#include <memory>

#include "config/run_config.h"
#include "daemon/alerts/alert_channel.h"

namespace plateau {

// The channel of `kind` as `config` sets it up; nullptr when the config has none (a reload may
// have removed it while a delivery was pending). The channel reads `config` while it delivers.
std::unique_ptr<AlertChannel> MakeAlertChannel(AlertChannelKind kind, boost::asio::io_context& io,
                                               const RunConfig& config,
                                               std::shared_ptr<spdlog::logger> log);

}  // namespace plateau

#endif  // PLATEAU_DAEMON_ALERTS_ALERT_CHANNELS_H_
