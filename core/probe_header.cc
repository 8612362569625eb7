#include "core/probe_header.h"

#include <charconv>
#include <cmath>
#include <optional>

namespace plateau {
namespace {

// Words of a comment line; parentheses and separators split them.
std::vector<std::string_view> Words(std::string_view text) {
  std::vector<std::string_view> words;
  std::size_t i = 0;
  const auto is_separator = [](char c) {
    return c == ' ' || c == '\t' || c == ',' || c == ';' || c == '\r' || c == '(' || c == ')';
  };
  while (i < text.size()) {
    if (is_separator(text[i])) {
      ++i;
      continue;
    }
    std::size_t j = i;
    while (j < text.size() && !is_separator(text[j])) ++j;
    words.push_back(text.substr(i, j - i));
    i = j;
  }
  return words;
}

std::optional<int> WholeNumber(std::string_view word) {
  int value = 0;
  const auto [ptr, ec] = std::from_chars(word.data(), word.data() + word.size(), value);
  if (ec != std::errc() || ptr != word.data() + word.size() || value < 0) return std::nullopt;
  return value;
}

std::optional<double> Number(std::string_view word) {
  if (!word.empty() && word[0] == '+') word.remove_prefix(1);
  double value = 0.0;
  const auto [ptr, ec] = std::from_chars(word.data(), word.data() + word.size(), value);
  if (ec != std::errc() || ptr != word.data() + word.size()) return std::nullopt;
  return value;
}

bool IsProbeWord(std::string_view word) { return word == "Probe" || word == "probe"; }

}  // namespace

bool SameProbes(const std::vector<ProbeLocation>& a, const std::vector<ProbeLocation>& b) {
  if (a.size() != b.size()) return false;
  for (std::size_t p = 0; p < a.size(); ++p) {
    if (a[p].id != b[p].id) return false;
    for (int k = 0; k < 3; ++k) {
      const double x = a[p].position[k], y = b[p].position[k];
      if (x != y && !(std::isnan(x) && std::isnan(y))) return false;
    }
  }
  return true;
}

bool ProbeHeader::IsProbeList(std::string_view text) {
  const std::vector<std::string_view> words = Words(text);
  if (words.size() < 2 || !IsProbeWord(words[0]) || text.find('(') != std::string_view::npos) {
    return false;
  }
  for (std::size_t w = 1; w < words.size(); ++w) {
    if (!WholeNumber(words[w])) return false;
  }
  return true;
}

void ProbeHeader::ReadCommentLine(std::string_view text) {
  const std::vector<std::string_view> words = Words(text);
  if (words.size() < 2 || !IsProbeWord(words[0])) return;
  if (IsProbeList(text)) {
    listed_ids_.clear();
    for (std::size_t w = 1; w < words.size(); ++w) listed_ids_.push_back(*WholeNumber(words[w]));
    return;
  }
  // `Probe 3 (x y z)`, possibly followed by a remark such as "# Not Found"; the location is the
  // first three numbers inside the parentheses.
  const std::optional<int> id = WholeNumber(words[1]);
  const std::size_t open = text.find('(');
  const std::size_t close = text.find(')', open == std::string_view::npos ? 0 : open);
  if (!id || open == std::string_view::npos || close == std::string_view::npos) return;
  const std::vector<std::string_view> inside = Words(text.substr(open + 1, close - open - 1));
  if (inside.size() != 3) return;
  ProbeLocation location;
  location.id = *id;
  for (int k = 0; k < 3; ++k) {
    const std::optional<double> x = Number(inside[k]);
    if (!x) return;
    location.position[k] = *x;
  }
  locations_.push_back(location);
}

std::vector<int> ProbeHeader::ColumnProbeIds() const {
  if (!listed_ids_.empty()) return listed_ids_;
  std::vector<int> ids;
  for (const ProbeLocation& l : locations_) ids.push_back(l.id);
  return ids;
}

}  // namespace plateau
