#pragma once
// Errors the front end turns into one-line messages and exit codes.
#include <stdexcept>
#include <string>

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

// Wrong use of the command line (exit code 1).
class UsageError : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

}  // namespace limitline
