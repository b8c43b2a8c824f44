#pragma once
// The one-line message of the InputError a piece of code throws, for checking messages whole.
#include <limitline/error.hpp>

#include <functional>
#include <string>

namespace limitline::test {

// The message of the InputError `f` throws ("" when it throws none).
inline std::string error_of(const std::function<void()>& f) {
  try {
    f();
  } catch (const InputError& e) {
    return e.what();
  }
  return "";
}

}  // namespace limitline::test
