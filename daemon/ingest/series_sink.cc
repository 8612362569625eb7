#include "daemon/ingest/series_sink.h"

#include <cmath>

namespace plateau {
std::string JoinedNames(const std::vector<std::string>& names) {
  std::string out;
  for (const std::string& n : names) out += (out.empty() ? "" : ", ") + n;
  return out;
}

void SeriesSink::Refuse(const std::string& reason) {
  segment_.refused = true;
  owner_.RefuseSegment(path_, reason);
}

void SeriesSink::OnColumns(const std::vector<std::string>& header) {
  if (!configured_names_.empty() && configured_names_.size() != header.size()) {
    Refuse(path_ + " has " + std::to_string(header.size()) + " columns but the source names " +
           std::to_string(configured_names_.size()));
    return;
  }
  const std::vector<std::string>& names = configured_names_.empty() ? header : configured_names_;
  // Probe locations are known for segments whose header was read in this process; a restored
  // series has none to compare with (they are behind the checkpoint's offsets).
  const std::vector<ProbeLocation>& probes = parser_.probes();
  const bool moved = !series_.layout_probes.empty() && !SameProbes(probes, series_.layout_probes);
  if (!series_.source) {
    series_.layout_file = path_;
    series_.layout_probes = probes;
    owner_.StartSeries(names, path_);
  } else if (names != series_.source->columns() || moved) {
    Refuse("the header of " + path_ + " differs from that of " + series_.layout_file + " (" +
           std::to_string(names.size()) + " columns: " + JoinedNames(names) + "; against " +
           std::to_string(series_.source->columns().size()) + ": " +
           JoinedNames(series_.source->columns()) +
           (moved ? "; the same names at other probe locations" : "") +
           "), as when a probe is added or moved at a restart: give it a source of its own");
  }
}

void SeriesSink::OnRow(std::uint64_t, const double* values) {
  if (segment_.refused || !series_.source) return;
  SourceStatistics& source = *series_.source;
  const double time = values[source.time_index()];
  ++segment_.rows;
  if (std::isnan(segment_.first_time)) segment_.first_time = time;
  segment_.last_time = time;
  if (!source.Add(values)) {
    ++segment_.overlap_rows;
    return;
  }
  if (std::isnan(segment_.first_recorded_time)) segment_.first_recorded_time = time;
  segment_.last_recorded_time = time;
  if (source.gate().skipped() > series_.overlap_reported) {
    const TimeOrderGate::Overlap overlap = source.gate().TakeFinishedOverlap();
    series_.overlap_reported = source.gate().skipped();
    if (overlap.samples > 0) owner_.ReportOverlap(overlap, path_);
  }
}

void SeriesSink::OnBadLine(std::uint64_t line, std::string_view reason) {
  owner_.ReportBadLine(path_, line, reason);
}

}  // namespace plateau
