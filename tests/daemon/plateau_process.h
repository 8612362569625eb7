// Runs the real plateau binary from integration tests: the daemon as a child process that can be
// signalled and reaped, and short-lived commands with their output captured. Test-only; each test
// owns its processes; everything it starts is killed by the destructors.
#ifndef PLATEAU_TESTS_DAEMON_PLATEAU_PROCESS_H_
#define PLATEAU_TESTS_DAEMON_PLATEAU_PROCESS_H_

#include <fcntl.h>
#include <linux/capability.h>
#include <signal.h>
#include <sys/prctl.h>
#include <sys/wait.h>
#include <unistd.h>

#include <chrono>
#include <cstdio>
#include <fstream>
#include <functional>
#include <sstream>
#include <string>
#include <thread>
#include <vector>

namespace plateau::testing {

inline std::string ReadAll(const std::string& path) {
  std::ifstream in(path);
  std::stringstream text;
  text << in.rdbuf();
  return text.str();
}

struct SpawnOptions {
  std::vector<std::string> environment;  // NAME=VALUE, added to the child's environment
  // File modes bind the child even when the tests run as root: the capabilities that override
  // them (CAP_DAC_OVERRIDE, CAP_DAC_READ_SEARCH, CAP_FOWNER) leave its bounding set, so that a
  // chmod can make a probe file unreadable or a store read-only for it.
  bool file_modes_apply = false;
};

// Forks and execs PLATEAU_BINARY with `args`, stdout and stderr to the given files.
inline pid_t Spawn(const std::vector<std::string>& args, const std::string& out,
                   const std::string& err, const SpawnOptions& options = {}) {
  const pid_t pid = fork();
  if (pid == 0) {
    const int o = ::open(out.c_str(), O_WRONLY | O_CREAT | O_APPEND, 0644);
    const int e = ::open(err.c_str(), O_WRONLY | O_CREAT | O_APPEND, 0644);
    ::dup2(o, 1);
    ::dup2(e, 2);
    for (const std::string& variable : options.environment) {
      const std::size_t equals = variable.find('=');
      ::setenv(variable.substr(0, equals).c_str(), variable.substr(equals + 1).c_str(), 1);
    }
    if (options.file_modes_apply) {
      // Fails harmlessly (EPERM) for a process that holds none of them anyway.
      for (int capability : {CAP_DAC_OVERRIDE, CAP_DAC_READ_SEARCH, CAP_FOWNER}) {
        ::prctl(PR_CAPBSET_DROP, capability, 0, 0, 0);
      }
    }
    std::vector<char*> argv{const_cast<char*>(PLATEAU_BINARY)};
    for (const std::string& a : args) argv.push_back(const_cast<char*>(a.c_str()));
    argv.push_back(nullptr);
    ::execv(PLATEAU_BINARY, argv.data());
    _exit(127);
  }
  return pid;
}

struct CommandResult {
  int exit_code = -1;
  std::string out;
  std::string err;
};

// Runs a short-lived plateau command to completion (at most 60 s).
inline CommandResult RunPlateau(const std::vector<std::string>& args, const std::string& scratch,
                                const SpawnOptions& options = {}) {
  const std::string out = scratch + ".out", err = scratch + ".err";
  std::remove(out.c_str());
  std::remove(err.c_str());
  const pid_t pid = Spawn(args, out, err, options);
  int status = 0;
  for (int i = 0; i < 6000 && ::waitpid(pid, &status, WNOHANG) == 0; ++i) {
    std::this_thread::sleep_for(std::chrono::milliseconds(10));
  }
  CommandResult r;
  if (::waitpid(pid, &status, WNOHANG) == 0 && !WIFEXITED(status)) {
    ::kill(pid, SIGKILL);
    ::waitpid(pid, &status, 0);
  }
  r.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  r.out = ReadAll(out);
  r.err = ReadAll(err);
  return r;
}

// Polls `condition` every 20 ms for at most `seconds`.
inline bool WaitFor(const std::function<bool()>& condition, double seconds) {
  const auto end = std::chrono::steady_clock::now() + std::chrono::duration<double>(seconds);
  while (std::chrono::steady_clock::now() < end) {
    if (condition()) return true;
    std::this_thread::sleep_for(std::chrono::milliseconds(20));
  }
  return condition();
}

// `plateau watch CONFIG` with short intervals, logging to `log`.
class WatchDaemon {
 public:
  WatchDaemon(const std::string& config, const std::string& log, double evaluate = 0.2,
              double poll = 0.1, const SpawnOptions& options = {})
      : pid_(Spawn({"watch", config, "--evaluate-every", std::to_string(evaluate), "--poll-every",
                    std::to_string(poll), "--quiet"},
                   log, log, options)) {}
  ~WatchDaemon() {
    if (pid_ > 0) {
      ::kill(pid_, SIGKILL);
      ::waitpid(pid_, nullptr, 0);
    }
  }
  WatchDaemon(const WatchDaemon&) = delete;
  WatchDaemon& operator=(const WatchDaemon&) = delete;

  void Signal(int signal) { ::kill(pid_, signal); }
  pid_t pid() const { return pid_; }
  // Exit code once it ended within `seconds`; -1 (and killed) otherwise; -2 if it died by signal.
  int Wait(double seconds) {
    if (!WaitFor([&] { return !Running(); }, seconds)) {
      KillHard();
      return -1;
    }
    return WIFEXITED(status_) ? WEXITSTATUS(status_) : -2;
  }
  // The signal that ended it, once Wait or Running saw it end; 0 when it exited.
  int TermSignal() const { return WIFSIGNALED(status_) ? WTERMSIG(status_) : 0; }
  void KillHard() {
    ::kill(pid_, SIGKILL);
    ::waitpid(pid_, nullptr, 0);
    pid_ = -1;
  }
  // Reaps the daemon when it has ended, keeping its exit status for Wait.
  bool Running() {
    if (pid_ <= 0) return false;
    if (::waitpid(pid_, &status_, WNOHANG) == 0) return true;
    pid_ = -1;
    return false;
  }

 private:
  pid_t pid_;
  int status_ = 0;
};

}  // namespace plateau::testing

#endif  // PLATEAU_TESTS_DAEMON_PLATEAU_PROCESS_H_
