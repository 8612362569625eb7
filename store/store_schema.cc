#include "store/store_schema.h"

#include <array>

namespace plateau {
namespace {

// Schema scripts by version: kMigrations[v - 1] takes a store from version v - 1 to v. A new
// version appends a script (ALTER TABLE, new tables) and raises kStoreSchemaVersion; old stores are
// brought forward on open, in order, each step in its own transaction.
constexpr std::array<const char*, kStoreSchemaVersion> kMigrations = {R"sql(
CREATE TABLE meta(key TEXT PRIMARY KEY, value TEXT NOT NULL);
CREATE TABLE cycles(
  cycle INTEGER PRIMARY KEY,
  wall_time REAL NOT NULL,
  last_sample_time REAL,
  last_sample_wall_time REAL,
  run_met INTEGER NOT NULL);
CREATE TABLE snapshots(
  cycle INTEGER NOT NULL,
  position INTEGER NOT NULL,
  statistic TEXT NOT NULL,
  state TEXT NOT NULL,
  state_reason TEXT NOT NULL,
  value REAL, half_width REAL, relative_half_width REAL, integrated_time REAL,
  effective_samples REAL, warmup_end_time REAL, samples_used INTEGER, last_time REAL,
  confidence REAL, target_kind TEXT NOT NULL, target_value REAL, target_half_width REAL,
  met_at_time REAL, met_at_wall REAL,
  PRIMARY KEY(cycle, position));
CREATE TABLE latest(position INTEGER PRIMARY KEY, json TEXT NOT NULL);
CREATE TABLE events(
  id INTEGER PRIMARY KEY AUTOINCREMENT,
  cycle INTEGER NOT NULL,
  wall_time REAL NOT NULL,
  simulated_time REAL,
  statistic TEXT NOT NULL,
  kind TEXT NOT NULL,
  message TEXT NOT NULL);
CREATE TABLE files(
  path TEXT PRIMARY KEY,
  source TEXT NOT NULL,
  inode INTEGER NOT NULL,
  offset INTEGER NOT NULL,
  lines INTEGER NOT NULL,
  rows INTEGER NOT NULL,
  bad_lines INTEGER NOT NULL,
  first_time REAL,
  last_time REAL,
  columns TEXT NOT NULL,
  vanished INTEGER NOT NULL,
  signature TEXT NOT NULL);
CREATE TABLE checkpoint(item TEXT PRIMARY KEY, state BLOB NOT NULL);
INSERT INTO meta(key, value) VALUES ('application', 'plateau');
)sql",
                                                                           R"sql(
ALTER TABLE events ADD COLUMN value REAL;
ALTER TABLE events ADD COLUMN half_width REAL;
ALTER TABLE events ADD COLUMN confidence REAL;
ALTER TABLE events ADD COLUMN target TEXT NOT NULL DEFAULT '';
ALTER TABLE events ADD COLUMN progress_rate REAL;
ALTER TABLE events ADD COLUMN elapsed_wall REAL;
ALTER TABLE events ADD COLUMN remaining_time REAL;
ALTER TABLE snapshots ADD COLUMN remaining_time REAL;
ALTER TABLE snapshots ADD COLUMN remaining_wall REAL;
ALTER TABLE snapshots ADD COLUMN reference_verdict TEXT NOT NULL DEFAULT '';
ALTER TABLE snapshots ADD COLUMN profile TEXT NOT NULL DEFAULT '';
ALTER TABLE cycles ADD COLUMN remaining_time REAL;
ALTER TABLE cycles ADD COLUMN remaining_wall REAL;
CREATE TABLE deliveries(
  event_id INTEGER NOT NULL REFERENCES events(id),
  channel TEXT NOT NULL,
  state TEXT NOT NULL,
  attempts INTEGER NOT NULL,
  next_attempt_at REAL,
  last_attempt_at REAL,
  last_error TEXT NOT NULL,
  PRIMARY KEY(event_id, channel));
)sql",
                                                                           R"sql(
UPDATE checkpoint SET item = item || '#0' WHERE item LIKE 'state:%';
)sql",
                                                                           R"sql(
ALTER TABLE snapshots ADD COLUMN integral_time_scale REAL;
ALTER TABLE snapshots ADD COLUMN averaging_time REAL;
)sql"};

}  // namespace

Status ReadSchemaVersion(SqliteConnection& db, int* version) {
  Status status;
  auto tables = db.Prepare(
      "SELECT count(*), sum(name = 'meta') FROM sqlite_master WHERE type = 'table'", &status);
  if (!tables) return status;
  if (!tables->Step()) {
    return tables->status().ok() ? Status::Error(db.LastError())
                                 : Status::Error("store " + db.path() + ": " +
                                                 tables->status().message());
  }
  const std::int64_t count = tables->ColumnInt(0);
  const std::int64_t has_meta = tables->ColumnInt(1);
  if (count == 0) {
    *version = 0;
    return Status::Ok();
  }
  if (has_meta == 0) return Status::Error("store " + db.path() + " is not a plateau store");
  auto query = db.Prepare(
      "SELECT value FROM meta WHERE key = 'schema_version'", &status);
  if (!query) return status;
  *version = query->Step() ? std::stoi(query->ColumnText(0)) : 0;
  return query->status();
}

Status MigrateSchema(SqliteConnection& db, const std::string& run_name) {
  int version = 0;
  Status status = ReadSchemaVersion(db, &version);
  if (!status.ok()) return status;
  if (version > kStoreSchemaVersion) {
    return Status::Error("store " + db.path() + " has schema version " + std::to_string(version) +
                         "; this plateau writes version " + std::to_string(kStoreSchemaVersion) +
                         ": use the newer plateau");
  }
  for (int next = version + 1; next <= kStoreSchemaVersion; ++next) {
    status = InTransaction(db, [&] {
      Status step = db.Execute(kMigrations[next - 1]);
      if (!step.ok()) return step;
      Status prepared;
      auto set = db.Prepare(
          "INSERT OR REPLACE INTO meta(key, value) VALUES ('schema_version', ?1), "
          "('run_name', ?2)",
          &prepared);
      if (!set) return prepared;
      set->Bind(1, std::to_string(next));
      set->Bind(2, run_name);
      return set->Run();
    });
    if (!status.ok()) return status;
  }
  return Status::Ok();
}

}  // namespace plateau
