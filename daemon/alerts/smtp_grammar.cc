#include "daemon/alerts/smtp_grammar.h"

#include "daemon/presentation/number_format.h"

namespace plateau {

SmtpReplyLine ParseSmtpReplyLine(std::string_view line) {
  SmtpReplyLine reply;
  if (line.size() < 3) return reply;
  int code = 0;
  for (std::size_t i = 0; i < 3; ++i) {
    if (line[i] < '0' || line[i] > '9') return reply;
    code = code * 10 + (line[i] - '0');
  }
  reply.code = code;
  reply.continues = line.size() > 3 && line[3] == '-';
  return reply;
}

bool SmtpReplyAccepted(int code, int expected) {
  return expected == 2 ? code / 100 == 2 : code == expected;
}

std::string Base64(std::string_view bytes) {
  static constexpr char kAlphabet[] =
      "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/";
  std::string out;
  std::size_t i = 0;
  const auto byte = [&](std::size_t k) { return static_cast<unsigned>(static_cast<unsigned char>(bytes[k])); };
  for (; i + 2 < bytes.size(); i += 3) {
    const unsigned n = (byte(i) << 16) | (byte(i + 1) << 8) | byte(i + 2);
    out += {kAlphabet[n >> 18], kAlphabet[(n >> 12) & 63], kAlphabet[(n >> 6) & 63], kAlphabet[n & 63]};
  }
  if (i + 1 == bytes.size()) {
    const unsigned n = byte(i) << 16;
    out += {kAlphabet[n >> 18], kAlphabet[(n >> 12) & 63], '=', '='};
  } else if (i + 2 == bytes.size()) {
    const unsigned n = (byte(i) << 16) | (byte(i + 1) << 8);
    out += {kAlphabet[n >> 18], kAlphabet[(n >> 12) & 63], kAlphabet[(n >> 6) & 63], '='};
  }
  return out;
}

std::string SmtpAuthPlainLine(const std::string& username, const std::string& password) {
  return "AUTH PLAIN " + Base64(std::string(1, '\0') + username + '\0' + password);
}

std::string SmtpDate(double seconds) {
  return FormatWallTime(seconds, "%a, %d %b %Y %H:%M:%S +0000");
}

std::string SmtpLetter(const EmailConfig& config, const AlertMessage& m, double now) {
  std::string to;
  for (const std::string& r : config.to) to += (to.empty() ? "" : ", ") + r;
  std::string text = "From: " + config.from + "\r\nTo: " + to + "\r\nSubject: " + m.subject +
                     "\r\nDate: " + SmtpDate(now) +
                     "\r\nMIME-Version: 1.0\r\nContent-Type: text/plain; charset=utf-8\r\n"
                     "Content-Transfer-Encoding: 8bit\r\n\r\n";
  std::size_t start = 0;
  while (start < m.body.size()) {
    std::size_t end = m.body.find('\n', start);
    if (end == std::string::npos) end = m.body.size();
    std::string line = m.body.substr(start, end - start);
    if (!line.empty() && line[0] == '.') line.insert(0, 1, '.');
    text += line + "\r\n";
    start = end + 1;
  }
  return text + ".\r\n";
}

}  // namespace plateau
