// Sorts the files a user names (files, globs, folders walked recursively) into series: one per
// solver function, its run segments in time order, whatever the column counts of other series.
// Files that are not per-step time series (a log, a binary file, a file of text fields or of a
// few rows) are left out with one reason each; a segment whose header differs from its series'
// earlier segments is left out naming both files. Reads only each file's first rows.
// Stateless: one call per command.
#ifndef PLATEAU_DAEMON_INGEST_SERIES_CATALOG_H_
#define PLATEAU_DAEMON_INGEST_SERIES_CATALOG_H_

#include <limits>
#include <string>
#include <vector>

#include "core/probe_header.h"
#include "core/row_parser.h"
#include "core/series_segment.h"
#include "daemon/presentation/analysis_result.h"

namespace plateau {

// One file's first rows: its layout and, per column, the mean and standard deviation there.
struct SegmentSample {
  std::string path;
  SeriesSegment segment;
  std::vector<std::string> columns;
  std::vector<ProbeLocation> probes;  // from a probe-description header; else empty
  double first_time = std::numeric_limits<double>::quiet_NaN();
  std::uint64_t rows = 0;       // data rows among the sampled lines
  std::uint64_t bad_lines = 0;  // among the sampled lines
  std::string first_bad_line;   // "line 7: value 2 'lowerWall' is not a number"
  std::vector<double> mean;
  std::vector<double> deviation;
};

struct Series {
  std::string glob;  // matches exactly its segments: SeriesSegment::series
  std::string name;  // unique among the catalog's series, from the series' folder
  std::vector<SegmentSample> segments;  // in time order
  const SegmentSample& first() const { return segments.front(); }
};

struct SeriesCatalog {
  std::vector<Series> series;
  std::vector<LeftOutFile> left_out;
  std::vector<std::string> notes;      // what was guessed: numbered restart folders as segments
  std::vector<std::string> unmatched;  // arguments that named nothing
};

// Rows a sample reads per file; a series needs at least kMinimumRows of them to be one.
constexpr std::uint64_t kSampleRows = 5000;
constexpr std::uint64_t kMinimumRows = 10;

// `time_column` (a name or 1-based number; empty: the first column) orders the segments.
SeriesCatalog CatalogSeries(const std::vector<std::string>& arguments,
                            const std::string& time_column = "");

// The first time of a file's data (by `time_column`), for ordering segments; infinity when the
// file has no data row in its first mebibyte or cannot be read.
double FirstDataTime(const std::string& path, const std::string& time_column);

// A parser for `path`: probe columns are named after the file's stem (`U`, `p`).
RowParser ParserFor(const std::string& path);

}  // namespace plateau

#endif  // PLATEAU_DAEMON_INGEST_SERIES_CATALOG_H_
