#pragma once
// The annual report: ranked strategies, wrong decisions, monthly hours, in text, Markdown,
// CSV and JSON. Formatting only: every number comes from annual::YearResult.
#include <limitline/analysis/annual.hpp>
#include <limitline/model/units.hpp>

#include <map>
#include <string>
#include <vector>

namespace limitline::report {

struct YearContext {
  std::string title;                       // unit or site name
  std::string unit_source;                 // unit file path, or "embedded demo"
  std::string site;                        // one line: site name and pressure basis
  std::string weather_source;              // weather file path, or embedded demo climate name
  std::vector<std::string> weather_notes;  // column mapping, calendar notes, bad-row counts
  std::string schedule;                    // Schedule::describe()
  units::System units = units::System::ip;
  // One line per strategy name: its conditions in words.
  std::map<std::string, std::string> strategy_descriptions;
  // Energy-code compliance per strategy name, when the site names an edition and zone.
  std::string code_label;  // "ASHRAE 90.1-2019, climate zone 4A"
  std::map<std::string, std::string> compliance;
  // Implausible inputs and disagreements between inputs, one line each (YearInputs::warnings).
  std::vector<std::string> warnings;
};

class Json;

// The inputs block every annual-based report starts with: unit, site, weather and its
// mapping, schedule, units (JSON fields, and the human lines).
void json_context(Json& j, const YearContext& c);
std::vector<std::string> context_lines(const YearContext& c);

std::string year_text(const annual::YearResult& y, const YearContext& c);
std::string year_markdown(const annual::YearResult& y, const YearContext& c);
std::string year_csv(const annual::YearResult& y, const YearContext& c);
std::string year_json(const annual::YearResult& y, const YearContext& c);

// Energy in display units: kBtu (IP) or kWh (SI), and cooling in ton-hours (IP) or kWh.
double energy_display(double kwh, units::System s);
std::string_view energy_unit(units::System s);

}  // namespace limitline::report
