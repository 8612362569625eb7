#include "core/source_statistics.h"

#include <algorithm>
#include <charconv>

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
    : columns_(std::move(columns)), time_index_(time_index) {}

std::optional<SourceStatistics> SourceStatistics::Make(
    std::vector<std::string> columns, const std::string& time_column,
    const std::vector<StatisticRequest>& requests, std::size_t capacity, std::string* error) {
  const int time_index = time_column.empty() ? 0 : ResolveColumn(columns, time_column);
  if (time_index < 0 || columns.empty()) {
    *error = "no time column '" + time_column + "' (columns: " + KnownColumns(columns) + ")";
    return std::nullopt;
  }
  SourceStatistics source(std::move(columns), time_index);
  for (std::size_t r = 0; r < requests.size(); ++r) {
    const StatisticRequest& request = requests[r];
    std::vector<int> positions;
    std::string problem;
    for (const std::string& column : request.columns) {
      const int position = ResolveColumn(source.columns_, column);
      if (position < 0 && problem.empty()) {
        problem = "no column '" + column + "' (columns: " + KnownColumns(source.columns_) + ")";
      }
      positions.push_back(position);
    }
    std::optional<StatisticFormula> formula;
    if (problem.empty()) formula = StatisticFormula::Make(request.kind, positions, &problem);
    if (!formula) {
      source.problems_.push_back({r, problem});
      continue;
    }
    std::vector<std::string> names;
    for (int p : positions) names.push_back(source.columns_[p]);
    const std::string name =
        request.name.empty() ? DefaultStatisticName(request.kind, names) : request.name;
    source.statistics_.emplace_back(name, *formula, capacity);
    source.columns_of_.push_back(std::move(names));
    source.request_of_.push_back(r);
  }
  return source;
}

std::vector<StatisticRequest> SourceStatistics::MeansOfEveryColumn(
    const std::vector<std::string>& columns, const std::string& time_column) {
  const int time_index = time_column.empty() ? 0 : ResolveColumn(columns, time_column);
  std::vector<StatisticRequest> requests;
  for (int c = 0; c < static_cast<int>(columns.size()); ++c) {
    if (c != time_index) requests.push_back({StatisticKind::kMean, {columns[c]}, ""});
  }
  return requests;
}

bool SourceStatistics::Add(const double* row) {
  const double time = row[time_index_];
  if (!gate_.Admit(time)) return false;
  for (Statistic& statistic : statistics_) statistic.Add(time, row);
  return true;
}

}  // namespace plateau
