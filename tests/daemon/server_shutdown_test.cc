// Shutdown order of the daemon's servers. WatchLoop declares its io_context before the servers that
// run on it (they need it to be built), so at shutdown the servers are destroyed first and the
// io_context after them, and with it every handler still pending: a client connected to the query
// socket or to /metrics when the daemon stops. Such a connection must not touch its server then.
// The tests below destroy a server, then its io_context, with a connection pending; in the
// ASan build (tests/run, step 3) a connection that decrements its server's count is a
// heap-use-after-free and fails the test. In the release build they check the same thing as far
// as an unsanitised build can: no crash.
#include <gtest/gtest.h>

#include <filesystem>
#include <memory>
#include <string>

#include "daemon/serving/metrics_server.h"
#include "daemon/serving/query_server.h"
#include "daemon/runtime/run_logger.h"

namespace plateau {
namespace {

namespace asio = boost::asio;
namespace fs = std::filesystem;

class ServerShutdown : public ::testing::Test {
 protected:
  void SetUp() override {
    folder_ = fs::temp_directory_path() /
              ("plateau_shutdown_" + std::to_string(::getpid()) + "_" +
               ::testing::UnitTest::GetInstance()->current_test_info()->name());
    fs::remove_all(folder_);
    fs::create_directories(folder_);
    RunConfig config;
    config.run_name = "shutdown";
    config.store_path = (folder_ / "plateau.db").string();
    auto store = RunStore::OpenForWriting(config.store_path, config.run_name);
    ASSERT_TRUE(store.ok()) << store.error();
    monitor_ = std::make_unique<RunMonitor>(std::move(config), std::move(store).value(),
                                            MakeSilentLogger());
  }
  void TearDown() override {
    monitor_.reset();
    fs::remove_all(folder_);
  }

  fs::path folder_;
  std::unique_ptr<RunMonitor> monitor_;
};

TEST_F(ServerShutdown, AQueryConnectionPendingAtShutdownOutlivesItsServerSafely) {
  auto io = std::make_unique<asio::io_context>();
  auto server = std::make_unique<QueryServer>(*io, *monitor_, [] { return std::string(); },
                                              MakeSilentLogger());
  const std::string path = (folder_ / "plateau.db.sock").string();
  ASSERT_TRUE(server->Start(path).ok());

  // One exchange proves the session exists; it then waits for the client's next line.
  asio::local::stream_protocol::socket client(*io);
  client.connect(asio::local::stream_protocol::endpoint(path));
  asio::write(client, asio::buffer(std::string("not json\n")));
  asio::streambuf reply;
  bool answered = false;
  asio::async_read_until(client, reply, '\n',
                         [&](const boost::system::error_code&, std::size_t) { answered = true; });
  while (!answered) io->run_one();
  EXPECT_EQ(server->connections(), 1);

  server.reset();  // WatchLoop's member order: the server goes first...
  client.close();
  io.reset();      // ...then the io_context, destroying the session's pending read
}

TEST_F(ServerShutdown, AMetricsConnectionPendingAtShutdownOutlivesItsServerSafely) {
  auto io = std::make_unique<asio::io_context>();
  auto server = std::make_unique<MetricsServer>(*io, *monitor_, MakeSilentLogger());
  ASSERT_TRUE(server->Start("127.0.0.1:0").ok());

  // A client that connects and sends half a request: its session waits for the rest.
  asio::ip::tcp::socket client(*io);
  client.connect({asio::ip::make_address("127.0.0.1"), server->port()});
  asio::write(client, asio::buffer(std::string("GET /metrics HTTP/1.1\r\n")));
  while (server->connections() == 0) io->run_one();

  server.reset();
  client.close();
  io.reset();
}

}  // namespace
}  // namespace plateau
