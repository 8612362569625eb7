#include "store/run_store.h"

#include <algorithm>
#include <array>
#include <cmath>
#include <csignal>
#include <cstdlib>
#include <cstring>

#include "store/snapshot_columns.h"
#include "store/store_schema.h"

namespace plateau {
namespace {

std::string JoinColumns(const std::vector<std::string>& columns) {
  std::string joined;
  for (std::size_t i = 0; i < columns.size(); ++i) joined += (i ? "\t" : "") + columns[i];
  return joined;
}

std::vector<std::string> SplitColumns(const std::string& joined) {
  std::vector<std::string> columns;
  if (joined.empty()) return columns;
  std::string item;
  for (char c : joined) {
    if (c == '\t') {
      columns.push_back(item);
      item.clear();
    } else {
      item += c;
    }
  }
  columns.push_back(item);
  return columns;
}

// A 64-bit hash of a checkpoint page's raw bits (SplitMix64's finaliser on each word): two
// versions of one page that differ anywhere differ here but with probability 2^-64.
std::uint64_t PageHash(const double* values, std::size_t count) {
  std::uint64_t h = 0x9e3779b97f4a7c15ULL ^ count;
  for (std::size_t i = 0; i < count; ++i) {
    std::uint64_t bits = 0;
    std::memcpy(&bits, values + i, sizeof bits);
    h ^= bits;
    h *= 0xbf58476d1ce4e5b9ULL;
    h ^= h >> 31;
    h *= 0x94d049bb133111ebULL;
    h ^= h >> 29;
  }
  return h;
}

// "state:NAME#k" for page k of item NAME.
std::string PageKey(const std::string& item, std::size_t page) {
  return "state:" + item + "#" + std::to_string(page);
}

}  // namespace

Result<std::unique_ptr<RunStore>> RunStore::OpenForWriting(const std::string& path,
                                                           const std::string& run_name) {
  Status status;
  auto connection = SqliteConnection::Open(path, SqliteConnection::Mode::kReadWrite, &status);
  if (!connection) return status;
  // WAL: readers never block the daemon and see only committed cycles. synchronous=NORMAL keeps
  // every committed cycle across a crash of the process; a power cut may lose the last one.
  status = connection->Execute("PRAGMA journal_mode=WAL; PRAGMA synchronous=NORMAL;");
  if (!status.ok()) return status;
  std::unique_ptr<RunStore> store(new RunStore(std::move(connection)));
  if (const char* fault = std::getenv("PLATEAU_FAULT_KILL_IN_CYCLE")) {
    store->kill_in_cycle_ = std::atoll(fault);
  }
  status = store->Migrate(run_name);
  if (!status.ok()) return status;
  return store;
}

Result<std::unique_ptr<RunStore>> RunStore::OpenForReading(const std::string& path) {
  Status status;
  auto connection = SqliteConnection::Open(path, SqliteConnection::Mode::kReadOnly, &status);
  if (!connection) return status;
  std::unique_ptr<RunStore> store(new RunStore(std::move(connection)));
  int version = 0;
  status = ReadSchemaVersion(*store->connection_, &version);
  if (!status.ok()) return status;
  if (version == 0) {
    return Status::Error("store " + path + " is empty: the daemon has not written to it yet");
  }
  if (version > kSchemaVersion) {
    return Status::Error("store " + path + " has schema version " + std::to_string(version) +
                         "; this plateau reads up to " + std::to_string(kSchemaVersion));
  }
  return store;
}

Status RunStore::Migrate(const std::string& run_name) {
  return MigrateSchema(*connection_, run_name);
}

Status RunStore::WriteCheckpointPages(const CycleRecord& r, PageHashes& pages,
                                      std::size_t* written) {
  SqliteConnection& db = *connection_;
  Status s;
  // The first cycle of this connection writes every page and clears whatever else is there:
  // pages of items that are gone, or of a longer history before a merge.
  if (committed_pages_.empty() && !(s = db.Execute("DELETE FROM checkpoint")).ok()) return s;
  struct Page {
    const std::string* key;
    const double* values;
    std::size_t count;
  };
  std::vector<Page> changed;
  for (const auto& [name, state] : r.checkpoint) {
    const std::size_t count = std::max<std::size_t>(
        1, (state.size() + kCheckpointPageDoubles - 1) / kCheckpointPageDoubles);
    for (std::size_t k = 0; k < count; ++k) {
      const std::size_t begin = k * kCheckpointPageDoubles;
      const std::size_t size = std::min(kCheckpointPageDoubles, state.size() - begin);
      const std::uint64_t hash = PageHash(state.data() + begin, size);
      const auto it = pages.emplace(PageKey(name, k), hash).first;
      const auto before = committed_pages_.find(it->first);
      if (before == committed_pages_.end() || before->second != hash) {
        changed.push_back({&it->first, state.data() + begin, size});
      }
    }
  }
  auto put = db.Prepare("INSERT OR REPLACE INTO checkpoint(item, state) VALUES (?1, ?2)", &s);
  auto drop = db.Prepare("DELETE FROM checkpoint WHERE item = ?1", &s);
  if (!put || !drop) return s;
  for (std::size_t i = 0; i < changed.size(); ++i) {
    put->Reset();
    put->Bind(1, *changed[i].key);
    put->BindBlob(2, changed[i].values, changed[i].count);
    if (!(s = put->Run()).ok()) return s;
    if (kill_in_cycle_ > 0 && r.cycle >= kill_in_cycle_ && i + 1 == (changed.size() + 1) / 2) {
      std::raise(SIGKILL);
    }
  }
  for (const auto& [key, hash] : committed_pages_) {
    if (pages.count(key) > 0) continue;
    drop->Reset();
    drop->Bind(1, key);
    if (!(s = drop->Run()).ok()) return s;
  }
  *written = changed.size();
  return Status::Ok();
}

Status RunStore::WriteCycle(const CycleRecord& r) {
  SqliteConnection& db = *connection_;
  PageHashes pages;
  std::size_t pages_written = 0;
  Status written = InTransaction(db, [&]() -> Status {
    Status s;
    auto cycle = db.Prepare(
        "INSERT OR REPLACE INTO cycles(cycle, wall_time, last_sample_time, "
        "last_sample_wall_time, run_met, remaining_time, remaining_wall) "
        "VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7)",
        &s);
    if (!cycle) return s;
    cycle->Bind(1, r.cycle);
    cycle->Bind(2, r.wall_time);
    cycle->Bind(3, r.last_sample_time);
    cycle->Bind(4, r.last_sample_wall_time);
    cycle->Bind(5, static_cast<std::int64_t>(r.run_met));
    cycle->Bind(6, r.remaining_time);
    cycle->Bind(7, r.remaining_wall);
    if (!(s = cycle->Run()).ok()) return s;

    if (!(s = db.Execute("DELETE FROM latest")).ok()) return s;
    auto snapshot = db.Prepare(kInsertSnapshot, &s);
    auto latest = db.Prepare("INSERT INTO latest VALUES (?1, ?2)", &s);
    if (!snapshot || !latest) return s;
    for (std::size_t i = 0; i < r.snapshots.size(); ++i) {
      const SnapshotRow& row = r.snapshots[i];
      const auto position = static_cast<std::int64_t>(i);
      BindSnapshot(*snapshot, r.cycle, position, row);
      if (!(s = snapshot->Run()).ok()) return s;
      latest->Reset();
      latest->Bind(1, position);
      // Invalid UTF-8 (a Latin-1 file name) is written as U+FFFD rather than failing the cycle.
      latest->Bind(2, row.document.dump(-1, ' ', false, nlohmann::detail::error_handler_t::replace));
      if (!(s = latest->Run()).ok()) return s;
    }

    auto event = db.Prepare(
        "INSERT INTO events(cycle, wall_time, simulated_time, statistic, kind, message, value, "
        "half_width, confidence, target, progress_rate, elapsed_wall, remaining_time) "
        "VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12, ?13)",
        &s);
    auto delivery = db.Prepare(
        "INSERT INTO deliveries VALUES (?1, ?2, 'pending', 0, ?3, NULL, '')", &s);
    if (!event || !delivery) return s;
    for (const EventRow& e : r.events) {
      event->Reset();
      event->Bind(1, r.cycle);
      event->Bind(2, e.wall_time);
      event->Bind(3, e.simulated_time);
      event->Bind(4, e.statistic);
      event->Bind(5, std::string(EventKindName(e.kind)));
      event->Bind(6, e.message);
      event->Bind(7, e.value);
      event->Bind(8, e.half_width);
      event->Bind(9, e.confidence);
      event->Bind(10, e.target);
      event->Bind(11, e.progress_rate);
      event->Bind(12, e.elapsed_wall);
      event->Bind(13, e.remaining_time);
      if (!(s = event->Run()).ok()) return s;
      const std::int64_t id = db.LastInsertId();
      for (const std::string& channel : e.channels) {
        delivery->Reset();
        delivery->Bind(1, id);
        delivery->Bind(2, channel);
        delivery->Bind(3, e.wall_time);
        if (!(s = delivery->Run()).ok()) return s;
      }
    }

    auto file = db.Prepare(
        "INSERT OR REPLACE INTO files VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12)",
        &s);
    if (!file) return s;
    for (const FileProgress& f : r.files) {
      file->Reset();
      file->Bind(1, f.path);
      file->Bind(2, f.source);
      file->Bind(3, f.inode);
      file->Bind(4, f.offset);
      file->Bind(5, f.lines);
      file->Bind(6, f.rows);
      file->Bind(7, f.bad_lines);
      file->Bind(8, f.first_time);
      file->Bind(9, f.last_time);
      file->Bind(10, JoinColumns(f.columns));
      file->Bind(11, static_cast<std::int64_t>(f.vanished));
      file->Bind(12, f.signature);
      if (!(s = file->Run()).ok()) return s;
    }

    if (!(s = WriteCheckpointPages(r, pages, &pages_written)).ok()) return s;
    auto meta = db.Prepare(
        "INSERT OR REPLACE INTO meta(key, value) VALUES ('checkpoint_cycle', ?1), "
        "('fingerprint', ?2)",
        &s);
    if (!meta) return s;
    meta->Bind(1, std::to_string(r.cycle));
    meta->Bind(2, r.fingerprint);
    return meta->Run();
  });
  // Only a committed cycle changes what the next one compares against.
  if (written.ok()) {
    committed_pages_ = std::move(pages);
    checkpoint_pages_written_ = pages_written;
  }
  return written;
}

Result<std::vector<FileProgress>> RunStore::ReadFiles() {
  std::vector<FileProgress> files;
  Status status;
  auto query = connection_->Prepare(
      "SELECT path, source, inode, offset, lines, rows, bad_lines, first_time, last_time, "
      "columns, vanished, signature FROM files ORDER BY rowid",
      &status);
  if (!query) return status;
  while (query->Step()) {
    FileProgress f;
    f.path = query->ColumnText(0);
    f.source = query->ColumnText(1);
    f.inode = query->ColumnInt(2);
    f.offset = query->ColumnInt(3);
    f.lines = query->ColumnInt(4);
    f.rows = query->ColumnInt(5);
    f.bad_lines = query->ColumnInt(6);
    f.first_time = query->ColumnDouble(7);
    f.last_time = query->ColumnDouble(8);
    f.columns = SplitColumns(query->ColumnText(9));
    f.vanished = query->ColumnInt(10) != 0;
    f.signature = query->ColumnText(11);
    files.push_back(std::move(f));
  }
  if (!query->status().ok()) return query->status();
  return files;
}

Result<std::optional<StoredCheckpoint>> RunStore::ReadCheckpoint() {
  Status status;
  auto meta = connection_->Prepare(
      "SELECT (SELECT value FROM meta WHERE key = 'checkpoint_cycle'), "
      "(SELECT value FROM meta WHERE key = 'fingerprint')",
      &status);
  if (!meta) return status;
  if (!meta->Step() || meta->ColumnText(0).empty()) {
    if (!meta->status().ok()) return meta->status();
    return std::optional<StoredCheckpoint>();
  }
  StoredCheckpoint c;
  c.cycle = std::stoll(meta->ColumnText(0));
  c.fingerprint = meta->ColumnText(1);
  Result<std::vector<FileProgress>> files = ReadFiles();
  if (!files.ok()) return files.status();
  c.files = std::move(files).value();
  auto items = connection_->Prepare("SELECT item, state FROM checkpoint", &status);
  if (!items) return status;
  // Pages of each item by number; an item whose pages are not 0..n-1 is left out (its owner
  // then starts empty and says so), which a transaction-per-cycle store never holds.
  std::map<std::string, std::map<std::size_t, std::vector<double>>> paged;
  while (items->Step()) {
    const std::string key = items->ColumnText(0);
    const std::size_t hash = key.rfind('#');
    if (key.rfind("state:", 0) != 0 || hash == std::string::npos || hash + 1 == key.size() ||
        key.find_first_not_of("0123456789", hash + 1) != std::string::npos) {
      continue;
    }
    paged[key.substr(6, hash - 6)][std::stoull(key.substr(hash + 1))] = items->ColumnBlob(1);
  }
  if (!items->status().ok()) return items->status();
  for (auto& [name, pages] : paged) {
    if (pages.rbegin()->first + 1 != pages.size()) continue;
    std::vector<double>& state = c.items[name];
    for (auto& [k, values] : pages) state.insert(state.end(), values.begin(), values.end());
  }
  return std::optional<StoredCheckpoint>(std::move(c));
}

Result<std::optional<LatestView>> RunStore::ReadLatest() {
  // One read transaction: in WAL mode it sees one committed cycle, never half of the next.
  Status status = connection_->Execute("BEGIN");
  if (!status.ok()) return status;
  std::optional<LatestView> view;
  [&] {
    auto cycle = connection_->Prepare(
        "SELECT cycle, wall_time, last_sample_time, last_sample_wall_time, run_met, "
        "(SELECT value FROM meta WHERE key = 'run_name'), remaining_time, remaining_wall "
        "FROM cycles ORDER BY cycle DESC LIMIT 1",
        &status);
    if (!cycle) return;
    if (!cycle->Step()) {
      status = cycle->status();
      return;
    }
    LatestView v;
    v.cycle = cycle->ColumnInt(0);
    v.wall_time = cycle->ColumnDouble(1);
    v.last_sample_time = cycle->ColumnDouble(2);
    v.last_sample_wall_time = cycle->ColumnDouble(3);
    v.run_met = cycle->ColumnInt(4) != 0;
    v.run_name = cycle->ColumnText(5);
    v.remaining_time = cycle->ColumnDouble(6);
    v.remaining_wall = cycle->ColumnDouble(7);
    auto rows = connection_->Prepare(std::string("SELECT ") + kSnapshotColumns +
                                         ", l.json FROM snapshots s JOIN latest l ON "
                                         "l.position = s.position WHERE s.cycle = ?1 "
                                         "ORDER BY s.position",
                                     &status);
    if (!rows) return;
    rows->Bind(1, v.cycle);
    while (rows->Step()) {
      SnapshotRow row = SnapshotAt(*rows, 0);
      // Written by WriteCycle; a text that does not parse (a damaged file) reads as null.
      row.document =
          nlohmann::ordered_json::parse(rows->ColumnText(kSnapshotColumnCount), nullptr, false);
      if (row.document.is_discarded()) row.document = nullptr;
      v.statistics.push_back(std::move(row));
    }
    if (!(status = rows->status()).ok()) return;
    Result<std::vector<FileProgress>> files = ReadFiles();
    if (!files.ok()) {
      status = files.status();
      return;
    }
    v.files = std::move(files).value();
    view = std::move(v);
  }();
  connection_->Execute("COMMIT");
  if (!status.ok()) return status;
  return view;
}

namespace {

constexpr const char* kEventColumns =
    "e.id, e.cycle, e.wall_time, e.simulated_time, e.statistic, e.kind, e.message, e.value, "
    "e.half_width, e.confidence, e.target, e.progress_rate, e.elapsed_wall, e.remaining_time";

// Reads the kEventColumns of a row, starting at column `first`.
EventRow EventAt(const SqliteStatement& q, int first) {
  EventRow e;
  e.id = q.ColumnInt(first);
  e.cycle = q.ColumnInt(first + 1);
  e.wall_time = q.ColumnDouble(first + 2);
  e.simulated_time = q.ColumnDouble(first + 3);
  e.statistic = q.ColumnText(first + 4);
  // The kinds a store holds are those this build writes (the schema version guards the rest).
  e.kind = EventKindFromName(q.ColumnText(first + 5)).value_or(EventKind::kMet);
  e.message = q.ColumnText(first + 6);
  e.value = q.ColumnDouble(first + 7);
  e.half_width = q.ColumnDouble(first + 8);
  e.confidence = q.ColumnDouble(first + 9);
  e.target = q.ColumnText(first + 10);
  e.progress_rate = q.ColumnDouble(first + 11);
  e.elapsed_wall = q.ColumnDouble(first + 12);
  e.remaining_time = q.ColumnDouble(first + 13);
  return e;
}

}  // namespace

Result<std::vector<EventRow>> RunStore::ReadEvents(std::int64_t after_id, int limit) {
  std::vector<EventRow> events;
  Status status;
  auto query = connection_->Prepare(std::string("SELECT ") + kEventColumns +
                                        " FROM events e WHERE e.id > ?1 ORDER BY e.id LIMIT ?2",
                                    &status);
  if (!query) return status;
  query->Bind(1, after_id);
  query->Bind(2, static_cast<std::int64_t>(limit));
  while (query->Step()) events.push_back(EventAt(*query, 0));
  if (!query->status().ok()) return query->status();
  return events;
}

Result<std::vector<HistoryRow>> RunStore::ReadHistory() {
  std::vector<HistoryRow> history;
  Status status;
  auto query = connection_->Prepare(std::string("SELECT s.cycle, c.wall_time, ") +
                                        kSnapshotColumns +
                                        " FROM snapshots s JOIN cycles c ON c.cycle = s.cycle "
                                        "ORDER BY s.cycle, s.position",
                                    &status);
  if (!query) return status;
  while (query->Step()) {
    history.push_back({query->ColumnInt(0), query->ColumnDouble(1), SnapshotAt(*query, 2)});
  }
  if (!query->status().ok()) return query->status();
  return history;
}

Result<std::vector<DeliveryRow>> RunStore::DueDeliveries(double now) {
  std::vector<DeliveryRow> due;
  Status status;
  auto query = connection_->Prepare(
      std::string("SELECT d.channel, d.attempts, ") + kEventColumns +
          " FROM deliveries d JOIN events e ON e.id = d.event_id WHERE d.state = 'pending' AND "
          "d.next_attempt_at <= ?1 ORDER BY e.id, d.channel",
      &status);
  if (!query) return status;
  query->Bind(1, now);
  while (query->Step()) {
    DeliveryRow d;
    d.channel = query->ColumnText(0);
    d.attempts = static_cast<int>(query->ColumnInt(1));
    d.event = EventAt(*query, 2);
    due.push_back(std::move(d));
  }
  if (!query->status().ok()) return query->status();
  return due;
}

Status RunStore::RecordDelivery(std::int64_t event_id, const std::string& channel, bool delivered,
                                const std::string& error, double now, double retry_at) {
  Status status;
  auto update = connection_->Prepare(
      "UPDATE deliveries SET state = ?3, attempts = attempts + 1, next_attempt_at = ?4, "
      "last_attempt_at = ?5, last_error = ?6 WHERE event_id = ?1 AND channel = ?2",
      &status);
  if (!update) return status;
  update->Bind(1, event_id);
  update->Bind(2, channel);
  update->Bind(3, std::string(delivered ? "delivered" : std::isnan(retry_at) ? "failed" : "pending"));
  update->Bind(4, retry_at);
  update->Bind(5, now);
  update->Bind(6, error);
  return update->Run();
}

Result<int> RunStore::CountDeliveries(const std::string& state) {
  Status status;
  auto query = connection_->Prepare("SELECT count(*) FROM deliveries WHERE state = ?1", &status);
  if (!query) return status;
  query->Bind(1, state);
  const int count = query->Step() ? static_cast<int>(query->ColumnInt(0)) : -1;
  if (!query->status().ok()) return query->status();
  return count;
}

Status RunStore::CheckIntegrity() {
  Status status;
  auto query = connection_->Prepare("PRAGMA integrity_check", &status);
  if (!query) return status;
  std::string result;
  while (query->Step()) result += (result.empty() ? "" : "; ") + query->ColumnText(0);
  if (!query->status().ok()) return query->status();
  return result == "ok" ? Status::Ok() : Status::Error("store " + path() + ": " + result);
}

}  // namespace plateau
