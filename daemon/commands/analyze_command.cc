#include "daemon/commands/analyze_command.h"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <filesystem>
#include <limits>
#include <map>
#include <optional>

#include "core/row_parser.h"
#include "core/source_statistics.h"
#include "daemon/presentation/analysis_report.h"
#include "daemon/presentation/number_format.h"
#include "daemon/presentation/analysis_result.h"
#include "daemon/ingest/probe_file_reader.h"
#include "daemon/ingest/series_catalog.h"

namespace plateau {
namespace {

constexpr std::size_t kBadLineExamplesPerFile = 10;

struct AnalyzeOptions {
  std::vector<std::string> files;
  std::string time_column;
  std::string means = "all";  // all, none, or a comma-separated list
  std::vector<std::string> variance_lists;
  std::vector<std::string> rms_lists;
  std::vector<std::string> covariances;
  std::vector<std::string> third_moments;
  std::vector<std::string> tkes;
  std::vector<SourceStatistics::ColumnScale> scales;
  Weighting weighting = Weighting::kAuto;
  EvaluationOptions evaluation;
  std::size_t capacity = BlockHistory::kDefaultCapacity;
  bool json = false;
  bool help = false;
};

std::vector<std::string> SplitList(const std::string& list) {
  std::vector<std::string> items;
  std::string item;
  for (char c : list) {
    if (c == ',') {
      items.push_back(item);
      item.clear();
    } else {
      item += c;
    }
  }
  items.push_back(item);
  return items;
}

std::optional<double> ParseDouble(const std::string& text) {
  double value = 0.0;
  const auto [ptr, ec] = std::from_chars(text.data(), text.data() + text.size(), value);
  if (ec != std::errc() || ptr != text.data() + text.size() || !std::isfinite(value)) {
    return std::nullopt;
  }
  return value;
}

std::optional<AnalyzeOptions> ParseOptions(const std::vector<std::string>& args,
                                           std::string* error) {
  AnalyzeOptions o;
  for (std::size_t i = 0; i < args.size(); ++i) {
    const std::string& a = args[i];
    const auto value = [&]() -> std::optional<std::string> {
      if (i + 1 >= args.size()) {
        *error = a + " needs a value";
        return std::nullopt;
      }
      return args[++i];
    };
    if (a == "--help" || a == "-h") {
      o.help = true;
    } else if (a == "--json") {
      o.json = true;
    } else if (a == "--time" || a == "--means" || a == "--variance" || a == "--rms" ||
               a == "--covariance" || a == "--third-moment" || a == "--tke" ||
               a == "--confidence" || a == "--batches" || a == "--warmup" || a == "--blocks" ||
               a == "--scale" || a == "--weighting") {
      const auto v = value();
      if (!v) return std::nullopt;
      if (a == "--time") o.time_column = *v;
      if (a == "--means") o.means = *v;
      if (a == "--variance") o.variance_lists.push_back(*v);
      if (a == "--rms") o.rms_lists.push_back(*v);
      if (a == "--covariance") o.covariances.push_back(*v);
      if (a == "--third-moment") o.third_moments.push_back(*v);
      if (a == "--tke") o.tkes.push_back(*v);
      if (a == "--scale") {
        const std::size_t equals = v->rfind('=');
        const auto factor =
            equals == std::string::npos ? std::nullopt : ParseDouble(v->substr(equals + 1));
        if (!factor || *factor == 0.0 || equals == 0) {
          *error = "--scale takes COLUMN=FACTOR with a factor other than 0, such as tau.x=-1; "
                   "got '" + *v + "'";
          return std::nullopt;
        }
        o.scales.push_back({v->substr(0, equals), *factor});
      }
      if (a == "--weighting") {
        const std::optional<Weighting> w = ParseWeighting(*v);
        if (!w) {
          *error = "--weighting takes auto, time or samples; got '" + *v + "'";
          return std::nullopt;
        }
        o.weighting = *w;
      }
      if (a == "--confidence") {
        const auto c = ParseDouble(*v);
        if (!c || *c <= 0.0 || *c >= 1.0) {
          *error = "--confidence takes a fraction between 0 and 1, such as 0.95; got '" + *v + "'";
          return std::nullopt;
        }
        o.evaluation.confidence = *c;
      }
      if (a == "--batches") {
        const auto k = ParseDouble(*v);
        if (!k || *k != std::floor(*k) || *k < 2 || *k > 1000) {
          *error = "--batches takes a whole number from 2 to 1000 (20 to 30 is usual); got '" +
                   *v + "'";
          return std::nullopt;
        }
        o.evaluation.batches = static_cast<int>(*k);
      }
      if (a == "--warmup") {
        if (*v == "auto") {
          o.evaluation.warmup = WarmupPolicy::kAuto;
        } else if (*v == "none") {
          o.evaluation.warmup = WarmupPolicy::kNone;
        } else if (const auto t = ParseDouble(*v)) {
          o.evaluation.warmup = WarmupPolicy::kFixedTime;
          o.evaluation.warmup_time = *t;
        } else {
          *error = "--warmup takes auto, none or a time in the units of the time column; got '" +
                   *v + "'";
          return std::nullopt;
        }
      }
      if (a == "--blocks") {
        const auto c = ParseDouble(*v);
        if (!c || *c < 64 || *c > (1 << 24) || *c != std::floor(*c)) {
          *error = "--blocks takes a whole number from 64 to 16777216; got '" + *v + "'";
          return std::nullopt;
        }
        o.capacity = static_cast<std::size_t>(*c);
      }
    } else if (!a.empty() && a[0] == '-') {
      *error = "unknown option " + a + " (see plateau analyze --help)";
      return std::nullopt;
    } else {
      o.files.push_back(a);
    }
  }
  if (!o.help && o.files.empty()) {
    *error = "no probe file given (see plateau analyze --help)";
    return std::nullopt;
  }
  if (o.capacity < 4 * static_cast<std::size_t>(o.evaluation.batches)) {
    *error = "--blocks must be at least four times --batches";
    return std::nullopt;
  }
  return o;
}

// Columns named by a list option: "all" is every column but the time column.
std::vector<std::string> ListedColumns(const std::string& list,
                                       const std::vector<std::string>& columns,
                                       const std::string& time_column) {
  if (list != "all") return SplitList(list);
  std::vector<std::string> all;
  for (const StatisticRequest& r : SourceStatistics::MeansOfEveryColumn(columns, time_column)) {
    all.push_back(r.columns[0]);
  }
  return all;
}

std::vector<StatisticRequest> BuildRequests(const AnalyzeOptions& o,
                                            const std::vector<std::string>& columns) {
  std::vector<StatisticRequest> requests;
  if (o.means != "none") {
    for (const std::string& c : ListedColumns(o.means, columns, o.time_column)) {
      requests.push_back(MakeRequest(StatisticKind::kMean, {c}));
    }
  }
  const auto per_column = [&](const std::vector<std::string>& lists, StatisticKind kind) {
    for (const std::string& list : lists) {
      for (const std::string& c : ListedColumns(list, columns, o.time_column)) {
        requests.push_back(MakeRequest(kind, {c}));
      }
    }
  };
  per_column(o.variance_lists, StatisticKind::kVariance);
  per_column(o.rms_lists, StatisticKind::kRms);
  const auto grouped = [&](const std::vector<std::string>& lists, StatisticKind kind) {
    for (const std::string& list : lists) requests.push_back(MakeRequest(kind, SplitList(list)));
  };
  grouped(o.covariances, StatisticKind::kCovariance);
  grouped(o.third_moments, StatisticKind::kThirdMoment);
  grouped(o.tkes, StatisticKind::kTke);
  return requests;
}

// Feeds one file's rows into the source; creates the source from the first file's columns.
// The catalog has already left out segments with another header; the check here is the guard.
class AnalyzeSink : public RowSink {
 public:
  AnalyzeSink(const AnalyzeOptions& options, const std::vector<StatisticRequest>& requests,
              std::optional<SourceStatistics>& source, FileSummary& summary,
              std::vector<std::string>& notes)
      : options_(options),
        requests_(requests),
        source_(source),
        summary_(summary),
        notes_(notes) {}

  const std::string& error() const { return error_; }

  void OnColumns(const std::vector<std::string>& names) override {
    if (source_) {
      if (names != source_->columns()) {
        error_ = summary_.path + ": its columns differ from the first file's";
      }
      return;
    }
    std::string error;
    source_ = SourceStatistics::Make(names, options_.time_column, requests_, options_.capacity,
                                     &error);
    if (source_ && !source_->problems().empty()) {
      error = source_->problems().front().message;
    } else if (source_) {
      source_->SetWeighting(options_.weighting);
      source_->SetScales(options_.scales, &error);  // leaves `error` empty when every column is known
    }
    if (!source_ || !error.empty()) error_ = summary_.path + ": " + error;
  }

  void OnRow(std::uint64_t, const double* values) override {
    if (!error_.empty() || !source_) return;
    ++summary_.rows;
    if (!source_->Add(values)) {
      ++summary_.restart_overlap;
      return;
    }
    const double time = values[source_->time_index()];
    if (std::isnan(summary_.first_time)) summary_.first_time = time;
    summary_.last_time = time;
    if (source_->gate().skipped() > reported_skipped_) ReportOverlap();
  }

  void OnBadLine(std::uint64_t line, std::string_view reason) override {
    if (summary_.bad_line_examples.size() < kBadLineExamplesPerFile) {
      summary_.bad_line_examples.push_back(summary_.path + ":" + std::to_string(line) + ": " +
                                           std::string(reason));
    }
  }

 private:
  void ReportOverlap() {
    const TimeOrderGate::Overlap o = source_->gate().TakeFinishedOverlap();
    reported_skipped_ = source_->gate().skipped();
    if (o.samples == 0) return;
    notes_.push_back("restart overlap: " + std::to_string(o.samples) + " rows with times " +
                     FormatValue(o.first_time) + " to " + FormatValue(o.last_time) +
                     " were already recorded and were skipped (" + summary_.path + ")");
  }

  const AnalyzeOptions& options_;
  const std::vector<StatisticRequest>& requests_;
  std::optional<SourceStatistics>& source_;
  FileSummary& summary_;
  std::vector<std::string>& notes_;
  std::string error_;
  std::uint64_t reported_skipped_ = 0;
};

}  // namespace

std::string AnalyzeUsage() {
  return R"(usage: plateau analyze DIR_OR_FILE... [options]

Estimates every requested time average of existing probe files, with its confidence interval,
integrated autocorrelation time, effective sample size, warm-up cut and drift test. The files
(folders are searched through) are grouped into series, each reported on its own: a solver
function's file in start-time folders (output/probes/0/U, output/probes/2000/U) or numbered
restart folders (run1/, run2/) is one restarted run, read in the order of its first times, with
rows whose time is not after the last one read skipped as restart overlap. Files that are not
time series (logs, binary files, tables of text) are left out, each with its reason.

By default every column except the time column gets its mean.

options:
  --time COL            time column, by name or 1-based number (default: the first column)
  --means LIST          columns whose mean is estimated: all (default), none, or a,b,c
  --variance LIST       add the variance <x'x'> of each listed column (or all)
  --rms LIST            add the rms sqrt(<x'x'>) of each listed column (or all)
  --covariance A,B      add the covariance <a'b'>, e.g. the Reynolds shear stress (repeatable)
  --third-moment A,B,C  add the third moment <a'b'c'>, columns may repeat: u,u,v (repeatable)
  --tke U,V,W           add the turbulent kinetic energy (<u'u'>+<v'v'>+<w'w'>)/2 (repeatable)
  --confidence C        confidence level of the intervals (default 0.95)
  --batches K           number of non-overlapping batches (default 20)
  --warmup W            auto (MSER-5, default), none, or a time before which samples are dropped
  --blocks N            blocks kept per statistic (default 4096; memory per statistic)
  --scale COL=F         multiply column COL by F before any statistic, e.g. a solver's sign
                        convention tau.x=-1 or a density (repeatable)
  --weighting W         auto (default): each sample weighs the simulated time it stands for
                        when the first spacings vary by more than 1 %, else counts once;
                        time or samples to choose
  --json                one JSON object instead of the table

exit status: 0 analysed, 2 bad usage or unusable input.
)";
}

int RunAnalyzeCommand(const std::vector<std::string>& args, std::ostream& out, std::ostream& err) {
  std::string error;
  const std::optional<AnalyzeOptions> parsed = ParseOptions(args, &error);
  if (!parsed) {
    err << "plateau analyze: " << error << "\n";
    return 2;
  }
  const AnalyzeOptions& options = *parsed;
  if (options.help) {
    out << AnalyzeUsage();
    return 0;
  }
  for (const std::string& path : options.files) {
    // A file named outright (no wildcard) must exist: say so as the system does.
    std::error_code ec;
    if (path.find_first_of("*?[") == std::string::npos && !std::filesystem::exists(path, ec)) {
      err << "plateau analyze: cannot open " << path << ": No such file or directory\n";
      return 2;
    }
  }
  const SeriesCatalog catalog = CatalogSeries(options.files, options.time_column);
  for (const std::string& a : catalog.unmatched) {
    err << "plateau analyze: " << a << " names no file\n";
  }
  for (const LeftOutFile& f : catalog.left_out) {
    err << "plateau analyze: left out " << f.path << ": " << f.reason << "\n";
  }
  if (catalog.series.empty()) {
    err << "plateau analyze: no time series to analyze in what was given\n";
    return 2;
  }
  AnalysisResult result;
  result.options = options.evaluation;
  result.left_out = catalog.left_out;
  result.notes = catalog.notes;
  std::map<std::string, bool> request_used;  // by statistic name: did any series take it?
  for (const Series& series : catalog.series) {
    std::vector<StatisticRequest> requests = BuildRequests(options, series.first().columns);
    if (catalog.series.size() > 1) {
      // Several series: a statistic named by its columns goes to every series that has them.
      std::vector<StatisticRequest> fitting;
      for (const StatisticRequest& r : requests) {
        const bool fits = std::all_of(r.columns.begin(), r.columns.end(), [&](const std::string& c) {
          return ResolveColumn(series.first().columns, c) >= 0;
        });
        request_used[r.name] = request_used[r.name] || fits;
        if (fits) fitting.push_back(r);
      }
      requests = std::move(fitting);
    }
    SourceAnalysis analysis;
    analysis.name = series.name;
    analysis.series = series.glob;
    std::optional<SourceStatistics> source;
    for (const SegmentSample& segment : series.segments) {
      FileSummary summary;
      summary.path = segment.path;
      RowParser parser = ParserFor(segment.path);
      AnalyzeSink sink(options, requests, source, summary, analysis.notes);
      const FileReadResult read =
          ReadProbeFile(segment.path, 0, parser, sink, [&] { return sink.error().empty(); });
      if (!read.ok) {
        err << "plateau analyze: " << read.error << "\n";
        return 2;
      }
      if (!sink.error().empty()) {
        err << "plateau analyze: " << sink.error() << "\n";
        return 2;
      }
      summary.bad_lines = parser.bad_lines();
      summary.unterminated_last_line = parser.pending_bytes() > 0;
      analysis.files.push_back(std::move(summary));
    }
    if (!source) continue;  // the file lost its rows since it was catalogued
    source->SettleWeighting();  // a short series: fewer rows than the choice waits for
    if (source->gate().current_overlap().samples > 0) {
      const TimeOrderGate::Overlap& o = source->gate().current_overlap();
      analysis.notes.push_back("restart overlap: the last " + std::to_string(o.samples) +
                               " rows (times " + FormatValue(o.first_time) + " to " +
                               FormatValue(o.last_time) + ") were not after earlier rows; skipped");
    }
    analysis.spacing = source->spacing();
    analysis.columns = source->columns();
    analysis.time_column = source->columns()[source->time_index()];
    for (const Statistic& statistic : source->statistics()) {
      analysis.estimates.push_back(statistic.Evaluate(options.evaluation));
      source->AddTimeScales(analysis.estimates.back());
    }
    analysis.statistic_columns = source->statistic_columns();
    result.sources.push_back(std::move(analysis));
  }
  for (const auto& [name, used] : request_used) {
    if (!used) {
      err << "plateau analyze: " << name << ": no series has all its columns (each series' "
             "columns are listed by --json under sources)\n";
      return 2;
    }
  }
  const bool anything = std::any_of(result.sources.begin(), result.sources.end(),
                                    [](const SourceAnalysis& a) { return !a.estimates.empty(); });
  if (!anything) {
    err << "plateau analyze: nothing to estimate (--means none and no other statistic asked)\n";
    return 2;
  }
  out << (options.json ? FormatAnalysisJson(result) : FormatAnalysisTable(result));
  return 0;
}

}  // namespace plateau
