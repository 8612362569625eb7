#include "core/convergence_tracker.h"

#include <gtest/gtest.h>

namespace plateau {
namespace {

StatisticEstimate Estimated(double value, double half_width, std::uint64_t samples) {
  StatisticEstimate e;
  e.name = "tau";
  e.state = EstimateState::kEstimated;
  e.value = value;
  e.half_width = half_width;
  e.relative_half_width = half_width / value;
  e.confidence = 0.95;
  e.samples_total = samples;
  e.samples_used = samples;
  e.first_time = 0.0;
  e.warmup_end_time = 1.0;
  e.last_time = samples * 0.01;
  e.effective_samples = 500;
  e.half_width_uncertainty = 0.1;  // 50 degrees of freedom
  return e;
}

ConvergenceTracker OnePercent() {
  StopRuleSettings rule;
  rule.minimum_effective_samples = 100;
  return ConvergenceTracker("tau", Target{Target::Kind::kRelative, 0.01, 0.95}, rule);
}

TEST(ConvergenceTracker, MetOnlyAfterThreeConfirmationsWithNewData) {
  ConvergenceTracker t = OnePercent();
  EXPECT_TRUE(t.Update(Estimated(2.0, 0.03, 1000), 10.0).empty());  // 1.5 %: converging
  EXPECT_EQ(t.state(), ConvergenceState::kConverging);
  EXPECT_TRUE(t.Update(Estimated(2.0, 0.015, 2000), 20.0).empty());
  EXPECT_EQ(t.reason(), "target reached, confirmation 1 of 3");
  EXPECT_TRUE(t.Update(Estimated(2.0, 0.015, 2000), 25.0).empty());  // same data: no confirmation
  EXPECT_EQ(t.consecutive(), 1);
  EXPECT_TRUE(t.Update(Estimated(2.0, 0.014, 3000), 30.0).empty());
  const auto met = t.Update(Estimated(2.0, 0.013, 4000), 40.0);
  ASSERT_EQ(met.size(), 1u);
  EXPECT_EQ(met[0].kind, EventKind::kMet);
  EXPECT_EQ(t.state(), ConvergenceState::kMet);
  EXPECT_EQ(t.met_at_wall(), 40.0);
  EXPECT_EQ(t.met_at_time(), 40.0);
  EXPECT_TRUE(t.Update(Estimated(2.0, 0.012, 5000), 50.0).empty());  // stays met, no new event
}

TEST(ConvergenceTracker, LosingTheTargetIsAnEventAndNeedsFreshConfirmations) {
  ConvergenceTracker t = OnePercent();
  for (int i = 1; i <= 3; ++i) t.Update(Estimated(2.0, 0.01, 1000 * i), i);
  ASSERT_TRUE(t.met());
  const auto lost = t.Update(Estimated(2.0, 0.03, 4000), 4.0);
  ASSERT_EQ(lost.size(), 1u);
  EXPECT_EQ(lost[0].kind, EventKind::kLost);
  EXPECT_FALSE(t.met());
  EXPECT_EQ(t.consecutive(), 0);
}

TEST(ConvergenceTracker, DriftFewEffectiveSamplesUncertainHalfWidthsAndShortBatchesNeverCountAsMet) {
  ConvergenceTracker t = OnePercent();
  StatisticEstimate drifting = Estimated(2.0, 0.001, 1000);
  drifting.drift_detected = true;
  t.Update(drifting, 1.0);
  EXPECT_EQ(t.state(), ConvergenceState::kDrifting);
  StatisticEstimate few = Estimated(2.0, 0.001, 2000);
  few.effective_samples = 40;
  t.Update(few, 2.0);
  EXPECT_EQ(t.reason(), "only 40 effective samples, the rule asks for 100");
  StatisticEstimate uncertain = Estimated(2.0, 0.001, 2500);
  uncertain.half_width_uncertainty = 0.25;  // 8 degrees of freedom
  t.Update(uncertain, 2.5);
  EXPECT_EQ(t.reason(), "the half-width is itself known only to ±25 %, the rule asks for ±20 %");
  StatisticEstimate short_batches = Estimated(2.0, 0.001, 3000);
  short_batches.decision.batches_too_short = true;
  t.Update(short_batches, 3.0);
  EXPECT_EQ(t.reason(), "batches are shorter than ten integrated times");
  EXPECT_EQ(t.consecutive(), 0);
}

TEST(ConvergenceTracker, DriftIsAnEventOnlyAfterASteadySpell) {
  ConvergenceTracker t = OnePercent();
  StatisticEstimate e = Estimated(2.0, 0.001, 1000);
  e.drift_detected = true;  // the start-up: drifting from the first evaluation on
  EXPECT_TRUE(t.Update(e, 1.0).empty());
  e.samples_total = 2000;
  EXPECT_TRUE(t.Update(e, 2.0).empty());
  EXPECT_EQ(t.state(), ConvergenceState::kDrifting);
  e.drift_detected = false;
  for (int i = 3; i <= 5; ++i) {  // three steady evaluations, each with new samples
    e.samples_total = 1000u * i;
    const auto events = t.Update(e, i);
    EXPECT_EQ(events.size(), i == 5 ? 1u : 0u);  // the third also meets the target
  }
  e.drift_detected = true;
  e.samples_total = 6000;
  const auto drift = t.Update(e, 6.0);
  ASSERT_EQ(drift.size(), 2u);  // it was met, so it is lost too
  EXPECT_EQ(drift[0].kind, EventKind::kLost);
  EXPECT_EQ(drift[1].kind, EventKind::kDrift);
  e.samples_total = 7000;
  EXPECT_TRUE(t.Update(e, 7.0).empty());  // reported once while it lasts
  // Restored from a checkpoint, the steady spell and the report survive.
  ConvergenceTracker restored = OnePercent();
  ASSERT_TRUE(restored.RestoreState(t.SaveState()));
  EXPECT_TRUE(restored.Update(e, 8.0).empty());
}

TEST(ConvergenceTracker, WarmupFillingHalfTheDataIsWarmingUp) {
  ConvergenceTracker t = OnePercent();
  StatisticEstimate e = Estimated(2.0, 0.001, 1000);
  e.warmup_end_time = 0.47 * e.last_time;
  t.Update(e, 1.0);
  EXPECT_EQ(t.state(), ConvergenceState::kWarmingUp);
}

TEST(ConvergenceTracker, AbsoluteTargetAndMinimumAveragingTime) {
  ConvergenceTracker t("cov", Target{Target::Kind::kAbsolute, 0.05, 0.95},
                       StopRuleSettings{1, 100, 50.0});
  t.Update(Estimated(-0.3, 0.04, 2000), 1.0);  // averaged 19 time units of 50
  EXPECT_EQ(t.state(), ConvergenceState::kConverging);
  EXPECT_EQ(t.reason(), "averaged over 19 time units, the minimum is 50");
  EXPECT_EQ(t.Update(Estimated(-0.3, 0.04, 6000), 2.0).size(), 1u);
  EXPECT_EQ(t.TargetHalfWidth(-0.3), 0.05);
}

TEST(ConvergenceTracker, NoTargetIsMonitoredAndStateRoundTrips) {
  ConvergenceTracker monitored("u", std::nullopt, StopRuleSettings{});
  monitored.Update(Estimated(2.0, 0.001, 1000), 1.0);
  EXPECT_EQ(monitored.state(), ConvergenceState::kMonitored);
  ConvergenceTracker t = OnePercent();
  for (int i = 1; i <= 3; ++i) t.Update(Estimated(2.0, 0.01, 1000 * i), i);
  ConvergenceTracker restored = OnePercent();
  ASSERT_TRUE(restored.RestoreState(t.SaveState()));
  EXPECT_EQ(restored.SaveState(), t.SaveState());
  EXPECT_TRUE(restored.met());
}

TEST(ConvergenceStateNames, EveryStateRoundTripsThroughItsName) {
  // The store and the daemon's JSON answer carry states by name; status reads them back.
  for (const ConvergenceState state :
       {ConvergenceState::kNoData, ConvergenceState::kNotEnoughData, ConvergenceState::kWarmingUp,
        ConvergenceState::kDrifting, ConvergenceState::kConverging, ConvergenceState::kMet,
        ConvergenceState::kMonitored, ConvergenceState::kColumnMissing}) {
    EXPECT_EQ(ConvergenceStateFromName(ConvergenceStateName(state)), state)
        << ConvergenceStateName(state);
  }
  EXPECT_EQ(ConvergenceStateName(ConvergenceState::kColumnMissing), "column_missing");
  EXPECT_EQ(ConvergenceStateFromName("finished"), std::nullopt);
}

}  // namespace
}  // namespace plateau
