// Units follow the user: a unit file's `units = "si"` sets the output system and the reading
// of bare numbers on the command line, unless --units says otherwise. The unit files are the
// invented scenarios of examples/ (inputs only, never check values); the weather is
// tests/data/greensboro-nc-tmy3.csv (open data set, see tests/data/SOURCES.md). The checks
// compare the tool with itself: a bare number and the same number with its unit must agree.
#include "support/cli.hpp"

using limitline::test::contains;
using limitline::test::run_cli;

namespace {

const std::string kSiUnit = "examples/lab-high-plateau.toml";    // units = "si"
const std::string kIpUnit = "examples/office-humid-coast.toml";  // no units key: IP
const std::string kSuite = "units_cli";

std::string data(const std::string& f) { return std::string(LIMITLINE_TEST_DATA_DIR) + "/" + f; }

}  // namespace

TEST_CASE("an SI unit file prints SI unless --units overrides it") {
  const auto si = run_cli({"year", kSiUnit, "--weather", data("greensboro-nc-tmy3.csv")}, kSuite);
  REQUIRE(si.rc == 0);
  CHECK(contains(si.out, "kWh"));
  CHECK_FALSE(contains(si.out, "kBtu"));
  const auto ip = run_cli(
      {"year", kSiUnit, "--weather", data("greensboro-nc-tmy3.csv"), "--units", "ip"}, kSuite);
  REQUIRE(ip.rc == 0);
  CHECK(contains(ip.out, "kBtu"));
  const auto json = run_cli(
      {"year", kSiUnit, "--weather", data("greensboro-nc-tmy3.csv"), "--format", "json"}, kSuite);
  REQUIRE(json.rc == 0);
  CHECK(contains(json.out, "\"units\": \"si\""));
  const auto ip_file =
      run_cli({"year", kIpUnit, "--weather", data("greensboro-nc-tmy3.csv")}, kSuite);
  REQUIRE(ip_file.rc == 0);
  CHECK(contains(ip_file.out, "kBtu"));
}

TEST_CASE("every command that reads a unit file follows its units") {
  SUBCASE("check") {
    const auto r = run_cli({"check", kSiUnit, "--outdoor", "21C/dp2C"}, kSuite);
    REQUIRE(r.rc == 0);
    CHECK(contains(r.out, "°C"));
    CHECK_FALSE(contains(r.out, "°F"));
  }
  SUBCASE("code") {
    const auto r = run_cli({"code", kSiUnit, "--format", "json"}, kSuite);
    REQUIRE(r.rc == 0);
    CHECK(contains(r.out, "_kpa"));
    CHECK_FALSE(contains(r.out, "_psia"));
  }
  SUBCASE("sequence") {
    const auto r = run_cli({"sequence", kSiUnit}, kSuite);
    REQUIRE(r.rc == 0);
    CHECK(contains(r.out, "°C"));
  }
  SUBCASE("chart") {
    const auto r =
        run_cli({"chart", kSiUnit, "--weather", data("greensboro-nc-tmy3.csv"), "-o", "-"}, kSuite);
    REQUIRE(r.rc == 0);
    CHECK(contains(r.out, "°C"));
  }
}

TEST_CASE("bare numbers on the command line are read in the active system") {
  SUBCASE("an SI unit file: a bare --outdoor dry-bulb is °C") {
    const auto bare =
        run_cli({"check", kSiUnit, "--outdoor", "21/dp2", "--format", "json"}, kSuite);
    const auto given =
        run_cli({"check", kSiUnit, "--outdoor", "21C/dp2C", "--format", "json"}, kSuite);
    REQUIRE(bare.rc == 0);
    CHECK(bare.out == given.out);
  }
  SUBCASE("an IP unit file: a bare --outdoor dry-bulb is °F") {
    const auto bare =
        run_cli({"check", kIpUnit, "--outdoor", "68/80%", "--format", "json"}, kSuite);
    const auto given =
        run_cli({"check", kIpUnit, "--outdoor", "68F/80%", "--format", "json"}, kSuite);
    REQUIRE(bare.rc == 0);
    CHECK(bare.out == given.out);
  }
  SUBCASE("--units overrides the file for bare numbers too") {
    const auto bare = run_cli(
        {"check", kSiUnit, "--outdoor", "70/dp36", "--units", "ip", "--format", "json"}, kSuite);
    const auto given = run_cli(
        {"check", kSiUnit, "--outdoor", "70F/dp36F", "--units", "ip", "--format", "json"}, kSuite);
    REQUIRE(bare.rc == 0);
    CHECK(bare.out == given.out);
  }
  SUBCASE("code: a bare --elevation with an SI unit file is metres") {
    const auto bare = run_cli({"code", kSiUnit, "--elevation", "1500"}, kSuite);
    const auto given = run_cli({"code", kSiUnit, "--elevation", "1500m"}, kSuite);
    REQUIRE(bare.rc == 0);
    CHECK(bare.out == given.out);
  }
  SUBCASE("state has no unit file: bare numbers are IP unless --units si") {
    const auto bare = run_cli({"state", "--dry-bulb", "24", "--rh", "50", "--units", "si"}, kSuite);
    const auto given =
        run_cli({"state", "--dry-bulb", "24C", "--rh", "50%", "--units", "si"}, kSuite);
    REQUIRE(bare.rc == 0);
    CHECK(bare.out == given.out);
  }
}

TEST_CASE("an error about a value speaks the active system") {
  // A dew point above the dry-bulb is impossible air; in an SI unit file the bare numbers are
  // read, and the error written, in °C.
  const auto r = run_cli({"check", kSiUnit, "--outdoor", "30/dp35"}, kSuite);
  CHECK(r.rc == 2);
  CHECK(contains(r.err, "--outdoor"));
  CHECK(contains(r.err, "°C"));
  CHECK_FALSE(contains(r.err, "°F"));
}

TEST_CASE("the help says where --units comes from") {
  for (const char* command :
       {"state", "check", "year", "code", "chart", "report", "sequence", "sensors", "audit"}) {
    CAPTURE(command);
    const auto r = run_cli({command, "--help"}, kSuite);
    CHECK(r.rc == 0);
    std::string words;  // the help wraps its lines: compare the words
    for (char c : r.out)
      if (c != ' ' && c != '\n')
        words += c;
      else if (!words.empty() && words.back() != ' ')
        words += ' ';
    CHECK(contains(words, "--units"));
    CHECK(contains(words, "(default: the unit file's units, else ip)"));
  }
}
