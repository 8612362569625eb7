#include "core/event_kind.h"

#include "core/name_table.h"

namespace plateau {
namespace {

constexpr NameTable<EventKind, 8> kNames{{
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

std::string_view EventKindName(EventKind kind) { return NameIn(kNames, kind); }

std::optional<EventKind> EventKindFromName(std::string_view name) { return ValueIn(kNames, name); }

const std::vector<EventKind>& AllEventKinds() {
  static const std::vector<EventKind> kinds = [] {
    std::vector<EventKind> all;
    for (const auto& entry : kNames) all.push_back(entry.first);
    return all;
  }();
  return kinds;
}

}  // namespace plateau
