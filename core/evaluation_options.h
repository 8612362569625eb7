// How a statistic is evaluated: confidence level, batches, warm-up policy, drift threshold.
// Plain data, no behaviour; copied freely between threads.
#ifndef PLATEAU_CORE_EVALUATION_OPTIONS_H_
#define PLATEAU_CORE_EVALUATION_OPTIONS_H_

namespace plateau {

enum class WarmupPolicy {
  kAuto,       // MSER-5 on the block series, re-evaluated as data grows
  kNone,       // use every sample
  kFixedTime,  // discard samples before warmup_time (simulated time units of the time column)
};

struct EvaluationOptions {
  double confidence = 0.95;
  int batches = 20;  // k of the non-overlapping batch means (Schmeiser 1982: 10 to 30)
  WarmupPolicy warmup = WarmupPolicy::kAuto;
  double warmup_time = 0.0;
  // Drift is reported when Geweke's two-sided p-value falls below this. Small, because a
  // statistic is tested at every evaluation and a run has many statistics.
  double drift_p_value = 0.001;
  // Fewer effective samples than this makes the interval itself unreliable: reported as a warning.
  double minimum_effective_samples = 100.0;
};

}  // namespace plateau

#endif  // PLATEAU_CORE_EVALUATION_OPTIONS_H_
