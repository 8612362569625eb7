#include "core/sample_spacing.h"

#include <algorithm>
#include <cmath>

#include "core/message_number.h"

namespace plateau {
namespace {

double Median(std::vector<double> values) {
  if (values.empty()) return std::numeric_limits<double>::quiet_NaN();
  const auto middle = values.begin() + static_cast<std::ptrdiff_t>(values.size() / 2);
  std::nth_element(values.begin(), middle, values.end());
  return *middle;
}

}  // namespace

const char* WeightingName(Weighting weighting) {
  switch (weighting) {
    case Weighting::kAuto:
      return "auto";
    case Weighting::kTime:
      return "time";
    case Weighting::kSamples:
      return "samples";
  }
  return "auto";
}

std::optional<Weighting> ParseWeighting(const std::string& name) {
  for (Weighting w : {Weighting::kAuto, Weighting::kTime, Weighting::kSamples}) {
    if (name == WeightingName(w)) return w;
  }
  return std::nullopt;
}

SampleSpacing::SampleSpacing(Weighting requested)
    : requested_(requested), decided_(requested == Weighting::kSamples) {}

void SampleSpacing::Decide(const std::vector<double>& first_times) {
  decided_ = true;
  std::vector<double> spacings;
  for (std::size_t i = 1; i < first_times.size(); ++i) {
    spacings.push_back(first_times[i] - first_times[i - 1]);
  }
  if (spacings.empty()) {
    time_weighted_ = false;  // nothing to weigh by: every sample counts once
    return;
  }
  const auto [lowest, highest] = std::minmax_element(spacings.begin(), spacings.end());
  median_ = Median(spacings);
  const bool varying = (*highest - *lowest) / median_ > kVaryingTolerance;
  time_weighted_ = requested_ == Weighting::kTime || (requested_ == Weighting::kAuto && varying);
  if (time_weighted_) cell_ = median_;
}

double SampleSpacing::Next(double time) {
  if (std::isnan(last_time_)) {
    first_time_ = time;
    last_time_ = time;
    return 1.0;  // the first sample stands for one cell
  }
  const double spacing = time - last_time_;
  const double cap = kGapFactor * median_;  // NaN before a median: no cap, no gap
  Record(spacing, time);
  last_time_ = time;
  if (!time_weighted_) return 1.0;
  return (spacing > cap ? cap : spacing) / cell_;
}

void SampleSpacing::Record(double spacing, double time) {
  const bool gap = spacing > kGapFactor * median_;
  ++spacings_;
  min_ = std::isnan(min_) ? spacing : std::min(min_, spacing);
  max_ = std::isnan(max_) ? spacing : std::max(max_, spacing);
  if (gap) {
    ++gap_count_;
    gaps_.push_back({last_time_, time});
    if (gaps_.size() > kGapsKept) gaps_.erase(gaps_.begin());
  }
  if (recent_.size() < kWindow) {
    recent_.push_back(spacing);
  } else {
    recent_[recent_next_] = spacing;
  }
  recent_next_ = (recent_next_ + 1) % kWindow;
  if (std::isnan(median_) || spacings_ % kMedianEvery == 0) UpdateMedian();
}

void SampleSpacing::UpdateMedian() {
  median_ = Median(recent_);
  varied_ = varied_ || RecentSpread() > kVaryingTolerance;
}

double SampleSpacing::RecentSpread() const {
  if (recent_.empty()) return 0.0;
  std::vector<double> sorted = recent_;
  std::sort(sorted.begin(), sorted.end());
  const auto at = [&](double q) {
    return sorted[static_cast<std::size_t>(q * static_cast<double>(sorted.size() - 1))];
  };
  return (at(0.9) - at(0.1)) / at(0.5);
}

double SampleSpacing::unit_time() const {
  if (time_weighted_) return cell_;
  if (spacings_ == 0) return std::numeric_limits<double>::quiet_NaN();
  return (last_time_ - first_time_) / static_cast<double>(spacings_);
}

bool SampleSpacing::varies() const { return varied_ || RecentSpread() > kVaryingTolerance; }

std::string SampleSpacing::Describe() const {
  std::string text;
  const std::string spread = "Δt from " + MessageNumber(min_) + " to " + MessageNumber(max_) + ", median " +
                             MessageNumber(median_);
  if (!decided_) {
    text = "weighting not chosen yet (it is chosen from the first " +
           std::to_string(kDecisionSpacings) + " spacings)";
  } else if (time_weighted_) {
    // "Cell" would read as a mesh cell: the user sees the unit as a time step of its own.
    text = "weighted by simulated time (" +
           std::string(requested_ == Weighting::kTime ? "as configured" : "the spacing varies") +
           "; " + spread + "); τ, n_eff and samples count steps of " + MessageNumber(cell_);
  } else if (varies()) {
    text = "weighted per sample (" +
           std::string(requested_ == Weighting::kSamples ? "as configured"
                                                         : "the first spacings were even") +
           "), but the spacing varies (" + spread +
           "): averages lean towards the short steps; set weighting: time";
  } else {
    text = "weighted per sample" +
           std::string(spacings_ > 0 ? " (even spacing, Δt " + MessageNumber(median_) + ")" : "");
  }
  if (gap_count_ > 0) {
    const Gap& last = gaps_.back();
    text += "; " + std::to_string(gap_count_) + (gap_count_ == 1 ? " gap" : " gaps") +
            " longer than " + MessageNumber(kGapFactor) + " median spacings, the last from t = " +
            MessageNumber(last.from) + " to " + MessageNumber(last.to) +
            (time_weighted_ ? " (the sample after a gap weighs " + MessageNumber(kGapFactor) +
                                  " median spacings)"
                            : "");
  }
  return text;
}

std::vector<double> SampleSpacing::SaveState() const {
  std::vector<double> state = {static_cast<double>(requested_),
                               decided_ ? 1.0 : 0.0,
                               time_weighted_ ? 1.0 : 0.0,
                               cell_,
                               first_time_,
                               last_time_,
                               static_cast<double>(spacings_),
                               min_,
                               max_,
                               median_,
                               varied_ ? 1.0 : 0.0,
                               static_cast<double>(recent_next_),
                               static_cast<double>(gap_count_),
                               static_cast<double>(recent_.size()),
                               static_cast<double>(gaps_.size())};
  state.insert(state.end(), recent_.begin(), recent_.end());
  for (const Gap& g : gaps_) {
    state.push_back(g.from);
    state.push_back(g.to);
  }
  return state;
}

bool SampleSpacing::RestoreState(const std::vector<double>& state) {
  constexpr std::size_t kFixed = 15;
  if (state.size() < kFixed || state[0] < 0.0 || state[0] > 2.0) return false;
  const auto recent = static_cast<std::size_t>(state[13]);
  const auto gaps = static_cast<std::size_t>(state[14]);
  if (recent > kWindow || gaps > kGapsKept || state.size() != kFixed + recent + 2 * gaps) {
    return false;
  }
  requested_ = static_cast<Weighting>(static_cast<int>(state[0]));
  decided_ = state[1] != 0.0;
  time_weighted_ = state[2] != 0.0;
  cell_ = state[3];
  first_time_ = state[4];
  last_time_ = state[5];
  spacings_ = static_cast<std::uint64_t>(state[6]);
  min_ = state[7];
  max_ = state[8];
  median_ = state[9];
  varied_ = state[10] != 0.0;
  recent_next_ = static_cast<std::size_t>(state[11]);
  gap_count_ = static_cast<std::uint64_t>(state[12]);
  recent_.assign(state.begin() + kFixed, state.begin() + kFixed + recent);
  gaps_.clear();
  for (std::size_t g = 0; g < gaps; ++g) {
    gaps_.push_back({state[kFixed + recent + 2 * g], state[kFixed + recent + 2 * g + 1]});
  }
  return true;
}

}  // namespace plateau
