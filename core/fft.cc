#include "core/fft.h"

#include <array>
#include <bit>
#include <cmath>
#include <mutex>
#include <numbers>
#include <utility>

namespace plateau {

namespace {

// exp(-2 pi i k / n) for k < n/2, from cos/sin of each angle (no rounding accumulated by a
// recurrence), computed once per power of two and shared: evaluations repeat the same sizes.
const std::vector<std::complex<double>>& ForwardTwiddles(std::size_t n) {
  static std::array<std::vector<std::complex<double>>, 64> tables;
  static std::array<std::once_flag, 64> made;
  const int k = std::countr_zero(n);
  std::call_once(made[k], [&] {
    tables[k].resize(n / 2);
    for (std::size_t j = 0; j < n / 2; ++j) {
      const double angle = -2.0 * std::numbers::pi * static_cast<double>(j) / static_cast<double>(n);
      tables[k][j] = {std::cos(angle), std::sin(angle)};
    }
  });
  return tables[k];
}

}  // namespace

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
  const std::vector<std::complex<double>>& twiddle = ForwardTwiddles(n);
  for (std::size_t span = 2; span <= n; span <<= 1) {
    const std::size_t half = span / 2;
    const std::size_t step = n / span;
    for (std::size_t start = 0; start < n; start += span) {
      for (std::size_t k = 0; k < half; ++k) {
        // Plain real arithmetic: std::complex's operator* carries C99 Annex G NaN recovery.
        const double wr = twiddle[k * step].real();
        const double wi = inverse ? -twiddle[k * step].imag() : twiddle[k * step].imag();
        const std::complex<double> x = data[start + k + half];
        const std::complex<double> odd(wr * x.real() - wi * x.imag(),
                                       wr * x.imag() + wi * x.real());
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
