// A temporary run folder for tests of the real daemon: probe rows written as a solver would, the
// config, short-lived plateau commands, and what the store says. Test-only; one per test.
#ifndef PLATEAU_TESTS_DAEMON_RUN_FOLDER_H_
#define PLATEAU_TESTS_DAEMON_RUN_FOLDER_H_

#include <gtest/gtest.h>
#include <unistd.h>

#include <atomic>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <optional>

#include "store/run_store.h"
#include "tests/core/synthetic_series.h"
#include "tests/daemon/plateau_process.h"

namespace plateau::testing {

// AR(1) rows "time x y": x about 10 (phi 0.5), y about -3 (phi 0.8), times 0.01 apart.
class ProbeRows {
 public:
  explicit ProbeRows(std::size_t n, std::uint64_t seed = 3)
      : x_(Ar1(n, 0.5, seed, 10.0)), y_(Ar1(n, 0.8, seed + 1, -3.0)) {}
  std::string Rows(std::size_t from, std::size_t to) const {
    std::string text;
    char line[128];
    for (std::size_t i = from; i < to; ++i) {
      std::snprintf(line, sizeof line, "%.2f %.17g %.17g\n", 0.01 * i, x_[i], y_[i]);
      text += line;
    }
    return text;
  }
  std::size_t size() const { return x_.size(); }

 private:
  std::vector<double> x_, y_;
};

class RunFolder : public ::testing::Test {
 protected:
  void SetUp() override {
    // Short: the query socket's path must fit in 107 bytes.
    static std::atomic<int> counter{0};
    dir_ = std::filesystem::temp_directory_path() /
           ("plr" + std::to_string(::getpid()) + "_" + std::to_string(counter++));
    std::filesystem::remove_all(dir_);
    std::filesystem::create_directories(dir_);
  }
  // Kept when the test failed, or always with PLATEAU_KEEP_TEST_FOLDERS set (to look inside).
  void TearDown() override {
    if (!HasFailure() && std::getenv("PLATEAU_KEEP_TEST_FOLDERS") == nullptr) {
      std::filesystem::remove_all(dir_);
    } else {
      std::printf("run folder kept: %s\n", dir_.c_str());
    }
  }

  std::string Path(const std::string& name) const { return (dir_ / name).string(); }

  // run.yaml with one source (run*/probe.dat) and a mean of x to `target`, then `extra` YAML.
  void WriteConfig(const std::string& target = "{relative: 0.01}",
                   const std::string& extra_statistics = "", const std::string& settings = "") {
    std::ofstream(Path("run.yaml")) << "run: test\n"
                                       "confirmations: 3\n"
                                    << settings
                                    << "sources:\n"
                                       "  - name: probe\n"
                                       "    files: run*/probe.dat\n"
                                       "statistics:\n"
                                       "  - kind: mean\n"
                                       "    columns: [x]\n"
                                       "    target: "
                                    << target << "\n"
                                    << extra_statistics;
  }

  void Append(const std::string& file, const std::string& text) {
    std::filesystem::create_directories(std::filesystem::path(Path(file)).parent_path());
    std::ofstream(Path(file), std::ios::app) << text;
  }

  CommandResult Plateau(const std::vector<std::string>& args) {
    return RunPlateau(args, Path("command"));
  }

  std::optional<LatestView> Latest() {
    const auto store = RunStore::OpenForReading(Path(store_));
    if (!store.ok()) return std::nullopt;
    const auto latest = (*store)->ReadLatest();
    return latest.ok() ? *latest : std::nullopt;
  }

  std::vector<EventRow> Events() {
    const auto store = RunStore::OpenForReading(Path(store_));
    if (!store.ok()) return {};
    const auto events = (*store)->ReadEvents(0, 1000);
    return events.ok() ? *events : std::vector<EventRow>();
  }

  // samples_total of statistic `index` in the newest cycle; -1 before any cycle.
  std::int64_t Samples(std::size_t index = 0) {
    const auto v = Latest();
    if (!v || v->statistics.size() <= index) return -1;
    const nlohmann::ordered_json& document = v->statistics[index].document;
    return document.contains("samples_total") ? document["samples_total"].get<std::int64_t>() : -1;
  }

  std::filesystem::path dir_;
  std::string store_ = "plateau.db";  // relative to dir_, or absolute
};

}  // namespace plateau::testing

#endif  // PLATEAU_TESTS_DAEMON_RUN_FOLDER_H_
