// The dominant frequency of an oscillating signal (a lift coefficient, a probe in a wake) with its
// confidence interval: the periods between successive up-crossings (UpcrossingDetector, about the
// running mean with a hysteresis band of a share of the running standard deviation) form a
// correlated series whose mean and interval come from the same pipeline as any statistic (warm-up
// cut, batch means, autocorrelation, the combination rule); the frequency f = 1 / mean period and
// its interval follow by the delta method (DeriveEstimate), and St = f D / U. The mean period over
// m cycles is (t_last - t_first) / m, so crossing-time jitter cancels except at the two ends.
// Not thread-safe: one owner feeds it.
#ifndef PLATEAU_CORE_SHEDDING_FREQUENCY_H_
#define PLATEAU_CORE_SHEDDING_FREQUENCY_H_

#include <cstdint>
#include <string>

#include "core/evaluation_options.h"
#include "core/statistic.h"
#include "core/statistic_estimate.h"
#include "core/upcrossing_detector.h"

namespace plateau {

class SheddingFrequency {
 public:
  // The hysteresis band in standard deviations of the signal: a tone's amplitude is sqrt(2) of
  // them, so 0.25 leaves crossings of tones well above noise of a quarter of the signal's spread.
  static constexpr double kDefaultBand = 0.25;
  // Samples before the first crossing counts: the running mean and spread must mean something.
  static constexpr std::uint64_t kSettlingSamples = 50;

  explicit SheddingFrequency(std::string name, double band = kDefaultBand);

  void Add(double time, double value);

  // Cycles (periods) counted so far.
  std::uint64_t cycles() const { return periods_.history().sample_count(); }
  // The mean period as a statistic (time units), and the frequency derived from it (1 / time).
  StatisticEstimate EvaluatePeriod(const EvaluationOptions& options) const;
  StatisticEstimate EvaluateFrequency(const EvaluationOptions& options) const;

 private:
  std::string name_;
  double band_;
  UpcrossingDetector detector_;
  Statistic periods_;
  // Welford's running mean and sum of squared deviations of the signal.
  std::uint64_t samples_ = 0;
  double mean_ = 0.0;
  double squares_ = 0.0;
  double last_crossing_;
};

// The Strouhal number St = f D / U of a frequency estimate (delta method: a linear map).
StatisticEstimate StrouhalNumber(const StatisticEstimate& frequency, double length,
                                 double velocity);

}  // namespace plateau

#endif  // PLATEAU_CORE_SHEDDING_FREQUENCY_H_
