// Sends one alert by SMTP (RFC 5321) with Boost.Asio on the daemon's event loop: EHLO, optional
// STARTTLS (RFC 3207, Boost.Asio SSL, the server's certificate verified against the system's or a
// given CA file), optional AUTH PLAIN (RFC 4616), MAIL, RCPT for each recipient, DATA, QUIT. The
// whole conversation has one deadline. The password is read when sending and never logged.
// Runs as a coroutine on the given io_context; the callback runs on that context's thread.
#ifndef PLATEAU_DAEMON_ALERTS_SMTP_CLIENT_H_
#define PLATEAU_DAEMON_ALERTS_SMTP_CLIENT_H_

#include <utility>  // before Asio: Boost 1.74's Asio in C++20 mode needs it

#include <boost/asio.hpp>

#include <functional>

#include "config/run_config.h"
#include "core/result.h"
#include "daemon/alerts/alert_message.h"

namespace plateau {

// Starts the conversation; `done` gets ok, or a message that names the server and the step
// ("smtp localhost:2525: RCPT TO <a@x>: 550 no such user").
void SendAlertMail(boost::asio::io_context& io, const EmailConfig& config,
                   const AlertMessage& message, std::function<void(Status)> done);

// The password named by the config: the first line of password_file, or password_env's value.
// An error when it cannot be had; empty when the config names neither.
Result<std::string> SmtpPassword(const EmailConfig& config);

}  // namespace plateau

#endif  // PLATEAU_DAEMON_ALERTS_SMTP_CLIENT_H_
