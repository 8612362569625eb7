// A newcomer's first contact on a solver's output tree: init on the whole tree, validate, watch,
// status; and analyze on the tree in one call. The tree holds three series with the same column
// count (the case that once merged them into one source), a probe line, restart segments with
// overlapping times, a log and a binary file (tests/daemon/solver_tree.h).
#include <gtest/gtest.h>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <map>
#include <sstream>

#include "config/config_loader.h"
#include "daemon/commands/analyze_command.h"
#include "daemon/presentation/json_document.h"
#include "tests/daemon/run_folder.h"
#include "tests/daemon/solver_tree.h"

namespace plateau {
namespace {

namespace fs = std::filesystem;
using testing::ReadAll;
using testing::SolverTree;
using testing::WaitFor;
using testing::WatchDaemon;

class SolverTreeRun : public testing::RunFolder {
 protected:
  void SetUp() override {
    RunFolder::SetUp();
    tree_.WriteRestartedRun(dir_ / "output");
  }

  // `plateau analyze ARGS --json` in process, parsed.
  JsonDocument Analyze(const std::vector<std::string>& args) {
    std::vector<std::string> all = args;
    all.push_back("--json");
    std::ostringstream out, err;
    EXPECT_EQ(RunAnalyzeCommand(all, out, err), 0) << err.str();
    auto json = ParseJsonDocument(out.str());
    EXPECT_TRUE(json.ok()) << json.error();
    return json.ok() ? *json : JsonDocument();
  }

  // The daemon's log beside the config: init names the run after the folder it ran in.
  std::string LogPath() const {
    return Path(fs::current_path().filename().string() + ".plateau.log");
  }

  SolverTree tree_;
};

// Statistic name -> its JSON object, for every statistic of an analyze or status document (which
// must outlive the map).
std::map<std::string, const JsonDocument*> ByName(const JsonDocument& document) {
  std::map<std::string, const JsonDocument*> named;
  if (const JsonDocument* list = FindMember(document, "statistics")) {
    for (const JsonDocument& s : *list) named[s.at("name").get<std::string>()] = &s;
  }
  return named;
}

TEST_F(SolverTreeRun, InitWritesOneSourcePerSeriesWithExactGlobsAndLeavesOutWhatIsNoSeries) {
  const auto init = Plateau({"init", Path("output")});
  ASSERT_EQ(init.exit_code, 0) << init.err;
  const std::string& yaml = init.out;
  for (const char* glob : {"output/wallShearLower/*/surfaceFieldValue.dat",
                           "output/wallShearUpper/*/surfaceFieldValue.dat",
                           "output/bulkVelocity/*/volFieldValue.dat", "output/probes/*/U"}) {
    EXPECT_NE(yaml.find("files: \"" + Path(glob) + "\""), std::string::npos) << glob << yaml;
  }
  for (const char* source : {"wallShearLower", "wallShearUpper", "bulkVelocity", "probes"}) {
    EXPECT_NE(yaml.find(std::string("- name: \"") + source + "\""), std::string::npos) << source;
  }
  // Named columns: per wall, per probe and component.
  EXPECT_NE(yaml.find("\"wallShearLower/areaAverage(wallShearStress).x\""), std::string::npos);
  EXPECT_NE(yaml.find("\"U[4].z\""), std::string::npos);
  EXPECT_EQ(yaml.find("col2"), std::string::npos);
  // The log and the binary file: one line each, with the reason.
  EXPECT_NE(init.err.find("left out " + Path("output/log.solver") + ": "), std::string::npos)
      << init.err;
  EXPECT_NE(init.err.find("left out " + Path("output/restart.bin") + ": binary data"),
            std::string::npos);
  // The probe line becomes a profile at the header's coordinates; wall units are proposed.
  EXPECT_NE(yaml.find("positions: [0.0048, 0.012, 0.031, 0.12, 0.5]"), std::string::npos) << yaml;
  EXPECT_NE(yaml.find("columns: {u: \"U[{i}].x\", v: \"U[{i}].y\", w: \"U[{i}].z\"}"),
            std::string::npos);
  EXPECT_NE(yaml.find("# wall_units:"), std::string::npos);

  std::ofstream(Path("run.yaml")) << yaml;
  const auto validate = Plateau({"validate", Path("run.yaml")});
  EXPECT_EQ(validate.exit_code, 0) << validate.err << yaml;
  EXPECT_NE(validate.out.find("4 sources"), std::string::npos) << validate.out;
  EXPECT_NE(validate.out.find("source 'wallShearLower': 2 files match"), std::string::npos);

  // The proposal, uncommented and filled in as its comment says, is a valid wall_units block.
  std::istringstream lines(yaml);
  std::string filled;
  bool in_proposal = false;
  for (std::string line; std::getline(lines, line);) {
    in_proposal = line == "# wall_units:" || (in_proposal && line.rfind("#   ", 0) == 0);
    if (in_proposal) {
      line = line.substr(2);
      const std::size_t fill = line.find("FILL_IN");
      if (fill != std::string::npos) line.replace(fill, 7, "1.5e-5");
    }
    filled += line + "\n";
  }
  std::vector<ConfigError> errors;
  const auto config = ParseRunConfig(filled, Path("filled.yaml"), &errors);
  ASSERT_TRUE(config.has_value()) << errors.front().ToString() << "\n" << filled;
  ASSERT_TRUE(config->wall_units.has_value());
  EXPECT_EQ(config->wall_units->wall_shear, "wallShearLower/areaAverage(wallShearStress).x");
}

TEST_F(SolverTreeRun, WatchedTreeCountsEverySampleOnceAndEqualsAnalyzeOnTheUncutSeries) {
  const auto init = Plateau({"init", Path("output")});
  ASSERT_EQ(init.exit_code, 0) << init.err;
  std::ofstream(Path("run.yaml")) << init.out;
  tree_.WriteUncut(dir_ / "uncut");

  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
  // Every statistic's row (profile summaries carry no count of their own) has every sample.
  const auto all_read = [&] {
    const auto v = Latest();
    if (!v) return false;
    std::size_t counted = 0;
    for (const SnapshotRow& s : v->statistics) {
      if (FindMember(s.document, "samples_total") == nullptr) continue;
      ++counted;
      if (NumberOr(s.document, "samples_total") != SolverTree::kRows) return false;
    }
    return counted == 3 * 3 + 15 + 5 * 6;
  };
  ASSERT_TRUE(WaitFor(all_read, 120)) << ReadAll(Path("watch.log"));
  const auto status = Plateau({"status", Path("run.yaml"), "--json"});
  ASSERT_EQ(status.exit_code, 0) << status.err;
  const auto document = ParseJsonDocument(status.out);
  ASSERT_TRUE(document.ok()) << document.error();
  const auto watched = ByName(*document);
  daemon.Signal(SIGTERM);
  EXPECT_EQ(daemon.Wait(30), 0);

  // init names a column used by several series "<source>/<column>", else by the column.
  std::size_t compared = 0;
  for (const SolverTree::SeriesText& series : tree_.series()) {
    const JsonDocument uncut = Analyze({Path("uncut/" + series.folder + "/" + series.file)});
    for (const auto& [column, analyzed] : ByName(uncut)) {
      auto it = watched.find(series.folder + "/" + column);
      if (it == watched.end()) it = watched.find(column);
      ASSERT_NE(it, watched.end()) << series.folder << " " << column;
      EXPECT_EQ(it->second->at("source").get<std::string>(), series.folder);
      EXPECT_EQ(it->second->at("samples_total").get<double>(), SolverTree::kRows);
      for (const char* key : {"mean", "half_width", "integrated_time"}) {
        const double expected = analyzed->at(key).get<double>();
        EXPECT_NEAR(it->second->at(key).get<double>(), expected, 1e-12 * std::fabs(expected))
            << column << " " << key;
      }
      ++compared;
    }
  }
  EXPECT_EQ(compared, 3u * 3u + 15u);
  // No segment was taken for another series' or refused for its header.
  const std::string log = ReadAll(LogPath());
  EXPECT_EQ(log.find("differs from"), std::string::npos) << log;
}

TEST_F(SolverTreeRun, AnalyzeReadsTheWholeTreeInOneCallOneSectionPerSeries) {
  const JsonDocument tree = Analyze({Path("output")});
  const JsonDocument* sources = FindMember(tree, "sources");
  ASSERT_NE(sources, nullptr);
  ASSERT_EQ(sources->size(), 4u);
  std::map<std::string, int> per_source;
  for (const JsonDocument& s : tree.at("statistics")) {
    ++per_source[s.at("source").get<std::string>()];
    EXPECT_EQ(s.at("samples_total").get<double>(), SolverTree::kRows) << s.at("name").get<std::string>();
  }
  EXPECT_EQ(per_source["wallShearLower"], 3);
  EXPECT_EQ(per_source["wallShearUpper"], 3);
  EXPECT_EQ(per_source["bulkVelocity"], 3);
  EXPECT_EQ(per_source["probes"], 15);
  ASSERT_EQ(tree.at("left_out").size(), 2u);
  // Each series' restart overlap skipped, never another series' rows.
  std::size_t overlap = 0;
  for (const JsonDocument& f : tree.at("files")) {
    overlap += static_cast<std::size_t>(f.at("restart_overlap").get<double>());
  }
  EXPECT_EQ(overlap, 4 * SolverTree::kOverlap);

  std::ostringstream table, err;
  ASSERT_EQ(RunAnalyzeCommand({Path("output")}, table, err), 0);
  EXPECT_NE(table.str().find("== source wallShearUpper: " +
                             Path("output/wallShearUpper/*/surfaceFieldValue.dat") + " =="),
            std::string::npos)
      << table.str();
  EXPECT_NE(table.str().find("left out " + Path("output/restart.bin")), std::string::npos);
}

TEST_F(SolverTreeRun, RestartSegmentWithAChangedHeaderIsNamedWithTheFirstAndNotMerged) {
  // The job restarted at 60 s with a sixth probe: another header in the same series.
  std::string header;
  for (int p = 0; p < 6; ++p) {
    header += "# Probe " + std::to_string(p) + " (2.05 " + std::to_string(0.01 * (p + 1)) +
              " 1.0333)\n";
  }
  header += "#  Probe  0  1  2  3  4  5\n#  Time\n";
  std::string rows;
  for (int i = 1; i <= 200; ++i) {
    rows += std::to_string(60 + 0.01 * i);
    for (int p = 0; p < 6; ++p) rows += " (0.5 0.01 0.0)";
    rows += "\n";
  }
  Append("output/probes/60/U", header + rows);
  const JsonDocument tree = Analyze({Path("output")});
  bool named = false;
  for (const JsonDocument& f : tree.at("left_out")) {
    const std::string& reason = f.at("reason").get<std::string>();
    if (f.at("path").get<std::string>() == Path("output/probes/60/U")) {
      named = reason.find("differs from that of " + Path("output/probes/0/U")) !=
              std::string::npos;
    }
  }
  EXPECT_TRUE(named) << "the changed segment is not left out naming the first one";
  for (const JsonDocument& s : tree.at("statistics")) {
    EXPECT_EQ(s.at("samples_total").get<double>(), SolverTree::kRows);  // nothing of it merged
  }

  // The daemon says the same in its log and ignores the file.
  const auto init = Plateau({"init", Path("output")});
  ASSERT_EQ(init.exit_code, 0) << init.err;
  EXPECT_NE(init.err.find("left out " + Path("output/probes/60/U")), std::string::npos);
  std::ofstream(Path("run.yaml")) << init.out;
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
  const std::string log_path = LogPath();
  ASSERT_TRUE(WaitFor([&] { return ReadAll(log_path).find("differs from that of") != std::string::npos; }, 60))
      << ReadAll(log_path) << ReadAll(Path("watch.log"));
  const std::string log = ReadAll(log_path);
  EXPECT_NE(log.find(Path("output/probes/60/U")), std::string::npos) << log;
  EXPECT_NE(log.find(Path("output/probes/0/U")), std::string::npos) << log;
  daemon.Signal(SIGTERM);
  EXPECT_EQ(daemon.Wait(30), 0);
}

TEST_F(SolverTreeRun, RestartSegmentWithAMovedProbeIsNotMergedEither) {
  // The job restarted at 60 s with probe 2 moved: the same column names, another location.
  const std::string header = tree_.series()[3].header;
  const std::string moved_header = std::string(header).replace(header.find("0.031"), 5, "0.045");
  std::string rows;
  for (int i = 1; i <= 200; ++i) {
    rows += std::to_string(60 + 0.01 * i);
    for (int p = 0; p < 5; ++p) rows += " (0.5 0.01 0.0)";
    rows += "\n";
  }
  Append("output/probes/60/U", moved_header + rows);
  const JsonDocument tree = Analyze({Path("output")});
  bool left_out = false;
  for (const JsonDocument& f : tree.at("left_out")) {
    left_out = left_out || f.at("path").get<std::string>() == Path("output/probes/60/U");
  }
  EXPECT_TRUE(left_out);

  const auto init = Plateau({"init", Path("output")});
  ASSERT_EQ(init.exit_code, 0) << init.err;
  std::ofstream(Path("run.yaml")) << init.out;
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
  const std::string log_path = LogPath();
  ASSERT_TRUE(WaitFor(
      [&] { return ReadAll(log_path).find("at other probe locations") != std::string::npos; }, 60))
      << ReadAll(log_path);
  EXPECT_NE(ReadAll(log_path).find(Path("output/probes/60/U")), std::string::npos);
  ASSERT_TRUE(WaitFor([&] { return Samples() == static_cast<std::int64_t>(SolverTree::kRows); },
                      60));
  daemon.Signal(SIGTERM);
  EXPECT_EQ(daemon.Wait(30), 0);
  const auto latest = Latest();
  ASSERT_TRUE(latest.has_value());
  for (const SnapshotRow& row : latest->statistics) {
    if (row.statistic.rfind("U[", 0) == 0) {
      EXPECT_EQ(NumberOr(row.document, "samples_total"), 6000) << row.statistic;
    }
  }
}

// The momentum balance of a channel held at a fixed flow rate: the solver writes the wall shear
// stress (negative, its sign convention) beside the driving pressure gradient it adjusts, and the
// mean shear must equal -delta <dP/dx> (Pope 2000, Sec. 7.1). Invented numbers: delta = 1,
// dP/dx about -2.8e-3, one common fluctuation in both (they are correlated).
TEST_F(SolverTreeRun, ScaledShearAgainstTheGradientSeriesIsJudgedOnTheJointSeries) {
  const std::vector<double> common = testing::Ar1(SolverTree::kRows, 0.95, 501, 0.0, 0.05);
  const std::vector<double> own = testing::Ar1(SolverTree::kRows, 0.5, 502, 0.0, 0.01);
  std::string text = "# Time  wallShear  gradient\n";
  char line[128];
  for (std::size_t i = 0; i < SolverTree::kRows; ++i) {
    std::snprintf(line, sizeof line, "%g %.12e %.12e\n", 0.01 * (i + 1),
                  -2.8e-3 * (1.0 + common[i] + own[i]), -2.8e-3 * (1.0 + common[i]));
    text += line;
  }
  Append("balance/0/balance.dat", text);
  std::ofstream(Path("run.yaml")) << R"(run: balance
sources:
  - name: balance
    files: "balance/*/balance.dat"
    scale: {wallShear: -1}
statistics:
  - {name: dpdx, kind: mean, columns: [gradient]}
  - name: tau_w
    kind: mean
    columns: [wallShear]
    reference: {statistic: dpdx, factor: -1}
)";
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
  ASSERT_TRUE(WaitFor([&] { return Samples(1) == static_cast<std::int64_t>(SolverTree::kRows); },
                      120))
      << ReadAll(Path("watch.log"));
  const auto status = Plateau({"status", Path("run.yaml"), "--json"});
  daemon.Signal(SIGTERM);
  EXPECT_EQ(daemon.Wait(30), 0);
  const auto document = ParseJsonDocument(status.out);
  ASSERT_TRUE(document.ok()) << document.error() << status.out;
  const auto named = ByName(*document);
  ASSERT_EQ(named.count("tau_w"), 1u);
  ASSERT_EQ(named.count("tau_w - reference"), 1u);  // the joint difference, averaged per sample
  const JsonDocument& tau = *named.at("tau_w");
  // The scale applies before any statistic: the same number analyze gives with --scale, and the
  // negative of the unscaled one.
  const JsonDocument analyzed_document =
      Analyze({Path("balance/0/balance.dat"), "--scale", "wallShear=-1"});
  const JsonDocument unscaled_document = Analyze({Path("balance/0/balance.dat")});
  const auto analyzed = ByName(analyzed_document);
  const auto unscaled = ByName(unscaled_document);
  const double mean = tau.at("mean").get<double>();
  EXPECT_GT(mean, 0.0);
  EXPECT_NEAR(mean, analyzed.at("wallShear")->at("mean").get<double>(), 1e-12 * mean);
  EXPECT_NEAR(mean, -unscaled.at("wallShear")->at("mean").get<double>(), 1e-12 * mean);
  const JsonDocument* reference = FindMember(tau, "reference");
  ASSERT_NE(reference, nullptr);
  EXPECT_EQ(reference->at("method").get<std::string>(), "joint_series");
  EXPECT_EQ(reference->at("statistic").get<std::string>(), "dpdx");
  EXPECT_EQ(reference->at("half_width").get<double>(),
            named.at("tau_w - reference")->at("half_width").get<double>());
  // Correlated: the joint interval of the difference is much narrower than tau_w's own.
  EXPECT_LT(reference->at("half_width").get<double>(), 0.5 * tau.at("half_width").get<double>());
  EXPECT_NE(reference->at("words").get<std::string>().find("sample by sample"), std::string::npos);
}

// A wake probe under a Courant-number controlled step, restarted once (the fixture of
// tests/core/fixtures/make_weighted_moments.py, split into two start-time folders): the daemon
// weighs each sample by the time it stands for, across the restart, says so in status, gives the
// integral time scale in time units and flow-throughs, and equals analyze on the whole file.
TEST_F(SolverTreeRun, CourantSteppedProbeIsTimeWeightedInWatchAndAnalyzeAlike) {
  const std::string fixture = PLATEAU_TEST_DATA_DIR "/core/fixtures/weighted_moments.dat";
  std::ifstream in(fixture);
  std::string header, first_half, second_half, restart_time;
  std::size_t rows = 0;
  for (std::string line; std::getline(in, line);) {
    if (line[0] == '#') {
      header += line + "\n";
      continue;
    }
    if (rows == 2500) restart_time = line.substr(0, line.find(' '));
    (rows < 2500 ? first_half : second_half) += line + "\n";
    ++rows;
  }
  ASSERT_EQ(rows, 5000u);
  Append("wake/0/velocity.dat", header + first_half);
  Append("wake/" + restart_time + "/velocity.dat", header + second_half);
  std::ofstream(Path("run.yaml")) << R"(run: wake
flow_through_time: 2.0
sources:
  - name: wake
    files: "wake/*/velocity.dat"
statistics:
  - {name: u, kind: mean, columns: [u]}
  - {name: uv, kind: covariance, columns: [u, v]}
)";
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
  ASSERT_TRUE(WaitFor([&] { return Samples(0) == 5000; }, 120)) << ReadAll(Path("watch.log"));
  const auto status = Plateau({"status", Path("run.yaml"), "--json"});
  const auto table = Plateau({"status", Path("run.yaml")});
  daemon.Signal(SIGTERM);
  EXPECT_EQ(daemon.Wait(30), 0);
  const auto document = ParseJsonDocument(status.out);
  ASSERT_TRUE(document.ok()) << document.error() << status.out;
  const JsonDocument& u = *ByName(*document).at("u");
  const JsonDocument* weighting = FindMember(u, "weighting");
  ASSERT_NE(weighting, nullptr) << status.out;
  EXPECT_TRUE(weighting->at("time_weighted").get<bool>());
  EXPECT_EQ(weighting->at("gaps").at("count").get<double>(), 0.0);
  EXPECT_LT(weighting->at("spacing").at("min").get<double>(),
            0.7 * weighting->at("spacing").at("max").get<double>());
  const double scale = u.at("integral_time_scale").get<double>();
  EXPECT_NEAR(scale, u.at("integrated_time").get<double>() * u.at("unit_time").get<double>(),
              1e-12 * scale);
  EXPECT_NEAR(u.at("integral_time_flow_throughs").get<double>(), scale / 2.0, 1e-12 * scale);
  EXPECT_GT(u.at("averaging_flow_throughs").get<double>(), 1.0);
  EXPECT_NE(table.out.find("source wake: samples weighted by simulated time"), std::string::npos)
      << table.out;

  const JsonDocument analyzed_document = Analyze({fixture, "--covariance", "u,v"});
  const auto analyzed = ByName(analyzed_document);
  ASSERT_EQ(analyzed.count("u"), 1u);
  EXPECT_TRUE(analyzed_document.at("sources")[0].at("weighting").at("time_weighted").get<bool>());
  for (const auto& [watched_name, analyzed_name] :
       std::vector<std::pair<std::string, std::string>>{{"u", "u"}, {"uv", "cov(u,v)"}}) {
    const JsonDocument& w = *ByName(*document).at(watched_name);
    for (const char* key : {"mean", "half_width", "integrated_time", "integral_time_scale"}) {
      const double expected = analyzed.at(analyzed_name)->at(key).get<double>();
      EXPECT_NEAR(w.at(key).get<double>(), expected, 1e-12 * std::fabs(expected))
          << watched_name << " " << key;
    }
  }
}

}  // namespace
}  // namespace plateau
