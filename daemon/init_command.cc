#include "daemon/init_command.h"

#include <glob.h>

#include <charconv>
#include <cmath>
#include <filesystem>
#include <map>
#include <optional>
#include <set>
#include <sstream>

#include "config/config_loader.h"
#include "core/row_parser.h"
#include "core/source_statistics.h"
#include "daemon/probe_file_reader.h"

namespace plateau {
namespace {

namespace fs = std::filesystem;

struct FoundFile {
  std::string path;
  std::string pattern;  // the argument that matched it
};

// The files of one column layout, which become one source; with the mean and the standard
// deviation of each column over the first rows of its first file.
struct Layout {
  std::vector<std::string> columns;
  std::vector<FoundFile> files;
  std::vector<double> mean;
  std::vector<double> deviation;
};

// Rows read per file to see what the columns look like.
constexpr std::uint64_t kSampleRows = 5000;

std::vector<std::string> Expand(const std::string& pattern) {
  std::vector<std::string> paths;
  glob_t matches{};
  if (::glob(pattern.c_str(), 0, nullptr, &matches) == 0) {
    for (std::size_t i = 0; i < matches.gl_pathc; ++i) {
      if (fs::is_regular_file(matches.gl_pathv[i])) paths.emplace_back(matches.gl_pathv[i]);
    }
  }
  ::globfree(&matches);
  return paths;
}

// Column names of a file (empty when it has no data row yet) and, over its first rows, each
// column's mean and standard deviation (Welford's update).
Layout LayoutOf(const std::string& path) {
  struct Sample : RowSink {
    Layout layout;
    std::vector<double> sum_sq;
    std::uint64_t rows = 0;
    void OnColumns(const std::vector<std::string>& n) override {
      layout.columns = n;
      layout.mean.assign(n.size(), 0.0);
      sum_sq.assign(n.size(), 0.0);
    }
    void OnRow(std::uint64_t, const double* values) override {
      if (rows >= kSampleRows) return;
      ++rows;
      for (std::size_t c = 0; c < layout.columns.size(); ++c) {
        const double delta = values[c] - layout.mean[c];
        layout.mean[c] += delta / static_cast<double>(rows);
        sum_sq[c] += delta * (values[c] - layout.mean[c]);
      }
    }
    void OnBadLine(std::uint64_t, std::string_view) override {}
  } sample;
  RowParser parser;
  ReadProbeFile(path, 0, parser, sample, [&] { return sample.rows < kSampleRows; });
  for (double s : sample.sum_sq) {
    sample.layout.deviation.push_back(sample.rows > 1 ? std::sqrt(s / (sample.rows - 1)) : 0.0);
  }
  return sample.layout;
}

std::string Quoted(const std::string& text) {
  std::string out = "\"";
  for (char c : text) {
    if (c == '"' || c == '\\') out += '\\';
    out += c;
  }
  return out + "\"";
}

// The glob for one layout: the argument's folder with the shared file name, when the argument
// ended in a wildcard and every file of the layout has the same name.
std::string SourceGlob(const Layout& layout) {
  const std::string& pattern = layout.files.front().pattern;
  const std::string name = fs::path(layout.files.front().path).filename().string();
  bool same_name = true;
  for (const FoundFile& f : layout.files) {
    same_name = same_name && fs::path(f.path).filename().string() == name;
  }
  const fs::path p(pattern);
  if (same_name && p.filename().string().find_first_of("*?[") != std::string::npos) {
    return (p.parent_path() / name).string();
  }
  return pattern;
}

std::optional<double> Fraction(const std::string& text) {
  double value = 0.0;
  const auto [ptr, ec] = std::from_chars(text.data(), text.data() + text.size(), value);
  if (ec != std::errc() || ptr != text.data() + text.size() || !(value > 0.0) || value >= 1.0) {
    return std::nullopt;
  }
  return value;
}

void WriteConfig(const std::vector<Layout>& layouts, const std::vector<std::string>& patterns,
                 double relative, double confidence, std::ostream& out) {
  std::string from;
  for (const std::string& p : patterns) from += (from.empty() ? "" : " ") + p;
  out << "# plateau run configuration, written by plateau init from: " << from << "\n"
      << "# Paths are relative to this file's folder. Every key is explained in plateau's\n"
      << "# README; check a change with: plateau validate THIS_FILE\n"
      << "run: " << Quoted(fs::current_path().filename().string()) << "\n"
      << "store: plateau.db          # the SQLite store: snapshots, events, checkpoint\n"
      << "evaluate_every: 60         # seconds between evaluations\n"
      << "poll_every: 10             # seconds between looks at the files (inotify is sooner)\n"
      << "warmup: auto               # MSER start-up cut; or none, or a simulated time\n"
      << "confirmations: 3           # evaluations in a row a target must hold to count as met\n"
      << "minimum_effective_samples: 100\n\nsources:\n";
  std::map<std::string, int> column_uses;
  std::vector<std::string> source_names;
  std::set<std::string> taken;
  for (const Layout& layout : layouts) {
    std::string name = fs::path(layout.files.front().path).stem().string();
    for (int k = 2; taken.count(name) > 0; ++k) {
      name = fs::path(layout.files.front().path).stem().string() + "_" + std::to_string(k);
    }
    taken.insert(name);
    source_names.push_back(name);
    for (std::size_t c = 1; c < layout.columns.size(); ++c) ++column_uses[layout.columns[c]];
    std::string columns;
    for (const std::string& c : layout.columns) columns += " " + c;
    out << "  - name: " << Quoted(name) << "    # " << layout.files.size()
        << (layout.files.size() == 1 ? " file" : " files") << ", columns:" << columns << "\n"
        << "    files: " << Quoted(SourceGlob(layout)) << "\n"
        << "    time_column: " << Quoted(layout.columns.front()) << "\n";
  }
  out << "\n# A mean per data column, each to a relative half-width of " << relative * 100
      << " % at " << confidence * 100 << " % confidence.\n# Other kinds: variance, rms, "
      << "covariance (2 columns), third_moment (3), tke (3).\nstatistics:\n";
  for (std::size_t l = 0; l < layouts.size(); ++l) {
    for (std::size_t c = 1; c < layouts[l].columns.size(); ++c) {
      const std::string& column = layouts[l].columns[c];
      const std::string name =
          column_uses[column] > 1 ? source_names[l] + "/" + column : column;
      out << "  - name: " << Quoted(name) << "\n"
          << "    source: " << Quoted(source_names[l]) << "\n"
          << "    kind: mean\n"
          << "    columns: [" << Quoted(column) << "]\n";
      // A mean smaller than the fluctuations (a cross-stream velocity, a lift coefficient) has no
      // useful relative half-width: give it an absolute one, relative to its standard deviation.
      const double mean = layouts[l].mean[c];
      const double deviation = layouts[l].deviation[c];
      if (deviation > 0.0 && std::fabs(mean) < deviation) {
        char absolute[32];
        std::snprintf(absolute, sizeof absolute, "%.3g", relative * deviation);
        out << "    # mean about zero in the first rows (" << mean << ", standard deviation "
            << deviation << "):\n    # an absolute target of " << relative
            << " times the standard deviation\n"
            << "    target: {absolute: " << absolute << ", confidence: " << confidence << "}\n";
      } else {
        out << "    target: {relative: " << relative << ", confidence: " << confidence << "}\n";
      }
    }
  }
}

}  // namespace

std::string InitUsage() {
  return R"(usage: plateau init GLOB... [--relative R] [--confidence C] > run.yaml

Reads the headers of the probe files the globs match (quote them: 'probes/*/*.dat') and writes a
commented starter config to stdout: one source per file layout, a mean statistic per data column,
each with a relative target R (default 0.01) at confidence C (default 0.95).
)";
}

std::string ValidateUsage() {
  return R"(usage: plateau validate CONFIG

Checks a config the way plateau watch would, without starting anything: every problem is listed as
FILE:LINE:COLUMN. Exit status 0 valid, 2 not.
)";
}

int RunInitCommand(const std::vector<std::string>& args, std::ostream& out, std::ostream& err) {
  std::vector<std::string> patterns;
  double relative = 0.01;
  double confidence = 0.95;
  for (std::size_t i = 0; i < args.size(); ++i) {
    const std::string& a = args[i];
    if (a == "--help" || a == "-h") {
      out << InitUsage();
      return 0;
    }
    if (a == "--relative" || a == "--confidence") {
      const auto v = i + 1 < args.size() ? Fraction(args[++i]) : std::nullopt;
      if (!v) {
        err << "plateau init: " << a << " takes a fraction between 0 and 1\n";
        return 2;
      }
      (a == "--relative" ? relative : confidence) = *v;
    } else if (!a.empty() && a[0] == '-') {
      err << "plateau init: unknown option " << a << " (see plateau init --help)\n";
      return 2;
    } else {
      patterns.push_back(a);
    }
  }
  if (patterns.empty()) {
    err << "plateau init: no probe files given (see plateau init --help)\n";
    return 2;
  }
  std::vector<Layout> layouts;
  std::set<std::string> seen;
  for (const std::string& pattern : patterns) {
    for (const std::string& path : Expand(pattern)) {
      if (!seen.insert(path).second) continue;
      Layout found = LayoutOf(path);
      if (found.columns.size() < 2) {
        err << "plateau init: " << path << " has no data rows yet; left out\n";
        continue;
      }
      auto it = std::find_if(layouts.begin(), layouts.end(),
                             [&](const Layout& l) { return l.columns == found.columns; });
      if (it == layouts.end()) {
        layouts.push_back(std::move(found));
        it = layouts.end() - 1;
      }
      it->files.push_back({path, pattern});
    }
  }
  if (layouts.empty()) {
    err << "plateau init: no probe file with data matched";
    for (const std::string& p : patterns) err << " " << p;
    err << "\n";
    return 2;
  }
  WriteConfig(layouts, patterns, relative, confidence, out);
  return 0;
}

int RunValidateCommand(const std::vector<std::string>& args, std::ostream& out,
                       std::ostream& err) {
  if (args.size() != 1 || args[0] == "--help" || args[0] == "-h") {
    (args.size() == 1 ? out : err) << ValidateUsage();
    return args.size() == 1 ? 0 : 2;
  }
  std::vector<ConfigError> errors;
  const std::optional<RunConfig> config = LoadRunConfig(args[0], &errors);
  if (!config) {
    for (const ConfigError& e : errors) err << e.ToString() << "\n";
    err << args[0] << ": " << errors.size() << (errors.size() == 1 ? " problem" : " problems")
        << "\n";
    return 2;
  }
  out << args[0] << ": valid: run '" << config->run_name << "', " << config->sources.size()
      << (config->sources.size() == 1 ? " source, " : " sources, ")
      << config->statistics.size() << " statistics, store " << config->store_path << "\n";
  for (const SourceConfig& s : config->sources) {
    out << "  source '" << s.name << "': " << Expand(s.files).size() << " files match "
        << s.files << " now\n";
  }
  return 0;
}

}  // namespace plateau
