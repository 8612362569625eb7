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
  // Weights are steps over a cell computed from printed times, so an evenly spaced run gives
  // weights of 1 give or take ~1e-11: a block short of full by less than this share of its weight
  // is full, and a remainder that small is dropped, so that such a run closes its blocks where an
  // unweighted history does. Never more than 1e-3 of a sample, so weights of 1 are untouched.
  const double rounding = std::min(1e-9 * static_cast<double>(block_length_), 1e-3);
  // The open block is filled in place in the slot after the closed ones: closing it is a count.
  double left = weight;
  while (left > 0.0) {
    double* open = OpenSlot();
    const double room = static_cast<double>(block_length_) - layout_.Count(open);
    const double part = std::min(left, room);
    layout_.AddSample(open, time, values, part);
    left -= part;
    if (room - part > rounding) return;  // the sample fitted and the block is not full
    if (left <= rounding) left = 0.0;
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
