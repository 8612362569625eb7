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

// How the automatic warm-up cut is found on the statistic's batch series.
enum class WarmupDetector {
  kMser,        // MSER alone (White 1997)
  kMserBridge,  // MSER, then a tenth more while the bridge test rejects (Heidelberger & Welch 1983)
  kMserDecay,   // MSER, then past the residue of a fitted exponential decay
};

struct EvaluationOptions {
  double confidence = 0.95;
  int batches = 20;  // k of the non-overlapping batch means (Schmeiser 1982: 10 to 30)
  WarmupPolicy warmup = WarmupPolicy::kAuto;
  double warmup_time = 0.0;
  WarmupDetector warmup_detector = WarmupDetector::kMserDecay;
  // Drift is reported when Geweke's two-sided p-value falls below this. Small, because a
  // statistic is tested at every evaluation and a run has many statistics.
  double drift_p_value = 0.001;
  // A half-width known less well than this (half_width_uncertainty) is reported as a warning; the
  // stop rule's bound of the same name decides whether it can count as met.
  double maximum_half_width_uncertainty = 0.2;
};

}  // namespace plateau

#endif  // PLATEAU_CORE_EVALUATION_OPTIONS_H_
