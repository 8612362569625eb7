// The text of an SMTP conversation, without a socket: reply lines (RFC 5321 4.2), the AUTH PLAIN
// line (RFC 4616, Base64 of RFC 4648 section 4) and the message in Internet Message Format (RFC
// 5322, CRLF line ends, dot-stuffed for DATA per RFC 5321 4.5.2). Pure; stateless.
#ifndef PLATEAU_DAEMON_ALERTS_SMTP_GRAMMAR_H_
#define PLATEAU_DAEMON_ALERTS_SMTP_GRAMMAR_H_

#include <string>
#include <string_view>

#include "config/run_config.h"
#include "daemon/alerts/alert_message.h"

namespace plateau {

// One line of a server's reply, without its CR LF: "250-SIZE 1000" continues, "250 OK" ends.
struct SmtpReplyLine {
  int code = 0;          // 0 when the line does not start with three digits
  bool continues = false;  // a '-' after the code: more lines of the same reply follow
};
SmtpReplyLine ParseSmtpReplyLine(std::string_view line);

// Whether a reply's code is the one a step expects; `expected` 2 accepts any 2xx (RCPT may answer
// 250 or 251).
bool SmtpReplyAccepted(int code, int expected);

std::string Base64(std::string_view bytes);

// "AUTH PLAIN <base64 of NUL user NUL password>" (no CR LF).
std::string SmtpAuthPlainLine(const std::string& username, const std::string& password);

// A Date: header value for the instant `seconds` since the epoch: "Fri, 04 Dec 2026 10:00:00 +0000".
std::string SmtpDate(double seconds);

// The whole DATA payload: headers, the body with CR LF line ends and leading dots doubled, and
// the terminating ".\r\n".
std::string SmtpLetter(const EmailConfig& config, const AlertMessage& message, double now);

}  // namespace plateau

#endif  // PLATEAU_DAEMON_ALERTS_SMTP_GRAMMAR_H_
