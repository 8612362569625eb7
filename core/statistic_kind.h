// The kinds of statistic plateau estimates, with their names as users and scripts see them.
// Pure: no I/O. Stateless; safe from any thread.
#ifndef PLATEAU_CORE_STATISTIC_KIND_H_
#define PLATEAU_CORE_STATISTIC_KIND_H_

#include <optional>
#include <string_view>

namespace plateau {

enum class StatisticKind {
  kMean,         // time average of one signal
  kVariance,     // <x'x'>
  kRms,          // sqrt(<x'x'>)
  kCovariance,   // <x'y'>, e.g. the Reynolds shear stress <u'v'>
  kThirdMoment,  // <x'y'w'>, e.g. the triple correlation <u'u'v'> of a TKE budget
  kTke,          // turbulent kinetic energy (<u'u'> + <v'v'> + <w'w'>) / 2
  kAverage,      // mean of the average of two columns, e.g. the wall shear stress of both walls
};

// Stable names used on the command line and in JSON: mean, variance, rms, covariance,
// third_moment, tke, average.
std::string_view KindName(StatisticKind kind);
// Inverse of KindName; nullopt for an unknown name.
std::optional<StatisticKind> ParseKind(std::string_view name);
// How many columns a statistic of this kind takes (third_moment takes three, possibly repeated).
int KindColumnCount(StatisticKind kind);

}  // namespace plateau

#endif  // PLATEAU_CORE_STATISTIC_KIND_H_
