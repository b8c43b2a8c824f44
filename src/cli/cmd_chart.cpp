// limitline chart: the psychrometric chart of a unit's high-limits, with a climate's occupied
// hours or one checked operating point.
#include "common.hpp"

#include <limitline/model/air_point.hpp>
#include <limitline/report/chart.hpp>
#include <limitline/app/report_job.hpp>
#include <limitline/app/year_job.hpp>

namespace limitline::cli {
namespace {

constexpr std::string_view kDetails =
    "Draws the psychrometric chart at the site's design pressure (it changes with elevation):\n"
    "saturation, relative humidity every 10 %, enthalpy and wet-bulb lines, and for each\n"
    "strategy of the unit file the line beyond which its high-limit stops the economizer.\n"
    "Differential strategies are drawn against the return air, which is marked, as is the\n"
    "mixed-air target (supply setpoint less fan heat).\n\n"
    "By default the occupied hours of the weather year are binned on the chart (1 °F × 5 gr/lb,\n"
    "or 0.5 °C × 0.5 g/kg with --units si; wider when the weather was recorded in whole degrees\n"
    "of the other unit system) and coloured by what the perfect changeover does: economize, do\n"
    "not economize, or no cooling needed. The legend gives the hours of each.\n\n"
    "With --outdoor (and optionally --return, default the unit's return air) it draws that one\n"
    "point instead: outdoor, return and the mixed air the damper makes of them. Add --weather\n"
    "to draw the climate's hours as well. States are dry-bulb plus one humidity form:\n"
    "  68F/80%   68F/dp58F   68F/wb62F   68F/w0.011   68F/h30btu/lb\n\n"
    "Examples:\n"
    "  limitline chart -o chart.svg\n"
    "  limitline chart --demo mesa-alta --units si -o mesa.svg\n"
    "  limitline chart examples/office-humid-coast.toml --weather "
    "tests/data/greensboro-nc-tmy3.csv --strategy \"dry-bulb 65F\" -o chart.svg\n"
    "  limitline chart examples/office-humid-coast.toml --weather "
    "tests/data/greensboro-nc-tmy3.csv --outdoor 68F/80% --return 75F/50% -o point.svg";

}  // namespace

int run_chart(const std::vector<std::string>& args) {
  po::options_description options("options");
  po::positional_options_description pos;
  add_job_options(options, pos);
  options.add_options()("output,o", po::value<std::string>()->default_value("-"),
                        "SVG file to write (- for standard output)")(
      "strategy", po::value<std::vector<std::string>>()->composing(),
      "draw only this strategy of the unit file (repeatable; default: all)")(
      "outdoor", po::value<std::string>(), "one outdoor state to check, e.g. 68F/80%")(
      "return", po::value<std::string>(),
      "its return air (default: the unit file's), e.g. 75F/50%")(
      "strict", "treat warnings (implausible values, inputs that disagree) as errors")(
      "help,h", "show this help");
  add_units_option(options);
  po::variables_map vm;
  if (!parse_options(args, options, pos, "limitline chart [UNIT.toml] [options] -o chart.svg",
                     kDetails, vm))
    return 0;
  const UnitsChoice units_choice(vm);
  if (vm.count("return") && !vm.count("outdoor")) throw UsageError("--return needs --outdoor");
  const UnitSource source = job_source(vm);
  const std::vector<std::string> names = vm.count("strategy")
                                             ? vm["strategy"].as<std::vector<std::string>>()
                                             : std::vector<std::string>{};

  report::ChartInput chart;
  std::vector<std::filesystem::path> inputs = job_input_files(vm, {});
  if (vm.count("outdoor")) {
    const UnitFile unit = load_unit(source);
    if (!vm.count("weather")) report_warnings(unit.warnings, vm.count("strict") > 0);
    const units::System s = units_choice.resolve(unit);
    const auto all = strategies_or_presets(unit);
    const auto chosen = select_strategies(all, names, "--strategy", unit.path);
    std::vector<std::string> point_warnings;
    const AirPoint outdoor = parse_air_point(vm["outdoor"].as<std::string>(), s, "--outdoor",
                                             AirRole::outdoor, point_warnings);
    const AirPoint ret = vm.count("return")
                             ? parse_air_point(vm["return"].as<std::string>(), s, "--return",
                                               AirRole::return_air, point_warnings)
                             : unit.return_air;
    chart = chart_input(unit, chosen, s);
    chart.check = check_marks(unit, all, outdoor, "--outdoor", ret,
                              vm.count("return") ? "--return" : unit.path + ": return air");
    // After the states are known to exist: an impossible one is an error, not also a warning.
    report_warnings(point_warnings, vm.count("strict") > 0);
    chart.return_air = chart.check->ret;
    if (vm.count("weather")) {
      const YearInputs in = load_year_inputs(source, weather_overrides(vm));
      report_warnings(in.warnings, vm.count("strict") > 0);
      add_climate(chart, prepare_year(in, false), in.weather_label);
      inputs = job_input_files(vm, in.weather_label);
    }
  } else {
    const YearInputs in = load_year_inputs(source, weather_overrides(vm));
    report_warnings(in.warnings, vm.count("strict") > 0);
    const units::System s = units_choice.resolve(in.unit);
    inputs = job_input_files(vm, in.weather_label);
    chart = chart_input(in.unit,
                        select_strategies(in.strategies, names, "--strategy", in.unit_label), s);
    add_climate(chart, prepare_year(in, false), in.weather_label);
  }
  const std::string output = vm["output"].as<std::string>();
  refuse_input_as_output(output, "--output", inputs);
  write_file(output, report::psychrometric_chart_svg(chart), "--output");
  return 0;
}

}  // namespace limitline::cli
