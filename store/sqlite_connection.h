// One SQLite connection and its prepared statements, with errors turned into Status messages that
// name the store file. The only place that calls the sqlite3 C API. Not thread-safe: one owner.
#ifndef PLATEAU_STORE_SQLITE_CONNECTION_H_
#define PLATEAU_STORE_SQLITE_CONNECTION_H_

#include <cstdint>
#include <memory>
#include <string>
#include <vector>

#include "core/status.h"

struct sqlite3;
struct sqlite3_stmt;

namespace plateau {

class SqliteStatement {
 public:
  SqliteStatement(sqlite3_stmt* statement, sqlite3* db);
  ~SqliteStatement();
  SqliteStatement(const SqliteStatement&) = delete;
  SqliteStatement& operator=(const SqliteStatement&) = delete;

  // Bind by 1-based position. NaN binds as NULL.
  void Bind(int index, double value);
  void Bind(int index, std::int64_t value);
  void Bind(int index, const std::string& value);
  void BindBlob(int index, const double* values, std::size_t count);

  // Steps once: true with a row, false when done. An error ends the statement and is kept in
  // status().
  bool Step();
  // Runs to completion (an INSERT or UPDATE); returns status().
  Status Run();
  void Reset();

  double ColumnDouble(int index) const;  // NULL reads as NaN
  std::int64_t ColumnInt(int index) const;
  std::string ColumnText(int index) const;
  std::vector<double> ColumnBlob(int index) const;
  const Status& status() const { return status_; }

 private:
  sqlite3_stmt* statement_;
  sqlite3* db_;
  Status status_ = Status::Ok();
};

class SqliteConnection {
 public:
  enum class Mode { kReadWrite, kReadOnly };

  // Opens (and for kReadWrite creates) the database at `path`. Returns nullptr with *status set
  // when it cannot be opened.
  static std::unique_ptr<SqliteConnection> Open(const std::string& path, Mode mode,
                                                Status* status);
  ~SqliteConnection();
  SqliteConnection(const SqliteConnection&) = delete;
  SqliteConnection& operator=(const SqliteConnection&) = delete;

  Status Execute(const std::string& sql);
  // nullptr with *status set on a malformed statement.
  std::unique_ptr<SqliteStatement> Prepare(const std::string& sql, Status* status);
  const std::string& path() const { return path_; }
  std::int64_t LastInsertId() const;
  // True when the database file was deleted, renamed or replaced since it was opened: the path
  // no longer names the file this connection writes (SQLITE_FCNTL_HAS_MOVED).
  bool HasMoved() const;
  // "store PATH: <sqlite message>" for the last failure on this connection.
  std::string LastError() const;

 private:
  SqliteConnection(sqlite3* db, std::string path) : db_(db), path_(std::move(path)) {}

  sqlite3* db_;
  std::string path_;
};

// Runs `body` inside BEGIN IMMEDIATE .. COMMIT, rolling back on any failure.
template <typename Body>
Status InTransaction(SqliteConnection& db, Body body) {
  Status status = db.Execute("BEGIN IMMEDIATE");
  if (!status.ok()) return status;
  status = body();
  if (status.ok()) status = db.Execute("COMMIT");
  if (!status.ok()) db.Execute("ROLLBACK");
  return status;
}

}  // namespace plateau

#endif  // PLATEAU_STORE_SQLITE_CONNECTION_H_
