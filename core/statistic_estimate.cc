#include "core/statistic_estimate.h"

namespace plateau {

std::string_view EstimateStateName(EstimateState state) {
  switch (state) {
    case EstimateState::kNoData:
      return "no_data";
    case EstimateState::kNotEnoughData:
      return "not_enough_data";
    case EstimateState::kEstimated:
      return "estimated";
  }
  return "unknown";
}

}  // namespace plateau
