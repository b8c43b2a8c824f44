// limitline sequence: the economizer part of a sequence of operation, written from the unit.
#include "common.hpp"

#include <limitline/io/codes.hpp>
#include <limitline/app/report_job.hpp>
#include <limitline/report/sequence.hpp>
#include <limitline/app/year_job.hpp>

#include <fmt/format.h>

namespace limitline::cli {
namespace {

constexpr std::string_view kDetails =
    "Writes the economizer part of a sequence of operation for one high-limit strategy of the\n"
    "unit file, in numbered paragraphs ready to paste into a specification: when the\n"
    "economizer runs, each high-limit condition with its setpoint and deadband, what happens\n"
    "at the limit, integrated or non-integrated operation, minimum outdoor air, mixed-air\n"
    "low-limit and freeze protection, the sensors and the alarms. Every figure is the one the\n"
    "analysis uses, in the chosen units; each setpoint states its basis: the code clause of\n"
    "the [site] energy_code and climate_zone, or a design choice, supported by the annual\n"
    "evaluation when --with-year or --weather is given.\n\n"
    "The strategy is --strategy NAME, else the unit file's first. With no unit file the\n"
    "embedded demo unit is used (an invented unit and climate).\n\n"
    "Examples:\n"
    "  limitline sequence\n"
    "  limitline sequence examples/office-humid-coast.toml --strategy \"enthalpy 28 + dry-bulb "
    "75F\" --format md\n"
    "  limitline sequence --demo mesa-alta --with-year --units si\n"
    "  limitline sequence examples/office-humid-coast.toml --weather "
    "tests/data/greensboro-nc-tmy3.csv";

}  // namespace

int run_sequence(const std::vector<std::string>& args) {
  po::options_description options("options");
  po::positional_options_description pos;
  add_job_options(options, pos);
  options.add_options()("strategy", po::value<std::string>(),
                        "strategy of the unit file to write (default: its first)")(
      "with-year",
      "run the annual evaluation (implied by --weather) and cite it as the basis "
      "of design-choice setpoints");
  add_common_options(options, "text, md");
  po::variables_map vm;
  if (!parse_options(args, options, pos, "limitline sequence [UNIT.toml] [options]", kDetails, vm))
    return 0;
  const Common common = read_common(vm, {Format::text, Format::md});
  const UnitSource source = job_source(vm);
  const WeatherOverrides overrides = weather_overrides(vm);
  const bool with_year = vm.count("with-year") || overrides.file;
  if (!with_year && (!overrides.columns.empty() || overrides.humidity || overrides.on_bad_row ||
                     overrides.time_convention))
    throw UsageError("weather options need the annual evaluation: add --with-year or --weather");

  // Without the annual evaluation only the unit file is read.
  YearInputs in;
  annual::YearResult year;
  if (with_year) {
    in = load_year_inputs(source, overrides);
    year = annual::evaluate(in.strategies, prepare_year(in));
  } else {
    in.unit = load_unit(source);
    in.warnings = in.unit.warnings;
    in.unit_label = source.embedded ? fmt::format("{} (embedded invented demo unit)", source.path)
                                    : source.path;
    in.strategies = strategies_or_presets(in.unit);
  }

  report_warnings(in.warnings, common.strict);
  const units::System system = common.units.resolve(in.unit);

  std::vector<std::string> names;
  if (vm.count("strategy")) names.push_back(vm["strategy"].as<std::string>());
  const auto chosen = select_strategies(in.strategies, names, "--strategy", in.unit.path);

  std::optional<codes::CodeTables> tables;
  std::optional<codes::ZoneRequirements> zone;
  if (!in.unit.site.energy_code.empty() || !in.unit.site.climate_zone.empty()) {
    tables = codes::CodeTables::load_installed();
    zone = sequence::site_requirements(in.unit, *tables);
  }

  sequence::Inputs si;
  si.unit = &in.unit;
  si.unit_label = in.unit_label;
  si.strategy = &chosen.front();
  si.code = zone ? &*zone : nullptr;
  if (with_year) si.annual = sequence::AnnualSupport{&year, in.weather_label};
  const sequence::Document doc = sequence::compose(si, system);
  write_out(common.format == Format::md ? sequence::to_markdown(doc) : sequence::to_text(doc));
  return 0;
}

}  // namespace limitline::cli
