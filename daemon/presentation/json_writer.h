// Writes one JSON document in reading order (begin an object, a key, its value, ...) into an
// nlohmann-json document whose members keep that order; NaN and infinities become null (JSON has
// no such numbers; scripts read null as "no value"). Not thread-safe; one writer per document.
#ifndef PLATEAU_DAEMON_PRESENTATION_JSON_WRITER_H_
#define PLATEAU_DAEMON_PRESENTATION_JSON_WRITER_H_

#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

#include "daemon/presentation/json_document.h"

namespace plateau {

// Holds a document: why the next line is exempt is said at SnapshotRow (store/run_store.h).
// NOLINTNEXTLINE(bugprone-exception-escape)
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
  // A document built elsewhere (a statistic's object of the cycle).
  void Value(const JsonDocument& value);

  // Shorthands for a key and its value.
  void Field(std::string_view key, std::string_view value);
  void Field(std::string_view key, const char* value) { Field(key, std::string_view(value)); }
  void Field(std::string_view key, double value);
  void Field(std::string_view key, std::int64_t value);
  void Field(std::string_view key, std::uint64_t value);
  void Field(std::string_view key, int value) { Field(key, static_cast<std::int64_t>(value)); }
  void Field(std::string_view key, bool value);

  // The document written so far (complete once every Begin has its End).
  const JsonDocument& document() const { return root_; }
  JsonDocument TakeDocument() { return std::move(root_); }
  std::string text() const { return JsonText(root_); }

 private:
  // Places `value` where the next value goes; returns it there.
  JsonDocument& Put(JsonDocument value);

  JsonDocument root_;
  std::vector<JsonDocument*> open_;  // the containers being written, innermost last
  std::string key_;
};

}  // namespace plateau

#endif  // PLATEAU_DAEMON_PRESENTATION_JSON_WRITER_H_
