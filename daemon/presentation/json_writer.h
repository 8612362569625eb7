// Builds one JSON document as text: objects, arrays, strings with escaping, numbers in shortest
// round-trip form, NaN and infinities as null (JSON has no such numbers; scripts read null as
// "no value"). Not thread-safe; one writer per document.
#ifndef PLATEAU_DAEMON_PRESENTATION_JSON_WRITER_H_
#define PLATEAU_DAEMON_PRESENTATION_JSON_WRITER_H_

#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

#include "daemon/presentation/json_value.h"

namespace plateau {

class JsonWriter {
 public:
  void BeginObject();
  void EndObject();
  void BeginArray();
  void EndArray();
  // Inside an object: the key of the next value.
  void Key(std::string_view key);
  void String(std::string_view value);
  void Number(double value);
  void Integer(std::int64_t value);
  void Bool(bool value);
  void Null();
  // A value that is already a JSON document (e.g. an object read back from the store).
  void Raw(std::string_view json);
  // A parsed document written back, members in their order.
  void Value(const JsonValue& value);

  // Shorthands for a key and its value.
  void Field(std::string_view key, std::string_view value);
  void Field(std::string_view key, const char* value) { Field(key, std::string_view(value)); }
  void Field(std::string_view key, double value);
  void Field(std::string_view key, std::int64_t value);
  void Field(std::string_view key, std::uint64_t value);
  void Field(std::string_view key, int value) { Field(key, static_cast<std::int64_t>(value)); }
  void Field(std::string_view key, bool value);

  const std::string& text() const { return text_; }

 private:
  void BeforeValue();
  void AppendQuoted(std::string_view value);

  std::string text_;
  std::vector<bool> first_in_scope_;
  bool after_key_ = false;
};

}  // namespace plateau

#endif  // PLATEAU_DAEMON_PRESENTATION_JSON_WRITER_H_
