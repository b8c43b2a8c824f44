// Inputs that are checked whichever command reads them: the warnings of a [sensors] table
// reach the study's context block, and a [site] energy code is checked by every command that
// reads the unit file, with the key's own FILE:LINE.
#include "support/cli.hpp"

#include <doctest/doctest.h>

#include <fstream>
#include <string>

namespace {

using limitline::test::run_cli;
using limitline::test::scratch_dir;

const std::string kSuite = "input_safety_cli";
const std::string kGreensboro = std::string(LIMITLINE_TEST_DATA_DIR) + "/greensboro-nc-tmy3.csv";

bool contains(const std::string& s, const std::string& needle) {
  return s.find(needle) != std::string::npos;
}

// The invented clinic unit of examples/audit-office.toml with `extra` appended to [site] and
// `tail` after the file.
std::string write_unit(const std::string& name, const std::string& site_extra,
                       const std::string& tail = "") {
  const auto path = scratch_dir(kSuite) / name;
  std::ofstream(path)
      << "[site]\nname = \"test unit\"\nelevation = \"900ft\"\n"
      << site_extra
      << "\n[air_handler]\nsupply_airflow = \"8000cfm\"\nsupply_air_temp = \"55F\"\n"
         "min_outdoor_air = \"20%\"\nreturn_air_temp = \"74F\"\nreturn_air_rh = \"45%\"\n"
      << tail;
  return path.string();
}

}  // namespace

TEST_CASE("a [sensors] accuracy beyond common practice is a warning in the study's context") {
  // 20 % RH is inside the allowed range (to 30 %) but several times a transmitter's catalogue
  // accuracy: kept, with a word (common practice).
  const std::string unit =
      write_unit("sensors-warn.toml", "", "\n[sensors]\nreturn_rh = \"20%\"\n");
  const auto r = run_cli({"sensors", unit, "--weather", kGreensboro, "--trials", "4",
                          "--break-even-trials", "0", "--format", "json"},
                         kSuite);
  REQUIRE(r.rc == 0);
  CHECK(contains(r.err, "warning: "));
  CHECK(contains(r.err, "sensors.return_rh"));
  const auto warnings = r.out.find("\"warnings\"");
  REQUIRE(warnings != std::string::npos);
  CHECK(r.out.find("sensors.return_rh", warnings) != std::string::npos);
  const auto strict = run_cli({"sensors", unit, "--weather", kGreensboro, "--trials", "4",
                               "--break-even-trials", "0", "--strict"},
                              kSuite);
  CHECK(strict.rc == 2);
  CHECK(contains(strict.err, "--strict"));
}

TEST_CASE("an unknown [site] energy_code stops audit with the key's FILE:LINE") {
  const std::string unit =
      write_unit("audit-code.toml", "energy_code = \"ashrae-90.1-1899\"\nclimate_zone = \"4A\"\n");
  const std::string log = std::string(LIMITLINE_SOURCE_DIR) + "/examples/trend-office.csv";
  const auto r = run_cli({"audit", unit, log}, kSuite);
  CHECK(r.rc == 2);
  CHECK(contains(r.err, "audit-code.toml:4"));
  CHECK(contains(r.err, "ashrae-90.1-1899"));
  CHECK(r.out.empty());
}
