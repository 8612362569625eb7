// A fixed table of an enum's values and their stable names (JSON keys, config words, store text),
// looked up both ways. One table per enum, so that a name is spelled in one place. Pure.
#ifndef PLATEAU_CORE_NAME_TABLE_H_
#define PLATEAU_CORE_NAME_TABLE_H_

#include <array>
#include <cstddef>
#include <optional>
#include <string_view>
#include <utility>

namespace plateau {

template <typename Enum, std::size_t N>
using NameTable = std::array<std::pair<Enum, std::string_view>, N>;

// The name of `value`; "unknown" for a value the table lacks.
template <typename Enum, std::size_t N>
constexpr std::string_view NameIn(const NameTable<Enum, N>& table, Enum value) {
  for (const auto& [v, name] : table) {
    if (v == value) return name;
  }
  return "unknown";
}

// The value named `name`; nullopt for a name the table lacks.
template <typename Enum, std::size_t N>
constexpr std::optional<Enum> ValueIn(const NameTable<Enum, N>& table, std::string_view name) {
  for (const auto& [value, n] : table) {
    if (n == name) return value;
  }
  return std::nullopt;
}

}  // namespace plateau

#endif  // PLATEAU_CORE_NAME_TABLE_H_
