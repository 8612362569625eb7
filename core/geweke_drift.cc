#include "core/geweke_drift.h"

#include <cmath>

#include "core/autocorrelation.h"
#include "core/student_t.h"

namespace plateau {
namespace {

struct PartMean {
  double mean = 0.0;
  double variance_of_mean = 0.0;
};

PartMean Summarise(const std::vector<double>& part) {
  PartMean p;
  for (double v : part) p.mean += v;
  p.mean /= static_cast<double>(part.size());
  double gamma0 = 0.0;
  const double monotone = GeyerInitialMonotoneSigma2(part, &gamma0);
  // A negative sequence sum (strong anticorrelation in a short part) falls back to independence.
  const double sigma2 = monotone > 0.0 ? monotone : gamma0;
  p.variance_of_mean = sigma2 / static_cast<double>(part.size());
  return p;
}

}  // namespace

DriftTest GewekeDrift(const std::vector<double>& series, double early_fraction,
                      double late_fraction) {
  DriftTest test;
  const std::size_t n = series.size();
  const auto early_count = static_cast<std::size_t>(early_fraction * static_cast<double>(n));
  const auto late_count = static_cast<std::size_t>(late_fraction * static_cast<double>(n));
  if (early_count < 20 || late_count < 20 || early_count + late_count > n) return test;
  const PartMean early = Summarise({series.begin(), series.begin() + early_count});
  const PartMean late = Summarise({series.end() - late_count, series.end()});
  const double spread = std::sqrt(early.variance_of_mean + late.variance_of_mean);
  if (!(spread > 0.0)) return test;
  test.available = true;
  test.z = (early.mean - late.mean) / spread;
  test.p_value = TwoSidedNormalPValue(test.z);
  return test;
}

}  // namespace plateau
