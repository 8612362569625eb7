// A run's configuration as plain structs: what to read, what to estimate, when to stop. Built by
// LoadRunConfig from YAML; no YAML node outlives loading. Plain data; copied freely between threads.
#ifndef PLATEAU_CONFIG_RUN_CONFIG_H_
#define PLATEAU_CONFIG_RUN_CONFIG_H_

#include <optional>
#include <string>
#include <vector>

#include "core/convergence_tracker.h"
#include "core/evaluation_options.h"
#include "core/event_kind.h"
#include "core/run_verdict.h"
#include "core/source_statistics.h"
#include "core/statistic_request.h"

namespace plateau {

struct SourceConfig {
  std::string name;
  std::string files;        // glob, absolute (resolved against the config file's folder)
  std::string time_column;  // name or 1-based number; empty: the first column
  std::vector<std::string> columns;  // names to use instead of the files' header; empty: header
  // Factors applied to columns before any statistic (a sign convention, a density).
  std::vector<SourceStatistics::ColumnScale> scales;
  // Each sample counts once, or for the simulated time it stands for (SampleSpacing).
  Weighting weighting = Weighting::kAuto;
};

struct StatisticConfig {
  StatisticRequest request;  // kind, columns; request.name is always set after loading
  std::string source;
  std::optional<Target> target;
  double minimum_time = 0.0;
  std::optional<double> reference;
  // A reference that is another statistic times a factor: a wall shear stress against
  // -delta <dP/dx> when the solver holds the flow rate and writes the gradient as a series.
  std::string reference_statistic;
  double reference_factor = 1.0;
  // The weighted_sum statistic plateau adds for value - factor * reference, averaged sample by
  // sample (both means or averages of one source, at most three columns in all); empty when the
  // two are compared as if independent.
  std::string reference_difference;
  // For the statistics a profile expands into: its name, the point, its wall distance and the
  // quantity (U, uu, uv, k, uuv, ...). Empty profile for an ordinary statistic.
  std::string profile;
  int point = -1;
  double position = 0.0;
  std::string quantity;
};

// Wall units: y+ = y u_tau / nu and quantities over powers of u_tau, with u_tau either known or
// the friction velocity sqrt(tau_w / rho) of a wall shear statistic (with its uncertainty).
struct WallUnitsConfig {
  double viscosity = 0.0;        // kinematic, m^2/s
  double density = 0.0;          // kg/m^3; needed with wall_shear
  std::string wall_shear;        // a statistic's name, or empty
  double friction_velocity = 0.0;  // known u_tau, or NaN
  double half_height = 0.0;      // channel half-height delta for Re_tau and the momentum balance;
                                 // NaN when not given
};

// A line of probe points whose columns follow a pattern: "u{i}" names point i's u column.
struct ProfileConfig {
  std::string name;
  std::string source;
  std::vector<double> positions;  // wall distance of each point (|coordinate - wall_at|)
  std::vector<std::string> quantities;
  std::vector<std::pair<std::string, std::string>> references;  // quantity -> file (absolute)
  bool momentum_balance = false;
};

// SMTP delivery. The password is never in the config: it is read from a file or an environment
// variable named here, and never logged.
struct EmailConfig {
  std::string host;
  int port = 25;
  std::string from;
  std::vector<std::string> to;
  bool starttls = false;
  std::string username;       // AUTH only when set
  std::string password_file;  // absolute
  std::string password_env;
  std::string ca_file;    // PEM certificates to trust for STARTTLS (default: the system's)
  double timeout = 30.0;  // seconds per conversation
};

// A program run for each alert, without a shell; the event's fields come as PLATEAU_* variables.
struct CommandConfig {
  std::vector<std::string> argv;
  double timeout = 60.0;  // seconds, then SIGKILL
};

struct AlertsConfig {
  // Event kinds that alert: met, lost, run_met, run_lost, drift, stalled, resumed, bad_lines.
  std::vector<EventKind> events{EventKind::kMet,     EventKind::kLost,    EventKind::kRunMet,
                                EventKind::kRunLost, EventKind::kDrift,   EventKind::kStalled,
                                EventKind::kBadLines};
  double stall_after = 1800.0;         // seconds without a new sample before "stalled"
  double bad_lines_per_minute = 60.0;  // above this rate over an evaluation interval: "bad_lines"
  int max_attempts = 8;                // per delivery, with doubling back-off from 10 s
  std::optional<EmailConfig> email;
  std::optional<CommandConfig> command;
  std::string stop_file;  // absolute; created when every target is met; empty: none
  bool syslog = false;
};

struct RunConfig {
  std::string config_path;  // absolute
  std::string run_folder;   // the config file's folder: logs go here
  std::string run_name;
  std::string store_path;   // absolute
  double evaluate_every = 60.0;  // seconds of wall-clock time
  double poll_every = 10.0;      // seconds
  EvaluationOptions evaluation;  // its confidence is the default target confidence
  StopRuleSettings stop_rule;    // minimum_time is per statistic
  std::size_t blocks = 4096;
  std::vector<SourceConfig> sources;
  std::vector<StatisticConfig> statistics;
  std::vector<StatisticGroup> groups;
  std::optional<WallUnitsConfig> wall_units;
  std::vector<ProfileConfig> profiles;  // their statistics are in `statistics` too
  AlertsConfig alerts;
  double planned_end_time = 0.0;  // simulated time the run was planned to reach; NaN: not given
  double cores = 0.0;             // cores the solver job holds; NaN: not given
  // Simulated time of one flow-through (domain length over bulk velocity); NaN: not given.
  double flow_through_time = 0.0;
  std::string socket_path;        // the query socket, absolute (default beside the store)
  std::string metrics_listen;     // "HOST:PORT" of the metrics endpoint; empty: none
};

// One problem found in a config file, as "run.yaml:12:5: what is wrong, what was expected".
struct ConfigError {
  std::string file;
  int line = 0;    // 1-based; 0 when the problem has no place (the file cannot be read)
  int column = 0;  // 1-based
  std::string message;
  std::string ToString() const;
};

}  // namespace plateau

#endif  // PLATEAU_CONFIG_RUN_CONFIG_H_
