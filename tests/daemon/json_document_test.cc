// JSON through nlohmann-json (daemon/presentation/json_document.h, json_writer.h) and the query
// socket's requests parsed with it (daemon/serving/query_request.h).
#include "daemon/presentation/json_document.h"

#include <gtest/gtest.h>

#include <limits>

#include "daemon/presentation/json_writer.h"
#include "daemon/serving/query_request.h"

namespace plateau {
namespace {

// Whether `text` parses; *error gets the refusal's message (empty when it parsed).
bool JsonParses(std::string_view text, std::string* error) {
  const Result<JsonDocument> parsed = ParseJsonDocument(text);
  *error = parsed.error();
  return parsed.ok();
}

bool RequestParses(std::string_view line, std::string* error) {
  const Result<QueryRequest> parsed = ParseQueryRequest(line);
  *error = parsed.error();
  return parsed.ok();
}

TEST(JsonDocument, ParsesTheDocumentsOfTheProtocol) {
  const auto v = ParseJsonDocument(
      R"( {"request": "events", "after": 12, "list": [1, -2.5e3, true, null],
            "text": "tab\t\"q\" \u00e9 \ud83d\ude00"} )");
  ASSERT_TRUE(v.ok()) << v.error();
  EXPECT_EQ(TextOr(*v, "request"), "events");
  EXPECT_EQ(NumberOr(*v, "after"), 12);
  ASSERT_EQ(v->at("list").size(), 4u);
  EXPECT_EQ(v->at("list")[1].get<double>(), -2500);
  EXPECT_EQ(TextOr(*v, "text"), "tab\t\"q\" \xc3\xa9 \xf0\x9f\x98\x80");
  EXPECT_EQ(FindMember(*v, "missing"), nullptr);
  EXPECT_TRUE(std::isnan(NumberOr(*v, "request")));  // a string is not a number
}

TEST(JsonDocument, MalformedInputSaysWhereAndWhat) {
  std::string error;
  // nlohmann-json counts to the end of the token it did not expect: the string "status".
  EXPECT_FALSE(JsonParses(R"({"request" "status"})", &error));
  EXPECT_EQ(error.substr(0, 12), "at byte 19: ") << error;
  EXPECT_NE(error.find("expected ':'"), std::string::npos) << error;
  EXPECT_FALSE(JsonParses(R"({"a": 1} x)", &error));
  EXPECT_EQ(error.substr(0, 11), "at byte 10:") << error;
  EXPECT_NE(error.find("end of input"), std::string::npos) << error;
  EXPECT_FALSE(JsonParses("\"unterminated", &error));
  EXPECT_FALSE(JsonParses("+1", &error));
  EXPECT_FALSE(JsonParses("[1e999]", &error));
  EXPECT_FALSE(JsonParses("\"a\x01\"", &error));
  EXPECT_FALSE(JsonParses("", &error));
}

TEST(JsonDocument, DeepNestingIsRefusedNotBuilt) {
  std::string error;
  EXPECT_FALSE(JsonParses(std::string(100000, '['), &error));
  EXPECT_EQ(error, "more than 32 levels of nesting");
  EXPECT_TRUE(JsonParses(std::string(32, '[') + std::string(32, ']'), &error)) << error;
  EXPECT_FALSE(JsonParses(std::string(33, '[') + std::string(33, ']'), &error));
}

TEST(JsonDocument, TheWriterKeepsTheOrderWrittenAndWritesNoNumberJsonLacks) {
  JsonWriter json;
  json.BeginObject();
  json.Field("zeta", 1);
  json.Field("alpha", std::numeric_limits<double>::quiet_NaN());
  json.Key("list");
  json.BeginArray();
  json.Number(std::numeric_limits<double>::infinity());
  json.String("caf\xe9");  // Latin-1, not UTF-8: replaced, not a failure
  json.BeginObject();
  json.Field("deep", true);
  json.EndObject();
  json.EndArray();
  json.Field("after", 0.1);
  json.EndObject();
  EXPECT_EQ(json.text(),
            "{\"zeta\":1,\"alpha\":null,\"list\":[null,\"caf\xef\xbf\xbd\",{\"deep\":true}],"
            "\"after\":0.1}");
}

TEST(QueryRequest, KnownRequestsAndTheirArguments) {
  EXPECT_EQ(ParseQueryRequest(R"({"request":"status"})")->kind, QueryRequest::Kind::kStatus);
  const auto check = ParseQueryRequest(R"({"request":"check","stat":"tau"})");
  EXPECT_EQ(check->statistic, "tau");
  EXPECT_EQ(ParseQueryRequest(R"({"request":"events","after":41})")->after, 41);
  EXPECT_EQ(ParseQueryRequest(R"({"request":"reload"})")->kind, QueryRequest::Kind::kReload);
}

TEST(QueryRequest, WrongRequestsGetAReason) {
  std::string error;
  EXPECT_FALSE(RequestParses(R"({"request":"stats"})", &error));
  EXPECT_EQ(error, "unknown request 'stats'; expected status, check, events or reload");
  EXPECT_FALSE(RequestParses("[1]", &error));
  EXPECT_EQ(error, "a request is a JSON object such as {\"request\": \"status\"}");
  EXPECT_FALSE(RequestParses(R"({"request":"events","after":-1})", &error));
  EXPECT_FALSE(RequestParses("status", &error));
  EXPECT_EQ(error.substr(0, 9), "not JSON:");
}

}  // namespace
}  // namespace plateau
