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

/// What kind of bad input an InputError reports, where a caller needs to
/// tell them apart (the batch summary's reason codes, docs/batch.md). Most
/// errors are `Other`; the rest name a likely hardware fault of the unit.
enum class InputCause {
  Other,             ///< `other`: malformed file, bad option, ...
  EmptyCell,         ///< `empty-cell`: a reading or reference cell is missing
  ConstantReadings,  ///< `constant-readings`: the readings do not vary at all
  FrozenReadings,    ///< `frozen-readings`: identical readings over several setpoints
  ZeroReadings,      ///< `zero-readings`: readings exactly 0 over several setpoints
  ClippedReadings,   ///< `clipped-readings`: the end setpoints read the extreme value
};
std::string to_string(InputCause c);
InputCause input_cause_from_string(const std::string& s);  ///< throws std::invalid_argument

/// A problem with what the user gave us: a file, a cell, an option value.
/// `line` is 1-based; 0 means "the file as a whole" (or no file: an option).
class InputError : public std::runtime_error {
 public:
  InputError(std::string file, std::size_t line, std::string message, std::string hint = {},
             InputCause cause = InputCause::Other);

  const std::string& file() const { return file_; }
  std::size_t line() const { return line_; }
  const std::string& message() const { return message_; }
  const std::string& hint() const { return hint_; }
  InputCause cause() const { return cause_; }

 private:
  std::string file_;
  std::size_t line_;
  std::string message_;
  std::string hint_;
  InputCause cause_;
};

/// Formats `FILE:LINE: message. hint` (LINE omitted when 0, FILE omitted when empty).
std::string format_input_error(const InputError& e);

}  // namespace ridgecal
