#pragma once
// The unit file (TOML): one air handler, its site, its return air, and the high-limit
// strategies to weigh for it. Every key is documented in the README section 'The unit file'.
//
// Reading is strict: an unknown key, a value of the wrong kind (a temperature where an
// enthalpy belongs), a missing required key or a contradiction is an InputError whose one-line
// message starts "FILE:LINE: KEY:". The [weather], [schedule] and [sensors] tables are kept
// raw for the layers that own them; they validate their own keys.
#include <limitline/model/air_point.hpp>
#include <limitline/model/airside.hpp>
#include <limitline/model/highlimit.hpp>
#include <limitline/model/part_load.hpp>
#include <limitline/model/plant.hpp>
#include <limitline/model/units.hpp>
#include <limitline/text.hpp>
#include <limitline/io/raw_table.hpp>
#include <limitline/io/trend.hpp>
#include <limitline/io/weather.hpp>

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace limitline {

struct Site {
  std::string name;
  std::optional<double> elevation_m;
  std::optional<double> pressure_kpa;
  std::string energy_code;   // as written; the code layer checks it against its tables
  std::string climate_zone;  // as written
  // "FILE:LINE: site.energy_code" (and climate_zone) for the messages of the layers that
  // check these values; empty when the key is absent.
  std::string energy_code_origin;
  std::string climate_zone_origin;
  // "FILE:LINE: site.elevation" (or site.pressure), whichever is given; empty when neither.
  std::string pressure_origin;

  // The pressure every state of the site is computed at: `pressure` when given, else the
  // standard pressure at `elevation` (ASHRAE Fundamentals ch. 1 eq. 3), else sea level.
  double design_pressure_kpa() const;
};

// [audit]: how the unit's trend logs are read and judged, so that one unit file and one log
// reproduce an audit record. Every key is optional; an option of the audit command overrides
// its key. Each `*_origin` is "FILE:LINE: audit.KEY" for the messages of later checks.
struct AuditSettings {
  std::vector<trend::ColumnOverride> columns;  // [audit.columns] QUANTITY = "HEADER[:UNIT]"
  // Sensor accuracies, one standard uncertainty, K.
  std::optional<double> outdoor_accuracy_k, return_accuracy_k, mixed_accuracy_k, supply_accuracy_k;
  std::optional<double> max_gap_s;    // max_gap_minutes
  std::optional<int> utc_offset_min;  // the log's clock
  std::optional<int> min_samples;     // significance
  std::optional<double> min_hours;    // significance
  std::optional<double> supply_tolerance_k;
};

// The return air the unit is designed around (air_handler.return_air_*).
using ReturnAir = AirPoint;

struct UnitFile {
  std::string path;  // the name errors are reported under
  Site site;
  airside::AirHandler air_handler;
  // air_handler.min_outdoor_airflow when the minimum was given as an airflow (the fraction
  // in air_handler is derived from it), so reports can show what was written.
  std::optional<double> min_outdoor_airflow_m3_per_s;
  // air_handler.design_cooling_capacity (kW) and "FILE:LINE: air_handler.design_cooling_capacity":
  // the capacity the energy code's economizer requirement is weighed on; absent, it is
  // estimated (cooling_capacity()).
  std::optional<double> design_cooling_capacity_kw;
  std::string design_cooling_capacity_origin;
  ReturnAir return_air;
  // How airflow and supply temperature follow the hour (the part-load keys of [air_handler]:
  // airflow_control, min_airflow, airflow_basis, supply_air_reset; min_outdoor_airflow).
  part_load::Control control;
  // [loads]: the space the unit serves. Absent: the design model (design airflow and return
  // air every occupied hour).
  std::optional<part_load::Space> space;
  // [loads] file = ...: hourly loads from a load-calculation program, read by the app layer
  // and matched to the weather (space->coefficients is then absent).
  struct LoadsFile {
    std::string path;    // as written, resolved against the unit file's folder
    std::string origin;  // "FILE:LINE: loads.file"
    // unit: a power unit ("kW", "Btu/h"); empty: the unit the column's header gives.
    std::string sensible_column, sensible_unit;
    std::string latent_column, latent_unit;  // empty column: no latent loads in the file
    // "FILE:LINE: loads.sensible" (and latent), for the messages of the loads reader.
    std::string sensible_origin, latent_origin;
    // Whether the file's stamps mark the start or the end of their interval (automatic:
    // hour-ending when a stamp reads 24:00, as for the weather).
    weather::TimeConvention time_convention = weather::TimeConvention::automatic;
  };
  std::optional<LoadsFile> loads_file;
  // [plant]: prices the energy; the references and the ranking then choose by cost.
  std::optional<Plant> plant;
  airside::EnergyWeights weights;                      // [energy], or the plant's cost weights
  std::vector<highlimit::Strategy> strategies;         // as written; empty when none are given
  bool strategies_defaulted = true;                    // no [[strategy]] in the file
  std::optional<RawTable> weather, schedule, sensors;  // raw, validated by their layers
  std::optional<AuditSettings> audit;                  // [audit]
  units::System units = units::System::ip;  // the system bare numbers in the file are read in
  // Values that are physically valid but implausible for an air handler, one line each
  // ("FILE:LINE: KEY: ..."): shown in every report's context block and on stderr, errors
  // under --strict.
  std::vector<std::string> warnings;
};

// Parses a unit file from text; `name` is the file name used in messages.
UnitFile parse_unit_file(std::string_view text, std::string_view name);
// A unit file is a page of settings; anything near this size is not one.
inline constexpr std::uintmax_t kMaxUnitFileBytes = 1u << 20;
// Reads and parses a file; an unreadable file is an InputError naming the path.
UnitFile load_unit_file(const std::string& path);

// The file's strategies, or every preset at its common-practice defaults when it gives none.
// When [site] names both energy_code and climate_zone, the preset settings the file leaves
// out take that code's required values for the zone (codes::apply_code_defaults, from the
// installed tables, at the site pressure when the site gives one), so every command sees the
// same strategies; an unknown edition or zone is an InputError naming the [site] key.
[[nodiscard]] std::vector<highlimit::Strategy> strategies_or_presets(const UnitFile& unit);
// The same with the code tables already loaded (a survey judges many sites with one set).
namespace codes {
class CodeTables;
}
[[nodiscard]] std::vector<highlimit::Strategy> strategies_or_presets(
    const UnitFile& unit, const codes::CodeTables& tables);

// The cooling capacity the economizer requirement is weighed on: design_cooling_capacity as
// written, or an estimate from the airflow (airside::return_air_coil_load_kw at the design
// return air and site pressure).
struct CoolingCapacity {
  double kw;
  bool estimated;
  std::string basis;  // the key's origin, or how the estimate was made
};
[[nodiscard]] CoolingCapacity cooling_capacity(const UnitFile& unit);

// A name as the unit file compares it: no case, no spaces, '_' the same as '-' ("Dew_Point"
// → "dew-point"), for every layer that reads names from its tables.
using text::normalise_name;

}  // namespace limitline
