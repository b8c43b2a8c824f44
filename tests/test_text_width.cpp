// Text output fits a 100-column terminal by default: tables stacked into parts that repeat
// their key columns, prose wrapped with its indent; --wide gives the full width back. The
// layout of report::Table and report::fit_lines, then every command's default text output on
// the demos and on real weather (tests/data/greensboro-nc-tmy3.csv, NREL TMY3; SOURCES.md).
#include <limitline/report/table.hpp>

#include "support/cli.hpp"

#include <algorithm>
#include <sstream>

using namespace limitline;
using limitline::test::contains;
using limitline::test::run_cli;

namespace {

std::size_t widest(const std::string& text) {
  std::istringstream in(text);
  std::size_t w = 0;
  for (std::string line; std::getline(in, line);) w = std::max(w, report::display_width(line));
  return w;
}

report::Table wide_table() {
  report::Table t({{"#", report::Align::right, true},
                   {"strategy", report::Align::left, true},
                   {"shortfall", report::Align::right},
                   {"savings", report::Align::right},
                   {"economizing h", report::Align::right, false, 1},
                   {"free-cooling h", report::Align::right, false, 1},
                   {"cooling ton-h", report::Align::right, false, 1},
                   {"heating kBtu", report::Align::right, false, 1}});
  t.add_row({"1", "differential enthalpy + dry-bulb", "0.03", "1246.07", "2046", "1206", "25767",
             "3120"});
  t.add_rule();
  t.add_row({"ref", "perfect-changeover", "0.00", "1246.10", "2052", "1206", "25767", "3100"});
  return t;
}

}  // namespace

TEST_CASE("a table too wide for its width is stacked by group, the keys repeated") {
  const report::Table t = wide_table();
  const std::string full = t.text(report::kUnlimitedWidth);
  CHECK(widest(full) > 60);
  CHECK(std::count(full.begin(), full.end(), '\n') == 5);  // header, rule, row, rule, row
  const std::string fitted = t.text(60);
  CHECK(widest(fitted) <= 60);
  // Group 0 first with the keys, then group 1 with the keys again.
  const auto first = fitted.find("shortfall"), second = fitted.find("economizing h");
  REQUIRE(first != std::string::npos);
  REQUIRE(second != std::string::npos);
  CHECK(first < second);
  CHECK(std::count(fitted.begin(), fitted.end(), '#') >= 2);
  std::size_t names = 0;
  for (auto at = fitted.find("perfect-changeover"); at != std::string::npos;
       at = fitted.find("perfect-changeover", at + 1))
    ++names;
  CHECK(names >= 2);
  // Every cell is still there.
  for (const std::string cell : {"0.03", "1246.07", "2046", "25767", "3120", "3100"})
    CHECK_MESSAGE(contains(fitted, cell), cell);
  // Parts are what a page folds: one table per group, each with the keys.
  const auto parts = t.parts();
  REQUIRE(parts.size() == 2);
  CHECK(contains(parts[0].markdown(), "| shortfall |"));
  CHECK(contains(parts[1].markdown(), "| strategy |"));
  CHECK_FALSE(contains(parts[1].markdown(), "shortfall"));
}

TEST_CASE("keys too wide are cut in the middle, in text only") {
  report::Table t({{"weather file", report::Align::left, true}, {"h", report::Align::right}});
  const std::string path = "/a/very/long/folder/of/weather/files/for/a/study/a-greensboro.csv";
  t.add_row({path, "3614"});
  const std::string fitted = t.text(40);
  CHECK(widest(fitted) <= 40);
  CHECK(contains(fitted, "…"));
  CHECK(contains(fitted, "/a/very"));   // the start of a name
  CHECK(contains(fitted, "boro.csv"));  // and the end of a file name are kept
  CHECK(contains(t.csv(), path));
  CHECK(contains(t.markdown(), path));
}

TEST_CASE("prose lines wrap at the width with their indent; table rows are left alone") {
  const std::string text =
      "Air handler: part load: variable airflow (floor 30%) following the space sensible load; "
      "space 75 °F, return air 1.0 °F above it\n"
      "  - differential enthalpy + dry-bulb: 0 harmful hours (economizing when it should not) "
      "cost 0.00 USD; 6 missed hours\n"
      "  1  fixed dry-bulb 65F        102.23     3    273    1143.87  complies  and more cells\n";
  const std::string out = report::fit_lines(text, 60);
  std::istringstream in(out);
  std::vector<std::string> lines;
  for (std::string l; std::getline(in, l);) lines.push_back(l);
  REQUIRE(lines.size() >= 5);
  CHECK(lines[0].starts_with("Air handler:"));
  CHECK(report::display_width(lines[0]) <= 60);
  CHECK_FALSE(lines[1].starts_with(" "));  // no indent to keep
  std::size_t bullet = 0;
  while (bullet < lines.size() && !lines[bullet].starts_with("  - ")) ++bullet;
  REQUIRE(bullet + 1 < lines.size());
  CHECK(lines[bullet + 1].starts_with("    "));                // hangs under the bullet's text
  CHECK(lines.back().starts_with("  1  fixed dry-bulb 65F"));  // the table row stays whole
  // Nothing lost: the words are the same.
  auto words = [](const std::string& s) {
    std::istringstream w(s);
    std::vector<std::string> v;
    for (std::string x; w >> x;) v.push_back(x);
    return v;
  };
  CHECK(words(out) == words(text));
}

TEST_CASE("every command's default text output fits 100 columns; --wide gives it back") {
  const std::string greensboro = std::string(LIMITLINE_TEST_DATA_DIR) + "/greensboro-nc-tmy3.csv";
  const std::string src = LIMITLINE_SOURCE_DIR;
  const std::vector<std::vector<std::string>> commands = {
      {"year"},
      {"year", "--units", "si"},
      {"year", "--demo", "mesa-alta"},
      {"year", src + "/examples/office-humid-coast.toml", "--weather", greensboro},
      {"tune"},
      {"check", src + "/examples/office-humid-coast.toml", "--outdoor", "72F/90%"},
      {"code", src + "/examples/office-humid-coast.toml"},
      {"code", "--edition", "ashrae-90.1-2019", "--zone", "4A"},
      {"audit", src + "/examples/audit-office.toml", src + "/examples/trend-office.csv"},
      {"sensors", "--trials", "20"},
  };
  for (const auto& args : commands) {
    std::string name;
    for (const auto& a : args) name += a + " ";
    CAPTURE(name);
    const auto r = run_cli(args, "text_width");
    REQUIRE(r.rc == 0);
    CHECK(widest(r.out) <= report::kTextWidth);
    auto wide_args = args;
    wide_args.push_back("--wide");
    const auto w = run_cli(wide_args, "text_width");
    REQUIRE(w.rc == 0);
    if (args.front() == "year") CHECK(widest(w.out) > report::kTextWidth);
  }
}
