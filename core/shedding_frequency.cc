#include "core/shedding_frequency.h"

#include <cmath>
#include <limits>

#include "core/derived_estimate.h"

namespace plateau {
namespace {

Statistic PeriodStatistic(const std::string& name) {
  std::string error;
  // A mean of one column always forms.
  return Statistic(name + " period", *StatisticFormula::Make(StatisticKind::kMean, {0}, &error));
}

}  // namespace

SheddingFrequency::SheddingFrequency(std::string name, double band)
    : name_(std::move(name)),
      band_(band),
      periods_(PeriodStatistic(name_)),
      last_crossing_(std::numeric_limits<double>::quiet_NaN()) {}

void SheddingFrequency::Add(double time, double value) {
  ++samples_;
  const double delta = value - mean_;
  mean_ += delta / static_cast<double>(samples_);
  squares_ += delta * (value - mean_);
  if (samples_ < kSettlingSamples) return;
  const double spread = std::sqrt(squares_ / static_cast<double>(samples_ - 1));
  const std::optional<double> crossing = detector_.Add(time, value, mean_, band_ * spread);
  if (!crossing) return;
  if (!std::isnan(last_crossing_)) {
    const double period = *crossing - last_crossing_;
    periods_.Add(*crossing, &period);
  }
  last_crossing_ = *crossing;
}

StatisticEstimate SheddingFrequency::EvaluatePeriod(const EvaluationOptions& options) const {
  return periods_.Evaluate(options);
}

StatisticEstimate SheddingFrequency::EvaluateFrequency(const EvaluationOptions& options) const {
  const StatisticEstimate period = EvaluatePeriod(options);
  const double t = period.value;
  return DeriveEstimate(period, name_ + " frequency", 1.0 / t, -1.0 / (t * t));
}

StatisticEstimate StrouhalNumber(const StatisticEstimate& frequency, double length,
                                 double velocity) {
  const double scale = length / velocity;
  return DeriveEstimate(frequency, "St", frequency.value * scale, scale);
}

}  // namespace plateau
