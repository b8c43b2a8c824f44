// `limitline tune` end to end: the demo, the best setting against every grid point of the CSV,
// the code's setting and its verdict, the plots, batch mode and bad input.
// Weather: tests/data/greensboro-nc-tmy3.csv and pvgis-tmy-45n-8e.csv (open data sets, see
// tests/data/SOURCES.md). The unit files are invented scenarios of the test.
#include "support/cli.hpp"
#include "support/svg.hpp"

#include <fstream>
#include <map>
#include <sstream>

using limitline::test::contains;
using limitline::test::run_cli;
using limitline::test::scratch_dir;
using limitline::test::slurp;

namespace {

constexpr const char* kSuite = "tune_cli";

std::filesystem::path write_unit(const std::string& name, const std::string& extra = "") {
  const auto p = scratch_dir(kSuite) / name;
  std::ofstream(p) << R"([site]
name = "test office"
elevation = "900ft"
[air_handler]
supply_airflow = "10000cfm"
supply_air_temp = "55F"
fan_heat = "1.5F"
min_outdoor_air = "20%"
return_air_temp = "75F"
return_air_rh = "50%"
[schedule]
mon-fri = "06:00-19:00"
)" << extra;
  return p;
}

std::string data(const std::string& f) { return std::string(LIMITLINE_TEST_DATA_DIR) + "/" + f; }

std::vector<std::string> split(const std::string& line) {
  std::vector<std::string> out;
  std::stringstream ss(line);
  std::string cell;
  while (std::getline(ss, cell, ',')) out.push_back(cell);
  return out;
}

}  // namespace

TEST_CASE("with no arguments tune runs the embedded demo and ends with the cautions") {
  const auto r = run_cli({"tune"}, kSuite);
  REQUIRE(r.rc == 0);
  CHECK(contains(r.out, "best:"));
  CHECK(contains(r.out, "within 1% of the best savings"));
  CHECK(contains(r.out, "Recommendation:"));
  CHECK(contains(r.out, "authority having jurisdiction"));
  limitline::test::check_no_nan(r);
}

TEST_CASE("the best setting of each strategy is the least shortfall of its grid in the CSV") {
  const auto unit = write_unit("csv.toml");
  const auto r = run_cli(
      {"tune", unit.string(), "--weather", data("greensboro-nc-tmy3.csv"), "--format", "csv"},
      kSuite);
  REQUIRE(r.rc == 0);
  std::stringstream in(r.out);
  std::string line;
  std::getline(in, line);
  const auto head = split(line);
  REQUIRE(head.size() > 9);
  CHECK(head[8] == "shortfall_vs_perfect_kwh");
  std::map<std::string, double> least, best;
  std::map<std::string, int> grid_rows;
  while (std::getline(in, line)) {
    const auto c = split(line);
    REQUIRE(c.size() >= 9);
    if (!c[1].starts_with("grid")) continue;
    const double v = std::stod(c[8]);
    ++grid_rows[c[0]];
    if (!least.count(c[0]) || v < least[c[0]]) least[c[0]] = v;
    if (c[1] == "grid (best)") best[c[0]] = v;
  }
  CHECK(least.size() == 7);  // every preset
  for (const auto& [name, v] : least) {
    CAPTURE(name);
    REQUIRE(best.count(name));
    CHECK(best[name] == v);
    CHECK((grid_rows[name] == 41 || grid_rows[name] == 21 * 11));
  }
}

TEST_CASE("with a code in [site] the code's setting is evaluated and judged") {
  // ANSI/ASHRAE/IES 90.1-2019, zone 4A: fixed dry-bulb at 65 °F (the shipped table, from
  // memory; see data/codes).
  const auto unit = write_unit("code.toml", R"([[strategy]]
name = "dry-bulb 70F"
preset = "fixed-dry-bulb"
dry_bulb_limit = "70F"
)");
  std::string text = slurp(unit);
  text.replace(text.find("elevation"), 0,
               "energy_code = \"ashrae-90.1-2019\"\nclimate_zone = \"4A\"\n");
  std::ofstream(unit) << text;
  const auto r =
      run_cli({"tune", unit.string(), "--weather", data("greensboro-nc-tmy3.csv")}, kSuite);
  REQUIRE(r.rc == 0);
  CHECK(contains(r.out, "at the code setting (65.0 °F)"));
  CHECK(contains(r.out, "(complies)"));
  CHECK(contains(r.out, "at the unit file setting (70.0 °F)"));
  CHECK(contains(r.out, "(set-wrong)"));
  CHECK(contains(r.out, "Recommended, the best the code allows: dry-bulb 70F at "));
}

TEST_CASE("--plots writes one standalone SVG per strategy") {
  const auto dir = scratch_dir(kSuite) / "plots";
  std::filesystem::remove_all(dir);
  const auto r = run_cli({"tune", "--plots", dir.string()}, kSuite);
  REQUIRE(r.rc == 0);
  std::size_t n = 0;
  for (const auto& e : std::filesystem::directory_iterator(dir)) {
    ++n;
    const std::string svg = slurp(e.path());
    limitline::test::svg::check_standalone(svg);
    CHECK(contains(svg, "within 1%"));
    limitline::test::svg::check_svg_renders(svg, kSuite, e.path().stem().string());
  }
  CHECK(n == 6);  // the harbourside demo's six strategies
}

TEST_CASE("--batch tunes every weather file and lists the one it cannot read") {
  const auto dir = scratch_dir(kSuite) / "sites";
  std::filesystem::remove_all(dir);
  std::filesystem::create_directories(dir);
  std::filesystem::copy_file(data("greensboro-nc-tmy3.csv"), dir / "a-greensboro.csv");
  std::filesystem::copy_file(data("pvgis-tmy-45n-8e.csv"), dir / "b-pvgis.csv");
  std::ofstream(dir / "c-broken.csv") << "not,a,weather,file\n1,2,3,4\n";
  const auto unit = write_unit("batch.toml");
  const auto r = run_cli({"tune", unit.string(), "--batch", dir.string(), "--wide"}, kSuite);
  CHECK(r.rc == 2);
  CHECK(contains(r.out, "a-greensboro.csv"));
  CHECK(contains(r.out, "b-pvgis.csv"));
  CHECK(contains(r.out, "Sites that could not be tuned"));
  CHECK(contains(r.out, "c-broken.csv"));
}

TEST_CASE("bad input gets one line and exit code 2") {
  const auto file = scratch_dir(kSuite) / "a-file";
  std::ofstream(file) << "x";
  const auto r = run_cli({"tune", "--plots", file.string()}, kSuite);
  CHECK(r.rc == 2);
  CHECK(contains(r.err, "--plots"));
  CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
}
