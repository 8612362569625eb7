// Follows the probe files of one source while a solver writes them: expands the source's glob on
// every poll (a restarted solver adds files or folders), reads each file from where it stopped, in
// the order of the files' first times, and feeds the rows to the source's statistics. Notices
// truncated, replaced and vanished files. Never fails for bad input: it logs and carries on.
// Not thread-safe: the daemon's event loop owns it.
#ifndef PLATEAU_DAEMON_INGEST_SOURCE_TAIL_H_
#define PLATEAU_DAEMON_INGEST_SOURCE_TAIL_H_

#include <spdlog/spdlog.h>

#include <cstdint>
#include <limits>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "config/run_config.h"
#include "core/row_parser.h"
#include "core/source_statistics.h"
#include "daemon/ingest/series_sink.h"
#include "store/run_store.h"

namespace plateau {

class SourceTail {
 public:
  // At most this many bytes are read per file and poll, so that a catch-up on gigabytes of existing
  // files leaves the event loop free between slices (signals, evaluations).
  static constexpr std::uint64_t kBytesPerPoll = 64 << 20;
  // Bad lines logged one by one per file; later ones are summarised once per poll.
  static constexpr std::uint64_t kBadLinesLoggedPerFile = 5;

  SourceTail(SourceConfig config, std::vector<StatisticRequest> requests, std::size_t blocks,
             std::shared_ptr<spdlog::logger> log);

  // Reads what the files gained; `wall_time` stamps newly read samples. Returns true when a file
  // still has unread bytes (the read was capped): poll again soon.
  bool Poll(double wall_time);

  const SourceConfig& config() const { return config_; }
  // nullptr until a file of the source has shown its columns.
  const SourceStatistics* statistics() const { return series_.source ? &*series_.source : nullptr; }
  // Rows admitted so far (after the restart-overlap gate): every statistic of the source sees
  // each, and its count is checkpointed.
  std::uint64_t admitted_samples() const;
  // Why a requested statistic has no estimate (an unknown column); empty when it has one.
  std::string ProblemOf(const std::string& statistic_name) const;
  const Statistic* Find(const std::string& statistic_name) const;
  // The source's weighting and time spacing; nullptr until its first file gave its columns.
  const SourceStatistics* source() const { return series_.source ? &*series_.source : nullptr; }
  double last_sample_time() const;
  double last_sample_wall_time() const { return last_sample_wall_time_; }
  // The system clock jumped by `seconds`: wall times held here move with it, so that durations
  // measured against the new clock stay true.
  void ShiftWallClock(double seconds);
  // Bad lines skipped in all of the source's files so far.
  std::uint64_t bad_lines() const;
  // Folders worth an inotify watch: the fixed part of the glob and every folder with a file.
  std::vector<std::string> Folders() const;

  // Adds this source's files, time gate and statistic histories to a cycle's checkpoint.
  void Checkpoint(CycleRecord& record);
  // Resumes from a checkpoint written by Checkpoint with the same configuration.
  void Restore(const StoredCheckpoint& checkpoint);

 private:
  // The weighting's state and the rows held back; a checkpoint without them (an older plateau)
  // goes on counting each sample once, as its estimates did.
  void RestoreWeighting(const StoredCheckpoint& checkpoint);
  struct TrackedFile {
    std::string path;
    std::int64_t inode = 0;
    RowParser parser;
    SegmentRows rows;  // its times and counts; `rows.refused`: its header does not fit the source
    bool vanished = false;
    bool unreadable = false;       // the last read failed (permissions, I/O error); logged once
    std::uint64_t bad_lines_logged = 0;
    std::uint64_t bad_lines_reported = 0;
    std::string signature;  // the bytes before the consumed offset, as last read
  };
  class ReadOwner;

  void DiscoverFiles();
  // Returns true when the file has more bytes waiting after this slice.
  bool ReadFile(TrackedFile& file, double wall_time);
  bool CheckIdentity(TrackedFile& file, std::uint64_t* size);
  void StartSource(const std::vector<std::string>& columns, const std::string& from_file);

  SourceConfig config_;
  std::vector<StatisticRequest> requests_;
  std::size_t blocks_;
  std::shared_ptr<spdlog::logger> log_;
  SeriesIngest series_;
  std::vector<TrackedFile> files_;
  double last_sample_wall_time_ = std::numeric_limits<double>::quiet_NaN();
};

}  // namespace plateau

#endif  // PLATEAU_DAEMON_INGEST_SOURCE_TAIL_H_
