#pragma once
// A small cache of a pure function of one or two doubles, for loops over a year of weather
// whose values repeat (readings written to a tenth of a degree, pressures to a whole hPa):
// an exp or a log computed once per distinct value instead of once per hour.
//
// The key is the exact bits of the arguments, so a hit returns exactly what the function
// would return. Each key has one slot (a hash of its bits); a new key replaces the one
// there. Keys must not be NaN.
#include <array>
#include <bit>
#include <cstddef>
#include <cstdint>

namespace limitline {

template <class Value, int Bits>
class Memo {
 public:
  Memo() { keys_.fill({kEmpty, kEmpty}); }

  // The value for (a, b): compute() on a miss. When compute() throws, nothing is kept.
  template <class Compute>
  const Value& get(double a, double b, Compute&& compute) {
    const auto ka = std::bit_cast<std::uint64_t>(a), kb = std::bit_cast<std::uint64_t>(b);
    const std::size_t i =
        ((ka ^ (kb * 0xC2B2AE3D27D4EB4FULL)) * 0x9E3779B97F4A7C15ULL) >> (64 - Bits);
    if (keys_[i][0] != ka || keys_[i][1] != kb) {
      values_[i] = compute();
      keys_[i] = {ka, kb};
    }
    return values_[i];
  }
  template <class Compute>
  const Value& get(double a, Compute&& compute) {
    return get(a, 0.0, compute);
  }

 private:
  static_assert(Bits > 0 && Bits < 20);
  // A NaN pattern, which no key has.
  static constexpr std::uint64_t kEmpty = ~std::uint64_t{0};
  std::array<std::array<std::uint64_t, 2>, std::size_t{1} << Bits> keys_;
  std::array<Value, std::size_t{1} << Bits> values_{};
};

}  // namespace limitline
