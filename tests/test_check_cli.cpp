// The `check` command end to end: outputs, formats, exit codes and error messages. The unit
// files written here are test scaffolding (invented), never check values: expectations are
// the physics of docs/model.md §Reference operations (perfect changeover, common practice
// on humid air) and the tool's own contract (exit codes, one-line errors, keys with unit
// suffixes).
#include <doctest/doctest.h>

#include <limitline/model/air_point.hpp>
#include <limitline/analysis/point_check.hpp>
#include <limitline/io/unit_file.hpp>

#include "support/cli.hpp"

#include <fmt/format.h>

#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <regex>
#include <sstream>
#include <string>

namespace fs = std::filesystem;

namespace {

struct Run {
  int code;
  std::string out, err;
};

std::string slurp(const fs::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

fs::path scratch() {
  const fs::path dir = fs::temp_directory_path() / fmt::format("limitline-check-{}", ::getpid());
  fs::create_directories(dir);
  return dir;
}

Run run(const std::string& args) {
  const fs::path err = scratch() / "stderr.txt";
  const std::string cmd = fmt::format("'{}' {} 2>'{}'", LIMITLINE_EXE, args, err.string());
  FILE* pipe = popen(cmd.c_str(), "r");
  REQUIRE(pipe != nullptr);
  std::string out;
  char buf[4096];
  while (std::size_t n = std::fread(buf, 1, sizeof buf, pipe)) out.append(buf, n);
  const int status = pclose(pipe);
  return {WIFEXITED(status) ? WEXITSTATUS(status) : -1, out, slurp(err)};
}

fs::path write_unit(const std::string& name, const std::string& text) {
  const fs::path p = scratch() / name;
  std::ofstream(p, std::ios::binary) << text;
  return p;
}

const std::string kUnitHead = R"([site]
name = "CLI test unit"
[air_handler]
supply_airflow = "10000cfm"
supply_air_temp = "55F"
fan_heat = "1.5F"
min_outdoor_air = "20%"
return_air_temp = "75F"
return_air_rh = "50%"
)";

const std::string kUnit = kUnitHead + R"(
[[strategy]]
name = "db75"
preset = "fixed-dry-bulb"
dry_bulb_limit = "75F"

[[strategy]]
name = "diff-h"
preset = "differential-enthalpy"

[[strategy]]
name = "h15"
preset = "fixed-enthalpy"
enthalpy_limit = "15btu/lb"
)";

// The text line of a strategy's row in the strategies table.
std::string row_of(const std::string& text, const std::string& name) {
  const auto start = text.find("\nStrategies");
  REQUIRE(start != std::string::npos);
  const auto at = text.find("\n" + name + " ", start);
  REQUIRE_MESSAGE(at != std::string::npos, "no row for ", name);
  return text.substr(at + 1, text.find('\n', at + 1) - at - 1);
}

double json_number(const std::string& json, const std::string& key, std::size_t from = 0) {
  const std::regex re("\"" + key + "\": (-?[0-9.eE+-]+)");
  std::smatch m;
  const std::string tail = json.substr(from);
  REQUIRE_MESSAGE(std::regex_search(tail, m, re), "no key ", key);
  return std::stod(m[1]);
}

void no_nan(const std::string& s) {
  CHECK(s.find("nan") == std::string::npos);
  CHECK(s.find("inf") == std::string::npos);
}

}  // namespace

TEST_CASE("check: usage errors exit 1, bad input exits 2, each with a one-line message") {
  const std::string unit = write_unit("unit.toml", kUnit).string();
  Run r = run("check");
  CHECK(r.code == 1);
  CHECK(r.err.find("unit file") != std::string::npos);
  r = run("check '" + unit + "'");
  CHECK(r.code == 1);
  CHECK(r.err.find("--outdoor is required") != std::string::npos);
  r = run("check '" + unit + "' --outdoor 68F/80% --format csv");
  CHECK(r.code == 1);
  CHECK(r.err.find("--format") != std::string::npos);
  r = run("check '" + unit + "' --outdoor 68F/80% --colour red");
  CHECK(r.code == 1);

  r = run("check '" + unit + "' --outdoor 68F");
  CHECK(r.code == 2);
  CHECK(r.err.find("--outdoor: '68F' needs a dry-bulb and a humidity") != std::string::npos);
  r = run("check '" + unit + "' --outdoor 68F/120%");
  CHECK(r.code == 2);
  CHECK(r.err.find("--outdoor 68F/120%: relative humidity") != std::string::npos);
  r = run("check '" + unit + "' --outdoor 68F/dp70F");
  CHECK(r.code == 2);
  CHECK(r.err.find("dew point") != std::string::npos);
  r = run("check '" + unit + "' --outdoor 68F/80% --return 75F/dp80F");
  CHECK(r.code == 2);
  CHECK(r.err.find("--return 75F/dp80F") != std::string::npos);
  r = run("check /nonexistent/unit.toml --outdoor 68F/80%");
  CHECK(r.code == 2);
  CHECK(r.err.find("/nonexistent/unit.toml: cannot open the unit file") != std::string::npos);

  const std::string bad = write_unit("bad.toml", kUnitHead + "colour = \"blue\"\n").string();
  r = run("check '" + bad + "' --outdoor 68F/80%");
  CHECK(r.code == 2);
  CHECK(r.err.find(bad + ":10: air_handler.colour: unknown key") != std::string::npos);
  CHECK(r.out.empty());
  CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);

  r = run("check --help");
  CHECK(r.code == 0);
  CHECK(r.out.find("usage: limitline check UNIT.toml --outdoor") != std::string::npos);
}

TEST_CASE("check: verdicts against the perfect changeover") {
  const std::string unit = write_unit("unit.toml", kUnit).string();
  SUBCASE("humid outdoor air below the return dry-bulb: a dry-bulb limit enables wrongly") {
    // Common practice: 72 °F / 90 % RH is cooler than 75 °F / 50 % return air but carries more
    // enthalpy, so bringing it in costs more; a dry-bulb high-limit still enables.
    const Run r = run("check --wide '" + unit + "' --outdoor 72F/90%");
    REQUIRE(r.code == 0);
    no_nan(r.out);
    const std::string db = row_of(r.out, "db75");
    CHECK(db.find("enabled") != std::string::npos);
    CHECK(db.find("harmful enable") != std::string::npos);
    const std::string dh = row_of(r.out, "diff-h");
    CHECK(dh.find("disabled") != std::string::npos);
    CHECK(dh.find("enthalpy over limit by") != std::string::npos);
    CHECK(dh.find("right decision") != std::string::npos);
    CHECK(r.out.find("Perfect changeover: disable") != std::string::npos);
  }
  SUBCASE("dry mild air: enabling pays; a far too low enthalpy limit misses it") {
    const Run r = run("check --wide '" + unit + "' --outdoor 65F/30%");
    REQUIRE(r.code == 0);
    CHECK(row_of(r.out, "db75").find("right decision") != std::string::npos);
    CHECK(row_of(r.out, "diff-h").find("right decision") != std::string::npos);
    CHECK(row_of(r.out, "h15").find("missed economizing") != std::string::npos);
    CHECK(r.out.find("Perfect changeover: enable") != std::string::npos);
  }
  SUBCASE("very cold air: no cooling needed, the high-limit does not matter") {
    // 20 % of −40 °F air with 75 °F return mixes near 52 °F, below the 53.5 °F target.
    const Run r = run("check --wide '" + unit + "' --outdoor -40F/50%");
    REQUIRE(r.code == 0);
    for (const char* s : {"db75", "diff-h", "h15"})
      CHECK(row_of(r.out, s).find("no cooling needed") != std::string::npos);
    CHECK(r.out.find("heating makes up") != std::string::npos);  // hand calculation
  }
}

TEST_CASE("check: the text report has every section and the cautions") {
  const std::string unit = write_unit("unit.toml", kUnit).string();
  const Run r = run("check '" + unit + "' --outdoor 68F/dp58F");
  REQUIRE(r.code == 0);
  for (const char* s :
       {"Unit         CLI test unit", "Air the decisions are made on", "outdoor", "return",
        "Hand calculation", "Mixed air of 53.5 °F is not reachable: would need 308.3% outdoor air",
        "Economizer disabled and enabled", "optimal damper", "Strategies", "Conditions",
        "enthalpy above return + 0.00 Btu/lb", "Cautions:", "authority having jurisdiction",
        "Ventilation minimums"})
    CHECK_MESSAGE(r.out.find(s) != std::string::npos, "missing: ", s);
  // The outdoor state the decisions used: 68 °F with a 58 °F dew point.
  CHECK(r.out.find("68.0 °F") != std::string::npos);
  CHECK(r.out.find("58.0 °F") != std::string::npos);
}

TEST_CASE("check: every preset when the unit file gives no strategy") {
  const std::string unit = write_unit("bare.toml", kUnitHead).string();
  const Run r = run("check '" + unit + "' --outdoor 70F/40%");
  REQUIRE(r.code == 0);
  CHECK(r.out.find("every preset at its defaults") != std::string::npos);
  for (const auto& p : limitline::highlimit::presets()) row_of(r.out, std::string(p.name));
}

TEST_CASE("check: --return replaces the unit file's return air") {
  const std::string unit = write_unit("unit.toml", kUnit).string();
  const Run r = run("check '" + unit + "' --outdoor 70F/40% --return 78F/dp60F");
  REQUIRE(r.code == 0);
  const auto at = r.out.find("\nreturn ");
  REQUIRE(at != std::string::npos);
  const std::string line = r.out.substr(at + 1, r.out.find('\n', at + 1) - at - 1);
  CHECK(line.find("--return") != std::string::npos);
  CHECK(line.find("78.0 °F") != std::string::npos);
  CHECK(line.find("60.0 °F") != std::string::npos);
}

TEST_CASE("check: JSON keys carry their units and agree with the library") {
  const std::string unit_text = kUnit;
  const std::string unit = write_unit("unit.toml", unit_text).string();
  const Run ip = run("check '" + unit + "' --outdoor 72F/90% --format json");
  REQUIRE(ip.code == 0);
  no_nan(ip.out);
  for (const char* k :
       {"\"dry_bulb_f\"", "\"enthalpy_btu_per_lb\"", "\"dew_point_f\"", "\"cooling_kbtu_per_h\"",
        "\"cooling_btu_per_lb\"", "\"outdoor_air_needed_pct\"", "\"verdict\": \"harmful_enable\"",
        "\"excess_energy_per_hour_kbtu\"", "\"cautions\""})
    CHECK_MESSAGE(ip.out.find(k) != std::string::npos, "missing ", k);
  CHECK(std::count(ip.out.begin(), ip.out.end(), '{') ==
        std::count(ip.out.begin(), ip.out.end(), '}'));

  const Run si = run("check '" + unit + "' --outdoor 22.2C/90% --units si --format json");
  REQUIRE(si.code == 0);
  for (const char* k : {"\"dry_bulb_c\"", "\"enthalpy_kj_per_kg\"", "\"cooling_kw\"",
                        "\"cooling_kj_per_kg\"", "\"excess_energy_per_hour_kwh\""})
    CHECK_MESSAGE(si.out.find(k) != std::string::npos, "missing ", k);
  // Load at the airflow = load per kg × dry-air mass flow.
  const auto disabled = si.out.find("\"economizer_disabled\"");
  REQUIRE(disabled != std::string::npos);
  const double m = json_number(si.out, "dry_air_mass_flow_kg_per_s");
  CHECK(json_number(si.out, "cooling_kw", disabled) ==
        doctest::Approx(json_number(si.out, "cooling_kj_per_kg", disabled) * m));
  // 10000 cfm at 1.204 kg/m³ (0.3048 m per ft, NIST SP 811).
  CHECK(m == doctest::Approx(10000 * 0.3048 * 0.3048 * 0.3048 / 60 * 1.204));

  // The same point through the library gives the same disabled cooling load.
  const limitline::UnitFile u = limitline::parse_unit_file(unit_text, "u.toml");
  const double p = u.site.design_pressure_kpa();
  const auto outdoor = limitline::parse_air_point("22.2C/90%", limitline::units::System::si, "o");
  const auto strategies = limitline::strategies_or_presets(u);
  const limitline::PointCheck pc = limitline::check_point(u.air_handler, u.weights, strategies,
                                                          outdoor.state(p), u.return_air.state(p));
  CHECK(json_number(si.out, "cooling_kj_per_kg", disabled) ==
        doctest::Approx(pc.choice.disabled.loads.cooling_kj_per_kg).epsilon(1e-6));
}

TEST_CASE("check: Markdown report") {
  const std::string unit = write_unit("unit.toml", kUnit).string();
  const Run r = run("check '" + unit + "' --outdoor 68F/80% --format md");
  REQUIRE(r.code == 0);
  for (const char* s : {"# Economizer high-limit check", "- **Unit:** CLI test unit",
                        "## Strategies", "| strategy |", "## Conditions", "## Cautions"})
    CHECK_MESSAGE(r.out.find(s) != std::string::npos, "missing: ", s);
}

TEST_CASE("check: extreme but valid conditions print finite numbers") {
  const std::string unit = write_unit("unit.toml", kUnit).string();
  for (const char* o : {"-40F/50%", "115F/w0.02", "55F/100%", "75F/50%", "20C/w0"}) {
    INFO(o);
    const Run r = run(fmt::format("check '{}' --outdoor {} --format json", unit, o));
    if (std::string(o) == "20C/w0") {
      // Bone-dry air has no dew point: refused with the reason, not printed as NaN.
      CHECK(r.code == 2);
      CHECK(r.err.find("--outdoor 20C/w0") != std::string::npos);
      continue;
    }
    CHECK(r.code == 0);
    no_nan(r.out);
  }
}

TEST_CASE("check_point: verdict tolerance and the perfect changeover") {
  // The library behind the command, on the same invented unit: a strategy's excess is its
  // weighted energy above the perfect changeover's, and never negative.
  const limitline::UnitFile u = limitline::parse_unit_file(kUnit, "u.toml");
  const double p = u.site.design_pressure_kpa();
  const auto strategies = limitline::strategies_or_presets(u);
  for (const char* o : {"72F/90%", "65F/30%", "10F/50%", "85F/40%"}) {
    INFO(o);
    const auto point = limitline::parse_air_point(o, limitline::units::System::ip, "o");
    const limitline::PointCheck pc = limitline::check_point(u.air_handler, u.weights, strategies,
                                                            point.state(p), u.return_air.state(p));
    REQUIRE(pc.outcomes.size() == 3);
    for (const auto& out : pc.outcomes) {
      CHECK(out.excess_kj_per_kg >= 0.0);
      if (out.verdict == limitline::Verdict::right_decision ||
          out.verdict == limitline::Verdict::no_cooling_needed)
        CHECK(out.excess_kj_per_kg <= limitline::kVerdictToleranceKjPerKg);
      else
        CHECK(out.excess_kj_per_kg > limitline::kVerdictToleranceKjPerKg);
    }
    CHECK(pc.optimal.weighted_kj_per_kg <= pc.changeover_kj_per_kg + 1e-12);
  }
}

// --- Input safety: reachability, plausibility, code names -----------------------------------

namespace {
using limitline::test::contains;
using limitline::test::run_cli;
}  // namespace

TEST_CASE("check: a mixed-air target no damper position reaches is said so, never as a setting") {
  const std::string unit = write_unit("reach.toml", kUnit).string();
  // Target 55 − 1.5 = 53.5 °F. At 68 °F outdoor and 75 °F return, sensible mixing
  // (ASHRAE Fundamentals ch. 1, adiabatic mixing, t weighted by mass) needs
  // (75 − 53.5)/(75 − 68) = 307 % outdoor air: past the outdoor air itself.
  auto r = run_cli({"check", unit, "--outdoor", "68F/dp58F"}, "check-reach");
  REQUIRE(r.rc == 0);
  CHECK(contains(r.out, "Mixed air of 53.5 °F is not reachable: would need 308.3% outdoor air"));
  CHECK_FALSE(contains(r.out, "Outdoor air needed"));
  auto j = run_cli({"check", unit, "--outdoor", "68F/dp58F", "--format", "json"}, "check-reach");
  REQUIRE(j.rc == 0);
  CHECK(contains(j.out, "\"target_reachable\": false"));
  CHECK(contains(j.out, "\"reach\": \"beyond_outdoor_air\""));
  const double needed = json_number(j.out, "outdoor_air_needed_pct");
  CHECK(needed == doctest::Approx(307.1).epsilon(0.01));  // the sensible estimate, within 1 %
  CHECK(fmt::format("{:.1f}", needed) == "308.3");        // the text and the JSON agree
  // 85 °F outdoor: the target lies past the return air, on the far side from the outdoor air
  // ((75 − 53.5)/(75 − 85) would be −215 %): no percentage is offered.
  r = run_cli({"check", unit, "--outdoor", "85F/40%"}, "check-reach");
  REQUIRE(r.rc == 0);
  CHECK(contains(r.out, "not reachable: it lies beyond the return air 75.0 °F"));
  const auto hand = r.out.substr(r.out.find("Hand calculation"));
  CHECK_FALSE(contains(hand.substr(0, hand.find("Economizer disabled")), "-"));
  j = run_cli({"check", unit, "--outdoor", "85F/40%", "--format", "json"}, "check-reach");
  CHECK(contains(j.out, "\"target_reachable\": false"));
  CHECK(contains(j.out, "\"reach\": \"beyond_return_air\""));
  // A reachable target keeps the fraction: 40 °F outdoor needs about (75 − 53.5)/35 = 61 %.
  r = run_cli({"check", unit, "--outdoor", "40F/50%"}, "check-reach");
  CHECK(contains(r.out, "Outdoor air needed for 53.5 °F mixed air: 6"));
}

TEST_CASE("check: command-line air is weighed against plausible bands") {
  const std::string unit = write_unit("plaus.toml", kUnitHead).string();
  // 68 read in SI units is 68 °C; 68 °F (20 °C) is an ordinary outdoor dry-bulb (−50…55 °C,
  // common practice).
  auto r = run_cli({"check", unit, "--outdoor", "68/50%", "--units", "si"}, "check-plaus");
  CHECK(r.rc == 2);
  CHECK(contains(r.err,
                 "--outdoor dry-bulb: 68 read in SI units is 68 °C, outside the plausible "
                 "range of an outdoor dry-bulb (-50 °C to 55 °C, common practice); if you "
                 "meant 68 °F write \"68F\""));
  CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
  // 24 read in IP return air is 24 °F; 24 °C is meant.
  r = run_cli({"check", unit, "--outdoor", "68F/50%", "--return", "24/50%"}, "check-plaus");
  CHECK(r.rc == 2);
  CHECK(contains(r.err, "write \"24C\""));
  // With its unit the value is used, with a warning on stderr and in the context block;
  // --strict makes it an error.
  r = run_cli({"check", unit, "--outdoor", "60C/5%"}, "check-plaus");
  CHECK(r.rc == 0);
  CHECK(contains(r.err,
                 "warning: --outdoor dry-bulb: '60C' (140 °F) is outside the plausible range"));
  CHECK(contains(r.out, "Warning      --outdoor dry-bulb: '60C'"));
  r = run_cli({"check", unit, "--outdoor", "60C/5%", "--strict"}, "check-plaus");
  CHECK(r.rc == 2);
  CHECK(contains(r.err, "--strict makes warnings errors"));
}

TEST_CASE("check: unit-file values in the wrong unit system and beyond physics are refused") {
  std::string si = "units = \"si\"\n" + kUnitHead;
  si.replace(si.find("return_air_temp = \"75F\""), 23, "return_air_temp = 75");
  auto r = run_cli({"check", write_unit("si75.toml", si).string(), "--outdoor", "20C/50%"},
                   "check-plaus");
  CHECK(r.rc == 2);
  CHECK(contains(r.err, "si75.toml:9: air_handler.return_air_temp: 75 in an SI file is 75 °C"));
  CHECK(contains(r.err, "if you meant 75 °F write \"75F\""));
  std::string huge = kUnitHead;
  huge.replace(huge.find("\"10000cfm\""), 10, "\"1e308cfm\"");
  for (const char* format : {"text", "json", "md"}) {
    r = run_cli({"check", write_unit("huge.toml", huge).string(), "--outdoor", "68F/50%",
                 "--format", format},
                "check-plaus");
    CHECK(r.rc == 2);
    CHECK(contains(r.err,
                   "huge.toml:4: air_handler.supply_airflow: '1e308cfm' is beyond any "
                   "physical airflow"));
    CHECK(r.out.empty());
  }
  std::string grouped = kUnitHead;
  grouped.replace(grouped.find("\"10000cfm\""), 10, "\"10,000 cfm\"");
  r = run_cli({"check", write_unit("grouped.toml", grouped).string(), "--outdoor", "68F/50%"},
              "check-plaus");
  CHECK(r.rc == 0);
  CHECK(contains(r.out, "10000 cfm supply"));
}

TEST_CASE("a bad [site] energy_code or climate_zone names FILE:LINE in check, sensors and year") {
  const std::string weather =
      std::string(LIMITLINE_SOURCE_DIR) + "/tests/data/greensboro-nc-tmy3.csv";
  const std::string bad_code =
      write_unit(
          "badcode.toml",
          "[site]\nname = \"x\"\nenergy_code = \"ashrae-90.1-2099\"\nclimate_zone = \"4A\"\n" +
              kUnitHead.substr(kUnitHead.find("[air_handler]")))
          .string();
  const std::string bad_zone =
      write_unit(
          "badzone.toml",
          "[site]\nname = \"x\"\nenergy_code = \"ashrae-90.1-2019\"\nclimate_zone = \"4D\"\n" +
              kUnitHead.substr(kUnitHead.find("[air_handler]")))
          .string();
  const std::vector<std::vector<std::string>> commands = {
      {"check", "--outdoor", "68F/50%"},
      {"sensors", "--weather", weather, "--trials", "1", "--break-even-trials", "0"},
      {"year", "--weather", weather}};
  for (const auto& c : commands) {
    INFO(c[0]);
    std::vector<std::string> args = {c[0], bad_code};
    args.insert(args.end(), c.begin() + 1, c.end());
    auto r = run_cli(args, "check-code");
    CHECK(r.rc == 2);
    CHECK(contains(
        r.err,
        "badcode.toml:3: site.energy_code: 'ashrae-90.1-2099' is not a loaded code edition"));
    args[1] = bad_zone;
    r = run_cli(args, "check-code");
    CHECK(r.rc == 2);
    CHECK(contains(r.err, "badzone.toml:4: site.climate_zone:"));
    CHECK(contains(r.err, "4D"));
  }
}

TEST_CASE("--pressure and --elevation are weighed against the plausible band of a site") {
  // 14.7 read in SI units is 14.7 kPa (about 13,700 m up); 14.7 psia is 101.4 kPa (NIST SP 811).
  auto r =
      run_cli({"state", "--dry-bulb", "24C", "--rh", "50%", "--pressure", "14.7", "--units", "si"},
              "check-site");
  CHECK(r.rc == 2);
  CHECK(contains(r.err, "--pressure: 14.7 read in SI units is 14.7 kPa"));
  CHECK(contains(r.err, "if you meant 14.7 psia write \"14.7psia\""));
  // 8000 m is a real place but no site for an air handler (common practice): a warning.
  r = run_cli({"code", "--edition", "ashrae-90.1-2019", "--zone", "5B", "--elevation", "8000m"},
              "check-site");
  CHECK(r.rc == 0);
  CHECK(contains(r.err, "warning: --elevation: '8000m'"));
  r = run_cli(
      {"code", "--edition", "ashrae-90.1-2019", "--zone", "5B", "--elevation", "8000m", "--strict"},
      "check-site");
  CHECK(r.rc == 2);
}
