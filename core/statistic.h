// One statistic of a run: its formula over row columns, the block history of its signals, and the
// evaluation pipeline (warm-up cut, linearisation, estimators, combination, drift).
// Pure numerics, no I/O. Not thread-safe: one owner adds samples and evaluates.
#ifndef PLATEAU_CORE_STATISTIC_H_
#define PLATEAU_CORE_STATISTIC_H_

#include <functional>
#include <memory>
#include <string>
#include <vector>

#include "core/block_history.h"
#include "core/evaluation_options.h"
#include "core/statistic_estimate.h"
#include "core/statistic_formula.h"

namespace plateau {

class Statistic {
 public:
  // Fewer samples than this after the warm-up give a value but no interval.
  static constexpr double kMinimumSamples = 50.0;
  // An oscillating statistic whose average spans fewer periods than this is flagged: tens of
  // shedding cycles before a mean drag or an rms lift is trusted is common practice (no single
  // source; the figure, about 20).
  static constexpr double kMinimumCycles = 20.0;

  // A statistic with a history of its own.
  Statistic(std::string name, StatisticFormula formula,
            std::size_t capacity = BlockHistory::kDefaultCapacity);
  // A statistic on a history that others share (the points of a probe line): whoever owns the
  // history feeds it, once per sample; its layout must hold the formula's signals and order.
  Statistic(std::string name, StatisticFormula formula, std::shared_ptr<BlockHistory> history);
  Statistic(Statistic&&) = default;
  Statistic& operator=(Statistic&&) = default;
  Statistic(const Statistic&) = delete;  // copies would alias one history
  Statistic& operator=(const Statistic&) = delete;

  const std::string& name() const { return name_; }
  const StatisticFormula& formula() const { return formula_; }
  const BlockHistory& history() const { return *history_; }
  BlockHistory& history() { return *history_; }

  // Adds the sample of one data row to the statistic's history; `row` holds every column, the
  // formula picks its signals. Only for a history of its own: a shared one is fed by its owner.
  void Add(double time, const double* row);

  // Evaluates with the data so far. Never fails: missing data shows in the estimate's state.
  StatisticEstimate Evaluate(const EvaluationOptions& options) const;

  // Number of leading closed blocks that the warm-up policy discards.
  int WarmupBlocks(const EvaluationOptions& options) const;
  // The linearised block series after `cut` leading closed blocks: the series Evaluate's
  // estimators work on (its mean is zero), for joint estimates over statistics of one source.
  // Empty when no closed block remains.
  std::vector<double> LinearisedBlockSeries(int cut) const;

 private:
  // The automatic cut: MSER on the grouped block series, then the detector's extension.
  int AutomaticWarmupBlocks(WarmupDetector detector) const;
  // Blocks per MSER batch: at least five samples and at most kMserBatches batches.
  std::size_t MserGroup() const;
  using BlockMeasure = std::function<double(const double* block)>;
  // `measure` of each closed block, oldest first.
  std::vector<double> BlockSeries(const BlockMeasure& measure) const;
  std::vector<double> PostWarmupSummary(int cut) const;
  // z_b for each closed block after the cut (shared/DESIGN.md, delta method).
  std::vector<double> LinearisedSeries(int cut, const std::vector<double>& global,
                                       const std::vector<WeightedMoment>& terms) const;
  double LinearisedSampleVariance(const std::vector<double>& global,
                                  const std::vector<WeightedMoment>& terms) const;
  void Estimate(const std::vector<double>& series, double sample_variance,
                const EvaluationOptions& options, StatisticEstimate& e) const;

  std::string name_;
  StatisticFormula formula_;
  std::shared_ptr<BlockHistory> history_;
};

}  // namespace plateau

#endif  // PLATEAU_CORE_STATISTIC_H_
