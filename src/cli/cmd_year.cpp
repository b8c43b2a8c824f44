// limitline year: the annual evaluation of every high-limit strategy for a unit and climate.
#include "common.hpp"

#include <limitline/io/output_file.hpp>
#include <limitline/report/cautions.hpp>
#include <limitline/report/hourly.hpp>
#include <limitline/report/json.hpp>
#include <limitline/report/table.hpp>
#include <limitline/report/year.hpp>
#include <limitline/app/year_job.hpp>

#include <fmt/format.h>

#include <cstdio>
#include <memory>
#include <unistd.h>

namespace limitline::cli {
namespace {

constexpr std::string_view kDetails =
    "Runs every strategy of the unit file (all presets when it gives none; preset settings\n"
    "left out take the [site] code's values for its climate zone, else common practice) and\n"
    "three references over a year of weather: no economizer, the perfect\n"
    "changeover (each hour enabled or not, whichever costs less) and the optimal damper (each\n"
    "hour the damper position that costs least). Strategies are ranked by their energy\n"
    "shortfall against the perfect changeover; harmful hours are hours economizing when it\n"
    "costs more than not, missed hours the reverse.\n\n"
    "With no unit file it runs the embedded demo (an invented unit and climate). The weather\n"
    "file comes from the unit file's [weather] table or --weather; its columns and units are\n"
    "found from the header and can be set with --column (repeatable):\n"
    "  --column dry_bulb=Temperature:C --column dew_point=\"Dew Point:F\" --column "
    "pressure=SP:Pa\n\n"
    "--batch evaluates every .csv entry of a folder; one that cannot be read is listed with its\n"
    "error and the others kept (exit 2). Ctrl-C stops it and reports the sites that finished,\n"
    "marked partial (exit 130); with --format csv the errors and that note go to standard "
    "error.\n\n"
    "Examples:\n"
    "  limitline year\n"
    "  limitline year --demo mesa-alta --units si\n"
    "  limitline year examples/office-humid-coast.toml --weather tests/data/greensboro-nc-tmy3.csv "
    "--format json\n"
    "  limitline year examples/office-humid-coast.toml --batch tests/data/\n"
    "  limitline year examples/office-humid-coast.toml --weather tests/data/greensboro-nc-tmy3.csv "
    "--hourly hours.csv";

// What the batch came to: how many sites finished, failed, or never started.
struct BatchTally {
  std::size_t run = 0, failed = 0;
  explicit BatchTally(const std::vector<BatchSite>& sites) {
    for (const auto& s : sites) {
      run += s.run;
      failed += s.run && !s.ok;
    }
  }
};

std::string partial_note(const std::vector<BatchSite>& sites) {
  return fmt::format(
      "PARTIAL RESULTS: interrupted; {} of {} sites evaluated, the others not started",
      BatchTally(sites).run, sites.size());
}

std::string batch_json(const std::vector<BatchSite>& sites, const report::Measure& m,
                       units::System s, bool interrupted) {
  report::Json j;
  j.begin_object();
  j.field("units", units::system_name(s));
  j.field("partial", interrupted);
  j.key("sites").begin_array();
  for (const auto& site : sites) {
    j.begin_object();
    j.field("weather_file", site.weather_path);
    j.field("status", !site.run ? "not-run" : site.ok ? "ok" : "failed");
    if (site.run && !site.ok) j.field("error", site.error);
    if (site.ok) {
      const auto* b = site.result.best();
      j.field("operating_hours", site.operating_hours, 8);
      if (b) {
        j.field("best", b->name);
        for (const auto& [k, v] : m.fields("shortfall_vs_perfect", b->shortfall_vs_perfect_kwh))
          j.field(k, v, 8);
        j.field("harmful_hours", b->annual.harmful_hours, 8);
        j.field("missed_hours", b->annual.missed_hours, 8);
      } else {
        j.key("best").null();
      }
      for (const auto& [k, v] :
           m.fields("perfect_savings_vs_no_economizer",
                    site.result.perfect_changeover.savings_vs_no_economizer_kwh))
        j.field(k, v, 8);
    }
    j.end_object();
  }
  j.end_array();
  j.key("cautions").begin_array();
  for (const auto& c : report::cautions(report::CautionTopic::design)) j.value(c);
  j.end_array();
  j.end_object();
  return j.str();
}

std::string batch_table(const std::vector<BatchSite>& sites, const report::Measure& m, Format f,
                        bool interrupted, std::size_t width) {
  std::vector<report::Column> cols = {{"weather file", report::Align::left, true},
                                      {"fan-on h", report::Align::right},
                                      {"best strategy", report::Align::left},
                                      {"shortfall " + m.unit(), report::Align::right},
                                      {"perfect savings " + m.unit(), report::Align::right},
                                      {"harmful h", report::Align::right},
                                      {"missed h", report::Align::right}};
  report::Table t(cols);
  std::string errors;
  for (const auto& site : sites) {
    if (!site.run) continue;
    if (!site.ok) {
      const std::string line = fmt::format("{}: {}", site.weather_path, site.error);
      errors += "  - " + (f == Format::md ? report::markdown_escape(line) : line) + "\n";
      continue;
    }
    const auto* b = site.result.best();
    auto e = [&](double v) { return m.format(v); };
    t.add_row({site.weather_path, fmt::format("{:.0f}", site.operating_hours), b ? b->name : "-",
               b ? e(b->shortfall_vs_perfect_kwh) : "-",
               e(site.result.perfect_changeover.savings_vs_no_economizer_kwh),
               b ? fmt::format("{:.0f}", b->annual.harmful_hours) : "-",
               b ? fmt::format("{:.0f}", b->annual.missed_hours) : "-"});
  }
  // CSV is data only: errors and the partial note go to standard error (see run_year).
  if (f == Format::csv) return t.csv();
  std::string out = f == Format::md ? "# Annual high-limit evaluation, per site\n\n" + t.markdown()
                                    : "limitline year — per-site summary\n\n" + t.text(width);
  if (interrupted) out += "\n" + partial_note(sites) + "\n";
  if (!errors.empty()) out += "\nSites that could not be evaluated:\n" + errors;
  out += '\n';
  out += f == Format::md ? report::cautions_markdown(report::CautionTopic::design)
                         : report::cautions_text(report::CautionTopic::design);
  return out;
}

int run_batch(const po::variables_map& vm, const Common& common, const UnitSource& source,
              const WeatherOverrides& overrides) {
  if (!vm.count("unit")) throw UsageError("--batch needs a unit file");
  if (vm.count("weather") || vm.count("hourly"))
    throw UsageError(
        "--batch takes its weather files from the folder; drop --weather and --hourly");
  // The unit is read once; its own weather file is not needed.
  UnitFile unit = load_unit_file(source.path);
  report_warnings(unit.warnings, common.strict);
  const units::System system = common.units.resolve(unit);
  const YearInputs base = batch_base(unit, source.path);
  const bool tty = isatty(fileno(stderr));
  const InterruptGuard guard;
  const auto sites =
      run_year_batch(base, vm["batch"].as<std::string>(), overrides, vm["threads"].as<unsigned>(),
                     tty ? show_site_progress : nullptr, &InterruptGuard::flag());
  const bool interrupted = guard.interrupted();
  const BatchTally tally(sites);
  const report::Measure measure(system, unit.plant);
  write_out(common.format == Format::json
                ? batch_json(sites, measure, system, interrupted)
                : terminal_text(common, batch_table(sites, measure, common.format, interrupted,
                                                    common.text_width())));
  std::fflush(stdout);
  if (common.format == Format::csv) {
    for (const auto& s : sites)
      if (s.run && !s.ok)
        std::fprintf(stderr, "limitline year: error: %s: %s\n", s.weather_path.c_str(),
                     s.error.c_str());
    if (interrupted) std::fprintf(stderr, "limitline year: %s\n", partial_note(sites).c_str());
  } else if (common.format == Format::json && tally.failed > 0) {
    std::fprintf(stderr,
                 "limitline year: error: %zu of %zu sites could not be evaluated; their errors are "
                 "in the JSON\n",
                 tally.failed, sites.size());
  }
  if (interrupted) {
    std::fprintf(stderr, "limitline year: interrupted; partial results written\n");
    return kInterruptedExit;
  }
  return tally.failed > 0 ? 2 : 0;
}

}  // namespace

int run_year(const std::vector<std::string>& args) {
  po::options_description options("options");
  po::positional_options_description pos;
  add_job_options(options, pos);
  options.add_options()("hourly", po::value<std::string>(),
                        "also write every hour's states, decisions and loads to this CSV file")(
      "batch", po::value<std::string>(),
      "evaluate every .csv weather file of this folder; per-site summary")(
      "threads", po::value<unsigned>()->default_value(0), "threads for --batch (0: all cores)")(
      "edition", po::value<std::string>(),
      "energy-code edition for the compliance column (default: [site] energy_code)")(
      "zone", po::value<std::string>(),
      "climate zone for the compliance column (default: [site] climate_zone)")(
      "code-table", po::value<std::vector<std::string>>()->composing(),
      "extra code-table file (a jurisdiction's amendments; repeatable)");
  add_common_options(options, "text, json, csv, md");
  po::variables_map vm;
  if (!parse_options(args, options, pos, "limitline year [UNIT.toml] [options]", kDetails, vm))
    return 0;
  const Common common = read_common(vm, {Format::text, Format::json, Format::csv, Format::md});

  const WeatherOverrides overrides = weather_overrides(vm);
  const UnitSource source = job_source(vm);

  if (vm.count("batch")) return run_batch(vm, common, source, overrides);

  // The output is opened first, so that a place it cannot be written fails before the work.
  const std::unique_ptr<OutputFile> hourly = open_side_output(vm, "hourly");
  const YearInputs in = load_year_inputs(source, overrides);
  if (hourly)
    refuse_input_as_output(hourly->target(), "--hourly", job_input_files(vm, in.weather_label));
  report_warnings(in.warnings, common.strict);
  const units::System system = common.units.resolve(in.unit);
  const annual::Prepared prepared = prepare_year(in);
  annual::RunOptions run;
  run.keep_decisions = hourly != nullptr;
  const annual::YearResult y = annual::evaluate(in.strategies, prepared, run);
  report::YearContext ctx = year_context(in, system);
  ctx.text_width = common.text_width();
  CodeSelection code;
  if (vm.count("edition")) code.edition = vm["edition"].as<std::string>();
  if (vm.count("zone")) code.zone = vm["zone"].as<std::string>();
  if (vm.count("code-table")) code.extra_tables = vm["code-table"].as<std::vector<std::string>>();
  add_compliance(ctx, in, code);

  if (hourly) {
    report::write_hourly_csv(hourly->stream(), outdoor_intervals(in.weather), prepared, y, system);
    hourly->commit();
  }
  switch (common.format) {
    case Format::json: write_out(report::year_json(y, ctx)); break;
    case Format::csv: write_out(report::year_csv(y, ctx)); break;
    case Format::md: write_out(report::year_markdown(y, ctx)); break;
    case Format::text:
    case Format::html:  // not among this command's formats: read_common refuses it
      write_out(terminal_text(common, report::year_text(y, ctx)));
      break;
  }
  return 0;
}

}  // namespace limitline::cli
