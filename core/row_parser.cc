#include "core/row_parser.h"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <cstdio>
#include <cstring>
#include <limits>

namespace plateau {
namespace {

// Separators by byte: a table, because this test runs once per byte of every probe file.
struct SeparatorTable {
  bool is[256] = {};
  constexpr SeparatorTable() {
    for (unsigned char c : {' ', '\t', ',', ';', '\r', '(', ')'}) is[c] = true;
  }
};
constexpr SeparatorTable kSeparators;

inline bool IsSeparator(char c) { return kSeparators.is[static_cast<unsigned char>(c)]; }

std::string_view TrimmedLeft(std::string_view line) {
  std::size_t i = 0;
  while (i < line.size() && (line[i] == ' ' || line[i] == '\t')) ++i;
  return line.substr(i);
}

bool IsBlank(std::string_view line) {
  for (char c : line) {
    if (!IsSeparator(c)) return false;
  }
  return true;
}

// Parses one number token. Accepts a leading '+' and Fortran's D exponent (1.5D+03), which
// std::from_chars does not; rejects NaN and infinities, which must never be averaged.
enum class NumberStatus { kOk, kNotNumber, kNotFinite, kOutOfRange };

NumberStatus ParseNumber(const char* begin, const char* end, double* value) {
  if (begin < end && *begin == '+') ++begin;
  auto [ptr, ec] = std::from_chars(begin, end, *value);
  if (ec == std::errc() && ptr != end && (*ptr == 'D' || *ptr == 'd') && end - begin < 64) {
    char buffer[64];
    const std::size_t length = end - begin;
    std::memcpy(buffer, begin, length);
    buffer[ptr - begin] = 'e';
    auto [p2, ec2] = std::from_chars(buffer, buffer + length, *value);
    ptr = begin + (p2 - buffer);
    ec = ec2;
  }
  if (ec == std::errc::result_out_of_range) return NumberStatus::kOutOfRange;
  if (ec != std::errc() || ptr != end) return NumberStatus::kNotNumber;
  return std::isfinite(*value) ? NumberStatus::kOk : NumberStatus::kNotFinite;
}

// A token as it can be shown in a message: bytes outside printable ASCII become \xNN, so that a
// binary line reads as what it is.
std::string Printable(std::string_view token) {
  std::string out;
  for (const unsigned char c : token) {
    if (c >= 0x20 && c < 0x7f) {
      out += static_cast<char>(c);
    } else {
      char escaped[5];
      std::snprintf(escaped, sizeof escaped, "\\x%02x", c);
      out += escaped;
    }
  }
  return out;
}

// Position of the ')' closing the '(' at `open`; npos when it is not closed on the line.
std::size_t MatchingParenthesis(std::string_view line, std::size_t open) {
  int depth = 0;
  for (std::size_t i = open; i < line.size(); ++i) {
    if (line[i] == '(') ++depth;
    if (line[i] == ')' && --depth == 0) return i;
  }
  return std::string_view::npos;
}

// The suffix of component k of an n-member group: x y z for a vector, the six independent
// components of a symmetric tensor in the order solvers write them (xx xy xz yy yz zz), the nine
// of a tensor row by row; a 0-based number for any other size. Stable: configs name columns by it.
std::string ComponentSuffix(std::size_t n, std::size_t k) {
  static const char* const kVector[] = {"x", "y", "z"};
  static const char* const kSymmTensor[] = {"xx", "xy", "xz", "yy", "yz", "zz"};
  static const char* const kTensor[] = {"xx", "xy", "xz", "yx", "yy", "yz", "zx", "zy", "zz"};
  if (n == 3 && k < 3) return std::string(".") + kVector[k];
  if (n == 6 && k < 6) return std::string(".") + kSymmTensor[k];
  if (n == 9 && k < 9) return std::string(".") + kTensor[k];
  return "." + std::to_string(k);
}

// The one scanner of the `( ... )` group syntax, for header and data lines alike. It walks `line`
// and tells `visit` what it meets, in order: OpenGroup() at '(', CloseGroup() at ')', and
// Token(text, in_group) for every run of non-separator bytes. In a header, parentheses attached
// to a name are part of it (`areaAverage(wallShearStress)` is one field, the surface average of a
// vector, not a name followed by a group); a data line has no such names
// (`names_hold_parentheses` false). A ')' without its '(' only ends a group that is open.
template <typename Visitor>
void ScanGroups(std::string_view line, bool names_hold_parentheses, Visitor& visit) {
  bool in_group = false;
  std::size_t i = 0;
  while (i < line.size()) {
    const char c = line[i];
    if (c == '(') {
      in_group = true;
      visit.OpenGroup();
      ++i;
      continue;
    }
    if (c == ')') {
      visit.CloseGroup(in_group);
      in_group = false;
      ++i;
      continue;
    }
    if (IsSeparator(c)) {
      ++i;
      continue;
    }
    std::size_t j = i;
    while (j < line.size()) {
      if (names_hold_parentheses && line[j] == '(' && j > i) {
        const std::size_t close = MatchingParenthesis(line, j);
        if (close == std::string_view::npos) break;
        j = close + 1;
      } else if (IsSeparator(line[j])) {
        break;
      } else {
        ++j;
      }
    }
    visit.Token(line.substr(i, j - i), in_group);
    i = j;
  }
}

// Tokens of a header line. `fields` keeps a parenthesised group as one field (its members joined
// by spaces), pushed when the group closes (an unclosed group is no field); `tokens` expands
// groups.
struct HeaderTokens {
  std::vector<std::string> tokens;
  std::vector<std::string> fields;
  std::string group;

  void OpenGroup() { group.clear(); }
  void CloseGroup(bool was_open) {
    if (was_open) fields.push_back(group);
  }
  void Token(std::string_view text, bool in_group) {
    tokens.emplace_back(text);
    if (in_group) {
      group += group.empty() ? tokens.back() : " " + tokens.back();
    } else {
      fields.push_back(tokens.back());
    }
  }
};

HeaderTokens TokenizeHeader(std::string_view line) {
  HeaderTokens h;
  ScanGroups(line, /*names_hold_parentheses=*/true, h);
  return h;
}

// Sizes of the fields of a data line: 1 for a plain value, the member count for a `(a b c)` group
// (counted from its '(', closed or not).
struct FieldSizeCounter {
  std::vector<std::size_t> sizes;

  void OpenGroup() { sizes.push_back(0); }
  void CloseGroup(bool) {}
  void Token(std::string_view, bool in_group) {
    if (in_group) {
      ++sizes.back();
    } else {
      sizes.push_back(1);
    }
  }
};

std::vector<std::size_t> FieldSizes(std::string_view line) {
  FieldSizeCounter counter;
  ScanGroups(line, /*names_hold_parentheses=*/false, counter);
  return counter.sizes;
}

}  // namespace

void RowParser::Feed(std::string_view bytes, RowSink& sink) {
  std::size_t pos = 0;
  while (pos < bytes.size()) {
    const void* found = std::memchr(bytes.data() + pos, '\n', bytes.size() - pos);
    if (found == nullptr) {
      const std::size_t rest = bytes.size() - pos;
      pending_size_ += rest;
      if (!skipping_long_line_) {
        pending_.append(bytes.data() + pos, rest);
        if (pending_.size() > kMaxLineBytes) {
          ++line_;
          Bad("line longer than 4 MiB (binary data?); skipped to its end", sink);
          --line_;
          pending_.clear();
          skipping_long_line_ = true;
        }
      }
      return;
    }
    const std::size_t end = static_cast<const char*>(found) - bytes.data();
    ++line_;
    if (skipping_long_line_) {
      skipping_long_line_ = false;
    } else if (pending_size_ == 0) {
      ParseLine(bytes.substr(pos, end - pos), sink);
    } else {
      pending_.append(bytes.data() + pos, end - pos);
      ParseLine(pending_, sink);
    }
    consumed_ += pending_size_ + (end - pos) + 1;
    pending_.clear();
    pending_size_ = 0;
    pos = end + 1;
  }
}

void RowParser::Resume(std::vector<std::string> names, std::uint64_t lines,
                       std::uint64_t consumed_bytes, std::uint64_t rows,
                       std::uint64_t bad_lines) {
  rows_ = rows;
  bad_lines_ = bad_lines;
  names_ = std::move(names);
  column_count_ = names_.size();
  values_.reserve(column_count_);
  line_ = lines;
  consumed_ = consumed_bytes;
  pending_.clear();
  pending_size_ = 0;
  skipping_long_line_ = false;
}

void RowParser::Bad(std::string_view reason, RowSink& sink) {
  ++bad_lines_;
  sink.OnBadLine(line_, reason);
}

void RowParser::ParseLine(std::string_view line, RowSink& sink) {
  const std::string_view trimmed = TrimmedLeft(line);
  if (!trimmed.empty() && trimmed[0] == '#') {
    if (!has_columns()) {
      probe_header_.ReadCommentLine(trimmed.substr(1));
      HeaderTokens h = TokenizeHeader(trimmed.substr(1));
      if (!h.tokens.empty()) {
        last_comment_tokens_ = std::move(h.tokens);
        last_comment_fields_ = std::move(h.fields);
      }
    }
    return;
  }
  if (IsBlank(trimmed)) return;
  if (!has_columns()) {
    HandleHeaderOrFirstRow(trimmed, sink);
    return;
  }
  std::string reason;
  if (!ParseNumbers(trimmed, &reason)) {
    Bad(reason, sink);
    return;
  }
  if (values_.size() != column_count_) {
    Bad("expected " + std::to_string(column_count_) + " values, found " +
            std::to_string(values_.size()),
        sink);
    return;
  }
  ++rows_;
  sink.OnRow(line_, values_.data());
}

void RowParser::HandleHeaderOrFirstRow(std::string_view line, RowSink& sink) {
  std::string reason;
  if (!ParseNumbers(line, &reason)) {
    HeaderTokens h = TokenizeHeader(line);
    bool all_names = true;
    for (const std::string& t : h.tokens) {
      double ignored;
      all_names = all_names && ParseNumber(t.data(), t.data() + t.size(), &ignored) ==
                                   NumberStatus::kNotNumber;
    }
    if (all_names) {  // a first line of column names without '#', as CSV writers emit
      last_comment_tokens_ = std::move(h.tokens);
      last_comment_fields_ = std::move(h.fields);
    } else {
      Bad(reason, sink);
    }
    return;
  }
  column_count_ = values_.size();
  NameColumns(FieldSizes(line));
  sink.OnColumns(names_);
  ++rows_;
  sink.OnRow(line_, values_.data());
}

void RowParser::NameColumns(const std::vector<std::size_t>& sizes) {
  if (NameProbeColumns(sizes)) return;
  if (last_comment_tokens_.size() == column_count_) {
    names_ = last_comment_tokens_;
  } else if (last_comment_fields_.size() == sizes.size()) {
    // One name per field: a vector group `U` written as (a b c) becomes U.x U.y U.z.
    for (std::size_t f = 0; f < sizes.size(); ++f) {
      if (sizes[f] == 1) {
        names_.push_back(last_comment_fields_[f]);
      } else {
        for (std::size_t k = 0; k < sizes[f]; ++k) {
          names_.push_back(last_comment_fields_[f] + ComponentSuffix(sizes[f], k));
        }
      }
    }
  } else {
    for (std::size_t c = 0; c < column_count_; ++c) names_.push_back("col" + std::to_string(c + 1));
  }
}

bool RowParser::NameProbeColumns(const std::vector<std::size_t>& sizes) {
  // The layout: location lines, a probe-number list, then a line naming only the time column;
  // each row is the time and one field per probe (a value, or a group for a vector or tensor).
  const std::vector<int> ids = probe_header_.ColumnProbeIds();
  if (ids.empty() || sizes.size() != ids.size() + 1 || sizes[0] != 1) return false;
  // An empty group `()` is a probe without a value: the row does not have the layout.
  if (std::find(sizes.begin(), sizes.end(), std::size_t{0}) != sizes.end()) return false;
  std::string time_name;
  if (last_comment_tokens_.size() == 1) {
    time_name = last_comment_tokens_[0];
  } else if (last_comment_tokens_.size() == ids.size() + 1 && last_comment_tokens_[0] == "Probe") {
    time_name = "Time";  // the probe-number list was the last header line
  } else {
    return false;
  }
  std::vector<std::string> names{time_name};
  for (std::size_t p = 0; p < ids.size(); ++p) {
    const std::string probe = field_name_ + "[" + std::to_string(ids[p]) + "]";
    if (sizes[p + 1] == 1) {
      names.push_back(probe);
    } else {
      for (std::size_t k = 0; k < sizes[p + 1]; ++k) {
        names.push_back(probe + ComponentSuffix(sizes[p + 1], k));
      }
    }
  }
  // A repeated probe number, or a time column named like a probe column, would make two columns
  // of one name: no column could then be told apart by it.
  std::vector<std::string> sorted = names;
  std::sort(sorted.begin(), sorted.end());
  if (std::adjacent_find(sorted.begin(), sorted.end()) != sorted.end()) return false;
  names_ = std::move(names);
  for (std::size_t p = 0; p < ids.size(); ++p) {
    ProbeLocation location;
    location.id = ids[p];
    location.position.fill(std::numeric_limits<double>::quiet_NaN());
    for (const ProbeLocation& l : probe_header_.locations()) {
      if (l.id == ids[p]) location = l;
    }
    probes_.push_back(location);
  }
  return true;
}

bool RowParser::ParseNumbers(std::string_view line, std::string* reason) {
  values_.clear();
  const char* p = line.data();
  const char* end = p + line.size();
  while (p < end) {
    if (IsSeparator(*p)) {
      ++p;
      continue;
    }
    // One scan per token: from_chars finds where the number ends, and the token must end there.
    // Anything else (a '+', a Fortran exponent, garbage) takes the careful path.
    double value;
    const auto [ptr, ec] = std::from_chars(p, end, value);
    if (ec == std::errc() && (ptr == end || IsSeparator(*ptr)) && std::isfinite(value)) {
      values_.push_back(value);
      p = ptr;
      continue;
    }
    const char* token_end = p;
    while (token_end < end && !IsSeparator(*token_end)) ++token_end;
    const NumberStatus status = ParseNumber(p, token_end, &value);
    if (status != NumberStatus::kOk) {
      const std::size_t column = values_.size();
      std::string where = "value " + std::to_string(column + 1);
      if (column < names_.size()) where += " (" + names_[column] + ")";
      const std::string token = Printable(std::string_view(p, token_end - p).substr(0, 40));
      const char* what = status == NumberStatus::kNotFinite    ? "not a finite number"
                         : status == NumberStatus::kOutOfRange ? "out of the range of a double"
                                                               : "not a number";
      *reason = where + ": '" + token + "' is " + what;
      return false;
    }
    values_.push_back(value);
    p = token_end;
  }
  return true;
}

}  // namespace plateau
