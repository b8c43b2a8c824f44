#pragma once
// Quantities at the edges: parsing text with its unit, and converting SI values for display.
//
// Internals are SI; this is the only place where °F, Btu/lb, psia, cfm and friends exist.
// IP enthalpy uses a 0 °F dry-air datum and SI a 0 °C one, so an enthalpy is converted with
// the datum shift h_IP = h_SI/2.326 + 7.68 (0.240 Btu/lb·°F × 32 °F), never as plain energy.
#include <limitline/error.hpp>
#include <limitline/names.hpp>

#include <span>
#include <string>
#include <string_view>
#include <utility>

namespace limitline::units {

enum class System { ip, si };

// "ip" or "si" (any case); anything else is an InputError naming `origin`.
[[nodiscard]] System parse_system(std::string_view text, std::string_view origin = "--units");
[[nodiscard]] std::string_view system_name(System s);  // "ip", "si"
[[nodiscard]] std::span<const Named<System>> system_names();

// Kinds of quantity the tool reads and writes. Each has its SI unit, a default unit for bare
// numbers in each system, and the spellings it accepts.
enum class Kind {
  temperature,             // °C
  temperature_difference,  // K
  enthalpy,                // kJ/kg dry air, 0 °C datum
  enthalpy_difference,     // kJ/kg dry air (no datum: offsets, deadbands, loads per kg)
  pressure,                // kPa
  length,                  // m
  fraction,                // 0–1 (written as a percentage)
  humidity_ratio,          // kg/kg
  airflow,                 // m³/s
  energy,                  // kWh
  power,                   // kW
  specific_volume,         // m³/kg dry air
  density,                 // kg/m³
  conductance,             // kW/K (a heat flow per degree: envelope UA)
};

// Human name of the kind ("a temperature", "an enthalpy") for error messages.
[[nodiscard]] std::string_view kind_name(Kind k);

// Parses `text` ("75F", "23.9 °C", "28btu/lb", "50%", "0.0093", "12000cfm", "20,000 cfm") as
// a quantity of `kind` and returns it in SI. A bare number takes the default unit of `bare`
// (°F or °C, and so on); a bare fraction is read as a percentage, and a bare value strictly
// between 0 and 1 is refused as ambiguous. Commas may group digits by three; any other comma
// is refused. A value beyond the kind's absolute bounds (below absolute zero, an airflow of
// 1e308 cfm) is refused, so no parsed quantity can overflow a calculation. `origin` says where
// the text came from (an option, or file:line key) and starts every error message. Throws
// InputError.
[[nodiscard]] double parse(Kind kind, std::string_view text, System bare, std::string_view origin);

// The SI value of one `unit` of `kind` ("kBtu/h" → 0.29307 kW), for values whose unit is
// written apart from them (a CSV column's unit). Only for kinds without a datum offset
// (not temperatures or enthalpies). An unknown spelling is an InputError naming `origin`
// and the spellings allowed.
[[nodiscard]] double unit_scale(Kind kind, std::string_view unit, std::string_view origin);

// Parses a plain number (no unit) or throws InputError naming `origin`.
[[nodiscard]] double parse_number(std::string_view text, std::string_view origin);

// True when `text` carries an explicit unit (anything after the number).
[[nodiscard]] bool has_unit(std::string_view text);

// The absolute bounds parse() holds a kind to (SI): absolute zero for a temperature, 0 for a
// pressure, a thousand times any air-side figure for the rest.
[[nodiscard]] std::pair<double, double> absolute_bounds(Kind kind);

// True when `value` lies in [lo, hi] up to the rounding of a unit conversion, so that an end
// point written in either system ("36F" for 20 K) is inside; held_within() returns such a
// value held to the end it rounds past (others unchanged).
[[nodiscard]] bool within(double value, double lo, double hi);
[[nodiscard]] double held_within(double value, double lo, double hi);

// The unit as a user writes it after a number ("F", "kJ/kg", "cfm"), for "write \"75F\"".
[[nodiscard]] std::string_view written_unit(Kind kind, System system);

// A value for a message, converted to `system` with up to `significant` digits ("75 °C",
// "20000 cfm", "23.8889 °C").
[[nodiscard]] std::string format_brief(Kind kind, System system, double value_si,
                                       int significant = 6);
// A range for a message ("10 °C to 40 °C"), each end rounded toward the inside at 4 decimals
// so that an end written as shown is accepted.
[[nodiscard]] std::string format_range(Kind kind, System system, double lo_si, double hi_si);

// SI value → display value in `system`, and back.
[[nodiscard]] double to_display(Kind kind, System system, double value_si);
[[nodiscard]] double from_display(Kind kind, System system, double display_value);

// Display unit label ("°F", "Btu/lb", "kJ/kg", "cfm", "%").
[[nodiscard]] std::string_view unit_label(Kind kind, System system);
// Suffix of a JSON or CSV key for that unit ("f", "c", "btu_per_lb", "kj_per_kg", "psia").
[[nodiscard]] std::string_view key_suffix(Kind kind, System system);

// Enthalpy datum shift (docs/model.md §Units and datums), exposed for tests and the chart.
[[nodiscard]] constexpr double enthalpy_ip_from_si(double h_kj_per_kg) {
  return h_kj_per_kg / 2.326 + 7.68;
}
[[nodiscard]] constexpr double enthalpy_si_from_ip(double h_btu_per_lb) {
  return (h_btu_per_lb - 7.68) * 2.326;
}

[[nodiscard]] constexpr double fahrenheit_from_celsius(double c) { return c * 1.8 + 32.0; }
[[nodiscard]] constexpr double celsius_from_fahrenheit(double f) { return (f - 32.0) / 1.8; }

// Formats an SI value for display: converted, rounded to `decimals`, with its unit label.
[[nodiscard]] std::string format(Kind kind, System system, double value_si, int decimals);

}  // namespace limitline::units
