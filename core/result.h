// The one error convention at module borders: a function that can fail returns Status (nothing
// to give back) or Result<T> (a value, or a Status with a message a user can act on). Plain
// value; copied or moved freely between threads.
#ifndef PLATEAU_CORE_RESULT_H_
#define PLATEAU_CORE_RESULT_H_

#include <cassert>
#include <optional>
#include <string>
#include <utility>

#include "core/status.h"

namespace plateau {

template <typename T>
class Result {
 public:
  // A value (implicit, so that `return value;` reads as success).
  Result(T value) : value_(std::move(value)) {}  // NOLINT(google-explicit-constructor)
  // A failure; `error` must not be ok.
  Result(Status error) : status_(std::move(error)) {  // NOLINT(google-explicit-constructor)
    assert(!status_.ok());
  }

  bool ok() const { return value_.has_value(); }
  const Status& status() const { return status_; }
  // The failure's message; empty when ok.
  const std::string& error() const { return status_.message(); }

  // The value; only when ok().
  T& value() & { return *value_; }
  const T& value() const& { return *value_; }
  T&& value() && { return std::move(*value_); }
  T* operator->() { return &*value_; }
  const T* operator->() const { return &*value_; }
  T& operator*() & { return *value_; }
  const T& operator*() const& { return *value_; }

 private:
  std::optional<T> value_;
  Status status_;
};

}  // namespace plateau

#endif  // PLATEAU_CORE_RESULT_H_
