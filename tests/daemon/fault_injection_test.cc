// Faults a cluster throws at a daemon that runs for days, injected into the real daemon: the
// store's disk full, the store read-only, the run folder deleted or moved, a probe file made
// unreadable or replaced by a binary one, the system clock stepped, and SIGKILL in the middle of a
// checkpoint write. For each: the daemon keeps running or exits with a clear message, nothing
// recorded is lost or corrupted (PRAGMA integrity_check), and once the fault is removed it goes on
// where it was.
#include <gtest/gtest.h>
#include <sys/mount.h>

#include <cerrno>
#include <cmath>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <random>
#include <thread>

#include "store/run_store.h"
#include "tests/daemon/run_folder.h"

namespace plateau {
namespace {

namespace fs = std::filesystem;
using testing::CommandResult;
using testing::ProbeRows;
using testing::ReadAll;
using testing::SpawnOptions;
using testing::WaitFor;
using testing::WatchDaemon;

class FaultInjection : public testing::RunFolder {
 protected:
  void TearDown() override {
    if (mounted_) ::umount2(mount_point_.c_str(), MNT_DETACH);
    // The mode changes of a test must not keep the folder from being removed.
    std::error_code ignored;
    for (const auto& entry : fs::recursive_directory_iterator(dir_, ignored)) {
      fs::permissions(entry.path(), fs::perms::owner_all, fs::perm_options::add, ignored);
    }
    fs::permissions(dir_, fs::perms::owner_all, fs::perm_options::add, ignored);
    RunFolder::TearDown();
  }

  // A tmpfs of `bytes` at dir_/small; false (with *why) where mounting is not permitted.
  bool MountSmallDisk(std::size_t bytes, std::string* why) {
    mount_point_ = Path("small");
    fs::create_directories(mount_point_);
    const std::string options = "size=" + std::to_string(bytes);
    if (::mount("tmpfs", mount_point_.c_str(), "tmpfs", 0, options.c_str()) != 0) {
      *why = std::string("mounting a size-limited tmpfs needs root (CAP_SYS_ADMIN): ") +
             std::strerror(errno);
      return false;
    }
    mounted_ = true;
    return true;
  }

  // SIGTERM: a clean stop (exit 0), and a store that passes PRAGMA integrity_check.
  void StopCleanly(WatchDaemon& daemon) {
    daemon.Signal(SIGTERM);
    EXPECT_EQ(daemon.Wait(10), 0);
    EXPECT_TRUE(IntegrityOk());
  }

  bool IntegrityOk() {
    const auto store = RunStore::OpenForReading(Path(store_));
    return store.ok() && (*store)->CheckIntegrity().ok();
  }

  int CountInLog(const std::string& text) {
    const std::string log = ReadAll(Path("test.plateau.log"));
    int count = 0;
    for (std::size_t at = log.find(text); at != std::string::npos; at = log.find(text, at + 1)) {
      ++count;
    }
    return count;
  }

  std::string mount_point_;
  bool mounted_ = false;
};

TEST_F(FaultInjection, FullDiskKeepsWhatWasRecordedAndCatchesUpWhenSpaceReturns) {
  std::string why;
  if (!MountSmallDisk(8 << 20, &why)) GTEST_SKIP() << why;
  store_ = mount_point_ + "/plateau.db";
  const ProbeRows rows(6000);
  WriteConfig("{relative: 0.01}", "", "store: " + store_ + "\n");
  Append("run1/probe.dat", "# time x y\n" + rows.Rows(0, 2000));
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
  ASSERT_TRUE(WaitFor([&] { return Samples() == 2000; }, 10)) << ReadAll(Path("watch.log"));
  const std::int64_t cycle_before = Latest()->cycle;

  // Fill the disk to the last byte, then let the run go on.
  {
    std::ofstream filler(mount_point_ + "/filler", std::ios::binary);
    const std::string block(1 << 16, 'f');
    while (filler.write(block.data(), block.size())) {
    }
  }
  Append("run1/probe.dat", rows.Rows(2000, 4000));
  ASSERT_TRUE(WaitFor([&] { return CountInLog("cannot record cycle") >= 2; }, 10))
      << ReadAll(Path("test.plateau.log"));
  EXPECT_TRUE(daemon.Running());
  // What was recorded is still there and readable, and status says so.
  ASSERT_TRUE(Latest());
  EXPECT_GE(Latest()->cycle, cycle_before);
  EXPECT_GE(Samples(), 2000);
  const CommandResult status = Plateau({"status", Path("run.yaml")});
  EXPECT_EQ(status.exit_code, 0) << status.err;

  // Space returns: the next cycle records everything read meanwhile.
  fs::remove(mount_point_ + "/filler");
  Append("run1/probe.dat", rows.Rows(4000, 6000));
  ASSERT_TRUE(WaitFor([&] { return Samples() == 6000; }, 10)) << ReadAll(Path("test.plateau.log"));
  EXPECT_GE(CountInLog("the store accepts writes again"), 1);
  StopCleanly(daemon);
}

TEST_F(FaultInjection, ReadOnlyStoreRefusesToStartAndStillAnswersStatus) {
  const ProbeRows rows(4000);
  WriteConfig();
  Append("run1/probe.dat", "# time x y\n" + rows.Rows(0, 2000));
  SpawnOptions bound;
  bound.file_modes_apply = true;
  {
    WatchDaemon daemon(Path("run.yaml"), Path("watch.log"), 0.2, 0.1, bound);
    ASSERT_TRUE(WaitFor([&] { return Samples() == 2000; }, 10)) << ReadAll(Path("watch.log"));
    daemon.Signal(SIGTERM);
    ASSERT_EQ(daemon.Wait(10), 0);
  }
  const std::int64_t cycle = Latest()->cycle;

  // The store and its folder become read-only (a quota, a read-only snapshot, another owner).
  Append("run1/probe.dat", rows.Rows(2000, 4000));
  const auto read_only = fs::perms::owner_read | fs::perms::owner_exec;
  for (const auto& entry : fs::directory_iterator(dir_)) {
    if (entry.is_regular_file()) fs::permissions(entry.path(), fs::perms::owner_read);
  }
  fs::permissions(dir_, read_only);
  const std::string scratch = dir_.string() + "_command";  // the run folder is read-only now
  const CommandResult refused =
      testing::RunPlateau({"watch", Path("run.yaml"), "--quiet"}, scratch, bound);
  EXPECT_EQ(refused.exit_code, 2) << refused.err;
  EXPECT_NE(refused.err.find(dir_.string()), std::string::npos) << refused.err;
  EXPECT_NE(refused.err.find("ermission denied"), std::string::npos) << refused.err;
  const CommandResult status = testing::RunPlateau({"status", Path("run.yaml")}, scratch, bound);
  EXPECT_EQ(status.exit_code, 0) << status.err;
  EXPECT_NE(status.out.find("cycle " + std::to_string(cycle)), std::string::npos) << status.out;

  fs::remove(scratch + ".out");
  fs::remove(scratch + ".err");

  // Writable again: the daemon resumes from its checkpoint and reads only what is new.
  fs::permissions(dir_, fs::perms::owner_all);
  for (const auto& entry : fs::directory_iterator(dir_)) {
    if (entry.is_regular_file()) {
      fs::permissions(entry.path(), fs::perms::owner_read | fs::perms::owner_write);
    }
  }
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"), 0.2, 0.1, bound);
  ASSERT_TRUE(WaitFor([&] { return Samples() == 4000; }, 10)) << ReadAll(Path("watch.log"));
  EXPECT_GT(Latest()->cycle, cycle);
  StopCleanly(daemon);
}

TEST_F(FaultInjection, RunFolderDeletedStopsTheDaemonWithAClearMessage) {
  const ProbeRows rows(1000);
  WriteConfig();
  Append("run1/probe.dat", "# time x y\n" + rows.Rows(0, 1000));
  WatchDaemon daemon(Path("run.yaml"), Path("../" + dir_.filename().string() + "_watch.log"));
  ASSERT_TRUE(WaitFor([&] { return Samples() == 1000; }, 10));
  fs::remove_all(dir_);
  EXPECT_EQ(daemon.Wait(10), 3);
  const std::string err = ReadAll(dir_.string() + "_watch.log");
  EXPECT_NE(err.find("was deleted, moved or replaced while plateau ran"), std::string::npos) << err;
  fs::remove(dir_.string() + "_watch.log");
  fs::create_directories(dir_);  // for TearDown
}

TEST_F(FaultInjection, RunFolderMovedAwayAndBackGoesOnWhereItWas) {
  const ProbeRows rows(3000);
  WriteConfig();
  Append("run1/probe.dat", "# time x y\n" + rows.Rows(0, 2000));
  const std::string moved = dir_.string() + "_moved";
  {
    WatchDaemon daemon(Path("run.yaml"), moved + "_watch.log");
    ASSERT_TRUE(WaitFor([&] { return Samples() == 2000; }, 10));
    fs::rename(dir_, moved);
    EXPECT_EQ(daemon.Wait(10), 3);
  }
  // The moved store holds every sample read, intact.
  {
    const auto store = RunStore::OpenForReading(moved + "/plateau.db");
    ASSERT_TRUE(store.ok()) << store.error();
    EXPECT_TRUE((*store)->CheckIntegrity().ok());
  }
  fs::rename(moved, dir_);
  fs::remove(moved + "_watch.log");
  Append("run1/probe.dat", rows.Rows(2000, 3000));
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
  ASSERT_TRUE(WaitFor([&] { return Samples() == 3000; }, 10)) << ReadAll(Path("watch.log"));
  StopCleanly(daemon);
}

TEST_F(FaultInjection, UnreadableProbeFileIsLoggedOnceAndReadOnWhenReadableAgain) {
  const ProbeRows rows(3000);
  WriteConfig();
  Append("run1/probe.dat", "# time x y\n" + rows.Rows(0, 1000));
  SpawnOptions bound;
  bound.file_modes_apply = true;
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"), 0.2, 0.1, bound);
  ASSERT_TRUE(WaitFor([&] { return Samples() == 1000; }, 10)) << ReadAll(Path("watch.log"));
  // Write-only for its owner: the solver goes on writing, plateau cannot read.
  fs::permissions(Path("run1/probe.dat"), fs::perms::owner_write);
  Append("run1/probe.dat", rows.Rows(1000, 2000));
  std::this_thread::sleep_for(std::chrono::milliseconds(1500));  // about 15 polls
  EXPECT_TRUE(daemon.Running());
  EXPECT_EQ(Samples(), 1000);
  EXPECT_EQ(CountInLog("cannot open"), 1) << ReadAll(Path("test.plateau.log"));
  fs::permissions(Path("run1/probe.dat"), fs::perms::owner_read | fs::perms::owner_write);
  Append("run1/probe.dat", rows.Rows(2000, 3000));
  ASSERT_TRUE(WaitFor([&] { return Samples() == 3000; }, 10)) << ReadAll(Path("test.plateau.log"));
  EXPECT_EQ(CountInLog("can be read again; reading on from byte"), 1);
  // Read on from where it stopped: not a line twice, no line bad.
  EXPECT_EQ(CountInLog("reading it again from the start"), 0);
  const CommandResult status = Plateau({"status", "--json", Path("run.yaml")});
  EXPECT_NE(status.out.find("\"bad_lines\":0"), std::string::npos) << status.out;
  StopCleanly(daemon);
}

TEST_F(FaultInjection, ProbeFileReplacedByABinaryOneIsCountedAsBadLinesNotData) {
  const ProbeRows rows(3000);
  WriteConfig();
  Append("run1/probe.dat", "# time x y\n" + rows.Rows(0, 2000));
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
  ASSERT_TRUE(WaitFor([&] { return Samples() == 2000; }, 10));
  // A core dump, a restart file or a compressed archive written over the probe file's name.
  std::mt19937_64 rng(7);
  std::string binary(1 << 20, '\0');
  for (char& c : binary) c = static_cast<char>(rng() & 0xff);
  std::ofstream(Path("binary.tmp"), std::ios::binary) << binary;
  fs::rename(Path("binary.tmp"), Path("run1/probe.dat"));
  ASSERT_TRUE(WaitFor([&] { return CountInLog("was replaced") >= 1; }, 10));
  std::this_thread::sleep_for(std::chrono::milliseconds(600));
  EXPECT_TRUE(daemon.Running());
  EXPECT_EQ(Samples(), 2000);
  // A few bad lines one by one, then summaries: not one log line per line of garbage.
  EXPECT_LE(CountInLog("line skipped"), 5);
  // The solver's real file comes back (restarted from a checkpoint): only new times count.
  std::ofstream(Path("probe.tmp")) << "# time x y\n" << rows.Rows(1500, 3000);
  fs::rename(Path("probe.tmp"), Path("run1/probe.dat"));
  ASSERT_TRUE(WaitFor([&] { return Samples() == 3000; }, 10)) << ReadAll(Path("test.plateau.log"));
  StopCleanly(daemon);
}

TEST_F(FaultInjection, ClockStepsForwardAndBackWithoutAFalseStall) {
  const char* faketime = "/usr/lib/x86_64-linux-gnu/faketime/libfaketime.so.1";
  if (!fs::exists(faketime)) GTEST_SKIP() << "libfaketime is not installed (Debian's faketime)";
  const ProbeRows rows(20000);
  WriteConfig("{relative: 0.001}", "",
              "alerts:\n  events: [stalled, resumed]\n  stall_after: 30\n");
  Append("run1/probe.dat", "# time x y\n" + rows.Rows(0, 1000));
  const std::string offset_file = Path("clock_offset");
  std::ofstream(offset_file) << "+0\n";
  SpawnOptions clock;
  // Only the system clock is stepped; the steady clock runs on, as with an NTP step.
  clock.environment = {"LD_PRELOAD=" + std::string(faketime),
                       "FAKETIME_TIMESTAMP_FILE=" + offset_file, "FAKETIME_NO_CACHE=1",
                       "DONT_FAKE_MONOTONIC=1",
                       // A sanitizer build's runtime must not object to the preloaded library.
                       "ASAN_OPTIONS=verify_asan_link_order=0:detect_leaks=1"};
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"), 0.2, 0.1, clock);
  ASSERT_TRUE(WaitFor([&] { return Samples() == 1000; }, 10)) << ReadAll(Path("watch.log"));
  const std::int64_t cycle_before = Latest()->cycle;
  // Each step falls between two writes of the solver, and evaluations run before the next write:
  // a daemon that measured "no new sample for ..." on the system clock would see hours of it.
  std::int64_t written = 1000;
  for (const char* offset : {"+7200", "-3600"}) {  // two hours forward, then three back
    std::ofstream(offset_file) << offset << "\n";
    std::this_thread::sleep_for(std::chrono::milliseconds(1000));  // about five evaluations
    Append("run1/probe.dat", rows.Rows(written, written + 1000));
    written += 1000;
    ASSERT_TRUE(WaitFor([&] { return Samples() == written; }, 10));
  }
  EXPECT_TRUE(daemon.Running());
  EXPECT_GT(Latest()->cycle, cycle_before + 5);
  // Each step once (by two and three hours, less the time between two readings of the clock).
  EXPECT_EQ(CountInLog("the system clock jumped forward by"), 1)
      << ReadAll(Path("test.plateau.log"));
  EXPECT_EQ(CountInLog("the system clock jumped back by"), 1);
  for (const EventRow& e : Events()) EXPECT_NE(e.kind, EventKind::kStalled) << e.message;
  StopCleanly(daemon);
}

TEST_F(FaultInjection, KillInTheMiddleOfACheckpointWriteLosesNothing) {
  // Many statistics make a checkpoint of many items; the daemon SIGKILLs itself halfway through
  // writing a cycle's (the first from cycle 6 on with new samples), inside the transaction. The
  // uninterrupted run is the reference.
  const ProbeRows rows(30000, 5);
  std::string extra;
  for (int i = 0; i < 20; ++i) {
    extra += "  - {name: v" + std::to_string(i) + ", kind: variance, columns: [" +
             (i % 2 ? "x" : "y") + "]}\n";
  }
  const auto final_numbers = [&] {
    std::vector<double> numbers;
    const std::optional<LatestView> latest = Latest();
    for (const SnapshotRow& s : latest->statistics) {
      numbers.insert(numbers.end(), {s.value, s.half_width, static_cast<double>(s.samples_used)});
    }
    return numbers;
  };
  WriteConfig("{relative: 0.001}", extra);
  Append("run1/probe.dat", "# time x y\n" + rows.Rows(0, 30000));
  {
    WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
    ASSERT_TRUE(WaitFor([&] { return Samples() == 30000; }, 30));
    daemon.Signal(SIGTERM);
    ASSERT_EQ(daemon.Wait(10), 0);
  }
  const std::vector<double> expected = final_numbers();
  for (const char* f : {"plateau.db", "plateau.db-wal", "plateau.db-shm"}) fs::remove(Path(f));
  fs::remove_all(Path("run1"));

  Append("run1/probe.dat", "# time x y\n" + rows.Rows(0, 10000));
  SpawnOptions fault;
  fault.environment = {"PLATEAU_FAULT_KILL_IN_CYCLE=6"};
  std::size_t written = 10000;
  {
    WatchDaemon daemon(Path("run.yaml"), Path("watch.log"), 0.2, 0.1, fault);
    // The solver goes on until the daemon dies: a cycle with new samples has pages to write.
    while (written < 30000 && daemon.Running()) {
      Append("run1/probe.dat", rows.Rows(written, written + 400));
      written += 400;
      std::this_thread::sleep_for(std::chrono::milliseconds(150));
    }
    ASSERT_EQ(daemon.Wait(20), -2) << "the daemon was to kill itself from cycle 6 on";
    EXPECT_EQ(daemon.TermSignal(), SIGKILL);
  }
  ASSERT_TRUE(IntegrityOk());
  EXPECT_GE(Latest()->cycle, 5);  // the cycle it died in never committed; the ones before did
  Append("run1/probe.dat", rows.Rows(written, 30000));
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
  ASSERT_TRUE(WaitFor([&] { return Samples() == 30000; }, 30)) << ReadAll(Path("watch.log"));
  daemon.Signal(SIGTERM);
  ASSERT_EQ(daemon.Wait(10), 0);
  const std::vector<double> actual = final_numbers();
  ASSERT_EQ(actual.size(), expected.size());
  for (std::size_t i = 0; i < expected.size(); ++i) {
    EXPECT_NEAR(actual[i], expected[i], 1e-12 * std::fabs(expected[i])) << i;
  }
  EXPECT_TRUE(IntegrityOk());
}

}  // namespace
}  // namespace plateau
