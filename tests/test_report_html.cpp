// The study report (report/html.hpp) and `limitline report`: one self-contained HTML page, or
// Markdown with its pictures beside it.
//
// The page is checked with libxml2's xmllint as XML (it is written to be well-formed XHTML-
// compatible HTML5), its inline pictures are parsed and rendered with rsvg-convert, and its
// text is searched for anything that would reach the network.
//
// Weather: tests/data/greensboro-nc-tmy3.csv (NREL TMY3, open data; tests/data/SOURCES.md) and
// the embedded invented demo climates. Unit files are invented scenarios of the test.
#include <limitline/io/embedded.hpp>
#include <limitline/report/cautions.hpp>
#include <limitline/report/html.hpp>
#include <limitline/io/unit_file.hpp>
#include <limitline/app/year_job.hpp>

#include "support/cli.hpp"
#include "support/svg.hpp"

#include <fstream>
#include <regex>

using namespace limitline;
using limitline::test::contains;
using limitline::test::run_cli;
using limitline::test::scratch_dir;
using limitline::test::shell_quote;
using limitline::test::slurp;
using limitline::test::svg::check_svg_renders;
using limitline::test::svg::sh;

namespace {

const char* const kSuite = "report_html";

std::filesystem::path out_path(const std::string& name) { return scratch_dir(kSuite) / name; }

bool well_formed_xml(const std::filesystem::path& file) {
  return sh("xmllint --noout " + shell_quote(file.string()) + " 2>/dev/null") == 0;
}

// Anything in a page that a browser would fetch or that names a place on the network, and any
// number that is not one.
void check_no_external_references(const std::string& page) {
  for (const char* bad : {"http:", "https:", "ftp:", "src=", "href=", "url(", "@import", "<link",
                          "<script", "<iframe", "<object", "<embed", "<img"})
    CHECK_MESSAGE(!contains(page, bad), bad);
  static const std::regex not_a_number(R"((^|[^a-z])(nan|inf)([^a-z]|$))", std::regex::icase);
  CHECK_FALSE(std::regex_search(page, not_a_number));
}

// The inline <svg> elements of a page, made standalone again.
std::vector<std::string> inline_svgs(const std::string& page) {
  std::vector<std::string> out;
  for (std::size_t at = page.find("<svg "); at != std::string::npos;
       at = page.find("<svg ", at + 1)) {
    const std::size_t end = page.find("</svg>", at);
    REQUIRE(end != std::string::npos);
    out.push_back("<svg xmlns=\"http://www.w3.org/2000/svg\" " +
                  page.substr(at + 5, end + 6 - at - 5));
  }
  return out;
}

std::filesystem::path write_unit(const std::string& name, const std::string& site_extra) {
  const auto p = scratch_dir(kSuite) / name;
  std::ofstream(p)
      << "[site]\nname = \"branch office <B&W> (invented)\"\nelevation = \"270m\"\n"
      << site_extra
      << "[air_handler]\nsupply_airflow = \"5000cfm\"\nsupply_air_temp = \"55F\"\nfan_heat = "
         "\"1.2F\"\n"
         "min_outdoor_air = \"22%\"\nreturn_air_temp = \"75F\"\nreturn_air_rh = \"48%\"\n"
         "[[strategy]]\nname = \"enthalpy 28 | db 75\"\npreset = \"fixed-enthalpy+dry-bulb\"\n"
         "enthalpy_limit = \"28btu/lb\"\ndry_bulb_limit = \"75F\"\n"
         "[[strategy]]\nname = \"dry-bulb 70\"\npreset = \"fixed-dry-bulb\"\ndry_bulb_limit = "
         "\"70F\"\n"
         "[[strategy]]\nname = \"differential enthalpy\"\npreset = \"differential-enthalpy\"\n";
  return p;
}

std::string greensboro() {
  return std::string(LIMITLINE_TEST_DATA_DIR) + "/greensboro-nc-tmy3.csv";
}

}  // namespace

TEST_CASE("the demo report is one well-formed page with every section, nothing fetched") {
  const auto file = out_path("demo.html");
  const auto r = run_cli({"report", "-o", file.string()}, kSuite);
  REQUIRE(r.rc == 0);
  CHECK(r.out.empty());
  const std::string page = slurp(file);
  CHECK(page.starts_with("<!DOCTYPE html>\n<html lang=\"en\">"));
  CHECK(well_formed_xml(file));
  check_no_external_references(page);
  // Print (A4 and Letter: margins only, the paper size is the printer's) and phones.
  for (const char* rule :
       {"<meta charset=\"utf-8\"/>",
        "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\"/>",
        "@page{margin:", "@media print{", "break-inside:avoid", "@media (max-width:40rem)",
        ".scroll{overflow-x:auto", "max-width:62rem"})
    CHECK_MESSAGE(contains(page, rule), rule);
  for (const char* id :
       {"id=\"inputs\"", "id=\"strategies\"", "class=\"ranked\"", "id=\"findings\"",
        "id=\"economizing-hours-by-month\"", "id=\"chart\"", "id=\"harmful-hours-by-month\"",
        "id=\"missed-hours-by-month\"", "id=\"code\"", "id=\"cautions\""})
    CHECK_MESSAGE(contains(page, id), id);
  // In that order: inputs first, cautions last.
  CHECK(page.find("id=\"inputs\"") < page.find("class=\"ranked\""));
  CHECK(page.find("id=\"economizing-hours-by-month\"") < page.find("id=\"chart\""));
  CHECK(page.find("id=\"chart\"") < page.find("id=\"harmful-hours-by-month\""));
  CHECK(page.find("id=\"code\"") < page.find("id=\"cautions\""));
  for (const auto& c : report::cautions(report::CautionTopic::design))
    CHECK(contains(page, report::html_escape(c)));
  // The weather mapping the year was read with.
  CHECK(contains(page, "column &#39;dry_bulb_c&#39;"));
  CHECK(contains(page, "Mixed-air target: 53.5 °F"));
  // Every strategy of the unit file, in the list and the ranked table.
  const UnitFile unit =
      parse_unit_file(*embedded::find("demo-harbourside.toml"), "demo-harbourside.toml");
  REQUIRE(!unit.strategies.empty());
  for (const auto& s : unit.strategies) {
    CHECK(contains(page, "<strong>" + report::html_escape(s.name) + "</strong>"));
    CHECK(contains(page, "</span>" + report::html_escape(s.name) + "</td>"));
  }
  // The pictures are inline, and each parses and renders on its own: the monthly hours, the
  // chart, then one setpoint-tuning plot per strategy after the compliance section.
  const auto svgs = inline_svgs(page);
  REQUIRE(svgs.size() == 2 + unit.strategies.size());
  check_svg_renders(svgs[0], kSuite, "inline-monthly");
  check_svg_renders(svgs[1], kSuite, "inline-chart");
  CHECK(contains(svgs[1], "Psychrometric chart at 14.678 psia"));
  for (std::size_t i = 2; i < svgs.size(); ++i) CHECK(contains(svgs[i], "within 1%"));
  CHECK(page.find("id=\"code\"") < page.find("id=\"tuning\""));
  CHECK(page.find("id=\"tuning\"") < page.find("id=\"cautions\""));
}

TEST_CASE(
    "the compliance section gives each strategy's verdict when the site names a code and a zone") {
  const auto unit =
      write_unit("coded.toml", "energy_code = \"ashrae-90.1-2019\"\nclimate_zone = \"4A\"\n");
  const auto file = out_path("coded.html");
  const auto r =
      run_cli({"report", unit.string(), "--weather", greensboro(), "-o", file.string()}, kSuite);
  REQUIRE(r.rc == 0);
  const std::string page = slurp(file);
  CHECK(well_formed_xml(file));
  check_no_external_references(page);
  CHECK(contains(page, "climate zone 4A"));
  // Names with markup characters are escaped, not interpreted.
  CHECK(contains(page, "branch office &lt;B&amp;W&gt; (invented)"));
  for (const char* name : {"enthalpy 28 | db 75", "dry-bulb 70", "differential enthalpy"}) {
    CHECK(contains(page, std::string("<strong>") + name + "</strong>: "));
    CHECK(contains(page, std::string("</span>") + name + "</td>"));
  }
  static const std::regex verdict(
      R"re(<span class="verdict (complies|not-allowed|set-wrong|not-evaluable)">)re");
  CHECK(std::distance(std::sregex_iterator(page.begin(), page.end(), verdict),
                      std::sregex_iterator()) == 3);
  CHECK(contains(page, "<th>code</th>"));
}

TEST_CASE("without a code the report leaves the compliance section out") {
  const auto unit = write_unit("plain.toml", "");
  const auto file = out_path("plain.html");
  const auto r = run_cli(
      {"report", unit.string(), "--weather", greensboro(), "--units", "si", "-o", file.string()},
      kSuite);
  REQUIRE(r.rc == 0);
  const std::string page = slurp(file);
  CHECK(well_formed_xml(file));
  CHECK_FALSE(contains(page, "id=\"code\""));
  CHECK_FALSE(contains(page, "<th>code</th>"));
  CHECK(contains(page, "kPa"));
  CHECK(contains(page, "g/kg"));
  CHECK(contains(page, "id=\"cautions\""));
}

TEST_CASE("a site naming only one of code and zone is a one-line error") {
  const auto unit = write_unit("half.toml", "energy_code = \"ashrae-90.1-2019\"\n");
  const auto r = run_cli(
      {"report", unit.string(), "--weather", greensboro(), "-o", out_path("half.html").string()},
      kSuite);
  CHECK(r.rc == 2);
  CHECK(contains(r.err, "half.toml:4"));
  CHECK(contains(r.err, "climate zone"));
  CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
}

TEST_CASE("--format md writes the study and its two pictures beside it") {
  const auto dir = scratch_dir(kSuite) / "md";
  std::filesystem::create_directories(dir);
  const auto md = dir / "study.md";
  const auto r = run_cli(
      {"report", "--demo", "mesa-alta", "--units", "si", "--format", "md", "-o", md.string()},
      kSuite);
  REQUIRE(r.rc == 0);
  const std::string text = slurp(md);
  CHECK(text.starts_with("# Economizer high-limit study — "));
  CHECK(contains(text, "![Psychrometric chart with high-limit lines](study-chart.svg)"));
  CHECK(contains(text, "![Economizing hours by month](study-monthly.svg)"));
  CHECK(contains(text, "## Cautions"));
  CHECK(contains(text, "## Energy-code compliance"));
  CHECK_FALSE(contains(text, "<svg"));
  const UnitFile unit =
      parse_unit_file(*embedded::find("demo-mesa-alta.toml"), "demo-mesa-alta.toml");
  for (const auto& s : strategies_or_presets(unit)) CHECK(contains(text, "**" + s.name + "**"));
  for (const char* f : {"study-chart.svg", "study-monthly.svg"}) {
    const std::string svg = slurp(dir / f);
    CHECK(well_formed_xml(dir / f));
    check_svg_renders(svg, kSuite, std::string("md-") + f);
  }
  CHECK(contains(slurp(dir / "study-chart.svg"),
                 "81.51 kPa"));  // standard pressure at 5900 ft (eq. 3)
}

TEST_CASE("report usage and output errors") {
  auto r = run_cli({"report"}, kSuite);
  CHECK(r.rc == 1);
  CHECK(contains(r.err, "-o"));
  r = run_cli({"report", "--format", "pdf", "-o", out_path("x.pdf").string()}, kSuite);
  CHECK(r.rc == 1);
  CHECK(contains(r.err, "'pdf' is not a format of this command (html, md)"));
  r = run_cli({"report", "--format", "md", "-o", "-"}, kSuite);
  CHECK(r.rc == 1);
  r = run_cli({"report", "-o", "/nonexistent-dir/r.html"}, kSuite);
  CHECK(r.rc == 2);
  CHECK(contains(r.err, "--output: cannot write '/nonexistent-dir/r.html'"));
  r = run_cli({"report", "--demo", "atlantis", "-o", out_path("a.html").string()}, kSuite);
  CHECK(r.rc == 2);
  CHECK(contains(r.err, "'atlantis' is not a demo"));
}

TEST_CASE("the Markdown the report formatters write becomes escaped HTML") {
  const std::string html = report::markdown_to_html(
      "# Title <x>\n\nA paragraph with **bold** & more\nand a second line.\n\n"
      "- one\n  - one.a\n  - one.b\n- two\n\n"
      "1. first\n2. second\n\n"
      "| name | h |\n|:---|---:|\n| a \\| b | 12 |\n| c | 3 |\n");
  CHECK(contains(html, "<h1>Title &lt;x&gt;</h1>"));
  CHECK(contains(html,
                 "<p>A paragraph with <strong>bold</strong> &amp; more and a second line.</p>"));
  CHECK(contains(
      html,
      "<ul>\n<li>one\n<ul>\n<li>one.a</li>\n<li>one.b</li>\n</ul>\n</li>\n<li>two</li>\n</ul>"));
  CHECK(contains(html, "<ol>\n<li>first</li>\n<li>second</li>\n</ol>"));
  CHECK(contains(html, "<thead><tr><th>name</th><th class=\"r\">h</th></tr></thead>"));
  CHECK(contains(html, "<tr><td>a | b</td><td class=\"r\">12</td></tr>"));
  // It is well-formed on its own.
  const auto file = out_path("fragment.xml");
  std::ofstream(file) << "<div>" << html << "</div>";
  CHECK(well_formed_xml(file));
  CHECK(report::html_escape("<a href='x'>&\"") == "&lt;a href=&#39;x&#39;&gt;&amp;&quot;");
}
