// The time spacing of one source's samples and what each sample counts for: once (sample
// weighting), or for the simulated time it stands for (time weighting, for runs whose solver
// adjusts its time step). Keeps the spread of the spacing and the gaps. Pure numerics, no I/O.
// Not thread-safe: one owner per source.
#ifndef PLATEAU_CORE_SAMPLE_SPACING_H_
#define PLATEAU_CORE_SAMPLE_SPACING_H_

#include <cstddef>
#include <cstdint>
#include <limits>
#include <optional>
#include <string>
#include <vector>

namespace plateau {

enum class Weighting {
  kAuto,     // time weighting when the first spacings vary by more than kVaryingTolerance
  kTime,     // each sample weighs the simulated time it stands for
  kSamples,  // each sample counts once
};
const char* WeightingName(Weighting weighting);
// "auto", "time" or "samples"; nullopt for anything else.
std::optional<Weighting> ParseWeighting(const std::string& name);

// The rule: a sample at t_i stands for the step that produced it, (t_{i-1}, t_i], as a solver's
// own running time average weighs each step's field by that step's Δt; the first sample stands
// for one cell. Weights are in cells of h, the median of the first kDecisionSpacings spacings, so
// that with even spacing every sample weighs 1 and every number equals the sample-weighted one.
// A step longer than kGapFactor median spacings is a gap (a paused and resumed solver): the sample
// after it weighs kGapFactor median spacings, not the gap.
class SampleSpacing {
 public:
  static constexpr std::size_t kDecisionSpacings = 32;
  // (max − min) / median of the first spacings above which kAuto weights by time: far above the
  // jitter of times printed to six digits (~1e-6), below the step changes of a Courant-number
  // controlled run (common practice: a few per cent and more).
  static constexpr double kVaryingTolerance = 0.01;
  static constexpr double kGapFactor = 5.0;
  static constexpr std::size_t kGapsKept = 16;

  struct Gap {
    double from = 0.0;  // time of the sample before the gap
    double to = 0.0;    // time of the sample after it
  };

  explicit SampleSpacing(Weighting requested = Weighting::kAuto);

  Weighting requested() const { return requested_; }
  // Whether the weighting is known: from the start for kSamples, else after Decide.
  bool decided() const { return decided_; }
  bool time_weighted() const { return time_weighted_; }
  // Chooses the weighting from the first admitted times (at least two for time weighting; with
  // fewer, kAuto falls back to sample weighting and kTime weighs every sample 1).
  void Decide(const std::vector<double>& first_times);
  // The weight of the next admitted sample at `time` (after the last one), and records its spacing.
  // Only once decided.
  double Next(double time);

  // Simulated time one unit of weight stands for: the cell h under time weighting, the mean
  // spacing under sample weighting; NaN before two samples.
  double unit_time() const;
  std::uint64_t spacings() const { return spacings_; }
  double min_spacing() const { return min_; }
  double max_spacing() const { return max_; }
  // Median of the recent spacings (the last kWindow), gaps included.
  double median_spacing() const { return median_; }
  // Whether the spacing has varied by more than kVaryingTolerance: the middle 80 % of the recent
  // spacings (10th to 90th percentile) spread by more than that share of their median, now or at
  // any earlier look. A single odd step (a skipped bad line) is not a varying step.
  bool varies() const;
  std::uint64_t gap_count() const { return gap_count_; }
  // The last kGapsKept gaps, oldest first.
  const std::vector<Gap>& gaps() const { return gaps_; }
  // One sentence for status and analyze: the weighting, why, and the spread of the spacing.
  std::string Describe() const;

  // Complete state as doubles, for checkpoints, the requested weighting with it (the estimates so
  // far were made under it); Restore returns false and changes nothing when the state does not fit.
  std::vector<double> SaveState() const;
  bool RestoreState(const std::vector<double>& state);

 private:
  static constexpr std::size_t kWindow = 256;
  static constexpr std::size_t kMedianEvery = 64;
  void Record(double spacing, double time);
  void UpdateMedian();
  // (90th - 10th percentile) / median of the recent spacings; 0 without any.
  double RecentSpread() const;

  Weighting requested_;
  bool decided_ = false;
  bool time_weighted_ = false;
  double cell_ = std::numeric_limits<double>::quiet_NaN();
  double first_time_ = std::numeric_limits<double>::quiet_NaN();
  double last_time_ = std::numeric_limits<double>::quiet_NaN();
  std::uint64_t spacings_ = 0;
  double min_ = std::numeric_limits<double>::quiet_NaN();
  double max_ = std::numeric_limits<double>::quiet_NaN();
  double median_ = std::numeric_limits<double>::quiet_NaN();
  bool varied_ = false;  // the recent spacings spread wider than kVaryingTolerance at some look
  std::vector<double> recent_;  // ring of the last kWindow spacings
  std::size_t recent_next_ = 0;
  std::uint64_t gap_count_ = 0;
  std::vector<Gap> gaps_;
};

}  // namespace plateau

#endif  // PLATEAU_CORE_SAMPLE_SPACING_H_
