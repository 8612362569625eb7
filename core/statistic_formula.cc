#include "core/statistic_formula.h"

#include <algorithm>
#include <cmath>
#include <limits>

namespace plateau {

std::optional<StatisticFormula> StatisticFormula::Make(StatisticKind kind, std::vector<int> columns,
                                                       std::string* error,
                                                       const std::vector<int>* history_signals,
                                                       std::vector<double> weights) {
  const int expected = KindColumnCount(kind);
  if (kind == StatisticKind::kWeightedSum) {
    if (columns.empty() || static_cast<int>(columns.size()) > expected ||
        weights.size() != columns.size()) {
      *error = "weighted_sum takes one to three columns and one weight per column";
      return std::nullopt;
    }
  } else if (static_cast<int>(columns.size()) != expected) {
    *error = std::string(KindName(kind)) + " takes " + std::to_string(expected) + " column" +
             (expected == 1 ? "" : "s") + ", got " + std::to_string(columns.size());
    return std::nullopt;
  }
  std::vector<int> signals;
  if (history_signals != nullptr) {
    signals = *history_signals;
    for (int column : columns) {
      if (std::find(signals.begin(), signals.end(), column) == signals.end()) {
        *error = "a column of the statistic is not in its shared history";
        return std::nullopt;
      }
    }
  } else {
    for (int column : columns) {
      if (std::find(signals.begin(), signals.end(), column) == signals.end()) {
        signals.push_back(column);
      }
    }
  }
  return StatisticFormula(kind, std::move(columns), std::move(signals), std::move(weights));
}

StatisticFormula::StatisticFormula(StatisticKind kind, std::vector<int> columns,
                                   std::vector<int> signals, std::vector<double> weights)
    : kind_(kind),
      columns_(std::move(columns)),
      signals_(std::move(signals)),
      weights_(std::move(weights)) {
  for (int column : columns_) {
    const auto it = std::find(signals_.begin(), signals_.end(), column);
    signal_of_column_.push_back(static_cast<int>(it - signals_.begin()));
  }
  switch (kind_) {
    case StatisticKind::kMean:
    case StatisticKind::kAverage:
    case StatisticKind::kWeightedSum:
      order_ = 1;
      break;
    case StatisticKind::kThirdMoment:
      order_ = 3;
      break;
    default:
      order_ = 2;
  }
}

std::vector<int> StatisticFormula::used_signals() const {
  std::vector<int> used;
  for (int s : signal_of_column_) {
    if (std::find(used.begin(), used.end(), s) == used.end()) used.push_back(s);
  }
  return used;
}

Powers StatisticFormula::ProductOf(std::initializer_list<int> which) const {
  Powers alpha{0, 0, 0};
  for (int k : which) ++alpha[signal_of_column_[k]];
  return alpha;
}

double StatisticFormula::Value(const MomentLayout& layout, const double* summary) const {
  if (layout.Count(summary) == 0.0) return std::numeric_limits<double>::quiet_NaN();
  switch (kind_) {
    case StatisticKind::kMean:
      return layout.Mean(summary, 0);
    case StatisticKind::kVariance:
      return layout.CentralMoment(summary, ProductOf({0, 0}));
    case StatisticKind::kRms:
      return std::sqrt(layout.CentralMoment(summary, ProductOf({0, 0})));
    case StatisticKind::kCovariance:
      return layout.CentralMoment(summary, ProductOf({0, 1}));
    case StatisticKind::kThirdMoment:
      return layout.CentralMoment(summary, ProductOf({0, 1, 2}));
    case StatisticKind::kTke:
      return 0.5 * (layout.CentralMoment(summary, ProductOf({0, 0})) +
                    layout.CentralMoment(summary, ProductOf({1, 1})) +
                    layout.CentralMoment(summary, ProductOf({2, 2})));
    case StatisticKind::kAverage:
      return 0.5 * (layout.Mean(summary, signal_of_column_[0]) +
                    layout.Mean(summary, signal_of_column_[1]));
    case StatisticKind::kWeightedSum: {
      double sum = 0.0;
      for (std::size_t k = 0; k < weights_.size(); ++k) {
        sum += weights_[k] * layout.Mean(summary, signal_of_column_[k]);
      }
      return sum;
    }
  }
  return std::numeric_limits<double>::quiet_NaN();
}

std::vector<WeightedMoment> StatisticFormula::Linearisation(const MomentLayout& layout,
                                                            const double* global) const {
  // At the global means every first-moment term of a centred moment drops out, so each gradient is
  // the statistic's influence function (e.g. (x-mu)^2 - sigma^2 for a variance).
  switch (kind_) {
    case StatisticKind::kMean:
      return {{ProductOf({0}), 1.0}};
    case StatisticKind::kVariance:
      return {{ProductOf({0, 0}), 1.0}};
    case StatisticKind::kRms: {
      const double rms = std::sqrt(layout.CentralMoment(global, ProductOf({0, 0})));
      return {{ProductOf({0, 0}), rms > 0.0 ? 0.5 / rms : 0.0}};
    }
    case StatisticKind::kCovariance:
      return {{ProductOf({0, 1}), 1.0}};
    case StatisticKind::kThirdMoment: {
      // d/d(mean_a) of <(x_a - m_a)(x_b - m_b)(x_c - m_c)> is -<x_b' x_c'>.
      return {{ProductOf({0, 1, 2}), 1.0},
              {ProductOf({0}), -layout.CentralMoment(global, ProductOf({1, 2}))},
              {ProductOf({1}), -layout.CentralMoment(global, ProductOf({0, 2}))},
              {ProductOf({2}), -layout.CentralMoment(global, ProductOf({0, 1}))}};
    }
    case StatisticKind::kTke:
      return {{ProductOf({0, 0}), 0.5}, {ProductOf({1, 1}), 0.5}, {ProductOf({2, 2}), 0.5}};
    case StatisticKind::kAverage:
      return {{ProductOf({0}), 0.5}, {ProductOf({1}), 0.5}};
    case StatisticKind::kWeightedSum: {
      // Linear: the per-sample weighted sum is exactly what is averaged, so its block values are
      // the weighted sums of the block means and no term is an approximation.
      std::vector<WeightedMoment> terms;
      for (std::size_t k = 0; k < weights_.size(); ++k) {
        terms.push_back({ProductOf({static_cast<int>(k)}), weights_[k]});
      }
      return terms;
    }
  }
  return {};
}

}  // namespace plateau
