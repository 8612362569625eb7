#include "core/time_order_gate.h"

#include <gtest/gtest.h>

namespace plateau {
namespace {

TEST(TimeOrderGate, RestartOverlapIsSkippedAndReportedOnce) {
  TimeOrderGate gate;
  for (double t : {1.0, 2.0, 3.0, 4.0}) EXPECT_TRUE(gate.Admit(t));
  // A restart from time 2.5 rewrites 2.5 .. 4.0, then carries on.
  EXPECT_FALSE(gate.Admit(2.5));
  EXPECT_FALSE(gate.Admit(3.5));
  EXPECT_FALSE(gate.Admit(4.0));
  EXPECT_EQ(gate.TakeFinishedOverlap().samples, 0u);  // still inside the overlap
  EXPECT_TRUE(gate.Admit(4.5));
  const TimeOrderGate::Overlap overlap = gate.TakeFinishedOverlap();
  EXPECT_EQ(overlap.samples, 3u);
  EXPECT_EQ(overlap.first_time, 2.5);
  EXPECT_EQ(overlap.last_time, 4.0);
  EXPECT_EQ(gate.TakeFinishedOverlap().samples, 0u);
  EXPECT_EQ(gate.skipped(), 3u);
}

}  // namespace
}  // namespace plateau
