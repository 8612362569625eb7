// JSON through nlohmann-json: the document type (members keep the order they were written in, so
// that scripts and people see the keys as documented), its text, and parsing with a depth limit
// and an error that says where. Stateless; safe from any thread.
#ifndef PLATEAU_DAEMON_PRESENTATION_JSON_DOCUMENT_H_
#define PLATEAU_DAEMON_PRESENTATION_JSON_DOCUMENT_H_

#include <nlohmann/json.hpp>

#include <optional>
#include <string>
#include <string_view>

#include "core/result.h"

namespace plateau {

using JsonDocument = nlohmann::ordered_json;

// Documents nest at most this deep: hostile input on the query socket cannot make a deep tree.
constexpr int kJsonMaxDepth = 32;

// One line, no spaces; bytes that are not UTF-8 (a file name in Latin-1) become U+FFFD.
std::string JsonText(const JsonDocument& document);

// One whole document (surrounding white space allowed); for anything else an error
// "at byte N: what went wrong".
Result<JsonDocument> ParseJsonDocument(std::string_view text);

// The member `key` of an object; nullptr when absent or `object` is not an object.
const JsonDocument* FindMember(const JsonDocument& object, std::string_view key);

// The member `key` of an object, or null when absent or `object` is not an object.
const JsonDocument& MemberOr(const JsonDocument& object, std::string_view key);

// A member's number (NaN when absent, null or not a number) or string (empty likewise).
double NumberOr(const JsonDocument& object, const char* key);
std::string TextOr(const JsonDocument& object, const char* key);

}  // namespace plateau

#endif  // PLATEAU_DAEMON_PRESENTATION_JSON_DOCUMENT_H_
