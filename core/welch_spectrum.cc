#include "core/welch_spectrum.h"

#include <kissfft/kissfft.hh>

#include <cmath>
#include <numbers>
#include <stdexcept>

namespace plateau {

// KissFFT's header-only template in double precision (Debian's libkissfft-dev): its real-input
// transform of 2N values runs a complex transform of N.
struct WelchSpectrum::Transform {
  explicit Transform(std::size_t half) : fft(half, false), output(half) {}
  kissfft<double> fft;
  std::vector<std::complex<double>> output;
};

WelchSpectrum::WelchSpectrum(std::size_t segment_length, double sampling_rate)
    : segment_length_(segment_length), sampling_rate_(sampling_rate) {
  if (segment_length < 4 || segment_length % 2 != 0) {
    throw std::invalid_argument("a Welch segment must hold an even number of values, at least 4");
  }
  // The periodic Hann window (SciPy's get_window("hann", N), the FFT convention).
  window_.resize(segment_length);
  for (std::size_t i = 0; i < segment_length; ++i) {
    window_[i] = 0.5 - 0.5 * std::cos(2.0 * std::numbers::pi * static_cast<double>(i) /
                                      static_cast<double>(segment_length));
    window_power_ += window_[i] * window_[i];
  }
  buffer_.reserve(segment_length);
  transform_ = std::make_unique<Transform>(segment_length / 2);
}

WelchSpectrum::~WelchSpectrum() = default;
WelchSpectrum::WelchSpectrum(WelchSpectrum&&) noexcept = default;
WelchSpectrum& WelchSpectrum::operator=(WelchSpectrum&&) noexcept = default;

void WelchSpectrum::Add(double value) {
  buffer_.push_back(value);
  if (buffer_.size() < segment_length_) return;
  TransformSegment();
  // The next segment starts half a segment later (50 % overlap).
  buffer_.erase(buffer_.begin(), buffer_.begin() + static_cast<long>(segment_length_ / 2));
}

void WelchSpectrum::TransformSegment() {
  const std::size_t n = segment_length_;
  double mean = 0.0;
  for (double v : buffer_) mean += v;
  mean /= static_cast<double>(n);
  std::vector<double> tapered(n);
  for (std::size_t i = 0; i < n; ++i) tapered[i] = (buffer_[i] - mean) * window_[i];
  std::vector<std::complex<double>>& x = transform_->output;
  transform_->fft.transform_real(tapered.data(), x.data());

  const std::size_t bins = n / 2 + 1;
  if (density_sum_.empty()) density_sum_.assign(bins, 0.0);
  const double scale = 1.0 / (sampling_rate_ * window_power_);
  // Bin 0 and the Nyquist bin come packed in x[0]; they are not doubled (one-sided density).
  density_sum_[0] += x[0].real() * x[0].real() * scale;
  density_sum_[n / 2] += x[0].imag() * x[0].imag() * scale;
  for (std::size_t k = 1; k < n / 2; ++k) density_sum_[k] += 2.0 * std::norm(x[k]) * scale;
  ++segments_;
}

std::vector<double> WelchSpectrum::Frequencies() const {
  std::vector<double> f(segment_length_ / 2 + 1);
  for (std::size_t k = 0; k < f.size(); ++k) {
    f[k] = static_cast<double>(k) * sampling_rate_ / static_cast<double>(segment_length_);
  }
  return f;
}

std::vector<double> WelchSpectrum::Density() const {
  std::vector<double> density = density_sum_;
  for (double& d : density) d /= static_cast<double>(segments_);
  return density;
}

}  // namespace plateau
