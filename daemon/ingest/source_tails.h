// Every source of a run, each followed by its SourceTail: built from the config, polled together,
// checkpointed and restored together, and asked together for the newest sample and the bad lines.
// Not thread-safe: the monitor owns it.
#ifndef PLATEAU_DAEMON_INGEST_SOURCE_TAILS_H_
#define PLATEAU_DAEMON_INGEST_SOURCE_TAILS_H_

#include <spdlog/spdlog.h>

#include <cstdint>
#include <memory>
#include <string>
#include <vector>

#include "config/run_config.h"
#include "daemon/ingest/source_tail.h"
#include "store/run_store.h"

namespace plateau {

// What the metrics show of one source.
struct SourceCounters {
  std::string source;
  std::uint64_t samples = 0;  // admitted (after the restart-overlap gate)
  std::uint64_t bad_lines = 0;
  double last_sample_wall = 0.0;  // NaN before the first
};

class SourceTails {
 public:
  // One tail per configured source, reading the statistics the config gives it.
  SourceTails(const RunConfig& config, const std::shared_ptr<spdlog::logger>& log);

  // The tail of source `name`; nullptr when there is none.
  SourceTail* Find(const std::string& name);
  // Reads what the files gained. Returns true when more bytes are waiting.
  bool Poll(double wall_time);
  // Folders worth an inotify watch, each once, sorted.
  std::vector<std::string> Folders() const;
  void ShiftWallClock(double seconds);
  void Checkpoint(CycleRecord& record);
  void Restore(const StoredCheckpoint& checkpoint);

  // The newest sample over every source: its simulated time and when it was read; NaN before any.
  double last_sample_time() const;
  double last_sample_wall_time() const;
  std::uint64_t bad_lines() const;  // over every source, since the run started
  std::vector<SourceCounters> Counters() const;  // per source, in config order

  const std::vector<std::unique_ptr<SourceTail>>& tails() const { return tails_; }

 private:
  std::vector<std::unique_ptr<SourceTail>> tails_;
};

}  // namespace plateau

#endif  // PLATEAU_DAEMON_INGEST_SOURCE_TAILS_H_
