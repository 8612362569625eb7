#include "daemon/alerts/alert_channels.h"

#include "daemon/alerts/command_channel.h"
#include "daemon/alerts/email_channel.h"
#include "daemon/alerts/log_channel.h"
#include "daemon/alerts/stop_file_channel.h"

namespace plateau {

std::unique_ptr<AlertChannel> MakeAlertChannel(AlertChannelKind kind, boost::asio::io_context& io,
                                               const RunConfig& config,
                                               std::shared_ptr<spdlog::logger> log) {
  switch (kind) {
    case AlertChannelKind::kEmail:
      if (!config.alerts.email) return nullptr;
      return std::make_unique<EmailChannel>(io, config);
    case AlertChannelKind::kCommand:
      if (!config.alerts.command) return nullptr;
      return std::make_unique<CommandChannel>(io, config, std::move(log));
    case AlertChannelKind::kStopFile:
      if (config.alerts.stop_file.empty()) return nullptr;
      return std::make_unique<StopFileChannel>(config.alerts.stop_file);
    case AlertChannelKind::kLog:
      return std::make_unique<LogChannel>(std::move(log));
  }
  return nullptr;
}

}  // namespace plateau
