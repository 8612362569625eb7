#include "daemon/alerts/command_runner.h"

#include <boost/asio/posix/stream_descriptor.hpp>
#include <fcntl.h>
#include <signal.h>
#include <sys/wait.h>
#include <unistd.h>

#include <array>
#include <cerrno>
#include <chrono>
#include <cstring>
#include <memory>

extern char** environ;

namespace plateau {
namespace {

namespace asio = boost::asio;

constexpr std::size_t kMaxOutput = 64 << 10;

class ChildWatch : public std::enable_shared_from_this<ChildWatch> {
 public:
  ChildWatch(asio::io_context& io, pid_t pid, int output_fd, double timeout,
             std::string program, std::function<void(CommandResult)> done)
      : pid_(pid),
        output_(io, output_fd),
        deadline_(io),
        reap_timer_(io),
        timeout_(timeout),
        program_(std::move(program)),
        done_(std::move(done)) {}

  void Start() {
    deadline_.expires_after(std::chrono::duration_cast<std::chrono::steady_clock::duration>(
        std::chrono::duration<double>(timeout_)));
    deadline_.async_wait([self = shared_from_this()](const boost::system::error_code& error) {
      if (!error) {
        self->timed_out_ = true;
        ::kill(self->pid_, SIGKILL);
      }
    });
    Read();
  }

 private:
  void Read() {
    output_.async_read_some(asio::buffer(chunk_), [self = shared_from_this()](
                                                      const boost::system::error_code& error,
                                                      std::size_t n) {
      if (self->result_.output.size() < kMaxOutput) {
        self->result_.output.append(self->chunk_.data(),
                                    std::min(n, kMaxOutput - self->result_.output.size()));
      }
      if (error) {
        self->Reap();  // end of output: the child closed it, most likely by exiting
      } else {
        self->Read();
      }
    });
  }

  // The child may outlive its output (it closed stdout and went on): poll without blocking.
  void Reap() {
    int status = 0;
    const pid_t r = ::waitpid(pid_, &status, WNOHANG);
    if (r == 0) {
      reap_timer_.expires_after(std::chrono::milliseconds(50));
      reap_timer_.async_wait([self = shared_from_this()](const boost::system::error_code& e) {
        if (!e) self->Reap();
      });
      return;
    }
    deadline_.cancel();
    if (timed_out_) {
      result_.status = Status::Error(program_ + " did not finish within " +
                                     std::to_string(static_cast<int>(timeout_)) +
                                     " s and was killed");
    } else if (r < 0) {
      result_.status = Status::Error(program_ + ": " + std::strerror(errno));
    } else if (WIFEXITED(status) && WEXITSTATUS(status) == 0) {
      result_.status = Status::Ok();
    } else if (WIFEXITED(status)) {
      result_.status = Status::Error(program_ + " exited with status " +
                                     std::to_string(WEXITSTATUS(status)));
    } else {
      result_.status = Status::Error(program_ + " ended by signal " +
                                     std::to_string(WTERMSIG(status)));
    }
    done_(std::move(result_));
  }

  pid_t pid_;
  asio::posix::stream_descriptor output_;
  asio::steady_timer deadline_;
  asio::steady_timer reap_timer_;
  double timeout_;
  std::string program_;
  std::function<void(CommandResult)> done_;
  std::array<char, 4096> chunk_{};
  CommandResult result_;
  bool timed_out_ = false;
};

}  // namespace

void RunAlertCommand(asio::io_context& io, const CommandConfig& config,
                     const std::vector<std::pair<std::string, std::string>>& environment,
                     std::function<void(CommandResult)> done) {
  // Everything the child needs is built before fork(): after it, only async-signal-safe calls.
  std::vector<std::string> env_text;
  for (char** e = environ; *e != nullptr; ++e) {
    if (std::strncmp(*e, "PLATEAU_", 8) != 0) env_text.emplace_back(*e);
  }
  for (const auto& [key, value] : environment) env_text.push_back(key + "=" + value);
  std::vector<char*> envp;
  envp.reserve(env_text.size() + 1);
  for (std::string& e : env_text) envp.push_back(e.data());
  envp.push_back(nullptr);
  std::vector<std::string> args = config.argv;
  std::vector<char*> argv;
  argv.reserve(args.size() + 1);
  for (std::string& a : args) argv.push_back(a.data());
  argv.push_back(nullptr);

  int pipe_fds[2];
  if (::pipe2(pipe_fds, O_CLOEXEC) != 0) {
    done({Status::Error(std::string("cannot run the alert command: ") + std::strerror(errno)), ""});
    return;
  }
  const pid_t pid = ::fork();
  if (pid < 0) {
    ::close(pipe_fds[0]);
    ::close(pipe_fds[1]);
    done({Status::Error(std::string("cannot run the alert command: ") + std::strerror(errno)), ""});
    return;
  }
  if (pid == 0) {
    const int null = ::open("/dev/null", O_RDONLY);
    ::dup2(null, 0);
    ::dup2(pipe_fds[1], 1);
    ::dup2(pipe_fds[1], 2);
    ::execvpe(argv[0], argv.data(), envp.data());
    const char message[] = "cannot execute the alert command\n";
    [[maybe_unused]] const ssize_t n = ::write(2, message, sizeof message - 1);
    ::_exit(127);
  }
  ::close(pipe_fds[1]);
  std::make_shared<ChildWatch>(io, pid, pipe_fds[0], config.timeout, config.argv.front(),
                               std::move(done))
      ->Start();
}

}  // namespace plateau
