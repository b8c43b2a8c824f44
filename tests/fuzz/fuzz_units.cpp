// libFuzzer target: the quantity parser (units::parse) on arbitrary text, for every kind of
// quantity and both unit systems. A value it returns is finite.
#include <limitline/error.hpp>
#include <limitline/model/units.hpp>

#include "support.hpp"

namespace u = limitline::units;

// Every Kind of units.hpp, in its order.
constexpr u::Kind kKinds[] = {u::Kind::temperature, u::Kind::temperature_difference,
                              u::Kind::enthalpy,    u::Kind::enthalpy_difference,
                              u::Kind::pressure,    u::Kind::length,
                              u::Kind::fraction,    u::Kind::humidity_ratio,
                              u::Kind::airflow,     u::Kind::energy,
                              u::Kind::power,       u::Kind::specific_volume,
                              u::Kind::density};

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const auto text = limitline::fuzz::text(data, size);
  for (const u::Kind kind : kKinds)
    for (const u::System system : {u::System::ip, u::System::si}) {
      try {
        const double v = u::parse(kind, text, system, "fuzz");
        limitline::fuzz::require_finite(v, "units::parse returned a non-finite value");
        limitline::fuzz::require_finite(u::to_display(kind, system, v),
                                        "a parsed value is not finite in display units");
      } catch (const limitline::InputError&) {
      }
    }
  try {
    limitline::fuzz::require_finite(u::parse_number(text, "fuzz"),
                                    "units::parse_number returned a non-finite value");
  } catch (const limitline::InputError&) {
  }
  (void)u::has_unit(text);
  return 0;
}
