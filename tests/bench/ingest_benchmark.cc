// Catch-up ingest benchmark: `plateau analyze` on a wide probe file against a bare loop that only
// splits lines and parses every number with std::from_chars, in one run on one machine, so the
// figure that matters is the ratio. Times are CPU seconds (user + system), the best of three runs of
// each, because wall time on a shared machine swings by tens of per cent. Also prints the peak
// resident memory of plateau (wait4 rusage).
// usage: ingest_benchmark PLATEAU_BINARY FILE [FILE...]   (prints one line per file)
//        ingest_benchmark --bare FILE                        (the bare loop alone, for callgrind)
#include <sys/resource.h>
#include <sys/wait.h>
#include <unistd.h>

#include <charconv>
#include <algorithm>
#include <cstdio>
#include <cstring>
#include <string>
#include <vector>

namespace {

constexpr int kRepeats = 3;

double CpuSeconds(const rusage& u) {
  return u.ru_utime.tv_sec + u.ru_stime.tv_sec + 1e-6 * (u.ru_utime.tv_usec + u.ru_stime.tv_usec);
}

double SelfCpuSeconds() {
  rusage u{};
  getrusage(RUSAGE_SELF, &u);
  return CpuSeconds(u);
}

// The baseline: read in 1 MiB chunks, split at newlines and spaces, from_chars every number.
double BareParse(const char* path, double* checksum) {
  const double start = SelfCpuSeconds();
  std::FILE* f = std::fopen(path, "rb");
  if (f == nullptr) return -1.0;
  std::vector<char> buffer(1 << 20);
  std::string carry;
  double sum = 0.0;
  std::size_t n;
  const auto parse_line = [&](const char* p, const char* end) {
    if (p < end && *p == '#') return;
    while (p < end) {
      while (p < end && *p == ' ') ++p;
      const char* token = p;
      while (p < end && *p != ' ') ++p;
      double value;
      if (std::from_chars(token, p, value).ec == std::errc()) sum += value;
    }
  };
  while ((n = std::fread(buffer.data(), 1, buffer.size(), f)) > 0) {
    const char* p = buffer.data();
    const char* end = p + n;
    while (p < end) {
      const char* nl = static_cast<const char*>(std::memchr(p, '\n', end - p));
      if (nl == nullptr) {
        carry.append(p, end);
        break;
      }
      if (!carry.empty()) {
        carry.append(p, nl);
        parse_line(carry.data(), carry.data() + carry.size());
        carry.clear();
      } else {
        parse_line(p, nl);
      }
      p = nl + 1;
    }
  }
  std::fclose(f);
  *checksum = sum;
  return SelfCpuSeconds() - start;
}

// Runs `plateau analyze FILE --json` with its output discarded; returns its CPU seconds and peak RSS.
double RunAnalyze(const char* plateau, const char* path, long* peak_kib) {
  std::fflush(stdout);  // or the child inherits and repeats what is buffered
  const pid_t child = fork();
  if (child == 0) {
    if (std::freopen("/dev/null", "w", stdout) == nullptr) _exit(126);
    execl(plateau, plateau, "analyze", path, "--json", static_cast<char*>(nullptr));
    _exit(127);
  }
  int status = 0;
  rusage usage{};
  wait4(child, &status, 0, &usage);
  *peak_kib = usage.ru_maxrss;
  if (!WIFEXITED(status) || WEXITSTATUS(status) != 0) return -1.0;
  return CpuSeconds(usage);
}

}  // namespace

int main(int argc, char** argv) {
  if (argc == 3 && std::string(argv[1]) == "--bare") {
    double checksum = 0.0;
    BareParse(argv[2], &checksum);
    std::printf("checksum %.6g\n", checksum);
    return 0;
  }
  if (argc < 3) {
    std::fprintf(stderr, "usage: ingest_benchmark PLATEAU_BINARY FILE [FILE...]\n");
    return 2;
  }
  std::printf("%-28s %8s %14s %16s %8s %14s\n", "file", "MB", "bare CPU [s]",
              "analyze CPU [s]", "ratio", "peak RSS [MiB]");
  for (int i = 2; i < argc; ++i) {
    double checksum = 0.0;
    double bare = 1e300, analyze = 1e300;
    long peak = 0;
    for (int r = 0; r < kRepeats; ++r) {
      bare = std::min(bare, BareParse(argv[i], &checksum));
      const double a = RunAnalyze(argv[1], argv[i], &peak);
      analyze = a < 0 ? a : std::min(analyze, a);
    }
    std::FILE* f = std::fopen(argv[i], "rb");
    std::fseek(f, 0, SEEK_END);
    const double megabytes = std::ftell(f) / 1e6;
    std::fclose(f);
    if (bare < 0 || analyze < 0) {
      std::fprintf(stderr, "ingest_benchmark: failed on %s\n", argv[i]);
      return 1;
    }
    std::printf("%-28s %8.0f %14.2f %16.2f %8.2f %14.1f   (checksum %.6g)\n", argv[i], megabytes,
                bare, analyze, analyze / bare, peak / 1024.0, checksum);
  }
  return 0;
}
