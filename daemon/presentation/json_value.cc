#include "daemon/presentation/json_value.h"

#include <charconv>
#include <cmath>

namespace plateau {

// Recursive descent over the text, one function per grammar rule of RFC 8259.
class JsonParser {
 public:
  explicit JsonParser(std::string_view text) : text_(text) {}

  std::optional<JsonValue> Document(std::string* error) {
    JsonValue value;
    SkipSpace();
    if (!Value(value, 0)) {
      *error = error_;
      return std::nullopt;
    }
    SkipSpace();
    if (pos_ != text_.size()) {
      *error = "at byte " + std::to_string(pos_) + ": text after the end of the document";
      return std::nullopt;
    }
    return value;
  }

 private:
  bool Fail(const std::string& expected) {
    if (error_.empty()) error_ = "at byte " + std::to_string(pos_) + ": expected " + expected;
    return false;
  }
  void SkipSpace() {
    while (pos_ < text_.size() && (text_[pos_] == ' ' || text_[pos_] == '\t' ||
                                   text_[pos_] == '\n' || text_[pos_] == '\r')) {
      ++pos_;
    }
  }
  bool Literal(std::string_view word) {
    if (text_.substr(pos_, word.size()) != word) return Fail(std::string(word));
    pos_ += word.size();
    return true;
  }

  bool Value(JsonValue& v, int depth) {
    if (depth > JsonValue::kMaxDepth) return Fail("less nesting (at most 32 levels)");
    if (pos_ >= text_.size()) return Fail("a value");
    switch (text_[pos_]) {
      case '{':
        return Object(v, depth);
      case '[':
        return Array(v, depth);
      case '"':
        v.type_ = JsonValue::Type::kString;
        return String(v.string_);
      case 't':
        v.type_ = JsonValue::Type::kBool;
        v.boolean_ = true;
        return Literal("true");
      case 'f':
        v.type_ = JsonValue::Type::kBool;
        return Literal("false");
      case 'n':
        return Literal("null");
      default:
        return Number(v);
    }
  }

  bool Number(JsonValue& v) {
    const char* begin = text_.data() + pos_;
    const char* end = text_.data() + text_.size();
    if (begin < end && *begin == '+') return Fail("a value");  // JSON has no leading '+'
    double number = 0.0;
    const auto [ptr, ec] = std::from_chars(begin, end, number);
    if (ec != std::errc() || ptr == begin || !std::isfinite(number)) return Fail("a value");
    v.type_ = JsonValue::Type::kNumber;
    v.number_ = number;
    pos_ += static_cast<std::size_t>(ptr - begin);
    return true;
  }

  bool Hex4(unsigned* code) {
    if (pos_ + 4 > text_.size()) return Fail("four hex digits");
    const auto [ptr, ec] = std::from_chars(text_.data() + pos_, text_.data() + pos_ + 4, *code, 16);
    if (ec != std::errc() || ptr != text_.data() + pos_ + 4) return Fail("four hex digits");
    pos_ += 4;
    return true;
  }

  static void AppendUtf8(unsigned code, std::string& out) {
    if (code < 0x80) {
      out += static_cast<char>(code);
    } else if (code < 0x800) {
      out += static_cast<char>(0xC0 | (code >> 6));
      out += static_cast<char>(0x80 | (code & 0x3F));
    } else if (code < 0x10000) {
      out += static_cast<char>(0xE0 | (code >> 12));
      out += static_cast<char>(0x80 | ((code >> 6) & 0x3F));
      out += static_cast<char>(0x80 | (code & 0x3F));
    } else {
      out += static_cast<char>(0xF0 | (code >> 18));
      out += static_cast<char>(0x80 | ((code >> 12) & 0x3F));
      out += static_cast<char>(0x80 | ((code >> 6) & 0x3F));
      out += static_cast<char>(0x80 | (code & 0x3F));
    }
  }

  bool String(std::string& out) {
    ++pos_;  // the opening quote
    while (pos_ < text_.size()) {
      const char c = text_[pos_++];
      if (c == '"') return true;
      if (static_cast<unsigned char>(c) < 0x20) return Fail("no control character in a string");
      if (c != '\\') {
        out += c;
        continue;
      }
      if (pos_ >= text_.size()) break;
      const char e = text_[pos_++];
      switch (e) {
        case '"': out += '"'; break;
        case '\\': out += '\\'; break;
        case '/': out += '/'; break;
        case 'b': out += '\b'; break;
        case 'f': out += '\f'; break;
        case 'n': out += '\n'; break;
        case 'r': out += '\r'; break;
        case 't': out += '\t'; break;
        case 'u': {
          unsigned code = 0;
          if (!Hex4(&code)) return false;
          if (code >= 0xD800 && code < 0xDC00 && text_.substr(pos_, 2) == "\\u") {
            pos_ += 2;
            unsigned low = 0;
            if (!Hex4(&low)) return false;
            if (low < 0xDC00 || low >= 0xE000) return Fail("a low surrogate");
            code = 0x10000 + ((code - 0xD800) << 10) + (low - 0xDC00);
          }
          AppendUtf8(code, out);
          break;
        }
        default:
          --pos_;
          return Fail("an escape such as \\n or \\u0041");
      }
    }
    return Fail("the closing quote of a string");
  }

  bool Array(JsonValue& v, int depth) {
    v.type_ = JsonValue::Type::kArray;
    ++pos_;
    SkipSpace();
    if (pos_ < text_.size() && text_[pos_] == ']') {
      ++pos_;
      return true;
    }
    while (true) {
      JsonValue item;
      SkipSpace();
      if (!Value(item, depth + 1)) return false;
      v.array_.push_back(std::move(item));
      SkipSpace();
      if (pos_ < text_.size() && text_[pos_] == ',') {
        ++pos_;
        continue;
      }
      if (pos_ < text_.size() && text_[pos_] == ']') {
        ++pos_;
        return true;
      }
      return Fail("',' or ']'");
    }
  }

  bool Object(JsonValue& v, int depth) {
    v.type_ = JsonValue::Type::kObject;
    ++pos_;
    SkipSpace();
    if (pos_ < text_.size() && text_[pos_] == '}') {
      ++pos_;
      return true;
    }
    while (true) {
      SkipSpace();
      if (pos_ >= text_.size() || text_[pos_] != '"') return Fail("a member name in quotes");
      std::string key;
      if (!String(key)) return false;
      SkipSpace();
      if (pos_ >= text_.size() || text_[pos_] != ':') return Fail("':'");
      ++pos_;
      SkipSpace();
      JsonValue member;
      if (!Value(member, depth + 1)) return false;
      v.members_.emplace_back(std::move(key), std::move(member));
      SkipSpace();
      if (pos_ < text_.size() && text_[pos_] == ',') {
        ++pos_;
        continue;
      }
      if (pos_ < text_.size() && text_[pos_] == '}') {
        ++pos_;
        return true;
      }
      return Fail("',' or '}'");
    }
  }

  std::string_view text_;
  std::size_t pos_ = 0;
  std::string error_;
};

std::optional<JsonValue> JsonValue::Parse(std::string_view text, std::string* error) {
  return JsonParser(text).Document(error);
}

const JsonValue* JsonValue::Find(std::string_view key) const {
  for (const auto& [name, value] : members_) {
    if (name == key) return &value;
  }
  return nullptr;
}

}  // namespace plateau
