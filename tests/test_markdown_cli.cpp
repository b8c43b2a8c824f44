// Names from the user's files (site, strategy, unit and weather file names) never become
// markup: the Markdown outputs escape raw HTML and table pipes, the HTML report escapes every
// character. The unit is the shared invented office (tests/support/office.hpp) renamed; the
// weather is tests/data/greensboro-nc-tmy3.csv (open data set, see tests/data/SOURCES.md).
#include "support/cli.hpp"
#include "support/office.hpp"

#include <limitline/report/html.hpp>
#include <limitline/report/table.hpp>

#include <fstream>

using limitline::test::contains;
using limitline::test::run_cli;
using limitline::test::scratch_dir;
using limitline::test::slurp;

namespace {

const std::string kSuite = "markdown_cli";
const std::string kSite = "<script>alert(1)</script> | North & South";
const std::string kStrategy = "<img src=x onerror=alert(2)> | lab *65F*";

// The shared invented office unit, renamed, with one strategy of a hostile name.
std::filesystem::path hostile_unit() {
  const auto p = scratch_dir(kSuite) / "hostile.toml";
  std::string unit = limitline::test::kOfficeUnit;
  const std::string name = "name = \"test office (invented)\"";
  REQUIRE(unit.find(name) != std::string::npos);
  unit.replace(unit.find(name), name.size(), "name = \"" + kSite + "\"");
  std::ofstream(p) << unit << R"(
[[strategy]]
name = ")" << kStrategy
                   << R"("
preset = "fixed-dry-bulb"
dry_bulb_limit = "65F"
)";
  return p;
}

std::string data(const std::string& f) { return std::string(LIMITLINE_TEST_DATA_DIR) + "/" + f; }

// Whether `md` holds `tag` as markup: not preceded by the backslash that makes it text.
bool raw(const std::string& md, const std::string& tag) {
  for (auto at = md.find(tag); at != std::string::npos; at = md.find(tag, at + 1))
    if (at == 0 || md[at - 1] != '\\') return true;
  return false;
}

// Every table row of a Markdown text has as many unescaped pipes as its header.
void check_tables_intact(const std::string& md) {
  std::istringstream in(md);
  std::size_t columns = 0;
  for (std::string line; std::getline(in, line);) {
    if (!line.starts_with("|")) {
      columns = 0;
      continue;
    }
    std::size_t pipes = 0;
    for (std::size_t i = 0; i < line.size(); ++i) {
      if (line[i] == '\\')
        ++i;
      else if (line[i] == '|')
        ++pipes;
    }
    if (columns == 0) columns = pipes;
    CAPTURE(line);
    CHECK(pipes == columns);
  }
}

}  // namespace

TEST_CASE("markdown_escape makes names literal text") {
  using limitline::report::markdown_escape;
  CHECK(markdown_escape("<b>") == "\\<b>");
  CHECK(markdown_escape("a|b") == "a\\|b");
  CHECK(markdown_escape("R&D *1*") == "R\\&D \\*1\\*");
  CHECK(markdown_escape("two\nlines") == "two lines");
  CHECK(markdown_escape("dry-bulb 65F (1.0)") == "dry-bulb 65F (1.0)");
  // The report's own converter reads the escapes back as the characters themselves.
  CHECK(limitline::report::markdown_to_html(markdown_escape("<b>x</b> & **y**")) ==
        "<p>&lt;b&gt;x&lt;/b&gt; &amp; **y**</p>\n");
}

TEST_CASE("year --format md and report --format md carry no raw HTML from names") {
  const auto unit = hostile_unit();
  const auto year = run_cli(
      {"year", unit.string(), "--weather", data("greensboro-nc-tmy3.csv"), "--format", "md"},
      kSuite);
  REQUIRE(year.rc == 0);
  const auto md_path = scratch_dir(kSuite) / "study.md";
  const auto report = run_cli({"report", unit.string(), "--weather", data("greensboro-nc-tmy3.csv"),
                               "--format", "md", "-o", md_path.string()},
                              kSuite);
  REQUIRE(report.rc == 0);
  for (const std::string& md : {year.out, slurp(md_path)}) {
    CHECK_FALSE(raw(md, "<script"));
    CHECK_FALSE(raw(md, "</script"));
    CHECK_FALSE(raw(md, "<img"));
    CHECK(contains(md, "\\<script>"));
    CHECK(contains(md, "North \\& South"));
    check_tables_intact(md);
  }
}

TEST_CASE("the HTML report escapes the same names") {
  const auto unit = hostile_unit();
  const auto html_path = scratch_dir(kSuite) / "study.html";
  const auto r = run_cli({"report", unit.string(), "--weather", data("greensboro-nc-tmy3.csv"),
                          "-o", html_path.string()},
                         kSuite);
  REQUIRE(r.rc == 0);
  const std::string html = slurp(html_path);
  CHECK_FALSE(contains(html, "<script"));
  CHECK_FALSE(contains(html, "<img"));
  CHECK(contains(html, "&lt;script&gt;alert(1)&lt;/script&gt; | North &amp; South"));
  CHECK(contains(html, "&lt;img src=x onerror=alert(2)&gt; | lab *65F*"));
  CHECK_FALSE(contains(html, "\\&lt;"));  // no Markdown escape shows through
}
