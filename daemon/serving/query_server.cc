#include "daemon/serving/query_server.h"

#include <sys/socket.h>
#include <sys/stat.h>
#include <sys/un.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>

#include "daemon/presentation/json_writer.h"
#include "daemon/serving/query_request.h"
#include "daemon/presentation/status_report.h"
#include "daemon/runtime/wall_clock.h"

namespace plateau {
namespace {

namespace asio = boost::asio;
using asio::local::stream_protocol;

std::string ErrorJson(const std::string& message) {
  JsonWriter json;
  json.BeginObject();
  json.Field("error", message);
  json.EndObject();
  return json.text();
}

// The last cycle in memory as the view status prints.
LatestView MemoryView(const RunMonitor& monitor) {
  const CycleRecord& r = monitor.last_cycle();
  LatestView v;
  v.run_name = monitor.config().run_name;
  v.cycle = r.cycle;
  v.wall_time = r.wall_time;
  v.last_sample_time = r.last_sample_time;
  v.last_sample_wall_time = r.last_sample_wall_time;
  v.run_met = r.run_met;
  v.remaining_time = r.remaining_time;
  v.remaining_wall = r.remaining_wall;
  v.statistics = r.snapshots;
  v.files = r.files;
  return v;
}

}  // namespace

// One client connection: read a line, answer it, repeat; a line over the limit ends it.
class QueryServer::Session : public std::enable_shared_from_this<Session> {
 public:
  Session(QueryServer& server, stream_protocol::socket socket)
      : server_(server),
        ticket_(server.connections_.Open()),
        socket_(std::move(socket)),
        buffer_(kMaxRequestBytes) {}

  void Read() {
    asio::async_read_until(
        socket_, buffer_, '\n',
        [self = shared_from_this()](const boost::system::error_code& error, std::size_t n) {
          if (error == asio::error::not_found) {
            self->Reply(ErrorJson("request longer than " + std::to_string(kMaxRequestBytes) +
                                  " bytes; the connection is closed"),
                        false);
            return;
          }
          if (error) return;  // the client went away
          std::string line(asio::buffers_begin(self->buffer_.data()),
                           asio::buffers_begin(self->buffer_.data()) +
                               static_cast<std::ptrdiff_t>(n - 1));
          self->buffer_.consume(n);
          self->Reply(self->server_.Answer(line), true);
        });
  }

  void Reply(std::string text, bool keep_open) {
    reply_ = std::move(text) + "\n";
    asio::async_write(socket_, asio::buffer(reply_),
                      [self = shared_from_this(), keep_open](const boost::system::error_code& error,
                                                            std::size_t) {
                        if (!error && keep_open) self->Read();
                      });
  }

 private:
  QueryServer& server_;
  ConnectionCount::Ticket ticket_;
  stream_protocol::socket socket_;
  asio::streambuf buffer_;
  std::string reply_;
};

QueryServer::QueryServer(asio::io_context& io, RunMonitor& monitor,
                         std::function<std::string()> reload, std::shared_ptr<spdlog::logger> log)
    : io_(io), monitor_(monitor), reload_(std::move(reload)), log_(std::move(log)), acceptor_(io) {}

QueryServer::~QueryServer() {
  if (!path_.empty()) ::unlink(path_.c_str());
}

Status QueryServer::Start(const std::string& path) {
  // A socket file nobody answers on is left over from a daemon that died: replace it. (The store
  // lock already guarantees that no other daemon of this run is alive.)
  if (!AskDaemon(path, "{\"request\":\"status\"}", 1.0)) ::unlink(path.c_str());
  boost::system::error_code error;
  acceptor_.open(stream_protocol(), error);
  // Created with mode 0600 from the start: no moment where others could connect.
  const mode_t old_mask = ::umask(0177);
  if (!error) acceptor_.bind(stream_protocol::endpoint(path), error);
  ::umask(old_mask);
  if (!error) acceptor_.listen(kMaxConnections, error);
  if (error) return Status::Error("cannot listen on the query socket " + path + ": " + error.message());
  path_ = path;
  Accept();
  return Status::Ok();
}

void QueryServer::Accept() {
  acceptor_.async_accept([this](const boost::system::error_code& error,
                                stream_protocol::socket socket) {
    if (error) {
      if (error != asio::error::operation_aborted) {
        log_->warn("query socket: {}", error.message());
        Accept();
      }
      return;
    }
    auto session = std::make_shared<Session>(*this, std::move(socket));
    if (connections_.open() > kMaxConnections) {
      session->Reply(ErrorJson("too many connections (at most " + std::to_string(kMaxConnections) +
                               "); try again"),
                     false);
    } else {
      session->Read();
    }
    Accept();
  });
}

std::string QueryServer::Answer(std::string_view line) {
  const Result<QueryRequest> request = ParseQueryRequest(line);
  if (!request.ok()) return ErrorJson(request.error());
  StatusContext context{monitor_.store().path(), static_cast<long>(::getpid()), "daemon",
                        WallSeconds()};
  switch (request->kind) {
    case QueryRequest::Kind::kStatus:
      if (monitor_.last_cycle().cycle == 0) return ErrorJson("no evaluation yet");
      return StatusJson(MemoryView(monitor_), context);
    case QueryRequest::Kind::kCheck: {
      if (monitor_.last_cycle().cycle == 0) return ErrorJson("no evaluation yet");
      const CheckAnswer answer = Check(MemoryView(monitor_), context, request->statistic);
      JsonWriter json;
      json.BeginObject();
      json.Field("exit_code", answer.exit_code);
      json.Field("answer", answer.exit_code == 0   ? "stop"
                           : answer.exit_code == 1 ? "continue"
                                                   : "cannot_tell");
      json.Field("message", answer.message);
      json.EndObject();
      return json.text();
    }
    case QueryRequest::Kind::kEvents: {
      const Result<std::vector<EventRow>> events = monitor_.store().ReadEvents(request->after, 1000);
      if (!events.ok()) return ErrorJson(events.error());
      JsonWriter json;
      json.BeginObject();
      json.Key("events");
      json.BeginArray();
      for (const EventRow& e : *events) {
        json.BeginObject();
        json.Field("id", e.id);
        json.Field("kind", EventKindName(e.kind));
        json.Field("statistic", e.statistic);
        json.Field("message", e.message);
        json.Field("simulated_time", e.simulated_time);
        json.Field("wall_time", e.wall_time);
        json.EndObject();
      }
      json.EndArray();
      json.EndObject();
      return json.text();
    }
    case QueryRequest::Kind::kReload: {
      JsonWriter json;
      json.BeginObject();
      json.Field("reloaded", reload_());
      json.EndObject();
      return json.text();
    }
  }
  return ErrorJson("unknown request");
}

std::optional<std::string> AskDaemon(const std::string& path, const std::string& request,
                                     double timeout) {
  sockaddr_un address{};
  if (path.size() >= sizeof address.sun_path) return std::nullopt;
  address.sun_family = AF_UNIX;
  std::memcpy(address.sun_path, path.c_str(), path.size() + 1);
  const int fd = ::socket(AF_UNIX, SOCK_STREAM | SOCK_CLOEXEC, 0);
  if (fd < 0) return std::nullopt;
  timeval limit{static_cast<time_t>(timeout),
                static_cast<suseconds_t>((timeout - static_cast<time_t>(timeout)) * 1e6)};
  ::setsockopt(fd, SOL_SOCKET, SO_RCVTIMEO, &limit, sizeof limit);
  ::setsockopt(fd, SOL_SOCKET, SO_SNDTIMEO, &limit, sizeof limit);
  std::optional<std::string> reply;
  if (::connect(fd, reinterpret_cast<const sockaddr*>(&address), sizeof address) == 0) {
    const std::string line = request + "\n";
    if (::send(fd, line.data(), line.size(), MSG_NOSIGNAL) == static_cast<ssize_t>(line.size())) {
      std::string text;
      char chunk[65536];
      ssize_t n;
      while ((n = ::recv(fd, chunk, sizeof chunk, 0)) > 0) {
        text.append(chunk, static_cast<std::size_t>(n));
        if (text.back() == '\n') break;
      }
      if (!text.empty() && text.back() == '\n') {
        text.pop_back();
        reply = std::move(text);
      }
    }
  }
  ::close(fd);
  return reply;
}

}  // namespace plateau
