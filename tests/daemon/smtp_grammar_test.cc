// The SMTP conversation's text without a socket (daemon/alerts/smtp_grammar.h).
#include "daemon/alerts/smtp_grammar.h"

#include <gtest/gtest.h>

namespace plateau {
namespace {

TEST(SmtpGrammar, ReplyLinesGiveTheirCodeAndWhetherMoreFollow) {
  // RFC 5321 4.2.1: "250-" continues a multi-line reply, "250 " (or a bare "250") ends it.
  EXPECT_EQ(ParseSmtpReplyLine("250-mail.example.org Hello").code, 250);
  EXPECT_TRUE(ParseSmtpReplyLine("250-mail.example.org Hello").continues);
  EXPECT_FALSE(ParseSmtpReplyLine("250 SMTPUTF8").continues);
  EXPECT_FALSE(ParseSmtpReplyLine("221").continues);
  EXPECT_EQ(ParseSmtpReplyLine("221").code, 221);
  // Not a reply: no code, and nothing that would read as a continuation.
  EXPECT_EQ(ParseSmtpReplyLine("25").code, 0);
  EXPECT_EQ(ParseSmtpReplyLine("2x0 odd").code, 0);
  EXPECT_EQ(ParseSmtpReplyLine("").code, 0);
}

TEST(SmtpGrammar, AStepAcceptsItsCodeOrAny2xxWhenAskedFor2) {
  EXPECT_TRUE(SmtpReplyAccepted(354, 354));
  EXPECT_FALSE(SmtpReplyAccepted(250, 354));
  EXPECT_TRUE(SmtpReplyAccepted(251, 2));  // RCPT: "user not local; will forward"
  EXPECT_FALSE(SmtpReplyAccepted(550, 2));
  EXPECT_FALSE(SmtpReplyAccepted(0, 2));
}

TEST(SmtpGrammar, Base64MatchesTheRfc4648TestVectors) {
  // RFC 4648 section 10.
  EXPECT_EQ(Base64(""), "");
  EXPECT_EQ(Base64("f"), "Zg==");
  EXPECT_EQ(Base64("fo"), "Zm8=");
  EXPECT_EQ(Base64("foo"), "Zm9v");
  EXPECT_EQ(Base64("foob"), "Zm9vYg==");
  EXPECT_EQ(Base64("fooba"), "Zm9vYmE=");
  EXPECT_EQ(Base64("foobar"), "Zm9vYmFy");
  EXPECT_EQ(Base64("\xff\xfe"), "//4=");
}

TEST(SmtpGrammar, AuthPlainIsTheRfc4616Example) {
  // RFC 4616 section 4: authorization identity empty, user "tim", password "tanstaaftanstaaf".
  EXPECT_EQ(SmtpAuthPlainLine("tim", "tanstaaftanstaaf"), "AUTH PLAIN AHRpbQB0YW5zdGFhZnRhbnN0YWFm");
}

TEST(SmtpGrammar, DateIsRfc5322InUtc) {
  EXPECT_EQ(SmtpDate(0), "Thu, 01 Jan 1970 00:00:00 +0000");
  // Python's email.utils.formatdate(1796472000, usegmt=True): "Sat, 05 Dec 2026 12:00:00 GMT".
  EXPECT_EQ(SmtpDate(1796472000), "Sat, 05 Dec 2026 12:00:00 +0000");
}

TEST(SmtpGrammar, TheLetterHasCrLfLinesStuffedDotsAndTheEndMarker) {
  EmailConfig config;
  config.from = "plateau@cluster.invalid";
  config.to = {"a@lab.invalid", "b@lab.invalid"};
  AlertMessage m;
  m.subject = "[plateau] run-7: every target met, the solver can stop";
  m.body = "first line\n.a line that starts with a dot\n\nlast\n";
  const std::string letter = SmtpLetter(config, m, 0);
  EXPECT_EQ(letter,
            "From: plateau@cluster.invalid\r\n"
            "To: a@lab.invalid, b@lab.invalid\r\n"
            "Subject: [plateau] run-7: every target met, the solver can stop\r\n"
            "Date: Thu, 01 Jan 1970 00:00:00 +0000\r\n"
            "MIME-Version: 1.0\r\n"
            "Content-Type: text/plain; charset=utf-8\r\n"
            "Content-Transfer-Encoding: 8bit\r\n"
            "\r\n"
            "first line\r\n"
            "..a line that starts with a dot\r\n"  // RFC 5321 4.5.2
            "\r\n"
            "last\r\n"
            ".\r\n");
}

}  // namespace
}  // namespace plateau
