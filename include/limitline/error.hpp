#pragma once
// Errors the front end turns into one-line messages and exit codes.
#include <stdexcept>
#include <string>
#include <string_view>

namespace limitline {

// Bad input: a value that is out of range, malformed or contradictory (exit code 2).
// The message names the value, where it came from, and what is allowed.
class InputError : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

// A physical quantity outside the range the model's equations support.
class RangeError : public InputError {
 public:
  using InputError::InputError;
};

// An offending value as it is echoed in a message: in single quotes, control characters and
// bytes outside printable ASCII/UTF-8 escaped (\n, \x1b), and cut after its first 40
// characters with its length ("'aaaa…' (1048576 characters)"), so that a message stays one
// readable line whatever the input held.
[[nodiscard]] std::string echo(std::string_view value);

}  // namespace limitline
