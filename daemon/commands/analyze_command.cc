#include "daemon/commands/analyze_command.h"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <filesystem>
#include <limits>
#include <map>
#include <optional>

#include "core/row_parser.h"
#include "daemon/commands/command_line.h"
#include "core/source_statistics.h"
#include "daemon/presentation/analysis_report.h"
#include "daemon/presentation/number_format.h"
#include "daemon/presentation/analysis_result.h"
#include "daemon/ingest/probe_file_reader.h"
#include "daemon/ingest/series_catalog.h"
#include "daemon/ingest/series_sink.h"

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

// The command line of analyze, declared once: the parser and the --help text. Values are
// checked as they are read; the cross-option check (blocks against batches) is RunAnalyzeCommand's.
std::unique_ptr<CLI::App> AnalyzeCommandLine(AnalyzeOptions& o) {
  auto app = MakeCommandLine("analyze", R"(Estimates every requested time average of existing probe files, with its confidence interval,
integrated autocorrelation time, effective sample size, warm-up cut and drift test. The files
(folders are searched through) are grouped into series, each reported on its own: a solver
function's file in start-time folders (output/probes/0/U, output/probes/2000/U) or numbered
restart folders (run1/, run2/) is one restarted run, read in the order of its first times, with
rows whose time is not after the last one read skipped as restart overlap. Files that are not
time series (logs, binary files, tables of text) are left out, each with its reason.

By default every column except the time column gets its mean.)",
                             "exit status: 0 analysed, 2 bad usage or unusable input.");
  const auto one = CLI::MultiOptionPolicy::TakeLast;
  app->add_option("files", o.files, "probe files, folders (searched through) or globs")
      ->type_name("DIR_OR_FILE");
  app->add_option("--time", o.time_column,
                  "time column, by name or 1-based number (default: the first column)")
      ->type_name("COL")
      ->multi_option_policy(one);
  app->add_option("--means", o.means,
                  "columns whose mean is estimated: all (default), none, or a,b,c")
      ->type_name("LIST")
      ->multi_option_policy(one);
  const auto repeatable = [&](const char* name, std::vector<std::string>& lists,
                              const char* type, const char* what) {
    app->add_option(name, lists, what)->type_name(type)->allow_extra_args(false);
  };
  repeatable("--variance", o.variance_lists, "LIST",
             "add the variance <x'x'> of each listed column (or all)");
  repeatable("--rms", o.rms_lists, "LIST", "add the rms sqrt(<x'x'>) of each listed column (or all)");
  repeatable("--covariance", o.covariances, "A,B",
             "add the covariance <a'b'>, e.g. the Reynolds shear stress (repeatable)");
  repeatable("--third-moment", o.third_moments, "A,B,C",
             "add the third moment <a'b'c'>, columns may repeat: u,u,v (repeatable)");
  repeatable("--tke", o.tkes, "U,V,W",
             "add the turbulent kinetic energy (<u'u'>+<v'v'>+<w'w'>)/2 (repeatable)");
  app->add_option_function<double>(
         "--confidence", [&o](double c) { o.evaluation.confidence = c; },
         "confidence level of the intervals (default 0.95)")
      ->check(ValueCheck(
          [](const std::string& v) {
            const auto c = FiniteNumber(v);
            return c && *c > 0.0 && *c < 1.0;
          },
          "takes a fraction between 0 and 1, such as 0.95"))
      ->type_name("C")
      ->multi_option_policy(one);
  app->add_option_function<std::string>(
         "--batches",
         [&o](const std::string& v) { o.evaluation.batches = static_cast<int>(*FiniteNumber(v)); },
         "number of non-overlapping batches (default 20)")
      ->check(ValueCheck(
          [](const std::string& v) {
            const auto k = FiniteNumber(v);
            return k && *k == std::floor(*k) && *k >= 2 && *k <= 1000;
          },
          "takes a whole number from 2 to 1000 (20 to 30 is usual)"))
      ->type_name("K")
      ->multi_option_policy(one);
  app->add_option_function<std::string>(
         "--warmup",
         [&o](const std::string& v) {
           o.evaluation.warmup = v == "auto"   ? WarmupPolicy::kAuto
                                 : v == "none" ? WarmupPolicy::kNone
                                               : WarmupPolicy::kFixedTime;
           if (o.evaluation.warmup == WarmupPolicy::kFixedTime) {
             o.evaluation.warmup_time = *FiniteNumber(v);
           }
         },
         "auto (MSER, then a fitted decay; default), none, or a time before which samples are dropped")
      ->check(ValueCheck(
          [](const std::string& v) { return v == "auto" || v == "none" || FiniteNumber(v); },
          "takes auto, none or a time in the units of the time column"))
      ->type_name("W")
      ->multi_option_policy(one);
  app->add_option_function<std::string>(
         "--blocks",
         [&o](const std::string& v) { o.capacity = static_cast<std::size_t>(*FiniteNumber(v)); },
         "blocks kept per statistic (default 4096; memory per statistic)")
      ->check(ValueCheck(
          [](const std::string& v) {
            const auto c = FiniteNumber(v);
            return c && *c >= 64 && *c <= (1 << 24) && *c == std::floor(*c);
          },
          "takes a whole number from 64 to 16777216"))
      ->type_name("N")
      ->multi_option_policy(one);
  app->add_option_function<std::string>(
         "--scale",
         [&o](const std::string& v) {
           const std::size_t equals = v.rfind('=');
           o.scales.push_back({v.substr(0, equals), *FiniteNumber(v.substr(equals + 1))});
         },
         "multiply column COL by F first: a sign, tau.x=-1, or a density (repeatable)")
      ->check(ValueCheck(
          [](const std::string& v) {
            const std::size_t equals = v.rfind('=');
            if (equals == std::string::npos || equals == 0) return false;
            const auto factor = FiniteNumber(v.substr(equals + 1));
            return factor && *factor != 0.0;
          },
          "takes COLUMN=FACTOR with a factor other than 0, such as tau.x=-1"))
      ->type_name("COL=F")
      ->allow_extra_args(false);
  app->add_option_function<std::string>(
         "--weighting", [&o](const std::string& v) { o.weighting = *ParseWeighting(v); },
         "time (a sample weighs the time it stands for), samples, or auto (time if spacing varies)")
      ->check(ValueCheck([](const std::string& v) { return ParseWeighting(v).has_value(); },
                         "takes auto, time or samples"))
      ->type_name("W")
      ->multi_option_policy(one);
  app->add_flag("--json", o.json, "one JSON object instead of the table");
  return app;
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

// What the series sink meets while analyze reads a segment: the series' statistics made from the
// first header, notes for restart overlaps, the first bad lines of each file as examples, and an
// error that stops the command (a column the options name is missing; the catalog has already
// left out segments with another header, so a refused one is a guard that should not fire).
class AnalyzeOwner : public SeriesSinkOwner {
 public:
  AnalyzeOwner(const AnalyzeOptions& options, const std::vector<StatisticRequest>& requests,
               std::optional<SourceStatistics>& source, FileSummary& summary,
               std::vector<std::string>& notes)
      : options_(options), requests_(requests), source_(source), summary_(summary), notes_(notes) {}

  const std::string& error() const { return error_; }

  void StartSeries(const std::vector<std::string>& names, const std::string& path) override {
    Result<SourceStatistics> made =
        SourceStatistics::Make(names, options_.time_column, requests_, options_.capacity);
    if (!made.ok()) {
      error_ = path + ": " + made.error();
      return;
    }
    source_ = std::move(made).value();
    if (!source_->problems().empty()) {
      error_ = path + ": " + source_->problems().front().message;
      return;
    }
    source_->SetWeighting(options_.weighting);
    if (const Status scaled = source_->SetScales(options_.scales); !scaled.ok()) {
      error_ = path + ": " + scaled.message();
    }
  }

  void RefuseSegment(const std::string&, const std::string& reason) override { error_ = reason; }

  void ReportOverlap(const TimeOrderGate::Overlap& o, const std::string& path) override {
    notes_.push_back("restart overlap: " + std::to_string(o.samples) + " rows with times " +
                     FormatValue(o.first_time) + " to " + FormatValue(o.last_time) +
                     " were already recorded and were skipped (" + path + ")");
  }

  void ReportBadLine(const std::string& path, std::uint64_t line,
                     std::string_view reason) override {
    if (summary_.bad_line_examples.size() < kBadLineExamplesPerFile) {
      summary_.bad_line_examples.push_back(path + ":" + std::to_string(line) + ": " +
                                           std::string(reason));
    }
  }

 private:
  const AnalyzeOptions& options_;
  const std::vector<StatisticRequest>& requests_;
  std::optional<SourceStatistics>& source_;
  FileSummary& summary_;
  std::vector<std::string>& notes_;
  std::string error_;
};

}  // namespace

std::string AnalyzeUsage() {
  AnalyzeOptions ignored;
  return AnalyzeCommandLine(ignored)->help();
}

int RunAnalyzeCommand(const std::vector<std::string>& args, std::ostream& out, std::ostream& err) {
  AnalyzeOptions options;
  if (const auto exit_code = ParseCommandLine(*AnalyzeCommandLine(options), args, out, err)) {
    return *exit_code;
  }
  if (options.files.empty()) {
    err << "plateau analyze: no probe file given (see plateau analyze --help)\n";
    return 2;
  }
  if (options.capacity < 4 * static_cast<std::size_t>(options.evaluation.batches)) {
    err << "plateau analyze: --blocks must be at least four times --batches\n";
    return 2;
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
    const std::vector<std::string> header_names;  // no `columns:` here: the header names them
    SeriesIngest ingest;
    std::optional<SourceStatistics>& source = ingest.source;
    for (const SegmentSample& segment : series.segments) {
      FileSummary summary;
      summary.path = segment.path;
      SegmentRows rows;
      RowParser parser = ParserFor(segment.path);
      AnalyzeOwner owner(options, requests, source, summary, analysis.notes);
      SeriesSink sink(ingest, rows, segment.path, parser, header_names, owner);
      const Result<std::uint64_t> read =
          ReadProbeFile(segment.path, 0, parser, sink, [&] { return owner.error().empty(); });
      if (!read.ok()) {
        err << "plateau analyze: " << read.error() << "\n";
        return 2;
      }
      if (!owner.error().empty()) {
        err << "plateau analyze: " << owner.error() << "\n";
        return 2;
      }
      summary.rows = rows.rows;
      summary.restart_overlap = rows.overlap_rows;
      summary.first_time = rows.first_recorded_time;
      summary.last_time = rows.last_recorded_time;
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
