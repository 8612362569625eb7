// The SQLite store of one run (WAL mode): a versioned schema with migrations; per evaluation cycle
// the snapshots, events, per-file ingest progress and the checkpoint of all estimator state,
// written in one transaction so that a reader never sees half a cycle and a restart resumes from a
// consistent point. Holds no business rules. Not thread-safe: one owner per connection.
#ifndef PLATEAU_STORE_RUN_STORE_H_
#define PLATEAU_STORE_RUN_STORE_H_

#include <nlohmann/json.hpp>

#include <cstdint>
#include <map>
#include <memory>
#include <optional>
#include <string>
#include <unordered_map>
#include <vector>

#include "core/convergence_tracker.h"
#include "core/event_kind.h"
#include "core/result.h"
#include "core/status.h"
#include "store/sqlite_connection.h"
#include "store/store_schema.h"

namespace plateau {

// Where the reading of one probe file stands, as of a checkpoint.
struct FileProgress {
  std::string path;
  std::string source;
  std::int64_t inode = 0;
  std::int64_t offset = 0;  // bytes of complete lines consumed
  std::int64_t lines = 0;
  std::int64_t rows = 0;
  std::int64_t bad_lines = 0;
  double first_time = 0.0;  // NaN before the first row
  double last_time = 0.0;
  std::vector<std::string> columns;  // the layout the file was read with; empty before its header
  bool vanished = false;
  // The bytes just before `offset`, hex-encoded: a file rewritten and grown past the offset between
  // two reads keeps its inode and its size lead, but not these bytes.
  std::string signature;
};

// What a snapshot row stands for. A profile's point is a kStatistic with `profile` set.
enum class RowKind {
  kStatistic,       // a configured statistic, or one derived from them (u_tau, Re_tau)
  kProfileSummary,  // a profile's quantity over its points, or its momentum balance
  kGroup,           // a group's joint standing
};

// One statistic at one cycle: the numbers worth a history, and the full JSON object of status.
// nlohmann-json's move operations are noexcept; clang-tidy 14 follows its assertions into code
// that may throw and flags the implicit moves of every type holding a document.
// NOLINTNEXTLINE(bugprone-exception-escape)
struct SnapshotRow {
  std::string statistic;
  RowKind kind = RowKind::kStatistic;
  ConvergenceState state = ConvergenceState::kNoData;
  std::string state_reason;
  double value = 0.0;
  double half_width = 0.0;
  double relative_half_width = 0.0;
  double integrated_time = 0.0;
  double effective_samples = 0.0;
  // Simulated time: the integral time scale (integrated_time in the time column's units) and the
  // averaging time after the warm-up; NaN when unknown (rows of a store older than schema 4).
  double integral_time_scale = 0.0;
  double averaging_time = 0.0;
  double warmup_end_time = 0.0;
  std::int64_t samples_used = 0;
  double last_time = 0.0;
  double confidence = 0.0;
  std::optional<Target::Kind> target_kind;  // nullopt without a target
  double target_value = 0.0;
  double target_half_width = 0.0;
  double met_at_time = 0.0;  // NaN while not met
  double met_at_wall = 0.0;
  double remaining_time = 0.0;  // simulated time still needed for the target; NaN: unknown
  double remaining_wall = 0.0;  // the same in wall-clock seconds at the observed rate
  std::string reference_verdict;  // consistent, bias, undetermined, or empty without a reference
  std::string profile;  // a profile point's profile (status folds those into summaries)
  // The full status object (JSON: the store keeps its text for the newest cycle only).
  nlohmann::ordered_json document;
};

struct EventRow {
  std::int64_t id = 0;  // assigned by the store
  std::int64_t cycle = 0;
  double wall_time = 0.0;
  double simulated_time = 0.0;
  std::string statistic;  // empty for a run-wide event
  EventKind kind = EventKind::kMet;
  std::string message;
  // What an alert says beyond the message (NaN or empty when they do not apply).
  double value = 0.0;
  double half_width = 0.0;
  double confidence = 0.0;
  std::string target;          // "1 %", "0.002"
  double progress_rate = 0.0;  // simulated time per wall-clock hour, recently
  double elapsed_wall = 0.0;   // seconds since the run's first sample was read
  double remaining_time = 0.0;  // the run's simulated time still needed; NaN: unknown
  std::vector<std::string> channels;  // deliveries to create with the event (write only)
};

// One alert channel's delivery of one event.
struct DeliveryRow {
  EventRow event;
  std::string channel;  // email, command, stop_file
  int attempts = 0;
};

struct CycleRecord {
  std::int64_t cycle = 0;
  double wall_time = 0.0;
  double last_sample_time = 0.0;       // NaN before any sample
  double last_sample_wall_time = 0.0;  // when the newest sample was read
  bool run_met = false;
  double remaining_time = 0.0;  // the run's: the largest over unmet targets; NaN: unknown
  double remaining_wall = 0.0;
  std::string fingerprint;  // identity of what the checkpoint's estimator state means
  std::vector<SnapshotRow> snapshots;
  std::vector<EventRow> events;
  std::vector<FileProgress> files;
  std::map<std::string, std::vector<double>> checkpoint;  // item -> state
};

// One statistic at one cycle, for the report's time histories and the CSV export.
struct HistoryRow {
  std::int64_t cycle = 0;
  double wall_time = 0.0;
  SnapshotRow snapshot;  // without json
};

// The newest complete cycle, as status and check read it.
struct LatestView {
  std::string run_name;
  std::int64_t cycle = 0;
  double wall_time = 0.0;
  double last_sample_time = 0.0;
  double last_sample_wall_time = 0.0;
  bool run_met = false;
  double remaining_time = 0.0;
  double remaining_wall = 0.0;
  std::vector<SnapshotRow> statistics;  // in configuration order (groups last), with json
  std::vector<FileProgress> files;
};

struct StoredCheckpoint {
  std::int64_t cycle = 0;
  std::string fingerprint;
  std::vector<FileProgress> files;
  std::map<std::string, std::vector<double>> items;
};

class RunStore {
 public:
  static constexpr int kSchemaVersion = kStoreSchemaVersion;
  // Checkpoint items are stored in pages of this many doubles (3840 bytes: a row fits one 4 KiB
  // database page). A cycle rewrites only the pages that changed.
  static constexpr std::size_t kCheckpointPageDoubles = 480;

  // Opens for writing (creating and migrating the schema) or for reading only. An error when the
  // file cannot be opened, is not a plateau store, or comes from a newer schema.
  static Result<std::unique_ptr<RunStore>> OpenForWriting(const std::string& path,
                                                          const std::string& run_name);
  static Result<std::unique_ptr<RunStore>> OpenForReading(const std::string& path);

  // Writes one cycle in one transaction (all or nothing). Event ids are not returned. Of the
  // checkpoint, only the pages that differ from what this store last committed are written (the
  // first cycle after opening writes them all and removes every other row).
  Status WriteCycle(const CycleRecord& record);
  // Checkpoint pages the last successful WriteCycle wrote (for tests and benchmarks).
  std::size_t checkpoint_pages_written() const { return checkpoint_pages_written_; }
  // The newest checkpoint; nullopt for a new store.
  Result<std::optional<StoredCheckpoint>> ReadCheckpoint();
  // The newest cycle, read in one transaction; nullopt before the first cycle.
  Result<std::optional<LatestView>> ReadLatest();
  // Every snapshot of every cycle, cycle by cycle in configuration order, in one transaction.
  Result<std::vector<HistoryRow>> ReadHistory();
  // Events after `after_id`, oldest first, at most `limit`.
  Result<std::vector<EventRow>> ReadEvents(std::int64_t after_id, int limit);
  // Deliveries not yet made whose next attempt is due at `now`, oldest event first.
  Result<std::vector<DeliveryRow>> DueDeliveries(double now);
  // Records an attempt: delivered, or failed with `error` and retried at `retry_at` (NaN: given
  // up after the last attempt).
  Status RecordDelivery(std::int64_t event_id, const std::string& channel, bool delivered,
                        const std::string& error, double now, double retry_at);
  // Deliveries made, for tests and status: (event id, channel) pairs with state "delivered".
  Result<int> CountDeliveries(const std::string& state);

  // `PRAGMA integrity_check`: ok, or what SQLite found.
  Status CheckIntegrity();
  // The store file was deleted, moved or replaced while open (see SqliteConnection::HasMoved).
  bool HasMoved() const { return connection_->HasMoved(); }

  const std::string& path() const { return connection_->path(); }

 private:
  explicit RunStore(std::unique_ptr<SqliteConnection> connection)
      : connection_(std::move(connection)) {}
  Status Migrate(const std::string& run_name);
  Result<std::vector<FileProgress>> ReadFiles();
  using PageHashes = std::unordered_map<std::string, std::uint64_t>;
  // Inside WriteCycle's transaction: the checkpoint's changed pages (*written of them); `pages`
  // receives every page's hash, to become committed_pages_ once the transaction commits.
  Status WriteCheckpointPages(const CycleRecord& record, PageHashes& pages, std::size_t* written);

  std::unique_ptr<SqliteConnection> connection_;
  // Per checkpoint page ("state:NAME#k"), a 64-bit hash of what the last committed cycle holds:
  // a page is written again only when its hash changes. Empty until the first cycle is written.
  PageHashes committed_pages_;
  std::size_t checkpoint_pages_written_ = 0;
  // Fault injection for the crash tests: with PLATEAU_FAULT_KILL_IN_CYCLE=N in the environment the
  // process SIGKILLs itself halfway through the checkpoint pages of the first cycle from N on that
  // writes any (a quiet cycle writes none), inside the open transaction.
  std::int64_t kill_in_cycle_ = -1;
};

}  // namespace plateau

#endif  // PLATEAU_STORE_RUN_STORE_H_
