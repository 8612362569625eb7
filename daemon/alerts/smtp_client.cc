#include "daemon/alerts/smtp_client.h"

#include <boost/asio/ssl.hpp>

#include "daemon/alerts/smtp_grammar.h"
#include "daemon/runtime/wall_clock.h"

#include <chrono>
#include <cstdlib>
#include <fstream>
#include <memory>
#include <optional>
#include <stdexcept>

namespace plateau {
namespace {

namespace asio = boost::asio;
using asio::ip::tcp;

// A failed step of the conversation, with what the server said.
struct SmtpError : std::runtime_error {
  using std::runtime_error::runtime_error;
};

class Conversation : public std::enable_shared_from_this<Conversation> {
 public:
  Conversation(asio::io_context& io, EmailConfig config, AlertMessage message,
               std::function<void(Status)> done)
      : io_(io),
        config_(std::move(config)),
        message_(std::move(message)),
        done_(std::move(done)),
        socket_(io),
        deadline_(io),
        tls_context_(asio::ssl::context::tls_client) {}

  void Start() {
    deadline_.expires_after(std::chrono::duration_cast<std::chrono::steady_clock::duration>(
        std::chrono::duration<double>(config_.timeout)));
    deadline_.async_wait([self = shared_from_this()](const boost::system::error_code& error) {
      if (!error) {
        self->timed_out_ = true;
        boost::system::error_code ignored;
        self->socket_.close(ignored);
      }
    });
    asio::co_spawn(io_, Talk(), [self = shared_from_this()](const std::exception_ptr& failure) {
      self->deadline_.cancel();
      self->done_(self->Outcome(failure));
    });
  }

 private:
  std::string Where() const { return "smtp " + config_.host + ":" + std::to_string(config_.port); }

  Status Outcome(const std::exception_ptr& failure) const {
    if (!failure) return Status::Ok();
    try {
      std::rethrow_exception(failure);
    } catch (const SmtpError& e) {
      return Status::Error(Where() + ": " + e.what());
    } catch (const std::exception& e) {
      return Status::Error(Where() + ": " + (timed_out_ ? "no answer within the timeout during " +
                                                              step_
                                                        : step_ + ": " + e.what()));
    }
    return Status::Error(Where() + ": failed");
  }

  asio::awaitable<void> Write(const std::string& text) {
    if (tls_) {
      co_await asio::async_write(*tls_, asio::buffer(text), asio::use_awaitable);
    } else {
      co_await asio::async_write(socket_, asio::buffer(text), asio::use_awaitable);
    }
  }

  // One reply, multi-line ("250-...") included; throws SmtpError unless its code is `expected`
  // (or, with expected 2, any 2xx).
  asio::awaitable<std::string> Expect(int expected) {
    std::string reply;
    SmtpReplyLine parsed;
    while (true) {
      std::size_t n = 0;
      if (tls_) {
        n = co_await asio::async_read_until(*tls_, buffer_, "\r\n", asio::use_awaitable);
      } else {
        n = co_await asio::async_read_until(socket_, buffer_, "\r\n", asio::use_awaitable);
      }
      std::string line(asio::buffers_begin(buffer_.data()),
                       asio::buffers_begin(buffer_.data()) + static_cast<std::ptrdiff_t>(n));
      buffer_.consume(n);
      while (!line.empty() && (line.back() == '\n' || line.back() == '\r')) line.pop_back();
      reply += (reply.empty() ? "" : " / ") + line;
      parsed = ParseSmtpReplyLine(line);
      if (!parsed.continues) break;
    }
    if (!SmtpReplyAccepted(parsed.code, expected)) throw SmtpError(step_ + ": " + reply);
    co_return reply;
  }

  asio::awaitable<void> Command(const std::string& step, const std::string& line, int expected) {
    step_ = step;
    co_await Write(line + "\r\n");
    co_await Expect(expected);
  }

  asio::awaitable<void> StartTls() {
    co_await Command("STARTTLS", "STARTTLS", 220);
    step_ = "TLS handshake";
    if (config_.ca_file.empty()) {
      tls_context_.set_default_verify_paths();
    } else {
      tls_context_.load_verify_file(config_.ca_file);
    }
    tls_context_.set_verify_mode(asio::ssl::verify_peer);
    tls_.emplace(socket_, tls_context_);
    tls_->set_verify_callback(asio::ssl::host_name_verification(config_.host));
    SSL_set_tlsext_host_name(tls_->native_handle(), config_.host.c_str());
    co_await tls_->async_handshake(asio::ssl::stream_base::client, asio::use_awaitable);
    co_await Command("EHLO after STARTTLS", "EHLO plateau", 250);
  }

  asio::awaitable<void> Talk() {
    std::string password;
    if (!config_.username.empty()) {
      Result<std::string> read = SmtpPassword(config_);
      if (!read.ok()) throw SmtpError(read.error());
      password = std::move(read).value();
    }
    step_ = "connect";
    tcp::resolver resolver(io_);
    const auto endpoints = co_await resolver.async_resolve(
        config_.host, std::to_string(config_.port), asio::use_awaitable);
    co_await asio::async_connect(socket_, endpoints, asio::use_awaitable);
    step_ = "greeting";
    co_await Expect(220);
    co_await Command("EHLO", "EHLO plateau", 250);
    if (config_.starttls) co_await StartTls();
    if (!config_.username.empty()) {
      // The password goes only into this line, which is never logged.
      co_await Command("AUTH PLAIN", SmtpAuthPlainLine(config_.username, password), 235);
    }
    co_await Command("MAIL FROM", "MAIL FROM:<" + config_.from + ">", 250);
    for (const std::string& r : config_.to) {
      co_await Command("RCPT TO <" + r + ">", "RCPT TO:<" + r + ">", 2);
    }
    co_await Command("DATA", "DATA", 354);
    step_ = "message";
    co_await Write(SmtpLetter(config_, message_, WallSeconds()));
    co_await Expect(250);
    co_await Command("QUIT", "QUIT", 221);
  }

  asio::io_context& io_;
  EmailConfig config_;
  AlertMessage message_;
  std::function<void(Status)> done_;
  tcp::socket socket_;
  asio::steady_timer deadline_;
  asio::ssl::context tls_context_;
  std::optional<asio::ssl::stream<tcp::socket&>> tls_;
  asio::streambuf buffer_;
  std::string step_ = "connect";
  bool timed_out_ = false;
};

}  // namespace

Result<std::string> SmtpPassword(const EmailConfig& config) {
  if (!config.password_file.empty()) {
    std::ifstream in(config.password_file);
    std::string line;
    if (!in || !std::getline(in, line)) {
      return Status::Error("cannot read the password file " + config.password_file);
    }
    return line;
  }
  if (!config.password_env.empty()) {
    const char* value = std::getenv(config.password_env.c_str());
    if (value == nullptr) {
      return Status::Error("the environment variable " + config.password_env + " is not set");
    }
    return std::string(value);
  }
  return std::string();
}

void SendAlertMail(asio::io_context& io, const EmailConfig& config, const AlertMessage& message,
                   std::function<void(Status)> done) {
  std::make_shared<Conversation>(io, config, message, std::move(done))->Start();
}

}  // namespace plateau
