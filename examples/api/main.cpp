// The library without the command line: one moist-air state at two elevations and what two
// fixed high-limits decide for it. The 28 Btu/lb fixed-enthalpy limit assumes sea level; the
// same 75 °F / 50 % air holds more enthalpy per pound of dry air where the air is thinner.
#include <limitline/model/highlimit.hpp>
#include <limitline/model/psychro.hpp>
#include <limitline/model/units.hpp>
#include <limitline/version.hpp>

#include <cstdio>
#include <exception>

namespace psy = limitline::psychro;
namespace hl = limitline::highlimit;
namespace units = limitline::units;

int main() {
  try {
    std::printf("limitline %s\n", limitline::version());
    hl::PresetSettings settings = hl::preset_defaults();
    settings.dry_bulb_limit_c = units::celsius_from_fahrenheit(75.0);
    settings.enthalpy_limit_kj_per_kg = units::enthalpy_si_from_ip(28.0);
    const hl::Strategy strategies[] = {
        hl::make_preset("fixed-dry-bulb", settings, "dry-bulb 75F"),
        hl::make_preset("fixed-enthalpy", settings, "enthalpy 28 Btu/lb"),
    };
    const double dry_bulb_c = units::celsius_from_fahrenheit(75.0);
    for (const double elevation_ft : {0.0, 6000.0}) {
      const double pressure_kpa = psy::standard_pressure_kpa(elevation_ft * 0.3048);
      const psy::Properties p = psy::properties(
          psy::state_from(dry_bulb_c, psy::HumidityInput::relative_humidity, 0.5, pressure_kpa));
      std::printf(
          "75F/50%% at %.0f ft: enthalpy %s, dew point %s\n", elevation_ft,
          units::format(units::Kind::enthalpy, units::System::ip, p.enthalpy_kj_per_kg, 1).c_str(),
          units::format(units::Kind::temperature, units::System::ip, p.dew_point_c, 1).c_str());
      const hl::AirValues outdoor =
          hl::air_values(p.dry_bulb_c, p.enthalpy_kj_per_kg, p.dew_point_c, p.humidity_ratio);
      for (const hl::Strategy& s : strategies) {
        hl::StrategyState state(s);
        // Fixed limits compare the outdoor air alone; the return air passed is not read.
        const bool enabled = hl::permits(s, outdoor, outdoor, state);
        std::printf("  %s: economizer %s\n", s.name.c_str(), enabled ? "enabled" : "off");
      }
    }
    return 0;
  } catch (const std::exception& e) {
    std::fprintf(stderr, "limitline_api_example: %s\n", e.what());
    return 1;
  }
}
