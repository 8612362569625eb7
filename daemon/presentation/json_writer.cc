#include "daemon/presentation/json_writer.h"

#include <cmath>

namespace plateau {

// A container's members are only added while it is the innermost open one, so the pointers to
// its open ancestors stay valid.
JsonDocument& JsonWriter::Put(JsonDocument value) {
  if (open_.empty()) {
    root_ = std::move(value);
    return root_;
  }
  JsonDocument& container = *open_.back();
  if (container.is_array()) {
    container.push_back(std::move(value));
    return container.back();
  }
  JsonDocument& member = container[key_];
  member = std::move(value);
  return member;
}

void JsonWriter::BeginObject() { open_.push_back(&Put(JsonDocument::object())); }
void JsonWriter::EndObject() { open_.pop_back(); }
void JsonWriter::BeginArray() { open_.push_back(&Put(JsonDocument::array())); }
void JsonWriter::EndArray() { open_.pop_back(); }
void JsonWriter::Key(std::string_view key) { key_ = key; }
void JsonWriter::String(std::string_view value) { Put(std::string(value)); }
void JsonWriter::Number(double value) {
  if (std::isfinite(value)) {
    Put(value);
  } else {
    Put(nullptr);
  }
}
void JsonWriter::Integer(std::int64_t value) { Put(value); }
void JsonWriter::Bool(bool value) { Put(value); }
void JsonWriter::Null() { Put(nullptr); }
void JsonWriter::Value(const JsonDocument& value) { Put(value); }

void JsonWriter::Field(std::string_view key, std::string_view value) {
  Key(key);
  String(value);
}
void JsonWriter::Field(std::string_view key, double value) {
  Key(key);
  Number(value);
}
void JsonWriter::Field(std::string_view key, std::int64_t value) {
  Key(key);
  Integer(value);
}
void JsonWriter::Field(std::string_view key, std::uint64_t value) {
  Key(key);
  Put(value);
}
void JsonWriter::Field(std::string_view key, bool value) {
  Key(key);
  Bool(value);
}

}  // namespace plateau
