#pragma once
// The reports of `limitline code`: what one edition allows in one climate zone, a unit's
// strategies judged against an edition, the zone-by-edition matrix of every loaded edition,
// and the list of loaded editions. Text, Markdown and JSON; each ends with the code cautions.
// Formatting only: requirements and verdicts come from io/codes.
#include <limitline/io/codes.hpp>
#include <limitline/model/airside.hpp>
#include <limitline/model/highlimit.hpp>
#include <limitline/model/units.hpp>
#include <limitline/report/table.hpp>

#include <optional>
#include <string>
#include <vector>

namespace limitline::report {

// The allowed and prohibited controls of one zone, with the integrated-economizer rule (the
// economizer checked against it when one is given), whether the zone requires an economizer
// and from which cooling capacity, and the selectable-setpoint footnote where the edition has
// one.
// The text forms lay their tables out to `width` columns (report/table.hpp).
std::string code_zone_text(const codes::ZoneRequirements& req, units::System s,
                           std::optional<airside::EconomizerType> economizer,
                           std::size_t width = kTextWidth);
std::string code_zone_markdown(const codes::ZoneRequirements& req, units::System s,
                               std::optional<airside::EconomizerType> economizer);
std::string code_zone_json(const codes::ZoneRequirements& req, units::System s,
                           std::optional<airside::EconomizerType> economizer);

// Where the pressure the altitude footnote used came from.
enum class FootnotePressure { command_line, unit_site, sea_level };

// The unit's own weather file beside the pressure the altitude footnote used: its median
// station pressure, or why it could not be read (the verdicts need no weather).
struct WeatherPressure {
  std::string unread;  // the reading error; when set, the fields below are not
  std::string label;   // the weather file
  double median_kpa = 0.0;
  double footnote_kpa = 0.0;
  FootnotePressure footnote_from = FootnotePressure::sea_level;
};

// A unit file's strategies judged against the requirements of its edition and zone.
struct CodeVerdicts {
  std::string unit_path;
  const codes::ZoneRequirements* req = nullptr;
  std::vector<highlimit::Strategy> strategies;
  std::vector<codes::StrategyCheck> checks;  // one per strategy, in the same order
  bool defaulted = false;                    // the strategies are the presets at defaults
  airside::EconomizerType economizer = airside::EconomizerType::integrated;
  std::string edition_from, zone_from;     // where the edition and zone were named
  std::optional<WeatherPressure> weather;  // when the unit names a weather file
  // Whether the code requires an economizer on this unit: its cooling capacity (kW), where
  // that figure came from (the key's FILE:LINE, or how it was estimated), and the answer.
  double capacity_kw = 0.0;
  bool capacity_estimated = false;
  std::string capacity_basis;
  codes::NeedCheck need;
};

std::string code_unit_text(const CodeVerdicts& v, units::System s, std::size_t width = kTextWidth);
std::string code_unit_markdown(const CodeVerdicts& v, units::System s);
std::string code_unit_json(const CodeVerdicts& v, units::System s);

// Every loaded edition side by side, zone by zone: the settings each allows, at the site
// pressure when one is given (else the tables' sea-level figures).
std::string code_matrix_text(const codes::CodeTables& tables, std::optional<double> pressure_kpa,
                             std::optional<units::System> compare_in, units::System s,
                             std::size_t width = kTextWidth);
std::string code_matrix_markdown(const codes::CodeTables& tables,
                                 std::optional<double> pressure_kpa,
                                 std::optional<units::System> compare_in, units::System s);
std::string code_matrix_json(const codes::CodeTables& tables, std::optional<double> pressure_kpa,
                             std::optional<units::System> compare_in, units::System s);

// The loaded editions, their zones and the files they came from.
std::string code_editions_text(const codes::CodeTables& tables, std::size_t width = kTextWidth);
std::string code_editions_markdown(const codes::CodeTables& tables);
std::string code_editions_json(const codes::CodeTables& tables);

}  // namespace limitline::report
