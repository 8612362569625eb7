#include "daemon/ingest/series_catalog.h"

#include <glob.h>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <map>
#include <set>

#include "core/source_statistics.h"
#include "daemon/ingest/probe_file_reader.h"

namespace plateau {
namespace {

namespace fs = std::filesystem;

// Regular files an argument names: the file, a glob's matches, or every file under a folder
// (hidden ones excepted), each list sorted so that a catalog does not depend on the file system's
// order.
std::vector<std::string> FilesNamedBy(const std::string& argument) {
  std::vector<std::string> paths;
  std::error_code ec;
  if (fs::is_directory(argument, ec)) {
    for (fs::recursive_directory_iterator it(argument, fs::directory_options::skip_permission_denied,
                                             ec),
         end;
         it != end; it.increment(ec)) {
      if (ec) break;
      const std::string name = it->path().filename().string();
      if (!name.empty() && name[0] == '.') {
        if (it->is_directory(ec)) it.disable_recursion_pending();
        continue;
      }
      if (it->is_regular_file(ec)) paths.push_back(it->path().string());
    }
  } else {
    glob_t matches{};
    if (::glob(argument.c_str(), 0, nullptr, &matches) == 0) {
      for (std::size_t i = 0; i < matches.gl_pathc; ++i) {
        if (fs::is_directory(matches.gl_pathv[i], ec)) {
          for (std::string& p : FilesNamedBy(matches.gl_pathv[i])) paths.push_back(std::move(p));
        } else if (fs::is_regular_file(matches.gl_pathv[i], ec)) {
          paths.emplace_back(matches.gl_pathv[i]);
        }
      }
    }
    ::globfree(&matches);
  }
  std::sort(paths.begin(), paths.end());
  return paths;
}

// A NUL byte among the first 4 KiB: a binary file (a restart file, a mesh), not text.
bool LooksBinary(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  char buffer[4096];
  in.read(buffer, sizeof buffer);
  return std::find(buffer, buffer + in.gcount(), '\0') != buffer + in.gcount();
}

// The file's first rows, read with Welford's update per column.
SegmentSample Sample(const std::string& path, const std::string& time_column,
                     std::string* read_error) {
  struct Sink : RowSink {
    SegmentSample s;
    std::vector<double> sum_sq;
    int time_index = 0;
    std::string time_column;
    void OnColumns(const std::vector<std::string>& names) override {
      s.columns = names;
      s.mean.assign(names.size(), 0.0);
      sum_sq.assign(names.size(), 0.0);
      time_index = time_column.empty() ? 0 : std::max(0, ResolveColumn(names, time_column));
    }
    void OnRow(std::uint64_t, const double* values) override {
      if (s.rows >= kSampleRows) return;
      if (s.rows == 0) s.first_time = values[time_index];
      ++s.rows;
      for (std::size_t c = 0; c < s.columns.size(); ++c) {
        const double delta = values[c] - s.mean[c];
        s.mean[c] += delta / static_cast<double>(s.rows);
        sum_sq[c] += delta * (values[c] - s.mean[c]);
      }
    }
    void OnBadLine(std::uint64_t line, std::string_view reason) override {
      if (s.rows >= kSampleRows) return;
      if (s.bad_lines++ == 0) s.first_bad_line = "line " + std::to_string(line) + ": " +
                                                 std::string(reason);
    }
  } sink;
  sink.time_column = time_column;
  RowParser parser = ParserFor(path);
  const Result<std::uint64_t> read = ReadProbeFile(path, 0, parser, sink, [&] {
    return sink.s.rows < kSampleRows && sink.s.bad_lines < kSampleRows;
  });
  if (!read.ok()) *read_error = read.error();
  for (double s : sink.sum_sq) {
    sink.s.deviation.push_back(sink.s.rows > 1 ? std::sqrt(s / (sink.s.rows - 1)) : 0.0);
  }
  sink.s.path = path;
  sink.s.segment = SeriesSegment::Of(path);
  sink.s.probes = parser.probes();
  return sink.s;
}

// Why a sampled file is not a per-step time series; empty when it is one.
std::string NotASeries(const SegmentSample& s) {
  if (s.rows == 0 && s.bad_lines == 0) return "no data rows yet";
  if (s.rows == 0) return "no numeric data rows (" + s.first_bad_line + "): not a time series";
  if (s.bad_lines > s.rows) {
    return "mostly lines that are not numeric rows (" + std::to_string(s.bad_lines) + " of " +
           std::to_string(s.bad_lines + s.rows) + ", the first at " + s.first_bad_line +
           "): a log or a table of text fields, not a time series";
  }
  if (s.columns.size() < 2) return "one column only: no time column and signal";
  return "";
}

bool SameLayout(const SegmentSample& a, const SegmentSample& b) {
  return a.columns == b.columns && SameProbes(a.probes, b.probes);
}

// Names from the series' own folder; where two series share it, the file's stem is added.
void NameSeries(std::vector<Series>& series) {
  std::map<std::string, int> uses;
  const auto base = [](const Series& s) {
    const SeriesSegment& seg = s.first().segment;
    return seg.series_folder.empty() ? seg.file_stem : seg.series_folder;
  };
  for (const Series& s : series) ++uses[base(s)];
  std::set<std::string> taken;
  for (Series& s : series) {
    const SeriesSegment& seg = s.first().segment;
    std::string name = base(s);
    if (uses[name] > 1 && !seg.series_folder.empty()) name += "_" + seg.file_stem;
    const std::string stem = name;
    for (int k = 2; taken.count(name) > 0; ++k) name = stem + "_" + std::to_string(k);
    taken.insert(name);
    s.name = name;
  }
}

}  // namespace

RowParser ParserFor(const std::string& path) {
  RowParser parser;
  parser.set_field_name(SeriesSegment::Of(path).file_stem);
  return parser;
}

double FirstDataTime(const std::string& path, const std::string& time_column) {
  struct FirstRow : RowSink {
    std::vector<std::string> names;
    double time = std::numeric_limits<double>::infinity();
    std::string time_column;
    void OnColumns(const std::vector<std::string>& n) override { names = n; }
    void OnRow(std::uint64_t, const double* values) override {
      if (!std::isinf(time)) return;
      const int index = time_column.empty() ? 0 : ResolveColumn(names, time_column);
      if (index >= 0) time = values[index];
    }
    void OnBadLine(std::uint64_t, std::string_view) override {}
  } first;
  first.time_column = time_column;
  RowParser parser = ParserFor(path);
  // The first mebibyte at most: headers are far shorter, and a file of garbage is not read whole.
  ReadProbeFile(path, 0, parser, first, [&] { return false; });
  return first.time;
}

SeriesCatalog CatalogSeries(const std::vector<std::string>& arguments,
                            const std::string& time_column) {
  SeriesCatalog catalog;
  std::set<std::string> seen;
  std::map<std::string, std::vector<SegmentSample>> by_series;
  std::vector<std::string> series_order;
  for (const std::string& argument : arguments) {
    const std::vector<std::string> files = FilesNamedBy(argument);
    if (files.empty()) catalog.unmatched.push_back(argument);
    for (const std::string& path : files) {
      if (!seen.insert(path).second) continue;
      if (LooksBinary(path)) {
        catalog.left_out.push_back({path, "binary data, not a text time series"});
        continue;
      }
      std::string read_error;
      SegmentSample sample = Sample(path, time_column, &read_error);
      const std::string reason = read_error.empty() ? NotASeries(sample) : read_error;
      if (!reason.empty()) {
        catalog.left_out.push_back({path, reason});
        continue;
      }
      const std::string key = sample.segment.series;
      if (by_series.count(key) == 0) series_order.push_back(key);
      by_series[key].push_back(std::move(sample));
    }
  }
  for (const std::string& key : series_order) {
    std::vector<SegmentSample>& segments = by_series[key];
    // Time order by the first data time; the folder's start time breaks ties.
    std::stable_sort(segments.begin(), segments.end(),
                     [](const SegmentSample& a, const SegmentSample& b) {
                       return a.first_time < b.first_time;
                     });
    Series series;
    series.glob = key;
    for (SegmentSample& s : segments) {
      if (!series.segments.empty() && !SameLayout(series.first(), s)) {
        catalog.left_out.push_back(
            {s.path, "its header differs from that of " + series.first().path + " (" +
                         std::to_string(s.columns.size()) + " columns against " +
                         std::to_string(series.first().columns.size()) +
                         (s.columns.size() == series.first().columns.size()
                              ? ", other names or probe locations"
                              : "") +
                         "): a probe added or moved at a restart? The two are not merged"});
        continue;
      }
      series.segments.push_back(std::move(s));
    }
    std::uint64_t rows = 0;
    for (const SegmentSample& s : series.segments) rows += s.rows;
    if (rows < kMinimumRows) {
      for (const SegmentSample& s : series.segments) {
        catalog.left_out.push_back(
            {s.path, "only " + std::to_string(rows) + " data rows in its series: written at a "
                     "few times, not a per-step time series (or it has only just started)"});
      }
      continue;
    }
    if (series.first().segment.folder == SeriesSegment::Folder::kNumberedRestart &&
        series.segments.size() > 1) {
      catalog.notes.push_back("the numbered folders of " + key +
                              " were taken as restart segments of one series");
    }
    catalog.series.push_back(std::move(series));
  }
  NameSeries(catalog.series);
  return catalog;
}

}  // namespace plateau
