#pragma once
// Shared by the libFuzzer targets: the input as text, and the checks a reader's success must
// pass. A broken check aborts, which libFuzzer reports as a crash with its reproducer.
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <string_view>

namespace limitline::fuzz {

inline std::string_view text(const std::uint8_t* data, std::size_t size) {
  return {reinterpret_cast<const char*>(data), size};
}

// Stops the run when `ok` is false, saying which promise of the reader was broken.
inline void require(bool ok, const char* what) {
  if (ok) return;
  std::fprintf(stderr, "limitline fuzz: broken promise: %s\n", what);
  std::abort();
}

inline void require_finite(double v, const char* what) { require(std::isfinite(v), what); }

// True when a text cell of an output reads as NaN or infinity ("nan", "-inf", "inf", ...).
inline bool non_finite_word(std::string_view cell) {
  while (!cell.empty() && (cell.front() == ' ' || cell.front() == '-' || cell.front() == '+'))
    cell.remove_prefix(1);
  while (!cell.empty() && cell.back() == ' ') cell.remove_suffix(1);
  if (cell.size() != 3 && cell.size() != 8) return false;
  auto lower = [](char c) { return static_cast<char>(c >= 'A' && c <= 'Z' ? c + 32 : c); };
  char w[9] = {};
  for (std::size_t i = 0; i < cell.size(); ++i) w[i] = lower(cell[i]);
  const std::string_view s(w, cell.size());
  return s == "nan" || s == "inf" || s == "infinity";
}

}  // namespace limitline::fuzz
