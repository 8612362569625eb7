// A parsed JSON document (RFC 8259) for the query socket's requests: null, booleans, numbers,
// strings, arrays and objects, with a depth limit so that hostile input cannot exhaust the stack.
// Plain value once parsed; copied freely between threads.
#ifndef PLATEAU_DAEMON_PRESENTATION_JSON_VALUE_H_
#define PLATEAU_DAEMON_PRESENTATION_JSON_VALUE_H_

#include <optional>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace plateau {

class JsonValue {
 public:
  enum class Type { kNull, kBool, kNumber, kString, kArray, kObject };
  static constexpr int kMaxDepth = 32;

  // Parses one whole document (surrounding white space allowed). nullopt with *error set to
  // "at byte N: what was expected" for anything else.
  static std::optional<JsonValue> Parse(std::string_view text, std::string* error);

  Type type() const { return type_; }
  bool is_object() const { return type_ == Type::kObject; }
  bool boolean() const { return boolean_; }
  double number() const { return number_; }
  const std::string& string() const { return string_; }
  const std::vector<JsonValue>& array() const { return array_; }
  // The member named `key` of an object; nullptr when absent or not an object.
  const JsonValue* Find(std::string_view key) const;
  const std::vector<std::pair<std::string, JsonValue>>& members() const { return members_; }

 private:
  friend class JsonParser;
  Type type_ = Type::kNull;
  bool boolean_ = false;
  double number_ = 0.0;
  std::string string_;
  std::vector<JsonValue> array_;
  std::vector<std::pair<std::string, JsonValue>> members_;
};

}  // namespace plateau

#endif  // PLATEAU_DAEMON_PRESENTATION_JSON_VALUE_H_
