// limitline survey and limitline merge: one unit at many sites, summarised by climate zone,
// on one machine or split into shards run anywhere and merged.
#include "common.hpp"

#include <limitline/app/survey.hpp>
#include <limitline/io/output_file.hpp>
#include <limitline/report/survey.hpp>

#include <fmt/format.h>

#include <unistd.h>

#include <cstdio>

namespace limitline::cli {
namespace {

constexpr unsigned kMaxThreads = 256;

constexpr std::string_view kSurveyDetails =
    "Judges one unit at every site of a manifest: a CSV whose header names its columns,\n"
    "  weather       the site's weather file (relative to the manifest's folder); required\n"
    "  site          its name (default: the weather file's name)\n"
    "  elevation     e.g. 850ft or 259m (bare numbers in --units)\n"
    "  energy_code   an edition (limitline code --all-editions lists them)\n"
    "  climate_zone  e.g. 4A\n"
    "  unit          a unit file of its own for this site (default: UNIT.toml)\n"
    "or a folder, whose every .csv file is a site. Each site gets every strategy of the unit\n"
    "(the presets at its code's settings when the unit gives none) and the references, ranked\n"
    "by shortfall against the perfect changeover, the best and the best its code allows;\n"
    "--tune adds each strategy's best setpoint (as limitline tune). The summary by climate zone\n"
    "counts how often each strategy is best (ties counted for each), and gives its median and\n"
    "worst shortfall, in energy and as a share of each site's perfect-changeover savings, and\n"
    "with --tune the median best setpoint. A site that fails (a missing or unreadable file) is\n"
    "listed with its error; the others are complete (exit 2 when any failed).\n\n"
    "--shard K/N evaluates only rows K, K+N, K+2N, ... and writes a partial result (JSON lines)\n"
    "instead of the report; limitline merge combines the partials of all N shards into exactly\n"
    "the report of the whole survey. A shard exits 0 once its partial is complete, failed\n"
    "sites included (they are in the partial); merge exits 2 when any site failed.\n\n"
    "Examples:\n"
    "  limitline survey examples/survey-sites.csv examples/survey-office.toml\n"
    "  limitline survey examples/survey-sites.csv examples/survey-office.toml --format html -o "
    "survey.html\n"
    "  limitline survey examples/survey-sites.csv examples/survey-office.toml --shard 1/2 -o "
    "part-1.jsonl";

constexpr std::string_view kMergeDetails =
    "Combines the partial results of every shard of one survey (limitline survey --shard K/N,\n"
    "any order) into its report, the same bytes the whole survey on one machine writes. It\n"
    "refuses partials of another survey (manifest, unit, settings or limitline version), a shard\n"
    "missing or given twice, an interrupted shard and a cut file, naming the file and line.\n"
    "examples/survey-parts/ holds the two shards of examples/survey-sites.csv as --shard 1/2\n"
    "and 2/2 write them.\n\n"
    "Examples:\n"
    "  limitline merge examples/survey-parts/part-1.jsonl examples/survey-parts/part-2.jsonl\n"
    "  limitline merge examples/survey-parts/part-2.jsonl examples/survey-parts/part-1.jsonl "
    "--format html -o survey.html";

void add_report_options(po::options_description& options) {
  options.add_options()("output,o", po::value<std::string>()->default_value("-"),
                        "write to this file instead of standard output (whole or absent)")(
      "table", po::value<std::string>()->default_value("zones"),
      "with --format csv: zones (one row per zone and strategy) or sites (one per site and "
      "strategy)");
}

bool sites_table(const po::variables_map& vm, Format f) {
  const std::string t = vm["table"].as<std::string>();
  if (t != "zones" && t != "sites")
    throw UsageError(fmt::format("--table: {} is not zones or sites", echo(t)));
  if (t == "sites" && f != Format::csv) throw UsageError("--table sites is for --format csv");
  return t == "sites";
}

// The report of records arriving in manifest order.
struct Collector {
  report::SurveyReport report;
  survey::SummaryBuilder summary;
  void add(const survey::SiteRecord& r) {
    summary.add(r);
    report.sites.push_back(r);
  }
};

int write_report(Collector& c, const Common& common, bool sites, const std::string& output,
                 const std::vector<std::filesystem::path>& inputs) {
  c.report.zones = c.summary.zones();
  std::string text;
  switch (common.format) {
    case Format::json: text = report::survey_json(c.report); break;
    case Format::csv: text = report::survey_csv(c.report, sites); break;
    case Format::html: text = report::survey_html(c.report); break;
    case Format::md:
    case Format::text: text = report::survey_text(c.report, common.text_width()); break;
  }
  if (output == "-") {
    write_out(text);
  } else {
    refuse_input_as_output(output, "-o", inputs);
    write_file(output, text, "-o");
  }
  std::size_t failed = 0;
  for (const auto& s : c.report.sites) failed += s.ok ? 0 : 1;
  if (failed && common.format == Format::csv)
    std::fprintf(stderr, "limitline: %zu site%s failed (listed in the other formats)\n", failed,
                 failed == 1 ? "" : "s");
  return failed ? 2 : 0;
}

}  // namespace

int run_survey(const std::vector<std::string>& args) {
  po::options_description options("options");
  po::positional_options_description pos;
  options.add_options()("manifest", po::value<std::string>(), "the manifest CSV, or a folder")(
      "unit", po::value<std::string>(), "the unit file every site is judged with")(
      "tune", po::bool_switch(), "sweep each strategy's setpoints per site (as limitline tune)")(
      "shard", po::value<std::string>(),
      "K/N: evaluate rows K, K+N, ... only and write their partial result (JSON lines)")(
      "threads", po::value<unsigned>()->default_value(0), "threads (0: all cores)");
  add_report_options(options);
  add_common_options(options, "text, json, csv, html");
  pos.add("manifest", 1).add("unit", 1);
  po::variables_map vm;
  if (!parse_options(args, options, pos, "limitline survey MANIFEST UNIT.toml [options]",
                     kSurveyDetails, vm))
    return 0;
  const Common common = read_common(vm, {Format::text, Format::json, Format::csv, Format::html});
  if (!vm.count("manifest"))
    throw UsageError("give the manifest (a CSV or a folder of weather files)");
  if (!vm.count("unit")) throw UsageError("give the unit file every site is judged with");
  const bool sharded = vm.count("shard") > 0;
  if (sharded && (!vm["format"].defaulted() || !vm["table"].defaulted()))
    throw UsageError("--shard writes a partial result (JSON lines); give --format to merge");
  const bool sites = sites_table(vm, common.format);
  const std::string manifest_path = vm["manifest"].as<std::string>();
  const std::string unit_path = vm["unit"].as<std::string>();
  const std::string output = vm["output"].as<std::string>();
  const std::vector<std::filesystem::path> inputs = {manifest_path, unit_path};

  const UnitFile unit = load_unit_file(unit_path);
  report_warnings(unit.warnings, common.strict);
  survey::SurveyOptions o;
  o.units = common.units.resolve(unit);
  o.tune = vm["tune"].as<bool>();
  o.threads = bounded<unsigned>(vm, "threads", 0, kMaxThreads);
  if (isatty(fileno(stderr))) o.progress = show_site_progress;
  survey::Manifest manifest = survey::read_manifest(manifest_path, o.units);
  const InterruptGuard guard;
  o.cancel = &InterruptGuard::flag();
  const survey::Survey run(std::move(manifest), unit_path, WeatherOverrides{}, o);

  if (sharded) {
    const survey::Shard shard = survey::parse_shard(vm["shard"].as<std::string>());
    if (output != "-") refuse_input_as_output(output, "-o", inputs);
    OutputFile out(output, "-o");
    out.write(survey::header_line(run.info(), shard));
    std::size_t count = 0, failed = 0;
    const bool complete = run.run(shard, [&](const survey::SiteRecord& r) {
      out.write(survey::record_line(r));
      ++count;
      failed += r.ok ? 0 : 1;
    });
    out.write(survey::end_line(count, complete));
    out.commit();
    if (failed)
      std::fprintf(stderr, "limitline survey: shard %zu/%zu: %zu of %zu sites failed (recorded)\n",
                   shard.index, shard.count, failed, count);
    if (!complete) {
      std::fprintf(stderr, "limitline survey: interrupted; the partial is marked incomplete\n");
      return kInterruptedExit;
    }
    return 0;
  }

  // The whole survey goes through the partial's lines too, so that merging shards gives
  // the same bytes.
  Collector c;
  survey::Shard whole;
  c.report.info = survey::parse_header(survey::header_line(run.info(), whole), "survey", whole);
  const bool complete = run.run(whole, [&](const survey::SiteRecord& r) {
    c.add(survey::parse_record(survey::record_line(r), "survey"));
  });
  c.report.partial = !complete;
  const int rc = write_report(c, common, sites, output, inputs);
  if (!complete) {
    std::fprintf(stderr, "limitline survey: interrupted; partial results written\n");
    return kInterruptedExit;
  }
  return rc;
}

int run_merge(const std::vector<std::string>& args) {
  po::options_description options("options");
  po::positional_options_description pos;
  options.add_options()("partial", po::value<std::vector<std::string>>()->composing(),
                        "a partial result of limitline survey --shard (repeatable)");
  add_report_options(options);
  add_common_options(options, "text, json, csv, html");
  pos.add("partial", -1);
  po::variables_map vm;
  if (!parse_options(args, options, pos, "limitline merge PARTIAL.jsonl... [options]",
                     kMergeDetails, vm))
    return 0;
  const Common common = read_common(vm, {Format::text, Format::json, Format::csv, Format::html});
  if (!vm.count("partial")) throw UsageError("give the partial results of every shard");
  const bool sites = sites_table(vm, common.format);
  const auto files = vm["partial"].as<std::vector<std::string>>();
  Collector c;
  c.report.info = survey::merge_partials(files, [&](const survey::SiteRecord& r) { c.add(r); });
  if (common.units.given() && common.units.resolve() != c.report.info.units)
    throw UsageError(fmt::format("--units: the survey ran in {}; merge reports in its units",
                                 units::system_name(c.report.info.units)));
  std::vector<std::filesystem::path> inputs(files.begin(), files.end());
  return write_report(c, common, sites, vm["output"].as<std::string>(), inputs);
}

}  // namespace limitline::cli
