// Warm-up cut by a stationarity test on what remains (Heidelberger & Welch 1983, "Simulation run
// length control in the presence of an initial transient", Operations Research 31(6) 1109-1144,
// after Schruben 1982, "Detecting initialization bias in simulation output", Operations Research
// 30(3) 569-590): the Brownian bridge of the standardised cumulative sums of the remaining series
// is tested with the Cramér–von Mises statistic, discarding a further tenth of the series after
// each rejection. Pure numerics; stateless.
#ifndef PLATEAU_CORE_BRIDGE_TEST_TRUNCATION_H_
#define PLATEAU_CORE_BRIDGE_TEST_TRUNCATION_H_

#include <vector>

namespace plateau {

// The 95 % quantile of the integral of a squared Brownian bridge (Anderson & Darling 1952; checked
// with SciPy's scipy.stats._hypotests._cdf_cvm_inf, 0.461361).
inline constexpr double kCramerVonMises95 = 0.4614;

// Cramér–von Mises statistic (1/n) sum_k B_k^2 of the bridge B_k = (S_k - k mean) / sqrt(n sigma^2)
// for S_k the partial sums of `series` and sigma^2 its long-run variance per value.
double BridgeCramerVonMises(const std::vector<double>& series, double long_run_variance);

// The number of leading values to delete: starting at `floor_cut` (MSER's), a tenth of the series
// more while the remaining series fails the bridge test at the 5 % level (asymptotic critical value
// 0.4614, Anderson & Darling 1952), the long-run variance estimated from the remaining series'
// second half by overlapping batch means. Never more than max_fraction of the series.
int BridgeTestTruncation(const std::vector<double>& series, int floor_cut,
                         double max_fraction = 0.5);

}  // namespace plateau

#endif  // PLATEAU_CORE_BRIDGE_TEST_TRUNCATION_H_
