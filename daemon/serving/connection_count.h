// The number of connections a server has open, shared with the connections themselves: each holds
// a Ticket that counts it until the ticket is destroyed, even when that happens after the server
// (an io_context destroys its pending handlers, and the connections in them, after the servers
// declared beside it). Single-threaded, like the loop the servers run on.
#ifndef PLATEAU_DAEMON_SERVING_CONNECTION_COUNT_H_
#define PLATEAU_DAEMON_SERVING_CONNECTION_COUNT_H_

#include <memory>

namespace plateau {

class ConnectionCount {
 public:
  class Ticket {
   public:
    explicit Ticket(std::shared_ptr<int> count) : count_(std::move(count)) { ++*count_; }
    ~Ticket() {
      if (count_) --*count_;
    }
    Ticket(Ticket&& other) noexcept = default;
    Ticket(const Ticket&) = delete;
    Ticket& operator=(const Ticket&) = delete;
    Ticket& operator=(Ticket&&) = delete;

   private:
    std::shared_ptr<int> count_;
  };

  // Counts one more connection for as long as the ticket lives.
  Ticket Open() { return Ticket(count_); }
  int open() const { return *count_; }

 private:
  std::shared_ptr<int> count_ = std::make_shared<int>(0);
};

}  // namespace plateau

#endif  // PLATEAU_DAEMON_SERVING_CONNECTION_COUNT_H_
