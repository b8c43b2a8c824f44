// `limitline year` end to end: demo, formats, hourly file, batch mode and bad input.
// Weather: tests/data/greensboro-nc-tmy3.csv and pvgis-tmy-45n-8e.csv (open data sets, see
// tests/data/SOURCES.md). The unit files are invented scenarios of the test.
#include "support/cli.hpp"

#include <fcntl.h>
#include <signal.h>
#include <sys/stat.h>
#include <unistd.h>

#include <algorithm>
#include <fstream>
#include <sstream>

using limitline::test::contains;
using limitline::test::run_cli;
using limitline::test::scratch_dir;
using limitline::test::slurp;

namespace {

std::filesystem::path write_unit(const std::string& name, const std::string& extra = "") {
  const auto p = scratch_dir("year_cli") / name;
  std::ofstream(p) << R"([site]
name = "test school"
elevation = "900ft"
[air_handler]
supply_airflow = "6000cfm"
supply_air_temp = "55F"
fan_heat = "1F"
min_outdoor_air = "30%"
return_air_temp = "75F"
return_air_rh = "50%"
)" << extra;
  return p;
}

std::string data(const std::string& f) { return std::string(LIMITLINE_TEST_DATA_DIR) + "/" + f; }

}  // namespace

TEST_CASE("with no arguments year runs the embedded demo and ends with the cautions") {
  const auto r = run_cli({"year"}, "year_cli");
  CHECK(r.rc == 0);
  CHECK(contains(r.out, "embedded invented demo"));
  CHECK(contains(r.out, "perfect-changeover"));
  CHECK(contains(r.out, "Recommended, the best the code allows"));
  CHECK(contains(r.out, "authority having jurisdiction"));
}

TEST_CASE("json carries the results keyed by strategy name, references included") {
  const auto unit = write_unit("json.toml");
  const auto r = run_cli(
      {"year", unit.string(), "--weather", data("greensboro-nc-tmy3.csv"), "--format", "json"},
      "year_cli");
  REQUIRE(r.rc == 0);
  for (const char* key : {"\"results\"",
                          "\"no-economizer\"",
                          "\"perfect-changeover\"",
                          "\"optimal-damper\"",
                          "\"differential-enthalpy\"",
                          "\"hours_enabled\"",
                          "\"hours_economizing\"",
                          "\"hours_free_cooling\"",
                          "\"hours_integrated\"",
                          "\"cooling_kwh\"",
                          "\"latent_kwh\"",
                          "\"heating_kwh\"",
                          "\"harmful_hours\"",
                          "\"harmful_kwh\"",
                          "\"missed_hours\"",
                          "\"missed_kwh\"",
                          "\"savings_vs_no_economizer_kwh\"",
                          "\"shortfall_vs_perfect_kwh\"",
                          "\"cooling_ton_hours\"",
                          "\"cooling_kbtu\"",
                          "\"monthly\"",
                          "\"cautions\""})
    CHECK_MESSAGE(contains(r.out, key), key);
}

TEST_CASE("the weather mapping is printed at the top of the report") {
  const auto unit = write_unit("map.toml");
  const auto r =
      run_cli({"year", unit.string(), "--weather", data("pvgis-tmy-45n-8e.csv"), "--units", "si"},
              "year_cli");
  REQUIRE(r.rc == 0);
  // PVGIS layout (pvlib test data): T2m °C, RH %, SP Pa.
  CHECK(contains(r.out, "'T2m'"));
  CHECK(contains(r.out, "'SP'"));
  CHECK(contains(r.out, "kWh"));
}

TEST_CASE("--hourly writes one row per weather hour with every strategy's decision") {
  const auto unit = write_unit("hourly.toml");
  const auto out = scratch_dir("year_cli") / "hours.csv";
  const auto r = run_cli({"year", unit.string(), "--weather", data("greensboro-nc-tmy3.csv"),
                          "--hourly", out.string()},
                         "year_cli");
  REQUIRE(r.rc == 0);
  const std::string csv = slurp(out);
  std::size_t lines = 0;
  for (char c : csv) lines += c == '\n';
  CHECK(lines == 8761);
  CHECK(contains(csv.substr(0, csv.find('\n')), "differential-dry-bulb:verdict"));
  CHECK(contains(csv, ",harmful"));
}

TEST_CASE("--batch evaluates every weather file of a folder, in name order") {
  const auto unit = write_unit("batch.toml");
  const auto dir = scratch_dir("year_cli") / "sites";
  std::filesystem::create_directories(dir);
  std::filesystem::copy_file(data("greensboro-nc-tmy3.csv"), dir / "a-greensboro.csv",
                             std::filesystem::copy_options::overwrite_existing);
  std::filesystem::copy_file(data("pvgis-tmy-45n-8e.csv"), dir / "b-piedmont.csv",
                             std::filesystem::copy_options::overwrite_existing);
  const auto r =
      run_cli({"year", unit.string(), "--batch", dir.string(), "--format", "csv"}, "year_cli");
  REQUIRE(r.rc == 0);
  const auto a = r.out.find("a-greensboro.csv");
  const auto b = r.out.find("b-piedmont.csv");
  CHECK(a != std::string::npos);
  CHECK(b != std::string::npos);
  CHECK(a < b);
  // A bad file is reported by name and the run exits 2, the other sites still reported.
  std::ofstream(dir / "c-broken.csv") << "not,a,weather,file\n1,2,3,4\n";
  const auto bad = run_cli({"year", unit.string(), "--batch", dir.string(), "--wide"}, "year_cli");
  CHECK(bad.rc == 2);
  CHECK(contains(bad.out, "c-broken.csv"));
  CHECK(contains(bad.out, "a-greensboro.csv"));
  std::filesystem::remove(dir / "c-broken.csv");
}

TEST_CASE("bad input gets one line naming the problem and exit code 2") {
  const auto unit = write_unit("bad.toml");
  SUBCASE("missing weather file") {
    const auto r = run_cli({"year", unit.string(), "--weather", "/nonexistent/w.csv"}, "year_cli");
    CHECK(r.rc == 2);
    CHECK(contains(r.err, "/nonexistent/w.csv"));
  }
  SUBCASE("no weather at all") {
    const auto r = run_cli({"year", unit.string()}, "year_cli");
    CHECK(r.rc == 2);
    CHECK(contains(r.err, "--weather"));
  }
  SUBCASE("unknown demo") {
    const auto r = run_cli({"year", "--demo", "atlantis"}, "year_cli");
    CHECK(r.rc == 2);
    CHECK(contains(r.err, "harbourside"));
  }
  SUBCASE("a sentinel value in the weather") {
    const auto w = scratch_dir("year_cli") / "sentinel.csv";
    std::ofstream(w) << "month,day,hour,Temperature (C),Dew point (C)\n1,1,0,5,2\n1,1,1,-9999,2\n";
    const auto r = run_cli({"year", unit.string(), "--weather", w.string()}, "year_cli");
    CHECK(r.rc == 2);
    CHECK(contains(r.err, "sentinel.csv:3"));
  }
  SUBCASE("bad column override is a usage error") {
    const auto r = run_cli({"year", unit.string(), "--weather", data("greensboro-nc-tmy3.csv"),
                            "--column", "colour=Red"},
                           "year_cli");
    CHECK(r.rc == 1);
  }
}

namespace {

// A batch folder of its own for each test: its entries are the sites.
std::filesystem::path batch_dir(const std::string& name) {
  const auto dir = scratch_dir("year_cli") / name;
  std::filesystem::remove_all(dir);
  std::filesystem::create_directories(dir);
  return dir;
}

std::size_t count(const std::string& s, char c) {
  return static_cast<std::size_t>(std::count(s.begin(), s.end(), c));
}

}  // namespace

TEST_CASE(
    "--batch lists a folder named x.csv and a dangling link as failing sites, keeping the others") {
  const auto unit = write_unit("batch-odd.toml");
  const auto dir = batch_dir("odd-sites");
  std::filesystem::copy_file(data("greensboro-nc-tmy3.csv"), dir / "a-greensboro.csv");
  std::filesystem::create_directory(dir / "b-folder.csv");
  std::filesystem::create_symlink("no-such-weather.csv", dir / "c-dangling.csv");
  SUBCASE("text: every failing site with its reason, after the good ones") {
    const auto r = run_cli({"year", unit.string(), "--batch", dir.string(), "--wide"}, "year_cli");
    CHECK(r.rc == 2);
    CHECK(contains(r.out, "a-greensboro.csv"));
    CHECK(contains(r.out, "Sites that could not be evaluated"));
    CHECK(contains(r.out, "b-folder.csv"));
    CHECK(contains(r.out, "is a folder"));
    CHECK(contains(r.out, "c-dangling.csv"));
    CHECK(contains(r.out, "link to a file that does not exist"));
  }
  SUBCASE("csv: data only on stdout, the errors on stderr") {
    const auto r =
        run_cli({"year", unit.string(), "--batch", dir.string(), "--format", "csv"}, "year_cli");
    CHECK(r.rc == 2);
    std::istringstream lines(r.out);
    std::size_t rows = 0;
    for (std::string line; std::getline(lines, line); ++rows) {
      CAPTURE(line);
      CHECK(count(line, ',') == 6);  // seven columns on every line: no prose
    }
    CHECK(rows == 2);  // the header and the one good site
    CHECK(contains(r.out, "a-greensboro.csv"));
    CHECK_FALSE(contains(r.out, "b-folder.csv"));
    CHECK(contains(r.err, "b-folder.csv"));
    CHECK(contains(r.err, "is a folder"));
    CHECK(contains(r.err, "c-dangling.csv"));
  }
  SUBCASE("json: each site with its status, errors as data") {
    const auto r =
        run_cli({"year", unit.string(), "--batch", dir.string(), "--format", "json"}, "year_cli");
    CHECK(r.rc == 2);
    CHECK(r.out.front() == '{');
    CHECK(contains(r.out, "\"status\": \"ok\""));
    CHECK(contains(r.out, "\"status\": \"failed\""));
    CHECK(contains(r.out, "\"error\": "));
    CHECK(contains(r.out, "\"partial\": false"));
    CHECK(contains(r.out, "\"best\": "));
    CHECK(contains(r.err, "2 of 3 sites could not be evaluated"));
  }
}

TEST_CASE("--batch on Ctrl-C reports the finished sites marked partial (exit 130)") {
  // The second site is a named pipe: when the command opens it the first site is done, and it
  // waits there for the interrupt.
  const auto unit = write_unit("batch-interrupt.toml");
  const auto dir = batch_dir("interrupted-sites");
  std::filesystem::copy_file(data("greensboro-nc-tmy3.csv"), dir / "a-greensboro.csv");
  REQUIRE(::mkfifo((dir / "b-pipe.csv").c_str(), 0600) == 0);
  std::filesystem::copy_file(data("pvgis-tmy-45n-8e.csv"), dir / "c-piedmont.csv");
  const auto out = scratch_dir("year_cli") / "interrupted.out",
             err = scratch_dir("year_cli") / "interrupted.err";
  const pid_t pid = limitline::test::spawn_cli(
      {"year", unit.string(), "--batch", dir.string(), "--threads", "1", "--format", "csv"},
      out.string(), err.string());
  const int w = ::open((dir / "b-pipe.csv").c_str(), O_WRONLY);
  REQUIRE(w >= 0);
  limitline::test::signal_and_wait_taken(pid, SIGINT);
  ::close(w);  // the pipe site reads as empty and fails; no site starts after it
  CHECK(limitline::test::wait_cli(pid) == 130);
  const std::string csv = slurp(out), messages = slurp(err);
  CHECK(contains(csv, "a-greensboro.csv"));
  CHECK_FALSE(contains(csv, "c-piedmont.csv"));
  CHECK_FALSE(contains(csv, "PARTIAL"));  // CSV is data only
  CHECK(contains(messages, "PARTIAL RESULTS: interrupted; 2 of 3 sites evaluated"));
  CHECK(contains(messages, "b-pipe.csv"));
  CHECK(contains(messages, "interrupted; partial results written"));
}

TEST_CASE("presets left unset take the [site] code's values, and the description says so") {
  // ANSI/ASHRAE/IES 90.1-2019 Table 6.5.1.1.3, zone 4A (from memory): fixed dry-bulb 65 °F;
  // limitline's common-practice default is 75 °F.
  const std::string site_code =
      "[site]\nname = \"coded\"\nenergy_code = \"ashrae-90.1-2019\"\nclimate_zone = \"4A\"\n";
  const std::string handler = R"([air_handler]
supply_airflow = "6000cfm"
supply_air_temp = "55F"
min_outdoor_air = "30%"
return_air_temp = "75F"
return_air_rh = "50%"
)";
  const auto write = [](const std::string& name, const std::string& text) {
    const auto p = scratch_dir("year_cli") / name;
    std::ofstream(p) << text;
    return p.string();
  };
  const auto coded = write("coded.toml", site_code + handler);
  const auto r =
      run_cli({"year", coded, "--weather", data("greensboro-nc-tmy3.csv"), "--wide"}, "year_cli");
  INFO(r.out, r.err);
  REQUIRE(r.rc == 0);
  CHECK(contains(r.out,
                 "fixed-dry-bulb: off when outdoor dry-bulb above 65.0 °F (65.0 °F from "
                 "ANSI/ASHRAE/IES Standard 90.1-2019 zone 4A, Table 6.5.1.1.3, from memory)"));
  // A preset the zone prohibits keeps common practice; its compliance word says so.
  CHECK(contains(r.out,
                 "differential-dry-bulb: off when outdoor dry-bulb above return-air "
                 "dry-bulb\n"));

  const auto plain = write("plain.toml", "[site]\nname = \"plain\"\n" + handler);
  const auto p = run_cli({"year", plain, "--weather", data("greensboro-nc-tmy3.csv")}, "year_cli");
  REQUIRE(p.rc == 0);
  CHECK(contains(p.out, "fixed-dry-bulb: off when outdoor dry-bulb above 75.0 °F\n"));

  const auto written = write("written.toml", site_code + handler +
                                                 "[[strategy]]\npreset = \"fixed-dry-bulb\"\n"
                                                 "dry_bulb_limit = \"70F\"\n");
  const auto w =
      run_cli({"year", written, "--weather", data("greensboro-nc-tmy3.csv")}, "year_cli");
  REQUIRE(w.rc == 0);
  CHECK(contains(w.out, "fixed-dry-bulb: off when outdoor dry-bulb above 70.0 °F\n"));
}
