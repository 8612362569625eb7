// Live benchmarks of `plateau watch`, printed as figures (not timed tests):
//  overhead  a writer appends 10 000 values per second across 300 columns for 60 s while the daemon
//            follows with its default intervals; prints the daemon's CPU time as a share of one core
//            (target below 2 %) and its peak RSS;
//  latency   with polling every 1 s and evaluation every 2 s, the time from a row being written to
//            status showing it, against the bound of one polling plus one evaluation interval;
//  catch-up  the daemon started on an existing probe file (give the 1 GB one): the time until status
//            counts every row, against `plateau analyze` on the same file (target within 1.2x).
// usage: live_benchmark PLATEAU_BINARY overhead|latency [SECONDS]
//        live_benchmark PLATEAU_BINARY catch-up FILE ROWS
#include <fcntl.h>
#include <signal.h>
#include <sys/resource.h>
#include <sys/wait.h>
#include <unistd.h>

#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <random>
#include <sstream>
#include <string>
#include <thread>
#include <vector>

#include "tests/bench/bench_process.h"

namespace {

namespace fs = std::filesystem;
using plateau::bench::Clock;
using plateau::bench::Since;
using plateau::bench::Start;

// User + system CPU seconds and peak RSS (KiB) of a live process, from /proc.
void Usage(pid_t pid, double* cpu, long* peak_kib) {
  std::ifstream stat("/proc/" + std::to_string(pid) + "/stat");
  std::string field;
  std::vector<std::string> fields;
  while (stat >> field) fields.push_back(field);
  const double ticks = static_cast<double>(sysconf(_SC_CLK_TCK));
  *cpu = fields.size() > 15 ? (std::stod(fields[13]) + std::stod(fields[14])) / ticks : -1;
  std::ifstream status("/proc/" + std::to_string(pid) + "/status");
  std::string line;
  *peak_kib = -1;
  while (std::getline(status, line)) {
    if (line.rfind("VmHWM:", 0) == 0) *peak_kib = std::stol(line.substr(6));
  }
}

// What `plateau status --json` says about the newest sample, or NaN.
double StatusLastSampleTime(const std::string& plateau, const std::string& config) {
  const std::string command = plateau + " status --json " + config + " 2>/dev/null";
  FILE* pipe = ::popen(command.c_str(), "r");
  if (pipe == nullptr) return std::nan("");
  std::string text;
  char buffer[4096];
  std::size_t n;
  while ((n = std::fread(buffer, 1, sizeof buffer, pipe)) > 0) text.append(buffer, n);
  ::pclose(pipe);
  const std::size_t at = text.find("\"last_sample_time\":");
  if (at == std::string::npos || text.compare(at + 19, 4, "null") == 0) return std::nan("");
  return std::stod(text.substr(at + 19));
}

std::int64_t StatusSamples(const std::string& plateau, const std::string& config) {
  const std::string command = plateau + " status --json " + config + " 2>/dev/null";
  FILE* pipe = ::popen(command.c_str(), "r");
  if (pipe == nullptr) return -1;
  std::string text;
  char buffer[4096];
  std::size_t n;
  while ((n = std::fread(buffer, 1, sizeof buffer, pipe)) > 0) text.append(buffer, n);
  ::pclose(pipe);
  const std::size_t at = text.find("\"samples_total\":");
  return at == std::string::npos ? -1 : std::stoll(text.substr(at + 16));
}

void WriteConfig(const fs::path& dir, int columns, const std::string& files,
                 const std::string& column_prefix) {
  std::ofstream config(dir / "run.yaml");
  config << "run: bench\nsources:\n  - name: probe\n    files: " << files << "\nstatistics:\n";
  for (int c = 0; c < columns; ++c) {
    config << "  - kind: mean\n    columns: [" << column_prefix << c
           << "]\n    target: {relative: 0.0001}\n";
  }
}

std::string Row(double time, int columns, std::mt19937_64& rng) {
  std::normal_distribution<double> normal;
  std::string row;
  char value[32];
  std::snprintf(value, sizeof value, "%.6e", time);
  row += value;
  for (int c = 0; c < columns; ++c) {
    std::snprintf(value, sizeof value, " %.6e", 1.0 + 0.1 * normal(rng));
    row += value;
  }
  return row + "\n";
}

int Overhead(const std::string& plateau, double seconds) {
  constexpr int kColumns = 300;
  constexpr double kValuesPerSecond = 10000.0;
  const fs::path dir = fs::temp_directory_path() / ("plateau-live-" + std::to_string(::getpid()));
  fs::create_directories(dir / "probes");
  WriteConfig(dir, kColumns, "probes/probe.dat", "p");
  std::ofstream probe(dir / "probes/probe.dat");
  probe << "# time";
  for (int c = 0; c < kColumns; ++c) probe << " p" << c;
  probe << "\n" << std::flush;
  const pid_t daemon = Start({plateau, "watch", (dir / "run.yaml").string(), "--quiet"},
                             (dir / "watch.log").string());
  std::mt19937_64 rng(1);
  const double rows_per_second = kValuesPerSecond / kColumns;
  const auto start = Clock::now();
  long rows = 0;
  while (Since(start) < seconds) {
    while (rows < Since(start) * rows_per_second) probe << Row(0.001 * rows++, kColumns, rng);
    probe << std::flush;
    std::this_thread::sleep_for(std::chrono::milliseconds(20));
  }
  double cpu = 0;
  long peak = 0;
  Usage(daemon, &cpu, &peak);
  const double wall = Since(start);
  ::kill(daemon, SIGTERM);
  ::waitpid(daemon, nullptr, 0);
  std::printf("live overhead: %ld rows x %d columns (%.0f values/s) for %.0f s with the default "
              "intervals (poll 10 s, evaluate 60 s)\n",
              rows, kColumns, rows * kColumns / wall, wall);
  std::printf("  daemon CPU %.2f s = %.2f %% of one core (target below 2 %%); peak RSS %.1f MiB\n",
              cpu, 100.0 * cpu / wall, peak / 1024.0);
  fs::remove_all(dir);
  return 0;
}

int Latency(const std::string& plateau, int repeats) {
  const double poll = 1.0, evaluate = 2.0;
  const fs::path dir = fs::temp_directory_path() / ("plateau-latency-" + std::to_string(::getpid()));
  fs::create_directories(dir / "probes");
  WriteConfig(dir, 3, "probes/probe.dat", "p");
  std::ofstream probe(dir / "probes/probe.dat");
  probe << "# time p0 p1 p2\n" << std::flush;
  const pid_t daemon =
      Start({plateau, "watch", (dir / "run.yaml").string(), "--quiet", "--poll-every", "1",
             "--evaluate-every", "2"},
            (dir / "watch.log").string());
  std::mt19937_64 rng(2);
  std::this_thread::sleep_for(std::chrono::milliseconds(500));
  double worst = 0.0, sum = 0.0;
  for (int i = 1; i <= repeats; ++i) {
    // Write at a random phase of the timers.
    std::this_thread::sleep_for(std::chrono::milliseconds(300 + rng() % 1700));
    const double marker = static_cast<double>(i);
    probe << Row(marker, 3, rng) << std::flush;
    const auto written = Clock::now();
    while (!(StatusLastSampleTime(plateau, (dir / "run.yaml").string()) >= marker) &&
           Since(written) < 30) {
      std::this_thread::sleep_for(std::chrono::milliseconds(20));
    }
    const double latency = Since(written);
    worst = std::max(worst, latency);
    sum += latency;
  }
  ::kill(daemon, SIGTERM);
  ::waitpid(daemon, nullptr, 0);
  std::printf("latency from a written row to status (poll %.0f s, evaluate %.0f s, %d rows): mean "
              "%.2f s, worst %.2f s; bound %.0f s\n",
              poll, evaluate, repeats, sum / repeats, worst, poll + evaluate);
  fs::remove_all(dir);
  return 0;
}

int CatchUp(const std::string& plateau, const std::string& file, std::int64_t rows) {
  const fs::path dir = fs::temp_directory_path() / ("plateau-catchup-" + std::to_string(::getpid()));
  fs::create_directories(dir);
  WriteConfig(dir, 100, fs::absolute(file).string(), "p");
  // One discarded run first, so that both timings read the file from the page cache.
  ::waitpid(Start({plateau, "analyze", file, "--json"}, "/dev/null"), nullptr, 0);
  auto start = Clock::now();
  const pid_t analyze = Start({plateau, "analyze", file, "--json"}, "/dev/null");
  ::waitpid(analyze, nullptr, 0);
  const double analyze_seconds = Since(start);
  start = Clock::now();
  const pid_t daemon = Start({plateau, "watch", (dir / "run.yaml").string(), "--quiet"},
                             (dir / "watch.log").string());
  while (StatusSamples(plateau, (dir / "run.yaml").string()) < rows && Since(start) < 600) {
    std::this_thread::sleep_for(std::chrono::milliseconds(50));
  }
  const double watch_seconds = Since(start);
  ::kill(daemon, SIGTERM);
  ::waitpid(daemon, nullptr, 0);
  std::printf("catch-up on %s (%lld rows, 100 statistics): status counts every row after %.2f s; "
              "plateau analyze takes %.2f s: ratio %.2f (target within 1.2)\n",
              file.c_str(), static_cast<long long>(rows), watch_seconds, analyze_seconds,
              watch_seconds / analyze_seconds);
  fs::remove_all(dir);
  return 0;
}

}  // namespace

int main(int argc, char** argv) {
  if (argc < 3) {
    std::fprintf(stderr,
                 "usage: live_benchmark PLATEAU overhead|latency [SECONDS|REPEATS]\n"
                 "       live_benchmark PLATEAU catch-up FILE ROWS\n");
    return 2;
  }
  const std::string plateau = fs::absolute(argv[1]).string();
  const std::string what = argv[2];
  if (what == "overhead") return Overhead(plateau, argc > 3 ? std::atof(argv[3]) : 60.0);
  if (what == "latency") return Latency(plateau, argc > 3 ? std::atoi(argv[3]) : 5);
  if (what == "catch-up" && argc == 5) return CatchUp(plateau, argv[3], std::atoll(argv[4]));
  std::fprintf(stderr, "live_benchmark: unknown benchmark %s\n", what.c_str());
  return 2;
}
