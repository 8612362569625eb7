#include "daemon/ingest/source_tails.h"

#include <algorithm>
#include <cmath>
#include <limits>

namespace plateau {
namespace {

// The larger of two times where either may be NaN (unknown).
double Newer(double a, double b) { return std::isnan(a) || b > a ? b : a; }

}  // namespace

SourceTails::SourceTails(const RunConfig& config, const std::shared_ptr<spdlog::logger>& log) {
  for (const SourceConfig& source : config.sources) {
    std::vector<StatisticRequest> requests;
    for (const StatisticConfig& s : config.statistics) {
      if (s.source == source.name) requests.push_back(s.request);
    }
    tails_.push_back(std::make_unique<SourceTail>(source, requests, config.blocks, log));
  }
}

SourceTail* SourceTails::Find(const std::string& name) {
  for (auto& tail : tails_) {
    if (tail->config().name == name) return tail.get();
  }
  return nullptr;
}

bool SourceTails::Poll(double wall_time) {
  bool more = false;
  for (auto& tail : tails_) more = tail->Poll(wall_time) || more;
  return more;
}

std::vector<std::string> SourceTails::Folders() const {
  std::vector<std::string> folders;
  for (const auto& tail : tails_) {
    for (const std::string& f : tail->Folders()) folders.push_back(f);
  }
  std::sort(folders.begin(), folders.end());
  folders.erase(std::unique(folders.begin(), folders.end()), folders.end());
  return folders;
}

void SourceTails::ShiftWallClock(double seconds) {
  for (auto& tail : tails_) tail->ShiftWallClock(seconds);
}

void SourceTails::Checkpoint(CycleRecord& record) {
  for (auto& tail : tails_) tail->Checkpoint(record);
}

void SourceTails::Restore(const StoredCheckpoint& checkpoint) {
  for (auto& tail : tails_) tail->Restore(checkpoint);
}

double SourceTails::last_sample_time() const {
  double newest = std::numeric_limits<double>::quiet_NaN();
  for (const auto& tail : tails_) newest = Newer(newest, tail->last_sample_time());
  return newest;
}

double SourceTails::last_sample_wall_time() const {
  double newest = std::numeric_limits<double>::quiet_NaN();
  for (const auto& tail : tails_) newest = Newer(newest, tail->last_sample_wall_time());
  return newest;
}

std::uint64_t SourceTails::bad_lines() const {
  std::uint64_t bad = 0;
  for (const auto& tail : tails_) bad += tail->bad_lines();
  return bad;
}

std::vector<SourceCounters> SourceTails::Counters() const {
  std::vector<SourceCounters> counters;
  for (const auto& tail : tails_) {
    counters.push_back({tail->config().name, tail->admitted_samples(), tail->bad_lines(),
                        tail->last_sample_wall_time()});
  }
  return counters;
}

}  // namespace plateau
