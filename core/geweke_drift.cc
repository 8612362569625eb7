#include "core/geweke_drift.h"

#include <algorithm>
#include <cmath>

#include "core/autocorrelation.h"
#include "core/student_t.h"

namespace plateau {
namespace {

double Mean(std::vector<double>::const_iterator begin, std::vector<double>::const_iterator end) {
  double sum = 0.0;
  for (auto it = begin; it != end; ++it) sum += *it;
  return sum / static_cast<double>(end - begin);
}

}  // namespace

DriftTest GewekeDrift(const std::vector<double>& series, double early_fraction,
                      double late_fraction) {
  DriftTest test;
  const std::size_t n = series.size();
  const auto early_count = static_cast<std::size_t>(early_fraction * static_cast<double>(n));
  const auto late_count = static_cast<std::size_t>(late_fraction * static_cast<double>(n));
  if (early_count < 20 || late_count < 20 || early_count + late_count > n) return test;
  const std::vector<double> late(series.end() - late_count, series.end());
  double gamma0 = 0.0;
  const double monotone = GeyerInitialMonotoneSigma2(late, &gamma0);
  // A negative sequence sum (strong anticorrelation) falls back to independence.
  const double sigma2 = monotone > 0.0 ? monotone : gamma0;
  const double spread = std::sqrt(sigma2 / static_cast<double>(early_count) +
                                  sigma2 / static_cast<double>(late_count));
  if (!(spread > 0.0)) return test;
  test.available = true;
  test.z = (Mean(series.begin(), series.begin() + static_cast<std::ptrdiff_t>(early_count)) -
            Mean(late.begin(), late.end())) /
           spread;
  // The variance estimate is itself uncertain: about one degree of freedom per effective sample.
  test.degrees_of_freedom = std::max(1.0, static_cast<double>(late_count) * gamma0 / sigma2);
  test.p_value = TwoSidedStudentPValue(test.z, test.degrees_of_freedom);
  return test;
}

}  // namespace plateau
