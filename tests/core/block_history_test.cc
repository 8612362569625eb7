#include "core/block_history.h"

#include <gtest/gtest.h>

#include <cmath>

#include "tests/core/synthetic_series.h"

namespace plateau {
namespace {

TEST(BlockHistory, MemoryStaysBoundedForAnyRunLength) {
  BlockHistory history(MomentLayout(1, 2), 64);
  const std::vector<double> x = testing::Ar1(1'000'003, 0.5, 3);
  for (std::size_t t = 0; t < x.size(); ++t) {
    history.Add(static_cast<double>(t), &x[t]);
    ASSERT_LT(history.block_count(), 64u);
  }
  EXPECT_EQ(history.sample_count(), 1'000'003u);
  EXPECT_GE(history.block_count(), 32u);
  // 1e6 samples in 32..63 blocks: blocks of 2^14 = 16384 samples.
  EXPECT_EQ(history.block_length(), 16384u);
  const double in_blocks = static_cast<double>(history.block_count() * history.block_length());
  EXPECT_EQ(in_blocks + history.layout().Count(history.open_block()), 1'000'003.0);
}

TEST(BlockHistory, MergedBlocksAgreeWithSinglePassToOneInATrillion) {
  const MomentLayout layout(1, 4);
  BlockHistory history(layout, 128);
  const std::vector<double> x = testing::Ar1(200'000, 0.9, 5, 40.0);
  std::vector<double> single(layout.stride());
  layout.Clear(single.data());
  for (std::size_t t = 0; t < x.size(); ++t) {
    history.Add(static_cast<double>(t), &x[t]);
    layout.AddSample(single.data(), static_cast<double>(t), &x[t]);
  }
  std::vector<double> merged(layout.stride());
  layout.Clear(merged.data());
  for (std::size_t b = 0; b < history.block_count(); ++b) {
    layout.Merge(merged.data(), history.block(b), merged.data());
  }
  layout.Merge(merged.data(), history.open_block(), merged.data());
  EXPECT_EQ(layout.Count(merged.data()), 200'000.0);
  EXPECT_NEAR(layout.Mean(merged.data(), 0), layout.Mean(single.data(), 0), 1e-12 * 40.0);
  // Relative to the moment's natural scale sigma^order: an odd moment of a symmetric signal is
  // near zero, and its own size is no yardstick.
  const double sigma = std::sqrt(testing::TwoPassCentralMoment({x}, {2}));
  for (int order = 2; order <= 4; ++order) {
    const double expected = testing::TwoPassCentralMoment({x}, {order});
    const double tolerance = 1e-12 * std::pow(sigma, order);
    EXPECT_NEAR(layout.CentralMoment(merged.data(), {order, 0, 0}), expected, tolerance);
    EXPECT_NEAR(layout.CentralMoment(single.data(), {order, 0, 0}), expected, tolerance);
  }
  EXPECT_EQ(layout.FirstTime(merged.data()), 0.0);
}

TEST(BlockHistory, SavedStateRestoresExactly) {
  BlockHistory history(MomentLayout(2, 4), 16);
  const std::vector<double> x = testing::Ar1(1001, 0.3, 8);
  for (std::size_t t = 0; t + 1 < x.size(); ++t) history.Add(t * 0.1, &x[t]);
  BlockHistory restored(MomentLayout(2, 4), 16);
  ASSERT_TRUE(restored.RestoreState(history.SaveState()));
  EXPECT_EQ(restored.SaveState(), history.SaveState());
  BlockHistory wrong_layout(MomentLayout(1, 2), 16);
  EXPECT_FALSE(wrong_layout.RestoreState(history.SaveState()));
  BlockHistory wrong_capacity(MomentLayout(2, 4), 32);
  EXPECT_FALSE(wrong_capacity.RestoreState(history.SaveState()));
}

}  // namespace
}  // namespace plateau
