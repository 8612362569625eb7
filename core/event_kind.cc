#include "core/event_kind.h"

#include <array>
#include <utility>

namespace plateau {
namespace {

constexpr std::array<std::pair<EventKind, std::string_view>, 8> kNames{{
    {EventKind::kMet, "met"},
    {EventKind::kLost, "lost"},
    {EventKind::kRunMet, "run_met"},
    {EventKind::kRunLost, "run_lost"},
    {EventKind::kDrift, "drift"},
    {EventKind::kStalled, "stalled"},
    {EventKind::kResumed, "resumed"},
    {EventKind::kBadLines, "bad_lines"},
}};

}  // namespace

std::string_view EventKindName(EventKind kind) {
  for (const auto& [k, name] : kNames) {
    if (k == kind) return name;
  }
  return "unknown";
}

std::optional<EventKind> EventKindFromName(std::string_view name) {
  for (const auto& [k, n] : kNames) {
    if (n == name) return k;
  }
  return std::nullopt;
}

const std::vector<EventKind>& AllEventKinds() {
  static const std::vector<EventKind> kinds = [] {
    std::vector<EventKind> all;
    for (const auto& entry : kNames) all.push_back(entry.first);
    return all;
  }();
  return kinds;
}

}  // namespace plateau
