// Warm-up cut that reaches past what MSER can see: a start-up transient decaying as A exp(-t / T),
// fitted to the batch means, is extrapolated into the part of it already buried in the noise, and
// the cut goes where the bias it leaves behind is a small share of the standard error. Pure
// numerics; stateless.
#ifndef PLATEAU_CORE_DECAY_FIT_TRUNCATION_H_
#define PLATEAU_CORE_DECAY_FIT_TRUNCATION_H_

#include <vector>

namespace plateau {

struct DecayFit {
  bool significant = false;  // the decay explains more than noise would (see DecayFitTruncation)
  double amplitude = 0.0;    // A, in the series' units
  double efolding = 0.0;     // T, in values of the series
  double level = 0.0;        // the settled mean
  double strength = 0.0;     // variance explained over the series' long-run variance per value
};

// A decay is significant when it explains more than this many long-run variances of one value:
// the best of the grid's fits to stationary noise explains a chi-square with about two degrees of
// freedom (exceeded with probability 1e-5 at 23). In the unit tests none of 1000 stationary
// series passed it with the noise level given, 3 with the noise level estimated from the series.
inline constexpr double kDecayStrength = 25.0;
// The cut leaves at most this many standard errors of fitted bias: 0.1 costs a 95 % interval
// under 0.1 % of coverage, and leaves room for the fit's own error.
inline constexpr double kResidueShare = 0.1;

// Least-squares fit of level + A exp(-(j + 1/2) / T) to the whole series over a logarithmic grid of
// T from half a value to half the series (linear least squares for level and A at each T).
DecayFit FitStartupDecay(const std::vector<double>& series, double long_run_variance);

// The number of leading values to delete: at least `floor_cut` (MSER's), and when a fitted decay is
// significant (it explains more than kDecayStrength long-run variances), the smallest cut whose
// remaining fitted bias is at most kResidueShare standard errors of the remaining mean. Never more
// than max_fraction of the series (White's search limit). The long-run variance is estimated from
// the second half by overlapping batch means. Series shorter than 16 values keep floor_cut.
int DecayFitTruncation(const std::vector<double>& series, int floor_cut, double max_fraction = 0.5);

}  // namespace plateau

#endif  // PLATEAU_CORE_DECAY_FIT_TRUNCATION_H_
