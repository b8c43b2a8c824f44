// `limitline code` end to end: the executable, its outputs and its exit codes.
//
// Expected limits are those of the shipped tables, which hold the values the issue recalls
// from memory for ASHRAE/IES 90.1-2019 Table 6.5.1.1.3 and Title 24 Part 6 §140.4(e) (each
// marked "from memory" below). The unit file tests/data/codes-unit-4a.toml is an invented
// fixture; only its verdicts are checked, against those same table values.
#include <doctest/doctest.h>

#include <fmt/format.h>

#include <sys/wait.h>

#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <regex>
#include <sstream>
#include <string>
#include <vector>

namespace {

struct Run {
  int rc;
  std::string out, err;
};

std::string slurp(const std::filesystem::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

std::string quote(const std::string& a) {
  std::string out = "'";
  for (char c : a) out += c == '\'' ? std::string("'\\''") : std::string(1, c);
  return out + "'";
}

// Runs the executable with the shipped tables of the source tree.
Run run(const std::vector<std::string>& args) {
  static const std::filesystem::path dir = [] {
    auto d = std::filesystem::path(LIMITLINE_BINARY_DIR) / "test_code_cli";
    std::filesystem::create_directories(d);
    return d;
  }();
  std::string cmd =
      fmt::format("cd {} && LIMITLINE_DATA_DIR={} {}", quote(LIMITLINE_SOURCE_DIR),
                  quote(std::string(LIMITLINE_SOURCE_DIR) + "/data"), quote(LIMITLINE_EXE));
  // --wide: these cases read rows and sentences whole; the default 100-column layout has its
  // own test (test_text_width).
  cmd += " code --wide";
  for (const auto& a : args) cmd += " " + quote(a);
  cmd += fmt::format(" > {} 2> {}", quote((dir / "out").string()), quote((dir / "err").string()));
  const int status = std::system(cmd.c_str());
  REQUIRE(WIFEXITED(status));
  Run r{WEXITSTATUS(status), slurp(dir / "out"), slurp(dir / "err")};
  // Never NaN or inf in any output.
  static const std::regex bad(R"((^|[^a-z])(nan|inf)([^a-z]|$))", std::regex::icase);
  CHECK_FALSE(std::regex_search(r.out, bad));
  return r;
}

bool has(const std::string& text, const std::string& needle) {
  return text.find(needle) != std::string::npos;
}

// The line of `text` that starts with `start`.
std::string line_of(const std::string& text, const std::string& start) {
  std::istringstream in(text);
  for (std::string line; std::getline(in, line);)
    if (line.rfind(start, 0) == 0) return line;
  return {};
}

// The number after `"key": ` in JSON text (first occurrence).
double json_number(const std::string& json, const std::string& key) {
  const auto at = json.find("\"" + key + "\": ");
  REQUIRE(at != std::string::npos);
  return std::stod(json.substr(at + key.size() + 4));
}

void check_one_line_error(const Run& r, int rc, std::initializer_list<std::string> needles) {
  INFO("stderr: ", r.err);
  CHECK(r.rc == rc);
  CHECK(r.out.empty());
  CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
  for (const auto& n : needles) CHECK(has(r.err, n));
}

const std::string kCaution = "must be verified against the adopted edition";
const std::string kProvenance = "from memory; verify against the adopted edition";

}  // namespace

TEST_CASE("one zone: allowed types with settings, clause, footnotes, provenance, cautions") {
  const Run r = run({"--edition", "ashrae-90.1-2019", "--zone", "4a"});
  INFO(r.out, r.err);
  CHECK(r.rc == 0);
  CHECK(r.err.empty());
  // 90.1-2019 Table 6.5.1.1.3 in 4A (from memory): 65 °F fixed dry-bulb; enthalpy types with
  // the 75 °F dry-bulb limit; no differential dry-bulb.
  CHECK(has(line_of(r.out, "fixed-dry-bulb "), "outdoor dry-bulb > 65.0 °F"));
  CHECK(has(line_of(r.out, "fixed-enthalpy+dry-bulb "),
            "outdoor enthalpy > 28.0 Btu/lb or outdoor dry-bulb > 75.0 °F"));
  CHECK(has(line_of(r.out, "fixed-dry-bulb "), "6.5.1.1.3, Table 6.5.1.1.3"));
  const auto prohibited = r.out.substr(r.out.find("Not allowed in this zone"));
  CHECK(has(prohibited, "differential-dry-bulb"));
  CHECK(has(r.out, "Climate zone  4A"));
  CHECK(has(r.out, "about 30.7 Btu/lb near 6000 ft"));  // the altitude footnote
  CHECK(has(r.out, kProvenance));
  CHECK(has(r.out, "Integrated economizer"));
  CHECK(has(r.out, "Cautions:"));
  CHECK(has(r.out, kCaution));
}

TEST_CASE("the fixed enthalpy limit follows the site pressure") {
  // 90.1 footnote: about 30.7 Btu/lb near 6000 ft (from memory).
  const Run r = run({"--edition", "ashrae-90.1-2019", "--zone", "5B", "--elevation", "6000ft",
                     "--format", "json"});
  INFO(r.out, r.err);
  REQUIRE(r.rc == 0);
  CHECK(json_number(r.out, "enthalpy_btu_per_lb") == doctest::Approx(30.7).epsilon(0.1 / 30.7));
  CHECK(json_number(r.out, "tabulated_enthalpy_btu_per_lb") == doctest::Approx(28));
  CHECK(has(r.out, "\"site_adjusted\": true"));
  CHECK(json_number(r.out, "site_pressure_psia") == doctest::Approx(11.78).epsilon(0.001));
  CHECK(has(r.out, "\"cautions\": ["));
  const Run text = run({"--edition", "ashrae-90.1-2019", "--zone", "5B", "--pressure", "81.2kPa"});
  CHECK(has(text.out, "[altitude footnote; table 28.0 Btu/lb]"));
  const Run both = run({"--edition", "ashrae-90.1-2019", "--zone", "5B", "--pressure", "81kPa",
                        "--elevation", "6000ft"});
  check_one_line_error(both, 1, {"--pressure or --elevation"});
}

TEST_CASE("display units and the figures compared are separate choices") {
  // 90.1-2019: 65 °F in 4A; its SI edition prints 18 °C (from memory).
  const Run ip_in_si = run({"--edition", "ashrae-90.1-2019", "--zone", "4A", "--units", "si"});
  CHECK(has(line_of(ip_in_si.out, "fixed-dry-bulb "), "18.3 °C"));
  const Run si =
      run({"--edition", "ashrae-90.1-2019", "--zone", "4A", "--units", "si", "--compare-in", "si"});
  CHECK(has(line_of(si.out, "fixed-dry-bulb "), "18.0 °C"));
  CHECK(has(si.out, "Compared in   SI figures"));
}

TEST_CASE("Markdown output") {
  const Run r = run({"--edition", "title24-2022", "--zone", "CZ7", "--format", "md"});
  INFO(r.out);
  REQUIRE(r.rc == 0);
  CHECK(r.out.rfind("# ", 0) == 0);
  CHECK(has(r.out, "| control | economizer off when | clause | notes |"));
  // Title 24 CZ7 (from memory): 69 °F, or return − 6 °F.
  CHECK(has(r.out, "| fixed-dry-bulb | outdoor dry-bulb > 69.0 °F |"));
  CHECK(has(r.out, "outdoor dry-bulb > return dry-bulb − 6.0 °F"));
  CHECK(has(r.out, "## Cautions"));
}

TEST_CASE("a unit file gets a verdict per strategy") {
  const Run r = run({"tests/data/codes-unit-4a.toml"});
  INFO(r.out, r.err);
  REQUIRE(r.rc == 0);
  // 90.1-2019, zone 4A (from memory): 65 °F complies, 75 °F is 10 °F high, differential
  // dry-bulb is prohibited, the written-out enthalpy pair is fixed-enthalpy+dry-bulb.
  CHECK(has(line_of(r.out, "dry-bulb at 65 "), "complies"));
  CHECK(has(line_of(r.out, "dry-bulb at 75 "), "set-wrong"));
  CHECK(has(line_of(r.out, "return comparison "), "not-allowed"));
  CHECK(has(line_of(r.out, "hand-written enthalpy pair "), "fixed-enthalpy+dry-bulb"));
  CHECK(has(line_of(r.out, "hand-written enthalpy pair "), "complies"));
  CHECK(has(line_of(r.out, "return dew point "), "not-evaluable"));
  CHECK(has(r.out, "dry-bulb limit 75.0 °F is 10.0 °F above the required 65.0 °F"));
  CHECK(has(r.out, "use instead: fixed-dry-bulb: outdoor dry-bulb > 65.0 °F"));
  CHECK(has(r.out, "codes-unit-4a.toml:5: site.energy_code"));
  CHECK(has(r.out, "the unit's economizer: non-integrated -> does not comply"));
  CHECK(has(r.out, kCaution));

  SUBCASE("--zone overrides the file") {
    const Run z = run({"tests/data/codes-unit-4a.toml", "--zone", "5A"});
    // 5A: 70 °F, and differential dry-bulb allowed (from memory).
    CHECK(has(line_of(z.out, "dry-bulb at 65 "), "set-wrong"));
    CHECK(has(line_of(z.out, "return comparison "), "complies"));
    CHECK(has(z.out, "5A (from --zone)"));
  }
  SUBCASE("JSON names the deviation and the settings to use") {
    const Run j =
        run({"tests/data/codes-unit-4a.toml", "--format", "json", "--economizer", "integrated"});
    REQUIRE(j.rc == 0);
    CHECK(has(j.out, "\"verdict\": \"set-wrong\""));
    CHECK(json_number(j.out, "difference_delta_f") == doctest::Approx(10));
    CHECK(has(j.out, "\"direction\": \"above\""));
    CHECK(has(j.out, "\"use_instead\": ["));
    CHECK(has(j.out, "\"complies\": true"));
  }
  SUBCASE("a unit file without a code names what is missing") {
    const auto path = std::filesystem::path(LIMITLINE_BINARY_DIR) / "test_code_cli" / "nocode.toml";
    std::string text = slurp(std::filesystem::path(LIMITLINE_TEST_DATA_DIR) / "codes-unit-4a.toml");
    text.erase(text.find("energy_code"),
               text.find('\n', text.find("energy_code")) - text.find("energy_code") + 1);
    std::ofstream(path) << text;
    check_one_line_error(run({path.string()}), 2, {"nocode.toml", "energy_code", "--edition"});
    CHECK(run({path.string(), "--edition", "iecc-2021"}).rc == 0);
  }
}

TEST_CASE("--all-editions prints one matrix of every edition") {
  const Run r = run({"--all-editions"});
  INFO(r.err);
  REQUIRE(r.rc == 0);
  for (const auto* id :
       {"ashrae-90.1-2010", "ashrae-90.1-2013", "ashrae-90.1-2016", "ashrae-90.1-2019",
        "ashrae-90.1-2022", "iecc-2015", "iecc-2018", "iecc-2021", "iecc-2024", "title24-2013",
        "title24-2016", "title24-2019", "title24-2022"})
    CHECK(has(r.out, id));
  // 4A (from memory): 90.1-2010 allows fixed enthalpy alone; 2013 on only with dry-bulb.
  const auto from4a = r.out.substr(r.out.find("\n4A "));
  CHECK(has(line_of(from4a, "      fixed-enthalpy "), "H28"));
  CHECK(has(line_of(from4a, "      fixed-enthalpy+dry-bulb "), "H28 DB75"));
  CHECK(has(r.out, kCaution));
  const Run j = run({"--all-editions", "--format", "json", "--units", "si"});
  CHECK(has(j.out, "\"zone_system\": \"california\""));
  CHECK(has(j.out, "\"dry_bulb_c\""));
}

TEST_CASE("--code-table adds editions and amendments") {
  const Run list = run({"--list-editions", "--code-table", "tests/data/codes-minimal.toml"});
  CHECK(list.rc == 0);
  CHECK(has(list.out, "test-minimal"));
  const Run amended = run({"--edition", "ashrae-90.1-2019", "--zone", "4A", "--code-table",
                           "tests/data/codes-amend-90.1-2019-4a.toml"});
  INFO(amended.out, amended.err);
  CHECK(amended.rc == 0);
  CHECK(has(line_of(amended.out, "fixed-dry-bulb "), "outdoor dry-bulb > 70.0 °F"));
  CHECK(has(line_of(amended.out, "fixed-dry-bulb "), "local 1"));
  CHECK(has(amended.out, "test amendment, zone 4A fixed dry-bulb"));
  CHECK(has(amended.out, "test fixture: fixed-dry-bulb"));  // provenance per row
  check_one_line_error(run({"--edition", "iecc-2021", "--zone", "4A", "--code-table",
                            "tests/data/codes-bad-units.toml"}),
                       2, {"codes-bad-units.toml:23:", "dry_bulb_c"});
}

TEST_CASE("bad input and wrong use give one-line errors and their exit codes") {
  check_one_line_error(run({"--edition", "ashrae-90.1-2019", "--zone", "7A"}), 2,
                       {"--zone", "7A", "no A/B/C split"});
  check_one_line_error(run({"--edition", "iecc-2016", "--zone", "4A"}), 2,
                       {"--edition", "iecc-2016", "iecc-2015"});
  check_one_line_error(run({"--edition", "title24-2019", "--zone", "CZ17"}), 2, {"--zone", "CZ17"});
  check_one_line_error(run({"--edition", "iecc-2021", "--zone", "4A", "--elevation", "high"}), 2,
                       {"--elevation", "high"});
  check_one_line_error(run({"--zone", "4A"}), 1, {"--edition"});
  check_one_line_error(run({"--all-editions", "--list-editions"}), 1, {"one of"});
  check_one_line_error(run({"--edition", "iecc-2021", "--zone", "4A", "--format", "csv"}), 1,
                       {"--format", "csv"});
  check_one_line_error(run({"--edition", "iecc-2021", "--zone", "4A", "--wrong"}), 1, {"wrong"});
}

TEST_CASE("help describes every mode and option") {
  const Run r = run({"--help"});
  CHECK(r.rc == 0);
  for (const auto* s :
       {"--edition", "--zone", "--elevation", "--pressure", "--economizer", "--all-editions",
        "--list-editions", "--code-table", "--compare-in", "--units", "--format", "complies",
        "not-allowed", "set-wrong", "not-evaluable", "0.05",
        "the README section 'Energy-code tables'", "from memory"})
    CHECK(has(r.out, s));
}

namespace {

// The 4A fixture with its [[strategy]] tables replaced by `tail` and `extra` lines added to
// [air_handler], written beside the other outputs of these tests.
std::string fixture_variant(const std::string& name, const std::string& extra,
                            const std::string& tail, const std::string& zone = "4A") {
  std::string text = slurp(std::filesystem::path(LIMITLINE_TEST_DATA_DIR) / "codes-unit-4a.toml");
  text = text.substr(0, text.find("[[strategy]]"));
  text.replace(text.find("climate_zone = \"4A\""), 19, "climate_zone = \"" + zone + "\"");
  const std::string anchor = "return_air_rh = \"50%\"\n";
  text.replace(text.find(anchor), anchor.size(), anchor + extra);
  const auto path = std::filesystem::path(LIMITLINE_BINARY_DIR) / "test_code_cli" / name;
  std::ofstream(path) << text << tail;
  return path.string();
}

}  // namespace

TEST_CASE("one zone says whether an economizer is required, and from which capacity") {
  // 90.1-2019 6.5.1, Table 6.5.1-1 (from memory): 54,000 Btu/h and up in 2A–8, none in 1A.
  const Run r = run({"--edition", "ashrae-90.1-2019", "--zone", "4A"});
  INFO(r.out);
  REQUIRE(r.rc == 0);
  CHECK(has(r.out, "Economizer requirement\n"));
  CHECK(has(r.out, "4A: an air economizer is required on cooling systems of at least 54.0 kBtu/h"));
  CHECK(has(r.out, "exceptions limitline does not weigh"));
  CHECK(has(r.out, "water economizer"));
  const Run humid = run({"--edition", "ashrae-90.1-2019", "--zone", "1A"});
  CHECK(has(humid.out, "1A: no economizer is required in this zone"));
  // Title 24 §140.4(e) (from memory): over 54,000 Btu/h, in every zone.
  const Run t24 = run({"--edition", "title24-2022", "--zone", "12"});
  CHECK(has(t24.out,
            "CZ12: an air economizer is required on cooling systems of more than 54.0 "
            "kBtu/h"));
  const Run j = run({"--edition", "ashrae-90.1-2019", "--zone", "4A", "--format", "json"});
  REQUIRE(j.rc == 0);
  CHECK(has(j.out, "\"economizer_requirement\": {"));
  CHECK(has(j.out, "\"required_in_zone\": true"));
  CHECK(json_number(j.out, "threshold_kbtu_per_h") == doctest::Approx(54));
  CHECK(has(j.out, "\"at_threshold_required\": true"));
  // 54,000 Btu/h is 15.83 kW (1 W = 3.412141633 Btu/h).
  const Run si =
      run({"--edition", "ashrae-90.1-2019", "--zone", "4A", "--format", "json", "--units", "si"});
  CHECK(json_number(si.out, "threshold_kw") == doctest::Approx(54 / 3.412141633));
  const Run jh = run({"--edition", "ashrae-90.1-2019", "--zone", "1A", "--format", "json"});
  CHECK(has(jh.out, "\"required_in_zone\": false"));
  CHECK(has(jh.out, "\"threshold_kbtu_per_h\": null"));
  const Run md = run({"--edition", "ashrae-90.1-2019", "--zone", "4A", "--format", "md"});
  CHECK(has(md.out, "## Economizer requirement"));
  CHECK(has(md.out, "## Selectable setpoints"));
}

TEST_CASE("a unit: the economizer requirement on its written or estimated capacity") {
  // Without design_cooling_capacity the capacity is an estimate, labelled as one. The fixture
  // (4000 cfm, 55 °F supply, 75 °F / 50 % return) comes to about 98 kBtu/h.
  const Run est = run({"tests/data/codes-unit-4a.toml"});
  INFO(est.out);
  REQUIRE(est.rc == 0);
  CHECK(has(est.out, "Economizer requirement for this unit"));
  CHECK(has(est.out, "cooling capacity of the unit: "));
  CHECK(has(est.out, "estimated from the supply airflow"));
  CHECK(has(est.out, "an air economizer is required for this unit, on its estimated capacity"));
  const Run est_json = run({"tests/data/codes-unit-4a.toml", "--format", "json"});
  CHECK(has(est_json.out, "\"capacity_estimated\": true"));
  CHECK(has(est_json.out, "\"required\": true"));

  // Given below the 54,000 Btu/h threshold (90.1-2019, from memory): not required.
  const auto small = fixture_variant("small.toml", "design_cooling_capacity = \"48kBtu/h\"\n", "");
  const Run given = run({small});
  INFO(given.out);
  REQUIRE(given.rc == 0);
  CHECK(has(given.out, "cooling capacity of the unit: 48.0 kBtu/h (from "));
  CHECK(has(given.out, "small.toml:15: air_handler.design_cooling_capacity"));
  CHECK(has(given.out, "no economizer is required for this unit, on its capacity"));
  CHECK_FALSE(has(given.out, "estimated from"));
  const Run given_json = run({small, "--format", "json"});
  CHECK(has(given_json.out, "\"capacity_estimated\": false"));
  CHECK(has(given_json.out, "\"required\": false"));
  CHECK(json_number(given_json.out, "capacity_kbtu_per_h") == doctest::Approx(48));
  // In an exempt zone the capacity does not matter.
  const Run exempt = run({small, "--zone", "1A"});
  CHECK(has(exempt.out, "no economizer is required for this unit: the zone is exempt"));
}

TEST_CASE("a unit: a selectable-setpoint verdict, and an ordinary set-wrong") {
  // 90.1-2019, zone 5B (from memory): fixed dry-bulb 75 °F, with the footnote allowing a device
  // with selectable setpoints to be within 2 °F of it.
  const auto unit =
      fixture_variant("selectable.toml", "",
                      "[[strategy]]\nname = \"step 74\"\npreset = \"fixed-dry-bulb\"\n"
                      "dry_bulb_limit = \"74F\"\n\n"
                      "[[strategy]]\nname = \"step 72\"\npreset = \"fixed-dry-bulb\"\n"
                      "dry_bulb_limit = \"72F\"\n",
                      "5B");
  const Run r = run({unit});
  INFO(r.out, r.err);
  REQUIRE(r.rc == 0);
  CHECK(has(line_of(r.out, "step 74 "), "complies-if-selectable"));
  CHECK(has(line_of(r.out, "step 72 "), "set-wrong"));
  CHECK(has(r.out, "dry-bulb limit 74.0 °F is 1.0 °F below the required 75.0 °F"));
  CHECK(has(r.out,
            "within the 2.0 °F the edition allows a device whose setpoints are "
            "selectable"));
  CHECK(has(r.out, "Selectable setpoints"));
  CHECK(has(r.out, "from memory (a footnote of the high-limit table"));
  const Run j = run({unit, "--format", "json"});
  CHECK(has(j.out, "\"verdict\": \"complies-if-selectable\""));
  CHECK(has(j.out, "\"selectable_setpoints\": {"));
}

TEST_CASE("a unit without [[strategy]] is judged at the [site] code's settings") {
  // 90.1-2019, zone 4A (from memory): the fixed dry-bulb default becomes 65 °F, so it complies
  // where the common-practice 75 °F would be set wrong.
  const auto unit = fixture_variant("defaulted.toml", "", "");
  const Run r = run({unit});
  INFO(r.out);
  REQUIRE(r.rc == 0);
  CHECK(has(r.out, "at the settings of the [site]'s code where it allows the preset"));
  CHECK(has(r.out, "ANSI/ASHRAE/IES Standard 90.1-2019 zone 4A"));
  CHECK(has(line_of(r.out, "fixed-dry-bulb "), "complies"));
  CHECK(has(line_of(r.out, "differential-dry-bulb "), "not-allowed"));
  const Run j = run({unit, "--format", "json"});
  CHECK(has(j.out, "\"settings_from_code\": \"ANSI/ASHRAE/IES Standard 90.1-2019 zone 4A"));
}

TEST_CASE("one zone and a unit list the edition's economizer fault-detection requirement") {
  // 90.1-2019 6.4.3.12 (from memory): sensors, ±2 °F, the controller's status, five faults.
  const Run r = run({"--edition", "ashrae-90.1-2019", "--zone", "4A"});
  INFO(r.out);
  REQUIRE(r.rc == 0);
  CHECK(has(r.out, "Economizer fault detection\n"));
  CHECK(has(r.out, "ashrae-90.1-2019 6.4.3.12: "));
  CHECK(has(r.out, "temperature sensor accuracy: ±2.0 °F over 40 °F to 80 °F"));
  CHECK(has(r.out, "\"excess outdoor air\" [outdoor-air-above-minimum]"));
  const Run si = run({"--edition", "ashrae-90.1-2019", "--zone", "4A", "--units", "si"});
  CHECK(has(si.out, "temperature sensor accuracy: ±1.1 K"));  // 2 °F = 1.11 K
  const Run j = run({"--edition", "ashrae-90.1-2019", "--zone", "4A", "--format", "json"});
  CHECK(has(j.out, "\"fault_detection\": {"));
  CHECK(has(j.out, "\"code_term\": \"damper not modulating\""));
  CHECK(has(j.out, "\"capacity_threshold_kbtu_per_h\": null"));
  // 90.1-2010 has no such clause (from memory).
  const Run old = run({"--edition", "ashrae-90.1-2010", "--zone", "4A"});
  CHECK(has(old.out, "ashrae-90.1-2010 has no economizer fault-detection clause"));
  const Run old_j = run({"--edition", "ashrae-90.1-2010", "--zone", "4A", "--format", "json"});
  CHECK(has(old_j.out, "\"fault_detection\": null"));
  // Title 24 §120.2(i) (from memory) applies from 54,000 Btu/h: a 48 kBtu/h unit is below it.
  const auto small =
      fixture_variant("small-t24.toml", "design_cooling_capacity = \"48kBtu/h\"\n", "");
  const Run unit = run({small, "--edition", "title24-2022", "--zone", "12"});
  INFO(unit.out);
  REQUIRE(unit.rc == 0);
  CHECK(has(unit.out,
            "not required for this unit: its capacity 48.0 kBtu/h is below the "
            "threshold"));
  const Run big = run({"tests/data/codes-unit-4a.toml"});
  CHECK(has(big.out, "required for this unit if it is of the type the clause covers"));
}
