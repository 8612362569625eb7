// Autocorrelation-based estimates of the variance of a series' mean: Geyer's (1992) initial positive
// and initial monotone sequences, Sokal's automatic window, and a test for an oscillating
// autocorrelation (a dominant period, as in vortex shedding). Pure numerics; stateless.
#ifndef PLATEAU_CORE_AUTOCORRELATION_H_
#define PLATEAU_CORE_AUTOCORRELATION_H_

#include <vector>

namespace plateau {

struct AutocorrelationResult {
  int length = 0;       // n, the number of values analysed
  double gamma0 = 0.0;  // variance with 1/n normalisation
  // Normalised autocorrelation rho_k = gamma_k / gamma_0, gamma_k = (1/n) sum (x_t - m)(x_{t+k} - m).
  std::vector<double> rho;
  // Asymptotic variance sigma^2 = lim n Var(mean) = -gamma_0 + 2 sum_m Gamma_m, Gamma_m =
  // gamma_{2m} + gamma_{2m+1}, summed while positive (initial positive sequence) and additionally
  // made non-increasing (initial monotone sequence); Geyer, Statistical Science 7 (1992) 473-483.
  double sigma2_initial_positive = 0.0;
  double sigma2_initial_monotone = 0.0;
  int geyer_pairs = 0;  // number of Gamma_m terms summed
  // tau = 1 + 2 sum_{k=1}^{M} rho_k with the smallest window M >= c tau(M) (Sokal 1997, "Monte Carlo
  // methods in statistical mechanics", c = 5).
  double tau_sokal = 0.0;
  int sokal_window = 0;
  // Lag of the first positive peak after a significant negative lobe, in values; 0 when the
  // autocorrelation does not oscillate.
  int oscillation_period = 0;
};

// Asymptotic variance by the Parzen lag window of `window` lags, sigma^2 = gamma_0 + 2 sum_{k<M}
// w(k/M) gamma_k (Priestley 1981, "Spectral Analysis and Time Series", Sec. 6.2.3). Its spectral
// window leaks a tone of period P only as (P/M)^4, where batch means (a Bartlett window) leak as P/M:
// with M many periods long it averages out vortex shedding. Equivalent degrees of freedom
// 2n / (0.539 M). NaN when window < 2 or the result has fewer than window lags.
double ParzenLagWindowSigma2(const AutocorrelationResult& r, int window);

// Analyses `series` (at least 4 finite values; fewer give a result with length < 4 and zeros).
// A constant series has gamma0 = 0, every sigma^2 = 0 and tau = 1.
AutocorrelationResult AnalyseAutocorrelation(const std::vector<double>& series,
                                             double sokal_c = 5.0);

// Geyer's initial monotone sigma^2 by direct lag sums, computed only as far as the sequence goes:
// O(n m) for m pairs, far cheaper than an FFT when the series is nearly white (merged blocks). Also
// returns gamma_0 through *gamma0 when not null. Same value as AnalyseAutocorrelation's.
double GeyerInitialMonotoneSigma2(const std::vector<double>& series, double* gamma0 = nullptr);

// Biased autocovariances gamma_0 .. gamma_{n-1} of the demeaned series, by FFT with zero padding.
std::vector<double> Autocovariance(const std::vector<double>& series);

}  // namespace plateau

#endif  // PLATEAU_CORE_AUTOCORRELATION_H_
