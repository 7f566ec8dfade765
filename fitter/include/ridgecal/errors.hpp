// ridgecal: the three kinds of failure.
//
//  * A programmer bug (a broken precondition inside the library) asserts.
//  * An expected numeric outcome (too few points, rank deficiency) is a
//    `Status` with a message, returned to the caller.
//  * A user or file error is an `InputError`, which the CLI prints as
//    `FILE:LINE: message. hint` and turns into exit code 2.
#pragma once

#include <stdexcept>
#include <string>

namespace ridgecal {

/// Outcome of a numeric step that can legitimately fail on some data.
struct Status {
  bool ok = true;
  std::string message;  ///< empty when ok

  static Status success() { return {}; }
  static Status failure(std::string msg) { return Status{false, std::move(msg)}; }
};

/// A problem with what the user gave us: a file, a cell, an option value.
/// `line` is 1-based; 0 means "the file as a whole" (or no file: an option).
class InputError : public std::runtime_error {
 public:
  InputError(std::string file, std::size_t line, std::string message, std::string hint = {});

  const std::string& file() const { return file_; }
  std::size_t line() const { return line_; }
  const std::string& message() const { return message_; }
  const std::string& hint() const { return hint_; }

 private:
  std::string file_;
  std::size_t line_;
  std::string message_;
  std::string hint_;
};

/// Formats `FILE:LINE: message. hint` (LINE omitted when 0, FILE omitted when empty).
std::string format_input_error(const InputError& e);

}  // namespace ridgecal
