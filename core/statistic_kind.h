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
  // Mean of a weighted sum of one to three columns, formed per sample: the difference between a
  // statistic and its reference series (tau_w - delta * dP/dx), whose interval then accounts for
  // the two being correlated. Formed by plateau itself; not a kind a config names.
  kWeightedSum,
};

// Stable names used on the command line and in JSON: mean, variance, rms, covariance,
// third_moment, tke, average, weighted_sum.
std::string_view KindName(StatisticKind kind);
// Inverse of KindName for the kinds a user may ask for; nullopt for an unknown name and for
// weighted_sum.
std::optional<StatisticKind> ParseKind(std::string_view name);
// How many columns a statistic of this kind takes (third_moment takes three, possibly repeated);
// for weighted_sum the most it takes (three).
int KindColumnCount(StatisticKind kind);

}  // namespace plateau

#endif  // PLATEAU_CORE_STATISTIC_KIND_H_
