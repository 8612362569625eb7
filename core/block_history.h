// Bounded history of one group of signals: at most `capacity` closed blocks of equal length plus one
// open block, merged pairwise (doubling the block length) whenever the capacity is reached.
// O(1) amortised work per sample and O(capacity) memory for any run length. Pure numerics, no I/O.
// Not thread-safe: one owner adds and evaluates.
#ifndef PLATEAU_CORE_BLOCK_HISTORY_H_
#define PLATEAU_CORE_BLOCK_HISTORY_H_

#include <cstddef>
#include <cstdint>
#include <vector>

#include "core/moment_layout.h"

namespace plateau {

class BlockHistory {
 public:
  static constexpr std::size_t kDefaultCapacity = 4096;

  // capacity: a power of two >= 8; other values are rounded up to one.
  BlockHistory(MomentLayout layout, std::size_t capacity = kDefaultCapacity);

  // Adds one sample (`values` holds the layout's d signals). Times must increase; the caller gates
  // restart overlap before this point. `weight` is what the sample counts for, in units of one
  // sample of an evenly spaced series (under time weighting: its simulated time over the source's
  // cell duration, SampleSpacing). A block closes when its weight reaches block_length(): a sample
  // that does not fit is split, its remainder opening the next block (the value holds over the
  // time it stands for), so closed blocks hold equal weight, that is equal simulated time (to a
  // share of 1e-9 that is taken as rounding of the printed times).
  void Add(double time, const double* values, double weight = 1.0);

  const MomentLayout& layout() const { return layout_; }
  std::size_t capacity() const { return capacity_; }
  // Closed blocks, oldest first; each holds a weight of block_length() (samples, or cells).
  std::size_t block_count() const { return block_count_; }
  std::uint64_t block_length() const { return block_length_; }
  const double* block(std::size_t i) const { return blocks_.data() + i * layout_.stride(); }
  // The block being filled: less than block_length() of weight, possibly none.
  const double* open_block() const { return block(block_count_); }
  // Samples added, whatever their weight.
  std::uint64_t sample_count() const { return sample_count_; }
  double last_time() const { return last_time_; }

  // Complete state as a flat list of doubles (counts are exact in a double up to 2^53 samples), for
  // checkpoints; Restore returns false and leaves the history unchanged when the state does not fit
  // this layout and capacity.
  std::vector<double> SaveState() const;
  bool RestoreState(const std::vector<double>& state);

 private:
  void MergeNeighbourPairs();
  double* OpenSlot() { return blocks_.data() + block_count_ * layout_.stride(); }

  MomentLayout layout_;
  std::size_t capacity_;
  // (capacity_ + 1) * stride: block_count_ closed blocks, then the open block.
  std::vector<double> blocks_;
  std::size_t block_count_ = 0;
  std::uint64_t block_length_ = 1;
  std::uint64_t sample_count_ = 0;
  double last_time_;
};

}  // namespace plateau

#endif  // PLATEAU_CORE_BLOCK_HISTORY_H_
