#include "core/decay_fit_truncation.h"

#include <algorithm>
#include <cmath>

#include "core/batch_means.h"

namespace plateau {
namespace {

// Grid of T: 48 steps a decade (5 % apart).
constexpr double kGridRatio = 1.0491397180897439;  // 10^(1/48)

}  // namespace

DecayFit FitStartupDecay(const std::vector<double>& series, double long_run_variance) {
  DecayFit best;
  const std::size_t n = series.size();
  if (n < 4 || !(long_run_variance > 0.0)) return best;
  double mean_y = 0.0;
  for (double y : series) mean_y += y;
  mean_y /= static_cast<double>(n);
  std::vector<double> basis(n);
  const double longest = 0.5 * static_cast<double>(n);
  for (int step = 0;; ++step) {
    const double efolding = 0.5 * std::pow(kGridRatio, step);
    if (efolding > longest) break;
    // exp(-(j + 1/2) / T) by repeated multiplication: one exponential per grid point.
    const double ratio = std::exp(-1.0 / efolding);
    double term = std::exp(-0.5 / efolding);
    double mean_e = 0.0;
    for (std::size_t j = 0; j < n; ++j) {
      basis[j] = term;
      mean_e += term;
      term *= ratio;
    }
    mean_e /= static_cast<double>(n);
    double see = 0.0, sey = 0.0;
    for (std::size_t j = 0; j < n; ++j) {
      see += (basis[j] - mean_e) * (basis[j] - mean_e);
      sey += (basis[j] - mean_e) * (series[j] - mean_y);
    }
    if (!(see > 0.0)) continue;
    const double amplitude = sey / see;
    const double explained = amplitude * sey;  // the fit's reduction of the residual sum of squares
    const double strength = explained / long_run_variance;
    if (strength <= best.strength) continue;
    best.strength = strength;
    best.amplitude = amplitude;
    best.efolding = efolding;
    best.level = mean_y - amplitude * mean_e;
  }
  best.significant = best.strength > kDecayStrength;
  return best;
}

int DecayFitTruncation(const std::vector<double>& series, int floor_cut, double max_fraction) {
  const int n = static_cast<int>(series.size());
  if (n < 16) return floor_cut;
  const double long_run_variance = SecondHalfLongRunVariance(series);
  const DecayFit fit = FitStartupDecay(series, long_run_variance);
  if (!fit.significant) return floor_cut;
  const int last_candidate = static_cast<int>(max_fraction * n);
  // The fitted transient summed from the end: its mean over what a cut at d leaves.
  std::vector<double> tail_sum(static_cast<std::size_t>(n) + 1, 0.0);
  for (int j = n - 1; j >= 0; --j) {
    tail_sum[j] = tail_sum[j + 1] +
                  fit.amplitude * std::exp(-(static_cast<double>(j) + 0.5) / fit.efolding);
  }
  for (int d = floor_cut; d <= last_candidate; ++d) {
    const double remaining = static_cast<double>(n - d);
    const double bias = std::fabs(tail_sum[d]) / remaining;
    const double std_error = std::sqrt(long_run_variance / remaining);
    if (bias <= kResidueShare * std_error) return d;
  }
  return std::max(floor_cut, last_candidate);
}

}  // namespace plateau
