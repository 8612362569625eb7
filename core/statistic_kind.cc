#include "core/statistic_kind.h"

#include "core/name_table.h"

namespace plateau {
namespace {

constexpr NameTable<StatisticKind, 8> kNames{{
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

std::string_view KindName(StatisticKind kind) { return NameIn(kNames, kind); }

std::optional<StatisticKind> ParseKind(std::string_view name) {
  // plateau forms weighted sums itself (reference differences): not a kind to ask for.
  const std::optional<StatisticKind> kind = ValueIn(kNames, name);
  return kind == StatisticKind::kWeightedSum ? std::nullopt : kind;
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
