#include "daemon/commands/report_command.h"

#include <cmath>
#include <filesystem>
#include <fstream>
#include <map>
#include <memory>

#include "daemon/commands/command_line.h"
#include "daemon/presentation/number_format.h"
#include "daemon/presentation/json_document.h"
#include "daemon/commands/run_locator.h"
#include "daemon/presentation/svg_plot.h"
#include "store/run_store.h"

namespace plateau {
namespace {

namespace fs = std::filesystem;

constexpr std::size_t kMaxPlotPoints = 300;

const char* kStyle = R"css(
body { font-family: sans-serif; margin: 24px; color: #222; max-width: 1400px; }
h1 { font-size: 22px; } h2 { font-size: 18px; margin-top: 32px; } h3 { font-size: 15px; }
p.caution { background: #fff6e0; border-left: 4px solid #e0a000; padding: 8px 12px; }
table { border-collapse: collapse; font-size: 13px; }
td, th { border-bottom: 1px solid #ddd; padding: 3px 8px; text-align: right; }
td:first-child, th:first-child { text-align: left; }
.plots { display: flex; flex-wrap: wrap; gap: 8px; }
svg { background: #fff; border: 1px solid #eee; }
svg text { font-size: 11px; fill: #333; } svg text.title { font-size: 12px; font-weight: bold; }
.frame { fill: none; stroke: #999; } .grid { stroke: #eee; }
.value { fill: none; stroke: #1f5fa8; stroke-width: 1.5; }
.band { fill: #1f5fa8; fill-opacity: 0.18; stroke: none; }
.slope { fill: none; stroke: #999; stroke-dasharray: 5 3; }
.target { stroke: #c0392b; stroke-dasharray: 6 3; }
.reference { fill: none; stroke: #2e8b57; stroke-width: 1.5; stroke-dasharray: 4 2; }
.points { stroke: #1f5fa8; fill: #1f5fa8; }
.tau { stroke: #8e44ad; stroke-dasharray: 3 3; }
svg text.legend, svg text.marker { stroke: none; }
text.legend.value, text.legend.points { fill: #1f5fa8; } text.legend.reference { fill: #2e8b57; }
text.legend.slope { fill: #777; }
.state-met { color: #1e7d32; font-weight: bold; } .state-drifting { color: #c0392b; }
)css";

std::string Html(const std::string& text) { return SvgPlot::Escape(text); }

// The numbers of an array member (NaN for what is not a number); empty when absent.
std::vector<double> NumbersOf(const JsonDocument& object, const char* key) {
  std::vector<double> numbers;
  if (!object.is_object() || !object.contains(key) || !object[key].is_array()) return numbers;
  for (const JsonDocument& v : object[key]) {
    numbers.push_back(v.is_number() ? v.get<double>() : std::nan(""));
  }
  return numbers;
}

// Every n-th row, so that a plot has at most kMaxPlotPoints points (the last one always).
std::vector<const HistoryRow*> Thinned(const std::vector<const HistoryRow*>& rows) {
  if (rows.size() <= kMaxPlotPoints) return rows;
  std::vector<const HistoryRow*> out;
  const double step = static_cast<double>(rows.size() - 1) / (kMaxPlotPoints - 1);
  for (std::size_t i = 0; i < kMaxPlotPoints; ++i) {
    out.push_back(rows[static_cast<std::size_t>(std::round(i * step))]);
  }
  return out;
}

std::string StatisticSection(const SnapshotRow& latest, const JsonDocument& json,
                             const std::vector<const HistoryRow*>& history) {
  const std::string state(ConvergenceStateName(latest.state));
  std::string html = "<h3>" + Html(latest.statistic) + "</h3><p>";
  html += Html(FormatValue(latest.value) + " " + FormatHalfWidth(latest.half_width)) + " at " +
          Html(FormatPercent(latest.confidence)) + " confidence; <span class=\"state-" +
          state + "\">" + state + "</span>";
  if (!latest.state_reason.empty()) html += ": " + Html(latest.state_reason);
  if (const std::string decided = TextOr(json, "decided_by"); !decided.empty()) {
    html += "; decided by " + Html(decided);
  }
  const JsonDocument& reference = MemberOr(json, "reference");
  if (reference.is_object()) html += "<br>" + Html(TextOr(reference, "words"));
  html += "</p><div class=\"plots\">";
  const std::vector<const HistoryRow*> rows = Thinned(history);
  std::vector<double> t, value, low, high, averaged, half;
  for (const HistoryRow* r : rows) {
    const SnapshotRow& s = r->snapshot;
    t.push_back(s.last_time);
    value.push_back(s.value);
    low.push_back(s.value - s.half_width);
    high.push_back(s.value + s.half_width);
    averaged.push_back(s.last_time - s.warmup_end_time);
    half.push_back(s.half_width);
  }
  SvgPlot running("running value with its confidence band", "simulated time", latest.statistic);
  running.Band(t, low, high, "band");
  running.Line(t, value, "value", "value");
  if (reference.is_object()) {
    running.HorizontalLine(NumberOr(reference, "value"), "reference", "reference");
  }
  html += running.Render();
  SvgPlot shrink("half-width against averaging time", "averaging time", "half-width", true, true);
  shrink.Line(averaged, half, "value", "half-width");
  if (!averaged.empty() && averaged.back() > 0 && half.back() > 0) {
    // The 1/sqrt(T) law through the newest point, over the plotted range.
    std::vector<double> law;
    law.reserve(averaged.size());
    for (double a : averaged) law.push_back(half.back() * std::sqrt(averaged.back() / a));
    shrink.Line(averaged, law, "slope", "1/sqrt(T)");
  }
  if (std::isfinite(latest.target_half_width)) {
    shrink.HorizontalLine(latest.target_half_width, "target", "target");
  }
  html += shrink.Render();
  const JsonDocument& acf = MemberOr(json, "autocorrelation");
  if (acf.is_object() && acf.contains("rho")) {
    const double lag = NumberOr(acf, "lag_samples");
    const double tau = NumberOr(json, "integrated_time");
    // Out to about ten integrated times (at least 20 lags): where the correlation has died out.
    std::vector<double> rho = NumbersOf(acf, "rho");
    rho.resize(std::min(
        rho.size(),
        static_cast<std::size_t>(std::max(20.0, std::isfinite(tau) ? 10.0 * tau / lag : 0.0))));
    std::vector<double> lags;
    for (std::size_t k = 0; k < rho.size(); ++k) lags.push_back(static_cast<double>(k) * lag);
    SvgPlot correlation("autocorrelation (of the block series)", "lag [samples]", "rho");
    correlation.Line(lags, rho, "value", "");
    correlation.HorizontalLine(0.0, "grid", "");
    char label[128];
    const double scale = NumberOr(json, "integral_time_scale");
    if (std::isfinite(scale)) {
      std::snprintf(label, sizeof label, "tau = %.3g samples, T_int = %.3g in time", tau, scale);
    } else {
      std::snprintf(label, sizeof label, "tau = %.3g samples", tau);
    }
    correlation.VerticalLine(tau, "tau", label);
    html += correlation.Render();
  }
  return html + "</div>";
}

std::string ProfileSection(const JsonDocument& summary) {
  const std::string name = TextOr(summary, "name");
  const bool wall = MemberOr(summary, "wall_units").is_boolean() && summary["wall_units"].get<bool>();
  std::string html = "<h3>" + Html(name) + "</h3><p>" + Html(TextOr(summary, "state_reason")) +
                     "</p><div class=\"plots\">";
  if (summary.contains("departure")) {
    const std::vector<double> d = NumbersOf(summary, "departure");
    std::vector<double> y = NumbersOf(summary, "y_plus");
    y.resize(d.size(), std::nan(""));
    SvgPlot balance("total shear stress minus its line, in wall units", "y+", "departure", true);
    balance.Line(y, d, "value", "departure");
    balance.HorizontalLine(0.0, "reference", "exact balance");
    return html + balance.Render() + "</div>";
  }
  std::vector<double> y, v, e, reference_y, reference_v;
  const JsonDocument& points = MemberOr(summary, "points");
  for (const JsonDocument& p : points.is_array() ? points : JsonDocument::array()) {
    y.push_back(NumberOr(p, wall ? "y_plus" : "position"));
    v.push_back(NumberOr(p, wall ? "value_plus" : "value"));
    e.push_back(NumberOr(p, wall ? "half_width_plus" : "half_width"));
    if (p.contains("reference")) {
      reference_y.push_back(y.back());
      reference_v.push_back(NumberOr(p["reference"], "value"));
    }
  }
  const std::string quantity = TextOr(summary, "quantity");
  SvgPlot profile(name + (wall ? " in wall units" : ""), wall ? "y+" : "y",
                  quantity + (wall ? "+" : ""), wall);
  profile.Points(y, v, e, "points", "plateau, with half-widths");
  if (!reference_y.empty()) profile.Line(reference_y, reference_v, "reference", "reference");
  return html + profile.Render() + "</div>";
}

std::string CsvField(const std::string& text) {
  if (text.find_first_of(",\"\n") == std::string::npos) return text;
  std::string quoted = "\"";
  for (char c : text) quoted += c == '"' ? std::string("\"\"") : std::string(1, c);
  return quoted + "\"";
}

std::string CsvNumber(double v) {
  return std::isnan(v) ? "" : PrintfNumber("%.17g", v);
}

struct ReportOptions {
  std::string run, html_path, csv_path;
};

// The command line of report, declared once: the parser and the --help text.
std::unique_ptr<CLI::App> ReportCommandLine(ReportOptions& o) {
  auto app = MakeCommandLine("report", R"(Writes one self-contained HTML file (inline SVG; no network, no JavaScript): per statistic the
running value with its confidence band, the half-width against averaging time on log-log axes with
the 1/sqrt(T) slope and the target, and the autocorrelation with tau marked; per profile the values
against y+ with error bars, the reference where given, and the momentum balance.)",
                             "");
  app->add_option("run", o.run,
                  "the run: its config, its store or its folder (default: the current folder)")
      ->type_name("CONFIG|STORE|FOLDER");
  app->add_option("--out", o.html_path, "the HTML file (default: plateau-report.html beside the store)")
      ->type_name("FILE")
      ->multi_option_policy(CLI::MultiOptionPolicy::TakeLast);
  app->add_option("--csv", o.csv_path, "also write the snapshot history of every statistic and cycle")
      ->type_name("FILE")
      ->multi_option_policy(CLI::MultiOptionPolicy::TakeLast);
  return app;
}

}  // namespace

std::string ReportUsage() {
  ReportOptions ignored;
  return ReportCommandLine(ignored)->help();
}

int RunReportCommand(const std::vector<std::string>& args, std::ostream& out, std::ostream& err) {
  ReportOptions o;
  if (const auto exit_code = ParseCommandLine(*ReportCommandLine(o), args, out, err)) {
    return *exit_code;
  }
  const std::string& run = o.run;
  const std::string& csv_path = o.csv_path;
  std::string html_path = o.html_path;
  const LocatedRun located = LocateRun(run);
  if (located.store_path.empty()) {
    err << "plateau report: " << located.error << "\n";
    return 2;
  }
  const Result<std::unique_ptr<RunStore>> store = RunStore::OpenForReading(located.store_path);
  if (!store.ok()) {
    err << "plateau report: " << store.error() << "\n";
    return 2;
  }
  const Result<std::optional<LatestView>> read_latest = (*store)->ReadLatest();
  if (!read_latest.ok() || !*read_latest) {
    err << "plateau report: "
        << (read_latest.ok() ? "store " + located.store_path + " has no evaluation yet"
                             : read_latest.error())
        << "\n";
    return 2;
  }
  const std::optional<LatestView>& latest = *read_latest;
  const Result<std::vector<HistoryRow>> read_history = (*store)->ReadHistory();
  if (!read_history.ok()) {
    err << "plateau report: " << read_history.error() << "\n";
    return 2;
  }
  const std::vector<HistoryRow>& history = *read_history;
  if (html_path.empty()) {
    html_path = (fs::path(located.store_path).parent_path() / "plateau-report.html").string();
  }
  std::map<std::string, std::vector<const HistoryRow*>> by_statistic;
  for (const HistoryRow& h : history) by_statistic[h.snapshot.statistic].push_back(&h);

  std::string html = "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"><title>"
                     "plateau report: " + Html(latest->run_name) + "</title><style>" + kStyle +
                     "</style></head><body>";
  html += "<h1>plateau report: " + Html(latest->run_name) + "</h1><p>Cycle " +
          std::to_string(latest->cycle) + ", evaluated " + FormatUtcTime(latest->wall_time) +
          "; newest sample at simulated time " + Html(FormatValue(latest->last_sample_time)) +
          ". " +
          (latest->run_met ? "<b>Every target is met: the solver can stop.</b>"
                           : "Not every target is met yet.") +
          "</p><p class=\"caution\">These intervals measure sampling error only: how far each time "
          "average could still move if the same simulation ran longer. Statistical convergence is "
          "neither mesh convergence nor validation; engineering use defers to the applicable codes "
          "and licensed practice.</p>";
  std::string groups_html, statistics_html, profiles_html;
  for (const SnapshotRow& s : latest->statistics) {
    if (s.kind == RowKind::kGroup) {
      groups_html += "<tr><td>" + Html(s.statistic) + "</td><td>" +
                     std::string(ConvergenceStateName(s.state)) + "</td><td>" +
                     Html(s.state_reason) + "</td></tr>";
    } else if (s.kind == RowKind::kProfileSummary) {
      if (s.document.is_object()) profiles_html += ProfileSection(s.document);
    } else if (s.profile.empty()) {
      statistics_html += StatisticSection(s, s.document, by_statistic[s.statistic]);
    }
  }
  if (!groups_html.empty()) {
    html += "<h2>Groups</h2><table><tr><th>group</th><th>state</th><th>members</th></tr>" +
            groups_html + "</table>";
  }
  html += "<h2>Statistics</h2>" + statistics_html;
  if (!profiles_html.empty()) html += "<h2>Profiles</h2>" + profiles_html;
  html += "<p>Store " + Html(located.store_path) + ".</p></body></html>\n";
  std::ofstream html_file(html_path);
  html_file << html;
  if (!html_file) {
    err << "plateau report: cannot write " << html_path << "\n";
    return 2;
  }
  out << "report written to " << html_path << "\n";
  if (!csv_path.empty()) {
    std::ofstream csv(csv_path);
    csv << "cycle,wall_time,statistic,profile,state,value,half_width,relative_half_width,"
           "integrated_time,effective_samples,warmup_end_time,samples_used,last_time,confidence,"
           "target_half_width,remaining_time,integral_time_scale,averaging_time\n";
    for (const HistoryRow& h : history) {
      const SnapshotRow& s = h.snapshot;
      csv << h.cycle << "," << CsvNumber(h.wall_time) << "," << CsvField(s.statistic) << ","
          << CsvField(s.profile) << "," << ConvergenceStateName(s.state) << "," << CsvNumber(s.value) << ","
          << CsvNumber(s.half_width) << "," << CsvNumber(s.relative_half_width) << ","
          << CsvNumber(s.integrated_time) << "," << CsvNumber(s.effective_samples) << ","
          << CsvNumber(s.warmup_end_time) << "," << s.samples_used << "," << CsvNumber(s.last_time)
          << "," << CsvNumber(s.confidence) << "," << CsvNumber(s.target_half_width) << ","
          << CsvNumber(s.remaining_time) << "," << CsvNumber(s.integral_time_scale) << ","
          << CsvNumber(s.averaging_time) << "\n";
    }
    if (!csv) {
      err << "plateau report: cannot write " << csv_path << "\n";
      return 2;
    }
    out << "snapshot history written to " << csv_path << "\n";
  }
  return 0;
}

}  // namespace plateau
