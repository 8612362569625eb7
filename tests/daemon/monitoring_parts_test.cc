// The monitor's pure parts: a reloaded config applied to a running one (config_reload.h), the
// checkpoint's run item (run_state.h), and the words of input-health events (input_event_words.h).
#include <gtest/gtest.h>

#include <cmath>

#include "daemon/monitoring/config_reload.h"
#include "daemon/monitoring/input_event_words.h"
#include "daemon/monitoring/run_fingerprint.h"
#include "daemon/monitoring/run_state.h"

namespace plateau {
namespace {

RunConfig TwoStatistics() {
  RunConfig c;
  c.sources.push_back({});
  c.sources[0].name = "wall";
  c.sources[0].files = "output/wall/*/wall.dat";
  for (const char* name : {"tau_lower", "tau_upper"}) {
    StatisticConfig s;
    s.request.name = name;
    s.source = "wall";
    s.target = Target{Target::Kind::kRelative, 0.02, 0.95};
    c.statistics.push_back(s);
  }
  return c;
}

TEST(ConfigReload, ANewTargetRestartsOnlyThatStatisticsStopRule) {
  RunConfig running = TwoStatistics();
  RunConfig fresh = TwoStatistics();
  fresh.statistics[1].target->value = 0.01;
  fresh.alerts.stall_after = 60;
  const ReloadOutcome outcome = ApplyReload(running, fresh);
  EXPECT_TRUE(outcome.same_layout);
  EXPECT_EQ(outcome.retargeted, std::vector<std::string>{"tau_upper"});
  EXPECT_DOUBLE_EQ(running.statistics[1].target->value, 0.01);
  EXPECT_DOUBLE_EQ(running.alerts.stall_after, 60);
  EXPECT_EQ(outcome.message, "config reloaded: targets, alerts and intervals apply now");
}

TEST(ConfigReload, ChangedConfirmationsRestartEveryStopRule) {
  RunConfig running = TwoStatistics();
  RunConfig fresh = TwoStatistics();
  fresh.stop_rule.confirmations = 5;
  EXPECT_EQ(ApplyReload(running, fresh).retargeted.size(), 2u);
  EXPECT_EQ(running.stop_rule.confirmations, 5);
}

TEST(ConfigReload, ANewStatisticIsNotTakenAndTheUserIsToldToRestart) {
  RunConfig running = TwoStatistics();
  RunConfig fresh = TwoStatistics();
  fresh.statistics.push_back(fresh.statistics[0]);
  fresh.statistics.back().request.name = "tau_side";
  fresh.groups.push_back({"walls", {"tau_lower", "tau_upper"}, true, 0.95, true});
  const std::string before = RunFingerprint(running);
  const ReloadOutcome outcome = ApplyReload(running, fresh);
  EXPECT_FALSE(outcome.same_layout);
  EXPECT_EQ(running.statistics.size(), 2u);  // the trackers point into it
  EXPECT_TRUE(running.groups.empty());        // groups follow the layout
  EXPECT_EQ(RunFingerprint(running), before);
  EXPECT_NE(outcome.message.find("takes a restart of plateau watch"), std::string::npos);
}

TEST(RunState, RoundTripsThroughTheCheckpointItemAndRefusesAnotherLayout) {
  const RunState state{true, false, 1.8e9, 1.8e9 + 12.5, true};
  const std::vector<double> item = RunStateItem(state);
  ASSERT_EQ(item.size(), 5u);  // as stores of earlier versions hold it
  const std::optional<RunState> back = RunStateFromItem(item);
  ASSERT_TRUE(back);
  EXPECT_TRUE(back->run_met);
  EXPECT_FALSE(back->stalled);
  EXPECT_DOUBLE_EQ(back->first_sample_wall, 1.8e9);
  EXPECT_DOUBLE_EQ(back->last_sample_wall, 1.8e9 + 12.5);
  EXPECT_TRUE(back->bad_lines_alarm);
  EXPECT_FALSE(RunStateFromItem({1.0, 0.0, 3.0}));
  EXPECT_TRUE(std::isnan(RunState{}.first_sample_wall));  // before any sample
}

TEST(InputEventWords, EachEventSaysWhatHappenedAndWhatToCheck) {
  const InputHealthLimits limits{1800, 60};
  InputHealthEvent stall{InputHealthEvent::Kind::kStalled};
  stall.quiet_seconds = 2400;
  EXPECT_EQ(InputEventKind(stall.kind), EventKind::kStalled);
  EXPECT_EQ(InputEventMessage(stall, 41.5, limits),
            "no new sample for 40.0 min (the newest has time 41.5): has the solver stopped, "
            "crashed or hung?");
  InputHealthEvent bad{InputHealthEvent::Kind::kBadLines};
  bad.bad_lines = 300;
  bad.per_minute = 150;
  EXPECT_EQ(InputEventKind(bad.kind), EventKind::kBadLines);
  EXPECT_EQ(InputEventMessage(bad, 41.5, limits),
            "300 bad lines since the last evaluation (150 a minute, above 60): is something else "
            "writing into the probe files?");
  EXPECT_EQ(InputEventMessage({InputHealthEvent::Kind::kResumed}, 50, limits),
            "new samples arrive again (time 50)");
}

}  // namespace
}  // namespace plateau
