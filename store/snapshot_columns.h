// How a SnapshotRow sits in the store's snapshots table: the insert's parameters, the columns a
// read selects, and the row read back from them. Holds no business rules.
#ifndef PLATEAU_STORE_SNAPSHOT_COLUMNS_H_
#define PLATEAU_STORE_SNAPSHOT_COLUMNS_H_

#include <cstdint>

#include "store/run_store.h"
#include "store/sqlite_connection.h"

namespace plateau {

// "INSERT OR REPLACE INTO snapshots VALUES (?1, ..., ?25)": the cycle, the position, the row.
extern const char* const kInsertSnapshot;
void BindSnapshot(SqliteStatement& insert, std::int64_t cycle, std::int64_t position,
                  const SnapshotRow& row);

// The columns of table `s` (snapshots) that SnapshotAt reads, in its order (23 of them).
extern const char* const kSnapshotColumns;
constexpr int kSnapshotColumnCount = 23;
// The row whose kSnapshotColumns start at column `first` of the current result row.
SnapshotRow SnapshotAt(const SqliteStatement& query, int first);

}  // namespace plateau

#endif  // PLATEAU_STORE_SNAPSHOT_COLUMNS_H_
