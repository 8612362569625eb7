// How plateau scales with the number of statistics and the length of a run, printed as figures
// (not timed tests):
//  cycle N    N mean statistics on one source with N columns: the daemon's RunMonitor (the code of
//             `plateau watch`) reads 5000 rows and writes its first cycle; then, 50 new rows
//             before each, one evaluation cycle (estimates, snapshots, events and the checkpoint
//             written to the store in one transaction) is timed, median of 5; prints milliseconds
//             per cycle and per statistic (linear: the per-statistic figure stays put as N grows),
//             resident memory per statistic, and the bytes each cycle writes to storage per
//             statistic (the checkpoint);
//  growth N   the same monitor while the run grows from 5 000 to 400 000 rows: resident memory per
//             statistic at each length (flat once the block histories are full: 4096 blocks);
//  status N   `plateau watch` on N statistics, then `plateau status` and `status --json` timed
//             (median of 15) while the daemon answers on its socket, and after it stopped (the
//             store alone).
// usage: scaling_benchmark PLATEAU_BINARY cycle|growth|status N
#include <signal.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <random>
#include <string>
#include <thread>
#include <vector>

#include "config/config_loader.h"
#include "daemon/runtime/run_logger.h"
#include "daemon/monitoring/run_monitor.h"
#include "store/run_store.h"
#include "tests/bench/bench_process.h"

namespace {

namespace fs = std::filesystem;
using plateau::bench::Clock;
using plateau::bench::Since;
using plateau::bench::Start;

long ResidentKib() {
  std::ifstream status("/proc/self/status");
  for (std::string line; std::getline(status, line);) {
    if (line.rfind("VmRSS:", 0) == 0) return std::atol(line.c_str() + 6);
  }
  return -1;
}

// Bytes this process has caused to be written to storage (/proc/self/io, write_bytes).
long long WrittenBytes() {
  std::ifstream io("/proc/self/io");
  for (std::string line; std::getline(io, line);) {
    if (line.rfind("write_bytes:", 0) == 0) return std::atoll(line.c_str() + 12);
  }
  return -1;
}

double Median(std::vector<double> values) {
  std::sort(values.begin(), values.end());
  return values[values.size() / 2];
}

// A run folder with run.yaml (N means of p0..p{N-1}) and an empty probe file with its header.
fs::path MakeRun(int statistics) {
  const fs::path dir = fs::temp_directory_path() / ("plateau-scale-" + std::to_string(::getpid()));
  fs::remove_all(dir);
  fs::create_directories(dir);
  std::ofstream config(dir / "run.yaml");
  config << "run: scale\nsources:\n  - {name: probe, files: probe.dat}\nstatistics:\n";
  for (int c = 0; c < statistics; ++c) {
    config << "  - {kind: mean, column: p" << c << ", target: {relative: 0.0001}}\n";
  }
  std::ofstream probe(dir / "probe.dat");
  probe << "# time";
  for (int c = 0; c < statistics; ++c) probe << " p" << c;
  probe << "\n";
  return dir;
}

void AppendRows(const fs::path& dir, int columns, long from, long to) {
  std::ofstream probe(dir / "probe.dat", std::ios::app);
  std::mt19937_64 rng(static_cast<std::uint64_t>(from));
  std::normal_distribution<double> normal;
  char value[32];
  std::string row;
  for (long i = from; i < to; ++i) {
    std::snprintf(value, sizeof value, "%.4f", 0.001 * static_cast<double>(i));
    row = value;
    for (int c = 0; c < columns; ++c) {
      std::snprintf(value, sizeof value, " %.5e", 1.0 + 0.1 * normal(rng));
      row += value;
    }
    row += '\n';
    probe << row;
  }
}

double WallSeconds() {
  return std::chrono::duration<double>(std::chrono::system_clock::now().time_since_epoch()).count();
}

std::unique_ptr<plateau::RunMonitor> OpenMonitor(const fs::path& dir) {
  std::vector<plateau::ConfigError> errors;
  std::optional<plateau::RunConfig> config = plateau::LoadRunConfig(dir / "run.yaml", &errors);
  if (!config) {
    std::fprintf(stderr, "%s\n", errors.front().ToString().c_str());
    std::exit(1);
  }
  auto store = plateau::RunStore::OpenForWriting(config->store_path, "scale");
  if (!store.ok()) {
    std::fprintf(stderr, "%s\n", store.error().c_str());
    std::exit(1);
  }
  auto monitor = std::make_unique<plateau::RunMonitor>(std::move(*config), std::move(store).value(),
                                                       plateau::MakeSilentLogger());
  monitor->Restore();
  return monitor;
}

void ReadAllRows(plateau::RunMonitor& monitor) {
  while (monitor.Poll(WallSeconds())) {
  }
}

int Cycle(int statistics) {
  const fs::path dir = MakeRun(statistics);
  AppendRows(dir, statistics, 0, 5000);
  const long before = ResidentKib();
  auto monitor = OpenMonitor(dir);
  ReadAllRows(*monitor);
  // The first cycle of a daemon writes the whole checkpoint; the ones after it what changed.
  if (!monitor->Evaluate(WallSeconds()).ok()) return 1;
  std::vector<double> seconds;
  long long written = 0;
  for (int i = 0; i < 5; ++i) {
    AppendRows(dir, statistics, 5000 + 50 * i, 5000 + 50 * (i + 1));  // the solver goes on
    ReadAllRows(*monitor);
    const long long written_before = WrittenBytes();
    const auto start = Clock::now();
    if (!monitor->Evaluate(WallSeconds()).ok()) return 1;
    seconds.push_back(Since(start));
    written += WrittenBytes() - written_before;
  }
  const long after = ResidentKib();
  const double cycle = Median(seconds);
  std::printf(
      "cycle: %5d statistics, 5000 rows: %8.1f ms per cycle, %.3f ms per statistic; "
      "resident %.0f KiB and %.0f KiB written to the store per statistic and cycle\n",
      statistics, 1e3 * cycle, 1e3 * cycle / statistics,
      static_cast<double>(after - before) / statistics,
      static_cast<double>(written) / 5.0 / 1024.0 / statistics);
  fs::remove_all(dir);
  return 0;
}

int Growth(int statistics) {
  const fs::path dir = MakeRun(statistics);
  const long before = ResidentKib();
  auto monitor = OpenMonitor(dir);
  long rows = 0;
  for (long length : {5000L, 20000L, 100000L, 400000L}) {
    AppendRows(dir, statistics, rows, length);
    rows = length;
    ReadAllRows(*monitor);
    if (!monitor->Evaluate(WallSeconds()).ok()) return 1;
    std::printf("growth: %d statistics at %7ld rows: resident %.0f KiB per statistic\n", statistics,
                rows, static_cast<double>(ResidentKib() - before) / statistics);
  }
  fs::remove_all(dir);
  return 0;
}

double TimeCommand(const std::vector<std::string>& args) {
  const auto start = Clock::now();
  int status = 0;
  ::waitpid(Start(args, "/dev/null"), &status, 0);
  return WIFEXITED(status) && WEXITSTATUS(status) == 0 ? Since(start) : -1.0;
}

int StatusLatency(const std::string& plateau, int statistics) {
  const fs::path dir = MakeRun(statistics);
  AppendRows(dir, statistics, 0, 5000);
  const std::string config = (dir / "run.yaml").string();
  const pid_t daemon = Start({plateau, "watch", config, "--quiet", "--evaluate-every", "3600"},
                             (dir / "log").string());
  const auto started = Clock::now();
  while (TimeCommand({plateau, "status", config}) < 0 && Since(started) < 300) {
    std::this_thread::sleep_for(std::chrono::milliseconds(100));
  }
  const auto measure = [&](const char* where) {
    std::vector<double> table, json;
    for (int i = 0; i < 15; ++i) {
      table.push_back(TimeCommand({plateau, "status", config}));
      json.push_back(TimeCommand({plateau, "status", "--json", config}));
    }
    std::printf("status: %d statistics, %s: table %.0f ms, --json %.0f ms (median of 15)\n",
                statistics, where, 1e3 * Median(table), 1e3 * Median(json));
  };
  measure("the daemon answering on its socket");
  ::kill(daemon, SIGTERM);
  ::waitpid(daemon, nullptr, 0);
  measure("from the store (daemon stopped)");
  fs::remove_all(dir);
  return 0;
}

}  // namespace

int main(int argc, char** argv) {
  if (argc != 4) {
    std::fprintf(stderr, "usage: scaling_benchmark PLATEAU cycle|growth|status N\n");
    return 2;
  }
  const std::string what = argv[2];
  const int n = std::atoi(argv[3]);
  if (what == "cycle") return Cycle(n);
  if (what == "growth") return Growth(n);
  if (what == "status") return StatusLatency(fs::absolute(argv[1]).string(), n);
  std::fprintf(stderr, "scaling_benchmark: unknown benchmark %s\n", what.c_str());
  return 2;
}
