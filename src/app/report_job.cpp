#include <limitline/app/report_job.hpp>

#include <limitline/app/tune_job.hpp>
#include <limitline/report/monthly.hpp>
#include <limitline/report/tune.hpp>

#include <limitline/io/codes.hpp>
#include <limitline/io/embedded.hpp>
#include <limitline/error.hpp>
#include <limitline/analysis/point_check.hpp>

#include <fmt/format.h>

#include <algorithm>

namespace limitline {
namespace {

using units::Kind;

std::string q(Kind k, units::System s, double si, int decimals) {
  return units::format(k, s, si, decimals);
}

std::string air_text(const AirPoint& a, double p, units::System s) {
  const psychro::Properties pr = a.properties(p);
  return fmt::format("{}, {:.0f}% RH (dew point {}, enthalpy {})",
                     q(Kind::temperature, s, pr.dry_bulb_c, 1), 100.0 * pr.relative_humidity,
                     q(Kind::temperature, s, pr.dew_point_c, 1),
                     q(Kind::enthalpy, s, pr.enthalpy_kj_per_kg, 1));
}

std::vector<std::pair<std::string, std::string>> unit_facts(const UnitFile& u, units::System s) {
  const airside::AirHandler& a = u.air_handler;
  const double p = u.site.design_pressure_kpa();
  std::string min_oa = q(Kind::fraction, s, a.min_oa_fraction, 0);
  if (u.min_outdoor_airflow_m3_per_s)
    min_oa = fmt::format(
        "{} ({} of outdoor air)", min_oa,
        q(Kind::airflow, s, *u.min_outdoor_airflow_m3_per_s, s == units::System::ip ? 0 : 3));
  std::vector<std::pair<std::string, std::string>> f = {
      {"Supply air",
       fmt::format("{} at {}",
                   q(Kind::airflow, s, a.supply_airflow_m3_per_s, s == units::System::ip ? 0 : 3),
                   q(Kind::temperature, s, a.supply_air_temp_c, 1))},
      {"Supply fan", fmt::format("{}, heat {}", airside::fan_position_name(a.fan_position),
                                 q(Kind::temperature_difference, s, a.fan_heat_k, 1))},
      {"Outdoor air", fmt::format("{} minimum, {} maximum; {} economizer", min_oa,
                                  q(Kind::fraction, s, a.max_oa_fraction, 0),
                                  airside::economizer_name(a.economizer))},
      {"Mixed-air target", q(Kind::temperature, s, a.mixed_air_target_c(), 1)},
      {"Cooling coil",
       fmt::format("leaving {}, at most {} RH", q(Kind::temperature, s, a.coil_leaving_temp_c(), 1),
                   q(Kind::fraction, s, a.coil_leaving_rh_max, 0))},
      {"Return air", air_text(u.return_air, p, s)},
  };
  if (u.weights.cooling != 1.0 || u.weights.heating != 1.0)
    f.emplace_back("Energy weights", fmt::format("cooling {:.3g}, heating {:.3g}",
                                                 u.weights.cooling, u.weights.heating));
  return f;
}

}  // namespace

UnitFile load_unit(const UnitSource& source) {
  if (!source.embedded) return load_unit_file(source.path);
  const auto text = embedded::find(source.path);
  if (!text)
    throw InputError(
        fmt::format("embedded demo unit '{}' is missing from this build", source.path));
  return parse_unit_file(*text, source.path);
}

std::string pressure_basis(const Site& site, units::System s) {
  if (site.pressure_kpa) return "site pressure as given";
  if (site.elevation_m) return "standard pressure at " + q(Kind::length, s, *site.elevation_m, 0);
  return "sea-level standard pressure (no elevation given)";
}

std::vector<highlimit::Strategy> select_strategies(std::span<const highlimit::Strategy> all,
                                                   std::span<const std::string> names,
                                                   std::string_view origin,
                                                   std::string_view unit_label) {
  if (names.empty()) return {all.begin(), all.end()};
  std::vector<highlimit::Strategy> out;
  for (const auto& n : names) {
    const auto it =
        std::find_if(all.begin(), all.end(), [&](const auto& s) { return s.name == n; });
    if (it == all.end()) {
      std::string list;
      for (const auto& s : all) list += (list.empty() ? "'" : ", '") + s.name + "'";
      throw InputError(
          fmt::format("{}: '{}' is not a strategy of {} (it has {})", origin, n, unit_label, list));
    }
    out.push_back(*it);
  }
  return out;
}

report::ChartInput chart_input(const UnitFile& unit, std::vector<highlimit::Strategy> strategies,
                               units::System s) {
  report::ChartInput c;
  c.title = unit.site.name.empty() ? unit.path : unit.site.name;
  c.pressure_kpa = unit.site.design_pressure_kpa();
  c.pressure_basis = pressure_basis(unit.site, s);
  c.units = s;
  c.strategies = std::move(strategies);
  const psychro::MoistAir r = unit.return_air.state(c.pressure_kpa, unit.path + ": return air");
  c.return_air = {r.dry_bulb_c, r.humidity_ratio};
  c.mixed_air_target_c = unit.air_handler.mixed_air_target_c();
  return c;
}

void add_climate(report::ChartInput& chart, const annual::Prepared& prepared, std::string label) {
  chart.climate = report::climate_hours(prepared);
  chart.climate_label = std::move(label);
}

report::CheckMarks check_marks(const UnitFile& unit,
                               std::span<const highlimit::Strategy> strategies,
                               const AirPoint& outdoor, std::string_view outdoor_origin,
                               const AirPoint& ret, std::string_view return_origin) {
  const double p = unit.site.design_pressure_kpa();
  const psychro::MoistAir o = outdoor.state(p, outdoor_origin);
  const psychro::MoistAir r = ret.state(p, return_origin);
  const PointCheck pc = check_point(unit.air_handler, unit.weights, strategies, o, r);
  const airside::Operation& op = pc.changeover_enables ? pc.choice.enabled : pc.choice.disabled;
  report::CheckMarks m;
  m.outdoor = {o.dry_bulb_c, o.humidity_ratio};
  m.ret = {r.dry_bulb_c, r.humidity_ratio};
  m.mixed = {op.mixed.dry_bulb_c, op.mixed.humidity_ratio};
  m.oa_fraction = op.oa_fraction;
  m.note = !pc.choice.cooling_needed ? "no cooling needed"
           : pc.changeover_enables   ? "perfect changeover: economize"
                                     : "perfect changeover: do not economize";
  return m;
}

std::optional<report::ComplianceSection> compliance(const UnitFile& unit,
                                                    std::span<const highlimit::Strategy> strategies,
                                                    units::System s) {
  const Site& site = unit.site;
  if (site.energy_code.empty() && site.climate_zone.empty()) return std::nullopt;
  if (site.energy_code.empty() || site.climate_zone.empty())
    throw InputError(
        fmt::format("{}: the site names {} but no {}; give both site.energy_code and "
                    "site.climate_zone, or neither",
                    site.energy_code.empty() ? site.climate_zone_origin : site.energy_code_origin,
                    site.energy_code.empty() ? "a climate zone" : "an energy code",
                    site.energy_code.empty() ? "energy code" : "climate zone"));
  const codes::CodeTables tables = codes::CodeTables::load_installed();
  const codes::Edition& ed = tables.edition(site.energy_code, site.energy_code_origin);
  const codes::ZoneRequirements zone = codes::requirements(
      ed, site.climate_zone, codes::SiteConditions{site.design_pressure_kpa(), {}},
      site.climate_zone_origin);
  report::ComplianceSection out;
  out.label = fmt::format("{} ({}), climate zone {}", ed.title, ed.id, zone.zone);
  const codes::IntegrationCheck integ = codes::check_integration(ed, unit.air_handler.economizer);
  if (integ.rule && integ.rule->required)
    out.notes.push_back(fmt::format(
        "Economizer integration ({}): {} This unit's economizer is {}: {}.", integ.rule->clause,
        integ.rule->requirement, airside::economizer_name(unit.air_handler.economizer),
        integ.complies ? "complies" : "does not comply"));
  if (!ed.provenance.empty()) out.notes.push_back("Code table values: " + ed.provenance + ".");
  for (const auto& st : strategies) {
    const codes::StrategyCheck chk = codes::check_strategy(zone, st);
    out.lines.push_back({st.name, std::string(codes::verdict_word(chk.verdict)),
                         codes::verdict_text(chk, zone, s)});
  }
  return out;
}

report::ReportDocument report_document(const YearInputs& in, const annual::Prepared& prepared,
                                       const annual::YearResult& year, units::System s) {
  report::ReportDocument d;
  d.context = year_context(in, s);
  d.compliance = compliance(in.unit, in.strategies, s);
  if (d.compliance) {
    d.context.code_label = d.compliance->label;
    d.context.code_name = d.compliance->label;
    for (const auto& l : d.compliance->lines) d.context.compliance[l.strategy] = l.verdict;
  }
  d.unit_facts = unit_facts(in.unit, s);
  for (const auto& st : in.strategies) d.strategy_order.push_back(st.name);
  report::ChartInput chart = chart_input(in.unit, in.strategies, s);
  add_climate(chart, prepared, in.weather_label);
  d.chart_svg = report::psychrometric_chart_svg(chart);
  d.monthly_svg = report::monthly_hours_svg(year, d.strategy_order,
                                            "Month by month against the perfect changeover");
  // The setpoint tuning of every strategy: tens of milliseconds on the prepared year.
  TuneOptions topt;
  topt.units = s;
  const TuneResult tuned = run_tune(in, prepared, topt);
  report::YearContext tc = d.context;
  tc.code_label = tuned.code_label;
  const report::TuneReport rep{&tuned, &tc, prepared.operating_hours, tuned.perfect_savings};
  report::TuningSection ts;
  ts.markdown = report::tune_summary_markdown(rep);
  for (const auto& t : tuned.strategies)
    ts.plots.emplace_back(t.strategy.name, report::tune_plot_svg(t, tc));
  d.tuning = std::move(ts);
  return d;
}

}  // namespace limitline
