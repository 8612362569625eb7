#include "daemon/serving/query_request.h"

#include <cmath>

#include "daemon/presentation/json_value.h"

namespace plateau {

std::optional<QueryRequest> ParseQueryRequest(std::string_view line, std::string* error) {
  std::string parse_error;
  const std::optional<JsonValue> document = JsonValue::Parse(line, &parse_error);
  if (!document) {
    *error = "not JSON: " + parse_error;
    return std::nullopt;
  }
  if (!document->is_object()) {
    *error = "a request is a JSON object such as {\"request\": \"status\"}";
    return std::nullopt;
  }
  const JsonValue* request = document->Find("request");
  if (request == nullptr || request->type() != JsonValue::Type::kString) {
    *error = "a request needs \"request\": one of status, check, events or reload";
    return std::nullopt;
  }
  QueryRequest q;
  const std::string& name = request->string();
  if (name == "status") {
    q.kind = QueryRequest::Kind::kStatus;
  } else if (name == "check") {
    q.kind = QueryRequest::Kind::kCheck;
    if (const JsonValue* stat = document->Find("stat")) {
      if (stat->type() != JsonValue::Type::kString) {
        *error = "\"stat\" must be a statistic's name";
        return std::nullopt;
      }
      q.statistic = stat->string();
    }
  } else if (name == "events") {
    q.kind = QueryRequest::Kind::kEvents;
    if (const JsonValue* after = document->Find("after")) {
      if (after->type() != JsonValue::Type::kNumber || after->number() < 0 ||
          after->number() != std::floor(after->number()) || after->number() > 9e15) {
        *error = "\"after\" must be an event id, a whole number from 0";
        return std::nullopt;
      }
      q.after = static_cast<std::int64_t>(after->number());
    }
  } else if (name == "reload") {
    q.kind = QueryRequest::Kind::kReload;
  } else {
    *error = "unknown request '" + name + "'; expected status, check, events or reload";
    return std::nullopt;
  }
  return q;
}

}  // namespace plateau
