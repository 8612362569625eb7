// What one `plateau analyze` run found: per series (source) the files read and the estimates.
// Plain data handed from the command to the report; no behaviour.
#ifndef PLATEAU_DAEMON_PRESENTATION_ANALYSIS_RESULT_H_
#define PLATEAU_DAEMON_PRESENTATION_ANALYSIS_RESULT_H_

#include <cstdint>
#include <limits>
#include <string>
#include <vector>

#include "core/evaluation_options.h"
#include "core/sample_spacing.h"
#include "core/statistic_estimate.h"

namespace plateau {

// A file given that is not a time series, with the reason (ingest decides, the report shows it).
struct LeftOutFile {
  std::string path;
  std::string reason;  // one sentence
};

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

// One series: its segments as read, and its statistics.
struct SourceAnalysis {
  std::string name;    // unique among the result's sources, from the series' folder
  std::string series;  // the glob that matches its segments
  std::vector<FileSummary> files;  // in the order they were read (time order)
  std::vector<std::string> columns;
  std::string time_column;
  std::vector<StatisticEstimate> estimates;
  std::vector<std::vector<std::string>> statistic_columns;  // per estimate
  std::vector<std::string> notes;  // restart overlaps and the like, one sentence each
  SampleSpacing spacing;           // the weighting and the spread of the time spacing
};

struct AnalysisResult {
  EvaluationOptions options;
  std::vector<SourceAnalysis> sources;
  std::vector<LeftOutFile> left_out;  // files given that are not time series, with the reason
  std::vector<std::string> notes;     // what was guessed in grouping the files
};

}  // namespace plateau

#endif  // PLATEAU_DAEMON_PRESENTATION_ANALYSIS_RESULT_H_
