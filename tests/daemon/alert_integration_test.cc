// Alerts from the real daemon: e-mail to a real SMTP server on 127.0.0.1 (Debian's
// python3-aiosmtpd, tests/daemon/smtp_sink.py), command hooks, the stop file, stalled input.
#include <gtest/gtest.h>
#include <signal.h>
#include <fcntl.h>
#include <sys/wait.h>

#include <algorithm>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <thread>

#include "tests/daemon/run_folder.h"

namespace plateau {
namespace {

namespace fs = std::filesystem;
using testing::ProbeRows;
using testing::ReadAll;
using testing::WaitFor;
using testing::WatchDaemon;

// The SMTP sink as a child process; its port is the first line it prints.
class SmtpSink {
 public:
  SmtpSink(const std::string& folder, const std::vector<std::string>& options) : folder_(folder) {
    fs::create_directories(folder_ + "/mail");
    const std::string out = folder_ + "/smtp.out";
    pid_ = fork();
    if (pid_ == 0) {
      const int fd = ::open(out.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0644);
      ::dup2(fd, 1);
      ::dup2(fd, 2);
      std::vector<std::string> args{"/usr/bin/python3", PLATEAU_TEST_DATA_DIR "/daemon/smtp_sink.py",
                                    folder_ + "/mail"};
      args.insert(args.end(), options.begin(), options.end());
      std::vector<char*> argv;
      for (std::string& a : args) argv.push_back(a.data());
      argv.push_back(nullptr);
      ::execv(argv[0], argv.data());
      _exit(127);
    }
    WaitFor([&] { return ReadAll(out).find('\n') != std::string::npos; }, 20);
    port_ = std::atoi(ReadAll(out).c_str());
  }
  ~SmtpSink() {
    ::kill(pid_, SIGTERM);
    ::waitpid(pid_, nullptr, 0);
  }
  int port() const { return port_; }
  std::vector<std::string> Messages() const {
    std::vector<std::string> texts;
    std::vector<fs::path> files;
    for (const auto& entry : fs::directory_iterator(folder_ + "/mail")) {
      if (entry.path().extension() == ".eml") files.push_back(entry.path());
    }
    std::sort(files.begin(), files.end());
    for (const fs::path& f : files) texts.push_back(ReadAll(f.string()));
    return texts;
  }

 private:
  std::string folder_;
  pid_t pid_ = -1;
  int port_ = 0;
};

class AlertIntegration : public testing::RunFolder {
 protected:
  // Writes rows until the daemon has counted them all; 12000 rows meet a 1 % target on x. With a
  // pause between chunks the daemon sees a solver advancing at a measurable rate.
  void FeedUntilMet(const ProbeRows& rows, int pause_ms = 0) {
    Append("run1/probe.dat", "# time x y\n");
    for (std::size_t from = 0; from < rows.size(); from += 1000) {
      Append("run1/probe.dat", rows.Rows(from, from + 1000));
      WaitFor([&] { return Samples() == static_cast<std::int64_t>(from + 1000); }, 10);
      std::this_thread::sleep_for(std::chrono::milliseconds(pause_ms));
    }
  }

  std::string EmailSettings(int port, const std::string& extra = "") {
    return "planned_end_time: 400\ncores: 512\nalerts:\n  events: [met, run_met]\n"
           "  email:\n    host: 127.0.0.1\n    port: " +
           std::to_string(port) + "\n    from: plateau@cluster.example\n" +
           "    to: [alice@example.org, bob@example.org]\n    timeout: 5\n" + extra;
  }

  std::string Log() { return ReadAll(Path("test.plateau.log")); }
};

TEST_F(AlertIntegration, EmailArrivesOnceWithTheValueAndTheCoreHoursSaved) {
  SmtpSink smtp(dir_.string(), {});
  ASSERT_GT(smtp.port(), 0);
  WriteConfig("{relative: 0.01}", "", EmailSettings(smtp.port()));
  const ProbeRows rows(12000);
  {
    WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
    FeedUntilMet(rows, 200);
    ASSERT_TRUE(WaitFor([&] { return !smtp.Messages().empty(); }, 20)) << Log();
    daemon.KillHard();  // no clean stop: the restarted daemon must know what was sent
  }
  // x's target and the run's are met in the same evaluation: one message says both.
  const std::vector<std::string> mail = smtp.Messages();
  ASSERT_EQ(mail.size(), 1u);
  EXPECT_NE(mail[0].find("X-Envelope-To: alice@example.org, bob@example.org"), std::string::npos);
  EXPECT_NE(mail[0].find("Subject: [plateau] test: every target met, the solver can stop "
                         "(and 1 more event)"),
            std::string::npos)
      << mail[0];
  EXPECT_NE(mail[0].find("- x met its target: "), std::string::npos);
  EXPECT_NE(mail[0].find("at 95 % confidence"), std::string::npos);
  EXPECT_NE(mail[0].find("core-hours"), std::string::npos);
  EXPECT_NE(mail[0].find("on 512 cores"), std::string::npos);
  // Restarted after kill -9: cycles go on, nothing is sent twice.
  WatchDaemon again(Path("run.yaml"), Path("watch.log"));
  const std::int64_t cycle = Latest()->cycle;
  ASSERT_TRUE(WaitFor([&] { return Latest()->cycle > cycle + 5; }, 20));
  EXPECT_EQ(smtp.Messages().size(), 1u);
}

TEST_F(AlertIntegration, RefusingServerIsRetriedAndLoggedWhileIngestGoesOn) {
  SmtpSink smtp(dir_.string(), {"--refuse"});
  WriteConfig("{relative: 0.01}", "", EmailSettings(smtp.port()));
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
  FeedUntilMet(ProbeRows(12000));
  ASSERT_TRUE(WaitFor([&] { return Log().find("550 5.1.1 no such user here") != std::string::npos; },
                      20))
      << Log();
  EXPECT_NE(Log().find("alert by email failed (attempt 1 of 8)"), std::string::npos);
  EXPECT_NE(Log().find("retrying in 10 s"), std::string::npos);
  EXPECT_TRUE(smtp.Messages().empty());
  Append("run1/probe.dat", ProbeRows(12100).Rows(12000, 12100));
  EXPECT_TRUE(WaitFor([&] { return Samples() == 12100; }, 10)) << "ingest must not wait for mail";
}

TEST_F(AlertIntegration, ServerThatIsDownIsRetriedAndIngestIsUnaffected) {
  WriteConfig("{relative: 0.01}", "", EmailSettings(1));  // nothing listens on port 1
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
  FeedUntilMet(ProbeRows(12000));
  ASSERT_TRUE(WaitFor([&] { return Log().find("Connection refused") != std::string::npos; }, 20))
      << Log();
  EXPECT_EQ(Samples(), 12000);
  EXPECT_TRUE(daemon.Running());
}

TEST_F(AlertIntegration, StartTlsAndAuthWithThePasswordFromTheEnvironment) {
  const std::string cert = Path("cert.pem"), key = Path("key.pem");
  const std::string make_cert = "openssl req -x509 -newkey rsa:2048 -nodes -days 1 -subj "
                                "/CN=127.0.0.1 -addext subjectAltName=IP:127.0.0.1 -keyout " +
                                key + " -out " + cert + " > /dev/null 2>&1";
  ASSERT_EQ(std::system(make_cert.c_str()), 0) << "openssl could not make a test certificate";
  SmtpSink smtp(dir_.string(), {"--tls", cert, key, "--auth", "alice", "s3cret-Pa55"});
  ::setenv("PLATEAU_TEST_SMTP_PASSWORD", "s3cret-Pa55", 1);  // inherited by the daemon
  WriteConfig("{relative: 0.01}", "",
              EmailSettings(smtp.port(), "    starttls: true\n    ca_file: " + cert +
                                             "\n    username: alice\n"
                                             "    password_env: PLATEAU_TEST_SMTP_PASSWORD\n"));
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
  FeedUntilMet(ProbeRows(12000));
  ASSERT_TRUE(WaitFor([&] { return smtp.Messages().size() == 1; }, 20)) << Log();
  EXPECT_EQ(Log().find("s3cret-Pa55"), std::string::npos) << "the password must never be logged";
  ::unsetenv("PLATEAU_TEST_SMTP_PASSWORD");
}

TEST_F(AlertIntegration, CommandRunsWithoutAShellWhateverTheEventSays) {
  // A statistic name with quotes, a command substitution and a newline reaches the command as
  // bytes in PLATEAU_STATISTIC; nothing of it is executed.
  const std::string hostile = "x'\\\"$(touch pwned)`touch pwned2`\\nnext";
  WriteConfig("{relative: 0.01}\n    name: \"" + hostile + "\"", "",
              "alerts:\n  events: [met]\n  command: [/usr/bin/printenv, PLATEAU_STATISTIC]\n");
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
  FeedUntilMet(ProbeRows(12000));
  ASSERT_TRUE(WaitFor([&] { return Log().find("alert command for event") != std::string::npos; },
                      20))
      << Log();
  EXPECT_NE(Log().find("exit status 0; output: x'\"$(touch pwned)`touch pwned2`|next|"),
            std::string::npos)
      << Log();
  EXPECT_FALSE(fs::exists("pwned"));
  EXPECT_FALSE(fs::exists("pwned2"));
  EXPECT_FALSE(fs::exists(Path("pwned")));
}

TEST_F(AlertIntegration, ArgumentsAreNotInterpretedEither) {
  const std::string literal = Path("made-$(touch pwned)");
  WriteConfig("{relative: 0.01}", "",
              "alerts:\n  events: [met]\n  command: [/usr/bin/touch, \"" + literal + "\"]\n");
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
  FeedUntilMet(ProbeRows(12000));
  ASSERT_TRUE(WaitFor([&] { return fs::exists(literal); }, 20)) << Log();
  EXPECT_FALSE(fs::exists("pwned"));  // where a shell would have run it: the daemon's folder
  EXPECT_FALSE(fs::exists(Path("pwned")));
}

TEST_F(AlertIntegration, StopFileAppearsWhenEveryTargetIsMet) {
  WriteConfig("{relative: 0.01}", "", "alerts:\n  stop_file: STOP\n");
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
  FeedUntilMet(ProbeRows(12000));
  ASSERT_TRUE(WaitFor([&] { return fs::exists(Path("STOP")); }, 20)) << Log();
  EXPECT_NE(ReadAll(Path("STOP")).find("every target of run test is met"), std::string::npos);
}

TEST_F(AlertIntegration, InputThatStopsGrowingIsStalledAndThenResumed) {
  WriteConfig("{relative: 0.01}", "", "alerts:\n  stall_after: 1\n");
  Append("run1/probe.dat", "# time x y\n" + ProbeRows(200).Rows(0, 100));
  WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
  const auto has = [&](EventKind kind) {
    for (const EventRow& e : Events()) {
      if (e.kind == kind) return true;
    }
    return false;
  };
  ASSERT_TRUE(WaitFor([&] { return has(EventKind::kStalled); }, 10)) << Log();
  Append("run1/probe.dat", ProbeRows(200).Rows(100, 200));
  ASSERT_TRUE(WaitFor([&] { return has(EventKind::kResumed); }, 10)) << Log();
}

}  // namespace
}  // namespace plateau
