#include "core/moment_layout.h"

#include <algorithm>
#include <cmath>
#include <limits>

namespace plateau {
namespace {

constexpr int kMaxSums = 84;  // multi-indices of 3 signals up to order 6: C(9, 3)

double IntegerPower(double x, int n) {
  double result = 1.0;
  for (int i = 0; i < n; ++i) result *= x;
  return result;
}

double Binomial(int n, int k) {
  double result = 1.0;
  for (int i = 1; i <= k; ++i) result = result * (n - k + i) / i;
  return result;
}

}  // namespace

MomentLayout::MomentLayout(int signals, int max_order)
    : signals_(std::clamp(signals, 1, kMaxSignals)),
      max_order_(std::clamp(max_order, 2, kMaxOrder)) {
  // Order-major enumeration keeps S[0] (the count) first, then S[e_i], then the true sums.
  for (int order = 0; order <= max_order_; ++order) {
    for (int a0 = order; a0 >= 0; --a0) {
      for (int a1 = order - a0; a1 >= 0; --a1) {
        const int a2 = order - a0 - a1;
        const Powers alpha{a0, a1, a2};
        bool fits = true;
        for (int i = signals_; i < kMaxSignals; ++i) fits = fits && alpha[i] == 0;
        if (fits) powers_.push_back(alpha);
      }
    }
  }
  const int side = max_order_ + 1;
  index_of_.assign(side * side * side, -1);
  for (int p = 0; p < static_cast<int>(powers_.size()); ++p) {
    const Powers& a = powers_[p];
    index_of_[(a[0] * side + a[1]) * side + a[2]] = p;
  }
  for (int i = 0; i < signals_; ++i) {
    for (int target = 0; target < static_cast<int>(powers_.size()); ++target) {
      const Powers& alpha = powers_[target];
      for (int k = 0; k <= alpha[i]; ++k) {
        Powers beta = alpha;
        beta[i] = k;
        shift_terms_[i].push_back({target, SumIndex(beta), alpha[i] - k, Binomial(alpha[i], k)});
      }
    }
  }
}

int MomentLayout::SumIndex(const Powers& alpha) const {
  const int side = max_order_ + 1;
  for (int i = 0; i < kMaxSignals; ++i) {
    if (alpha[i] < 0 || alpha[i] >= side) return -1;
  }
  return index_of_[(alpha[0] * side + alpha[1]) * side + alpha[2]];
}

void MomentLayout::Clear(double* summary) const {
  std::fill(summary, summary + stride(), 0.0);
  summary[0] = std::numeric_limits<double>::quiet_NaN();
}

void MomentLayout::ShiftSums(double* sums, const double* delta) const {
  const int count = static_cast<int>(powers_.size());
  double shifted[kMaxSums];
  for (int i = 0; i < signals_; ++i) {
    if (delta[i] == 0.0) continue;
    double delta_power[kMaxOrder + 1];
    delta_power[0] = 1.0;
    for (int p = 1; p <= max_order_; ++p) delta_power[p] = delta_power[p - 1] * delta[i];
    std::fill(shifted, shifted + count, 0.0);
    for (const ShiftTerm& t : shift_terms_[i]) {
      shifted[t.target] += t.binomial * delta_power[t.power] * sums[t.source];
    }
    std::copy(shifted, shifted + count, sums);
  }
}

void MomentLayout::MergeOrderTwoSingle(const double* a, const double* b, double* out) const {
  // Chan, Golub & LeVeque (1979): M2 = M2a + M2b + delta^2 na nb / n, the order-two case of Merge.
  const double count_a = a[2], count_b = b[2];
  const double total = count_a + count_b;
  const double delta = b[1] - a[1];
  const double first_time = a[0];
  const double sum_sq = a[4] + b[4] + delta * delta * (count_a * count_b / total);
  out[0] = first_time;
  out[1] = a[1] + delta * (count_b / total);
  out[2] = total;
  out[3] = 0.0;
  out[4] = sum_sq;
}

void MomentLayout::AddSampleGeneral(double* summary, double time, const double* values,
                                    double weight) const {
  double* means = summary + 1;
  double* sums = summary + 1 + signals_;
  const double count = sums[0];
  if (count == 0.0) summary[0] = time;
  double new_mean[kMaxSignals] = {};
  double delta[kMaxSignals] = {};
  for (int i = 0; i < signals_; ++i) {
    new_mean[i] = means[i] + (values[i] - means[i]) * weight / (count + weight);
    delta[i] = means[i] - new_mean[i];
  }
  ShiftSums(sums, delta);
  double deviation[kMaxSignals][kMaxOrder + 1];
  for (int i = 0; i < signals_; ++i) {
    deviation[i][0] = 1.0;
    for (int p = 1; p <= max_order_; ++p) {
      deviation[i][p] = deviation[i][p - 1] * (values[i] - new_mean[i]);
    }
  }
  for (std::size_t p = 0; p < powers_.size(); ++p) {
    double term = 1.0;
    for (int i = 0; i < signals_; ++i) term *= deviation[i][powers_[p][i]];
    sums[p] += weight * term;
  }
  for (int i = 0; i < signals_; ++i) {
    means[i] = new_mean[i];
    sums[1 + i] = 0.0;  // first central sums vanish identically; keep them exact
  }
}

void MomentLayout::Merge(const double* a, const double* b, double* out) const {
  const std::size_t n = stride();
  const double count_a = Count(a);
  const double count_b = Count(b);
  if (count_b == 0.0) {
    if (out != a) std::copy(a, a + n, out);
    return;
  }
  if (count_a == 0.0) {
    if (out != b) std::copy(b, b + n, out);
    return;
  }
  if (signals_ == 1 && max_order_ == 2) {
    MergeOrderTwoSingle(a, b, out);
    return;
  }
  double first[kMaxSums + 1 + kMaxSignals];
  double second[kMaxSums + 1 + kMaxSignals];
  std::copy(a, a + n, first);
  std::copy(b, b + n, second);
  const double total = count_a + count_b;
  double mean[kMaxSignals] = {};
  double delta_a[kMaxSignals] = {};
  double delta_b[kMaxSignals] = {};
  for (int i = 0; i < signals_; ++i) {
    const double mean_a = first[1 + i];
    const double mean_b = second[1 + i];
    mean[i] = mean_a + (mean_b - mean_a) * (count_b / total);
    delta_a[i] = mean_a - mean[i];
    delta_b[i] = mean_b - mean[i];
  }
  double* sums_a = first + 1 + signals_;
  double* sums_b = second + 1 + signals_;
  ShiftSums(sums_a, delta_a);
  ShiftSums(sums_b, delta_b);
  out[0] = first[0];
  for (int i = 0; i < signals_; ++i) out[1 + i] = mean[i];
  double* sums_out = out + 1 + signals_;
  for (std::size_t p = 0; p < powers_.size(); ++p) sums_out[p] = sums_a[p] + sums_b[p];
  for (int i = 0; i < signals_; ++i) sums_out[1 + i] = 0.0;
}

double MomentLayout::CentralMoment(const double* summary, const Powers& alpha) const {
  const double count = Count(summary);
  const int index = SumIndex(alpha);
  if (count == 0.0 || index < 0) return std::numeric_limits<double>::quiet_NaN();
  return summary[1 + signals_ + index] / count;
}

double MomentLayout::MomentAbout(const double* summary, const Powers& alpha,
                                 const double* centre) const {
  const double count = Count(summary);
  if (count == 0.0 || SumIndex(alpha) < 0) return std::numeric_limits<double>::quiet_NaN();
  for (int i = 0; i < signals_; ++i) {
    // A first moment about a centre is the mean's distance from it: the common case (every mean).
    if (alpha[i] == 1 && alpha[0] + alpha[1] + alpha[2] == 1) return summary[1 + i] - centre[i];
  }
  const double* sums = summary + 1 + signals_;
  double delta[kMaxSignals] = {0.0, 0.0, 0.0};
  for (int i = 0; i < signals_; ++i) delta[i] = summary[1 + i] - centre[i];
  double total = 0.0;
  for (int b0 = 0; b0 <= alpha[0]; ++b0) {
    for (int b1 = 0; b1 <= alpha[1]; ++b1) {
      for (int b2 = 0; b2 <= alpha[2]; ++b2) {
        const double weight = Binomial(alpha[0], b0) * IntegerPower(delta[0], alpha[0] - b0) *
                              Binomial(alpha[1], b1) * IntegerPower(delta[1], alpha[1] - b1) *
                              Binomial(alpha[2], b2) * IntegerPower(delta[2], alpha[2] - b2);
        total += weight * sums[SumIndex({b0, b1, b2})];
      }
    }
  }
  return total / count;
}

}  // namespace plateau
