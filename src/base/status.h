// Errors as values. The library never prints or exits: every failure travels up as an Error
// naming where it happened (file, line, byte offset) and why; the CLI turns it into one line.
// Result<T> holds either a T or an Error; Status is Result<void>.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <utility>
#include <variant>

namespace evenhand {

// What kind of failure, so the CLI can map it to an exit code.
enum class ErrorKind {
  usage,     // bad options or arguments
  input,     // unreadable input, corrupt stream, bad record
  output,    // unwritable path, disk full
  pack,      // broken rule pack
  internal,  // a bug
};

struct Error {
  ErrorKind kind = ErrorKind::internal;
  std::string file;                // path the failure is about; empty if none
  std::optional<uint64_t> line;    // 1-based line (record) number, if known
  std::optional<uint64_t> offset;  // byte offset (compressed offset for compressed input)
  std::string reason;              // human-readable, no trailing period

  // One line: "file:line: byte N: reason" with the parts that are known.
  std::string message() const;
};

Error make_error(ErrorKind kind, std::string file, std::string reason);

template <typename T>
class [[nodiscard]] Result {
 public:
  Result(T value) : v_(std::move(value)) {}      // NOLINT: implicit by design
  Result(Error error) : v_(std::move(error)) {}  // NOLINT
  bool ok() const { return v_.index() == 0; }
  explicit operator bool() const { return ok(); }
  T& value() & { return std::get<0>(v_); }
  const T& value() const& { return std::get<0>(v_); }
  T&& value() && { return std::get<0>(std::move(v_)); }
  T& operator*() & { return value(); }
  T* operator->() { return &std::get<0>(v_); }
  const T* operator->() const { return &std::get<0>(v_); }
  const Error& error() const& { return std::get<1>(v_); }
  Error&& error() && { return std::get<1>(std::move(v_)); }

 private:
  std::variant<T, Error> v_;
};

template <>
class [[nodiscard]] Result<void> {
 public:
  Result() = default;
  Result(Error error) : e_(std::move(error)) {}  // NOLINT
  bool ok() const { return !e_.has_value(); }
  explicit operator bool() const { return ok(); }
  const Error& error() const& { return *e_; }
  Error&& error() && { return std::move(*e_); }

 private:
  std::optional<Error> e_;
};

using Status = Result<void>;

inline Status ok_status() {
  return Status();
}

}  // namespace evenhand

// Propagate an error from an expression returning Status or Result<T>.
#define EVENHAND_TRY(expr)                                                          \
  do {                                                                              \
    auto evenhand_try_status_ = (expr);                                             \
    if (!evenhand_try_status_.ok()) return std::move(evenhand_try_status_).error(); \
  } while (0)
