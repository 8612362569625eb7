// The statistics of one source (one file layout, possibly many files of a restarted run), fed with
// its rows in time order: resolves column names, gates restart overlap, routes each row to every
// statistic. Pure: rows in, no I/O. Not thread-safe: one owner feeds and evaluates.
#ifndef PLATEAU_CORE_SOURCE_STATISTICS_H_
#define PLATEAU_CORE_SOURCE_STATISTICS_H_

#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "core/result.h"
#include "core/sample_spacing.h"
#include "core/statistic.h"
#include "core/statistic_request.h"
#include "core/time_order_gate.h"

namespace plateau {

class SourceStatistics {
 public:
  // Resolves `time_column` (a column name, or a 1-based column number; empty means the first
  // column) and every request's columns against `columns`. An unknown time column is an error.
  // A request with an unknown column or a wrong column count gets no statistic: its
  // message (naming the column and listing the known ones) is in problems(), by request index.
  static Result<SourceStatistics> Make(std::vector<std::string> columns,
                                       const std::string& time_column,
                                       const std::vector<StatisticRequest>& requests,
                                       std::size_t capacity);

  struct Problem {
    std::size_t request;
    std::string message;
  };
  const std::vector<Problem>& problems() const { return problems_; }

  // A mean request for every column but the time column: what `analyze` does by default.
  static std::vector<StatisticRequest> MeansOfEveryColumn(const std::vector<std::string>& columns,
                                                          const std::string& time_column);

  // A factor applied to a column before any statistic sees it: -1 for a solver's sign convention,
  // a density to turn a kinematic value into pascals. Columns by name or 1-based number; an
  // unknown column is an error (the scales set before stay).
  struct ColumnScale {
    std::string column;
    double factor = 1.0;
  };
  Status SetScales(const std::vector<ColumnScale>& scales);

  // How samples are weighted (SampleSpacing); before the first row only, else false.
  bool SetWeighting(Weighting weighting);

  // Adds one row of every column. Returns false when its time is not after the last admitted time
  // (restart overlap): the row is then counted in gate() and used by no statistic. Until the
  // weighting is chosen (the first SampleSpacing::kDecisionSpacings spacings) admitted rows are held
  // back, and the statistics see them once it is.
  bool Add(const double* row);
  // Chooses the weighting from the rows held back so far and feeds them: at the end of a file that
  // `analyze` reads, which may hold fewer rows than the choice waits for.
  void SettleWeighting();
  const SampleSpacing& spacing() const { return spacing_; }
  // Rows admitted but held back until the weighting is chosen.
  std::size_t held_rows() const { return held_.size() / columns_.size(); }
  // Fills the estimate's simulated-time scales from the spacing (StatisticEstimate::unit_time).
  void AddTimeScales(StatisticEstimate& e) const;

  // The spacing's state and the rows held back, for checkpoints; Restore returns false and changes
  // nothing when the state does not fit this source.
  std::vector<double> SaveWeightingState() const;
  bool RestoreWeightingState(const std::vector<double>& state);

  // Every history with a stable key, for checkpoints: "statistic:NAME" for a statistic's own,
  // "shared:KEY" for a shared one.
  struct KeyedHistory {
    std::string key;
    BlockHistory* history;
  };
  std::vector<KeyedHistory> histories();

  const std::vector<std::string>& columns() const { return columns_; }
  int time_index() const { return time_index_; }
  const TimeOrderGate& gate() const { return gate_; }
  TimeOrderGate& gate() { return gate_; }
  std::vector<Statistic>& statistics() { return statistics_; }
  const std::vector<Statistic>& statistics() const { return statistics_; }
  // Column names of each statistic, in the order of statistics().
  const std::vector<std::vector<std::string>>& statistic_columns() const { return columns_of_; }

 private:
  SourceStatistics(std::vector<std::string> columns, int time_index);

  // A history and the row positions of its signals: the rows are read into it once each.
  struct Feed {
    std::string key;
    std::shared_ptr<BlockHistory> history;
    std::vector<int> columns;
  };
  // The feed for `key`, made with `columns` and `order` the first time; nullptr with *error when
  // a shared history's columns are unknown or more than three.
  Feed* FeedFor(const std::string& key, const std::vector<int>& columns, int order,
                std::size_t capacity, std::string* error);
  double TimeOf(const double* row) const { return row[time_index_] * scales_[time_index_]; }
  // Gives an admitted row to every history, with the weight the spacing gives it.
  void FeedRow(const double* row);

  std::vector<std::string> columns_;
  int time_index_;
  TimeOrderGate gate_;
  std::vector<Statistic> statistics_;
  std::vector<std::vector<std::string>> columns_of_;
  std::vector<Problem> problems_;
  std::vector<Feed> feeds_;
  std::vector<double> scales_;  // one factor per column, 1 unless set
  SampleSpacing spacing_;
  std::vector<double> held_;  // admitted rows, row after row, until the weighting is chosen
};

// Position of `column` (a name, else a 1-based number) in `columns`; -1 when neither matches.
int ResolveColumn(const std::vector<std::string>& columns, const std::string& column);

}  // namespace plateau

#endif  // PLATEAU_CORE_SOURCE_STATISTICS_H_
