#include "store/run_store.h"

#include <gtest/gtest.h>
#include <sqlite3.h>
#include <unistd.h>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <stdexcept>

namespace plateau {
namespace {

namespace fs = std::filesystem;

class RunStoreTest : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = fs::temp_directory_path() / ("plateau_store_" + std::to_string(::getpid()) + "_" +
                                        ::testing::UnitTest::GetInstance()->current_test_info()->name());
    fs::create_directories(dir_);
    path_ = (dir_ / "plateau.db").string();
  }
  void TearDown() override { fs::remove_all(dir_); }

  // The value of a store call this test needs to succeed; a failure ends the test with its message.
  template <typename T>
  static T Must(Result<T> result) {
    if (!result.ok()) throw std::runtime_error(result.error());
    return std::move(result).value();
  }

  CycleRecord Cycle(std::int64_t n) {
    CycleRecord r;
    r.cycle = n;
    r.wall_time = 1000.0 + n;
    r.last_sample_time = 10.0 * n;
    r.last_sample_wall_time = 999.0 + n;
    r.fingerprint = "fp";
    SnapshotRow s;
    s.statistic = "tau";
    s.state = ConvergenceState::kConverging;
    s.state_reason = "half-width 2 %";
    s.value = 0.28;
    s.half_width = std::nan("");
    s.target_kind = Target::Kind::kRelative;
    s.target_value = 0.01;
    s.document = {{"name", "tau"}, {"cycle", n}};
    r.snapshots = {s};
    EventRow e;
    e.wall_time = 1000.0 + n;
    e.simulated_time = 10.0 * n;
    e.statistic = "tau";
    e.kind = EventKind::kMet;
    e.message = "tau met its target";
    e.value = 0.28;
    e.channels = {"email", "command"};
    r.events = {e};
    FileProgress f;
    f.path = "/p/wall.dat";
    f.source = "wall";
    f.inode = 77;
    f.offset = 1234 * n;
    f.columns = {"time", "tau"};
    f.first_time = std::nan("");
    r.files = {f};
    r.checkpoint["history:tau"] = {1.0, 2.5, -3e-300, std::nan("")};
    return r;
  }

  fs::path dir_;
  std::string path_;
};

TEST_F(RunStoreTest, CycleRoundTripsThroughTheStore) {
  auto store = Must(RunStore::OpenForWriting(path_, "ch420"));
  ASSERT_TRUE(store->WriteCycle(Cycle(1)).ok());
  ASSERT_TRUE(store->WriteCycle(Cycle(2)).ok());
  auto reader = Must(RunStore::OpenForReading(path_));
  const auto latest = Must(reader->ReadLatest());
  ASSERT_TRUE(latest);
  EXPECT_EQ(latest->run_name, "ch420");
  EXPECT_EQ(latest->cycle, 2);
  ASSERT_EQ(latest->statistics.size(), 1u);
  EXPECT_EQ(latest->statistics[0].document.dump(), "{\"name\":\"tau\",\"cycle\":2}");
  EXPECT_EQ(latest->statistics[0].state_reason, "half-width 2 %");
  EXPECT_TRUE(std::isnan(latest->statistics[0].half_width));
  EXPECT_EQ(latest->files.at(0).offset, 2468);
  const auto checkpoint = Must(reader->ReadCheckpoint());
  ASSERT_TRUE(checkpoint);
  EXPECT_EQ(checkpoint->cycle, 2);
  EXPECT_EQ(checkpoint->fingerprint, "fp");
  const std::vector<double>& h = checkpoint->items.at("history:tau");
  ASSERT_EQ(h.size(), 4u);
  EXPECT_EQ(h[2], -3e-300);  // bit for bit
  EXPECT_TRUE(std::isnan(h[3]));
  const auto events = Must(reader->ReadEvents(0, 10));
  ASSERT_EQ(events.size(), 2u);
  EXPECT_EQ(events[1].cycle, 2);
  EXPECT_EQ(events[1].value, 0.28);
  EXPECT_TRUE(reader->CheckIntegrity().ok());
}

TEST_F(RunStoreTest, ReopeningKeepsTheDataAndTheSchema) {
  {
    auto store = Must(RunStore::OpenForWriting(path_, "ch420"));
    ASSERT_TRUE(store->WriteCycle(Cycle(1)).ok());
  }
  auto again = Must(RunStore::OpenForWriting(path_, "ch420"));
  const auto checkpoint = Must(again->ReadCheckpoint());
  ASSERT_TRUE(checkpoint);
  EXPECT_EQ(checkpoint->cycle, 1);
}

TEST_F(RunStoreTest, NewerSchemaIsRefusedWithItsVersion) {
  { auto store = Must(RunStore::OpenForWriting(path_, "ch420")); }
  sqlite3* db = nullptr;
  sqlite3_open(path_.c_str(), &db);
  sqlite3_exec(db, "UPDATE meta SET value = '99' WHERE key = 'schema_version'", nullptr, nullptr,
               nullptr);
  sqlite3_close(db);
  const auto refused = RunStore::OpenForWriting(path_, "ch420");
  EXPECT_FALSE(refused.ok());
  EXPECT_NE(refused.error().find("schema version 99"), std::string::npos);
  EXPECT_FALSE(RunStore::OpenForReading(path_).ok());
}

TEST_F(RunStoreTest, ForeignDatabaseAndMissingFileAreClearErrors) {
  sqlite3* db = nullptr;
  sqlite3_open(path_.c_str(), &db);
  sqlite3_exec(db, "CREATE TABLE results(x)", nullptr, nullptr, nullptr);
  sqlite3_close(db);
  const auto foreign = RunStore::OpenForWriting(path_, "ch420");
  EXPECT_FALSE(foreign.ok());
  EXPECT_EQ(foreign.error(), "store " + path_ + " is not a plateau store");
  const auto missing = RunStore::OpenForReading((dir_ / "none.db").string());
  EXPECT_FALSE(missing.ok());
  EXPECT_NE(missing.error().find("unable to open"), std::string::npos);
}

TEST_F(RunStoreTest, DeliveriesAreMadeOnceRetriedAndGivenUp) {
  auto store = Must(RunStore::OpenForWriting(path_, "ch420"));
  ASSERT_TRUE(store->WriteCycle(Cycle(1)).ok());
  auto due = Must(store->DueDeliveries(2000.0));
  ASSERT_EQ(due.size(), 2u);
  EXPECT_EQ(due[0].channel, "command");
  EXPECT_EQ(due[0].event.value, 0.28);
  const std::int64_t id = due[0].event.id;
  ASSERT_TRUE(store->RecordDelivery(id, "command", true, "", 2000.0, std::nan("")).ok());
  ASSERT_TRUE(store->RecordDelivery(id, "email", false, "connection refused", 2000.0, 2010.0).ok());
  EXPECT_TRUE(Must(store->DueDeliveries(2005.0)).empty());  // the retry is not due yet
  due = Must(store->DueDeliveries(2010.0));
  ASSERT_EQ(due.size(), 1u);
  EXPECT_EQ(due[0].attempts, 1);
  ASSERT_TRUE(store->RecordDelivery(id, "email", false, "refused", 2010.0, std::nan("")).ok());
  EXPECT_TRUE(Must(store->DueDeliveries(1e12)).empty());
  EXPECT_EQ(Must(store->CountDeliveries("delivered")), 1);
  EXPECT_EQ(Must(store->CountDeliveries("failed")), 1);
}

TEST_F(RunStoreTest, VersionOneStoreIsMigratedAndKeepsItsHistory) {
  sqlite3* db = nullptr;
  sqlite3_open(path_.c_str(), &db);
  const std::string v1 = [] {
    std::ifstream in(PLATEAU_TEST_DATA_DIR "/store/fixtures/schema_v1.sql");
    std::stringstream text;
    text << in.rdbuf();
    return text.str();
  }();
  ASSERT_EQ(sqlite3_exec(db, v1.c_str(), nullptr, nullptr, nullptr), SQLITE_OK);
  // A checkpoint item as versions 1 and 2 wrote it: the whole state in one row.
  sqlite3_stmt* legacy = nullptr;
  sqlite3_prepare_v2(db, "INSERT INTO checkpoint VALUES ('state:history:tau', ?1)", -1, &legacy,
                     nullptr);
  const double state[3] = {4096.0, 5.0, -3e-300};
  sqlite3_bind_blob(legacy, 1, state, sizeof state, SQLITE_STATIC);
  ASSERT_EQ(sqlite3_step(legacy), SQLITE_DONE);
  sqlite3_finalize(legacy);
  sqlite3_close(db);
  auto store = Must(RunStore::OpenForWriting(path_, "ch420"));
  const auto old = Must(store->ReadEvents(0, 10));
  ASSERT_EQ(old.size(), 1u);
  EXPECT_EQ(old[0].message, "tau met its target");
  EXPECT_TRUE(std::isnan(old[0].value));  // a column the old schema did not have
  const auto checkpoint = Must(store->ReadCheckpoint());
  ASSERT_TRUE(checkpoint);
  EXPECT_EQ(checkpoint->items.at("history:tau"), std::vector<double>({4096.0, 5.0, -3e-300}));
  ASSERT_TRUE(store->WriteCycle(Cycle(8)).ok()) << "a migrated store takes new cycles";
  EXPECT_EQ(Must(store->DueDeliveries(1e12)).size(), 2u);
  EXPECT_TRUE(store->CheckIntegrity().ok());
}

TEST_F(RunStoreTest, CheckpointPagesAreRewrittenOnlyWhereTheyChanged) {
  auto store = Must(RunStore::OpenForWriting(path_, "ch420"));
  std::vector<double> history(5000);
  for (std::size_t i = 0; i < history.size(); ++i) history[i] = 0.5 * static_cast<double>(i);
  const auto write = [&](std::int64_t n) {
    CycleRecord r = Cycle(n);
    r.checkpoint["history:big"] = history;
    ASSERT_TRUE(store->WriteCycle(r).ok());
  };
  const auto stored = [&] {
    auto reader = Must(RunStore::OpenForReading(path_));
    return Must(reader->ReadCheckpoint())->items.at("history:big");
  };
  const std::size_t pages =
      (5000 + RunStore::kCheckpointPageDoubles - 1) / RunStore::kCheckpointPageDoubles;
  write(1);
  EXPECT_EQ(store->checkpoint_pages_written(), pages + 1);  // and history:tau's one page
  EXPECT_EQ(stored(), history);

  // Between merges a history changes at its start (counts, the open block) and its end.
  history.front() += 1.0;
  history.back() = -3e-300;
  write(2);
  EXPECT_EQ(store->checkpoint_pages_written(), 2u);
  EXPECT_EQ(stored(), history);

  // A merge halves it: fewer pages, and none of the old ones left behind.
  history.resize(2000);
  history[700] = 7.0;
  write(3);
  EXPECT_EQ(stored(), history);
  sqlite3* db = nullptr;
  sqlite3_open(path_.c_str(), &db);
  sqlite3_stmt* count = nullptr;
  sqlite3_prepare_v2(db, "SELECT count(*) FROM checkpoint WHERE item LIKE 'state:history:big#%'",
                     -1, &count, nullptr);
  ASSERT_EQ(sqlite3_step(count), SQLITE_ROW);
  EXPECT_EQ(sqlite3_column_int(count, 0), 5);  // 2000 doubles in pages of 480
  sqlite3_finalize(count);
  sqlite3_close(db);

  // A new daemon on the store writes everything once, then only changes again.
  store = Must(RunStore::OpenForWriting(path_, "ch420"));
  write(4);
  EXPECT_EQ(store->checkpoint_pages_written(), 5u + 1u);
  write(5);
  EXPECT_EQ(store->checkpoint_pages_written(), 0u);
  EXPECT_EQ(stored(), history);
}

TEST_F(RunStoreTest, ReaderNeverSeesHalfACycle) {
  // A read transaction opened between two writes keeps seeing the first write (WAL snapshot).
  auto writer = Must(RunStore::OpenForWriting(path_, "ch420"));
  ASSERT_TRUE(writer->WriteCycle(Cycle(1)).ok());
  auto reader = Must(RunStore::OpenForReading(path_));
  for (std::int64_t n = 2; n < 40; ++n) {
    ASSERT_TRUE(writer->WriteCycle(Cycle(n)).ok());
    const auto latest = Must(reader->ReadLatest());
    ASSERT_TRUE(latest);
    // Whatever cycle it sees, its snapshot JSON and file offset belong to that same cycle.
    EXPECT_EQ(latest->statistics.at(0).document.dump(),
              "{\"name\":\"tau\",\"cycle\":" + std::to_string(latest->cycle) + "}");
    EXPECT_EQ(latest->files.at(0).offset, 1234 * latest->cycle);
  }
}

}  // namespace
}  // namespace plateau
