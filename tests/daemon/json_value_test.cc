#include "daemon/presentation/json_value.h"

#include <gtest/gtest.h>

#include "daemon/serving/query_request.h"

namespace plateau {
namespace {

TEST(JsonValue, ParsesTheDocumentsOfTheProtocol) {
  std::string error;
  const auto v = JsonValue::Parse(
      R"( {"request": "events", "after": 12, "list": [1, -2.5e3, true, null],
            "text": "tab\t\"q\" \u00e9 \ud83d\ude00"} )",
      &error);
  ASSERT_TRUE(v) << error;
  EXPECT_EQ(v->Find("request")->string(), "events");
  EXPECT_EQ(v->Find("after")->number(), 12);
  ASSERT_EQ(v->Find("list")->array().size(), 4u);
  EXPECT_EQ(v->Find("list")->array()[1].number(), -2500);
  EXPECT_EQ(v->Find("text")->string(), "tab\t\"q\" \xc3\xa9 \xf0\x9f\x98\x80");
  EXPECT_EQ(v->Find("missing"), nullptr);
}

TEST(JsonValue, MalformedInputSaysWhereAndWhat) {
  std::string error;
  EXPECT_FALSE(JsonValue::Parse(R"({"request" "status"})", &error));
  EXPECT_EQ(error, "at byte 11: expected ':'");
  EXPECT_FALSE(JsonValue::Parse(R"({"a": 1} x)", &error));
  EXPECT_EQ(error, "at byte 9: text after the end of the document");
  EXPECT_FALSE(JsonValue::Parse("\"unterminated", &error));
  EXPECT_FALSE(JsonValue::Parse("+1", &error));
  EXPECT_FALSE(JsonValue::Parse("[1e999]", &error));
  EXPECT_FALSE(JsonValue::Parse("\"a\x01\"", &error));
  EXPECT_FALSE(JsonValue::Parse("", &error));
}

TEST(JsonValue, DeepNestingIsRefusedNotRecursedInto) {
  std::string error;
  EXPECT_FALSE(JsonValue::Parse(std::string(100000, '['), &error));
  EXPECT_EQ(error, "at byte 33: expected less nesting (at most 32 levels)");
  EXPECT_TRUE(JsonValue::Parse(std::string(32, '[') + std::string(32, ']'), &error));
}

TEST(QueryRequest, KnownRequestsAndTheirArguments) {
  std::string error;
  EXPECT_EQ(ParseQueryRequest(R"({"request":"status"})", &error)->kind,
            QueryRequest::Kind::kStatus);
  const auto check = ParseQueryRequest(R"({"request":"check","stat":"tau"})", &error);
  EXPECT_EQ(check->statistic, "tau");
  EXPECT_EQ(ParseQueryRequest(R"({"request":"events","after":41})", &error)->after, 41);
  EXPECT_EQ(ParseQueryRequest(R"({"request":"reload"})", &error)->kind,
            QueryRequest::Kind::kReload);
}

TEST(QueryRequest, WrongRequestsGetAReason) {
  std::string error;
  EXPECT_FALSE(ParseQueryRequest(R"({"request":"stats"})", &error));
  EXPECT_EQ(error, "unknown request 'stats'; expected status, check, events or reload");
  EXPECT_FALSE(ParseQueryRequest("[1]", &error));
  EXPECT_EQ(error, "a request is a JSON object such as {\"request\": \"status\"}");
  EXPECT_FALSE(ParseQueryRequest(R"({"request":"events","after":-1})", &error));
  EXPECT_FALSE(ParseQueryRequest("status", &error));
  EXPECT_EQ(error.substr(0, 9), "not JSON:");
}

}  // namespace
}  // namespace plateau
