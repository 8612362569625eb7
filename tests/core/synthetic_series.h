// Synthetic test signals with known statistics: AR(1) processes and periodic signals with AR(1)
// noise. Deterministic for a given seed. Test-only helper; not thread-safe.
#ifndef PLATEAU_TESTS_CORE_SYNTHETIC_SERIES_H_
#define PLATEAU_TESTS_CORE_SYNTHETIC_SERIES_H_

#include <cmath>
#include <cstdint>
#include <numbers>
#include <random>
#include <vector>

namespace plateau::testing {

// x_t = mean + phi (x_{t-1} - mean) + e_t, e_t ~ N(0, innovation_sd^2), started in its stationary
// distribution so that no warm-up is needed. Var(mean of N) -> sigma_e^2 / ((1 - phi)^2 N)
// (standard time-series result, e.g. Brockwell & Davis 1991, Sec. 7.1).
inline std::vector<double> Ar1(std::size_t n, double phi, std::uint64_t seed, double mean = 0.0,
                               double innovation_sd = 1.0) {
  std::mt19937_64 rng(seed);
  std::normal_distribution<double> normal(0.0, innovation_sd);
  std::vector<double> x(n);
  double state = normal(rng) / std::sqrt(1.0 - phi * phi);
  for (std::size_t t = 0; t < n; ++t) {
    x[t] = mean + state;
    state = phi * state + normal(rng);
  }
  return x;
}

// A vortex-shedding-like signal: amplitude * sin(2 pi t / period + random phase) plus AR(1) noise.
inline std::vector<double> SinePlusAr1(std::size_t n, double period, double amplitude, double phi,
                                       std::uint64_t seed) {
  std::vector<double> x = Ar1(n, phi, seed);
  std::mt19937_64 rng(seed ^ 0x9e3779b97f4a7c15ULL);
  const double phase = std::uniform_real_distribution<double>(0.0, 2.0 * std::numbers::pi)(rng);
  for (std::size_t t = 0; t < n; ++t) {
    x[t] += amplitude * std::sin(2.0 * std::numbers::pi * t / period + phase);
  }
  return x;
}

// Central moment of several series about their exact means, by two passes in long double: the
// reference that one-pass merging is checked against.
inline double TwoPassCentralMoment(const std::vector<std::vector<double>>& signals,
                                   const std::vector<int>& powers) {
  const std::size_t n = signals[0].size();
  std::vector<long double> mean(signals.size(), 0.0L);
  for (std::size_t s = 0; s < signals.size(); ++s) {
    for (double v : signals[s]) mean[s] += v;
    mean[s] /= n;
  }
  long double sum = 0.0L;
  for (std::size_t t = 0; t < n; ++t) {
    long double product = 1.0L;
    for (std::size_t s = 0; s < signals.size(); ++s) {
      for (int p = 0; p < powers[s]; ++p) product *= signals[s][t] - mean[s];
    }
    sum += product;
  }
  return static_cast<double>(sum / n);
}

}  // namespace plateau::testing

#endif  // PLATEAU_TESTS_CORE_SYNTHETIC_SERIES_H_
