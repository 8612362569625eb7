#include "core/statistic_kind.h"

#include <array>
#include <utility>

namespace plateau {
namespace {

constexpr std::array<std::pair<StatisticKind, std::string_view>, 8> kNames{{
    {StatisticKind::kMean, "mean"},
    {StatisticKind::kVariance, "variance"},
    {StatisticKind::kRms, "rms"},
    {StatisticKind::kCovariance, "covariance"},
    {StatisticKind::kThirdMoment, "third_moment"},
    {StatisticKind::kTke, "tke"},
    {StatisticKind::kAverage, "average"},
    {StatisticKind::kWeightedSum, "weighted_sum"},
}};

}  // namespace

std::string_view KindName(StatisticKind kind) {
  for (const auto& [k, name] : kNames) {
    if (k == kind) return name;
  }
  return "unknown";
}

std::optional<StatisticKind> ParseKind(std::string_view name) {
  for (const auto& [k, n] : kNames) {
    if (n == name && k != StatisticKind::kWeightedSum) return k;
  }
  return std::nullopt;
}

int KindColumnCount(StatisticKind kind) {
  switch (kind) {
    case StatisticKind::kMean:
    case StatisticKind::kVariance:
    case StatisticKind::kRms:
      return 1;
    case StatisticKind::kCovariance:
    case StatisticKind::kAverage:
      return 2;
    case StatisticKind::kThirdMoment:
    case StatisticKind::kTke:
    case StatisticKind::kWeightedSum:
      return 3;
  }
  return 1;
}

}  // namespace plateau
