// Turns the bytes of a delimited-text probe file into numeric rows: whitespace, comma, semicolon or
// tab separators; `#` comment lines; column names from the last comment line before the data (or a
// first line of names), or from a probe description over several comment lines; `(a b c)` vector
// groups expanded to columns. Pure: bytes in, rows out, no I/O.
// Not thread-safe: one parser per file, fed by one owner.
#ifndef PLATEAU_CORE_ROW_PARSER_H_
#define PLATEAU_CORE_ROW_PARSER_H_

#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

#include "core/probe_header.h"

namespace plateau {

// Receives what the parser finds. Line numbers are 1-based within the stream.
class RowSink {
 public:
  virtual ~RowSink() = default;
  // Called once, before the first row, with one name per column.
  virtual void OnColumns(const std::vector<std::string>& names) = 0;
  // A complete row of finite values, exactly one per column.
  virtual void OnRow(std::uint64_t line, const double* values) = 0;
  // A line that is not a data row of the established layout; `reason` says what is wrong with it.
  virtual void OnBadLine(std::uint64_t line, std::string_view reason) = 0;
};

class RowParser {
 public:
  // A line longer than this without a newline is reported bad and skipped to its end, so that a
  // binary file cannot make the parser buffer without bound.
  static constexpr std::size_t kMaxLineBytes = 4 << 20;

  // Parses every complete line in `bytes`; an unterminated last line is kept until its newline
  // arrives in a later call.
  void Feed(std::string_view bytes, RowSink& sink);

  // The quantity a probe file holds when only its file name says it (`p`, `U`): probe columns
  // are then named `U[3].x` (probe 3, x component) and `p[3]`. Default "probe". Set before Feed.
  void set_field_name(std::string name) { field_name_ = std::move(name); }
  // The probes of a probe-description header, one per probe field in column order; empty for
  // other layouts and after Resume (the header lines are behind the resume offset).
  const std::vector<ProbeLocation>& probes() const { return probes_; }

  bool has_columns() const { return column_count_ > 0; }
  const std::vector<std::string>& column_names() const { return names_; }
  std::uint64_t lines() const { return line_; }
  std::uint64_t rows() const { return rows_; }
  std::uint64_t bad_lines() const { return bad_lines_; }
  // Bytes of complete lines consumed so far: the offset to resume from after a restart.
  std::uint64_t consumed_bytes() const { return consumed_; }
  // Bytes of an unterminated last line waiting for its newline.
  std::size_t pending_bytes() const { return pending_size_; }

  // Resumes a stream at a line boundary (after a restart): the layout and counters as they were.
  void Resume(std::vector<std::string> names, std::uint64_t lines, std::uint64_t consumed_bytes,
              std::uint64_t rows = 0, std::uint64_t bad_lines = 0);

 private:
  void ParseLine(std::string_view line, RowSink& sink);
  void HandleHeaderOrFirstRow(std::string_view line, RowSink& sink);
  // Column names for the first data row's fields (sizes: 1 per value, n per `(..)` group).
  void NameColumns(const std::vector<std::size_t>& sizes);
  // Names from a probe description, when it fits the fields; false otherwise.
  bool NameProbeColumns(const std::vector<std::size_t>& sizes);
  // Splits on separators and parentheses; returns false on a token that is not a finite number,
  // with *reason set. values_ receives the numbers.
  bool ParseNumbers(std::string_view line, std::string* reason);
  void Bad(std::string_view reason, RowSink& sink);

  std::vector<std::string> names_;
  std::size_t column_count_ = 0;
  std::vector<std::string> last_comment_tokens_;  // of the last non-empty comment line before data
  std::vector<std::string> last_comment_fields_;  // the same, with vector groups kept whole
  ProbeHeader probe_header_;
  std::string field_name_ = "probe";
  std::vector<ProbeLocation> probes_;
  std::vector<double> values_;
  std::string pending_;
  std::size_t pending_size_ = 0;  // bytes of the unterminated line so far, skipped ones included
  bool skipping_long_line_ = false;
  std::uint64_t line_ = 0;
  std::uint64_t rows_ = 0;
  std::uint64_t bad_lines_ = 0;
  std::uint64_t consumed_ = 0;
};

}  // namespace plateau

#endif  // PLATEAU_CORE_ROW_PARSER_H_
