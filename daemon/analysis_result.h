// What one `plateau analyze` run found: per file what was read, per statistic its estimate.
// Plain data handed from the command to the report; no behaviour.
#ifndef PLATEAU_DAEMON_ANALYSIS_RESULT_H_
#define PLATEAU_DAEMON_ANALYSIS_RESULT_H_

#include <cstdint>
#include <limits>
#include <string>
#include <vector>

#include "core/evaluation_options.h"
#include "core/statistic_estimate.h"

namespace plateau {

struct FileSummary {
  std::string path;
  std::uint64_t rows = 0;            // complete data rows parsed
  std::uint64_t bad_lines = 0;
  std::uint64_t restart_overlap = 0;  // rows skipped because their time was not after the last
  double first_time = std::numeric_limits<double>::quiet_NaN();
  double last_time = std::numeric_limits<double>::quiet_NaN();
  std::vector<std::string> bad_line_examples;  // "path:line: reason", the first few
  bool unterminated_last_line = false;
};

struct AnalysisResult {
  std::vector<FileSummary> files;
  std::vector<std::string> columns;
  std::string time_column;
  EvaluationOptions options;
  std::vector<StatisticEstimate> estimates;
  std::vector<std::vector<std::string>> statistic_columns;  // per estimate
  std::vector<std::string> notes;  // restart overlaps and the like, one sentence each
};

}  // namespace plateau

#endif  // PLATEAU_DAEMON_ANALYSIS_RESULT_H_
