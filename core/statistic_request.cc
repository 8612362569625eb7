#include "core/statistic_request.h"

namespace plateau {

StatisticRequest MakeRequest(StatisticKind kind, std::vector<std::string> columns,
                             std::string name) {
  StatisticRequest r;
  r.kind = kind;
  r.columns = std::move(columns);
  r.name = std::move(name);
  return r;
}

std::string DefaultStatisticName(StatisticKind kind, const std::vector<std::string>& columns) {
  std::string joined;
  for (const std::string& c : columns) joined += (joined.empty() ? "" : ",") + c;
  switch (kind) {
    case StatisticKind::kMean:
      return joined;
    case StatisticKind::kVariance:
      return "var(" + joined + ")";
    case StatisticKind::kRms:
      return "rms(" + joined + ")";
    case StatisticKind::kCovariance:
      return "cov(" + joined + ")";
    case StatisticKind::kThirdMoment:
      return "m3(" + joined + ")";
    case StatisticKind::kTke:
      return "tke(" + joined + ")";
    case StatisticKind::kAverage:
      return "average(" + joined + ")";
    case StatisticKind::kWeightedSum:
      return "weighted_sum(" + joined + ")";
  }
  return joined;
}

}  // namespace plateau
