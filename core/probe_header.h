// Recognises the probe description that solvers write in the comment lines above a probe file's
// data: one line per probe with its location, `# Probe 3 (2.05 0.0048 1.0333)`, and a line listing
// the probe numbers, `# Probe 0 1 2 3`. Pure: comment text in, probe ids and coordinates out.
// Not thread-safe: owned by one RowParser.
#ifndef PLATEAU_CORE_PROBE_HEADER_H_
#define PLATEAU_CORE_PROBE_HEADER_H_

#include <array>
#include <string>
#include <string_view>
#include <vector>

namespace plateau {

struct ProbeLocation {
  int id = 0;                       // the solver's probe number
  std::array<double, 3> position{};  // x, y, z in the solver's length unit
};

// True when both lists name the same probes at the same locations, in the same order; a probe
// without a location line (NaN coordinates) equals one without a location line.
bool SameProbes(const std::vector<ProbeLocation>& a, const std::vector<ProbeLocation>& b);

class ProbeHeader {
 public:
  // Reads one comment line, without its '#'. Lines that describe no probe are ignored.
  void ReadCommentLine(std::string_view text);

  // Probes with a location line, in the order they were described.
  const std::vector<ProbeLocation>& locations() const { return locations_; }
  // The probe numbers of the data columns, in column order: the listed numbers when a
  // `Probe 0 1 2` line was read, else the ids of the location lines; empty when neither.
  std::vector<int> ColumnProbeIds() const;
  // True when `text` (a comment line without '#') is the probe-number list.
  static bool IsProbeList(std::string_view text);

 private:
  std::vector<ProbeLocation> locations_;
  std::vector<int> listed_ids_;
};

}  // namespace plateau

#endif  // PLATEAU_CORE_PROBE_HEADER_H_
