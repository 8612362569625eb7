#include "daemon/monitoring/event_rows.h"

#include <limits>

#include "config/alert_routing.h"
#include "daemon/presentation/number_format.h"

namespace plateau {

EventRow NewEventRow(EventKind kind, const std::string& statistic, std::string message,
                     double simulated_time, double wall_time, const EventSetting& setting) {
  constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
  EventRow e;
  e.kind = kind;
  e.statistic = statistic;
  e.message = std::move(message);
  e.simulated_time = simulated_time;
  e.wall_time = wall_time;
  e.value = e.half_width = e.confidence = kNaN;
  e.progress_rate = setting.progress_rate;
  e.elapsed_wall = wall_time - setting.first_sample_wall;
  for (const AlertChannelKind channel : RecordedChannelsFor(kind, setting.alerts)) {
    e.channels.emplace_back(AlertChannelKindName(channel));
  }
  return e;
}

EventRow StatisticEventRow(const ConvergenceEvent& event, const StatisticEstimate& estimate,
                           const std::optional<Target>& target, const EventSetting& setting) {
  EventRow row = NewEventRow(event.kind, event.statistic, event.message, event.simulated_time,
                             event.wall_time, setting);
  row.value = estimate.value;
  row.half_width = estimate.half_width;
  row.confidence = estimate.confidence;
  if (target) row.target = FormatTarget(target->kind, target->value);
  return row;
}

}  // namespace plateau
