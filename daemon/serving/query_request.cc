#include "daemon/serving/query_request.h"

#include <cmath>

#include "daemon/presentation/json_document.h"

namespace plateau {

Result<QueryRequest> ParseQueryRequest(std::string_view line) {
  const Result<JsonDocument> document = ParseJsonDocument(line);
  if (!document.ok()) return Status::Error("not JSON: " + document.error());
  if (!document->is_object()) {
    return Status::Error("a request is a JSON object such as {\"request\": \"status\"}");
  }
  const auto request = document->find("request");
  if (request == document->end() || !request->is_string()) {
    return Status::Error("a request needs \"request\": one of status, check, events or reload");
  }
  QueryRequest q;
  const std::string name = request->get<std::string>();
  if (name == "status") {
    q.kind = QueryRequest::Kind::kStatus;
  } else if (name == "check") {
    q.kind = QueryRequest::Kind::kCheck;
    if (const auto stat = document->find("stat"); stat != document->end()) {
      if (!stat->is_string()) {
        return Status::Error("\"stat\" must be a statistic's name");
      }
      q.statistic = stat->get<std::string>();
    }
  } else if (name == "events") {
    q.kind = QueryRequest::Kind::kEvents;
    if (const auto after = document->find("after"); after != document->end()) {
      const double number = after->is_number() ? after->get<double>() : -1.0;
      if (number < 0 || number != std::floor(number) || number > 9e15) {
        return Status::Error("\"after\" must be an event id, a whole number from 0");
      }
      q.after = static_cast<std::int64_t>(number);
    }
  } else if (name == "reload") {
    q.kind = QueryRequest::Kind::kReload;
  } else {
    return Status::Error("unknown request '" + name + "'; expected status, check, events or reload");
  }
  return q;
}

}  // namespace plateau
