// The real daemon on a temporary run folder: the test writes probe files as a solver would and
// reads what status, check and the store say.
#include <gtest/gtest.h>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <random>

#include "store/run_store.h"
#include "tests/daemon/run_folder.h"

namespace plateau {
namespace {

namespace fs = std::filesystem;
using testing::CommandResult;
using testing::ReadAll;
using testing::WaitFor;
using testing::WatchDaemon;

using testing::ProbeRows;

class WatchIntegration : public testing::RunFolder {};

TEST_F(WatchIntegration, FollowsGrowingFilesAndCheckSaysStopOnceMet) {
  const ProbeRows rows(12000);
  WriteConfig();
  Append("run1/probe.dat", "# time x y\n" + rows.Rows(0, 500));
  EXPECT_EQ(Plateau({"check", Path("run.yaml")}).exit_code, 2);  // no store yet: cannot tell
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
  ASSERT_TRUE(WaitFor([&] { return Samples() == 500; }, 10)) << ReadAll(Path("watch.log"));
  // A line written in two pieces waits for its newline.
  const std::string next = rows.Rows(500, 501);
  Append("run1/probe.dat", next.substr(0, 7));
  Append("run1/probe.dat", next.substr(7) + rows.Rows(501, 1000));
  ASSERT_TRUE(WaitFor([&] { return Samples() == 1000; }, 10));
  const CommandResult early = Plateau({"check", Path("run.yaml")});
  EXPECT_EQ(early.exit_code, 1) << early.err;
  EXPECT_NE(early.err.find("continue"), std::string::npos);
  // Enough data for 1 % on a mean of 10 with sigma_asym^2 = 4: about 1600 samples; three
  // evaluations with new data confirm it.
  for (std::size_t from = 1000; from < 12000; from += 1000) {
    Append("run1/probe.dat", rows.Rows(from, from + 1000));
    WaitFor([&] { return Samples() == static_cast<std::int64_t>(from + 1000); }, 10);
  }
  ASSERT_TRUE(WaitFor([&] { return Plateau({"check", Path("run.yaml")}).exit_code == 0; }, 10))
      << Plateau({"status", Path("run.yaml")}).out;
  const CommandResult stop = Plateau({"check", dir_.string()});
  EXPECT_NE(stop.err.find("stop: every target is met (1 of 1)"), std::string::npos) << stop.err;
  const CommandResult status = Plateau({"status", "--json", Path("run.yaml")});
  ASSERT_EQ(status.exit_code, 0) << status.err;
  for (const char* key : {"\"run_met\":true", "\"state\":\"met\"", "\"met_at\":{",
                          "\"integrated_time\":", "\"effective_samples\":", "\"half_width\":",
                          "\"decided_by\":", "\"daemon\":{\"running\":true"}) {
    EXPECT_NE(status.out.find(key), std::string::npos) << key;
  }
  daemon.Signal(SIGTERM);
  EXPECT_EQ(daemon.Wait(10), 0);
  const CommandResult after = Plateau({"status", Path("run.yaml")});
  EXPECT_EQ(after.exit_code, 0);
  EXPECT_NE(after.out.find("the daemon is not running"), std::string::npos);
  const auto store = RunStore::OpenForReading(Path("plateau.db"));
  ASSERT_TRUE(store.ok()) << store.error();
  const auto events = (*store)->ReadEvents(0, 10);
  ASSERT_TRUE(events.ok()) << events.error();
  ASSERT_EQ(events->size(), 2u);
  EXPECT_EQ((*events)[0].kind, EventKind::kMet);
  EXPECT_EQ((*events)[1].kind, EventKind::kRunMet);
}

TEST_F(WatchIntegration, RestartFolderWithOverlappingTimesIsCountedOnce) {
  const ProbeRows rows(3000);
  WriteConfig();
  Append("run1/probe.dat", "# time x y\n" + rows.Rows(0, 2000));
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
  ASSERT_TRUE(WaitFor([&] { return Samples() == 2000; }, 10));
  // The solver restarts from a checkpoint at t = 15 into a new folder.
  Append("run2/probe.dat", "# time x y\n" + rows.Rows(1500, 3000));
  ASSERT_TRUE(WaitFor([&] { return Samples() == 3000; }, 10)) << ReadAll(Path("watch.log"));
  EXPECT_NE(ReadAll(Path("test.plateau.log"))
                .find("skipped 500 samples with times 15 to 19.99, already recorded"),
            std::string::npos);
}

TEST_F(WatchIntegration, GarbageTruncationAndVanishingFilesNeverStopTheDaemon) {
  const ProbeRows rows(4000);
  WriteConfig();
  Append("run1/probe.dat", "# time x y\n" + rows.Rows(0, 1000) + "\x01\x02 binary junk\n" +
                               rows.Rows(1000, 1500));
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
  ASSERT_TRUE(WaitFor([&] { return Samples() == 1500; }, 10));
  auto v = Latest();
  ASSERT_TRUE(v);
  EXPECT_EQ(v->files.at(0).bad_lines, 1);
  // The solver rewrites its file from the start (shorter than what was read): read again, and the
  // times already recorded are skipped.
  std::ofstream(Path("run1/probe.dat"), std::ios::trunc) << "# time x y\n" << rows.Rows(0, 800);
  Append("run1/probe.dat", rows.Rows(800, 2500));
  ASSERT_TRUE(WaitFor([&] { return Samples() == 2500; }, 10)) << ReadAll(Path("watch.log"));
  // Rewritten and grown past the old offset before the daemon looked: the size alone cannot tell.
  EXPECT_NE(ReadAll(Path("test.plateau.log")).find("was rewritten"), std::string::npos);
  fs::remove(Path("run1/probe.dat"));
  ASSERT_TRUE(WaitFor(
      [&] { return ReadAll(Path("test.plateau.log")).find("vanished") != std::string::npos; }, 10));
  EXPECT_TRUE(daemon.Running());
  std::this_thread::sleep_for(std::chrono::milliseconds(500));
  EXPECT_EQ(Samples(), 2500);  // its statistics are kept
  EXPECT_EQ(Plateau({"status", Path("run.yaml")}).exit_code, 0);
}

TEST_F(WatchIntegration, SecondDaemonOnTheSameStoreRefusesAndNamesTheHolder) {
  WriteConfig();
  Append("run1/probe.dat", "# time x y\n" + ProbeRows(100).Rows(0, 100));
  WatchDaemon first(Path("run.yaml"), Path("watch.log"));
  ASSERT_TRUE(WaitFor([&] { return Samples() == 100; }, 10));
  const CommandResult second = Plateau({"watch", Path("run.yaml")});
  EXPECT_EQ(second.exit_code, 2);
  EXPECT_NE(second.err.find("in use by another plateau watch (process "), std::string::npos)
      << second.err;
}

TEST_F(WatchIntegration, MissingColumnIsReportedAndCheckCannotTell) {
  WriteConfig("{relative: 0.01}", "  - kind: mean\n    columns: [q]\n    target: {relative: 0.1}\n");
  Append("run1/probe.dat", "# time x y\n" + ProbeRows(200).Rows(0, 200));
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
  ASSERT_TRUE(WaitFor([&] { return Samples() == 200; }, 10));
  const CommandResult check = Plateau({"check", Path("run.yaml")});
  EXPECT_EQ(check.exit_code, 2);
  EXPECT_NE(check.err.find("no column 'q' (columns: time, x, y)"), std::string::npos) << check.err;
}

TEST_F(WatchIntegration, InvalidConfigRefusesToStartWithLineAndColumn) {
  std::ofstream(Path("run.yaml")) << "sources:\n  - name: probe\n    fils: x.dat\n";
  const CommandResult r = Plateau({"watch", Path("run.yaml")});
  EXPECT_EQ(r.exit_code, 2);
  EXPECT_NE(r.err.find(Path("run.yaml") + ":3:5: unknown key 'fils' in a source"),
            std::string::npos)
      << r.err;
  EXPECT_NE(r.err.find("not starting"), std::string::npos);
  EXPECT_EQ(Plateau({"validate", Path("run.yaml")}).exit_code, 2);
  EXPECT_FALSE(fs::exists(Path("plateau.db")));
}

// Kill -9 at random moments of a long ingest, restart each time, and compare the final numbers
// with an uninterrupted run over the same bytes: equal to 1e-12, every sample counted once.
TEST_F(WatchIntegration, KillNineAtRandomPointsEndsWithTheUninterruptedNumbers) {
  const ProbeRows rows(60000, 11);
  const std::string extra =
      "  - kind: variance\n    columns: [y]\n  - kind: covariance\n    columns: [x, y]\n";
  const auto final_numbers = [&] {
    const auto v = Latest();
    std::vector<double> numbers;
    for (const SnapshotRow& s : v->statistics) {
      numbers.insert(numbers.end(), {s.value, s.half_width, s.integrated_time,
                                     static_cast<double>(s.samples_used)});
    }
    return numbers;
  };
  const std::int64_t total = static_cast<std::int64_t>(rows.size());

  // The uninterrupted run: every byte present before the daemon starts.
  WriteConfig("{relative: 0.001}", extra);
  Append("run1/probe.dat", "# time x y\n" + rows.Rows(0, 40000));
  Append("run2/probe.dat", "# time x y\n" + rows.Rows(39000, 60000));
  {
    WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
    ASSERT_TRUE(WaitFor([&] { return Samples() == total; }, 30));
    daemon.Signal(SIGTERM);
    ASSERT_EQ(daemon.Wait(10), 0);
  }
  const std::vector<double> expected = final_numbers();
  ASSERT_EQ(expected.size(), 12u);
  fs::remove(Path("plateau.db"));
  fs::remove(Path("plateau.db-wal"));
  fs::remove(Path("plateau.db-shm"));
  fs::remove_all(Path("run1"));
  fs::remove_all(Path("run2"));

  // The interrupted run: the files grow while the daemon is killed and restarted.
  std::mt19937 rng(2026);
  std::uniform_int_distribution<int> pause_ms(30, 400);
  const std::vector<std::pair<std::string, std::pair<std::size_t, std::size_t>>> pieces = {
      {"run1/probe.dat", {0, 40000}}, {"run2/probe.dat", {39000, 60000}}};
  int kills = 0;
  for (const auto& [file, range] : pieces) {
    Append(file, "# time x y\n");
    for (std::size_t from = range.first; from < range.second; from += 2500) {
      WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
      std::string chunk = rows.Rows(from, std::min(from + 2500, range.second));
      Append(file, chunk.substr(0, chunk.size() / 2));  // a torn line, completed below
      std::this_thread::sleep_for(std::chrono::milliseconds(pause_ms(rng)));
      Append(file, chunk.substr(chunk.size() / 2));
      std::this_thread::sleep_for(std::chrono::milliseconds(pause_ms(rng)));
      daemon.KillHard();
      ++kills;
    }
  }
  const std::int64_t last_cycle = Latest() ? Latest()->cycle : 0;
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
  // The store may already hold every sample from a killed daemon: wait for this one's own cycle.
  ASSERT_TRUE(WaitFor([&] { return Latest() && Latest()->cycle > last_cycle + 1; }, 30));
  ASSERT_TRUE(WaitFor([&] { return Samples() == total; }, 30)) << ReadAll(Path("watch.log"));
  daemon.Signal(SIGTERM);
  ASSERT_EQ(daemon.Wait(10), 0);
  const std::vector<double> actual = final_numbers();
  ASSERT_EQ(actual.size(), expected.size());
  for (std::size_t i = 0; i < expected.size(); ++i) {
    EXPECT_NEAR(actual[i], expected[i], 1e-12 * std::fabs(expected[i])) << i;
  }
  EXPECT_GE(kills, 20);
  const auto store = RunStore::OpenForReading(Path("plateau.db"));
  ASSERT_TRUE(store.ok()) << store.error();
  EXPECT_TRUE((*store)->CheckIntegrity().ok());
}

}  // namespace
}  // namespace plateau

namespace plateau {
namespace {

// Feeds 16000 probe rows in eight steps, each awaited, to the running daemon and waits for
// `check --stat group` to say stop.
class WatchedGroup : public WatchIntegration {
 protected:
  bool FeedUntilGroupMet(const std::string& group) {
    const ProbeRows rows(16000);
    Append("run1/probe.dat", "# time x y\n");
    for (std::size_t from = 0; from < rows.size(); from += 2000) {
      Append("run1/probe.dat", rows.Rows(from, from + 2000));
      WaitFor([&] { return Samples() == static_cast<std::int64_t>(from + 2000); }, 10);
    }
    return WaitFor(
        [&] { return Plateau({"check", "--stat", group, Path("run.yaml")}).exit_code == 0; }, 10);
  }
};

TEST_F(WatchedGroup, GroupStopsJointlyAtBonferroniConfidenceAndReferencesGetAVerdict) {
  // x has mean 10 by construction: a reference of 10 is consistent, one of 10.5 is a bias. The
  // group's members are judged at 1 - 0.05 / 2 = 97.5 %.
  WriteConfig("{relative: 0.01}\n    reference: 10.0\n    name: x",
              "  - kind: mean\n    columns: [x]\n    name: x_shifted_reference\n"
              "    target: {relative: 0.01}\n    reference: 10.5\n"
              "groups:\n  - name: both\n    members: [x, x_shifted_reference]\n"
              "    bonferroni: true\n");
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
  ASSERT_TRUE(FeedUntilGroupMet("both")) << Plateau({"status", Path("run.yaml")}).out;
  const testing::CommandResult json = Plateau({"status", "--json", Path("run.yaml")});
  EXPECT_NE(json.out.find("\"member_confidence\":0.975"), std::string::npos) << json.out;
  EXPECT_NE(json.out.find("\"confidence\":0.975"), std::string::npos);
  EXPECT_NE(json.out.find("\"verdict\":\"consistent\""), std::string::npos);
  EXPECT_NE(json.out.find("\"verdict\":\"bias\""), std::string::npos);
  EXPECT_NE(json.out.find("\"time_to_target\":{\"simulated\":0"), std::string::npos);
  const testing::CommandResult table = Plateau({"status", Path("run.yaml")});
  EXPECT_NE(table.out.find("group both: met, 2 of 2 members met"), std::string::npos) << table.out;
  EXPECT_NE(table.out.find("BIAS"), std::string::npos);
}

TEST_F(WatchedGroup, AMultivariateGroupStopsOnItsJointRegionAndSaysWhatBonferroniWouldNeed) {
  // x (mean 10) and y (mean -3) of one source, each judged at the group's 95 %, and jointly by
  // one region (core/joint_region.h).
  WriteConfig("{relative: 0.01}\n    name: x",
              "  - kind: mean\n    columns: [y]\n    name: y\n    target: {relative: 0.05}\n"
              "groups:\n  - name: both\n    members: [x, y]\n    joint: multivariate\n");
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
  ASSERT_TRUE(FeedUntilGroupMet("both")) << Plateau({"status", Path("run.yaml")}).out;
  const testing::CommandResult json = Plateau({"status", "--json", Path("run.yaml")});
  EXPECT_NE(json.out.find("\"joint\":\"multivariate\""), std::string::npos) << json.out;
  EXPECT_NE(json.out.find("\"joint_region\":{\"available\":true,\"small_enough\":true"),
            std::string::npos);
  EXPECT_EQ(json.out.find("\"confidence\":0.975"), std::string::npos);  // not Bonferroni's
  const testing::CommandResult table = Plateau({"status", Path("run.yaml")});
  EXPECT_NE(table.out.find("group both: met, 2 of 2 members met; joint 95 % region of 2 members"),
            std::string::npos)
      << table.out;
  EXPECT_NE(table.out.find("× as long)"), std::string::npos);
}

}  // namespace
}  // namespace plateau
