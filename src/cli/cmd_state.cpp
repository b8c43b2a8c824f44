// limitline state: properties of one moist-air state (or of every row of a CSV file).
#include "common.hpp"

#include <limitline/io/input_file.hpp>

#include <limitline/model/air_point.hpp>
#include <limitline/model/psychro.hpp>
#include <limitline/report/json.hpp>
#include <limitline/report/state.hpp>
#include <limitline/report/table.hpp>
#include <limitline/app/state_batch.hpp>

#include <fmt/format.h>

#include <fstream>
#include <iostream>

namespace limitline::cli {
namespace {

using psychro::HumidityInput;
using units::Kind;

struct HumidityOption {
  const char* name;
  HumidityInput input;
};
constexpr HumidityOption kHumidityOptions[] = {
    {"rh", HumidityInput::relative_humidity}, {"wet-bulb", HumidityInput::wet_bulb},
    {"dew-point", HumidityInput::dew_point},  {"humidity-ratio", HumidityInput::humidity_ratio},
    {"enthalpy", HumidityInput::enthalpy},
};

constexpr std::string_view kDetails =
    "Give the dry-bulb and exactly one humidity input. Quantities may carry their unit\n"
    "(75F, 23.9C, 50%, 62F, 0.0093, 28btu/lb, 47kJ/kg, 5000ft, 14.696psia, 101.325kPa);\n"
    "bare numbers are read in the --units system, IP unless --units si is given (RH always in\n"
    "%). Pressure defaults to the standard pressure at --elevation (sea level when neither is\n"
    "given).\n\n"
    "Batch mode: --batch FILE (or - for standard input) reads a CSV whose header names the\n"
    "columns: dry_bulb, one of rh, wet_bulb, dew_point, humidity_ratio, enthalpy, and\n"
    "optionally pressure or elevation. It streams the properties of every row as CSV with\n"
    "the JSON key names as column names.\n\n"
    "Examples:\n"
    "  limitline state --dry-bulb 75F --rh 50%\n"
    "  limitline state --dry-bulb 24C --dew-point 12C --elevation 1500m --units si --format json\n"
    "  limitline state --batch examples/state-points.csv --units si > properties.csv";

}  // namespace

int run_state(const std::vector<std::string>& args) {
  po::options_description options("options");
  options.add_options()("dry-bulb", po::value<std::string>(), "dry-bulb temperature (75F, 24C)")(
      "rh", po::value<std::string>(), "relative humidity (50%)")(
      "wet-bulb", po::value<std::string>(), "thermodynamic wet-bulb temperature")(
      "dew-point", po::value<std::string>(), "dew-point temperature")(
      "humidity-ratio", po::value<std::string>(), "humidity ratio (0.0093, 9.3g/kg, 65gr/lb)")(
      "enthalpy", po::value<std::string>(), "enthalpy (28btu/lb, 47kJ/kg)")(
      "elevation", po::value<std::string>(), "site elevation for standard pressure (850ft, 260m)")(
      "pressure", po::value<std::string>(), "total pressure (14.696psia, 101.325kPa)")(
      "batch", po::value<std::string>(), "CSV file of states (- for standard input)");
  add_common_options(options, "text, json, csv");
  po::variables_map vm;
  if (!parse_options(args, options, {}, "limitline state --dry-bulb T --rh RH [options]", kDetails,
                     vm))
    return 0;
  const Common common = read_common(vm, {Format::text, Format::json, Format::csv});
  const units::System system = common.units.resolve();  // state reads no unit file
  std::vector<std::string> warnings;
  const double p =
      site_pressure_option(vm, system, warnings).value_or(psychro::kStandardPressureKpa);
  report_warnings(warnings, common.strict);

  if (vm.count("batch")) {
    for (const auto& h : kHumidityOptions)
      if (vm.count(h.name) || vm.count("dry-bulb"))
        throw UsageError("--batch reads the states from the file; drop the state options");
    if (common.format != Format::csv && !vm["format"].defaulted())
      throw UsageError("--batch writes CSV only");
    const std::string path = vm["batch"].as<std::string>();
    StateBatchOptions bo{system, p, path == "-" ? "standard input" : path};
    std::ifstream file;
    if (path != "-") {
      check_input_file(path, "the --batch file");
      file.open(path, std::ios::binary);
      if (!file) throw InputError(fmt::format("--batch: cannot open {}", echo(path)));
    }
    // The rows written before a bad one reach standard output before its error.
    OutputFile out("-", "");
    try {
      write_state_batch(path == "-" ? std::cin : file, out.stream(), bo);
    } catch (const InputError&) {
      out.commit();
      throw;
    }
    out.commit();
    return 0;
  }

  if (!vm.count("dry-bulb")) throw UsageError("--dry-bulb is required");
  const HumidityOption* given = nullptr;
  for (const auto& h : kHumidityOptions) {
    if (!vm.count(h.name)) continue;
    if (given)
      throw UsageError(
          fmt::format("give one humidity input, not both --{} and --{}", given->name, h.name));
    given = &h;
  }
  if (!given)
    throw UsageError(
        "give one humidity input: --rh, --wet-bulb, --dew-point, "
        "--humidity-ratio or --enthalpy");
  const double t = quantity(vm, "dry-bulb", Kind::temperature, system);
  const double value = quantity(vm, given->name, humidity_input_kind(given->input), system);
  psychro::Properties props;
  try {
    props = psychro::properties(psychro::state_from(t, given->input, value, p));
  } catch (const RangeError& e) {
    throw InputError(fmt::format("--dry-bulb {} with --{} {}: {}", vm["dry-bulb"].as<std::string>(),
                                 given->name, vm[given->name].as<std::string>(), e.what()));
  }

  const auto fields = report::property_fields();
  if (common.format == Format::json) {
    report::Json j;
    j.begin_object();
    for (const auto& f : fields)
      j.field(report::property_key(f, system), report::property_value(f, props, system));
    j.end_object();
    write_out(j.str());
  } else if (common.format == Format::csv) {
    std::string head, row;
    for (std::size_t i = 0; i < fields.size(); ++i) {
      if (i) {
        head += ',';
        row += ',';
      }
      head += report::property_key(fields[i], system);
      row += fmt::format("{:.8g}", report::property_value(fields[i], props, system));
    }
    write_out(head + "\n" + row + "\n");
  } else {
    report::Table table({{"property", report::Align::left}, {"value", report::Align::right}});
    for (const auto& f : fields)
      table.add_row({std::string(f.label), report::property_text(f, props, system)});
    write_out(table.text(common.text_width()));
  }
  return 0;
}

}  // namespace limitline::cli
