// The `check` command end to end: outputs, formats, exit codes and error messages. The unit
// files written here are test scaffolding (invented), never check values: expectations are
// the physics of docs/model.md §Reference operations (perfect changeover, common practice
// on humid air) and the tool's own contract (exit codes, one-line errors, keys with unit
// suffixes).
#include <doctest/doctest.h>

#include <limitline/air_point.hpp>
#include <limitline/point_check.hpp>
#include <limitline/unit_file.hpp>

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
    const Run r = run("check '" + unit + "' --outdoor 72F/90%");
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
    const Run r = run("check '" + unit + "' --outdoor 65F/30%");
    REQUIRE(r.code == 0);
    CHECK(row_of(r.out, "db75").find("right decision") != std::string::npos);
    CHECK(row_of(r.out, "diff-h").find("right decision") != std::string::npos);
    CHECK(row_of(r.out, "h15").find("missed economizing") != std::string::npos);
    CHECK(r.out.find("Perfect changeover: enable") != std::string::npos);
  }
  SUBCASE("very cold air: no cooling needed, the high-limit does not matter") {
    // 20 % of −40 °F air with 75 °F return mixes near 52 °F, below the 53.5 °F target.
    const Run r = run("check '" + unit + "' --outdoor -40F/50%");
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
  for (const char* s : {"Unit         CLI test unit", "Air the decisions are made on", "outdoor",
                        "return", "Hand calculation", "Outdoor air needed for 53.5 °F mixed air",
                        "Economizer disabled and enabled", "optimal damper", "Strategies",
                        "Conditions", "enthalpy above return + 0.00 Btu/lb", "Cautions:",
                        "authority having jurisdiction", "Ventilation minimums"})
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
  for (const char* k : {"\"dry_bulb_f\"", "\"enthalpy_btu_per_lb\"", "\"dew_point_f\"",
                        "\"cooling_kbtu_per_h\"", "\"cooling_btu_per_lb\"",
                        "\"outdoor_air_needed_pct\"", "\"verdict\": \"harmful_enable\"",
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
  const limitline::PointCheck pc = limitline::check_point(
      u.air_handler, u.weights, strategies, outdoor.state(p), u.return_air.state(p));
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
    const limitline::PointCheck pc = limitline::check_point(
        u.air_handler, u.weights, strategies, point.state(p), u.return_air.state(p));
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
