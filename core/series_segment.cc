#include "core/series_segment.h"

#include <cctype>
#include <charconv>
#include <limits>

namespace plateau {
namespace {

// A folder name that is a whole number written as a time: `0`, `2000`, `1.5e+03`, `0.25`.
bool ParseStartTime(const std::string& name, double* time) {
  if (name.empty()) return false;
  const char* begin = name.data();
  if (*begin == '+') ++begin;
  const auto [ptr, ec] = std::from_chars(begin, name.data() + name.size(), *time);
  return ec == std::errc() && ptr == name.data() + name.size();
}

// `run2`, `restart_3`, `job-12`: a name, then digits; returns the length of the name part.
std::size_t NumberedRestartPrefix(const std::string& name) {
  std::size_t digits = 0;
  const auto digit = [&](std::size_t k) {
    return std::isdigit(static_cast<unsigned char>(name[name.size() - 1 - k])) != 0;
  };
  while (digits < name.size() && digit(digits)) ++digits;
  const std::size_t prefix = name.size() - digits;
  if (digits == 0 || prefix == 0 || !std::isalpha(static_cast<unsigned char>(name[0]))) return 0;
  return prefix;
}

}  // namespace

SeriesSegment SeriesSegment::Of(const std::string& path) {
  SeriesSegment s;
  s.series = path;
  s.start_time = std::numeric_limits<double>::quiet_NaN();
  s.folder = Folder::kNone;
  const std::size_t file_slash = path.rfind('/');
  s.file_name = file_slash == std::string::npos ? path : path.substr(file_slash + 1);
  const std::size_t dot = s.file_name.rfind('.');
  s.file_stem = dot == std::string::npos || dot == 0 ? s.file_name : s.file_name.substr(0, dot);
  if (file_slash == std::string::npos || file_slash == 0) return s;
  const std::size_t folder_slash = path.rfind('/', file_slash - 1);
  const std::size_t folder_begin = folder_slash == std::string::npos ? 0 : folder_slash + 1;
  const std::string folder = path.substr(folder_begin, file_slash - folder_begin);
  const std::string before = path.substr(0, folder_begin);  // ends in '/' or is empty
  std::string abstracted;
  if (ParseStartTime(folder, &s.start_time)) {
    s.folder = Folder::kStartTime;
    abstracted = "*";
  } else if (const std::size_t prefix = NumberedRestartPrefix(folder); prefix > 0) {
    s.folder = Folder::kNumberedRestart;
    abstracted.assign(folder, 0, prefix);
    abstracted += '*';
  } else {
    return s;
  }
  // Appended piece by piece: g++ 12 reports a false -Wrestrict on the chained operator+.
  s.series = before;
  s.series.append(abstracted).append("/").append(s.file_name);
  if (folder_begin >= 2) {
    const std::size_t series_slash = path.rfind('/', folder_begin - 2);
    const std::size_t series_begin = series_slash == std::string::npos ? 0 : series_slash + 1;
    s.series_folder = path.substr(series_begin, folder_begin - 1 - series_begin);
    if (s.series_folder == "." || s.series_folder == "..") s.series_folder.clear();
  }
  return s;
}

}  // namespace plateau
