// Whether the solver still feeds the run (core/input_health.h): stalls, their end, bad-line rates.
#include "core/input_health.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>

namespace plateau {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
using Kind = InputHealthEvent::Kind;

const InputHealthLimits kLimits{100.0, 60.0};  // stall after 100 s; 60 bad lines a minute

TEST(InputHealth, NothingReadYetIsNotAStall) {
  InputHealth health;
  EXPECT_TRUE(health.Observe({0.0, kNaN, 0}, kLimits).empty());
  EXPECT_TRUE(health.Observe({1000.0, kNaN, 0}, kLimits).empty());
  EXPECT_FALSE(health.stalled());
}

TEST(InputHealth, AStallIsReportedOnceAndItsEndOnce) {
  InputHealth health;
  EXPECT_TRUE(health.Observe({10.0, 10.0, 0}, kLimits).empty());
  EXPECT_TRUE(health.Observe({110.0, 10.0, 0}, kLimits).empty());  // 100 s: not more than the limit
  const auto stall = health.Observe({111.0, 10.0, 0}, kLimits);
  ASSERT_EQ(stall.size(), 1u);
  EXPECT_EQ(stall[0].kind, Kind::kStalled);
  EXPECT_DOUBLE_EQ(stall[0].quiet_seconds, 101.0);
  EXPECT_TRUE(health.Observe({200.0, 10.0, 0}, kLimits).empty());  // still stalled: said once
  const auto resumed = health.Observe({210.0, 205.0, 0}, kLimits);
  ASSERT_EQ(resumed.size(), 1u);
  EXPECT_EQ(resumed[0].kind, Kind::kResumed);
  EXPECT_FALSE(health.stalled());
}

TEST(InputHealth, BadLinesAlarmAboveTheRateOnceUntilItFalls) {
  InputHealth health;
  EXPECT_TRUE(health.Observe({0.0, 0.0, 0}, kLimits).empty());  // the baseline
  EXPECT_TRUE(health.Observe({60.0, 60.0, 60}, kLimits).empty());  // 60 a minute: at the limit
  const auto alarm = health.Observe({120.0, 120.0, 181}, kLimits);
  ASSERT_EQ(alarm.size(), 1u);
  EXPECT_EQ(alarm[0].kind, Kind::kBadLines);
  EXPECT_EQ(alarm[0].bad_lines, 121u);
  EXPECT_DOUBLE_EQ(alarm[0].per_minute, 121.0);
  EXPECT_TRUE(health.Observe({180.0, 180.0, 400}, kLimits).empty());  // still high: said once
  EXPECT_TRUE(health.Observe({240.0, 240.0, 400}, kLimits).empty());  // fell: alarm cleared
  EXPECT_FALSE(health.bad_lines_alarm());
  EXPECT_EQ(health.Observe({300.0, 300.0, 500}, kLimits).size(), 1u);  // high again: said again
}

TEST(InputHealth, ABacklogOnlySetsANewBaseline) {
  InputHealth health;
  health.Observe({0.0, 0.0, 0}, kLimits);
  health.NoteCatchUp();
  // Thousands of old bad lines read in one go say nothing about the rate now.
  EXPECT_TRUE(health.Observe({1.0, 1.0, 5000}, kLimits).empty());
  EXPECT_EQ(health.Observe({61.0, 61.0, 5200}, kLimits).size(), 1u);
}

TEST(InputHealth, AClockJumpMovesTheStallWindow) {
  InputHealth health;
  health.Observe({10.0, 10.0, 0}, kLimits);
  health.ShiftWallClock(3600.0);  // the clock stepped an hour ahead
  EXPECT_TRUE(health.Observe({3650.0, kNaN, 0}, kLimits).empty());
  EXPECT_DOUBLE_EQ(health.last_sample_wall(), 3610.0);
}

TEST(InputHealth, RestoresAStallFromACheckpoint) {
  InputHealth health;
  health.Restore(true, 50.0, false);
  const auto resumed = health.Observe({500.0, 490.0, 0}, kLimits);
  ASSERT_EQ(resumed.size(), 1u);
  EXPECT_EQ(resumed[0].kind, Kind::kResumed);
}

}  // namespace
}  // namespace plateau
