// Geweke's (1992) stationarity diagnostic: the mean of the early part of a series against the mean
// of its late part, in units of their standard errors. Pure numerics; stateless.
#ifndef PLATEAU_CORE_GEWEKE_DRIFT_H_
#define PLATEAU_CORE_GEWEKE_DRIFT_H_

#include <vector>

namespace plateau {

struct DriftTest {
  bool available = false;  // false when the parts are too short to test
  double z = 0.0;          // (mean_early - mean_late) / sqrt(sigma2 / n_early + sigma2 / n_late)
  double degrees_of_freedom = 0.0;  // of the Student t that gives p: the late part's n_eff
  double p_value = 1.0;    // two-sided
};

// Geweke, "Evaluating the accuracy of sampling-based approaches to the calculation of posterior
// moments", Bayesian Statistics 4 (1992): early = first `early_fraction`, late = last
// `late_fraction` (defaults 0.1 and 0.5 as in the paper). The long-run variance sigma2 of both
// parts comes from Geyer's initial monotone sequence on the late part, as Heidelberger & Welch
// (1983) take the spectral density from the later part (cited from memory): a short early part
// estimates its own variance too low and too noisily, which made the test reject a stationary
// series at many times its nominal rate. Needs at least 20 values in the early part.
DriftTest GewekeDrift(const std::vector<double>& series, double early_fraction = 0.1,
                      double late_fraction = 0.5);

}  // namespace plateau

#endif  // PLATEAU_CORE_GEWEKE_DRIFT_H_
