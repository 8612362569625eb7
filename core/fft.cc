#include "core/fft.h"

#include <cmath>
#include <numbers>
#include <utility>

namespace plateau {

bool Fft(std::vector<std::complex<double>>& data, bool inverse) {
  const std::size_t n = data.size();
  if (n == 0 || (n & (n - 1)) != 0) return false;
  // Iterative Cooley-Tukey: bit-reversal permutation, then butterflies of doubling span.
  for (std::size_t i = 1, j = 0; i < n; ++i) {
    std::size_t bit = n >> 1;
    for (; j & bit; bit >>= 1) j ^= bit;
    j ^= bit;
    if (i < j) std::swap(data[i], data[j]);
  }
  // Twiddles computed directly from cos/sin of each angle, once per call: no accumulated rounding
  // from a recurrence, and n/2 trigonometric calls rather than n log n.
  const double sign = inverse ? 1.0 : -1.0;
  std::vector<std::complex<double>> twiddle(n / 2);
  for (std::size_t k = 0; k < n / 2; ++k) {
    const double angle = sign * 2.0 * std::numbers::pi * static_cast<double>(k) / n;
    twiddle[k] = {std::cos(angle), std::sin(angle)};
  }
  for (std::size_t span = 2; span <= n; span <<= 1) {
    const std::size_t half = span / 2;
    const std::size_t step = n / span;
    for (std::size_t start = 0; start < n; start += span) {
      for (std::size_t k = 0; k < half; ++k) {
        const std::complex<double> odd = twiddle[k * step] * data[start + k + half];
        data[start + k + half] = data[start + k] - odd;
        data[start + k] += odd;
      }
    }
  }
  if (inverse) {
    for (auto& value : data) value /= static_cast<double>(n);
  }
  return true;
}

}  // namespace plateau
