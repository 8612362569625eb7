#include "daemon/presentation/json_writer.h"

#include <charconv>
#include <cmath>
#include <cstdio>

namespace plateau {

void JsonWriter::BeforeValue() {
  if (after_key_) {
    after_key_ = false;
    return;
  }
  if (!first_in_scope_.empty()) {
    if (!first_in_scope_.back()) text_ += ',';
    first_in_scope_.back() = false;
  }
}

void JsonWriter::BeginObject() {
  BeforeValue();
  text_ += '{';
  first_in_scope_.push_back(true);
}

void JsonWriter::EndObject() {
  text_ += '}';
  first_in_scope_.pop_back();
}

void JsonWriter::BeginArray() {
  BeforeValue();
  text_ += '[';
  first_in_scope_.push_back(true);
}

void JsonWriter::EndArray() {
  text_ += ']';
  first_in_scope_.pop_back();
}

void JsonWriter::Key(std::string_view key) {
  BeforeValue();
  AppendQuoted(key);
  text_ += ':';
  after_key_ = true;
}

void JsonWriter::String(std::string_view value) {
  BeforeValue();
  AppendQuoted(value);
}

void JsonWriter::AppendQuoted(std::string_view value) {
  text_ += '"';
  for (const char c : value) {
    switch (c) {
      case '"':
        text_ += "\\\"";
        break;
      case '\\':
        text_ += "\\\\";
        break;
      case '\n':
        text_ += "\\n";
        break;
      case '\t':
        text_ += "\\t";
        break;
      case '\r':
        text_ += "\\r";
        break;
      default:
        if (static_cast<unsigned char>(c) < 0x20) {
          char escaped[8];
          std::snprintf(escaped, sizeof escaped, "\\u%04x", c);
          text_ += escaped;
        } else {
          text_ += c;
        }
    }
  }
  text_ += '"';
}

void JsonWriter::Number(double value) {
  if (!std::isfinite(value)) {
    Null();
    return;
  }
  BeforeValue();
  char buffer[32];
  const auto result = std::to_chars(buffer, buffer + sizeof buffer, value);
  text_.append(buffer, result.ptr);
}

void JsonWriter::Integer(std::int64_t value) {
  BeforeValue();
  text_ += std::to_string(value);
}

void JsonWriter::Bool(bool value) {
  BeforeValue();
  text_ += value ? "true" : "false";
}

void JsonWriter::Raw(std::string_view json) {
  BeforeValue();
  text_ += json;
}

void JsonWriter::Value(const JsonValue& value) {
  switch (value.type()) {
    case JsonValue::Type::kNull:
      Null();
      return;
    case JsonValue::Type::kBool:
      Bool(value.boolean());
      return;
    case JsonValue::Type::kNumber:
      Number(value.number());
      return;
    case JsonValue::Type::kString:
      String(value.string());
      return;
    case JsonValue::Type::kArray:
      BeginArray();
      for (const JsonValue& item : value.array()) Value(item);
      EndArray();
      return;
    case JsonValue::Type::kObject:
      BeginObject();
      for (const auto& [key, member] : value.members()) {
        Key(key);
        Value(member);
      }
      EndObject();
      return;
  }
}

void JsonWriter::Null() {
  BeforeValue();
  text_ += "null";
}

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
  Integer(static_cast<std::int64_t>(value));
}

void JsonWriter::Field(std::string_view key, bool value) {
  Key(key);
  Bool(value);
}

}  // namespace plateau
