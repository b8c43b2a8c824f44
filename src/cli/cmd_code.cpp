// limitline code: what an energy code allows for the high-limit, and verdicts for a unit.
#include "common.hpp"

#include <limitline/io/codes.hpp>
#include <limitline/model/psychro.hpp>
#include <limitline/report/code.hpp>
#include <limitline/io/unit_file.hpp>
#include <limitline/app/year_job.hpp>

#include <fmt/format.h>

#include <filesystem>

namespace limitline::cli {
namespace {

using units::System;

std::string details() {
  return fmt::format(
      "Lists what an energy code allows for the economizer high-limit in a climate zone, or\n"
      "judges the strategies of a unit file against it.\n\n"
      "  limitline code --edition ashrae-90.1-2019 --zone 4A\n"
      "      the allowed high-limit control types in the zone with their required settings,\n"
      "      clause, footnotes and provenance; the prohibited types; whether the zone\n"
      "      requires an economizer and from which cooling capacity; the integrated-\n"
      "      economizer requirement (checked when --economizer is given); the selectable-\n"
      "      setpoint footnote where the edition has one.\n"
      "  limitline code UNIT.toml\n"
      "      a verdict for every [[strategy]] of the unit file (every preset at its default\n"
      "      settings when it has none), edition and zone from its [site] energy_code and\n"
      "      climate_zone (--edition and --zone override them):\n"
      "        complies       an allowed type, set as the table requires\n"
      "        complies-if-selectable\n"
      "                       off the listed fixed limit, but within the edition's allowance\n"
      "                       for devices whose setpoints are selectable in steps\n"
      "        not-allowed    the type is prohibited, or not listed, in this zone\n"
      "        set-wrong      an allowed type with a setting off by more than the tolerance\n"
      "                       (says by how much and which way)\n"
      "        not-evaluable  the conditions are equivalent to no control type\n"
      "      with the compliant settings to use instead, the unit's economizer against\n"
      "      the integrated-economizer requirement, and whether an economizer is required\n"
      "      for this unit: its air_handler.design_cooling_capacity, or when absent an\n"
      "      estimate from the supply airflow and the design return air (labelled so).\n"
      "      Preset settings the unit file leaves out take the [site] code's values.\n"
      "  limitline code --all-editions    one matrix, zone x edition, of what is allowed\n"
      "  limitline code --list-editions   the loaded editions and the files they came from\n\n"
      "Editions: ashrae-90.1-2010, -2013, -2016, -2019, -2022; iecc-2015, -2018, -2021,\n"
      "-2024; title24-2013, -2016, -2019, -2022; and any added with --code-table.\n"
      "Zones: ASHRAE 169 (0A and 0B where the edition has them, 1A ... 6B, 7, 8) or\n"
      "California climate zones (12 or CZ12).\n\n"
      "Site: --elevation or --pressure, else the unit file's site, else sea level. A fixed\n"
      "enthalpy limit follows the altitude footnote (the enthalpy at the footnote's state,\n"
      "75 °F and 50 % RH, at the site pressure) once that differs from its sea-level value by\n"
      "more than {} Btu/lb.\n\n"
      "Tolerances: a setting complies within {} °F and {} Btu/lb of the table's IP figures,\n"
      "or {} K and {} kJ/kg of its SI figures (--compare-in si; the default is the edition's\n"
      "governing units, IP for every shipped edition). --units only changes the display.\n\n"
      "Tables: data/codes/*.toml, found through $LIMITLINE_DATA_DIR/codes, the installed data\n"
      "folder, or the source tree. --code-table FILE (repeatable, applied in order) adds an\n"
      "edition or an [amendment] whose rows replace the edition's rows zone by zone: a\n"
      "jurisdiction's local amendments. The format is described in the README section 'Energy-code "
      "tables'.\n"
      "Every value in the shipped tables is recalled from memory: verify it against the\n"
      "adopted edition.\n\n"
      "Examples:\n"
      "  limitline code --edition ashrae-90.1-2019 --zone 4A\n"
      "  limitline code --edition title24-2022 --zone 12 --elevation 4500ft --format md\n"
      "  limitline code tests/data/codes-unit-4a.toml --code-table "
      "tests/data/codes-amend-90.1-2019-4a.toml\n"
      "  limitline code --all-editions --units si --format json",
      codes::kAltitudeFootnoteThresholdBtuPerLb, codes::kTemperatureToleranceF,
      codes::kEnthalpyToleranceBtuPerLb, codes::kTemperatureToleranceK,
      codes::kEnthalpyToleranceKjPerKg);
}

airside::EconomizerType parse_economizer(const std::string& text) {
  if (const auto e = airside::economizer_from_name(text)) return *e;
  throw UsageError(fmt::format("--economizer: '{}' is not {}", text,
                               names_in(airside::economizer_names(), " or ")));
}

// A report in the chosen format: its text, Markdown and JSON renderings take the same inputs,
// the text one then the width its tables fit, and the text goes through terminal_text().
template <typename Text, typename Render, typename... Args>
std::string formatted(const Common& common, Text text, Render markdown, Render json,
                      const Args&... args) {
  if (common.format == Format::json) return json(args...);
  if (common.format == Format::md) return markdown(args...);
  return terminal_text(common, text(args..., common.text_width()));
}

// The unit's own weather file, when it has a pressure column: which pressure the altitude
// footnote used beside the file's (a disagreement with the site is warned about), or why the
// file could not be read. None when the unit names no weather file.
std::optional<report::WeatherPressure> weather_pressure(const UnitFile& file,
                                                        std::optional<double> pressure,
                                                        bool from_command_line, bool strict) {
  if (!file.weather || !file.weather->contains("file")) return std::nullopt;
  std::optional<report::WeatherPressure> out;
  std::string label;
  weather::WeatherSeries w;
  try {
    w = read_unit_weather(file, label);
  } catch (const InputError& error) {
    // The verdicts need no weather: a file that cannot be read is said, not fatal.
    out = report::WeatherPressure{error.what(), {}, 0.0, 0.0, {}};
  }
  if (w.info.median_pressure_kpa) {
    out = report::WeatherPressure{{},
                                  label,
                                  *w.info.median_pressure_kpa,
                                  pressure.value_or(psychro::kStandardPressureKpa),
                                  from_command_line ? report::FootnotePressure::command_line
                                  : pressure        ? report::FootnotePressure::unit_site
                                                    : report::FootnotePressure::sea_level};
    std::vector<std::string> warnings;
    if (auto warning = site_pressure_warning(file, w.info)) warnings.push_back(*warning);
    report_warnings(warnings, strict);
  }
  return out;
}

}  // namespace

int run_code(const std::vector<std::string>& args) {
  const std::string economizer_help =
      names_in(airside::economizer_names(), " or ") + ": checked against the edition";
  po::options_description options("options");
  options.add_options()("unit", po::value<std::string>(),
                        "unit file (TOML) whose strategies are judged")(
      "edition", po::value<std::string>(),
      "code edition, e.g. ashrae-90.1-2019, iecc-2021, title24-2022")(
      "zone", po::value<std::string>(), "climate zone, e.g. 4A, 7, CZ12")(
      "elevation", po::value<std::string>(),
      "site elevation for the standard pressure (6000ft, 1830m)")(
      "pressure", po::value<std::string>(), "site pressure (11.8psia, 81.2kPa)")(
      "economizer", po::value<std::string>(), economizer_help.c_str())(
      "all-editions", po::bool_switch(), "matrix, zone x edition, of what is allowed")(
      "list-editions", po::bool_switch(), "list the loaded editions and their files")(
      "code-table", po::value<std::vector<std::string>>()->composing(),
      "extra code table or amendment (TOML), repeatable")(
      "compare-in", po::value<std::string>(),
      "which table figures verdicts compare with: ip or si (default: the edition's governing "
      "units)");
  add_common_options(options, "text, json, md");
  po::positional_options_description positional;
  positional.add("unit", 1);
  po::variables_map vm;
  if (!parse_options(args, options, positional,
                     "limitline code (--edition ID --zone ZONE | UNIT.toml | --all-editions | "
                     "--list-editions) [options]",
                     details(), vm))
    return 0;
  const Common common = read_common(vm, {Format::text, Format::json, Format::md});
  const bool all = vm["all-editions"].as<bool>(), list = vm["list-editions"].as<bool>();
  const bool unit = vm.count("unit") > 0;
  if (static_cast<int>(all) + static_cast<int>(list) + static_cast<int>(unit) > 1)
    throw UsageError("give one of a unit file, --all-editions or --list-editions");
  if ((all || list) && (vm.count("edition") || vm.count("zone")))
    throw UsageError(
        "--all-editions and --list-editions cover every edition and zone; drop "
        "--edition and --zone");
  if (!unit && !all && !list && !(vm.count("edition") && vm.count("zone")))
    throw UsageError("give --edition and --zone, a unit file, --all-editions or --list-editions");
  std::optional<System> compare_in;
  if (vm.count("compare-in"))
    compare_in = system_option(vm["compare-in"].as<std::string>(), "--compare-in");
  std::optional<airside::EconomizerType> economizer;
  if (vm.count("economizer")) economizer = parse_economizer(vm["economizer"].as<std::string>());

  std::vector<std::filesystem::path> extra;
  if (vm.count("code-table"))
    for (const auto& f : vm["code-table"].as<std::vector<std::string>>()) extra.emplace_back(f);
  const codes::CodeTables tables = codes::CodeTables::load_installed(extra);
  // The unit file, when given, is read first: its units set the display and the reading of
  // bare numbers such as --elevation 1500 unless --units is given.
  std::optional<UnitFile> unit_file;
  std::vector<std::string> warnings;
  if (unit) {
    unit_file = load_unit_file(vm["unit"].as<std::string>());
    warnings = unit_file->warnings;
  }
  const System s = unit_file ? common.units.resolve(*unit_file) : common.units.resolve();
  std::optional<double> pressure = site_pressure_option(vm, s, warnings);
  report_warnings(warnings, common.strict);

  if (list) {
    write_out(formatted(common, report::code_editions_text, report::code_editions_markdown,
                        report::code_editions_json, tables));
    return 0;
  }
  if (all) {
    write_out(formatted(common, report::code_matrix_text, report::code_matrix_markdown,
                        report::code_matrix_json, tables, pressure, compare_in, s));
    return 0;
  }
  if (!unit) {
    const auto& e = tables.edition(vm["edition"].as<std::string>(), "--edition");
    const auto req =
        codes::requirements(e, vm["zone"].as<std::string>(), {pressure, compare_in}, "--zone");
    write_out(formatted(common, report::code_zone_text, report::code_zone_markdown,
                        report::code_zone_json, req, s, economizer));
    return 0;
  }

  const UnitFile& file = *unit_file;
  report::CodeVerdicts u;
  u.unit_path = file.path;
  std::string edition_id = file.site.energy_code, zone = file.site.climate_zone;
  std::string edition_origin = file.site.energy_code_origin,
              zone_origin = file.site.climate_zone_origin;
  if (vm.count("edition"))
    edition_id = vm["edition"].as<std::string>(), edition_origin = "--edition";
  if (vm.count("zone")) zone = vm["zone"].as<std::string>(), zone_origin = "--zone";
  if (edition_id.empty())
    throw InputError(
        fmt::format("{}: [site] has no energy_code; add one (e.g. energy_code = "
                    "\"ashrae-90.1-2019\") or give --edition",
                    file.path));
  if (zone.empty())
    throw InputError(
        fmt::format("{}: [site] has no climate_zone; add one (e.g. climate_zone = "
                    "\"4A\") or give --zone",
                    file.path));
  u.edition_from = edition_origin;
  u.zone_from = zone_origin;
  if (!pressure && (file.site.pressure_kpa || file.site.elevation_m))
    pressure = file.site.design_pressure_kpa();
  u.weather = weather_pressure(file, pressure, vm.count("elevation") || vm.count("pressure"),
                               common.strict);
  const auto& e = tables.edition(edition_id, edition_origin);
  const auto req = codes::requirements(e, zone, {pressure, compare_in}, zone_origin);
  u.req = &req;
  u.strategies = strategies_or_presets(file);
  u.defaulted = file.strategies_defaulted;
  u.economizer = economizer.value_or(file.air_handler.economizer);
  for (const auto& st : u.strategies) u.checks.push_back(codes::check_strategy(req, st));
  const CoolingCapacity capacity = cooling_capacity(file);
  u.capacity_kw = capacity.kw;
  u.capacity_estimated = capacity.estimated;
  u.capacity_basis = capacity.basis;
  u.need = codes::economizer_need(req, capacity.kw);
  write_out(formatted(common, report::code_unit_text, report::code_unit_markdown,
                      report::code_unit_json, u, s));
  return 0;
}

}  // namespace limitline::cli
