// A plain-text table for terminals: a header row and data rows, columns padded to their widest cell,
// text columns left-aligned and numeric ones right-aligned. Not thread-safe; build, then Render.
#ifndef PLATEAU_DAEMON_PRESENTATION_TEXT_TABLE_H_
#define PLATEAU_DAEMON_PRESENTATION_TEXT_TABLE_H_

#include <string>
#include <vector>

namespace plateau {

class TextTable {
 public:
  enum class Align { kLeft, kRight };

  // One header per column, with its alignment.
  explicit TextTable(std::vector<std::pair<std::string, Align>> columns);
  // A row with one cell per column (missing cells are blank, extra ones dropped).
  void AddRow(std::vector<std::string> cells);
  // Header, then rows; two spaces between columns; no trailing spaces.
  std::string Render() const;

 private:
  std::vector<std::pair<std::string, Align>> columns_;
  std::vector<std::vector<std::string>> rows_;
};

}  // namespace plateau

#endif  // PLATEAU_DAEMON_PRESENTATION_TEXT_TABLE_H_
