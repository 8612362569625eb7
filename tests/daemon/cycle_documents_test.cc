// The documents a user's scripts read, pinned: `plateau analyze --json`, `plateau status --json` and
// the status table, made from the demo's run (its solver, its config) by the real monitor driven
// with fixed wall-clock times, compared with the copies committed in tests/daemon/fixtures/
// demo_cycle/. A redesign that changes a key, an order, a state or a number fails here.
//
// The fixtures were written by this test itself (PLATEAU_WRITE_DEMO_DOCUMENTS=1 writes them into
// the source tree) before the typed cycle model replaced the JSON strings of each snapshot: they
// are "before", every later build is "after". Numbers are compared to 1e-12 relative so that a
// sanitizer build's different instruction choices cannot fail the test on the last bit.
#include <gtest/gtest.h>
#include <sys/wait.h>

#include <cmath>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>
#include <string>
#include <vector>

#include "config/config_loader.h"
#include "daemon/commands/analyze_command.h"
#include "daemon/monitoring/run_monitor.h"
#include "daemon/presentation/json_document.h"
#include "daemon/presentation/status_report.h"
#include "daemon/runtime/run_logger.h"
#include "tests/daemon/run_folder.h"

namespace plateau {
namespace {

namespace fs = std::filesystem;
using Json = nlohmann::ordered_json;

const fs::path kFixtures = fs::path(PLATEAU_TEST_DATA_DIR) / "daemon/fixtures/demo_cycle";
constexpr double kFirstWall = 1.8e9;  // 2027-01-15 08:00 UTC: any fixed instant will do
constexpr double kCycleSeconds = 2.0;  // demo/channel.yaml's evaluate_every

std::string ReadText(const fs::path& path) {
  std::ifstream in(path, std::ios::binary);
  std::stringstream text;
  text << in.rdbuf();
  return text.str();
}

void WriteText(const fs::path& path, const std::string& text) {
  std::ofstream(path, std::ios::binary) << text;
}

void ReplaceAll(std::string& text, const std::string& from, const std::string& to) {
  for (std::size_t at = text.find(from); at != std::string::npos; at = text.find(from, at)) {
    text.replace(at, from.size(), to);
    at += to.size();
  }
}

// The first place where two documents differ, as "path: expected vs actual"; empty when equal
// (numbers to 1e-12 relative).
std::string FirstDifference(const Json& expected, const Json& actual, const std::string& path) {
  if (expected.is_number() && actual.is_number()) {
    const double e = expected.get<double>();
    const double a = actual.get<double>();
    if (e == a || std::abs(e - a) <= 1e-12 * std::max(std::abs(e), std::abs(a))) return "";
    return path + ": " + expected.dump() + " vs " + actual.dump();
  }
  if (expected.type() != actual.type() || expected.size() != actual.size()) {
    return path + ": " + expected.dump().substr(0, 200) + " vs " + actual.dump().substr(0, 200);
  }
  if (expected.is_object()) {
    auto a = actual.begin();
    for (auto e = expected.begin(); e != expected.end(); ++e, ++a) {
      if (e.key() != a.key()) return path + ": key " + e.key() + " vs " + a.key();
      const std::string d = FirstDifference(e.value(), a.value(), path + "." + e.key());
      if (!d.empty()) return d;
    }
    return "";
  }
  if (expected.is_array()) {
    for (std::size_t i = 0; i < expected.size(); ++i) {
      const std::string d =
          FirstDifference(expected[i], actual[i], path + "[" + std::to_string(i) + "]");
      if (!d.empty()) return d;
    }
    return "";
  }
  return expected == actual ? "" : path + ": " + expected.dump() + " vs " + actual.dump();
}

class CycleDocuments : public testing::RunFolder {
 protected:
  // The demo solver's whole output, written at once (deterministic: its signals are seeded).
  void WriteSolverOutput(const fs::path& into) {
    fs::create_directories(into);
    const std::string command = std::string(PLATEAU_DEMO_SOLVER) + " --out " + into.string() +
                                " --speed-up 1000000 --duration 160 --restart-pause 0 > " +
                                (into / "solver.log").string() + " 2>&1";
    ASSERT_EQ(std::system(command.c_str()), 0) << command;
  }

  // The series' files in time order (segment 0 before the restart's), each with its full text.
  static std::vector<std::pair<fs::path, std::string>> SeriesFiles(const fs::path& output) {
    std::vector<std::pair<fs::path, std::string>> files;
    for (const auto& entry : fs::recursive_directory_iterator(output)) {
      if (entry.is_regular_file()) files.emplace_back(entry.path(), ReadText(entry.path()));
    }
    std::sort(files.begin(), files.end(), [](const auto& a, const auto& b) {
      const auto start = [](const fs::path& p) { return std::stod(p.parent_path().filename()); };
      const fs::path sa = a.first.parent_path().parent_path();
      const fs::path sb = b.first.parent_path().parent_path();
      return sa != sb ? sa < sb : start(a.first) < start(b.first);
    });
    return files;
  }

  // The files as they stand after `fraction` of each series' bytes, cut at a line end: the first
  // segment completes before the restart's appears, as a solver writes them.
  static void WriteGrowth(const fs::path& from, const fs::path& to,
                          const std::vector<std::pair<fs::path, std::string>>& files,
                          double fraction) {
    std::map<fs::path, std::size_t> series_bytes;
    for (const auto& [path, text] : files) series_bytes[path.parent_path().parent_path()] += text.size();
    std::map<fs::path, std::size_t> budget;
    for (const auto& [series, bytes] : series_bytes) {
      budget[series] = static_cast<std::size_t>(fraction * static_cast<double>(bytes));
    }
    for (const auto& [path, text] : files) {
      std::size_t& left = budget[path.parent_path().parent_path()];
      std::size_t size = std::min(left, text.size());
      if (size < text.size()) {
        const std::size_t end = text.rfind('\n', size == 0 ? 0 : size - 1);
        size = end == std::string::npos || size == 0 ? 0 : end + 1;
      }
      left -= std::min(left, text.size());
      if (size == 0) continue;
      const fs::path target = to / fs::relative(path, from);
      fs::create_directories(target.parent_path());
      WriteText(target, text.substr(0, size));
    }
  }

  static std::string DemoConfig() {
    std::string yaml = ReadText(fs::path(PLATEAU_SOURCE_DIR) / "demo/channel.yaml");
    // No e-mail (as demo/run without an SMTP server): cut from "  email:" to "    timeout:".
    const std::size_t begin = yaml.find("  email:");
    const std::size_t end = yaml.find('\n', yaml.find("    timeout:", begin));
    yaml.erase(begin, end + 1 - begin);
    return yaml;
  }
};

TEST_F(CycleDocuments, AnalyzeAndStatusOfTheDemoRunAreAsBefore) {
  const fs::path generated = dir_ / "generated";
  const fs::path run = dir_ / "run";
  WriteSolverOutput(generated);
  fs::create_directories(run);
  fs::copy_file(generated / "reichardt_u_plus.dat", run / "reichardt_u_plus.dat");
  WriteText(run / "channel.yaml", DemoConfig());
  std::vector<ConfigError> errors;
  std::optional<RunConfig> config = LoadRunConfig((run / "channel.yaml").string(), &errors);
  ASSERT_TRUE(config) << (errors.empty() ? "" : errors[0].ToString());
  Result<std::unique_ptr<RunStore>> store =
      RunStore::OpenForWriting(config->store_path, config->run_name);
  ASSERT_TRUE(store.ok()) << store.error();

  // Twelve cycles while the files grow, then four more after the solver has stopped.
  const auto files = SeriesFiles(generated / "output");
  RunMonitor monitor(std::move(*config), std::move(store).value(), MakeSilentLogger());
  monitor.Restore();
  double wall = kFirstWall;
  for (int cycle = 1; cycle <= 16; ++cycle) {
    WriteGrowth(generated, run, files, std::min(1.0, cycle / 12.0));
    wall += kCycleSeconds;
    while (monitor.Poll(wall)) {
    }
    ASSERT_TRUE(monitor.Evaluate(wall).ok());
  }
  ASSERT_TRUE(monitor.run_met()) << "the pinned run should show the demo's outcome";

  const Result<std::unique_ptr<RunStore>> reader = RunStore::OpenForReading(monitor.store().path());
  ASSERT_TRUE(reader.ok()) << reader.error();
  const Result<std::optional<LatestView>> latest = (*reader)->ReadLatest();
  ASSERT_TRUE(latest.ok() && *latest) << latest.error();
  const std::optional<LatestView>& view = *latest;
  StatusContext context;
  context.store_path = "RUN/plateau.db";
  context.answered_by = "store";
  context.now = wall + 1.0;
  std::string status_json = StatusJson(*view, context);
  std::string status_table = StatusTable(*view, context);
  // The daemon's path: status reads its JSON answer back into a view and shows the same table.
  StatusContext read_back;
  read_back.now = context.now;  // the reader's own clock, as plateau status sets it
  const std::optional<LatestView> from_json =
      LatestViewFromJson(*ParseJsonDocument(status_json), &read_back);
  ASSERT_TRUE(from_json);
  EXPECT_EQ(StatusTable(*from_json, read_back), status_table);

  std::vector<std::string> args = {"--json"};
  for (const auto& [path, text] : files) args.push_back((run / fs::relative(path, generated)).string());
  std::ostringstream out, err;
  ASSERT_EQ(RunAnalyzeCommand(args, out, err), 0) << err.str();
  std::string analyze_json = out.str();
  for (std::string* text : {&status_json, &status_table, &analyze_json}) {
    ReplaceAll(*text, run.string(), "RUN");
  }

  if (std::getenv("PLATEAU_WRITE_DEMO_DOCUMENTS") != nullptr) {
    fs::create_directories(kFixtures);
    WriteText(kFixtures / "status.json", status_json + "\n");
    WriteText(kFixtures / "status.txt", status_table);
    WriteText(kFixtures / "analyze.json", analyze_json);
    GTEST_SKIP() << "wrote the documents into " << kFixtures << "; compare them by eye, then commit";
  }
  EXPECT_EQ(FirstDifference(Json::parse(ReadText(kFixtures / "status.json")),
                            Json::parse(status_json), "status"),
            "");
  EXPECT_EQ(FirstDifference(Json::parse(ReadText(kFixtures / "analyze.json")),
                            Json::parse(analyze_json), "analyze"),
            "");
  EXPECT_EQ(ReadText(kFixtures / "status.txt"), status_table);
}

}  // namespace
}  // namespace plateau
