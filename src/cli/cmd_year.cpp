// limitline year: the annual evaluation of every high-limit strategy for a unit and climate.
#include "common.hpp"

#include <limitline/report/cautions.hpp>
#include <limitline/report/hourly.hpp>
#include <limitline/report/table.hpp>
#include <limitline/report/year.hpp>
#include <limitline/year_job.hpp>

#include <fmt/format.h>

#include <cstdio>
#include <fstream>
#include <unistd.h>

namespace limitline::cli {
namespace {

constexpr std::string_view kDetails =
    "Runs every strategy of the unit file (all presets at common-practice settings when it\n"
    "gives none) and three references over a year of weather: no economizer, the perfect\n"
    "changeover (each hour enabled or not, whichever costs less) and the optimal damper (each\n"
    "hour the damper position that costs least). Strategies are ranked by their energy\n"
    "shortfall against the perfect changeover; harmful hours are hours economizing when it\n"
    "costs more than not, missed hours the reverse.\n\n"
    "With no unit file it runs the embedded demo (an invented unit and climate). The weather\n"
    "file comes from the unit file's [weather] table or --weather; its columns and units are\n"
    "found from the header and can be set with --column (repeatable):\n"
    "  --column dry_bulb=Temperature:C --column dew_point=\"Dew Point:F\" --column pressure=SP:Pa\n\n"
    "Examples:\n"
    "  limitline year\n"
    "  limitline year --demo mesa-alta --units si\n"
    "  limitline year examples/office-rtu-humid.toml --weather site.csv --format json\n"
    "  limitline year unit.toml --batch weather-folder/\n"
    "  limitline year unit.toml --hourly hours.csv";

void show_progress(std::size_t done, std::size_t total) {
  std::fprintf(stderr, "\r  %zu of %zu sites", done, total);
  if (done == total) std::fputc('\n', stderr);
}

std::string batch_text(const std::vector<BatchSite>& sites, units::System s, Format f) {
  std::vector<report::Column> cols = {{"weather file", report::Align::left},
                                      {"fan-on h", report::Align::right},
                                      {"best strategy", report::Align::left},
                                      {std::string("shortfall ") + std::string(report::energy_unit(s)), report::Align::right},
                                      {std::string("perfect savings ") + std::string(report::energy_unit(s)), report::Align::right},
                                      {"harmful h", report::Align::right},
                                      {"missed h", report::Align::right}};
  report::Table t(cols);
  std::string errors;
  for (const auto& site : sites) {
    if (!site.ok) {
      errors += fmt::format("  {}: {}\n", site.weather_path, site.error);
      continue;
    }
    const auto* b = site.result.best();
    auto e = [&](double kwh) { return fmt::format("{:.0f}", report::energy_display(kwh, s)); };
    t.add_row({site.weather_path, fmt::format("{:.0f}", site.operating_hours), b ? b->name : "-",
               b ? e(b->shortfall_vs_perfect_kwh) : "-",
               e(site.result.perfect_changeover.savings_vs_no_economizer_kwh),
               b ? fmt::format("{:.0f}", b->annual.harmful_hours) : "-",
               b ? fmt::format("{:.0f}", b->annual.missed_hours) : "-"});
  }
  std::string out;
  if (f == Format::csv) out = t.csv();
  else if (f == Format::md) out = "# Annual high-limit evaluation, per site\n\n" + t.markdown();
  else out = "limitline year — per-site summary\n\n" + t.text();
  if (!errors.empty()) out += "\nSites that could not be evaluated:\n" + errors;
  if (f != Format::csv) {
    out += '\n';
    out += f == Format::md ? report::cautions_markdown(report::CautionTopic::design)
                           : report::cautions_text(report::CautionTopic::design);
  }
  return out;
}

}  // namespace

int run_year(const std::vector<std::string>& args) {
  po::options_description options("options");
  po::positional_options_description pos;
  add_job_options(options, pos);
  options.add_options()
      ("hourly", po::value<std::string>(), "also write every hour's states, decisions and loads to this CSV file")
      ("batch", po::value<std::string>(), "evaluate every .csv weather file of this folder; per-site summary")
      ("threads", po::value<unsigned>()->default_value(0), "threads for --batch (0: all cores)")
      ("edition", po::value<std::string>(), "energy-code edition for the compliance column (default: [site] energy_code)")
      ("zone", po::value<std::string>(), "climate zone for the compliance column (default: [site] climate_zone)")
      ("code-table", po::value<std::vector<std::string>>()->composing(),
       "extra code-table file (a jurisdiction's amendments; repeatable)");
  add_common_options(options, "text, json, csv, md");
  po::variables_map vm;
  if (!parse_options(args, options, pos, "limitline year [UNIT.toml] [options]", kDetails, vm)) return 0;
  const Common common = read_common(vm, {Format::text, Format::json, Format::csv, Format::md});

  const WeatherOverrides overrides = weather_overrides(vm);
  const UnitSource source = job_source(vm);

  if (vm.count("batch")) {
    if (!vm.count("unit")) throw UsageError("--batch needs a unit file");
    if (vm.count("weather") || vm.count("hourly"))
      throw UsageError("--batch takes its weather files from the folder; drop --weather and --hourly");
    if (common.format == Format::json) throw UsageError("--batch writes text, csv or md");
    // The unit is read once; its own weather file is not needed.
    UnitFile unit = load_unit_file(source.path);
    YearInputs base;
    base.unit = unit;
    base.unit_label = source.path;
    if (unit.schedule) base.schedule = read_schedule(*unit.schedule, unit.path);
    base.strategies = strategies_or_presets(unit);
    const bool tty = isatty(fileno(stderr));
    const auto sites = run_year_batch(base, vm["batch"].as<std::string>(), overrides,
                                      vm["threads"].as<unsigned>(), tty ? show_progress : nullptr);
    write_out(batch_text(sites, common.units, common.format));
    for (const auto& s : sites)
      if (!s.ok) return 2;
    return 0;
  }

  const YearInputs in = load_year_inputs(source, overrides);
  report_warnings(in.warnings, common.strict);
  const annual::Prepared prepared = prepare_year(in);
  annual::RunOptions run;
  run.keep_decisions = vm.count("hourly") > 0;
  const annual::YearResult y = annual::evaluate(in.strategies, prepared, run);
  report::YearContext ctx = year_context(in, common.units);
  CodeSelection code;
  if (vm.count("edition")) code.edition = vm["edition"].as<std::string>();
  if (vm.count("zone")) code.zone = vm["zone"].as<std::string>();
  if (vm.count("code-table")) code.extra_tables = vm["code-table"].as<std::vector<std::string>>();
  add_compliance(ctx, in, code);

  if (vm.count("hourly")) {
    const std::string path = vm["hourly"].as<std::string>();
    std::ofstream f(path, std::ios::binary);
    if (!f) throw InputError(fmt::format("--hourly: cannot write '{}'", path));
    report::write_hourly_csv(f, outdoor_intervals(in.weather), prepared, y, common.units);
  }
  switch (common.format) {
    case Format::json: write_out(report::year_json(y, ctx)); break;
    case Format::csv: write_out(report::year_csv(y, ctx)); break;
    case Format::md: write_out(report::year_markdown(y, ctx)); break;
    case Format::text: write_out(report::year_text(y, ctx)); break;
  }
  return 0;
}

}  // namespace limitline::cli
