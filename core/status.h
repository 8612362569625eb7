// The outcome of an operation at a module border: ok, or a message a user can act on.
// Plain value; copied freely between threads.
#ifndef PLATEAU_CORE_STATUS_H_
#define PLATEAU_CORE_STATUS_H_

#include <string>
#include <utility>

namespace plateau {

class Status {
 public:
  Status() = default;  // ok
  static Status Ok() { return Status(); }
  static Status Error(std::string message) { return Status(std::move(message)); }

  bool ok() const { return ok_; }
  const std::string& message() const { return message_; }

 private:
  explicit Status(std::string message) : ok_(false), message_(std::move(message)) {}

  bool ok_ = true;
  std::string message_;
};

}  // namespace plateau

#endif  // PLATEAU_CORE_STATUS_H_
