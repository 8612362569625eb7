// The events a cycle records, with what alerts need beyond the message (the progress rate, how
// long the run has been followed, the value and target of a statistic's event) and the channels
// whose deliveries are created with them. Pure.
#ifndef PLATEAU_DAEMON_MONITORING_EVENT_ROWS_H_
#define PLATEAU_DAEMON_MONITORING_EVENT_ROWS_H_

#include <optional>
#include <string>

#include "config/run_config.h"
#include "core/convergence_tracker.h"
#include "store/run_store.h"

namespace plateau {

// What every event of a cycle shares.
struct EventSetting {
  const AlertsConfig& alerts;
  double progress_rate;      // simulated time per wall-clock hour; NaN unknown
  double first_sample_wall;  // when the run's first sample was read; NaN before
};

EventRow NewEventRow(EventKind kind, const std::string& statistic, std::string message,
                     double simulated_time, double wall_time, const EventSetting& setting);

// A stop rule's event (met, lost, drift) with the estimate and target it is about.
EventRow StatisticEventRow(const ConvergenceEvent& event, const StatisticEstimate& estimate,
                           const std::optional<Target>& target, const EventSetting& setting);

}  // namespace plateau

#endif  // PLATEAU_DAEMON_MONITORING_EVENT_ROWS_H_
