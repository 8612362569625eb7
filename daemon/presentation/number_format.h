// The project's number formats for people (tables, messages, alerts, the report): one place, so
// that a value reads the same wherever it is shown. JSON and metrics keep full precision instead.
#ifndef PLATEAU_DAEMON_PRESENTATION_NUMBER_FORMAT_H_
#define PLATEAU_DAEMON_PRESENTATION_NUMBER_FORMAT_H_

#include <string>

#include "core/convergence_tracker.h"

namespace plateau {

// `value` through a printf format with one double conversion ("%.3g").
std::string PrintfNumber(const char* format, double value);

// Short human forms used in tables: 6 significant digits for values, 2 for half-widths.
std::string FormatValue(double value);
std::string FormatHalfWidth(double value);
std::string FormatPercent(double fraction);
// A span of wall-clock seconds as "45 s", "3.5 min", "2.1 h" or "1.5 d"; "-" when NaN.
std::string FormatDuration(double seconds);
// A target half-width: "1.5 %" for a relative one, "0.002" for one in the statistic's units.
std::string FormatTarget(Target::Kind kind, double value);
// Wall-clock seconds since the epoch through a strftime `format`, in UTC (at most 63 bytes).
std::string FormatWallTime(double wall, const char* format);
// Wall-clock seconds since the epoch as "2026-12-02 10:15:00 UTC"; "-" when NaN.
std::string FormatUtcTime(double wall);

}  // namespace plateau

#endif  // PLATEAU_DAEMON_PRESENTATION_NUMBER_FORMAT_H_
