#include "store/sqlite_connection.h"

#include <sqlite3.h>

#include <cmath>
#include <cstring>
#include <limits>

namespace plateau {

SqliteStatement::SqliteStatement(sqlite3_stmt* statement, sqlite3* db)
    : statement_(statement), db_(db) {}

SqliteStatement::~SqliteStatement() { sqlite3_finalize(statement_); }

void SqliteStatement::Bind(int index, double value) {
  if (std::isnan(value)) {
    sqlite3_bind_null(statement_, index);
  } else {
    sqlite3_bind_double(statement_, index, value);
  }
}

void SqliteStatement::Bind(int index, std::int64_t value) {
  sqlite3_bind_int64(statement_, index, value);
}

void SqliteStatement::Bind(int index, const std::string& value) {
  sqlite3_bind_text(statement_, index, value.data(), static_cast<int>(value.size()),
                    SQLITE_TRANSIENT);
}

void SqliteStatement::BindBlob(int index, const double* values, std::size_t count) {
  // Raw IEEE doubles: a checkpoint must restore every bit (the restart test compares to 1e-12).
  // An empty blob is bound as one, not as the NULL a null pointer would give.
  if (count == 0) {
    sqlite3_bind_zeroblob(statement_, index, 0);
    return;
  }
  sqlite3_bind_blob(statement_, index, values, static_cast<int>(count * sizeof(double)),
                    SQLITE_TRANSIENT);
}

bool SqliteStatement::Step() {
  const int rc = sqlite3_step(statement_);
  if (rc == SQLITE_ROW) return true;
  if (rc != SQLITE_DONE && status_.ok()) status_ = Status::Error(sqlite3_errmsg(db_));
  return false;
}

Status SqliteStatement::Run() {
  while (Step()) {
  }
  return status_;
}

void SqliteStatement::Reset() {
  sqlite3_reset(statement_);
  sqlite3_clear_bindings(statement_);
}

double SqliteStatement::ColumnDouble(int index) const {
  if (sqlite3_column_type(statement_, index) == SQLITE_NULL) {
    return std::numeric_limits<double>::quiet_NaN();
  }
  return sqlite3_column_double(statement_, index);
}

std::int64_t SqliteStatement::ColumnInt(int index) const {
  return sqlite3_column_int64(statement_, index);
}

std::string SqliteStatement::ColumnText(int index) const {
  const unsigned char* text = sqlite3_column_text(statement_, index);
  return text == nullptr ? std::string() : std::string(reinterpret_cast<const char*>(text));
}

std::vector<double> SqliteStatement::ColumnBlob(int index) const {
  const void* data = sqlite3_column_blob(statement_, index);
  const int bytes = sqlite3_column_bytes(statement_, index);
  std::vector<double> values(static_cast<std::size_t>(bytes) / sizeof(double));
  if (data != nullptr && !values.empty()) std::memcpy(values.data(), data, values.size() * 8);
  return values;
}

std::unique_ptr<SqliteConnection> SqliteConnection::Open(const std::string& path, Mode mode,
                                                         Status* status) {
  sqlite3* db = nullptr;
  const int flags = mode == Mode::kReadOnly ? SQLITE_OPEN_READONLY
                                            : SQLITE_OPEN_READWRITE | SQLITE_OPEN_CREATE;
  const int rc = sqlite3_open_v2(path.c_str(), &db, flags | SQLITE_OPEN_NOMUTEX, nullptr);
  if (rc != SQLITE_OK) {
    *status = Status::Error("store " + path + ": " +
                            (db != nullptr ? sqlite3_errmsg(db) : sqlite3_errstr(rc)));
    sqlite3_close(db);
    return nullptr;
  }
  sqlite3_busy_timeout(db, 5000);
  *status = Status::Ok();
  return std::unique_ptr<SqliteConnection>(new SqliteConnection(db, path));
}

SqliteConnection::~SqliteConnection() { sqlite3_close(db_); }

std::int64_t SqliteConnection::LastInsertId() const { return sqlite3_last_insert_rowid(db_); }

bool SqliteConnection::HasMoved() const {
  int moved = 0;
  return sqlite3_file_control(db_, "main", SQLITE_FCNTL_HAS_MOVED, &moved) == SQLITE_OK &&
         moved != 0;
}

std::string SqliteConnection::LastError() const {
  return "store " + path_ + ": " + sqlite3_errmsg(db_);
}

Status SqliteConnection::Execute(const std::string& sql) {
  char* message = nullptr;
  if (sqlite3_exec(db_, sql.c_str(), nullptr, nullptr, &message) != SQLITE_OK) {
    const std::string text = "store " + path_ + ": " + (message != nullptr ? message : "error");
    sqlite3_free(message);
    return Status::Error(text);
  }
  return Status::Ok();
}

std::unique_ptr<SqliteStatement> SqliteConnection::Prepare(const std::string& sql,
                                                           Status* status) {
  sqlite3_stmt* statement = nullptr;
  if (sqlite3_prepare_v2(db_, sql.c_str(), -1, &statement, nullptr) != SQLITE_OK) {
    *status = Status::Error(LastError());
    return nullptr;
  }
  *status = Status::Ok();
  return std::make_unique<SqliteStatement>(statement, db_);
}

}  // namespace plateau
