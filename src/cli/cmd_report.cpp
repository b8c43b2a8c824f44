// limitline report: the whole study as one self-contained HTML page, or Markdown with its
// pictures beside it.
#include "common.hpp"

#include <limitline/report/html.hpp>
#include <limitline/app/report_job.hpp>
#include <limitline/app/year_job.hpp>

#include <fmt/format.h>

#include <filesystem>

namespace limitline::cli {
namespace {

constexpr std::string_view kDetails =
    "Runs the annual evaluation of `limitline year` and writes it as a study to send to a client\n"
    "or an inspector: the job and its inputs (unit, site pressure, weather file and how its\n"
    "columns were read, schedule), the strategies, their ranking against the perfect changeover,\n"
    "monthly economizing hours as a bar chart, the psychrometric chart with each high-limit and\n"
    "the occupied hours, harmful and missed hours by month, the energy-code verdicts when the\n"
    "unit file's [site] names energy_code and climate_zone, and the cautions.\n\n"
    "--format html (default) writes one file with its CSS and pictures inline: it needs no\n"
    "network, prints on A4 or Letter and reads on a phone. --format md writes Markdown, with the\n"
    "pictures as SVG files beside it: report.md, report-chart.svg, report-monthly.svg.\n\n"
    "Examples:\n"
    "  limitline report -o study.html\n"
    "  limitline report --demo mesa-alta --units si -o mesa.html\n"
    "  limitline report examples/office-humid-coast.toml --weather "
    "tests/data/greensboro-nc-tmy3.csv --format md -o report.md";

// "dir/report.md" → "dir/report-chart.svg": the pictures sit beside the Markdown file.
std::filesystem::path beside(const std::filesystem::path& md, std::string_view suffix) {
  return md.parent_path() / (md.stem().string() + std::string(suffix));
}

}  // namespace

int run_report(const std::vector<std::string>& args) {
  po::options_description options("options");
  po::positional_options_description pos;
  add_job_options(options, pos);
  options.add_options()("output,o", po::value<std::string>(),
                        "file to write (html: - for standard output)")(
      "format", po::value<std::string>()->default_value("html"), "html or md")(
      "strict", "treat warnings (implausible values, inputs that disagree) as errors")(
      "help,h", "show this help");
  add_units_option(options);
  po::variables_map vm;
  if (!parse_options(args, options, pos, "limitline report [UNIT.toml] [options] -o report.html",
                     kDetails, vm))
    return 0;
  const UnitsChoice units_choice(vm);
  const std::string format = vm["format"].as<std::string>();
  if (format != "html" && format != "md")
    throw UsageError(
        fmt::format("--format: '{}' is not a format of this command (html, md)", format));
  if (!vm.count("output")) throw UsageError("give the file to write with -o, e.g. -o report.html");
  const std::string output = vm["output"].as<std::string>();
  if (format == "md" && output == "-")
    throw UsageError("--format md writes its pictures beside the file: give -o report.md");

  const YearInputs in = load_year_inputs(job_source(vm), weather_overrides(vm));
  report_warnings(in.warnings, vm.count("strict") > 0);
  const units::System s = units_choice.resolve(in.unit);
  const std::vector<std::filesystem::path> inputs = job_input_files(vm, in.weather_label);
  const annual::Prepared prepared = prepare_year(in);
  const annual::YearResult year = annual::evaluate(in.strategies, prepared);
  report::ReportDocument doc = report_document(in, prepared, year, s);
  doc.generator = "limitline " LIMITLINE_CLI_VERSION;

  if (format == "html") {
    refuse_input_as_output(output, "--output", inputs);
    write_file(output, report::report_html(year, doc), "--output");
    return 0;
  }
  // The three files are written whole before any is renamed into place, so a failure leaves
  // none of them half-written.
  const std::filesystem::path md(output);
  const auto chart = beside(md, "-chart.svg"), monthly = beside(md, "-monthly.svg");
  for (const auto& p : {chart, monthly, md}) refuse_input_as_output(p, "--output", inputs);
  OutputFile chart_file(chart, "--output"), monthly_file(monthly, "--output"),
      md_file(md, "--output");
  chart_file.write(doc.chart_svg);
  monthly_file.write(doc.monthly_svg);
  md_file.write(
      report::report_markdown(year, doc, chart.filename().string(), monthly.filename().string()));
  chart_file.commit();
  monthly_file.commit();
  md_file.commit();
  return 0;
}

}  // namespace limitline::cli
