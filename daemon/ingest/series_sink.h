// The one row sink of analyze and watch: one segment's parser output into its series' statistics.
// The first segment's header starts the series; a later segment whose header differs (a probe
// added or moved at a restart) is refused whole, never merged column by column; rows pass the
// series' time gate (restart overlap). What it meets goes to the owner's SeriesSinkOwner (log
// lines for watch, notes and file summaries for analyze). Single-threaded; one sink per read.
#ifndef PLATEAU_DAEMON_INGEST_SERIES_SINK_H_
#define PLATEAU_DAEMON_INGEST_SERIES_SINK_H_

#include <cstdint>
#include <limits>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/probe_header.h"
#include "core/row_parser.h"
#include "core/source_statistics.h"

namespace plateau {

// A series as read so far, across its segments and reads.
struct SeriesIngest {
  std::optional<SourceStatistics> source;    // empty until a header made it (see StartSeries)
  std::string layout_file;                   // the segment whose header set the columns
  std::vector<ProbeLocation> layout_probes;  // its probe locations, when read in this process
  std::uint64_t overlap_reported = 0;        // skipped samples already reported
};

// One segment as read so far, across reads.
struct SegmentRows {
  static constexpr double kUnknown = std::numeric_limits<double>::quiet_NaN();
  double first_time = kUnknown;  // of its rows, recorded or skipped as overlap
  double last_time = kUnknown;
  double first_recorded_time = kUnknown;  // of the rows the time gate admitted
  double last_recorded_time = kUnknown;
  std::uint64_t rows = 0;          // complete data rows
  std::uint64_t overlap_rows = 0;  // of those, skipped as already recorded
  bool refused = false;            // its header does not fit the series: none of it is read
};

// What the owner of a series does with what the sink meets.
class SeriesSinkOwner {
 public:
  virtual ~SeriesSinkOwner() = default;
  // The series' first header: make `series.source` from `names` (or leave it empty, saying why).
  virtual void StartSeries(const std::vector<std::string>& names, const std::string& path) = 0;
  // `path` is refused whole; `reason` names it and, for a changed header, the first segment.
  virtual void RefuseSegment(const std::string& path, const std::string& reason) = 0;
  // A restart overlap ended in `path`: `overlap.samples` rows already recorded were skipped.
  virtual void ReportOverlap(const TimeOrderGate::Overlap& overlap, const std::string& path) = 0;
  virtual void ReportBadLine(const std::string& path, std::uint64_t line,
                             std::string_view reason) = 0;
};

// Column names as one comma-separated list, for messages.
std::string JoinedNames(const std::vector<std::string>& names);

class SeriesSink final : public RowSink {
 public:
  // `configured_names` (the config's `columns:`; empty to take the header's) must outlive the
  // sink, as must every other argument.
  SeriesSink(SeriesIngest& series, SegmentRows& segment, const std::string& path,
             const RowParser& parser, const std::vector<std::string>& configured_names,
             SeriesSinkOwner& owner)
      : series_(series),
        segment_(segment),
        path_(path),
        parser_(parser),
        configured_names_(configured_names),
        owner_(owner) {}

  void OnColumns(const std::vector<std::string>& header) override;
  void OnRow(std::uint64_t line, const double* values) override;
  void OnBadLine(std::uint64_t line, std::string_view reason) override;

 private:
  void Refuse(const std::string& reason);

  SeriesIngest& series_;
  SegmentRows& segment_;
  const std::string& path_;
  const RowParser& parser_;
  const std::vector<std::string>& configured_names_;
  SeriesSinkOwner& owner_;
};

}  // namespace plateau

#endif  // PLATEAU_DAEMON_INGEST_SERIES_SINK_H_
