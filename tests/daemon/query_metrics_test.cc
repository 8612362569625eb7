// The query socket and the metrics endpoint of the real daemon, and SIGHUP reloads.
#include <arpa/inet.h>
#include <gtest/gtest.h>
#include <netinet/in.h>
#include <sys/socket.h>
#include <sys/stat.h>
#include <sys/un.h>

#include <filesystem>
#include <fstream>
#include <cctype>
#include <cstdlib>
#include <sstream>
#include <thread>

#include "daemon/presentation/json_document.h"
#include "daemon/serving/query_server.h"
#include "tests/daemon/run_folder.h"

namespace plateau {
namespace {

using testing::ProbeRows;
using testing::ReadAll;
using testing::WaitFor;
using testing::WatchDaemon;

// One raw exchange on the socket: `bytes` sent as they are, the first reply line returned.
std::string Exchange(const std::string& path, const std::string& bytes) {
  sockaddr_un address{};
  address.sun_family = AF_UNIX;
  std::snprintf(address.sun_path, sizeof address.sun_path, "%s", path.c_str());
  const int fd = ::socket(AF_UNIX, SOCK_STREAM, 0);
  timeval limit{5, 0};
  ::setsockopt(fd, SOL_SOCKET, SO_RCVTIMEO, &limit, sizeof limit);
  std::string reply;
  if (::connect(fd, reinterpret_cast<sockaddr*>(&address), sizeof address) == 0) {
    ::send(fd, bytes.data(), bytes.size(), MSG_NOSIGNAL);
    char chunk[4096];
    ssize_t n;
    while ((n = ::recv(fd, chunk, sizeof chunk, 0)) > 0) {
      reply.append(chunk, static_cast<std::size_t>(n));
      if (reply.back() == '\n') break;
    }
  }
  ::close(fd);
  return reply;
}

// GET on 127.0.0.1:port; the whole response.
std::string HttpGet(int port, const std::string& target) {
  const int fd = ::socket(AF_INET, SOCK_STREAM, 0);
  sockaddr_in address{};
  address.sin_family = AF_INET;
  address.sin_port = htons(static_cast<std::uint16_t>(port));
  ::inet_pton(AF_INET, "127.0.0.1", &address.sin_addr);
  timeval limit{5, 0};
  ::setsockopt(fd, SOL_SOCKET, SO_RCVTIMEO, &limit, sizeof limit);
  std::string response;
  if (::connect(fd, reinterpret_cast<sockaddr*>(&address), sizeof address) == 0) {
    const std::string request = "GET " + target + " HTTP/1.1\r\nHost: 127.0.0.1\r\n\r\n";
    ::send(fd, request.data(), request.size(), MSG_NOSIGNAL);
    char chunk[4096];
    ssize_t n;
    while ((n = ::recv(fd, chunk, sizeof chunk, 0)) > 0) response.append(chunk, n);
  }
  ::close(fd);
  return response;
}

// True for one sample line of the exposition format: name{key="value",...} number, label values
// with only \\, \" and \n escapes.
bool IsSampleLine(const std::string& line) {
  std::size_t i = 0;
  const auto name = [&] {
    const std::size_t start = i;
    while (i < line.size() && (std::islower(static_cast<unsigned char>(line[i])) || line[i] == '_')) ++i;
    return i > start;
  };
  if (!name() || i >= line.size() || line[i++] != '{') return false;
  while (true) {
    if (!name() || line.compare(i, 2, "=\"") != 0) return false;
    for (i += 2; i < line.size() && line[i] != '"'; ++i) {
      if (line[i] == '\\' && (++i >= line.size() || std::string("\\\"n").find(line[i]) == std::string::npos)) {
        return false;
      }
    }
    if (i >= line.size()) return false;
    ++i;  // the closing quote
    if (i < line.size() && line[i] == ',') {
      ++i;
      continue;
    }
    break;
  }
  if (line.compare(i, 2, "} ") != 0) return false;
  const std::string value = line.substr(i + 2);
  if (value == "NaN" || value == "+Inf" || value == "-Inf") return true;
  char* end = nullptr;
  std::strtod(value.c_str(), &end);
  return !value.empty() && *end == '\0';
}

int FreePort() {
  const int fd = ::socket(AF_INET, SOCK_STREAM, 0);
  sockaddr_in address{};
  address.sin_family = AF_INET;
  ::inet_pton(AF_INET, "127.0.0.1", &address.sin_addr);
  ::bind(fd, reinterpret_cast<sockaddr*>(&address), sizeof address);
  socklen_t size = sizeof address;
  ::getsockname(fd, reinterpret_cast<sockaddr*>(&address), &size);
  ::close(fd);
  return ntohs(address.sin_port);
}

class QueryAndMetrics : public testing::RunFolder {
 protected:
  std::string Socket() { return Path("plateau.db.sock"); }
  void StartWithData(WatchDaemon*& daemon, const std::string& settings = "",
                     const std::string& target = "{relative: 0.01}") {
    WriteConfig(target, "", settings);
    Append("run1/probe.dat", "# time x y\n" + ProbeRows(3000).Rows(0, 3000));
    daemon = new WatchDaemon(Path("run.yaml"), Path("watch.log"));
    ASSERT_TRUE(WaitFor([&] { return Samples() == 3000; }, 10));
    ASSERT_TRUE(WaitFor([&] { return std::filesystem::exists(Socket()); }, 10));
  }
};

TEST_F(QueryAndMetrics, SocketIsPrivateAndAnswersLineByLine) {
  WatchDaemon* daemon = nullptr;
  StartWithData(daemon);
  std::unique_ptr<WatchDaemon> owner(daemon);
  struct stat info {};
  ASSERT_EQ(::stat(Socket().c_str(), &info), 0);
  EXPECT_TRUE(S_ISSOCK(info.st_mode));
  EXPECT_EQ(info.st_mode & 0777, 0600u);
  const std::string status = Exchange(Socket(), "{\"request\":\"status\"}\n");
  EXPECT_NE(status.find("\"answered_by\":\"daemon\""), std::string::npos) << status;
  EXPECT_NE(status.find("\"samples_total\":3000"), std::string::npos);
  const std::string check = Exchange(Socket(), "{\"request\":\"check\"}\n");
  EXPECT_NE(check.find("\"answer\":\"continue\""), std::string::npos) << check;
  EXPECT_NE(Exchange(Socket(), "{\"request\":\"events\",\"after\":0}\n").find("\"events\":["),
            std::string::npos);
  // Through the commands: the daemon answers while it runs.
  const testing::CommandResult json = Plateau({"status", "--json", Path("run.yaml")});
  EXPECT_NE(json.out.find("\"answered_by\":\"daemon\""), std::string::npos);
}

TEST_F(QueryAndMetrics, DaemonAndStoreGiveTheSameTimeToTarget) {
  // The data stop after 3000 rows, so every cycle computes the same prediction; the daemon's
  // answer (from memory) must equal the store's (a regression: memory once said 0, "reached").
  WatchDaemon* daemon = nullptr;
  StartWithData(daemon, "", "{relative: 0.002}");
  std::unique_ptr<WatchDaemon> owner(daemon);
  ASSERT_TRUE(WaitFor([&] { return Latest() && Latest()->cycle >= 3; }, 10));
  const auto status = ParseJsonDocument(Exchange(Socket(), "{\"request\":\"status\"}\n"));
  ASSERT_TRUE(status.ok()) << status.error();
  const JsonDocument* eta = FindMember(*status, "time_to_target");
  ASSERT_NE(eta, nullptr);
  ASSERT_TRUE(eta->is_object());
  const double from_daemon = eta->at("simulated").get<double>();
  EXPECT_GT(from_daemon, 0.0);  // 3000 rows give about 0.7 %: far from a 0.2 % target
  EXPECT_NEAR(from_daemon, Latest()->remaining_time, 1e-9 * from_daemon);
}

TEST_F(QueryAndMetrics, MalformedUnknownAndOversizedRequestsGetAnErrorObject) {
  WatchDaemon* daemon = nullptr;
  StartWithData(daemon);
  std::unique_ptr<WatchDaemon> owner(daemon);
  // nlohmann-json's words, after where it stopped.
  EXPECT_EQ(Exchange(Socket(), "{\"request\": status}\n").substr(0, 35),
            "{\"error\":\"not JSON: at byte 13: syn");
  EXPECT_EQ(Exchange(Socket(), "{\"request\":\"shutdown\"}\n"),
            "{\"error\":\"unknown request 'shutdown'; expected status, check, events or "
            "reload\"}\n");
  const std::string huge = "{\"request\":\"" + std::string(100000, 'a') + "\"}\n";
  EXPECT_EQ(Exchange(Socket(), huge),
            "{\"error\":\"request longer than 65536 bytes; the connection is closed\"}\n");
  EXPECT_TRUE(daemon->Running());
  EXPECT_NE(Exchange(Socket(), "{\"request\":\"status\"}\n").find("\"cycle\":"), std::string::npos);
}

TEST_F(QueryAndMetrics, StatusFallsBackToTheStoreWhenTheDaemonIsGone) {
  WatchDaemon* daemon = nullptr;
  StartWithData(daemon);
  delete daemon;  // SIGKILL: the socket file stays, nobody answers on it
  const testing::CommandResult json = Plateau({"status", "--json", Path("run.yaml")});
  EXPECT_EQ(json.exit_code, 0) << json.err;
  EXPECT_NE(json.out.find("\"answered_by\":\"store\""), std::string::npos) << json.out;
  EXPECT_NE(json.out.find("\"running\":false"), std::string::npos);
}

TEST_F(QueryAndMetrics, MetricsAreScrapedInThePrometheusTextFormat) {
  const int port = FreePort();
  WatchDaemon* daemon = nullptr;
  StartWithData(daemon, "metrics: {listen: 127.0.0.1:" + std::to_string(port) + "}\n");
  std::unique_ptr<WatchDaemon> owner(daemon);
  std::string response;
  ASSERT_TRUE(WaitFor([&] { return (response = HttpGet(port, "/metrics")).find("200 OK") !=
                                   std::string::npos; },
                      10));
  EXPECT_NE(response.find("Content-Type: text/plain; version=0.0.4"), std::string::npos);
  const std::string body = response.substr(response.find("\r\n\r\n") + 4);
  // Every line is a comment or `name{labels} value`, per the exposition format.
  std::istringstream lines(body);
  std::string line;
  int samples = 0;
  while (std::getline(lines, line)) {
    if (line.rfind("# HELP ", 0) == 0 || line.rfind("# TYPE ", 0) == 0) continue;
    EXPECT_TRUE(IsSampleLine(line)) << line;
    ++samples;
  }
  EXPECT_GE(samples, 11);
  EXPECT_NE(body.find("plateau_statistic_met{run=\"test\",statistic=\"x\"} 0"), std::string::npos);
  EXPECT_NE(body.find("plateau_source_samples_total{run=\"test\",source=\"probe\"} 3000"),
            std::string::npos)
      << body;
  EXPECT_NE(body.find("# TYPE plateau_source_bad_lines_total counter"), std::string::npos);
  EXPECT_NE(HttpGet(port, "/other").find("404 Not Found"), std::string::npos);
}

TEST_F(QueryAndMetrics, HangUpReloadsTargetsAndKeepsTheOldConfigWhenTheNewOneIsBroken) {
  WatchDaemon* daemon = nullptr;
  StartWithData(daemon);
  std::unique_ptr<WatchDaemon> owner(daemon);
  WriteConfig("{relative: 0.5}");  // loose enough to be met
  daemon->Signal(SIGHUP);
  ASSERT_TRUE(WaitFor([&] { return Plateau({"status", "--json", Path("run.yaml")}).out.find(
                                       "\"kind\":\"relative\",\"value\":0.5") != std::string::npos; },
                      10))
      << ReadAll(Path("test.plateau.log"));
  Append("run1/probe.dat", ProbeRows(6000).Rows(3000, 6000));
  std::ofstream(Path("run.yaml")) << "sources: [\n";  // broken
  daemon->Signal(SIGHUP);
  ASSERT_TRUE(WaitFor([&] { return ReadAll(Path("test.plateau.log")).find(
                                       "config reload failed") != std::string::npos; },
                      10));
  EXPECT_TRUE(daemon->Running());
  EXPECT_NE(Exchange(Socket(), "{\"request\":\"status\"}\n").find("\"value\":0.5"),
            std::string::npos);
}

}  // namespace
}  // namespace plateau
