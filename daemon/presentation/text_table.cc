#include "daemon/presentation/text_table.h"

#include <algorithm>

namespace plateau {
namespace {

// Display width: UTF-8 continuation bytes take no column (the table shows ±, τ, %).
std::size_t Width(const std::string& text) {
  std::size_t width = 0;
  for (unsigned char c : text) width += (c & 0xC0) != 0x80;
  return width;
}

}  // namespace

TextTable::TextTable(std::vector<std::pair<std::string, Align>> columns)
    : columns_(std::move(columns)) {}

void TextTable::AddRow(std::vector<std::string> cells) {
  cells.resize(columns_.size());
  rows_.push_back(std::move(cells));
}

std::string TextTable::Render() const {
  std::vector<std::size_t> widths;
  for (const auto& [header, align] : columns_) widths.push_back(Width(header));
  for (const auto& row : rows_) {
    for (std::size_t c = 0; c < row.size(); ++c) widths[c] = std::max(widths[c], Width(row[c]));
  }
  std::string out;
  const auto render_row = [&](const std::vector<std::string>& cells) {
    std::string line;
    for (std::size_t c = 0; c < cells.size(); ++c) {
      const std::string pad(widths[c] - Width(cells[c]), ' ');
      if (c > 0) line += "  ";
      line += columns_[c].second == Align::kRight ? pad + cells[c] : cells[c] + pad;
    }
    while (!line.empty() && line.back() == ' ') line.pop_back();
    out += line + "\n";
  };
  std::vector<std::string> headers;
  for (const auto& [header, align] : columns_) headers.push_back(header);
  render_row(headers);
  for (const auto& row : rows_) render_row(row);
  return out;
}

}  // namespace plateau
