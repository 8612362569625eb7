// Soak: the real daemon over many sources and statistics for a bounded time, while the solver
// writes, dies and restarts into new folders (with overlapping times) and status and check
// clients ask all the while. The daemon's memory must stay flat once its histories are full, its
// file descriptors must not grow, every sample must be counted exactly once, and no event may be
// recorded twice. PLATEAU_SOAK_SECONDS sets the length (default 120; hours for a real soak:
//   PLATEAU_SOAK_SECONDS=14400 build/release/tests/soak_tests).
#include <gtest/gtest.h>

#include <atomic>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <map>
#include <set>
#include <thread>
#include <tuple>

#include "store/run_store.h"
#include "tests/daemon/run_folder.h"

namespace plateau {
namespace {

namespace fs = std::filesystem;
using testing::ReadAll;
using testing::WaitFor;
using testing::WatchDaemon;

constexpr int kSources = 8;
constexpr int kColumns = 16;          // per source, besides time
constexpr int kRowsPerTick = 40;      // per source, every 100 ms: 400 rows/s each
constexpr double kRestartEvery = 15;  // seconds between solver restarts
constexpr int kRestartOverlap = 100;  // rows the restarted solver writes again

double SoakSeconds() {
  const char* text = std::getenv("PLATEAU_SOAK_SECONDS");
  return text != nullptr ? std::atof(text) : 120.0;
}

// Resident memory (VmRSS, KiB) and open descriptors of a process, from /proc.
struct Footprint {
  long rss_kib = 0;
  long descriptors = 0;
};

Footprint FootprintOf(pid_t pid) {
  Footprint f;
  std::ifstream status("/proc/" + std::to_string(pid) + "/status");
  for (std::string line; std::getline(status, line);) {
    if (line.rfind("VmRSS:", 0) == 0) f.rss_kib = std::atol(line.c_str() + 6);
  }
  std::error_code ignored;
  for (auto it = fs::directory_iterator("/proc/" + std::to_string(pid) + "/fd", ignored);
       it != fs::directory_iterator(); ++it) {
    ++f.descriptors;
  }
  return f;
}

class Soak : public testing::RunFolder {
 protected:
  // Sources s0..s7 (run*/s<k>.dat); per source a mean per column, and a variance and a
  // covariance: 8 x 18 = 144 statistics.
  void WriteSoakConfig() {
    std::ofstream config(Path("run.yaml"));
    config << "run: soak\nconfirmations: 3\nalerts:\n  events: [met, lost, run_met, run_lost, "
              "drift]\nsources:\n";
    for (int s = 0; s < kSources; ++s) {
      config << "  - {name: s" << s << ", files: \"run*/s" << s << ".dat\"}\n";
    }
    config << "statistics:\n";
    for (int s = 0; s < kSources; ++s) {
      for (int c = 0; c < kColumns; ++c) {
        config << "  - {name: s" << s << "_c" << c << ", source: s" << s
               << ", kind: mean, column: c" << c << ", target: {relative: 0.002}}\n";
      }
      config << "  - {name: s" << s << "_var, source: s" << s
             << ", kind: variance, column: c0, target: {relative: 0.02}}\n";
      config << "  - {name: s" << s << "_cov, source: s" << s
             << ", kind: covariance, columns: [c0, c1]}\n";
    }
  }

  // One row of source s at step i: AR(1)-like values about 5 + c, deterministic.
  static std::string Row(int s, long i) {
    std::string row = std::to_string(0.01 * i);
    for (int c = 0; c < kColumns; ++c) {
      const double noise = std::sin(0.37 * i + 1.3 * c + s) + 0.5 * std::sin(0.011 * i * (c + 1));
      row += " " + std::to_string(5.0 + c + noise);
    }
    return row + "\n";
  }

  static std::string Header() {
    std::string header = "# time";
    for (int c = 0; c < kColumns; ++c) header += " c" + std::to_string(c);
    return header + "\n";
  }
};

TEST_F(Soak, FlatMemoryNoDescriptorLeakEverySampleOnceNoEventTwice) {
  const double seconds = SoakSeconds();
  WriteSoakConfig();
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"), 0.5, 0.2);
  const pid_t pid = daemon.pid();

  std::atomic<bool> running{true};
  std::atomic<long> rows_written{0};  // distinct steps written per source: the highest step
  std::atomic<int> restarts{0};
  std::thread solver([&] {
    int run = 1;
    long step = 0;
    auto run_started = std::chrono::steady_clock::now();
    const auto open_run = [&](int r) {
      for (int s = 0; s < kSources; ++s) {
        Append("run" + std::to_string(r) + "/s" + std::to_string(s) + ".dat", Header());
      }
    };
    open_run(run);
    while (running) {
      for (int s = 0; s < kSources; ++s) {
        std::string chunk;
        for (long i = step; i < step + kRowsPerTick; ++i) chunk += Row(s, i);
        Append("run" + std::to_string(run) + "/s" + std::to_string(s) + ".dat", chunk);
      }
      step += kRowsPerTick;
      if (step > rows_written) rows_written = step;
      std::this_thread::sleep_for(std::chrono::milliseconds(100));
      if (std::chrono::steady_clock::now() - run_started >
          std::chrono::duration<double>(kRestartEvery)) {
        // The job dies; the next one restarts from a checkpoint a little earlier, in a new folder.
        ++run;
        ++restarts;
        step -= kRestartOverlap;
        open_run(run);
        run_started = std::chrono::steady_clock::now();
      }
    }
  });

  // Clients from the first recorded cycle on (before it, "cannot tell" is the right answer).
  ASSERT_TRUE(WaitFor([&] { return Latest().has_value(); }, 10)) << ReadAll(Path("watch.log"));
  std::atomic<int> answers{0}, failures{0};
  const auto client = [&](std::vector<std::string> args, const std::string& scratch) {
    while (running) {
      const int code = testing::RunPlateau(args, Path(scratch)).exit_code;
      (code == 0 || code == 1 ? answers : failures)++;
    }
  };
  std::thread status_client(client, std::vector<std::string>{"status", "--json", Path("run.yaml")},
                            "status_client");
  std::thread check_client(client, std::vector<std::string>{"check", Path("run.yaml")},
                           "check_client");

  std::vector<Footprint> samples;
  const auto start = std::chrono::steady_clock::now();
  while (std::chrono::steady_clock::now() - start < std::chrono::duration<double>(seconds)) {
    std::this_thread::sleep_for(std::chrono::milliseconds(2000));
    ASSERT_TRUE(daemon.Running()) << ReadAll(Path("watch.log"));
    samples.push_back(FootprintOf(pid));
  }
  running = false;
  solver.join();
  status_client.join();
  check_client.join();

  // Every sample once: each source's statistics saw exactly the distinct steps written.
  const std::int64_t expected = rows_written;
  ASSERT_TRUE(WaitFor([&] { return Samples() == expected; }, 30))
      << Samples() << " of " << expected << "\n"
      << ReadAll(Path("soak.plateau.log"));
  const auto latest = Latest();
  ASSERT_TRUE(latest);
  for (const SnapshotRow& s : latest->statistics) {
    if (s.profile.empty() && s.kind != RowKind::kGroup) {
      EXPECT_EQ(s.document.value("samples_total", std::int64_t{-1}),
                static_cast<std::int64_t>(expected))
          << s.statistic;
    }
  }

  // Memory: the histories fill within the first seconds (4096 blocks at 400 rows/s); from the
  // end of the first quarter on the resident size may wander but not grow.
  ASSERT_GE(samples.size(), 8u);
  const std::size_t quarter = samples.size() / 4;
  long early_rss = 0, late_rss = 0, early_fds = 0, late_fds = 0;
  for (std::size_t i = quarter; i < 2 * quarter; ++i) {
    early_rss = std::max(early_rss, samples[i].rss_kib);
    early_fds = std::max(early_fds, samples[i].descriptors);
  }
  for (std::size_t i = samples.size() - quarter; i < samples.size(); ++i) {
    late_rss = std::max(late_rss, samples[i].rss_kib);
    late_fds = std::max(late_fds, samples[i].descriptors);
  }
  std::printf(
      "soak %.0f s: %d solver restarts, %d status/check answers (%d failed); rss %ld -> "
      "%ld KiB, descriptors %ld -> %ld\n",
      seconds, restarts.load(), answers.load(), failures.load(), early_rss, late_rss, early_fds,
      late_fds);
  EXPECT_LE(late_rss, early_rss + early_rss / 10);
  EXPECT_LE(late_fds, early_fds + 2);  // a client's connection may be open at either moment
  EXPECT_GE(restarts.load(), static_cast<int>(seconds / kRestartEvery) - 1);
  EXPECT_EQ(failures.load(), 0);
  EXPECT_GT(answers.load(), 20);

  // No event twice: one row per kind, statistic and moment; met and lost alternate.
  std::set<std::tuple<std::string, std::string, double>> seen;
  std::map<std::string, std::string> last_of;
  for (const EventRow& e : Events()) {
    const std::string kind(EventKindName(e.kind));
    EXPECT_TRUE(seen.insert({kind, e.statistic, e.simulated_time}).second)
        << kind << " " << e.statistic << " at " << e.simulated_time;
    if (kind == "met" || kind == "lost") {
      EXPECT_NE(last_of[e.statistic], kind) << e.statistic << ": " << kind << " twice";
      last_of[e.statistic] = kind;
    }
  }
  daemon.Signal(SIGTERM);
  EXPECT_EQ(daemon.Wait(20), 0);
  const auto store = RunStore::OpenForReading(Path("plateau.db"));
  ASSERT_TRUE(store.ok()) << store.error();
  EXPECT_TRUE((*store)->CheckIntegrity().ok());
}

}  // namespace
}  // namespace plateau
