// What a user asks for: a statistic of a kind over named columns, before the columns are known to
// exist. Plain data plus naming rules; pure, no I/O.
#ifndef PLATEAU_CORE_STATISTIC_REQUEST_H_
#define PLATEAU_CORE_STATISTIC_REQUEST_H_

#include <string>
#include <vector>

#include "core/statistic_kind.h"

namespace plateau {

struct StatisticRequest {
  StatisticKind kind = StatisticKind::kMean;
  std::vector<std::string> columns;
  std::string name;  // empty: DefaultStatisticName
  // Requests with the same non-empty key share one history of `shared_columns` (at most three;
  // the point of a probe line: u, v, w), kept to the highest order any of them needs.
  std::string shared_history;
  std::vector<std::string> shared_columns;
  // weighted_sum only: one weight per column.
  std::vector<double> weights;
};

// A request with a history of its own.
StatisticRequest MakeRequest(StatisticKind kind, std::vector<std::string> columns,
                             std::string name = "");

// The name a statistic shows when the user gave none: the column itself for a mean, otherwise
// kind(columns), e.g. var(u), rms(u), cov(u,v), m3(u,u,v), tke(u,v,w).
std::string DefaultStatisticName(StatisticKind kind, const std::vector<std::string>& columns);

}  // namespace plateau

#endif  // PLATEAU_CORE_STATISTIC_REQUEST_H_
