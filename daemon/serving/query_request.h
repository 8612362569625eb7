// One request of the query socket's line protocol, parsed and checked: {"request": "status"},
// {"request": "check", "stat": NAME}, {"request": "events", "after": ID}, {"request": "reload"}.
// Pure: text in, request or error out. Stateless.
#ifndef PLATEAU_DAEMON_SERVING_QUERY_REQUEST_H_
#define PLATEAU_DAEMON_SERVING_QUERY_REQUEST_H_

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>

#include "core/result.h"

namespace plateau {

struct QueryRequest {
  enum class Kind { kStatus, kCheck, kEvents, kReload };
  Kind kind = Kind::kStatus;
  std::string statistic;     // check: one statistic, or empty for the run
  std::int64_t after = 0;    // events: ids above this
};

// An error ("not JSON: at byte 3: expected ':'", "unknown request 'stats'; expected
// status, check, events or reload", ...) for anything that is not a valid request.
Result<QueryRequest> ParseQueryRequest(std::string_view line);

}  // namespace plateau

#endif  // PLATEAU_DAEMON_SERVING_QUERY_REQUEST_H_
