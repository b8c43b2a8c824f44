// Weather behaviour end to end: a user's weather file with the embedded demo unit, columns in
// the wrong unit, the bad-row share, whole-degree files, site-weather pressure and files that
// span several years. Weather: tests/data/greensboro-nc-tmy3.csv and pvgis-tmy-45n-8e.csv
// (open data sets, see tests/data/SOURCES.md) and versions of them derived here; the unit
// files are invented scenarios of the test.
#include "support/cli.hpp"
#include "support/derived_weather.hpp"

#include <fmt/format.h>

#include <cmath>
#include <fstream>
#include <functional>
#include <sstream>

using limitline::test::contains;
using limitline::test::run_cli;
using limitline::test::scratch_dir;
using limitline::test::slurp;

namespace {

const std::string kSuite = "weather_cli";

std::string data(const std::string& f) { return std::string(LIMITLINE_TEST_DATA_DIR) + "/" + f; }

std::filesystem::path write_file(const std::string& name, const std::string& text) {
  const auto p = scratch_dir(kSuite) / name;
  std::ofstream(p, std::ios::binary) << text;
  return p;
}

std::filesystem::path write_unit(const std::string& name, const std::string& elevation,
                                 const std::string& extra = "") {
  return write_file(name, fmt::format(R"([site]
name = "weather test"
elevation = "{}"
energy_code = "ashrae-90.1-2019"
climate_zone = "4A"
[air_handler]
supply_airflow = "6000cfm"
supply_air_temp = "55F"
fan_heat = "1F"
min_outdoor_air = "30%"
return_air_temp = "75F"
return_air_rh = "50%"
)",
                                      elevation) +
                              extra);
}

// Greensboro (line 2 its header) with `edit` applied to the fields of each data row.
std::string greensboro_with(const std::function<void(std::vector<std::string>&)>& edit) {
  return limitline::test::edited_csv(data("greensboro-nc-tmy3.csv"), 2, edit);
}

}  // namespace

TEST_CASE("with no unit file every weather command reads a user's file by its own header") {
  const auto svg = scratch_dir(kSuite) / "chart.svg";
  const auto html = scratch_dir(kSuite) / "report.html";
  for (const char* file : {"greensboro-nc-tmy3.csv", "pvgis-tmy-45n-8e.csv"}) {
    CAPTURE(file);
    const std::string w = data(file);
    // The columns each file names: Greensboro TMY3 'Dry-bulb (C)', PVGIS 'T2m' (SOURCES.md).
    const std::string dry = contains(file, "greensboro") ? "'Dry-bulb (C)'" : "'T2m'";
    const auto year = run_cli({"year", "--weather", w}, kSuite);
    CHECK(year.rc == 0);
    CHECK(contains(year.out, "embedded invented demo unit"));
    CHECK(contains(year.out, "dry-bulb: column " + dry));
    CHECK(contains(year.out, "Recommended, the best the code allows"));
    CHECK_FALSE(contains(year.err, "error"));
    const auto chart = run_cli({"chart", "--weather", w, "-o", svg.string()}, kSuite);
    CHECK(chart.rc == 0);
    CHECK(contains(slurp(svg), "<svg"));
    const auto report = run_cli({"report", "--weather", w, "-o", html.string()}, kSuite);
    CHECK(report.rc == 0);
    CHECK(contains(slurp(html), dry.substr(1, dry.size() - 2)));
    const auto sensors = run_cli({"sensors", "--weather", w, "--trials", "20"}, kSuite);
    CHECK(sensors.rc == 0);
    CHECK(contains(sensors.out, "20"));
    const auto sequence = run_cli({"sequence", "--weather", w}, kSuite);
    CHECK(sequence.rc == 0);
    CHECK(contains(sequence.out, file));
  }
  // The user's own options still apply on top of the file's header.
  const auto rh = run_cli({"year", "--weather", data("greensboro-nc-tmy3.csv"), "--humidity",
                           "relative-humidity", "--column", "time=Time (HH:MM)"},
                          kSuite);
  CHECK(rh.rc == 0);
  CHECK(contains(rh.out, "humidity: relative humidity, column 'RHum (%)'"));
  // The whole header is the column: split at its colon it would name 'Time (HH' in unit 'MM)'.
  CHECK(contains(rh.out, "time: 'Date (MM/DD/YYYY)' + 'Time (HH:MM)'"));
}

TEST_CASE("a °F column under a (C) header is refused with the unit fix, never skip") {
  const auto unit = write_unit("labels.toml", "900ft");
  const auto file =
      write_file("fahrenheit.csv", greensboro_with([](std::vector<std::string>& f) {
                   f[2] = fmt::format("{:.1f}", std::stod(f[2]) * 1.8 + 32.0);  // °F = 1.8·°C + 32
                   f[3] = fmt::format("{:.1f}", std::stod(f[3]) * 1.8 + 32.0);
                 }));
  for (const char* policy : {"error", "skip", "fill"}) {
    CAPTURE(policy);
    const auto r = run_cli(
        {"year", unit.string(), "--weather", file.string(), "--on-bad-row", policy}, kSuite);
    CHECK(r.rc == 2);
    CHECK(contains(r.err, "column 'Dry-bulb (C)' contradicts its unit °C"));
    CHECK(contains(r.err, "median is 60.1 °C"));
    CHECK(contains(r.err, "unit = \"F\""));
    CHECK(contains(r.err, "--column 'dry_bulb=Dry-bulb (C):F'"));
    CHECK_FALSE(contains(r.err, "skip"));
    CHECK(r.out.empty());
  }
  // The fix the message gives, as given.
  const auto fixed = run_cli({"year", unit.string(), "--weather", file.string(), "--column",
                              "dry_bulb=Dry-bulb (C):F", "--column", "dew_point=Dew-point (C):F"},
                             kSuite);
  CHECK(fixed.rc == 0);
  CHECK(contains(fixed.out, "dry-bulb: column 'Dry-bulb (C)', °F"));
}

TEST_CASE("--max-bad-share: skip refuses beyond 1 % of rows unless the share is raised") {
  const auto unit = write_unit("share.toml", "900ft");
  int row = 0;
  const auto file = write_file("gaps.csv", greensboro_with([&](std::vector<std::string>& f) {
                                 if (row++ % 50 == 7)
                                   f[3] = "";  // 176 of 8760 rows (2.0 %) without a dew point
                               }));
  const auto refused =
      run_cli({"year", unit.string(), "--weather", file.string(), "--on-bad-row", "skip"}, kSuite);
  CHECK(refused.rc == 2);
  CHECK(contains(refused.err, "176 of 8760 rows (2 %)"));
  CHECK(contains(refused.err, "allowed: at most 1 %"));
  CHECK(contains(refused.err, "--max-bad-share 2.1%"));
  const auto raised = run_cli({"year", unit.string(), "--weather", file.string(), "--on-bad-row",
                               "skip", "--max-bad-share", "3%"},
                              kSuite);
  CHECK(raised.rc == 0);
  CHECK(contains(raised.out, "bad rows skipped: 176"));
  const auto in_file = write_unit("share-file.toml", "900ft",
                                  "[weather]\non_bad_row = \"fill\"\nmax_bad_share = \"2.5%\"\n");
  const auto filled = run_cli({"year", in_file.string(), "--weather", file.string()}, kSuite);
  CHECK(filled.rc == 0);
  CHECK(contains(filled.out, "bad rows filled by interpolation: 176"));
  const auto bad = run_cli({"year", unit.string(), "--weather", file.string(), "--on-bad-row",
                            "skip", "--max-bad-share", "150%"},
                           kSuite);
  CHECK(bad.rc == 2);
  CHECK(contains(bad.err, "--max-bad-share: '150%' is not a share of rows"));
}

TEST_CASE("whole-degree weather reads, its saturated rows counted in the report") {
  const auto unit = write_unit("whole.toml", "900ft");
  int above = 0;
  // Dry-bulb cut to whole °C (a logger dropping decimals), dew point rounded to nearest.
  const auto file = write_file("whole.csv", greensboro_with([&](std::vector<std::string>& f) {
                                 const double t = std::floor(std::stod(f[2])),
                                              d = std::round(std::stod(f[3]));
                                 above += d > t;
                                 f[2] = fmt::format("{:.0f}", t);
                                 f[3] = fmt::format("{:.0f}", d);
                               }));
  REQUIRE(above > 50);
  const auto r = run_cli({"year", unit.string(), "--weather", file.string()}, kSuite);
  CHECK(r.rc == 0);
  CHECK(contains(r.out, fmt::format("{} rows read as saturated: whole-degree rounding", above)));
}

TEST_CASE("site and weather pressure: Greensboro under a unit at 20 ft warns, at 900 ft not") {
  // Greensboro station: 273 m (SOURCES.md), pressures near 987 mbar in the file.
  const auto low = write_unit("p20.toml", "20ft");
  const auto high = write_unit("p900.toml", "900ft");
  const std::string w = data("greensboro-nc-tmy3.csv");
  const auto warned = run_cli({"year", low.string(), "--weather", w}, kSuite);
  CHECK(warned.rc == 0);
  CHECK(contains(warned.err, "warning: "));
  // In the unit file's own system (IP here): 2 kPa is 0.29 psia, 200 m is 656 ft.
  CHECK(contains(
      warned.err,
      "p20.toml:3: site.elevation: elevation 20 ft gives a standard pressure of 14.69 psia"));
  CHECK(contains(warned.err, "more than the 0.29 psia (about 656 ft) tolerance"));
  CHECK(contains(warned.out, "Warning: "));
  const auto strict = run_cli({"year", low.string(), "--weather", w, "--strict"}, kSuite);
  CHECK(strict.rc == 2);
  const auto quiet = run_cli({"year", high.string(), "--weather", w}, kSuite);
  CHECK(quiet.rc == 0);
  CHECK_FALSE(contains(quiet.err, "warning"));
  CHECK_FALSE(contains(quiet.out, "Warning: "));

  // `code` with a unit whose [weather] file has a pressure column.
  std::filesystem::copy_file(w, scratch_dir(kSuite) / "site.csv",
                             std::filesystem::copy_options::overwrite_existing);
  const auto coded = write_unit("code20.toml", "20ft", "[weather]\nfile = \"site.csv\"\n");
  const auto code = run_cli({"code", coded.string(), "--wide"}, kSuite);  // sentences read whole
  CHECK(code.rc == 0);
  CHECK(contains(code.out, "Weather pressure"));
  CHECK(contains(code.out, "the altitude footnote used 14.69 psia (from the unit's [site])"));
  CHECK(contains(code.out, "median station pressure of 14.32 psia"));
  CHECK(contains(code.err, "code20.toml:3: site.elevation"));
  const auto coded_high = write_unit("code900.toml", "900ft", "[weather]\nfile = \"site.csv\"\n");
  const auto code_high = run_cli({"code", coded_high.string()}, kSuite);
  CHECK(code_high.rc == 0);
  CHECK(contains(code_high.out, "the altitude footnote used 14.22 psia"));
  CHECK(code_high.err.empty());
}

TEST_CASE("a weather file spanning ten years is refused with the span named") {
  const auto unit = write_unit("years.toml", "900ft");
  std::string text = "Timestamp,Temp (C),RH (%)\n";
  constexpr int kDays[] = {31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31};
  for (int y = 2001; y <= 2010; ++y)
    for (int m = 1; m <= 12; ++m)
      for (int d = 1; d <= kDays[m - 1] + (m == 2 && y % 4 == 0); ++d)
        for (int h = 0; h < 24; ++h)
          text += fmt::format("{}-{:02}-{:02}T{:02}:00,15,50\n", y, m, d, h);
  const auto file = write_file("ten-years.csv", text);
  const auto r = run_cli({"year", unit.string(), "--weather", file.string()}, kSuite);
  CHECK(r.rc == 2);
  CHECK(contains(r.err, "spans 2001-01-01 to 2010-12-31, 10 years; evaluate one year at a time"));
  CHECK(r.out.empty());
}

TEST_CASE("a weather file with CR-only line ends gives the same year as with LF") {
  const auto unit = write_unit("cr.toml", "900ft");
  std::string cr = slurp(data("greensboro-nc-tmy3.csv"));
  for (char& c : cr)
    if (c == '\n') c = '\r';
  const auto file = write_file("greensboro-nc-tmy3.csv", cr);
  const auto a = run_cli(
      {"year", unit.string(), "--weather", data("greensboro-nc-tmy3.csv"), "--format", "json"},
      kSuite);
  const auto b =
      run_cli({"year", unit.string(), "--weather", file.string(), "--format", "json"}, kSuite);
  CHECK(a.rc == 0);
  CHECK(b.rc == 0);
  const auto results = [](const std::string& json) {
    return json.substr(json.find("\"results\""));
  };
  CHECK(results(a.out) == results(b.out));
}

TEST_CASE("RH 0 % in a weather row names file, line and column; skip applies") {
  const auto unit = write_unit("rh0.toml", "900ft");
  int row = 0;
  const auto file = write_file("rh0.csv", greensboro_with([&](std::vector<std::string>& f) {
                                 if (row++ == 100) f[4] = "0";
                               }));
  const std::vector<std::string> rh = {"--humidity", "relative-humidity"};
  auto args = std::vector<std::string>{"year", unit.string(), "--weather", file.string()};
  args.insert(args.end(), rh.begin(), rh.end());
  const auto r = run_cli(args, kSuite);
  CHECK(r.rc == 2);
  CHECK(contains(r.err, "rh0.csv:103: column 'RHum (%)' value '0' is 0 % relative humidity"));
  args.insert(args.end(), {"--on-bad-row", "skip"});
  const auto skipped = run_cli(args, kSuite);
  CHECK(skipped.rc == 0);
  CHECK(contains(skipped.out, "bad rows skipped: 1"));
}
