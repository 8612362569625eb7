// The result of evaluating one statistic: value, standard errors by each estimator, the deciding
// estimator and its half-width, warm-up cut, drift. Plain data; copied freely between threads.
#ifndef PLATEAU_CORE_STATISTIC_ESTIMATE_H_
#define PLATEAU_CORE_STATISTIC_ESTIMATE_H_

#include <cstdint>
#include <limits>
#include <string>
#include <string_view>
#include <vector>

#include "core/combination_rule.h"
#include "core/geweke_drift.h"
#include "core/statistic_kind.h"

namespace plateau {

enum class EstimateState {
  kNoData,         // no sample yet
  kNotEnoughData,  // a value, but too few samples or blocks after the warm-up for an interval
  kEstimated,      // value and interval
};

// The state's name in JSON and the store: "no_data", "not_enough_data", "estimated".
std::string_view EstimateStateName(EstimateState state);

struct StatisticEstimate {
  static constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

  std::string name;
  StatisticKind kind = StatisticKind::kMean;
  EstimateState state = EstimateState::kNoData;
  std::string state_reason;  // why there is no interval, for kNoData and kNotEnoughData

  std::uint64_t samples_total = 0;
  std::uint64_t samples_used = 0;  // after the warm-up cut
  double first_time = kNaN;
  double last_time = kNaN;
  double warmup_end_time = kNaN;  // time of the first sample used
  std::uint64_t warmup_batch_length = 0;  // samples per batch of the MSER search (kAuto only)
  std::uint64_t block_length = 0;
  int blocks_used = 0;

  double value = kNaN;
  double se_batch_means = kNaN;
  double se_overlapping_batch_means = kNaN;
  double se_lugsail_batch_means = kNaN;  // bias-corrected for short batches
  double se_autocorrelation = kNaN;  // Geyer initial monotone sequence
  double se_sokal = kNaN;            // Sokal's automatic window, a cross-check
  double se_lag_window = kNaN;       // Parzen lag window, for oscillating signals
  double integrated_time = kNaN;     // in samples, implied by the deciding estimator
  double integrated_time_geyer = kNaN;
  double integrated_time_sokal = kNaN;
  double effective_samples = kNaN;   // samples_used / integrated_time
  double batch_length = kNaN;        // samples per batch
  double lag_window = kNaN;          // samples spanned by the Parzen window
  double oscillation_period = 0.0;   // samples; 0 when not oscillating
  double oscillation_cycles = kNaN;  // samples_used / oscillation_period when oscillating

  // Simulated time (the time column's units), filled by SourceStatistics::AddTimeScales: what one
  // unit of samples_used stands for (the mean spacing under sample weighting, the cell under time
  // weighting), the integral time scale integrated_time * unit_time, and the averaging time after
  // the warm-up cut samples_used * unit_time.
  bool time_weighted = false;
  double unit_time = kNaN;
  double integral_time_scale = kNaN;
  double averaging_time = kNaN;

  double confidence = kNaN;
  double quantile = kNaN;
  double std_error = kNaN;           // of the deciding estimator
  double half_width = kNaN;
  double relative_half_width = kNaN;  // half_width / |value|
  // The relative standard deviation of half_width itself, from the deciding estimator's degrees
  // of freedom (decision.degrees_of_freedom): 0.18 reads "the half-width is known to about 18 %".
  double half_width_uncertainty = kNaN;
  Decision decision;

  DriftTest drift;
  bool drift_detected = false;

  // The autocorrelation of the linearised block series, lag 0 first, at most kAutocorrelationLags
  // lags of autocorrelation_lag samples each (the block length), for plots.
  static constexpr std::size_t kAutocorrelationLags = 128;
  std::vector<double> autocorrelation;
  double autocorrelation_lag = kNaN;

  std::vector<std::string> warnings;  // plain sentences: few effective samples, disagreement, ...
};

}  // namespace plateau

#endif  // PLATEAU_CORE_STATISTIC_ESTIMATE_H_
