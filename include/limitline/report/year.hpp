#pragma once
// The annual report: ranked strategies, wrong decisions, monthly hours, in text, Markdown,
// CSV and JSON. Formatting only: every number comes from annual::YearResult.
#include <limitline/analysis/annual.hpp>
#include <limitline/report/table.hpp>
#include <limitline/model/part_load.hpp>
#include <limitline/model/plant.hpp>
#include <limitline/model/units.hpp>

#include <optional>

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
  std::string code_label;  // "ASHRAE 90.1-2019, climate zone 4A (tables from memory; ...)"
  std::string code_name;   // the same without the note: "ASHRAE 90.1-2019, climate zone 4A"
  std::map<std::string, std::string> compliance;
  // Implausible inputs and disagreements between inputs, one line each (YearInputs::warnings).
  std::vector<std::string> warnings;
  // The model that priced the hours, in words (describe_model).
  std::string model;
  // With a [plant], the figures the ranking is in are a cost in its currency.
  std::optional<Plant> plant;
  // The width text tables fit (report::kTextWidth; kUnlimitedWidth for --wide).
  std::size_t text_width = kTextWidth;
};

// The ranked table: rank and strategy as keys, the decision figures (shortfall, wrong hours,
// savings, code verdict) in group 0, the hours and energies behind them in group 1.
Table ranked_table(const annual::YearResult& y, const YearContext& c);

// "part load: variable airflow (floor 30 %), supply air reset from 60 °F at 50 °F outdoor to
// 55 °F at 65 °F; space 75 °F, return 1 °F above it; loads: 150 kBtu/h internal, ...", or the
// design model's one line.
std::string describe_model(const part_load::Control& control,
                           const std::optional<part_load::Space>& space,
                           std::string_view loads_source, units::System s);

// The figures a ranking is in: the weighted coil energy (kBtu in IP, kWh in SI), or with a
// plant, its cost. `key` names a JSON or CSV field: "shortfall" → "shortfall_kwh" (and the
// kBtu twin in IP), or "shortfall_cost".
class Measure {
 public:
  Measure(units::System s, const std::optional<Plant>& plant)
      : s_(s), currency_(plant ? plant->currency : std::string()) {}
  explicit Measure(const YearContext& c) : Measure(c.units, c.plant) {}
  // The measure of a survey, which records only the currency (empty: weighted energy).
  Measure(units::System s, std::string currency) : s_(s), currency_(std::move(currency)) {}
  [[nodiscard]] bool is_cost() const { return !currency_.empty(); }
  [[nodiscard]] double display(double v) const;
  [[nodiscard]] std::string format(double v) const;  // rounded for a table
  [[nodiscard]] std::string unit() const;            // "kBtu", "kWh" or the currency
  [[nodiscard]] std::string basis() const;           // "weighted coil cooling + heating, kBtu"
  // The JSON fields of one figure: (key, value) pairs.
  [[nodiscard]] std::vector<std::pair<std::string, double>> fields(std::string_view stem,
                                                                   double v) const;

 private:
  units::System s_;
  std::string currency_;
};

class Json;

// The inputs block every annual-based report starts with: unit, site, weather and its
// mapping, schedule, units (JSON fields, and the human lines).
void json_context(Json& j, const YearContext& c);
std::vector<std::string> context_lines(const YearContext& c);

// The recommendation in sentences (docs/model.md §Recommendation): the best strategy the
// code allows, the best overall when the code turns it down, ties and the all-tied case.
std::vector<std::string> recommendation_lines(const annual::YearResult& y, const YearContext& c);

std::string year_text(const annual::YearResult& y, const YearContext& c);
std::string year_markdown(const annual::YearResult& y, const YearContext& c);
std::string year_csv(const annual::YearResult& y, const YearContext& c);
std::string year_json(const annual::YearResult& y, const YearContext& c);

// Energy in display units: kBtu (IP) or kWh (SI), and cooling in ton-hours (IP) or kWh.
double energy_display(double kwh, units::System s);
std::string_view energy_unit(units::System s);

}  // namespace limitline::report
