#include "daemon/presentation/number_format.h"

#include <cmath>
#include <cstdio>
#include <ctime>

namespace plateau {

std::string PrintfNumber(const char* format, double value) {
  char buffer[64];
  std::snprintf(buffer, sizeof buffer, format, value);
  return buffer;
}

std::string FormatValue(double value) {
  return std::isnan(value) ? "-" : PrintfNumber("%.6g", value);
}

std::string FormatHalfWidth(double value) {
  return std::isnan(value) ? "-" : "±" + PrintfNumber("%.2g", value);
}

std::string FormatPercent(double fraction) {
  if (std::isnan(fraction)) return "-";
  // Past 100 % the interval includes zero: the relative width of a near-zero mean says nothing.
  return fraction > 1.0 ? ">100 %" : PrintfNumber("%.3g", 100.0 * fraction) + " %";
}

std::string FormatDuration(double seconds) {
  if (std::isnan(seconds)) return "-";
  if (seconds < 120) return PrintfNumber("%.0f s", seconds);
  if (seconds < 7200) return PrintfNumber("%.1f min", seconds / 60);
  if (seconds < 172800) return PrintfNumber("%.1f h", seconds / 3600);
  return PrintfNumber("%.1f d", seconds / 86400);
}

std::string FormatTarget(Target::Kind kind, double value) {
  return kind == Target::Kind::kRelative ? FormatPercent(value) : FormatValue(value);
}

std::string FormatWallTime(double wall, const char* format) {
  const std::time_t t = static_cast<std::time_t>(wall);
  std::tm tm{};
  gmtime_r(&t, &tm);
  char buffer[64];
  return std::strftime(buffer, sizeof buffer, format, &tm) > 0 ? buffer : "";
}

std::string FormatUtcTime(double wall) {
  return std::isnan(wall) ? "-" : FormatWallTime(wall, "%Y-%m-%d %H:%M:%S UTC");
}

}  // namespace plateau
