#include "daemon/ingest/source_tail.h"

#include <fcntl.h>
#include <glob.h>
#include <unistd.h>
#include <sys/stat.h>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <set>

#include "daemon/presentation/number_format.h"
#include "daemon/ingest/probe_file_reader.h"
#include "daemon/ingest/series_catalog.h"

namespace plateau {
namespace {

namespace fs = std::filesystem;

std::vector<std::string> ExpandGlob(const std::string& pattern) {
  std::vector<std::string> paths;
  glob_t matches{};
  if (::glob(pattern.c_str(), 0, nullptr, &matches) == 0) {
    for (std::size_t i = 0; i < matches.gl_pathc; ++i) {
      struct stat info {};
      if (::stat(matches.gl_pathv[i], &info) == 0 && S_ISREG(info.st_mode)) {
        paths.emplace_back(matches.gl_pathv[i]);
      }
    }
  }
  ::globfree(&matches);
  return paths;
}

// The folder part of a glob before its first wildcard: it exists before the solver writes there.
std::string FixedFolder(const std::string& pattern) {
  const std::size_t wildcard = pattern.find_first_of("*?[");
  const std::string fixed = wildcard == std::string::npos ? pattern : pattern.substr(0, wildcard);
  return fs::path(fixed).parent_path().string();
}

constexpr std::uint64_t kSignatureBytes = 64;

// The up to 64 bytes that end at `offset`; empty when the file is shorter; nullopt when it cannot
// be opened (unreadable for now: that says nothing about its content).
std::optional<std::string> SignatureAt(const std::string& path, std::uint64_t offset) {
  const std::uint64_t start = offset > kSignatureBytes ? offset - kSignatureBytes : 0;
  std::string bytes(offset - start, '\0');
  const int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC);
  if (fd < 0) return std::nullopt;
  const ssize_t n = ::pread(fd, bytes.data(), bytes.size(), static_cast<off_t>(start));
  ::close(fd);
  return n == static_cast<ssize_t>(bytes.size()) ? bytes : "";
}

std::string Hex(const std::string& bytes) {
  static const char* digits = "0123456789abcdef";
  std::string hex;
  for (const unsigned char c : bytes) hex += {digits[c >> 4], digits[c & 15]};
  return hex;
}

std::string Unhex(const std::string& hex) {
  std::string bytes;
  for (std::size_t i = 0; i + 1 < hex.size(); i += 2) {
    bytes += static_cast<char>(std::stoi(hex.substr(i, 2), nullptr, 16));
  }
  return bytes;
}

}  // namespace

// What the series sink meets while one file is read, into the run's log (the first few bad lines
// of a file one by one).
class SourceTail::ReadOwner : public SeriesSinkOwner {
 public:
  ReadOwner(SourceTail& tail, TrackedFile& file) : tail_(tail), file_(file) {}

  void StartSeries(const std::vector<std::string>& names, const std::string& path) override {
    tail_.StartSource(names, path);
  }

  void RefuseSegment(const std::string&, const std::string& reason) override {
    tail_.log_->error("source '{}': {}; the file is ignored", tail_.config_.name, reason);
  }

  void ReportOverlap(const TimeOrderGate::Overlap& o, const std::string&) override {
    tail_.log_->info("source '{}': skipped {} samples with times {} to {}, already recorded "
                     "before a restart",
                     tail_.config_.name, o.samples, FormatValue(o.first_time),
                     FormatValue(o.last_time));
  }

  void ReportBadLine(const std::string& path, std::uint64_t line,
                     std::string_view reason) override {
    if (file_.bad_lines_logged < kBadLinesLoggedPerFile) {
      ++file_.bad_lines_logged;
      file_.bad_lines_reported = file_.parser.bad_lines();
      tail_.log_->warn("{}:{}: {}; line skipped", path, line, reason);
    }
  }

 private:
  SourceTail& tail_;
  TrackedFile& file_;
};

SourceTail::SourceTail(SourceConfig config, std::vector<StatisticRequest> requests,
                       std::size_t blocks, std::shared_ptr<spdlog::logger> log)
    : config_(std::move(config)),
      requests_(std::move(requests)),
      blocks_(blocks),
      log_(std::move(log)) {}

void SourceTail::StartSource(const std::vector<std::string>& columns,
                             const std::string& from_file) {
  Result<SourceStatistics> made =
      SourceStatistics::Make(columns, config_.time_column, requests_, blocks_);
  if (!made.ok()) {
    log_->error("source '{}' ({}): {}; nothing of it can be estimated until the config is fixed",
                config_.name, from_file, made.error());
    return;
  }
  series_.source = std::move(made).value();
  series_.source->SetWeighting(config_.weighting);
  if (const Status scaled = series_.source->SetScales(config_.scales); !scaled.ok()) {
    log_->error("source '{}' ({}): {}; the columns are {}; no factor is applied until the config "
                "is fixed",
                config_.name, from_file, scaled.message(), JoinedNames(columns));
  }
  for (const SourceStatistics::Problem& p : series_.source->problems()) {
    log_->error("statistic '{}' of source '{}': {}", requests_[p.request].name, config_.name,
                p.message);
  }
}

std::string SourceTail::ProblemOf(const std::string& statistic_name) const {
  if (!series_.source) return "";
  for (const SourceStatistics::Problem& p : series_.source->problems()) {
    if (requests_[p.request].name == statistic_name) return p.message;
  }
  return "";
}

const Statistic* SourceTail::Find(const std::string& statistic_name) const {
  if (!series_.source) return nullptr;
  for (const Statistic& s : series_.source->statistics()) {
    if (s.name() == statistic_name) return &s;
  }
  return nullptr;
}

double SourceTail::last_sample_time() const {
  if (!series_.source) return std::numeric_limits<double>::quiet_NaN();
  const double t = series_.source->gate().last_time();
  return std::isinf(t) ? std::numeric_limits<double>::quiet_NaN() : t;
}

void SourceTail::ShiftWallClock(double seconds) { last_sample_wall_time_ += seconds; }

std::uint64_t SourceTail::admitted_samples() const {
  std::uint64_t samples = 0;
  if (!series_.source) return samples;
  for (const Statistic& statistic : series_.source->statistics()) {
    samples = std::max<std::uint64_t>(samples, statistic.history().sample_count());
  }
  return samples;
}

std::uint64_t SourceTail::bad_lines() const {
  std::uint64_t total = 0;
  for (const TrackedFile& f : files_) total += f.parser.bad_lines();
  return total;
}

std::vector<std::string> SourceTail::Folders() const {
  std::set<std::string> folders{FixedFolder(config_.files)};
  for (const TrackedFile& f : files_) folders.insert(fs::path(f.path).parent_path().string());
  return {folders.begin(), folders.end()};
}

void SourceTail::DiscoverFiles() {
  for (const std::string& path : ExpandGlob(config_.files)) {
    const bool known = std::any_of(files_.begin(), files_.end(),
                                   [&](const TrackedFile& f) { return f.path == path; });
    if (known) continue;
    TrackedFile file;
    file.path = path;
    file.parser = ParserFor(path);
    struct stat info {};
    if (::stat(path.c_str(), &info) == 0) file.inode = static_cast<std::int64_t>(info.st_ino);
    log_->info("source '{}': reading new file {}", config_.name, path);
    files_.push_back(std::move(file));
  }
}

bool SourceTail::CheckIdentity(TrackedFile& file, std::uint64_t* size) {
  struct stat info {};
  if (::stat(file.path.c_str(), &info) != 0) {
    if (!file.vanished) {
      log_->warn("{} vanished; the {} samples read from it are kept", file.path,
                 file.parser.rows());
      file.vanished = true;
    }
    return false;
  }
  const auto inode = static_cast<std::int64_t>(info.st_ino);
  *size = static_cast<std::uint64_t>(info.st_size);
  const std::uint64_t read_to = file.parser.consumed_bytes() + file.parser.pending_bytes();
  const bool replaced = inode != file.inode || file.vanished;
  const bool truncated = *size < read_to;
  bool rewritten = false;
  if (!replaced && !truncated && !file.signature.empty()) {
    const std::optional<std::string> now = SignatureAt(file.path, file.parser.consumed_bytes());
    rewritten = now && *now != file.signature;
  }
  if (replaced || truncated || rewritten) {
    log_->warn("{} was {} (size {} bytes, {} read); reading it again from the start: samples "
               "already recorded are skipped by time",
               file.path, replaced ? "replaced" : truncated ? "truncated" : "rewritten", *size,
               read_to);
    file.inode = inode;
    file.parser = ParserFor(file.path);
    file.vanished = false;
    file.rows.refused = false;
    file.bad_lines_logged = 0;
    file.bad_lines_reported = 0;
    file.signature.clear();
  }
  return true;
}

bool SourceTail::ReadFile(TrackedFile& file, double wall_time) {
  std::uint64_t size = 0;
  if (!CheckIdentity(file, &size) || file.rows.refused) return false;
  const std::uint64_t from = file.parser.consumed_bytes() + file.parser.pending_bytes();
  if (size <= from) return false;
  ReadOwner owner(*this, file);
  SeriesSink sink(series_, file.rows, file.path, file.parser, config_.columns, owner);
  const std::uint64_t recorded_before = file.rows.rows - file.rows.overlap_rows;
  const std::uint64_t start = file.parser.consumed_bytes();
  const Result<std::uint64_t> read = ReadProbeFile(file.path, from, file.parser, sink, [&] {
    return file.parser.consumed_bytes() - start < kBytesPerPoll && !file.rows.refused;
  });
  if (!read.ok()) {
    // Once per spell, not once per poll: a file unreadable for a day must not fill the log.
    if (!file.unreadable) {
      log_->warn(
          "{}; the {} samples read from it are kept, and reading resumes from byte {} "
          "when it can be read again",
          read.error(), file.parser.rows(), file.parser.consumed_bytes());
    }
    file.unreadable = true;
    return false;
  }
  if (file.unreadable) {
    log_->info("{} can be read again; reading on from byte {}", file.path, from);
    file.unreadable = false;
  }
  if (file.rows.rows - file.rows.overlap_rows > recorded_before) last_sample_wall_time_ = wall_time;
  file.signature = SignatureAt(file.path, file.parser.consumed_bytes()).value_or("");
  const std::uint64_t unreported = file.parser.bad_lines() - file.bad_lines_reported;
  if (unreported > 0 && file.bad_lines_logged >= kBadLinesLoggedPerFile) {
    log_->warn("{}: {} more bad lines skipped ({} in all)", file.path, unreported,
               file.parser.bad_lines());
    file.bad_lines_reported = file.parser.bad_lines();
  }
  return from + *read < size;
}

bool SourceTail::Poll(double wall_time) {
  DiscoverFiles();
  // Oldest first time first: the remainder of a run's file before its restart's new file.
  std::vector<TrackedFile*> order;
  for (TrackedFile& f : files_) order.push_back(&f);
  // A file not read yet is ordered by its first data time, looked up without reading it: the
  // glob lists start-time folders as text (1000 before 250), and a later segment read first would
  // make every row of the earlier one look like restart overlap.
  // Only files never read: a file read so far without a row stays last until its rows come.
  for (TrackedFile& f : files_) {
    const bool never_read = f.parser.consumed_bytes() == 0 && f.parser.pending_bytes() == 0;
    if (std::isnan(f.rows.first_time) && never_read && !f.vanished) {
      const double t = FirstDataTime(f.path, config_.time_column);
      if (!std::isinf(t)) f.rows.first_time = t;
    }
  }
  std::stable_sort(order.begin(), order.end(), [](const TrackedFile* a, const TrackedFile* b) {
    const double ta = std::isnan(a->rows.first_time) ? INFINITY : a->rows.first_time;
    const double tb = std::isnan(b->rows.first_time) ? INFINITY : b->rows.first_time;
    return ta < tb;
  });
  bool more = false;
  for (TrackedFile* f : order) more = ReadFile(*f, wall_time) || more;
  return more;
}

void SourceTail::Checkpoint(CycleRecord& record) {
  for (const TrackedFile& f : files_) {
    FileProgress p;
    p.path = f.path;
    p.source = config_.name;
    p.inode = f.inode;
    // A file whose header was read but no row yet restarts from its beginning: the parser would
    // otherwise have lost the column names that only the skipped comment lines carry.
    const bool has_layout = f.parser.has_columns();
    p.offset = has_layout ? static_cast<std::int64_t>(f.parser.consumed_bytes()) : 0;
    p.lines = has_layout ? static_cast<std::int64_t>(f.parser.lines()) : 0;
    p.rows = static_cast<std::int64_t>(f.parser.rows());
    p.bad_lines = has_layout ? static_cast<std::int64_t>(f.parser.bad_lines()) : 0;
    p.first_time = f.rows.first_time;
    p.last_time = f.rows.last_time;
    if (has_layout) {
      p.columns = f.parser.column_names();
      p.signature = Hex(f.signature);
    }
    p.vanished = f.vanished;
    record.files.push_back(std::move(p));
  }
  if (!series_.source) return;
  record.checkpoint["gate:" + config_.name] = {series_.source->gate().last_time(),
                                               static_cast<double>(series_.source->gate().skipped())};
  record.checkpoint["weighting:" + config_.name] = series_.source->SaveWeightingState();
  for (const SourceStatistics::KeyedHistory& h : series_.source->histories()) {
    record.checkpoint["history:" + config_.name + "/" + h.key] = h.history->SaveState();
  }
}

void SourceTail::RestoreWeighting(const StoredCheckpoint& checkpoint) {
  const auto weighting = checkpoint.items.find("weighting:" + config_.name);
  if (weighting == checkpoint.items.end() ||
      !series_.source->RestoreWeightingState(weighting->second)) {
    // Saved by a plateau before time weighting: its estimates counted every sample once.
    series_.source->SetWeighting(Weighting::kSamples);
    log_->warn("source '{}': no usable weighting state in the checkpoint (saved by an older "
               "plateau?); samples count once each, as its estimates did; time weighting needs a "
               "fresh store",
               config_.name);
    return;
  }
  if (series_.source->spacing().requested() != config_.weighting) {
    log_->warn("source '{}': the config asks for weighting {}, the store's estimates were made "
               "with {}; they go on with {} (a fresh store applies the new one)",
               config_.name, WeightingName(config_.weighting),
               WeightingName(series_.source->spacing().requested()),
               WeightingName(series_.source->spacing().requested()));
  }
}

void SourceTail::Restore(const StoredCheckpoint& checkpoint) {
  for (const FileProgress& p : checkpoint.files) {
    if (p.source != config_.name) continue;
    TrackedFile file;
    file.path = p.path;
    file.inode = p.inode;
    file.rows.first_time = p.first_time;
    file.rows.last_time = p.last_time;
    file.vanished = p.vanished;
    file.parser.Resume(p.columns, p.lines, p.offset, p.rows, p.bad_lines);
    file.bad_lines_reported = static_cast<std::uint64_t>(p.bad_lines);
    file.signature = Unhex(p.signature);
    if (!p.columns.empty() && !series_.source) {
      const std::vector<std::string>& names = config_.columns.empty() ? p.columns : config_.columns;
      series_.layout_file = p.path;
      StartSource(names, p.path);
    }
    files_.push_back(std::move(file));
  }
  if (!series_.source) return;
  RestoreWeighting(checkpoint);
  const auto gate = checkpoint.items.find("gate:" + config_.name);
  if (gate != checkpoint.items.end() && gate->second.size() == 2) {
    series_.source->gate().Resume(gate->second[0], static_cast<std::uint64_t>(gate->second[1]));
    series_.overlap_reported = series_.source->gate().skipped();
  }
  for (const SourceStatistics::KeyedHistory& h : series_.source->histories()) {
    const auto state = checkpoint.items.find("history:" + config_.name + "/" + h.key);
    if (state == checkpoint.items.end() || !h.history->RestoreState(state->second)) {
      log_->warn("source '{}', history {}: no usable state in the checkpoint; it starts empty",
                 config_.name, h.key);
    }
  }
}

}  // namespace plateau
