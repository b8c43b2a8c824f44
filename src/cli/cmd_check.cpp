// limitline check: at one outdoor (and return) condition, what every high-limit strategy of a
// unit decides and what that decision costs against the perfect changeover.
#include "common.hpp"

#include <limitline/model/air_point.hpp>
#include <limitline/io/codes.hpp>
#include <limitline/analysis/point_check.hpp>
#include <limitline/report/point_check.hpp>
#include <limitline/io/unit_file.hpp>

#include <fmt/format.h>

namespace limitline::cli {
namespace {

constexpr std::string_view kDetails =
    "UNIT.toml is a unit file (see the README section 'The unit file'). --outdoor, and --return "
    "when given,\n"
    "are a dry-bulb with one humidity form:\n"
    "  68F/80%  (relative humidity)   68F/dp58F  (dew point)   68F/wb62F  (wet-bulb)\n"
    "  68F/w0.011  (humidity ratio)   68F/h30btu/lb  (enthalpy)\n"
    "Bare numbers are read in the --units system, which is the unit file's units unless\n"
    "--units is given. Without --return the unit file's return air is used. States are\n"
    "computed at the site design pressure of the unit file.\n\n"
    "Each strategy of the file (every preset at its defaults when the file has none) is\n"
    "evaluated from an untripped state, so deadbands do not hold anything at a single point.\n"
    "Verdicts compare the strategy's decision with the perfect changeover (whichever of\n"
    "enabled or disabled costs less this hour); differences within 0.01 kJ/kg of dry air\n"
    "count as ties.\n\n"
    "Examples:\n"
    "  limitline check examples/office-humid-coast.toml --outdoor 68F/80%\n"
    "  limitline check examples/lab-high-plateau.toml --outdoor 18C/dp12C --units si --format json";

}  // namespace

int run_check(const std::vector<std::string>& args) {
  po::options_description options("options");
  options.add_options()("unit", po::value<std::string>(), "unit file (TOML)")(
      "outdoor", po::value<std::string>(), "outdoor air: dry-bulb/humidity (68F/80%, 68F/dp58F)")(
      "return", po::value<std::string>(), "return air, instead of the unit file's (75F/50%)");
  add_common_options(options, "text, json, md");
  po::positional_options_description positional;
  positional.add("unit", 1);
  po::variables_map vm;
  if (!parse_options(args, options, positional,
                     "limitline check UNIT.toml --outdoor DRYBULB/HUMIDITY [--return "
                     "DRYBULB/HUMIDITY] [options]",
                     kDetails, vm))
    return 0;
  const Common common = read_common(vm, {Format::text, Format::json, Format::md});
  if (!vm.count("unit"))
    throw UsageError("give the unit file, e.g. limitline check unit.toml --outdoor 68F/80%");
  if (!vm.count("outdoor")) throw UsageError("--outdoor is required, e.g. --outdoor 68F/80%");

  const UnitFile unit = load_unit_file(vm["unit"].as<std::string>());
  codes::check_site_code(unit.site.energy_code, unit.site.energy_code_origin,
                         unit.site.climate_zone, unit.site.climate_zone_origin);
  std::vector<std::string> warnings = unit.warnings;
  const units::System system = common.units.resolve(unit);
  const double p = unit.site.design_pressure_kpa();
  const std::string outdoor_text = vm["outdoor"].as<std::string>();
  const AirPoint outdoor_point =
      parse_air_point(outdoor_text, system, "--outdoor", AirRole::outdoor, warnings);
  const psychro::MoistAir outdoor =
      outdoor_point.state(p, fmt::format("--outdoor {}", outdoor_text));
  (void)outdoor_point.properties(
      p, fmt::format("--outdoor {}", outdoor_text));  // throws if impossible

  psychro::MoistAir ret = unit.return_air.state(p);
  std::string return_source = "unit file";
  if (vm.count("return")) {
    const std::string return_text = vm["return"].as<std::string>();
    const AirPoint point =
        parse_air_point(return_text, system, "--return", AirRole::return_air, warnings);
    ret = point.state(p, fmt::format("--return {}", return_text));
    (void)point.properties(p, fmt::format("--return {}", return_text));  // throws if impossible
    return_source = "--return";
  }
  report_warnings(warnings, common.strict);

  const std::vector<highlimit::Strategy> strategies = strategies_or_presets(unit);
  const PointCheck pc = check_point(unit.air_handler, unit.weights, strategies, outdoor, ret);
  const report::PointCheckContext context{&unit,    "--outdoor", return_source,
                                          warnings, system,      common.text_width()};
  switch (common.format) {
    case Format::json: write_out(report::point_check_json(pc, context)); break;
    case Format::md: write_out(report::point_check_markdown(pc, context)); break;
    default: write_out(terminal_text(common, report::point_check_text(pc, context))); break;
  }
  return 0;
}

}  // namespace limitline::cli
