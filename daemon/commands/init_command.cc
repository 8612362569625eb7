#include "daemon/commands/init_command.h"

#include <glob.h>

#include <cmath>
#include <filesystem>
#include <map>
#include <optional>
#include <set>
#include <sstream>

#include "config/config_loader.h"
#include "daemon/commands/command_line.h"
#include "daemon/ingest/series_catalog.h"
#include "daemon/presentation/number_format.h"

namespace plateau {
namespace {

namespace fs = std::filesystem;

// Regular files a glob matches now.
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

std::string Quoted(const std::string& text) {
  std::string out = "\"";
  for (char c : text) {
    if (c == '"' || c == '\\') out += '\\';
    out += c;
  }
  return out + "\"";
}

// The columns of a source as one comment: all of them when few, else the first ones and a count.
std::string ColumnList(const std::vector<std::string>& columns) {
  constexpr std::size_t kShown = 8;
  std::string list;
  for (std::size_t c = 0; c < columns.size() && c < kShown; ++c) list += " " + columns[c];
  if (columns.size() > kShown) list += " ... (" + std::to_string(columns.size()) + " in all)";
  return list;
}

// A line of probes for a profile: consecutive probe numbers, three components each, locations
// that differ along one coordinate only and increase along it.
struct ProbeLine {
  int coordinate = -1;  // 0, 1, 2 for x, y, z
  int first_id = 0;
  std::vector<double> positions;
};

std::optional<ProbeLine> ProbeLineOf(const SegmentSample& s) {
  const std::vector<ProbeLocation>& probes = s.probes;
  if (probes.size() < 3 || s.columns.size() != 1 + 3 * probes.size()) return std::nullopt;
  for (std::size_t p = 0; p < probes.size(); ++p) {
    if (probes[p].id != probes[0].id + static_cast<int>(p) || std::isnan(probes[p].position[0])) {
      return std::nullopt;
    }
  }
  for (int k = 0; k < 3; ++k) {
    bool others_fixed = true;
    bool increasing = true;
    for (std::size_t p = 1; p < probes.size(); ++p) {
      increasing = increasing && probes[p].position[k] > probes[p - 1].position[k];
      for (int j = 0; j < 3; ++j) {
        if (j != k) others_fixed = others_fixed && probes[p].position[j] == probes[0].position[j];
      }
    }
    if (others_fixed && increasing) {
      ProbeLine line{k, probes[0].id, {}};
      for (const ProbeLocation& l : probes) line.positions.push_back(l.position[k]);
      return line;
    }
  }
  return std::nullopt;
}

// Returns true when the entry was written as it stands, false when commented out.
bool WriteProfile(const Series& series, const ProbeLine& line, std::ostream& raw) {
  const char axis = "xyz"[line.coordinate];
  const std::string field = series.first().segment.file_stem;
  // Written as it stands only when the coordinates are wall distances from a wall at 0 (they grow
  // from 0); otherwise commented out, since only the user knows where the wall is.
  bool from_zero = line.positions.front() >= 0.0;
  for (std::size_t p = 1; p < line.positions.size(); ++p) {
    from_zero = from_zero && std::fabs(line.positions[p]) > std::fabs(line.positions[p - 1]);
  }
  std::ostringstream out;
  out << "  - name: " << Quoted(series.name) << "    # a line of " << line.positions.size()
      << " probes along " << axis << "\n"
      << "    source: " << Quoted(series.name) << "\n"
      << "    # The probes' " << axis << " coordinates from the file's header. They are wall "
      << "distances only\n    # if the wall is at " << axis << " = 0: otherwise give the wall's "
      << axis << " coordinate as wall_at.\n"
      << "    positions: [";
  for (std::size_t p = 0; p < line.positions.size(); ++p) {
    out << (p == 0 ? "" : ", ") << line.positions[p];
  }
  out << "]\n    wall_at: 0\n"
      << "    columns: {u: " << Quoted(field + "[{i}].x") << ", v: " << Quoted(field + "[{i}].y")
      << ", w: " << Quoted(field + "[{i}].z") << "}\n"
      << "    first_index: " << line.first_id << "\n"
      << "    quantities: [U, uu, vv, ww, uv, k]   # monitored: give a target to wait for them\n";
  if (from_zero) {
    raw << out.str();
    return true;
  }
  raw << "  # The probes' distances from " << axis << " = 0 do not grow along the line: set wall_at "
      << "to the wall's\n  # " << axis << " coordinate and remove the '#' of the lines below.\n";
  std::istringstream lines(out.str());
  for (std::string l; std::getline(lines, l);) raw << "  #" << l << "\n";
  return false;
}

// A column that holds a wall shear stress, by the names solvers and users give it (a
// `wallShearStress` field's x component, a `tau...` column, or any first signal of a series whose
// folder says wall shear); empty when none. A guess: the proposal it feeds stays commented out.
std::string WallShearColumn(const Series& series) {
  const std::vector<std::string>& columns = series.first().columns;
  const auto ends_with_x = [](const std::string& c) {
    return c.size() > 2 && c.compare(c.size() - 2, 2, ".x") == 0;
  };
  for (std::size_t i = 1; i < columns.size(); ++i) {
    const std::string& c = columns[i];
    if (c.find("wallShearStress") != std::string::npos && ends_with_x(c)) return c;
    if (c.rfind("tau", 0) == 0 && (c.find('.') == std::string::npos || ends_with_x(c))) return c;
  }
  const std::string& folder = series.first().segment.series_folder;
  const bool shear_folder = folder.find("allShear") != std::string::npos;
  return shear_folder && columns.size() > 1 ? columns[1] : "";
}

// The name init gives the mean of `column`: the column itself, or "<source>/<column>" where
// several sources have a column of that name.
std::string MeanName(const Series& s, const std::string& column,
                     const std::map<std::string, int>& column_uses) {
  return column_uses.at(column) > 1 ? s.name + "/" + column : column;
}

void WriteWallUnitsProposal(const std::vector<Series>& series,
                            const std::map<std::string, int>& column_uses, std::ostream& out) {
  for (const Series& s : series) {
    const std::string column = WallShearColumn(s);
    if (column.empty()) continue;
    out << "\n# Wall units (y+, U+): series '" << s.name << "' holds a wall shear stress. To use "
        << "it, remove the\n# '#' below and fill in what is marked. A solver's wall shear stress is "
        << "often kinematic\n# (m^2/s^2: then density 1) and its streamwise component negative: "
        << "add to the source\n#   scale: {" << Quoted(column) << ": -1}\n"
        << "# wall_units:\n"
        << "#   wall_shear: " << Quoted(MeanName(s, column, column_uses))
        << "   # its mean, defined above\n"
        << "#   viscosity: FILL_IN        # kinematic viscosity, m^2/s\n"
        << "#   density: FILL_IN          # kg/m^3; 1 when the wall shear stress is kinematic\n"
        << "#   half_height: FILL_IN      # channel half-height, for Re_tau and the momentum "
        << "balance\n";
    return;
  }
}

void WriteConfig(const SeriesCatalog& catalog, const std::vector<std::string>& patterns,
                 double relative, double confidence, std::ostream& out) {
  std::string from;
  for (const std::string& p : patterns) from += (from.empty() ? "" : " ") + p;
  out << "# plateau run configuration, written by plateau init from: " << from << "\n"
      << "# Paths are relative to this file's folder. Every key is explained in plateau's\n"
      << "# README; check a change with: plateau validate THIS_FILE\n";
  for (const LeftOutFile& f : catalog.left_out) out << "# left out: " << f.path << ": " << f.reason << "\n";
  for (const std::string& n : catalog.notes) out << "# note: " << n << "\n";
  out << "run: " << Quoted(fs::current_path().filename().string()) << "\n"
      << "store: plateau.db          # the SQLite store: snapshots, events, checkpoint\n"
      << "evaluate_every: 60         # seconds between evaluations\n"
      << "poll_every: 10             # seconds between looks at the files (inotify is sooner)\n"
      << "warmup: auto               # MSER + fitted-decay start-up cut; or none, or a time\n"
      << "confirmations: 3           # evaluations in a row a target must hold to count as met\n"
      << "max_half_width_uncertainty: 0.2   # the half-width itself known to ±20 % to count as met\n\n"
      << "# One source per series: a solver function's file, its restart segments in time order.\n"
      << "sources:\n";
  std::map<std::string, int> column_uses;
  for (const Series& s : catalog.series) {
    const SegmentSample& first = s.first();
    for (std::size_t c = 1; c < first.columns.size(); ++c) ++column_uses[first.columns[c]];
    out << "  - name: " << Quoted(s.name) << "    # " << s.segments.size()
        << (s.segments.size() == 1 ? " segment" : " segments") << ", columns:"
        << ColumnList(first.columns) << "\n"
        << "    files: " << Quoted(s.glob) << "\n"
        << "    time_column: " << Quoted(first.columns.front()) << "\n";
  }
  out << "\n# A mean per data column, each to a relative half-width of " << relative * 100
      << " % at " << confidence * 100 << " % confidence.\n# Other kinds: variance, rms, "
      << "covariance (2 columns), third_moment (3), tke (3).\nstatistics:\n";
  for (const Series& s : catalog.series) {
    const SegmentSample& first = s.first();
    for (std::size_t c = 1; c < first.columns.size(); ++c) {
      const std::string& column = first.columns[c];
      const std::string name = MeanName(s, column, column_uses);
      out << "  - name: " << Quoted(name) << "\n"
          << "    source: " << Quoted(s.name) << "\n"
          << "    kind: mean\n"
          << "    columns: [" << Quoted(column) << "]\n";
      // A mean smaller than the fluctuations (a cross-stream velocity, a lift coefficient) has no
      // useful relative half-width: give it an absolute one, relative to its standard deviation.
      const double mean = first.mean[c];
      const double deviation = first.deviation[c];
      if (deviation > 0.0 && std::fabs(mean) < deviation) {
        const std::string absolute = PrintfNumber("%.3g", relative * deviation);
        out << "    # mean about zero in the first rows (" << mean << ", standard deviation "
            << deviation << "):\n    # an absolute target of " << relative
            << " times the standard deviation\n"
            << "    target: {absolute: " << absolute << ", confidence: " << confidence << "}\n";
      } else {
        out << "    target: {relative: " << relative << ", confidence: " << confidence << "}\n";
      }
    }
  }
  std::ostringstream profiles;
  bool any_active = false;
  for (const Series& s : catalog.series) {
    if (const std::optional<ProbeLine> line = ProbeLineOf(s.first())) {
      any_active = WriteProfile(s, *line, profiles) || any_active;
    }
  }
  if (!profiles.str().empty()) out << (any_active ? "\nprofiles:\n" : "\n# profiles:\n") << profiles.str();
  WriteWallUnitsProposal(catalog.series, column_uses, out);
}

// A check for --relative and --confidence.
CLI::Validator FractionCheck() {
  return ValueCheck(
      [](const std::string& v) {
        const auto f = FiniteNumber(v);
        return f && *f > 0.0 && *f < 1.0;
      },
      "takes a fraction between 0 and 1");
}

struct InitOptions {
  std::vector<std::string> patterns;
  double relative = 0.01;
  double confidence = 0.95;
};

// The command line of init, declared once: the parser and the --help text.
std::unique_ptr<CLI::App> InitCommandLine(InitOptions& o) {
  auto app = MakeCommandLine("init", R"(Reads the headers of the probe files under the folders or matched by the globs (quote them:
'output/*/*/*') and writes a commented starter config to stdout: one source per series (a solver
function's file, its restart segments in start-time folders such as output/probes/0/U and
output/probes/2000/U taken as one), a mean statistic per data column, each with a relative target
R at confidence C; a profile for a line of probes; a wall-units proposal where a wall shear stress
is found. Files that are not time series (logs, binary files, tables of text) are left out, each
with its reason on stderr.)",
                             "example: plateau init output --relative 0.01 > run.yaml");
  app->add_option("patterns", o.patterns, "folders or quoted globs of probe files")
      ->type_name("DIR_OR_GLOB");
  app->add_option("--relative", o.relative, "relative half-width of every target (default 0.01)")
      ->check(FractionCheck())
      ->type_name("R")
      ->multi_option_policy(CLI::MultiOptionPolicy::TakeLast);
  app->add_option("--confidence", o.confidence, "confidence level of the targets (default 0.95)")
      ->check(FractionCheck())
      ->type_name("C")
      ->multi_option_policy(CLI::MultiOptionPolicy::TakeLast);
  return app;
}

// The command line of validate: one config.
std::unique_ptr<CLI::App> ValidateCommandLine(std::string& config_path) {
  auto app = MakeCommandLine("validate",
                             "Checks a config the way plateau watch would, without starting "
                             "anything: every problem is listed as FILE:LINE:COLUMN.",
                             "exit status: 0 valid, 2 not.");
  app->add_option("config", config_path, "the run's config")->type_name("CONFIG");
  return app;
}

}  // namespace

std::string InitUsage() {
  InitOptions ignored;
  return InitCommandLine(ignored)->help();
}

std::string ValidateUsage() {
  std::string ignored;
  return ValidateCommandLine(ignored)->help();
}

int RunInitCommand(const std::vector<std::string>& args, std::ostream& out, std::ostream& err) {
  InitOptions o;
  if (const auto exit_code = ParseCommandLine(*InitCommandLine(o), args, out, err)) {
    return *exit_code;
  }
  const std::vector<std::string>& patterns = o.patterns;
  if (patterns.empty()) {
    err << "plateau init: no probe files given (see plateau init --help)\n";
    return 2;
  }
  const SeriesCatalog catalog = CatalogSeries(patterns);
  for (const LeftOutFile& f : catalog.left_out) {
    err << "plateau init: left out " << f.path << ": " << f.reason << "\n";
  }
  for (const std::string& n : catalog.notes) err << "plateau init: note: " << n << "\n";
  if (catalog.series.empty()) {
    err << "plateau init: no probe file with data matched";
    for (const std::string& p : patterns) err << " " << p;
    err << "\n";
    return 2;
  }
  WriteConfig(catalog, patterns, o.relative, o.confidence, out);
  return 0;
}

int RunValidateCommand(const std::vector<std::string>& args, std::ostream& out,
                       std::ostream& err) {
  std::string config_path;
  if (const auto exit_code = ParseCommandLine(*ValidateCommandLine(config_path), args, out, err)) {
    return *exit_code;
  }
  if (config_path.empty()) {
    err << "plateau validate: no config file given (see plateau validate --help)\n";
    return 2;
  }
  std::vector<ConfigError> errors;
  const std::optional<RunConfig> config = LoadRunConfig(config_path, &errors);
  if (!config) {
    for (const ConfigError& e : errors) err << e.ToString() << "\n";
    err << config_path << ": " << errors.size() << (errors.size() == 1 ? " problem" : " problems")
        << "\n";
    return 2;
  }
  out << config_path << ": valid: run '" << config->run_name << "', " << config->sources.size()
      << (config->sources.size() == 1 ? " source, " : " sources, ")
      << config->statistics.size() << " statistics, store " << config->store_path << "\n";
  for (const SourceConfig& s : config->sources) {
    out << "  source '" << s.name << "': " << Expand(s.files).size() << " files match "
        << s.files << " now\n";
  }
  return 0;
}

}  // namespace plateau
