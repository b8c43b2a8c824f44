// limitline sensors: how each high-limit fares with the sensors it will actually have.
#include "common.hpp"

#include <limitline/report/sensors.hpp>
#include <limitline/io/codes.hpp>
#include <limitline/analysis/sensors.hpp>
#include <limitline/app/year_job.hpp>

#include <fmt/format.h>

#include <cstdio>
#include <optional>
#include <unistd.h>

namespace limitline::cli {
namespace {

constexpr std::string_view kDetails =
    "Runs many trials of the year. In each trial every sensor (outdoor dry-bulb, outdoor\n"
    "humidity, return dry-bulb, return RH) reads the truth plus one persistent bias drawn from\n"
    "its accuracy; the high-limit decides on those readings and the energy is that of the true\n"
    "air. Per strategy: the spread over the trials of the annual shortfall against the perfect\n"
    "changeover and of the harmful and missed hours, the chance it beats each other strategy,\n"
    "and, for each strategy that reads a humidity sensor against each that reads dry-bulb\n"
    "only, the humidity-sensor accuracy at which it stops being the better choice.\n\n"
    "Accuracies come from the unit file's [sensors] table (typical commercial figures when it\n"
    "has none): outdoor_dry_bulb = \"1F\", outdoor_rh = \"5%\" (or outdoor_dew_point,\n"
    "outdoor_enthalpy), return_dry_bulb, return_rh, distribution = \"uniform\" | \"normal\".\n\n"
    "The same seed gives the same results on any number of threads. Ctrl-C stops the run and\n"
    "reports the trials that finished, marked partial (exit code 130).\n\n"
    "Examples:\n"
    "  limitline sensors\n"
    "  limitline sensors examples/office-humid-coast.toml --weather "
    "tests/data/greensboro-nc-tmy3.csv --trials 2000 --seed 7\n"
    "  limitline sensors examples/office-humid-coast.toml --weather "
    "tests/data/greensboro-nc-tmy3.csv --sweep outdoor_rh=-10%:10%:1%\n"
    "  limitline sensors --format json --trials-csv trials.csv";

constexpr std::size_t kMaxTrials = 100000;
constexpr unsigned kMaxThreads = 256;
// "\r  trials: 430 of 1000" on stderr, redrawn when the whole percentage changes.
struct ProgressLine {
  std::string phase;
  std::size_t last_percent = 101;
  void operator()(std::string_view p, std::size_t done, std::size_t total) {
    const std::size_t percent = total ? done * 100 / total : 100;
    if (p == phase && percent == last_percent) return;
    if (p != phase && !phase.empty() && last_percent != 100) std::fputc('\n', stderr);
    phase = std::string(p);
    last_percent = percent;
    std::fprintf(stderr, "\r  %s: %zu of %zu", phase.c_str(), done, total);
    if (done == total) std::fputc('\n', stderr);
    std::fflush(stderr);
  }
};

// --sweep SENSOR=FROM:TO:STEP: the syntax is the command line's, the meaning the library's.
sensors::SweepSpec sweep_option(const std::string& text, sensors::HumidityKind configured,
                                units::System bare) {
  const std::string origin = "--sweep";
  const auto eq = text.find('=');
  if (eq == std::string::npos || eq == 0)
    throw UsageError(
        fmt::format("{}: write SENSOR=FROM:TO:STEP, e.g. outdoor_rh=-10%:10%:1%", origin));
  const std::string_view range = std::string_view(text).substr(eq + 1);
  std::array<std::string_view, 3> parts;
  std::size_t start = 0, count = 0;
  for (std::size_t i = 0; i <= range.size(); ++i) {
    if (i < range.size() && range[i] != ':') continue;
    if (count == 3)
      count = 4;
    else
      parts[count++] = range.substr(start, i - start);
    start = i + 1;
  }
  if (count != 3)
    throw UsageError(fmt::format("{}: the range must be FROM:TO:STEP, e.g. {}=-10%:10%:1%", origin,
                                 echo(text.substr(0, eq))));
  return sensors::sweep_spec(std::string_view(text).substr(0, eq), parts, configured, bare, origin);
}

}  // namespace

int run_sensors(const std::vector<std::string>& args) {
  po::options_description options("options");
  po::positional_options_description pos;
  add_job_options(options, pos);
  options.add_options()("trials", po::value<std::size_t>()->default_value(1000),
                        "trials (1 to 100000)")(
      "seed", po::value<std::uint64_t>()->default_value(1), "seed of the random biases")(
      "threads", po::value<unsigned>()->default_value(0), "threads (0: all cores)")(
      "trials-csv", po::value<std::string>(),
      "also write every trial's biases and results to this CSV file")(
      "sweep", po::value<std::string>(),
      "bias sweep of one sensor, SENSOR=FROM:TO:STEP, e.g. outdoor_rh=-10%:10%:1%")(
      "break-even-trials", po::value<std::size_t>()->default_value(200),
      "trials per accuracy in the break-even search (0: skip it)");
  add_common_options(options, "text, json");
  po::variables_map vm;
  if (!parse_options(args, options, pos, "limitline sensors [UNIT.toml] [options]", kDetails, vm))
    return 0;
  const Common common = read_common(vm, {Format::text, Format::json});
  const std::size_t trials = bounded<std::size_t>(vm, "trials", 1, kMaxTrials);
  const std::size_t be_trials = bounded<std::size_t>(vm, "break-even-trials", 0, kMaxTrials);
  const unsigned threads = bounded<unsigned>(vm, "threads", 0, kMaxThreads);
  const std::uint64_t seed = vm["seed"].as<std::uint64_t>();

  // Everything that can be wrong with the input is found before the long work starts.
  // The output is opened first, so that a place it cannot be written fails before the work.
  const std::unique_ptr<OutputFile> csv = open_side_output(vm, "trials-csv");
  const YearInputs in = load_year_inputs(job_source(vm), weather_overrides(vm));
  if (csv)
    refuse_input_as_output(csv->target(), "--trials-csv", job_input_files(vm, in.weather_label));
  report_warnings(in.warnings, common.strict);
  const units::System system = common.units.resolve(in.unit);
  codes::check_site_code(in.unit.site.energy_code, in.unit.site.energy_code_origin,
                         in.unit.site.climate_zone, in.unit.site.climate_zone_origin);
  const sensors::SensorSet set = sensors::read_sensors(
      in.unit.sensors ? &*in.unit.sensors : nullptr, in.unit.path, in.unit.units);
  report_warnings(set.warnings, common.strict);
  std::optional<sensors::SweepSpec> sweep_spec;
  if (vm.count("sweep"))
    sweep_spec = sweep_option(vm["sweep"].as<std::string>(), set.outdoor_humidity, system);

  // The study weighs sensor error in coil energy; a [plant]'s prices apply in year and report.
  const annual::Prepared prepared = prepare_year(in, true, false);
  const sensors::Engine engine(prepared, in.strategies, set.outdoor_humidity);

  const InterruptGuard guard;
  sensors::RunControl control;
  control.threads = threads;
  control.cancel = &InterruptGuard::flag();
  if (isatty(fileno(stderr))) control.progress = ProgressLine{};

  sensors::StudyOptions study_options;
  study_options.trials = trials;
  study_options.seed = seed;
  const sensors::StudyResult study = sensors::run_study(engine, set, study_options, control);

  std::optional<sensors::BreakEvenResult> be;
  if (be_trials > 0 && !guard.interrupted()) {
    sensors::BreakEvenOptions o;
    o.trials = std::min(be_trials, trials);
    o.seed = seed;
    be = sensors::break_even(engine, set, o, control);
  }
  std::optional<sensors::SweepResult> sweep;
  if (sweep_spec && !guard.interrupted())
    sweep = sensors::run_sweep(prepared, in.strategies, *sweep_spec, control);

  const bool interrupted = guard.interrupted();
  std::string note;
  if (interrupted) {
    note = fmt::format(
        "PARTIAL RESULTS: interrupted; {} of {} trials finished and every figure "
        "is over those",
        study.trials_completed(), study.trials_requested);
    if (be_trials > 0 && (!be || be->partial)) note += "; the break-even search did not finish";
    if (sweep_spec && (!sweep || sweep->partial)) note += "; the bias sweep did not finish";
  }

  report::YearContext ctx = year_context(in, system);
  ctx.text_width = common.text_width();
  if (ctx.plant) {
    ctx.plant.reset();
    ctx.model += "; this study weighs coil energy ([plant] prices apply in year and report)";
  }
  // The [sensors] table's own warnings belong to the study's inputs too.
  ctx.warnings.insert(ctx.warnings.end(), set.warnings.begin(), set.warnings.end());
  report::SensorsReport rep;
  rep.context = &ctx;
  rep.study = &study;
  rep.break_even = be ? &*be : nullptr;
  rep.sweep = sweep ? &*sweep : nullptr;
  rep.uses_humidity = engine.uses_humidity();
  rep.interrupted_note = note;

  if (csv) {
    report::write_trials_csv(csv->stream(), study, system);
    csv->commit();
  }
  write_out(common.format == Format::json ? report::sensors_json(rep)
                                          : terminal_text(common, report::sensors_text(rep)));
  if (interrupted)
    std::fprintf(stderr, "limitline sensors: interrupted; partial results written\n");
  return interrupted ? kInterruptedExit : 0;
}

}  // namespace limitline::cli
