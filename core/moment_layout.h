// The algebra of one block summary: sample count, time of the first sample, the means of up to three
// signals and their central power sums up to a fixed order, stored as a flat array of doubles.
// Pure numerics: no I/O, no clock. Immutable after construction; safe to share between threads.
#ifndef PLATEAU_CORE_MOMENT_LAYOUT_H_
#define PLATEAU_CORE_MOMENT_LAYOUT_H_

#include <array>
#include <cstddef>
#include <vector>

namespace plateau {

// Exponents of a product of centred signals: {2, 1, 0} is (x0 - c0)^2 (x1 - c1).
using Powers = std::array<int, 3>;

// A summary is `stride()` doubles laid out as
//   [0]            time of the first sample (NaN while empty)
//   [1 .. d]       means of the d signals
//   [1+d ..]       S[alpha] = sum over samples of prod_i (x_i - mean_i)^alpha_i for every alpha with
//                  |alpha| <= max_order; S[0] is the count, S[e_i] is kept at exactly zero.
// Merging shifts both summaries' sums to the combined mean with the binomial theorem and adds them:
// exact in real arithmetic and stable in floating point (Chan, Golub & LeVeque 1979 for order 2;
// Pébay 2008, "Formulas for robust, one-pass parallel computation of covariances and arbitrary-order
// statistical moments", Sandia report SAND2008-6212, for higher orders and several signals).
class MomentLayout {
 public:
  static constexpr int kMaxSignals = 3;
  static constexpr int kMaxOrder = 6;

  // signals in 1..kMaxSignals, max_order in 2..kMaxOrder; out-of-range arguments are clamped.
  MomentLayout(int signals, int max_order);

  int signals() const { return signals_; }
  int max_order() const { return max_order_; }
  std::size_t stride() const { return 1 + signals_ + powers_.size(); }

  // Sets a summary to the empty state (count 0).
  void Clear(double* summary) const;
  // Adds one sample of all d signals at `time` with `weight` (> 0; 1 for a sample that counts
  // once, the simulated time it stands for under time weighting): the count becomes the sum of
  // weights and every mean and central sum the weighted one, so summaries of weighted samples merge
  // by the same formulas (Pébay 2008 holds for real weights). Values must be finite (the parser
  // guarantees it). The one-signal order-two case (every mean statistic) is Welford's update
  // (Welford 1962; weighted form West 1979, "Updating mean and variance estimates: an improved
  // method", CACM 22(9)), inline because it runs once per value of every probe file. With weight 1
  // every operation rounds as the unweighted update did.
  void AddSample(double* summary, double time, const double* values, double weight = 1.0) const {
    if (signals_ == 1 && max_order_ == 2) {
      double& count = summary[2];
      if (count == 0.0) summary[0] = time;
      count += weight;
      const double delta = values[0] - summary[1];
      summary[1] += delta * weight / count;
      summary[4] += weight * delta * (values[0] - summary[1]);
      return;
    }
    AddSampleGeneral(summary, time, values, weight);
  }
  // out = a merged with b, where b's samples follow a's. `out` may alias `a` or `b`.
  void Merge(const double* a, const double* b, double* out) const;

  double Count(const double* summary) const { return summary[1 + signals_]; }
  double FirstTime(const double* summary) const { return summary[0]; }
  double Mean(const double* summary, int signal) const { return summary[1 + signal]; }
  // S[alpha] / n: the central moment of the summary's own samples (1/n normalisation).
  // |alpha| must be <= max_order; NaN when the summary is empty.
  double CentralMoment(const double* summary, const Powers& alpha) const;
  // (1/n) sum over samples of prod_i (x_i - centre_i)^alpha_i, about an arbitrary centre, by the
  // binomial shift of the stored central sums (no cancellation when centre is near the mean).
  double MomentAbout(const double* summary, const Powers& alpha, const double* centre) const;

 private:
  // One term of the per-signal binomial shift: T[target] += binom * delta^power * S[source].
  struct ShiftTerm {
    int target;
    int source;
    int power;
    double binomial;
  };
  int SumIndex(const Powers& alpha) const;
  // Rewrites the sums `sums` (about the current mean) as sums about mean - delta.
  void ShiftSums(double* sums, const double* delta) const;
  void AddSampleGeneral(double* summary, double time, const double* values, double weight) const;
  void MergeOrderTwoSingle(const double* a, const double* b, double* out) const;

  int signals_;
  int max_order_;
  std::vector<Powers> powers_;          // every alpha with |alpha| <= max_order, order-major
  std::vector<int> index_of_;           // dense lookup (max_order+1)^3 -> position in powers_
  std::array<std::vector<ShiftTerm>, kMaxSignals> shift_terms_;
};

}  // namespace plateau

#endif  // PLATEAU_CORE_MOMENT_LAYOUT_H_
