#pragma once
// Plausibility, separate from physical validity: the band each air-handler quantity of the
// unit file and the command line usually lies in (common practice), and what a value outside
// it means.
//
// A value outside its physical range is an error where it is read (units::parse refuses
// magnitudes beyond any physical bound; each reader checks its own range). A value inside
// that range but outside its plausible band is most often a number in the wrong unit system:
// `return_air_temp = 75` in an SI file is 75 °C. So a bare number outside its band whose
// reading in the other system is inside is refused with both readings spelt out, and any
// other value outside its band is used with a warning ("FILE:LINE: KEY: ...").
#include <limitline/model/units.hpp>

#include <span>
#include <string>
#include <string_view>
#include <vector>

namespace limitline::plausible {

struct Band {
  std::string_view name;  // the unit-file key or option it weighs ("return_air_temp")
  units::Kind kind;
  double lo, hi;          // SI
  std::string_view what;  // "a return-air dry-bulb", for messages
};

// Every band, and one by name (nullptr when the name has none).
[[nodiscard]] std::span<const Band> bands();
[[nodiscard]] const Band* find(std::string_view name);

// Where a value was written: `origin` starts every message ("FILE:LINE: KEY", "--outdoor
// dry-bulb"); `bare_reading` says how a bare number there is read ("in an SI file", "with
// --units si").
struct Source {
  std::string origin;
  std::string bare_reading;
};
// The two readings of a bare number: in a unit file ("in an SI file") and on the command line
// ("read in SI units").
[[nodiscard]] std::string in_file(units::System bare);
[[nodiscard]] std::string on_command_line(units::System bare);

// Parses `text` as the band's kind (units::parse, with its absolute bounds) in the `bare`
// system and weighs it against the band. Inside: the value. Outside, a bare number whose
// reading in the other system is inside: InputError naming both readings and the spelling to
// write ("75 in an SI file is 75 °C, ...; if you meant 75 °F write \"75F\""). Otherwise the
// value, with one warning appended to `warnings` (values shown in the `bare` system).
[[nodiscard]] double parse(const Band& band, std::string_view text, units::System bare,
                           const Source& source, std::vector<std::string>& warnings);

// The band of a plain number (a COP, an efficiency, a price): without a unit there is no
// other reading, so a value outside is always used, with a warning.
struct NumberBand {
  std::string_view name;  // the unit-file key it weighs ("plant.cooling_cop")
  double lo, hi;
  std::string_view what;        // "a cooling COP", for messages
  std::string_view above_hint;  // what a value above the band most likely is; may be empty
};
[[nodiscard]] std::span<const NumberBand> number_bands();
[[nodiscard]] const NumberBand* find_number(std::string_view name);
// Appends one warning to `warnings` when `value` lies outside the band ("ORIGIN: 12 is
// outside the plausible range of a cooling COP (1.5 to 10, common practice); used as
// written"); `origin` is "FILE:LINE: KEY".
void weigh(const NumberBand& band, double value, std::string_view origin,
           std::vector<std::string>& warnings);

}  // namespace limitline::plausible
