// What a statistic is as a function of central moments of its signals, and its linearisation about
// the global means (delta method for batch means, Muñoz & Glynn 1997). Pure numerics, no I/O.
// Immutable after construction; safe to share between threads.
#ifndef PLATEAU_CORE_STATISTIC_FORMULA_H_
#define PLATEAU_CORE_STATISTIC_FORMULA_H_

#include <optional>
#include <string>
#include <vector>

#include "core/moment_layout.h"
#include "core/statistic_kind.h"

namespace plateau {

// One term of a linearised statistic: weight * (moment about the global means, of powers alpha).
struct WeightedMoment {
  Powers alpha;
  double weight;
};

class StatisticFormula {
 public:
  // `columns` are positions in a data row (KindColumnCount(kind) of them; third_moment may repeat a
  // column, as in <u'u'v'>). The formula's signals are its distinct columns, or, when
  // `history_signals` is given, those of a history shared with other statistics (every column must
  // be one of them). Returns nullopt and sets *error when the count is wrong or a column is not in
  // the shared history.
  // A weighted_sum takes one to three columns and one weight per column.
  static std::optional<StatisticFormula> Make(StatisticKind kind, std::vector<int> columns,
                                              std::string* error,
                                              const std::vector<int>* history_signals = nullptr,
                                              std::vector<double> weights = {});

  StatisticKind kind() const { return kind_; }
  const std::vector<int>& columns() const { return columns_; }
  // Row positions of the history's signals: the distinct columns in first-use order, or the shared
  // history's.
  const std::vector<int>& signals() const { return signals_; }
  // Which of signals() the formula uses (indices into signals()).
  std::vector<int> used_signals() const;
  // Order of the moments the history must keep: twice the statistic's own order, so that the
  // sample-level variance of the linearised series (needed for tau in samples) is exact.
  int history_order() const { return 2 * order_; }

  // The statistic of the samples one summary holds (the global summary, or one block alone).
  // NaN when the summary is empty.
  double Value(const MomentLayout& layout, const double* summary) const;
  // Gradient terms at the global summary: z_b = sum_t weight_t * (M_b[alpha_t] - mu[alpha_t]) is the
  // block's linearised deviation, where M_b is the block's moment about the global means.
  std::vector<WeightedMoment> Linearisation(const MomentLayout& layout,
                                            const double* global) const;

 private:
  StatisticFormula(StatisticKind kind, std::vector<int> columns, std::vector<int> signals,
                   std::vector<double> weights);
  // Powers selecting the product of the statistic's columns with positions `which` in columns_.
  Powers ProductOf(std::initializer_list<int> which) const;

  StatisticKind kind_;
  std::vector<int> columns_;
  std::vector<int> signals_;
  std::vector<int> signal_of_column_;  // columns_[k] is signal signal_of_column_[k]
  std::vector<double> weights_;        // weighted_sum: one per column
  int order_;
};

}  // namespace plateau

#endif  // PLATEAU_CORE_STATISTIC_FORMULA_H_
