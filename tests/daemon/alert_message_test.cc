#include "daemon/alerts/alert_message.h"

#include <gtest/gtest.h>

#include <cmath>

namespace plateau {
namespace {

RunConfig Ch420Run() {
  RunConfig c;
  c.run_name = "ch420";
  c.store_path = "/runs/ch420/plateau.db";
  c.planned_end_time = 400.0;
  c.cores = 512.0;
  return c;
}

EventRow RunMet() {
  EventRow e;
  e.id = 7;
  e.kind = EventKind::kRunMet;
  e.message = "every target of run ch420 is met: the solver can stop";
  e.simulated_time = 160.0;
  e.wall_time = 1796194795.0;
  e.value = std::nan("");
  e.half_width = std::nan("");
  e.confidence = std::nan("");
  e.progress_rate = 20.0;  // time units per hour
  e.elapsed_wall = 7200.0;
  return e;
}

TEST(AlertMessage, CoreHoursSavedFollowFromThePlannedEndAndTheRate) {
  // 400 - 160 = 240 time units left at 20 per hour: 12 h on 512 cores = 6144 core-hours.
  const AlertMessage m = ComposeAlert(RunMet(), Ch420Run());
  EXPECT_EQ(m.subject, "[plateau] ch420: every target met, the solver can stop");
  EXPECT_NE(m.body.find("12.0 h more on 512 cores: stopping now saves about 6144 core-hours"),
            std::string::npos)
      << m.body;
  EXPECT_NE(m.body.find("Followed by plateau for 2.0 h"), std::string::npos);
  EXPECT_NE(m.body.find("not a validated one"), std::string::npos);
}

TEST(AlertMessage, SmallSavingsAreShownInTenthsNotAsZero) {
  // 1 time unit left at 20 per hour on 4 cores: 0.05 h x 4 = 0.2 core-hours.
  RunConfig c = Ch420Run();
  c.planned_end_time = 161.0;
  c.cores = 4.0;
  const AlertMessage m = ComposeAlert(RunMet(), c);
  EXPECT_NE(m.body.find("stopping now saves about 0.2 core-hours"), std::string::npos) << m.body;
}

TEST(AlertMessage, NoPlannedEndMeansNoSavingsClaimed) {
  RunConfig c = Ch420Run();
  c.planned_end_time = std::nan("");
  EXPECT_EQ(ComposeAlert(RunMet(), c).body.find("core-hours"), std::string::npos);
  EventRow e = RunMet();
  e.progress_rate = std::nan("");
  EXPECT_EQ(ComposeAlert(e, Ch420Run()).body.find("core-hours"), std::string::npos);
}

TEST(AlertMessage, StatisticEventsCarryValueAndEnvironment) {
  EventRow e = RunMet();
  e.kind = EventKind::kMet;
  e.statistic = "tau_lower";
  e.message = "tau_lower met its target: 0.2781 ± 0.0027 at 95 % confidence";
  e.value = 0.2781;
  e.half_width = 0.0027;
  e.confidence = 0.95;
  e.target = "1 %";
  const AlertMessage m = ComposeAlert(e, Ch420Run());
  EXPECT_NE(m.body.find("Value: 0.2781 ±0.0027 at 95 % confidence (target half-width 1 %)"),
            std::string::npos)
      << m.body;
  const auto find = [&](const std::string& key) {
    for (const auto& [k, v] : m.environment) {
      if (k == key) return v;
    }
    return std::string("<absent>");
  };
  EXPECT_EQ(find("PLATEAU_EVENT"), "met");
  EXPECT_EQ(find("PLATEAU_STATISTIC"), "tau_lower");
  EXPECT_EQ(find("PLATEAU_VALUE"), "0.2781");
  EXPECT_EQ(find("PLATEAU_EVENT_ID"), "7");
}

TEST(AlertMessage, DigestLeadsWithTheRunAndListsTheRestUpToALimit) {
  std::vector<EventRow> events;
  for (int i = 0; i < 60; ++i) {
    EventRow e = RunMet();
    e.kind = EventKind::kMet;
    e.statistic = "line[" + std::to_string(i) + "]/U";
    e.message = e.statistic + " met its target";
    events.push_back(e);
  }
  events.insert(events.begin() + 30, RunMet());  // the important one arrives in the middle
  const AlertMessage m = ComposeDigest(events, Ch420Run());
  EXPECT_EQ(m.subject, "[plateau] ch420: every target met, the solver can stop (and 60 more events)");
  EXPECT_EQ(m.body.find("every target of run ch420 is met"), 0u) << m.body;
  EXPECT_NE(m.body.find("- line[0]/U met its target\n"), std::string::npos);
  EXPECT_NE(m.body.find("- line[49]/U met its target\n"), std::string::npos);
  EXPECT_EQ(m.body.find("line[50]/U"), std::string::npos);  // 50 lines at most
  EXPECT_NE(m.body.find("- ... and 10 more"), std::string::npos);
  // The footer stays last.
  EXPECT_LT(m.body.find("- ... and 10 more"), m.body.find("\nRun ch420, store"));
  EXPECT_EQ(ComposeDigest({RunMet()}, Ch420Run()).body, ComposeAlert(RunMet(), Ch420Run()).body);
}

}  // namespace
}  // namespace plateau
