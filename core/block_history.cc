#include "core/block_history.h"

#include <algorithm>
#include <limits>

namespace plateau {
namespace {

std::size_t PowerOfTwoAtLeast(std::size_t n) {
  std::size_t p = 8;
  while (p < n) p *= 2;
  return p;
}

}  // namespace

BlockHistory::BlockHistory(MomentLayout layout, std::size_t capacity)
    : layout_(std::move(layout)),
      capacity_(PowerOfTwoAtLeast(capacity)),
      blocks_((capacity_ + 1) * layout_.stride()),
      last_time_(std::numeric_limits<double>::quiet_NaN()) {
  layout_.Clear(OpenSlot());
}

void BlockHistory::Add(double time, const double* values, double weight) {
  ++sample_count_;
  last_time_ = time;
  // The open block is filled in place in the slot after the closed ones: closing it is a count.
  // With weight 1 every block fills with whole samples, as an unweighted history does.
  double left = weight;
  while (left > 0.0) {
    double* open = OpenSlot();
    const double room = static_cast<double>(block_length_) - layout_.Count(open);
    const double part = std::min(left, room);
    layout_.AddSample(open, time, values, part);
    if (part < room) return;
    left -= part;
    ++block_count_;
    if (block_count_ == capacity_) MergeNeighbourPairs();
    layout_.Clear(OpenSlot());
  }
}

void BlockHistory::MergeNeighbourPairs() {
  const std::size_t stride = layout_.stride();
  for (std::size_t i = 0; i < capacity_ / 2; ++i) {
    layout_.Merge(block(2 * i), block(2 * i + 1), blocks_.data() + i * stride);
  }
  block_count_ = capacity_ / 2;
  block_length_ *= 2;
}

std::vector<double> BlockHistory::SaveState() const {
  std::vector<double> state;
  const std::size_t stride = layout_.stride();
  state.reserve(6 + stride * (1 + block_count_));
  state.push_back(static_cast<double>(capacity_));
  state.push_back(static_cast<double>(layout_.stride()));
  state.push_back(static_cast<double>(block_count_));
  state.push_back(static_cast<double>(block_length_));
  state.push_back(static_cast<double>(sample_count_));
  state.push_back(last_time_);
  state.insert(state.end(), open_block(), open_block() + stride);
  state.insert(state.end(), blocks_.begin(), blocks_.begin() + block_count_ * stride);
  return state;
}

bool BlockHistory::RestoreState(const std::vector<double>& state) {
  const std::size_t stride = layout_.stride();
  if (state.size() < 6 + stride) return false;
  if (state[0] != static_cast<double>(capacity_) || state[1] != static_cast<double>(stride)) {
    return false;
  }
  const auto count = static_cast<std::size_t>(state[2]);
  if (count >= capacity_ || state.size() != 6 + stride * (1 + count)) return false;
  block_count_ = count;
  block_length_ = static_cast<std::uint64_t>(state[3]);
  sample_count_ = static_cast<std::uint64_t>(state[4]);
  last_time_ = state[5];
  std::copy(state.begin() + 6 + stride, state.end(), blocks_.begin());
  std::copy(state.begin() + 6, state.begin() + 6 + stride, OpenSlot());
  return true;
}

}  // namespace plateau
