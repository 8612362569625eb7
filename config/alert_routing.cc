#include "config/alert_routing.h"

#include <algorithm>

#include "core/name_table.h"

namespace plateau {
namespace {

constexpr NameTable<AlertChannelKind, 4> kNames{{
    {AlertChannelKind::kEmail, "email"},
    {AlertChannelKind::kCommand, "command"},
    {AlertChannelKind::kStopFile, "stop_file"},
    {AlertChannelKind::kLog, "log"},
}};

}  // namespace

std::string_view AlertChannelKindName(AlertChannelKind channel) {
  return NameIn(kNames, channel);
}

std::optional<AlertChannelKind> AlertChannelKindFromName(std::string_view name) {
  return ValueIn(kNames, name);
}

std::vector<AlertChannelKind> RecordedChannelsFor(EventKind kind, const AlertsConfig& alerts) {
  std::vector<AlertChannelKind> channels;
  if (std::find(alerts.events.begin(), alerts.events.end(), kind) != alerts.events.end()) {
    if (alerts.email) channels.push_back(AlertChannelKind::kEmail);
    if (alerts.command) channels.push_back(AlertChannelKind::kCommand);
  }
  if (kind == EventKind::kRunMet && !alerts.stop_file.empty()) {
    channels.push_back(AlertChannelKind::kStopFile);
  }
  return channels;
}

}  // namespace plateau
