#include "daemon/serving/query_request.h"

#include <cmath>

#include "daemon/presentation/json_document.h"

namespace plateau {

std::optional<QueryRequest> ParseQueryRequest(std::string_view line, std::string* error) {
  std::string parse_error;
  const std::optional<JsonDocument> document = ParseJsonDocument(line, &parse_error);
  if (!document) {
    *error = "not JSON: " + parse_error;
    return std::nullopt;
  }
  if (!document->is_object()) {
    *error = "a request is a JSON object such as {\"request\": \"status\"}";
    return std::nullopt;
  }
  const auto request = document->find("request");
  if (request == document->end() || !request->is_string()) {
    *error = "a request needs \"request\": one of status, check, events or reload";
    return std::nullopt;
  }
  QueryRequest q;
  const std::string name = request->get<std::string>();
  if (name == "status") {
    q.kind = QueryRequest::Kind::kStatus;
  } else if (name == "check") {
    q.kind = QueryRequest::Kind::kCheck;
    if (const auto stat = document->find("stat"); stat != document->end()) {
      if (!stat->is_string()) {
        *error = "\"stat\" must be a statistic's name";
        return std::nullopt;
      }
      q.statistic = stat->get<std::string>();
    }
  } else if (name == "events") {
    q.kind = QueryRequest::Kind::kEvents;
    if (const auto after = document->find("after"); after != document->end()) {
      const double number = after->is_number() ? after->get<double>() : -1.0;
      if (number < 0 || number != std::floor(number) || number > 9e15) {
        *error = "\"after\" must be an event id, a whole number from 0";
        return std::nullopt;
      }
      q.after = static_cast<std::int64_t>(number);
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
