#include "daemon/status_command.h"

#include <cmath>
#include <ctime>
#include <memory>
#include <optional>

#include "daemon/analysis_report.h"
#include "daemon/json_writer.h"
#include "daemon/run_locator.h"
#include "daemon/store_lock.h"
#include "daemon/text_table.h"
#include "daemon/watch_loop.h"
#include "store/run_store.h"

namespace plateau {
namespace {

struct Reading {
  std::string store_path;
  std::optional<LatestView> view;
  std::string error;  // set when there is nothing to show
  long daemon_pid = 0;
};

Reading Read(const std::string& argument) {
  Reading r;
  const LocatedRun located = LocateRun(argument);
  if (located.store_path.empty()) {
    r.error = located.error;
    return r;
  }
  r.store_path = located.store_path;
  Status status;
  const std::unique_ptr<RunStore> store = RunStore::OpenForReading(located.store_path, &status);
  if (!store) {
    r.error = status.message();
    return r;
  }
  r.view = store->ReadLatest(&status);
  if (!status.ok()) {
    r.error = status.message();
  } else if (!r.view) {
    r.error = "store " + located.store_path + " has no evaluation yet";
  }
  r.daemon_pid = StoreLock::HolderPid(located.store_path);
  return r;
}

std::string Ago(double seconds) {
  if (std::isnan(seconds)) return "-";
  char buffer[32];
  if (seconds < 120) {
    std::snprintf(buffer, sizeof buffer, "%.0f s", seconds);
  } else if (seconds < 7200) {
    std::snprintf(buffer, sizeof buffer, "%.1f min", seconds / 60);
  } else if (seconds < 172800) {
    std::snprintf(buffer, sizeof buffer, "%.1f h", seconds / 3600);
  } else {
    std::snprintf(buffer, sizeof buffer, "%.1f d", seconds / 86400);
  }
  return buffer;
}

std::string UtcTime(double wall) {
  if (std::isnan(wall)) return "-";
  const std::time_t t = static_cast<std::time_t>(wall);
  std::tm tm{};
  gmtime_r(&t, &tm);
  char buffer[32];
  std::strftime(buffer, sizeof buffer, "%Y-%m-%d %H:%M:%S UTC", &tm);
  return buffer;
}

std::string StateWords(const std::string& state) {
  std::string words = state;
  for (char& c : words) c = c == '_' ? ' ' : c;
  return words;
}

std::string TargetCell(const SnapshotRow& s) {
  if (s.target_kind.empty()) return "-";
  return s.target_kind == "relative" ? FormatPercent(s.target_value) : FormatValue(s.target_value);
}

std::string DaemonLine(long pid, double age) {
  if (pid > 0) return "the daemon is running (process " + std::to_string(pid) + ")";
  if (pid < 0) return "the daemon is running";
  return "the daemon is not running: these numbers are " + Ago(age) + " old";
}

struct Tally {
  int targets = 0;
  int met = 0;
  const SnapshotRow* first_unmet = nullptr;
  const SnapshotRow* column_missing = nullptr;
};

Tally Count(const LatestView& v) {
  Tally t;
  for (const SnapshotRow& s : v.statistics) {
    if (s.state == "column_missing" && !t.column_missing) t.column_missing = &s;
    if (s.target_kind.empty()) continue;
    ++t.targets;
    if (s.state == "met") {
      ++t.met;
    } else if (!t.first_unmet) {
      t.first_unmet = &s;
    }
  }
  return t;
}

void PrintTable(const Reading& r, std::ostream& out) {
  const LatestView& v = *r.view;
  const double now = WallSeconds();
  out << "run '" << v.run_name << "': cycle " << v.cycle << ", evaluated " << Ago(now - v.wall_time)
      << " ago (" << UtcTime(v.wall_time) << "); " << DaemonLine(r.daemon_pid, now - v.wall_time)
      << "\n";
  out << "newest sample: time " << FormatValue(v.last_sample_time) << ", read "
      << Ago(now - v.last_sample_wall_time) << " ago\n\n";
  using A = TextTable::Align;
  TextTable table({{"statistic", A::kLeft},
                   {"value", A::kRight},
                   {"± half-width", A::kRight},
                   {"conf.", A::kRight},
                   {"relative", A::kRight},
                   {"target", A::kRight},
                   {"τ [samples]", A::kRight},
                   {"n_eff", A::kRight},
                   {"warm-up ends", A::kRight},
                   {"state", A::kLeft},
                   {"met at", A::kRight}});
  for (const SnapshotRow& s : v.statistics) {
    char tau[32], neff[32];
    std::snprintf(tau, sizeof tau, "%.3g", s.integrated_time);
    std::snprintf(neff, sizeof neff, "%.0f", s.effective_samples);
    const bool estimated = !std::isnan(s.half_width);
    table.AddRow({s.statistic, FormatValue(s.value), FormatHalfWidth(s.half_width),
                  FormatPercent(s.confidence), FormatPercent(s.relative_half_width), TargetCell(s),
                  estimated ? tau : "-", estimated ? neff : "-", FormatValue(s.warmup_end_time),
                  StateWords(s.state), FormatValue(s.met_at_time)});
  }
  out << table.Render();
  const Tally t = Count(v);
  out << "\n";
  if (t.targets == 0) {
    out << "no statistic has a target: nothing to stop on\n";
  } else if (v.run_met) {
    out << "every target is met (" << t.met << " of " << t.targets << "): stop the solver\n";
  } else {
    out << t.met << " of " << t.targets << " targets met: continue\n";
  }
  bool header = false;
  for (const SnapshotRow& s : v.statistics) {
    if (s.state == "met" || s.state == "monitored" || s.state_reason.empty()) continue;
    if (!header) out << "\nnotes:\n";
    header = true;
    out << "  " << s.statistic << ": " << StateWords(s.state) << ": " << s.state_reason << "\n";
  }
}

void PrintJson(const Reading& r, std::ostream& out) {
  const LatestView& v = *r.view;
  const double now = WallSeconds();
  const Tally t = Count(v);
  JsonWriter json;
  json.BeginObject();
  json.Field("run", v.run_name);
  json.Field("store", r.store_path);
  json.Field("cycle", v.cycle);
  json.Field("evaluated_at", v.wall_time);
  json.Field("age_seconds", now - v.wall_time);
  json.Field("last_sample_time", v.last_sample_time);
  json.Field("last_sample_read_at", v.last_sample_wall_time);
  json.Field("last_sample_age_seconds", now - v.last_sample_wall_time);
  json.Key("daemon");
  json.BeginObject();
  json.Field("running", r.daemon_pid != 0);
  json.Key("pid");
  if (r.daemon_pid > 0) {
    json.Integer(r.daemon_pid);
  } else {
    json.Null();
  }
  json.EndObject();
  json.Field("run_met", v.run_met);
  json.Field("targets", t.targets);
  json.Field("targets_met", t.met);
  json.Key("statistics");
  json.BeginArray();
  for (const SnapshotRow& s : v.statistics) json.Raw(s.json);
  json.EndArray();
  json.Key("files");
  json.BeginArray();
  for (const FileProgress& f : v.files) {
    json.BeginObject();
    json.Field("path", f.path);
    json.Field("source", f.source);
    json.Field("rows", f.rows);
    json.Field("bad_lines", f.bad_lines);
    json.Field("last_time", f.last_time);
    json.Field("vanished", f.vanished);
    json.EndObject();
  }
  json.EndArray();
  json.EndObject();
  out << json.text() << "\n";
}

// Splits [PATH] and the flags a command knows; returns false on anything else.
bool ParseArgs(const std::vector<std::string>& args, const std::string& command,
               std::string* path, bool* json, std::string* stat, std::ostream& err) {
  for (std::size_t i = 0; i < args.size(); ++i) {
    const std::string& a = args[i];
    if (a == "--json" && json) {
      *json = true;
    } else if (a == "--stat" && stat && i + 1 < args.size()) {
      *stat = args[++i];
    } else if (!a.empty() && a[0] == '-') {
      err << "plateau " << command << ": unknown option " << a << " (see plateau " << command
          << " --help)\n";
      return false;
    } else if (path->empty()) {
      *path = a;
    } else {
      err << "plateau " << command << ": one config, store or folder, please\n";
      return false;
    }
  }
  return true;
}

}  // namespace

std::string StatusUsage() {
  return R"(usage: plateau status [CONFIG|STORE|FOLDER] [--json]

Every statistic as the daemon last evaluated it: value ± half-width, relative half-width against
its target, tau, n_eff, warm-up cut, state and when its target was met. Reads the store only, so it
works while the daemon runs and after it stopped (and then says how old the numbers are). Without
an argument it looks in the current folder for plateau.db or a single config.
)";
}

std::string CheckUsage() {
  return R"(usage: plateau check [CONFIG|STORE|FOLDER] [--stat NAME]

Stop or continue, as an exit status, with one line on stderr saying why:
  0  every target is met: stop the solver
  1  not yet: continue
  2  cannot tell (no store, no evaluation yet, unreadable config, a statistic whose column is
     missing)
With --stat, the answer for one statistic only.

  until plateau check run.yaml; do sleep 600; done
)";
}

int RunStatusCommand(const std::vector<std::string>& args, std::ostream& out, std::ostream& err) {
  if (!args.empty() && (args[0] == "--help" || args[0] == "-h")) {
    out << StatusUsage();
    return 0;
  }
  std::string path;
  bool json = false;
  if (!ParseArgs(args, "status", &path, &json, nullptr, err)) return 2;
  const Reading r = Read(path);
  if (!r.view) {
    err << "plateau status: " << r.error << "\n";
    return 2;
  }
  json ? PrintJson(r, out) : PrintTable(r, out);
  return 0;
}

int RunCheckCommand(const std::vector<std::string>& args, std::ostream& out, std::ostream& err) {
  if (!args.empty() && (args[0] == "--help" || args[0] == "-h")) {
    out << CheckUsage();
    return 0;
  }
  std::string path;
  std::string stat;
  if (!ParseArgs(args, "check", &path, nullptr, &stat, err)) return 2;
  const Reading r = Read(path);
  if (!r.view) {
    err << "plateau check: cannot tell: " << r.error << "\n";
    return 2;
  }
  const LatestView& v = *r.view;
  const double age = WallSeconds() - v.wall_time;
  const std::string when = " (cycle " + std::to_string(v.cycle) + ", evaluated " + Ago(age) +
                           " ago" + (r.daemon_pid == 0 ? "; the daemon is not running" : "") + ")";
  if (!stat.empty()) {
    for (const SnapshotRow& s : v.statistics) {
      if (s.statistic != stat) continue;
      if (s.state == "column_missing" || s.target_kind.empty()) {
        err << "plateau check: cannot tell: " << stat << " "
            << (s.target_kind.empty() ? "has no target" : s.state_reason) << when << "\n";
        return 2;
      }
      if (s.state == "met") {
        err << "plateau check: stop: " << stat << " met its target at time "
            << FormatValue(s.met_at_time) << when << "\n";
        return 0;
      }
      err << "plateau check: continue: " << stat << " is " << StateWords(s.state) << ": "
          << s.state_reason << when << "\n";
      return 1;
    }
    err << "plateau check: cannot tell: no statistic named '" << stat << "' in the store\n";
    return 2;
  }
  const Tally t = Count(v);
  if (t.column_missing) {
    err << "plateau check: cannot tell: " << t.column_missing->statistic << ": "
        << t.column_missing->state_reason << when << "\n";
    return 2;
  }
  if (t.targets == 0) {
    err << "plateau check: cannot tell: no statistic has a target" << when << "\n";
    return 2;
  }
  if (v.run_met) {
    err << "plateau check: stop: every target is met (" << t.met << " of " << t.targets << ")"
        << when << "\n";
    return 0;
  }
  err << "plateau check: continue: " << t.met << " of " << t.targets << " targets met";
  if (t.first_unmet) {
    err << "; " << t.first_unmet->statistic << " is " << StateWords(t.first_unmet->state) << ": "
        << t.first_unmet->state_reason;
  }
  err << when << "\n";
  return 1;
}

}  // namespace plateau
