// In-place radix-2 complex FFT, used to compute autocovariances in O(n log n).
// Pure numerics, no I/O. Stateless; safe from any thread.
#ifndef PLATEAU_CORE_FFT_H_
#define PLATEAU_CORE_FFT_H_

#include <complex>
#include <vector>

namespace plateau {

// Transforms `data` in place; its size must be a power of two (otherwise it is left unchanged and
// false is returned). The inverse transform includes the 1/n factor.
bool Fft(std::vector<std::complex<double>>& data, bool inverse);

}  // namespace plateau

#endif  // PLATEAU_CORE_FFT_H_
