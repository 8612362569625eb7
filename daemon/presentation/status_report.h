// The status of a run as people and scripts read it: a table, a JSON document, and the stop or
// continue answer, from one LatestView whether it came from the store or from the daemon over the
// query socket. Formatting and judgement only; stateless.
#ifndef PLATEAU_DAEMON_PRESENTATION_STATUS_REPORT_H_
#define PLATEAU_DAEMON_PRESENTATION_STATUS_REPORT_H_

#include <optional>
#include <string>

#include "daemon/presentation/json_document.h"
#include "store/run_store.h"

namespace plateau {

struct StatusContext {
  std::string store_path;
  long daemon_pid = 0;    // >0 running with this pid, <0 running (pid unknown), 0 not running
  std::string answered_by;  // "daemon" (the query socket) or "store"
  double now = 0.0;       // wall-clock seconds
};

std::string StatusTable(const LatestView& view, const StatusContext& context);
// One line of JSON (no newline).
std::string StatusJson(const LatestView& view, const StatusContext& context);
// Reads a StatusJson document back; nullopt when it is not one.
std::optional<LatestView> LatestViewFromJson(const JsonDocument& document, StatusContext* context);

struct CheckAnswer {
  int exit_code = 2;  // 0 stop, 1 continue, 2 cannot tell
  std::string message;  // "stop: every target is met (5 of 5) (cycle 57, evaluated 12 s ago)"
};
// `statistic` empty: the whole run.
CheckAnswer Check(const LatestView& view, const StatusContext& context,
                  const std::string& statistic);

}  // namespace plateau

#endif  // PLATEAU_DAEMON_PRESENTATION_STATUS_REPORT_H_
