#include "core/autocorrelation.h"

#include <algorithm>
#include <cmath>
#include <complex>
#include <limits>

#include "core/fft.h"

namespace plateau {
namespace {

void GeyerSequences(const std::vector<double>& gamma, AutocorrelationResult& r) {
  const int n = static_cast<int>(gamma.size());
  double sum_positive = 0.0;
  double sum_monotone = 0.0;
  double previous = gamma[0] + (n > 1 ? gamma[1] : 0.0);
  int pairs = 0;
  for (int m = 0; 2 * m + 1 < n; ++m) {
    const double pair = gamma[2 * m] + gamma[2 * m + 1];
    if (pair <= 0.0) break;
    sum_positive += pair;
    previous = std::min(previous, pair);
    sum_monotone += previous;
    ++pairs;
  }
  r.geyer_pairs = pairs;
  r.sigma2_initial_positive = -gamma[0] + 2.0 * sum_positive;
  r.sigma2_initial_monotone = -gamma[0] + 2.0 * sum_monotone;
}

void SokalWindow(const std::vector<double>& rho, double c, AutocorrelationResult& r) {
  double tau = 1.0;
  const int n = static_cast<int>(rho.size());
  for (int m = 1; m < n; ++m) {
    tau += 2.0 * rho[m];
    if (m >= c * tau) {
      r.tau_sokal = tau;
      r.sokal_window = m;
      return;
    }
  }
  r.tau_sokal = tau;
  r.sokal_window = n - 1;
}

// A dominant period shows as a negative lobe followed by a positive one, both well outside the noise
// of the estimated autocorrelation (Bartlett's formula, Var rho_k ~ (1 + 2 sum rho_j^2) / n, summed
// over the initial lobe). An AR-like decay crosses zero only in noise and fails the test.
int OscillationPeriod(const std::vector<double>& rho) {
  const int n = static_cast<int>(rho.size());
  const int limit = n / 4;
  int k = 1;
  double initial_sum_sq = 0.0;
  for (; k < limit && rho[k] >= 0.0; ++k) initial_sum_sq += rho[k] * rho[k];
  const double noise = std::sqrt((1.0 + 2.0 * initial_sum_sq) / n);
  const double threshold = std::max(0.1, 4.0 * noise);
  double lobe_min = 0.0;
  for (; k < limit && rho[k] < 0.0; ++k) lobe_min = std::min(lobe_min, rho[k]);
  double lobe_max = 0.0;
  int peak = 0;
  while (k < limit && rho[k] >= 0.0) {
    if (rho[k] > lobe_max) {
      lobe_max = rho[k];
      peak = k;
    }
    ++k;
  }
  return (lobe_min < -threshold && lobe_max > threshold) ? peak : 0;
}

}  // namespace

double ParzenWindowDegreesOfFreedom(int n, int window) {
  return window > 0 ? n / (0.539 * window) : std::numeric_limits<double>::quiet_NaN();
}

double GeyerDegreesOfFreedom(const AutocorrelationResult& r) {
  if (r.geyer_pairs < 1) return std::numeric_limits<double>::quiet_NaN();
  const int truncation = 2 * r.geyer_pairs - 1;
  constexpr double kDataChosenTruncation = 1.5;  // see the header: measured, on the safe side
  return r.length / (kDataChosenTruncation * (2.0 * truncation + 1.0));
}

double ParzenLagWindowSigma2(const AutocorrelationResult& r, int window) {
  if (window < 2 || window > static_cast<int>(r.rho.size())) return std::nan("");
  double sum = 1.0;
  for (int k = 1; k < window; ++k) {
    const double u = static_cast<double>(k) / window;
    const double w = u <= 0.5 ? 1.0 - 6.0 * u * u + 6.0 * u * u * u : 2.0 * std::pow(1.0 - u, 3);
    sum += 2.0 * w * r.rho[k];
  }
  return r.gamma0 * sum;
}

double GeyerInitialMonotoneSigma2(const std::vector<double>& series, double* gamma0) {
  const std::size_t n = series.size();
  if (n < 2) return std::nan("");
  double mean = 0.0;
  for (double v : series) mean += v;
  mean /= static_cast<double>(n);
  std::vector<double> centred(n);
  for (std::size_t t = 0; t < n; ++t) centred[t] = series[t] - mean;
  const auto lag = [&](std::size_t k) {
    double sum = 0.0;
    for (std::size_t t = 0; t + k < n; ++t) sum += centred[t] * centred[t + k];
    return sum / static_cast<double>(n);
  };
  const double g0 = lag(0);
  if (gamma0 != nullptr) *gamma0 = g0;
  double previous = std::numeric_limits<double>::infinity();
  double sum_monotone = 0.0;
  for (std::size_t m = 0; 2 * m + 1 < n; ++m) {
    const double pair = (m == 0 ? g0 : lag(2 * m)) + lag(2 * m + 1);
    if (pair <= 0.0) break;
    previous = std::min(previous, pair);
    sum_monotone += previous;
  }
  return -g0 + 2.0 * sum_monotone;
}

std::vector<double> Autocovariance(const std::vector<double>& series) {
  const std::size_t n = series.size();
  if (n == 0) return {};
  double mean = 0.0;
  for (double v : series) mean += v;
  mean /= static_cast<double>(n);
  std::size_t size = 1;
  while (size < 2 * n) size <<= 1;
  std::vector<std::complex<double>> data(size);
  for (std::size_t i = 0; i < n; ++i) data[i] = series[i] - mean;
  Fft(data, false);
  for (auto& value : data) value = std::norm(value);
  Fft(data, true);
  std::vector<double> gamma(n);
  for (std::size_t k = 0; k < n; ++k) gamma[k] = data[k].real() / static_cast<double>(n);
  return gamma;
}

AutocorrelationResult AnalyseAutocorrelation(const std::vector<double>& series, double sokal_c) {
  AutocorrelationResult r;
  r.length = static_cast<int>(series.size());
  if (r.length < 4) return r;
  const std::vector<double> gamma = Autocovariance(series);
  r.gamma0 = gamma[0];
  if (!(r.gamma0 > 0.0)) {
    r.tau_sokal = 1.0;
    r.rho.assign(series.size(), 0.0);
    r.rho[0] = 1.0;
    return r;
  }
  r.rho.resize(gamma.size());
  for (std::size_t k = 0; k < gamma.size(); ++k) r.rho[k] = gamma[k] / gamma[0];
  GeyerSequences(gamma, r);
  SokalWindow(r.rho, sokal_c, r);
  r.oscillation_period = OscillationPeriod(r.rho);
  return r;
}

}  // namespace plateau
