#include "core/source_statistics.h"

#include <algorithm>
#include <charconv>
#include <limits>
#include <map>

namespace plateau {
namespace {

std::string KnownColumns(const std::vector<std::string>& columns) {
  std::string list;
  for (const std::string& c : columns) list += (list.empty() ? "" : ", ") + c;
  return list;
}

}  // namespace

int ResolveColumn(const std::vector<std::string>& columns, const std::string& column) {
  const auto named = std::find(columns.begin(), columns.end(), column);
  if (named != columns.end()) return static_cast<int>(named - columns.begin());
  int number = 0;
  const auto [ptr, ec] = std::from_chars(column.data(), column.data() + column.size(), number);
  if (ec == std::errc() && ptr == column.data() + column.size() && number >= 1 &&
      number <= static_cast<int>(columns.size())) {
    return number - 1;
  }
  return -1;
}

SourceStatistics::SourceStatistics(std::vector<std::string> columns, int time_index)
    : columns_(std::move(columns)), time_index_(time_index), scales_(columns_.size(), 1.0) {}

Result<SourceStatistics> SourceStatistics::Make(std::vector<std::string> columns,
                                                const std::string& time_column,
                                                const std::vector<StatisticRequest>& requests,
                                                std::size_t capacity) {
  const int time_index = time_column.empty() ? 0 : ResolveColumn(columns, time_column);
  if (time_index < 0 || columns.empty()) {
    return Status::Error("no time column '" + time_column + "' (columns: " +
                         KnownColumns(columns) + ")");
  }
  SourceStatistics source(std::move(columns), time_index);
  // The order each shared history must keep: the highest any of its statistics needs.
  std::map<std::string, int> shared_order;
  for (const StatisticRequest& r : requests) {
    if (r.shared_history.empty()) continue;
    const int order = r.kind == StatisticKind::kMean ? 2 : r.kind == StatisticKind::kThirdMoment ? 6 : 4;
    shared_order[r.shared_history] = std::max(shared_order[r.shared_history], order);
  }
  for (std::size_t r = 0; r < requests.size(); ++r) {
    const StatisticRequest& request = requests[r];
    const auto resolve = [&](const std::vector<std::string>& names, std::vector<int>* positions) {
      for (const std::string& column : names) {
        const int position = ResolveColumn(source.columns_, column);
        if (position < 0) {
          return "no column '" + column + "' (columns: " + KnownColumns(source.columns_) + ")";
        }
        positions->push_back(position);
      }
      return std::string();
    };
    std::vector<int> positions;
    std::string problem = resolve(request.columns, &positions);
    std::vector<std::string> names;
    names.reserve(positions.size());
    for (int p : positions) names.push_back(source.columns_[p]);
    const std::string name =
        request.name.empty() ? DefaultStatisticName(request.kind, names) : request.name;
    std::optional<StatisticFormula> formula;
    Feed* feed = nullptr;
    if (problem.empty() && request.shared_history.empty()) {
      formula = StatisticFormula::Make(request.kind, positions, &problem, nullptr, request.weights);
      // Keyed by position too: `analyze` may ask for the same statistic twice.
      if (formula) {
        feed = source.FeedFor("statistic:" + name + "#" + std::to_string(r), formula->signals(),
                              formula->history_order(), capacity, &problem);
      }
    } else if (problem.empty()) {
      std::vector<int> shared;
      problem = resolve(request.shared_columns, &shared);
      if (problem.empty()) {
        feed = source.FeedFor("shared:" + request.shared_history, shared,
                              shared_order[request.shared_history], capacity, &problem);
      }
      if (feed) formula = StatisticFormula::Make(request.kind, positions, &problem, &feed->columns);
    }
    if (!formula || !feed) {
      source.problems_.push_back({r, problem});
      continue;
    }
    source.statistics_.emplace_back(name, *formula, feed->history);
    source.columns_of_.push_back(std::move(names));
  }
  return source;
}

SourceStatistics::Feed* SourceStatistics::FeedFor(const std::string& key,
                                                  const std::vector<int>& columns, int order,
                                                  std::size_t capacity, std::string* error) {
  for (Feed& f : feeds_) {
    if (f.key == key) return &f;
  }
  if (columns.empty() || columns.size() > MomentLayout::kMaxSignals) {
    *error = "a shared history holds one to three columns, not " + std::to_string(columns.size());
    return nullptr;
  }
  feeds_.push_back({key,
                    std::make_shared<BlockHistory>(
                        MomentLayout(static_cast<int>(columns.size()), order), capacity),
                    columns});
  return &feeds_.back();
}

std::vector<SourceStatistics::KeyedHistory> SourceStatistics::histories() {
  std::vector<KeyedHistory> out;
  for (Feed& f : feeds_) out.push_back({f.key, f.history.get()});
  return out;
}

std::vector<StatisticRequest> SourceStatistics::MeansOfEveryColumn(
    const std::vector<std::string>& columns, const std::string& time_column) {
  const int time_index = time_column.empty() ? 0 : ResolveColumn(columns, time_column);
  std::vector<StatisticRequest> requests;
  for (int c = 0; c < static_cast<int>(columns.size()); ++c) {
    if (c != time_index) requests.push_back(MakeRequest(StatisticKind::kMean, {columns[c]}));
  }
  return requests;
}

Status SourceStatistics::SetScales(const std::vector<ColumnScale>& scales) {
  std::vector<double> factors(columns_.size(), 1.0);
  for (const ColumnScale& s : scales) {
    const int index = ResolveColumn(columns_, s.column);
    if (index < 0) {
      return Status::Error("scale names column '" + s.column + "', which the files do not have");
    }
    factors[index] = s.factor;
  }
  scales_ = std::move(factors);
  return Status::Ok();
}

bool SourceStatistics::SetWeighting(Weighting weighting) {
  if (gate_.last_time() != -std::numeric_limits<double>::infinity()) return false;
  spacing_ = SampleSpacing(weighting);
  return true;
}

bool SourceStatistics::Add(const double* row) {
  if (!gate_.Admit(TimeOf(row))) return false;
  if (spacing_.decided()) {
    FeedRow(row);
    return true;
  }
  held_.insert(held_.end(), row, row + columns_.size());
  if (held_rows() > SampleSpacing::kDecisionSpacings) SettleWeighting();
  return true;
}

void SourceStatistics::SettleWeighting() {
  if (spacing_.decided()) return;
  std::vector<double> times;
  const std::size_t width = columns_.size();
  for (std::size_t at = 0; at < held_.size(); at += width) times.push_back(TimeOf(&held_[at]));
  spacing_.Decide(times);
  for (std::size_t at = 0; at < held_.size(); at += width) FeedRow(&held_[at]);
  held_.clear();
  held_.shrink_to_fit();
}

void SourceStatistics::FeedRow(const double* row) {
  // Multiplying by an unset factor of exactly 1 leaves every value as it was.
  const double time = TimeOf(row);
  const double weight = spacing_.Next(time);
  double values[MomentLayout::kMaxSignals];
  for (Feed& f : feeds_) {
    for (std::size_t i = 0; i < f.columns.size(); ++i) {
      values[i] = row[f.columns[i]] * scales_[f.columns[i]];
    }
    f.history->Add(time, values, weight);
  }
}

void SourceStatistics::AddTimeScales(StatisticEstimate& e) const {
  if (!spacing_.decided()) {
    if (e.state == EstimateState::kNoData && held_rows() > 0) {
      e.state_reason = std::to_string(held_rows()) + " rows held until the weighting is chosen (" +
                       std::to_string(SampleSpacing::kDecisionSpacings + 1) + " rows)";
    }
    return;
  }
  e.time_weighted = spacing_.time_weighted();
  e.unit_time = spacing_.unit_time();
  e.integral_time_scale = e.integrated_time * e.unit_time;
  e.averaging_time = static_cast<double>(e.samples_used) * e.unit_time;
}

std::vector<double> SourceStatistics::SaveWeightingState() const {
  std::vector<double> state = spacing_.SaveState();
  state.insert(state.begin(), static_cast<double>(state.size()));
  state.insert(state.end(), held_.begin(), held_.end());
  return state;
}

bool SourceStatistics::RestoreWeightingState(const std::vector<double>& state) {
  if (state.empty()) return false;
  const auto size = static_cast<std::size_t>(state[0]);
  if (state.size() < 1 + size || (state.size() - 1 - size) % columns_.size() != 0) return false;
  SampleSpacing spacing;
  if (!spacing.RestoreState(std::vector<double>(state.begin() + 1, state.begin() + 1 + size))) {
    return false;
  }
  spacing_ = std::move(spacing);
  held_.assign(state.begin() + 1 + static_cast<std::ptrdiff_t>(size), state.end());
  return true;
}

}  // namespace plateau
