#include "daemon/presentation/json_document.h"

#include <limits>

namespace plateau {
namespace {

struct TooDeep {
  std::size_t byte;
};

}  // namespace

std::string JsonText(const JsonDocument& document) {
  return document.dump(-1, ' ', false, nlohmann::detail::error_handler_t::replace);
}

Result<JsonDocument> ParseJsonDocument(std::string_view text) {
  // The callback sees each value as it opens; a container past the limit stops the parse before
  // anything deeper is built.
  const auto limit_depth = [](int depth, JsonDocument::parse_event_t event, JsonDocument&) {
    if ((event == JsonDocument::parse_event_t::object_start ||
         event == JsonDocument::parse_event_t::array_start) &&
        depth >= kJsonMaxDepth) {
      throw TooDeep{};
    }
    return true;
  };
  try {
    return JsonDocument::parse(text.begin(), text.end(), limit_depth);
  } catch (const TooDeep&) {
    return Status::Error("more than " + std::to_string(kJsonMaxDepth) + " levels of nesting");
  } catch (const JsonDocument::parse_error& e) {
    // what(): "[json.exception.parse_error.101] parse error at line 1, column 12: ..."
    const std::string what = e.what();
    const std::size_t colon = what.find(": ");
    return Status::Error("at byte " + std::to_string(e.byte) + ": " +
                         (colon == std::string::npos ? what : what.substr(colon + 2)));
  } catch (const JsonDocument::exception& e) {
    return Status::Error(e.what());
  }
}

const JsonDocument* FindMember(const JsonDocument& object, std::string_view key) {
  if (!object.is_object()) return nullptr;
  const auto it = object.find(key);
  return it == object.end() ? nullptr : &*it;
}

const JsonDocument& MemberOr(const JsonDocument& object, std::string_view key) {
  static const JsonDocument kNull;
  const JsonDocument* member = FindMember(object, key);
  return member != nullptr ? *member : kNull;
}

double NumberOr(const JsonDocument& object, const char* key) {
  if (!object.is_object()) return std::numeric_limits<double>::quiet_NaN();
  const auto it = object.find(key);
  return it != object.end() && it->is_number() ? it->get<double>()
                                               : std::numeric_limits<double>::quiet_NaN();
}

std::string TextOr(const JsonDocument& object, const char* key) {
  if (!object.is_object()) return "";
  const auto it = object.find(key);
  return it != object.end() && it->is_string() ? it->get<std::string>() : "";
}

}  // namespace plateau
