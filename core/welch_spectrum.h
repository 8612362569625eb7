// Welch's averaged periodogram kept online (Welch 1967, "The use of fast Fourier transform for the
// estimation of power spectra", IEEE Trans. Audio Electroacoust. 15(2)): periodic Hann window,
// segments overlapping by half, each segment's mean removed, one-sided power spectral density. The
// same conventions as SciPy's signal.welch with its defaults (window "hann", noverlap = nperseg / 2,
// detrend "constant", scaling "density"), so that the two agree on the same data. Memory is one
// segment and one spectrum, whatever the run length. Not thread-safe: one owner adds and reads.
#ifndef PLATEAU_CORE_WELCH_SPECTRUM_H_
#define PLATEAU_CORE_WELCH_SPECTRUM_H_

#include <complex>
#include <cstddef>
#include <memory>
#include <vector>

namespace plateau {

class WelchSpectrum {
 public:
  // `segment_length` values per segment, even and at least 4 (the real-input transform works on
  // pairs); `sampling_rate` in samples per unit of time (1 / dt).
  WelchSpectrum(std::size_t segment_length, double sampling_rate);
  ~WelchSpectrum();
  WelchSpectrum(WelchSpectrum&&) noexcept;
  WelchSpectrum& operator=(WelchSpectrum&&) noexcept;
  WelchSpectrum(const WelchSpectrum&) = delete;
  WelchSpectrum& operator=(const WelchSpectrum&) = delete;

  // The next value of the evenly sampled signal. Every half segment after the first full one
  // completes a segment, which is transformed and averaged in.
  void Add(double value);

  std::size_t segment_length() const { return segment_length_; }
  std::size_t segments() const { return segments_; }
  // segment_length / 2 + 1 frequencies, 0 to the Nyquist frequency, in 1 / time units.
  std::vector<double> Frequencies() const;
  // The mean one-sided power spectral density over the segments so far (units of the signal
  // squared per unit of frequency); empty before the first segment.
  std::vector<double> Density() const;

 private:
  void TransformSegment();

  std::size_t segment_length_;
  double sampling_rate_;
  std::vector<double> window_;
  double window_power_ = 0.0;  // sum of the squared window
  // The last segment_length values, oldest first once full (a sliding buffer, shifted by half a
  // segment after each transform).
  std::vector<double> buffer_;
  std::vector<double> density_sum_;
  std::size_t segments_ = 0;
  struct Transform;  // the library's real-input FFT plan
  std::unique_ptr<Transform> transform_;
};

}  // namespace plateau

#endif  // PLATEAU_CORE_WELCH_SPECTRUM_H_
