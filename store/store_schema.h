// The store's schema: the script of each version, the version a store holds, and the migration
// that brings an older store forward on open, each step in its own transaction. Holds no business
// rules.
#ifndef PLATEAU_STORE_STORE_SCHEMA_H_
#define PLATEAU_STORE_STORE_SCHEMA_H_

#include <string>

#include "core/status.h"
#include "store/sqlite_connection.h"

namespace plateau {

constexpr int kStoreSchemaVersion = 4;

// The version `db` holds: 0 for an empty file; an error for a database that is not a store.
Status ReadSchemaVersion(SqliteConnection& db, int* version);

// Creates or brings forward the schema to kStoreSchemaVersion and records `run_name`; an error
// for a store of a newer version.
Status MigrateSchema(SqliteConnection& db, const std::string& run_name);

}  // namespace plateau

#endif  // PLATEAU_STORE_STORE_SCHEMA_H_
