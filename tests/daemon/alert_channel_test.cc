// The alert channels behind one interface (daemon/alerts/alert_channel.h), each delivering without
// the store or the daemon, and the routing of event kinds to them (config/alert_routing.h).
#include <gtest/gtest.h>
#include <spdlog/sinks/ostream_sink.h>

#include <filesystem>
#include <fstream>
#include <optional>
#include <sstream>

#include "config/alert_routing.h"
#include "daemon/alerts/alert_channels.h"

namespace plateau {
namespace {

namespace fs = std::filesystem;

EventRow RunMetEvent() {
  EventRow e;
  e.id = 7;
  e.kind = EventKind::kRunMet;
  e.message = "every target of run pipe-9 is met: the solver can stop";
  e.value = e.half_width = e.confidence = e.elapsed_wall = e.remaining_time = std::nan("");
  return e;
}

// Runs the loop until `done` was called; its status.
Status DeliverAndWait(AlertChannel& channel, boost::asio::io_context& io,
                      const std::vector<EventRow>& events) {
  std::optional<Status> outcome;
  channel.Deliver(events, [&](const Status& s) { outcome = s; });
  while (!outcome && io.run_one() > 0) {
  }
  io.restart();
  return outcome.value_or(Status::Error("done was never called"));
}

class AlertChannels : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = fs::temp_directory_path() / ("plateau_channels_" + std::to_string(::getpid()));
    fs::create_directories(dir_);
    config_.run_name = "pipe-9";
    log_ = std::make_shared<spdlog::logger>(
        "channels", std::make_shared<spdlog::sinks::ostream_sink_mt>(log_text_));
  }
  void TearDown() override { fs::remove_all(dir_); }

  fs::path dir_;
  RunConfig config_;
  std::ostringstream log_text_;
  std::shared_ptr<spdlog::logger> log_;
  boost::asio::io_context io_;
};

TEST_F(AlertChannels, AChannelTheConfigLacksIsNotMade) {
  EXPECT_EQ(MakeAlertChannel(AlertChannelKind::kEmail, io_, config_, log_), nullptr);
  EXPECT_EQ(MakeAlertChannel(AlertChannelKind::kCommand, io_, config_, log_), nullptr);
  EXPECT_EQ(MakeAlertChannel(AlertChannelKind::kStopFile, io_, config_, log_), nullptr);
  const auto log = MakeAlertChannel(AlertChannelKind::kLog, io_, config_, log_);
  ASSERT_NE(log, nullptr);  // the log is always there
  EXPECT_EQ(log->kind(), AlertChannelKind::kLog);
}

TEST_F(AlertChannels, TheStopFileHoldsTheEventsMessage) {
  config_.alerts.stop_file = (dir_ / "STOP").string();
  const auto channel = MakeAlertChannel(AlertChannelKind::kStopFile, io_, config_, log_);
  ASSERT_NE(channel, nullptr);
  EXPECT_FALSE(channel->sends_digest());
  ASSERT_TRUE(DeliverAndWait(*channel, io_, {RunMetEvent()}).ok());
  std::ifstream in(dir_ / "STOP");
  std::string line;
  std::getline(in, line);
  EXPECT_EQ(line, RunMetEvent().message);
}

TEST_F(AlertChannels, AStopFileThatCannotBeCreatedSaysWhere) {
  config_.alerts.stop_file = (dir_ / "no_such_folder" / "STOP").string();
  const auto channel = MakeAlertChannel(AlertChannelKind::kStopFile, io_, config_, log_);
  const Status s = DeliverAndWait(*channel, io_, {RunMetEvent()});
  EXPECT_FALSE(s.ok());
  EXPECT_NE(s.message().find(config_.alerts.stop_file), std::string::npos) << s.message();
}

TEST_F(AlertChannels, TheCommandGetsTheEventInItsEnvironmentAndReportsItsExitStatus) {
  config_.alerts.command = CommandConfig{{"/bin/sh", "-c", "test \"$PLATEAU_EVENT\" = run_met"}, 30};
  const auto channel = MakeAlertChannel(AlertChannelKind::kCommand, io_, config_, log_);
  ASSERT_NE(channel, nullptr);
  EXPECT_TRUE(DeliverAndWait(*channel, io_, {RunMetEvent()}).ok());
  EventRow stalled = RunMetEvent();
  stalled.kind = EventKind::kStalled;
  EXPECT_FALSE(DeliverAndWait(*channel, io_, {stalled}).ok());  // the test exits 1
  EXPECT_NE(log_text_.str().find("alert command for event 7 (run_met): exit status 0"),
            std::string::npos)
      << log_text_.str();
}

TEST_F(AlertChannels, TheLogTakesEveryEventOfACycleOnALineEach) {
  const auto channel = MakeAlertChannel(AlertChannelKind::kLog, io_, config_, log_);
  EventRow drift = RunMetEvent();
  drift.kind = EventKind::kDrift;
  drift.message = "cd drifts";
  ASSERT_TRUE(DeliverAndWait(*channel, io_, {RunMetEvent(), drift}).ok());
  const std::string text = log_text_.str();
  EXPECT_NE(text.find("event run_met: every target of run pipe-9 is met"), std::string::npos);
  EXPECT_NE(text.find("event drift: cd drifts"), std::string::npos);
}

TEST(AlertRouting, KindsGoWhereTheConfigSends) {
  AlertsConfig alerts;
  alerts.events = {EventKind::kRunMet, EventKind::kStalled};
  EXPECT_TRUE(RecordedChannelsFor(EventKind::kRunMet, alerts).empty());  // nothing configured
  alerts.email = EmailConfig{};
  alerts.command = CommandConfig{};
  alerts.stop_file = "/tmp/STOP";
  using K = AlertChannelKind;
  EXPECT_EQ(RecordedChannelsFor(EventKind::kRunMet, alerts),
            (std::vector<K>{K::kEmail, K::kCommand, K::kStopFile}));
  EXPECT_EQ(RecordedChannelsFor(EventKind::kStalled, alerts), (std::vector<K>{K::kEmail, K::kCommand}));
  EXPECT_TRUE(RecordedChannelsFor(EventKind::kMet, alerts).empty());  // not in alerts: events:
  // The stop file is for run_met only, even when run_met is not an alert kind.
  alerts.events = {};
  EXPECT_EQ(RecordedChannelsFor(EventKind::kRunMet, alerts), (std::vector<K>{K::kStopFile}));
}

TEST(AlertRouting, NamesRoundTrip) {
  for (const AlertChannelKind k : {AlertChannelKind::kEmail, AlertChannelKind::kCommand,
                                   AlertChannelKind::kStopFile, AlertChannelKind::kLog}) {
    EXPECT_EQ(AlertChannelKindFromName(AlertChannelKindName(k)), k);
  }
  EXPECT_EQ(AlertChannelKindFromName("pager"), std::nullopt);
  for (const EventKind k : AllEventKinds()) EXPECT_EQ(EventKindFromName(EventKindName(k)), k);
  EXPECT_EQ(EventKindFromName("finished"), std::nullopt);
}

}  // namespace
}  // namespace plateau
