// libFuzzer target: the weather reader (weather::read_text, default mapping) on arbitrary
// text. Every hour it returns holds finite, physical values.
#include <limitline/error.hpp>
#include <limitline/io/weather.hpp>

#include "support.hpp"

namespace wx = limitline::weather;
using limitline::fuzz::require;

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const auto text = limitline::fuzz::text(data, size);
  try {
    const wx::WeatherSeries s = wx::read_text(text, "fuzz.csv", wx::Mapping{}, 101.325);
    for (const wx::WeatherHour& h : s.hours) {
      require(std::isfinite(h.dry_bulb_c), "dry-bulb not finite");
      require(std::isfinite(h.humidity_ratio) && h.humidity_ratio >= 0,
              "humidity ratio not finite or negative");
      require(std::isfinite(h.pressure_kpa) && h.pressure_kpa > 0,
              "pressure not finite or not positive");
      require(std::isfinite(h.weight_h) && h.weight_h > 0, "weight not finite or not positive");
      require(h.month >= 1 && h.month <= 12 && h.hour >= 0 && h.hour <= 23,
              "month or hour out of range");
    }
    (void)wx::describe(s.info);
  } catch (const limitline::InputError&) {
  }
  return 0;
}
