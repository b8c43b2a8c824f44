#pragma once
// One moist-air state as practitioners write it: a dry-bulb and one humidity form, e.g.
// "68F/80%", "68F/dp58F", "68F/wb62F", "68F/w0.011" or "20C/h45kJ/kg".
//
// The text alone does not fix the state: RH, wet-bulb and dew point give a humidity ratio
// only at a pressure, so an AirPoint is resolved against the site pressure when it is used.
#include <limitline/model/airside.hpp>
#include <limitline/model/highlimit.hpp>
#include <limitline/model/psychro.hpp>
#include <limitline/model/units.hpp>

#include <string>
#include <string_view>
#include <vector>

namespace limitline {

struct AirPoint {
  double dry_bulb_c = 0.0;
  psychro::HumidityInput humidity_kind = psychro::HumidityInput::relative_humidity;
  double humidity_value = 0.0;  // SI: fraction, °C, kg/kg or kJ/kg, as humidity_kind says
  units::System system = units::System::si;  // the system it was written in: its messages' units

  // The state at a pressure. Throws InputError for impossible states (RH over 100 %, dew
  // point or wet-bulb above the dry-bulb, beyond saturation), with values in `system`; when
  // `origin` is not empty the message starts with it.
  [[nodiscard]] psychro::MoistAir state(double pressure_kpa, std::string_view origin = {}) const;
  [[nodiscard]] psychro::Properties properties(double pressure_kpa,
                                               std::string_view origin = {}) const;
  [[nodiscard]] airside::AirState at(double pressure_kpa) const;
  [[nodiscard]] highlimit::AirValues values(double pressure_kpa) const;
};

// Parses "DRYBULB/HUMIDITY". The humidity part is a relative humidity ("80%", "rh80%"), a dew
// point ("dp58F"), a wet-bulb ("wb62F"), a humidity ratio ("w0.011", "w9.3g/kg") or an
// enthalpy ("h28btu/lb"). Bare numbers take the units of `bare`. Errors start with `origin`
// and say which forms are allowed. Only the syntax and units are checked here; the state
// itself is checked by AirPoint::state.
[[nodiscard]] AirPoint parse_air_point(std::string_view text, units::System bare,
                                       std::string_view origin);

// Which air a point is, for its plausible bands (plausible.hpp): outdoor air, or return air
// (the bands of the unit file's return_air_* keys).
enum class AirRole { outdoor, return_air };
// parse_air_point, with the dry-bulb and the humidity each weighed against the band of that
// air: a bare number that is plausible only in the other unit system is refused with both
// readings; any other implausible value is kept and described in `warnings`.
[[nodiscard]] AirPoint parse_air_point(std::string_view text, units::System bare,
                                       std::string_view origin, AirRole role,
                                       std::vector<std::string>& warnings);

// The forms parse_air_point accepts, for help texts and error messages.
inline constexpr std::string_view kAirPointForms =
    "DRYBULB/RH (68F/80%), DRYBULB/dpDEWPOINT (68F/dp58F), DRYBULB/wbWETBULB (68F/wb62F), "
    "DRYBULB/wHUMIDITYRATIO (68F/w0.011) or DRYBULB/hENTHALPY (68F/h30btu/lb)";

// The kind of quantity a humidity input is written as (RH a fraction, dew point and wet-bulb
// temperatures, ...), so every table of humidity spellings needs only the input.
[[nodiscard]] units::Kind humidity_input_kind(psychro::HumidityInput input);

// The decision values (dry-bulb, enthalpy, dew point, humidity ratio) of a state.
[[nodiscard]] highlimit::AirValues air_values(const psychro::Properties& p);

}  // namespace limitline
