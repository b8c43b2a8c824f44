#pragma once
// What `limitline chart` and `limitline report` assemble from a unit file: the chart at the
// site pressure, a climate's occupied hours on it, one checked operating point, the energy-code
// verdicts of the strategies, and the study document around the annual results.
#include <limitline/model/air_point.hpp>
#include <limitline/report/chart.hpp>
#include <limitline/report/html.hpp>
#include <limitline/app/year_job.hpp>

#include <optional>
#include <span>
#include <string>
#include <vector>

namespace limitline {

// The unit file alone, without reading its weather (for a chart of one checked point).
UnitFile load_unit(const UnitSource& source);

// How the site pressure was found, in words: "site pressure as given", "standard pressure at
// 33 ft", "sea-level standard pressure (no elevation given)".
std::string pressure_basis(const Site& site, units::System s);

// The strategies named (in the order given), or all of them when `names` is empty. An unknown
// name is an InputError naming `origin` and listing the strategies there are.
std::vector<highlimit::Strategy> select_strategies(std::span<const highlimit::Strategy> all,
                                                   std::span<const std::string> names,
                                                   std::string_view origin,
                                                   std::string_view unit_label);

// The chart of a unit at its design pressure: its strategies, return air and mixed-air target.
report::ChartInput chart_input(const UnitFile& unit, std::vector<highlimit::Strategy> strategies,
                               units::System s);

// Adds the occupied hours of a prepared year as the climate overlay.
void add_climate(report::ChartInput& chart, const annual::Prepared& prepared, std::string label);

// One operating point at the design pressure: outdoor, return and the mixed air of the perfect
// changeover's choice for that hour. Impossible states are InputErrors starting with their origin.
report::CheckMarks check_marks(const UnitFile& unit,
                               std::span<const highlimit::Strategy> strategies,
                               const AirPoint& outdoor, std::string_view outdoor_origin,
                               const AirPoint& ret, std::string_view return_origin);

// The energy-code verdict of every strategy when the site names both an edition and a climate
// zone (with the code tables of codes::CodeTables::load_installed); nothing when it names
// neither. A site naming only one of them is an InputError saying which is missing.
std::optional<report::ComplianceSection> compliance(const UnitFile& unit,
                                                    std::span<const highlimit::Strategy> strategies,
                                                    units::System s);

// The study document: the annual report's context (with the compliance column), the facts of
// the air handler, both pictures and the compliance section.
report::ReportDocument report_document(const YearInputs& in, const annual::Prepared& prepared,
                                       const annual::YearResult& year, units::System s);

}  // namespace limitline
