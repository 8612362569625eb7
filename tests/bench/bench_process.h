// What the benchmark programs share: a steady-clock stopwatch and starting a child process with
// its output to a file. Benchmark-only; single-threaded.
#ifndef PLATEAU_TESTS_BENCH_BENCH_PROCESS_H_
#define PLATEAU_TESTS_BENCH_BENCH_PROCESS_H_

#include <fcntl.h>
#include <unistd.h>

#include <chrono>
#include <cstdio>
#include <string>
#include <vector>

namespace plateau::bench {

using Clock = std::chrono::steady_clock;

inline double Since(Clock::time_point start) {
  return std::chrono::duration<double>(Clock::now() - start).count();
}

// Forks and execs args[0] with `args`, stdout and stderr appended to `log`; returns its pid.
inline pid_t Start(const std::vector<std::string>& args, const std::string& log) {
  std::fflush(stdout);  // or the child inherits and repeats what is buffered
  const pid_t pid = fork();
  if (pid == 0) {
    const int fd = ::open(log.c_str(), O_WRONLY | O_CREAT | O_APPEND, 0644);
    ::dup2(fd, 1);
    ::dup2(fd, 2);
    std::vector<char*> argv;
    for (const std::string& a : args) argv.push_back(const_cast<char*>(a.c_str()));
    argv.push_back(nullptr);
    ::execv(argv[0], argv.data());
    _exit(127);
  }
  return pid;
}

}  // namespace plateau::bench

#endif  // PLATEAU_TESTS_BENCH_BENCH_PROCESS_H_
