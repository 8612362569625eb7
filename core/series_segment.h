// Which series a solver output file belongs to. Solvers write each function's time series into
// `<output>/<series>/<start time>/<file>`; a restarted job opens a new folder named after its start
// time (`0`, `2000`, `1.5e+03`) and writes the same file name again. A series is the path with the
// start-time folder abstracted; numbered restart folders (`run1`, `run2`) count the same way.
// Pure: path text in, no file system access. Stateless.
#ifndef PLATEAU_CORE_SERIES_SEGMENT_H_
#define PLATEAU_CORE_SERIES_SEGMENT_H_

#include <string>

namespace plateau {

struct SeriesSegment {
  // The series as a glob that matches all its segments: `output/wallShearLower/*/surface.dat`
  // for a start-time folder, `out/run*/wall.dat` for numbered restart folders, the path itself
  // for a file in neither.
  std::string series;
  // The folder the series is named after (`wallShearLower`): the one holding the start-time
  // folders; empty when there is none (`run1/wall.dat`, or a file in a plain folder).
  std::string series_folder;
  std::string file_name;  // `surfaceFieldValue.dat`
  std::string file_stem;  // `surfaceFieldValue`
  // The start time the folder names; NaN for numbered restart folders and plain folders.
  double start_time;
  // How the segment folder was recognised, for the notes that say what plateau guessed.
  enum class Folder { kNone, kStartTime, kNumberedRestart } folder;

  // Splits `path` (with '/' separators, relative or absolute).
  static SeriesSegment Of(const std::string& path);
};

}  // namespace plateau

#endif  // PLATEAU_CORE_SERIES_SEGMENT_H_
