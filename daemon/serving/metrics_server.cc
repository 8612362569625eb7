#include "daemon/serving/metrics_server.h"

#include <boost/beast/core.hpp>
#include <boost/beast/http.hpp>

#include <chrono>
#include <cmath>

#include "daemon/runtime/wall_clock.h"
#include "daemon/presentation/number_format.h"

namespace plateau {
namespace {

namespace asio = boost::asio;
namespace beast = boost::beast;
namespace http = beast::http;
using asio::ip::tcp;

// Label values escape backslash, double quote and newline (the exposition format's rules).
std::string Label(const std::string& value) {
  std::string out;
  for (char c : value) {
    if (c == '\\') {
      out += "\\\\";
    } else if (c == '"') {
      out += "\\\"";
    } else if (c == '\n') {
      out += "\\n";
    } else {
      out += c;
    }
  }
  return out;
}

std::string Number(double value) {
  if (std::isnan(value)) return "NaN";
  if (std::isinf(value)) return value > 0 ? "+Inf" : "-Inf";
  return PrintfNumber("%.17g", value);
}

class Family {
 public:
  Family(std::string& out, const std::string& name, const std::string& type,
         const std::string& help)
      : out_(out), name_(name) {
    out_ += "# HELP " + name + " " + help + "\n# TYPE " + name + " " + type + "\n";
  }
  void Sample(const std::string& labels, double value) {
    out_ += name_ + "{" + labels + "} " + Number(value) + "\n";
  }

 private:
  std::string& out_;
  std::string name_;
};

// `ticket` counts the connection until the coroutine's frame is destroyed, which may be after the
// server's (an io_context destroyed with the connection pending).
asio::awaitable<void> Serve(tcp::socket socket, const RunMonitor& monitor,
                            [[maybe_unused]] ConnectionCount::Ticket ticket) {
  beast::tcp_stream stream(std::move(socket));
  beast::flat_buffer buffer;
  http::request_parser<http::empty_body> parser;
  parser.header_limit(8 << 10);
  stream.expires_after(std::chrono::seconds(10));
  boost::system::error_code error;
  co_await http::async_read(stream, buffer, parser,
                            asio::redirect_error(asio::use_awaitable, error));
  if (error) co_return;
  const auto& request = parser.get();
  http::response<http::string_body> response;
  response.version(request.version());
  response.set(http::field::server, "plateau");
  if (request.method() != http::verb::get && request.method() != http::verb::head) {
    response.result(http::status::method_not_allowed);
    response.set(http::field::allow, "GET, HEAD");
    response.body() = "only GET /metrics\n";
  } else if (request.target() != "/metrics") {
    response.result(http::status::not_found);
    response.body() = "not found: the metrics are at /metrics\n";
  } else {
    response.result(http::status::ok);
    response.set(http::field::content_type, "text/plain; version=0.0.4; charset=utf-8");
    response.body() = MetricsServer::Exposition(monitor, WallSeconds());
  }
  response.keep_alive(false);
  response.prepare_payload();
  co_await http::async_write(stream, response, asio::redirect_error(asio::use_awaitable, error));
  stream.socket().shutdown(tcp::socket::shutdown_send, error);
}

}  // namespace

MetricsServer::MetricsServer(asio::io_context& io, RunMonitor& monitor,
                             std::shared_ptr<spdlog::logger> log)
    : io_(io), monitor_(monitor), log_(std::move(log)), acceptor_(io) {}

Status MetricsServer::Start(const std::string& listen) {
  const std::size_t colon = listen.rfind(':');
  const std::string host = listen.substr(0, colon);
  const std::string port = listen.substr(colon + 1);
  boost::system::error_code error;
  tcp::resolver resolver(io_);
  const auto endpoints = resolver.resolve(host, port, error);
  if (error || endpoints.empty()) {
    return Status::Error("metrics: cannot resolve " + listen + ": " + error.message());
  }
  const tcp::endpoint endpoint = endpoints.begin()->endpoint();
  acceptor_.open(endpoint.protocol(), error);
  if (!error) acceptor_.set_option(tcp::acceptor::reuse_address(true), error);
  if (!error) acceptor_.bind(endpoint, error);
  if (!error) acceptor_.listen(kMaxConnections, error);
  if (error) return Status::Error("metrics: cannot listen on " + listen + ": " + error.message());
  Accept();
  return Status::Ok();
}

unsigned short MetricsServer::port() const {
  boost::system::error_code error;
  return acceptor_.local_endpoint(error).port();
}

void MetricsServer::Accept() {
  acceptor_.async_accept([this](const boost::system::error_code& error, tcp::socket socket) {
    if (error) {
      if (error != asio::error::operation_aborted) Accept();
      return;
    }
    if (connections_.open() >= kMaxConnections) {
      boost::system::error_code ignored;
      socket.close(ignored);  // the scraper retries at its next interval
    } else {
      asio::co_spawn(io_, Serve(std::move(socket), monitor_, connections_.Open()), asio::detached);
    }
    Accept();
  });
}

std::string MetricsServer::Exposition(const RunMonitor& monitor, double now) {
  const CycleRecord& cycle = monitor.last_cycle();
  const std::string run = "run=\"" + Label(monitor.config().run_name) + "\"";
  std::string out;
  const auto per_statistic = [&](const std::string& name, const std::string& help, auto field) {
    Family family(out, name, "gauge", help);
    for (const SnapshotRow& s : cycle.snapshots) {
      if (s.kind != RowKind::kStatistic) continue;
      family.Sample(run + ",statistic=\"" + Label(s.statistic) + "\"", field(s));
    }
  };
  per_statistic("plateau_statistic_value", "The statistic's estimate (a mean, variance, ... by kind).",
                [](const SnapshotRow& s) { return s.value; });
  per_statistic("plateau_statistic_half_width",
                "Half-width of its confidence interval, in the statistic's units.",
                [](const SnapshotRow& s) { return s.half_width; });
  per_statistic("plateau_statistic_relative_half_width", "Half-width over the absolute value.",
                [](const SnapshotRow& s) { return s.relative_half_width; });
  per_statistic("plateau_statistic_integrated_time_samples",
                "Integrated autocorrelation time, in samples.",
                [](const SnapshotRow& s) { return s.integrated_time; });
  per_statistic("plateau_statistic_integral_time_scale",
                "Integral time scale, in the time column's units (simulated time).",
                [](const SnapshotRow& s) { return s.integral_time_scale; });
  per_statistic("plateau_statistic_averaging_time",
                "Simulated time averaged after the warm-up cut.",
                [](const SnapshotRow& s) { return s.averaging_time; });
  per_statistic("plateau_statistic_effective_samples", "Effective sample size.",
                [](const SnapshotRow& s) { return s.effective_samples; });
  per_statistic("plateau_statistic_met", "1 when the statistic meets its target, else 0.",
                [](const SnapshotRow& s) { return s.state == ConvergenceState::kMet ? 1.0 : 0.0; });
  Family samples(out, "plateau_source_samples_total", "counter",
                 "Samples admitted from the source's files.");
  Family bad(out, "plateau_source_bad_lines_total", "counter",
             "Lines of the source's files that were skipped as bad.");
  Family since(out, "plateau_source_seconds_since_last_sample", "gauge",
               "Seconds since the source's newest sample was read.");
  const std::vector<SourceCounters> counters = monitor.Counters();
  for (const SourceCounters& c : counters) {
    const std::string labels = run + ",source=\"" + Label(c.source) + "\"";
    samples.Sample(labels, static_cast<double>(c.samples));
  }
  for (const SourceCounters& c : counters) {
    bad.Sample(run + ",source=\"" + Label(c.source) + "\"", static_cast<double>(c.bad_lines));
  }
  for (const SourceCounters& c : counters) {
    since.Sample(run + ",source=\"" + Label(c.source) + "\"", now - c.last_sample_wall);
  }
  Family groups(out, "plateau_group_met", "gauge",
                "1 when the group is met (every member, and a multivariate group's joint region), "
                "else 0.");
  for (const SnapshotRow& s : cycle.snapshots) {
    if (s.kind == RowKind::kGroup) {
      groups.Sample(run + ",group=\"" + Label(s.statistic) + "\"", s.state == ConvergenceState::kMet ? 1.0 : 0.0);
    }
  }
  Family left(out, "plateau_run_remaining_simulated_time", "gauge",
              "Simulated time still needed for every target (NaN: not predictable yet).");
  left.Sample(run, cycle.remaining_time);
  Family met(out, "plateau_run_met", "gauge", "1 when every target of the run is met, else 0.");
  met.Sample(run, cycle.run_met ? 1.0 : 0.0);
  Family cycles(out, "plateau_evaluation_cycle", "gauge", "Number of the last evaluation cycle.");
  cycles.Sample(run, static_cast<double>(cycle.cycle));
  return out;
}

}  // namespace plateau
