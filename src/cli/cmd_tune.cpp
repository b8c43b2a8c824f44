// limitline tune: the best setpoint of every high-limit strategy, and how flat the optimum is.
#include "common.hpp"

#include <limitline/app/tune_job.hpp>
#include <limitline/io/output_file.hpp>
#include <limitline/report/json.hpp>
#include <limitline/report/table.hpp>
#include <limitline/report/tune.hpp>

#include <fmt/format.h>

#include <cstdio>
#include <filesystem>

namespace limitline::cli {
namespace {

constexpr std::string_view kDetails =
    "Sweeps each strategy of the unit file (every preset at its defaults when it gives none)\n"
    "over a practical range of its setpoints, on the year prepared once: 41 settings for a\n"
    "strategy on one quantity, 21 x 11 for a combined one (its primary setting by its dry-bulb\n"
    "limit). For each strategy it reports the best setting, the settings whose savings come\n"
    "within 1 % and 5 % of the best (choose inside the band, not on the point), and what the\n"
    "unit file's, the common-practice and the energy code's settings cost against the best.\n"
    "With an energy code and climate zone ([site], or --edition and --zone) each setting gets\n"
    "its verdict, and the recommendation names the best setting the code allows.\n\n"
    "--plots DIR writes one SVG per strategy: the loss against the best along the swept\n"
    "setting, the 1 % band shaded. --batch DIR tunes every .csv weather file of a folder and\n"
    "prints the best setting per site and strategy.\n\n"
    "Examples:\n"
    "  limitline tune\n"
    "  limitline tune examples/office-humid-coast.toml --weather "
    "tests/data/greensboro-nc-tmy3.csv\n"
    "  limitline tune --plots plots/ --format json\n"
    "  limitline tune examples/office-humid-coast.toml --batch tests/data/";

constexpr unsigned kMaxThreads = 256;

std::string best_text(const tuning::StrategyTuning& t, units::System s) {
  std::string out;
  const auto& c = t.curve;
  const auto& b = c.best_point();
  for (std::size_t a = 0; a < c.axes.size(); ++a) {
    const auto& ax = c.axes[a];
    const units::Kind k = ax.kind();
    out += (a ? " / " : "") + units::format(k, s, b.values[a], 1);
  }
  return out;
}

std::string band_text(const tuning::StrategyTuning& t, units::System s) {
  const auto& c = t.curve;
  const auto& b = c.within_1pct;
  std::string out;
  for (std::size_t a = 0; a < c.axes.size(); ++a) {
    const auto& ax = c.axes[a];
    const units::Kind k = ax.kind();
    out += (a ? " / " : "") + units::format(k, s, b.lo[a], 1) + " to " +
           units::format(k, s, b.hi[a], 1);
  }
  return out;
}

int run_batch(const po::variables_map& vm, const Common& common, const UnitSource& source,
              const WeatherOverrides& overrides, TuneOptions options, unsigned threads) {
  if (!vm.count("unit")) throw UsageError("--batch needs a unit file");
  if (vm.count("weather") || vm.count("plots"))
    throw UsageError("--batch takes its weather files from the folder; drop --weather and --plots");
  UnitFile unit = load_unit_file(source.path);
  report_warnings(unit.warnings, common.strict);
  options.units = common.units.resolve(unit);
  const YearInputs base = batch_base(unit, source.path);
  const InterruptGuard guard;
  options.cancel = &InterruptGuard::flag();
  const auto sites =
      run_tune_batch(base, vm["batch"].as<std::string>(), overrides, options, threads);
  const report::Measure m(options.units, unit.plant);
  const units::System s = options.units;

  std::size_t failed = 0;
  if (common.format == Format::json) {
    report::Json j;
    j.begin_object();
    j.field("units", units::system_name(s));
    j.field("partial", guard.interrupted());
    j.key("sites").begin_array();
    for (const auto& site : sites) {
      j.begin_object();
      j.field("weather_file", site.weather_path);
      j.field("status", !site.run ? "not-run" : site.ok ? "ok" : "failed");
      if (site.run && !site.ok) {
        j.field("error", site.error);
        ++failed;
      }
      if (site.ok) {
        j.key("strategies").begin_array();
        for (const auto& t : site.result.strategies) {
          j.begin_object();
          j.field("name", t.strategy.name);
          j.field("best", best_text(t, s));
          j.field("within_1pct", band_text(t, s));
          for (const auto& [k, v] :
               m.fields("shortfall_vs_perfect", t.curve.best_point().shortfall_kwh))
            j.field(k, v, 8);
          if (!t.best_verdict.empty()) j.field("compliance", t.best_verdict);
          j.end_object();
        }
        j.end_array();
      }
      j.end_object();
    }
    j.end_array();
    j.end_object();
    write_out(j.str());
  } else {
    report::Table t({{"weather file", report::Align::left, true},
                     {"strategy", report::Align::left},
                     {"best", report::Align::left},
                     {"within 1%", report::Align::left},
                     {"shortfall " + m.unit(), report::Align::right}});
    std::string errors;
    for (const auto& site : sites) {
      if (!site.run) continue;
      if (!site.ok) {
        ++failed;
        errors += fmt::format("  - {}: {}\n", site.weather_path, site.error);
        continue;
      }
      for (const auto& st : site.result.strategies)
        t.add_row({site.weather_path, st.strategy.name, best_text(st, s), band_text(st, s),
                   m.format(st.curve.best_point().shortfall_kwh)});
    }
    if (common.format == Format::csv) {
      write_out(t.csv());
      if (!errors.empty()) std::fprintf(stderr, "limitline tune: errors:\n%s", errors.c_str());
    } else {
      std::string out =
          common.format == Format::md
              ? "# Setpoint tuning, per site\n\n" + t.markdown()
              : "limitline tune — best setting per site\n\n" + t.text(common.text_width());
      if (!errors.empty()) out += "\nSites that could not be tuned:\n" + errors;
      write_out(common.format == Format::md ? out : terminal_text(common, out));
    }
  }
  if (guard.interrupted()) {
    std::fprintf(stderr, "limitline tune: interrupted; partial results written\n");
    return kInterruptedExit;
  }
  return failed > 0 ? 2 : 0;
}

}  // namespace

int run_tune(const std::vector<std::string>& args) {
  po::options_description options("options");
  po::positional_options_description pos;
  add_job_options(options, pos);
  options.add_options()("plots", po::value<std::string>(),
                        "write one loss-against-setting SVG per strategy into this folder")(
      "batch", po::value<std::string>(), "tune every .csv weather file of this folder")(
      "threads", po::value<unsigned>()->default_value(0), "threads (0: all cores)")(
      "edition", po::value<std::string>(), "energy-code edition (default: [site] energy_code)")(
      "zone", po::value<std::string>(), "climate zone (default: [site] climate_zone)")(
      "code-table", po::value<std::vector<std::string>>()->composing(),
      "extra code-table file (a jurisdiction's amendments; repeatable)");
  add_common_options(options, "text, json, csv, md");
  po::variables_map vm;
  if (!parse_options(args, options, pos, "limitline tune [UNIT.toml] [options]", kDetails, vm))
    return 0;
  const Common common = read_common(vm, {Format::text, Format::json, Format::csv, Format::md});
  const unsigned threads = bounded<unsigned>(vm, "threads", 0, kMaxThreads);
  TuneOptions topt;
  topt.threads = threads;
  if (vm.count("edition")) topt.code.edition = vm["edition"].as<std::string>();
  if (vm.count("zone")) topt.code.zone = vm["zone"].as<std::string>();
  if (vm.count("code-table"))
    topt.code.extra_tables = vm["code-table"].as<std::vector<std::string>>();
  const WeatherOverrides overrides = weather_overrides(vm);
  const UnitSource source = job_source(vm);
  if (vm.count("batch")) return run_batch(vm, common, source, overrides, topt, threads);

  const YearInputs in = load_year_inputs(source, overrides);
  report_warnings(in.warnings, common.strict);
  topt.units = common.units.resolve(in.unit);
  std::filesystem::path plots;
  if (vm.count("plots")) {
    plots = vm["plots"].as<std::string>();
    std::error_code ec;
    std::filesystem::create_directories(plots, ec);
    if (!std::filesystem::is_directory(plots, ec))
      throw InputError(
          fmt::format("--plots: {} is not a folder and cannot be made one", echo(plots.string())));
  }
  const annual::Prepared prepared = prepare_year(in);
  const InterruptGuard guard;
  topt.cancel = &InterruptGuard::flag();
  const TuneResult tuned = limitline::run_tune(in, prepared, topt);
  report::YearContext ctx = year_context(in, topt.units);
  ctx.code_label = tuned.code_label;
  report::TuneReport rep{&tuned, &ctx, prepared.operating_hours, tuned.perfect_savings};

  if (!plots.empty())
    for (std::size_t i = 0; i < tuned.strategies.size(); ++i)
      write_file((plots / report::plot_file_name(tuned.strategies[i].strategy.name, i)).string(),
                 report::tune_plot_svg(tuned.strategies[i], ctx), "--plots");
  switch (common.format) {
    case Format::json: write_out(report::tune_json(rep)); break;
    case Format::csv: write_out(report::tune_csv(rep)); break;
    case Format::md: write_out(report::tune_markdown(rep)); break;
    case Format::text:
    case Format::html:  // not among this command's formats: read_common refuses it
      write_out(terminal_text(common, report::tune_text(rep)));
      break;
  }
  if (guard.interrupted()) {
    std::fprintf(stderr, "limitline tune: interrupted; partial results written\n");
    return kInterruptedExit;
  }
  return 0;
}

}  // namespace limitline::cli
