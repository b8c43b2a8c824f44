// The unit file: what a valid file gives, and every kind of error with its message (file,
// line, key). Unit conversions are checked against exact definitions (NIST SP 811: 1 ft =
// 0.3048 m, °F = 1.8·°C + 32, 1 psi = 6.894757 kPa); the enthalpy datum shift against
// docs/model.md §Units and datums (h_IP = h_SI/2.326 + 7.68).
#include <doctest/doctest.h>

#include <limitline/model/air_point.hpp>
#include <limitline/error.hpp>
#include <limitline/model/psychro.hpp>
#include <limitline/io/unit_file.hpp>
#include <limitline/io/detail/raw_table.hpp>

#include <fmt/format.h>

#include <cmath>
#include <fstream>
#include <string>

using limitline::InputError;
using limitline::parse_unit_file;
using limitline::UnitFile;
namespace hl = limitline::highlimit;
namespace air = limitline::airside;
namespace psy = limitline::psychro;

namespace {

constexpr double kCfm = 0.3048 * 0.3048 * 0.3048 / 60.0;  // m³/s per cfm (NIST SP 811)

// A valid IP file; tests replace one line at a time, which keeps every line number.
const std::string kBase = R"([site]
name = "Test annex"
elevation = "850ft"
energy_code = "ashrae-90.1-2019"
climate_zone = "4A"

[air_handler]
supply_airflow = "12000cfm"
supply_air_temp = "55F"
fan_heat = "1.5F"
fan_position = "draw-through"
min_outdoor_air = "25%"
max_outdoor_air = "100%"
economizer = "integrated"
coil_leaving_rh_max = "95%"
return_air_temp = "75F"
return_air_rh = "50%"
)";

std::string replace(std::string text, const std::string& from, const std::string& to) {
  const auto at = text.find(from);
  REQUIRE_MESSAGE(at != std::string::npos, "test text lacks: ", from);
  text.replace(at, from.size(), to);
  return text;
}

// Parsing fails with a message that starts "unit.toml:LINE: KEY" and contains `detail`.
void refuses(const std::string& text, int line, const std::string& key, const std::string& detail) {
  try {
    parse_unit_file(text, "unit.toml");
    FAIL("accepted; expected an error at line ", line, " for ", key);
  } catch (const InputError& e) {
    const std::string m = e.what();
    INFO("message: ", m);
    CHECK(m.rfind(fmt::format("unit.toml:{}: {}", line, key), 0) == 0);
    CHECK(m.find(detail) != std::string::npos);
    CHECK(m.find('\n') == std::string::npos);  // one line
  }
}

}  // namespace

TEST_CASE("a full IP unit file reads into SI") {
  const std::string text = kBase + R"(
[[strategy]]
name = "code default"
preset = "fixed-dry-bulb"
dry_bulb_limit = "70F"
deadband = "1F"

[[strategy]]
name = "humid-climate custom"
conditions = [ { quantity = "enthalpy", reference = "fixed", limit = "28btu/lb" },
               { quantity = "dew-point", reference = "fixed", limit = "55F", deadband = "2F" },
               { quantity = "enthalpy", reference = "return", offset = "-1btu/lb" } ]

[[strategy]]
preset = "differential-enthalpy"
enthalpy_offset = "0.5btu/lb"
)";
  const UnitFile u = parse_unit_file(text, "unit.toml");
  CHECK(u.path == "unit.toml");
  CHECK(u.units == limitline::units::System::ip);
  CHECK(u.site.name == "Test annex");
  REQUIRE(u.site.elevation_m);
  CHECK(*u.site.elevation_m == doctest::Approx(850 * 0.3048));
  CHECK_FALSE(u.site.pressure_kpa);
  CHECK(u.site.design_pressure_kpa() == doctest::Approx(psy::standard_pressure_kpa(259.08)));
  CHECK(u.site.energy_code == "ashrae-90.1-2019");
  CHECK(u.site.climate_zone == "4A");
  CHECK(u.site.climate_zone_origin == "unit.toml:5: site.climate_zone");

  const air::AirHandler& a = u.air_handler;
  CHECK(a.supply_airflow_m3_per_s == doctest::Approx(12000 * kCfm));
  CHECK(a.supply_air_temp_c == doctest::Approx((55 - 32) / 1.8));
  CHECK(a.fan_heat_k == doctest::Approx(1.5 / 1.8));
  CHECK(a.fan_position == air::FanPosition::draw_through);
  CHECK(a.min_oa_fraction == doctest::Approx(0.25));
  CHECK(a.max_oa_fraction == doctest::Approx(1.0));
  CHECK(a.economizer == air::EconomizerType::integrated);
  CHECK(a.coil_leaving_rh_max == doctest::Approx(0.95));
  CHECK(u.return_air.dry_bulb_c == doctest::Approx((75 - 32) / 1.8));
  CHECK(u.return_air.humidity_kind == psy::HumidityInput::relative_humidity);
  CHECK(u.return_air.humidity_value == doctest::Approx(0.5));
  CHECK(u.weights.cooling == 1.0);
  CHECK(u.weights.heating == 1.0);

  REQUIRE(u.strategies.size() == 3);
  CHECK_FALSE(u.strategies_defaulted);
  const hl::Strategy& s0 = u.strategies[0];
  CHECK(s0.name == "code default");
  CHECK(s0.preset == "fixed-dry-bulb");
  REQUIRE(s0.conditions.size() == 1);
  CHECK(s0.conditions[0].limit == doctest::Approx((70 - 32) / 1.8));
  CHECK(s0.conditions[0].deadband == doctest::Approx(1 / 1.8));
  const hl::Strategy& s1 = u.strategies[1];
  CHECK(s1.preset.empty());
  REQUIRE(s1.conditions.size() == 3);
  // 28 Btu/lb with the datum shift: (28 − 7.68)·2.326 = 47.264 kJ/kg.
  CHECK(s1.conditions[0].limit == doctest::Approx(47.26432));
  CHECK(s1.conditions[1].quantity == hl::Quantity::dew_point);
  CHECK(s1.conditions[1].deadband == doctest::Approx(2 / 1.8));
  // An offset is a difference: −1 Btu/lb = −2.326 kJ/kg, no datum shift.
  CHECK(s1.conditions[2].reference == hl::Reference::return_air);
  CHECK(s1.conditions[2].limit == doctest::Approx(-2.326));
  const hl::Strategy& s2 = u.strategies[2];
  CHECK(s2.name == "differential-enthalpy");  // named after its preset
  CHECK(s2.conditions[0].limit == doctest::Approx(0.5 * 2.326));
  CHECK(limitline::strategies_or_presets(u).size() == 3);
}

TEST_CASE("an SI file with bare numbers, an airflow minimum and weights") {
  const std::string text = R"(units = "si"
[site]
pressure = 84.5
[air_handler]
supply_airflow = 6.0
supply_air_temp = 13
fan_heat = 1
fan_position = "blow-through"
min_outdoor_airflow = 1.5
max_outdoor_air = "80%"
economizer = "non_integrated"
return_air_temp = 24
return_air_dew_point = 8
[energy]
cooling_weight = 1
heating_weight = "0.5"
[[strategy]]
preset = "fixed-dry-bulb"
dry_bulb_limit = 21
)";
  const UnitFile u = parse_unit_file(text, "si.toml");
  CHECK(u.units == limitline::units::System::si);
  CHECK(u.site.design_pressure_kpa() == 84.5);
  CHECK(u.air_handler.supply_airflow_m3_per_s == 6.0);
  CHECK(u.air_handler.fan_position == air::FanPosition::blow_through);
  CHECK(u.air_handler.economizer == air::EconomizerType::non_integrated);
  // A ratio of standard-air volume flows is the ratio of dry-air mass flows.
  CHECK(u.air_handler.min_oa_fraction == doctest::Approx(0.25));
  REQUIRE(u.min_outdoor_airflow_m3_per_s);
  CHECK(*u.min_outdoor_airflow_m3_per_s == 1.5);
  CHECK(u.air_handler.max_oa_fraction == doctest::Approx(0.8));
  CHECK(u.return_air.humidity_kind == psy::HumidityInput::dew_point);
  CHECK(u.return_air.humidity_value == 8.0);
  CHECK(u.weights.heating == 0.5);
  CHECK(u.strategies[0].conditions[0].limit == 21.0);
  // The return state at the site pressure: dew point 8 °C holds at any pressure.
  CHECK(psy::properties(u.return_air.state(84.5)).dew_point_c == doctest::Approx(8.0));
}

TEST_CASE("defaults: sea level, no strategies means every preset, raw tables kept") {
  const std::string text = R"([air_handler]
supply_airflow = "5000cfm"
supply_air_temp = "55F"
min_outdoor_air = "15%"
return_air_temp = "75F"
return_air_humidity_ratio = "0.0090"

[weather]
file = "somewhere.csv"
anything = { the = "weather layer checks its own keys" }

[schedule]
mon-fri = "07:00-18:00"

[sensors]
outdoor_dry_bulb = "0.5F"
)";
  const UnitFile u = parse_unit_file(text, "d.toml");
  CHECK(u.site.design_pressure_kpa() == psy::kStandardPressureKpa);
  CHECK(u.air_handler.fan_heat_k == 0.0);
  CHECK(u.air_handler.max_oa_fraction == 1.0);
  CHECK(u.air_handler.coil_leaving_rh_max == doctest::Approx(0.95));
  CHECK(u.strategies.empty());
  CHECK(u.strategies_defaulted);
  CHECK(limitline::strategies_or_presets(u).size() == hl::presets().size());
  REQUIRE(u.weather);
  const toml::table& weather = limitline::detail::toml_table(*u.weather);
  CHECK(weather.get("file")->value_or(std::string()) == "somewhere.csv");
  REQUIRE(u.schedule);
  REQUIRE(u.sensors);
  // The raw tables keep their source, so their own layers can report file and line; a copy
  // of the unit file keeps it too.
  const toml::node* file = weather.get("file");
  CHECK(limitline::detail::source_origin(file->source(), "weather.file") ==
        "d.toml:9: weather.file");
  const UnitFile copy = u;
  const toml::node* copied = limitline::detail::toml_table(*copy.weather).get("file");
  CHECK(limitline::detail::source_origin(copied->source(), "weather.file") ==
        "d.toml:9: weather.file");
}

TEST_CASE("TOML syntax errors name the file and line") {
  try {
    parse_unit_file("[air_handler]\nsupply_airflow = \"5000cfm\nx = 1\n", "bad.toml");
    FAIL("accepted broken TOML");
  } catch (const InputError& e) {
    const std::string m = e.what();
    INFO(m);
    CHECK(m.rfind("bad.toml:2: TOML syntax error", 0) == 0);
  }
  try {
    parse_unit_file("[air_handler]\nsupply_airflow = 1\nsupply_airflow = 2\n", "dup.toml");
    FAIL("accepted a duplicate key");
  } catch (const InputError& e) {
    CHECK(std::string(e.what()).rfind("dup.toml:3: TOML syntax error", 0) == 0);
  }
}

TEST_CASE("unknown keys anywhere outside the raw tables are errors") {
  refuses(kBase + "colour = \"blue\"\n", 18, "air_handler.colour", "unknown key in [air_handler]");
  refuses("title = \"x\"\n" + kBase, 1, "title", "unknown key in the unit file");
  refuses(replace(kBase, "climate_zone = \"4A\"", "climate = \"4A\""), 5, "site.climate",
          "allowed: name, elevation");
  refuses(kBase + "[[strategy]]\npreset = \"fixed-dry-bulb\"\nlimit = \"70F\"\n", 20,
          "strategy[1].limit", "unknown key in [[strategy]]");
  refuses(kBase +
              "[[strategy]]\nname = \"c\"\nconditions = [ { quantity = \"enthalpy\", "
              "limit = \"28btu/lb\", hysteresis = \"1btu/lb\" } ]\n",
          20, "strategy[1].conditions[1].hysteresis", "unknown key in a condition");
  refuses(kBase + "[energy]\ncooling_cop = 3\n", 19, "energy.cooling_cop",
          "unknown key in [energy]");
}

TEST_CASE("a value of the wrong kind names the key and what was expected") {
  refuses(kBase + "[[strategy]]\npreset = \"fixed-enthalpy\"\nenthalpy_limit = \"75F\"\n", 20,
          "strategy[1].enthalpy_limit", "which is not an enthalpy");
  refuses(replace(kBase, "supply_air_temp = \"55F\"", "supply_air_temp = \"28btu/lb\""), 9,
          "air_handler.supply_air_temp", "not a temperature");
  refuses(replace(kBase, "supply_airflow = \"12000cfm\"", "supply_airflow = true"), 8,
          "air_handler.supply_airflow", "not a boolean");
  refuses(replace(kBase, "min_outdoor_air = \"25%\"", "min_outdoor_air = 0.25"), 12,
          "air_handler.min_outdoor_air", "ambiguous");
  refuses(replace(kBase, "fan_position = \"draw-through\"", "fan_position = \"sideways\""), 11,
          "air_handler.fan_position", "allowed: draw-through, blow-through");
  refuses(replace(kBase, "economizer = \"integrated\"", "economizer = 1"), 14,
          "air_handler.economizer", "must be a string");
  refuses(replace(kBase, "elevation = \"850ft\"", "elevation = \"850psia\""), 3, "site.elevation",
          "not a length");
  refuses("units = \"metric\"\n" + kBase, 1, "units", "allowed: ip, si");
}

TEST_CASE("missing required keys are reported at their table") {
  refuses(replace(kBase, "supply_air_temp = \"55F\"\n", "\n"), 7, "air_handler.supply_air_temp",
          "required key is missing");
  refuses(replace(kBase, "min_outdoor_air = \"25%\"\n", "\n"), 7, "air_handler.min_outdoor_air",
          "ventilation minimum");
  refuses(replace(kBase, "return_air_rh = \"50%\"\n", "\n"), 7, "air_handler.return_air_rh",
          "return-air humidity");
  refuses(kBase + "[[strategy]]\nname = \"nothing\"\n", 18, "strategy[1].preset", "give preset");
  refuses(kBase + "[[strategy]]\nconditions = [ { quantity = \"enthalpy\", limit = 47 } ]\n", 18,
          "strategy[1].name", "needs a name");
  refuses(kBase + "[[strategy]]\nname = \"c\"\nconditions = [ { quantity = \"dry-bulb\" } ]\n", 20,
          "strategy[1].conditions[1].limit", "needs its limit");
  try {
    parse_unit_file("[site]\nname = \"x\"\n", "none.toml");
    FAIL("accepted a file without [air_handler]");
  } catch (const InputError& e) {
    CHECK(std::string(e.what()).rfind("none.toml: [air_handler] is missing", 0) == 0);
  }
}

TEST_CASE("contradictory values are refused") {
  refuses(replace(kBase, "max_outdoor_air = \"100%\"", "max_outdoor_air = \"20%\""), 12,
          "air_handler.min_outdoor_air", "is above max_outdoor_air 20.0% (line 13)");
  refuses(replace(kBase, "supply_air_temp = \"55F\"", "supply_air_temp = \"75F\""), 9,
          "air_handler.supply_air_temp", "not below return_air_temp 75.0 °F (line 16)");
  refuses(replace(kBase, "supply_air_temp = \"55F\"", "supply_air_temp = \"80F\""), 9,
          "air_handler.supply_air_temp", "not below return_air_temp");
  refuses(replace(kBase, "return_air_rh = \"50%\"", "return_air_rh = \"105%\""), 17,
          "air_handler.return_air_rh", "105.0% is outside the allowed range (0% to 100%)");
  refuses(replace(kBase, "return_air_rh = \"50%\"", "return_air_dew_point = \"80F\""), 17,
          "air_handler.return_air_dew_point", "80 °F is above the dry-bulb 75 °F");
  refuses(replace(kBase, "return_air_rh = \"50%\"",
                  "return_air_rh = \"50%\"\nreturn_air_dew_point = \"55F\""),
          18, "air_handler.return_air_dew_point", "give one return-air humidity");
  refuses(replace(kBase, "min_outdoor_air = \"25%\"",
                  "min_outdoor_air = \"25%\"\nmin_outdoor_airflow = \"3000cfm\""),
          13, "air_handler.min_outdoor_airflow", "not both");
  refuses(replace(kBase, "min_outdoor_air = \"25%\"", "min_outdoor_airflow = \"13000cfm\""), 12,
          "air_handler.min_outdoor_airflow", "up to supply_airflow 12000 cfm");
  refuses(replace(kBase, "elevation = \"850ft\"", "elevation = \"850ft\"\npressure = \"14.2psia\""),
          4, "site.pressure", "give elevation or pressure, not both (elevation is on line 3)");
  refuses(replace(kBase, "coil_leaving_rh_max = \"95%\"", "coil_leaving_rh_max = \"101%\""), 15,
          "air_handler.coil_leaving_rh_max", "above 0%, up to 100%");
  refuses(replace(kBase, "elevation = \"850ft\"", "elevation = \"60000ft\""), 3, "site.elevation",
          "outside the allowed range");
  refuses(replace(kBase, "supply_airflow = \"12000cfm\"", "supply_airflow = \"0cfm\""), 8,
          "air_handler.supply_airflow", "more than 0");
  refuses("units = \"si\"\n[site]\nunits = \"si\"\n[air_handler]\n", 3, "site.units",
          "already set");
  refuses(kBase + "[energy]\ncooling_weight = 0\nheating_weight = 0\n", 18, "energy", "both 0");
  refuses(kBase + "[energy]\nheating_weight = -1\n", 19, "energy.heating_weight",
          "outside the allowed range");
}

TEST_CASE("strategy errors: names, preset or conditions, settings the preset does not use") {
  const std::string two = kBase + R"(
[[strategy]]
name = "A"
preset = "fixed-dry-bulb"

[[strategy]]
name = "A"
preset = "fixed-enthalpy"
)";
  refuses(two, 24, "strategy[2].name", "'A' is already the name of strategy[1] (line 20)");
  refuses(kBase +
              "[[strategy]]\npreset = \"fixed-dry-bulb\"\n[[strategy]]\npreset = "
              "\"fixed-dry-bulb\"\ndry_bulb_limit = \"70F\"\n",
          20, "strategy[2].name", "already the name of strategy[1]");
  refuses(kBase +
              "[[strategy]]\nname = \"x\"\npreset = \"fixed-enthalpy\"\nconditions = [ { "
              "quantity = \"enthalpy\", limit = 47 } ]\n",
          21, "strategy[1].conditions",
          "give preset or conditions, not both (preset is on line 20)");
  refuses(kBase + "[[strategy]]\npreset = \"fixed-dry-bulb\"\ndew_point_limit = \"55F\"\n", 20,
          "strategy[1].dew_point_limit",
          "preset 'fixed-dry-bulb' does not use dew_point_limit (it takes: dry_bulb_limit, "
          "deadband, dry_bulb_deadband)");
  refuses(kBase + "[[strategy]]\npreset = \"differential-dry-bulb\"\ndry_bulb_limit = \"70F\"\n",
          20, "strategy[1].dry_bulb_limit",
          "does not use dry_bulb_limit (it takes: dry_bulb_offset");
  refuses(kBase + "[[strategy]]\npreset = \"fixed-enthalpy+dry-bulb\"\ndeadband = \"1F\"\n", 20,
          "strategy[1].deadband",
          "more than one quantity; give each its own deadband (dry_bulb_deadband, "
          "enthalpy_deadband)");
  refuses(kBase +
              "[[strategy]]\npreset = \"fixed-dry-bulb\"\ndeadband = \"1F\"\n"
              "dry_bulb_deadband = \"1F\"\n",
          21, "strategy[1].dry_bulb_deadband", "give deadband or dry_bulb_deadband, not both");
  refuses(kBase + "[[strategy]]\npreset = \"fixed-enthalpy\"\ndeadband = \"1F\"\n", 20,
          "strategy[1].deadband", "not an enthalpy difference");
  refuses(kBase + "[[strategy]]\npreset = \"fixed-wet-bulb\"\n", 19, "strategy[1].preset",
          "'fixed-wet-bulb' is not a preset (allowed: fixed-dry-bulb,");
  refuses(kBase + "[[strategy]]\npreset = \"fixed-dry-bulb\"\ndry_bulb_limit = \"170F\"\n", 20,
          "strategy[1].dry_bulb_limit", "170.0 °F is outside the allowed range (-40 °F to 140 °F)");
  refuses(kBase + "[[strategy]]\npreset = \"fixed-dry-bulb\"\ndeadband = \"-1F\"\n", 20,
          "strategy[1].deadband", "outside the allowed range");
  refuses(kBase + "[strategy]\npreset = \"fixed-dry-bulb\"\n", 18, "strategy",
          "must be an array of tables");
}

TEST_CASE("condition errors") {
  auto cond = [](const std::string& c) {
    return kBase + "[[strategy]]\nname = \"c\"\nconditions = [ " + c + " ]\n";
  };
  refuses(cond("{ quantity = \"wet-bulb\", limit = 60 }"), 20, "strategy[1].conditions[1].quantity",
          "allowed: dry-bulb, enthalpy, dew-point, humidity-ratio");
  refuses(cond("{ quantity = \"enthalpy\", reference = \"outdoor\", limit = 28 }"), 20,
          "strategy[1].conditions[1].reference", "allowed: fixed, return");
  refuses(cond("{ quantity = \"enthalpy\", offset = \"1btu/lb\" }"), 20,
          "strategy[1].conditions[1].offset", "a fixed condition takes limit, not offset");
  refuses(cond("{ quantity = \"enthalpy\", reference = \"return\", limit = 28 }"), 20,
          "strategy[1].conditions[1].limit", "takes offset");
  refuses(cond("{ quantity = \"dry-bulb\", limit = \"70F\" }, { quantity = \"dew-point\", limit "
               "= \"28btu/lb\" }"),
          20, "strategy[1].conditions[2].limit", "not a temperature");
  refuses(cond("{ quantity = \"humidity-ratio\", limit = \"0.2\" }"), 20,
          "strategy[1].conditions[1].limit", "outside the allowed range");
  refuses(kBase + "[[strategy]]\nname = \"c\"\nconditions = []\n", 20, "strategy[1].conditions",
          "non-empty");
  refuses(kBase +
              "[[strategy]]\nname = \"c\"\nconditions = [ { quantity = \"dry-bulb\", limit = "
              "70 } ]\ndeadband = \"1F\"\n",
          21, "strategy[1].deadband", "give each condition its own deadband");
  // A name as it is spelled in TOML keys is accepted: dew_point = dew-point.
  const UnitFile u =
      parse_unit_file(cond("{ quantity = \"dew_point\", limit = \"55F\" }"), "u.toml");
  CHECK(u.strategies[0].conditions[0].quantity == hl::Quantity::dew_point);
}

TEST_CASE("load_unit_file names a file it cannot open") {
  try {
    limitline::load_unit_file("/nonexistent/unit.toml");
    FAIL("opened a missing file");
  } catch (const InputError& e) {
    CHECK(std::string(e.what()) ==
          "/nonexistent/unit.toml: cannot open the unit file (No such file or directory)");
  }
}

TEST_CASE("the example unit files all read") {
  for (const char* name :
       {"office-humid-coast.toml", "lab-high-plateau.toml", "school-custom-conditions.toml"}) {
    INFO(name);
    const UnitFile u =
        limitline::load_unit_file(std::string(LIMITLINE_SOURCE_DIR) + "/examples/" + name);
    CHECK_FALSE(u.strategies.empty());
    CHECK_NOTHROW(air::validate(u.air_handler));
  }
}

// --- Air points ("68F/80%") ---------------------------------------------------------------

TEST_CASE("air points: dry-bulb with each humidity form") {
  using limitline::parse_air_point;
  const auto ip = limitline::units::System::ip;
  auto p = parse_air_point("68F/80%", ip, "--outdoor");
  CHECK(p.dry_bulb_c == doctest::Approx(20.0));
  CHECK(p.humidity_kind == psy::HumidityInput::relative_humidity);
  CHECK(p.humidity_value == doctest::Approx(0.8));
  p = parse_air_point("68/rh80", ip, "--outdoor");
  CHECK(p.humidity_value == doctest::Approx(0.8));
  p = parse_air_point("68F/dp58F", ip, "--outdoor");
  CHECK(p.humidity_kind == psy::HumidityInput::dew_point);
  CHECK(p.humidity_value == doctest::Approx((58 - 32) / 1.8));
  p = parse_air_point(" 68F / wb62F ", ip, "--outdoor");
  CHECK(p.humidity_kind == psy::HumidityInput::wet_bulb);
  p = parse_air_point("20C/w0.011", ip, "--outdoor");
  CHECK(p.dry_bulb_c == doctest::Approx(20.0));
  CHECK(p.humidity_kind == psy::HumidityInput::humidity_ratio);
  CHECK(p.humidity_value == doctest::Approx(0.011));
  p = parse_air_point("20C/W9.5g/kg", ip, "--outdoor");
  CHECK(p.humidity_value == doctest::Approx(0.0095));
  p = parse_air_point("68F/h28btu/lb", ip, "--outdoor");
  CHECK(p.humidity_kind == psy::HumidityInput::enthalpy);
  CHECK(p.humidity_value == doctest::Approx(47.26432));
  p = parse_air_point("20/dp10", limitline::units::System::si, "--outdoor");
  CHECK(p.humidity_value == doctest::Approx(10.0));

  auto bad = [&](const char* text, const char* detail) {
    try {
      (void)parse_air_point(text, ip, "--outdoor");
      FAIL("accepted ", text);
    } catch (const InputError& e) {
      const std::string m = e.what();
      INFO(m);
      CHECK(m.rfind("--outdoor", 0) == 0);
      CHECK(m.find(detail) != std::string::npos);
    }
  };
  bad("68F", "separated by '/'");
  bad("68F/", "nothing after '/'");
  bad("68F/hot", "is not a percentage");
  bad("68F/dp58btu/lb", "not a temperature");
  bad("warm/50%", "dry-bulb");
  // The state is checked against the pressure when it is resolved.
  const auto over = parse_air_point("68F/120%", ip, "--outdoor");
  CHECK_THROWS_WITH_AS(over.state(101.325, "--outdoor 68F/120%"),
                       doctest::Contains("--outdoor 68F/120%: relative humidity"), InputError);
  const auto dp = parse_air_point("68F/dp70F", ip, "--outdoor");
  CHECK_THROWS_AS(dp.state(101.325), InputError);
}

// --- Plausibility, separate from physical validity -----------------------------------------

namespace {
// kBase in SI, line for line (the [site] elevation becomes a bare length in metres).
std::string si_base() {
  std::string t = "units = \"si\"\n" + kBase;  // every line moves down by one
  return t;
}
}  // namespace

TEST_CASE(
    "a bare number plausible only in the other unit system is refused, naming both readings") {
  // Return air 10–40 °C and supply setpoint 5–25 °C are common practice; 75 °F is 23.9 °C.
  refuses(replace(si_base(), "return_air_temp = \"75F\"", "return_air_temp = 75"), 17,
          "air_handler.return_air_temp",
          "75 in an SI file is 75 °C, outside the plausible range of a return-air dry-bulb (10 °C "
          "to 40 °C, common practice); if you meant 75 °F write \"75F\"");
  refuses(replace(si_base(), "supply_airflow = \"12000cfm\"", "supply_airflow = 20000"), 9,
          "air_handler.supply_airflow", "if you meant 20000 cfm write \"20000cfm\"");
  // In an IP file "13" is 13 °F; the setpoint meant is 13 °C. The range is shown in °F.
  refuses(replace(kBase, "supply_air_temp = \"55F\"", "supply_air_temp = \"13\""), 9,
          "air_handler.supply_air_temp",
          "13 in an IP file is 13 °F, outside the plausible range "
          "of a supply-air setpoint (41 °F to 77 °F");
  // A dry-bulb high-limit of 24 °F is no setting; 24 °C is (common practice: 65–75 °F).
  refuses(kBase + R"(
[[strategy]]
preset = "fixed-dry-bulb"
dry_bulb_limit = 24
)",
          21, "strategy[1].dry_bulb_limit", "write \"24C\"");
}

TEST_CASE(
    "an implausible value written with its unit is kept, with a warning naming file, line and "
    "key") {
  const UnitFile u = parse_unit_file(
      replace(kBase, "return_air_temp = \"75F\"", "return_air_temp = \"45C\""), "unit.toml");
  CHECK(u.return_air.dry_bulb_c == 45.0);
  REQUIRE(u.warnings.size() == 1);
  CHECK(u.warnings[0].rfind("unit.toml:16: air_handler.return_air_temp: '45C' (113 °F) is outside "
                            "the plausible range of a return-air dry-bulb (50 °F to 104 °F, "
                            "common practice)",
                            0) == 0);
  // The shipped examples are plausible throughout.
  for (const char* f : {"office-humid-coast.toml", "lab-high-plateau.toml",
                        "school-custom-conditions.toml", "audit-office.toml"}) {
    INFO(f);
    CHECK(limitline::load_unit_file(std::string(LIMITLINE_SOURCE_DIR) + "/examples/" + f)
              .warnings.empty());
  }
}

TEST_CASE("magnitudes beyond any physical bound are refused, never inf or nan downstream") {
  refuses(replace(kBase, "supply_airflow = \"12000cfm\"", "supply_airflow = \"1e308cfm\""), 8,
          "air_handler.supply_airflow", "'1e308cfm' is beyond any physical airflow");
  refuses(replace(kBase, "supply_airflow = \"12000cfm\"", "supply_airflow = 1e308"), 8,
          "air_handler.supply_airflow", "beyond any physical airflow");
  refuses(replace(kBase, "return_air_temp = \"75F\"", "return_air_temp = \"-1000F\""), 16,
          "air_handler.return_air_temp", "beyond any physical temperature");
}

TEST_CASE("thousands separators in quantities") {
  for (const char* flow : {"\"20,000cfm\"", "\"20,000 cfm\""}) {
    INFO(flow);
    const UnitFile u = parse_unit_file(
        replace(kBase, "supply_airflow = \"12000cfm\"", std::string("supply_airflow = ") + flow),
        "unit.toml");
    CHECK(u.air_handler.supply_airflow_m3_per_s == doctest::Approx(20000 * kCfm));
  }
  refuses(replace(kBase, "supply_airflow = \"12000cfm\"", "supply_airflow = \"20,00cfm\""), 8,
          "air_handler.supply_airflow", "commas in a number must group its digits by three");
}

TEST_CASE("documented end points are inside, and a range error names the key's own line") {
  // fan_heat: 0 up to 20 K (36 °F); supply_air_temp: -40 °C to 60 °C (README).
  UnitFile u =
      parse_unit_file(replace(kBase, "fan_heat = \"1.5F\"", "fan_heat = \"36F\""), "u.toml");
  CHECK(u.air_handler.fan_heat_k == 20.0);
  u = parse_unit_file(replace(kBase, "supply_air_temp = \"55F\"", "supply_air_temp = \"-40C\""),
                      "u.toml");
  CHECK(u.air_handler.supply_air_temp_c == -40.0);
  CHECK_FALSE(u.warnings.empty());  // valid, but no supply setpoint a cooling unit uses
  // dew_point_limit: -76 °F to 104 °F; dry_bulb_offset ±27 °F; enthalpy_offset ±35 kJ/kg.
  u = parse_unit_file(kBase + R"(
[[strategy]]
preset = "fixed-dew-point+dry-bulb"
dew_point_limit = "-76F"
dry_bulb_limit = "140F"

[[strategy]]
preset = "differential-enthalpy"
enthalpy_offset = "-35kJ/kg"
)",
                      "u.toml");
  CHECK(u.strategies[0].conditions[0].limit == -60.0);
  CHECK(u.strategies[0].conditions[1].limit == 60.0);
  CHECK(u.strategies[1].conditions[0].limit == -35.0);
  u = parse_unit_file(replace(kBase, "elevation = \"850ft\"", "elevation = \"-500m\""), "u.toml");
  CHECK(*u.site.elevation_m == -500.0);

  refuses(replace(kBase, "fan_heat = \"1.5F\"", "fan_heat = \"36.1F\""), 10, "air_handler.fan_heat",
          "is outside the allowed range (0 °F to 36 °F)");
  refuses(replace(kBase, "supply_air_temp = \"55F\"", "supply_air_temp = \"-41C\""), 9,
          "air_handler.supply_air_temp", "outside the allowed range (-40 °F to 140 °F)");
}

TEST_CASE("messages of an IP file are in °F, and offending names are echoed safely") {
  refuses(replace(kBase, "return_air_rh = \"50%\"", "return_air_dew_point = \"80F\""), 17,
          "air_handler.return_air_dew_point", "dew point 80 °F is above the dry-bulb 75 °F");
  refuses(replace(kBase, "fan_position = \"draw-through\"", "fan_position = \"up\\u001b[2Jwards\""),
          11, "air_handler.fan_position", "'up\\x1b[2Jwards' is not allowed");
}

TEST_CASE("TOML nested beyond 64 levels is refused before the parser sees it") {
  const auto refused = [](const std::string& text, const std::string& detail) {
    try {
      parse_unit_file(text, "deep.toml");
      FAIL("accepted");
    } catch (const InputError& e) {
      INFO(e.what());
      CHECK(std::string(e.what()).rfind("deep.toml:" + detail, 0) == 0);
      CHECK(std::string(e.what()).find("nested more than 64 levels deep") != std::string::npos);
    }
  };
  std::string dotted;
  for (int i = 0; i < 50000; ++i) dotted += i ? ".a" : "a";
  refused("[" + dotted + "]\n", "1:");           // a table header
  refused("x = 1\n" + dotted + " = 1\n", "2:");  // a dotted key
  refused("a = " + std::string(50000, '[') + std::string(50000, ']') + "\n", "1:");  // arrays
  std::string inline_tables = "a = ";
  for (int i = 0; i < 50000; ++i) inline_tables += "{b = ";
  refused(inline_tables + "1" + std::string(50000, '}') + "\n", "1:");
  // Depth in strings and comments does not count; a shallow file reaches the reader's checks.
  const std::string quoted = "# [" + dotted + "]\n[site]\nname = \"" + dotted + "\"\n";
  try {
    parse_unit_file(quoted, "deep.toml");
    FAIL("accepted");
  } catch (const InputError& e) {
    CHECK(std::string(e.what()).find("[air_handler] is missing") != std::string::npos);
  }
}

// --- The part-load inputs: [loads], the part-load keys of [air_handler], [plant] ----------

namespace {

namespace pl = limitline::part_load;

// 1 W = 3.412141633 Btu/h (international-table Btu, NIST SP 811 B.8; from memory).
constexpr double kKwPerKbtuh = 1.0 / 3.412141633;

// kBase with variable airflow and the smallest [loads]: line 18 onwards.
const std::string kPartLoad = kBase + R"(airflow_control = "variable"
[loads]
space_temp = "75F"
internal_sensible = "150kBtu/h"
)";

bool has(const std::vector<std::string>& warnings, const std::string& start,
         const std::string& part) {
  for (const std::string& w : warnings)
    if (w.rfind(start, 0) == 0 && w.find(part) != std::string::npos) return true;
  INFO("no warning starting '", start, "' with '", part, "' among ", warnings.size());
  return false;
}

}  // namespace

TEST_CASE("part-load keys, [loads] coefficients and [plant] read into SI") {
  const std::string text = kBase + R"(airflow_control = "variable"
min_airflow = "40%"
airflow_basis = "actual"
supply_air_reset = { outdoor_low = "50F", supply_at_low = "60F", outdoor_high = "65F", supply_at_high = "55F" }
[loads]
space_temp = "75F"
return_air_rise = "1F"
internal_sensible = "150kBtu/h"
envelope_ua = "3kBtu/h/F"
latent = "40kBtu/h"
[plant]
cooling_cop = 3.5
heating_efficiency = 0.9
electricity_price = 0.12
heating_price = 0.04
currency = "EUR"
)";
  const UnitFile u = parse_unit_file(text, "unit.toml");
  CHECK(u.warnings.empty());
  CHECK(u.control.airflow == pl::AirflowControl::variable);
  CHECK(u.control.min_airflow_fraction == doctest::Approx(0.4));
  CHECK(u.control.basis == pl::AirflowBasis::actual);
  CHECK_FALSE(u.control.min_outdoor_airflow_m3_per_s);  // a percentage minimum
  REQUIRE(u.control.reset);
  // °C = (°F − 32)/1.8 (NIST SP 811, exact).
  CHECK(u.control.reset->outdoor_low_c == doctest::Approx(10.0));
  CHECK(u.control.reset->supply_at_low_c == doctest::Approx((60.0 - 32.0) / 1.8));
  CHECK(u.control.reset->outdoor_high_c == doctest::Approx((65.0 - 32.0) / 1.8));
  CHECK(u.control.reset->supply_at_high_c == doctest::Approx((55.0 - 32.0) / 1.8));
  REQUIRE(u.space);
  CHECK(u.space->space_temp_c == doctest::Approx((75.0 - 32.0) / 1.8));
  CHECK(u.space->return_air_rise_k == doctest::Approx(1.0 / 1.8));
  REQUIRE(u.space->coefficients);
  const pl::LoadCoefficients& k = *u.space->coefficients;
  CHECK(k.internal_sensible_kw == doctest::Approx(150.0 * kKwPerKbtuh));
  // 1 Btu/h·°F = 1.8/3.412141633 W/K (the two factors above; 1 K = 1.8 °F).
  CHECK(k.envelope_ua_kw_per_k == doctest::Approx(3.0 * 1.8 * kKwPerKbtuh));
  CHECK(k.latent_kw == doctest::Approx(40.0 * kKwPerKbtuh));
  CHECK_FALSE(u.loads_file);
  REQUIRE(u.plant);
  CHECK(u.plant->cooling_cop == 3.5);
  CHECK(u.plant->heating_efficiency == 0.9);
  CHECK(u.plant->electricity_price == 0.12);
  CHECK(u.plant->heating_price == 0.04);
  CHECK(u.plant->currency == "EUR");
  // A kWh of coil cooling costs the price of the electricity that makes it, 0.12/3.5; a kWh
  // of heating the fuel's, 0.04/0.9 (hand calculation from the definitions of COP and
  // efficiency, common practice).
  // The cost weights are the plant's (currency per kWh of coil load); the energy weights stay.
  CHECK(u.plant->cost_weights().cooling == doctest::Approx(0.12 / 3.5));
  CHECK(u.plant->cost_weights().heating == doctest::Approx(0.04 / 0.9));
  CHECK(u.weights.cooling == 1.0);
  CHECK(u.weights.heating == 1.0);
}

TEST_CASE("an SI file: a loads file, a fixed ventilation airflow, kW per ton and a percentage") {
  const std::string text = R"toml(units = "si"
[air_handler]
supply_airflow = 6.0
supply_air_temp = 13
min_outdoor_airflow = 1.5
return_air_temp = 24
return_air_dew_point = 8
airflow_control = "variable"
[loads]
space_temp = 24
file = "loads/hourly.csv"
sensible = { column = "Sensible (kW)" }
latent = { column = " Latent ", unit = "kBtu/h" }
time_convention = "hour-ending"
[plant]
cooling_kw_per_ton = 1.0
heating_efficiency = "90%"
electricity_price = 0.2
heating_price = "0.08"
)toml";
  const UnitFile u = parse_unit_file(text, "si.toml");
  CHECK(u.warnings.empty());
  CHECK(u.air_handler.min_oa_fraction == doctest::Approx(0.25));
  REQUIRE(u.min_outdoor_airflow_m3_per_s);
  CHECK(*u.min_outdoor_airflow_m3_per_s == 1.5);
  REQUIRE(u.control.min_outdoor_airflow_m3_per_s);
  CHECK(*u.control.min_outdoor_airflow_m3_per_s == 1.5);
  CHECK(u.control.min_airflow_fraction == doctest::Approx(0.3));  // the default
  CHECK(u.control.basis == pl::AirflowBasis::standard);
  REQUIRE(u.space);
  CHECK(u.space->space_temp_c == 24.0);
  CHECK(u.space->return_air_rise_k == 0.0);
  CHECK_FALSE(u.space->coefficients);
  REQUIRE(u.loads_file);
  const UnitFile::LoadsFile& f = *u.loads_file;
  CHECK(f.path == "loads/hourly.csv");  // as written; the app layer resolves it
  CHECK(f.origin == "si.toml:11: loads.file");
  CHECK(f.sensible_column == "Sensible (kW)");
  CHECK(f.sensible_unit.empty());  // from the header
  CHECK(f.sensible_origin == "si.toml:12: loads.sensible");
  CHECK(f.latent_column == "Latent");
  CHECK(f.latent_unit == "kBtu/h");
  CHECK(f.latent_origin == "si.toml:13: loads.latent");
  CHECK(f.time_convention == limitline::weather::TimeConvention::hour_ending);
  REQUIRE(u.plant);
  // A ton is 12,000 Btu/h = 3.516852842 kW (common practice; 1 W = 3.412141633 Btu/h).
  CHECK(u.plant->cooling_cop == doctest::Approx(12.0 * kKwPerKbtuh));
  CHECK(u.plant->heating_efficiency == doctest::Approx(0.9));
  CHECK(u.plant->heating_price == 0.08);
  CHECK(u.plant->currency == "USD");
}

TEST_CASE("without the part-load tables nothing changes: design airflow, [energy] weights") {
  const UnitFile u = parse_unit_file(kBase + "[energy]\nheating_weight = 0.5\n", "unit.toml");
  CHECK(u.control.airflow == pl::AirflowControl::constant);
  CHECK(u.control.basis == pl::AirflowBasis::standard);
  CHECK_FALSE(u.control.reset);
  CHECK_FALSE(u.control.min_outdoor_airflow_m3_per_s);
  CHECK_FALSE(u.space);
  CHECK_FALSE(u.loads_file);
  CHECK_FALSE(u.plant);
  CHECK(u.weights.cooling == 1.0);
  CHECK(u.weights.heating == 0.5);
  // Constant airflow with a space is the design airflow with the space's return air.
  const UnitFile c = parse_unit_file(
      kBase + "[loads]\nspace_temp = \"24C\"\ninternal_sensible = \"40kW\"\n", "unit.toml");
  REQUIRE(c.space);
  CHECK(c.control.airflow == pl::AirflowControl::constant);
}

TEST_CASE("part-load keys of [air_handler]: every error names its line and key") {
  refuses(kBase + "min_airflow = \"30%\"\n", 18, "air_handler.min_airflow",
          "is the floor of variable airflow; with constant airflow control");
  refuses(kBase + "airflow_control = \"constant\"\nmin_airflow = \"30%\"\n", 19,
          "air_handler.min_airflow", "set airflow_control = \"variable\"");
  refuses(replace(kPartLoad, "[loads]", "min_airflow = \"0%\"\n[loads]"), 19,
          "air_handler.min_airflow", "0.0% is not allowed (above 0%, up to 100%)");
  refuses(replace(kPartLoad, "[loads]", "min_airflow = \"120%\"\n[loads]"), 19,
          "air_handler.min_airflow", "120.0% is outside the allowed range (above 0%, up to 100%)");
  refuses(replace(kPartLoad, "[loads]", "min_airflow = \"30F\"\n[loads]"), 19,
          "air_handler.min_airflow", "which is not a percentage");
  refuses(kBase + "airflow_control = \"variable\"\n", 18, "air_handler.airflow_control",
          "\"variable\" needs a [loads] table: the airflow follows the space load");
  refuses(kBase + "airflow_control = \"ramp\"\n", 18, "air_handler.airflow_control",
          "'ramp' is not allowed (allowed: constant, variable)");
  refuses(kBase + "airflow_basis = \"normal\"\n", 18, "air_handler.airflow_basis",
          "allowed: standard, actual");
  refuses(kBase + "airflow_basis = 1\n", 18, "air_handler.airflow_basis", "must be a string");
}

TEST_CASE("supply_air_reset: four temperatures, a line rising with the outdoor air") {
  const auto reset = [](const std::string& points) {
    return kBase + "supply_air_reset = { " + points + " }\n";
  };
  const UnitFile u = parse_unit_file(reset("outdoor_low = \"10C\", supply_at_low = \"16C\", "
                                           "outdoor_high = \"18C\", supply_at_high = \"13C\""),
                                     "unit.toml");
  REQUIRE(u.control.reset);
  CHECK(u.control.reset->supply_at_low_c == 16.0);
  CHECK(u.control.airflow == pl::AirflowControl::constant);  // a reset needs no variable airflow
  refuses(reset("outdoor_low = \"50F\", supply_at_low = \"60F\", outdoor_high = \"65F\""), 18,
          "air_handler.supply_air_reset.supply_at_high", "all four points of the reset");
  refuses(reset("outdoor_low = \"50F\", supply_at_low = \"60F\", outdoor_high = \"65F\", "
                "supply_at_high = \"55F\", at_mid = \"57F\""),
          18, "air_handler.supply_air_reset.at_mid",
          "unknown key in supply_air_reset (allowed: outdoor_low, supply_at_low, outdoor_high, "
          "supply_at_high)");
  refuses(reset("outdoor_low = \"65F\", supply_at_low = \"60F\", outdoor_high = \"65F\", "
                "supply_at_high = \"55F\""),
          18, "air_handler.supply_air_reset.outdoor_high",
          "65.0 °F is not above outdoor_low 65.0 °F");
  refuses(reset("outdoor_low = \"50F\", supply_at_low = \"28btu/lb\", outdoor_high = \"65F\", "
                "supply_at_high = \"55F\""),
          18, "air_handler.supply_air_reset.supply_at_low", "not a temperature");
  refuses(reset("outdoor_low = \"50F\", supply_at_low = \"150F\", outdoor_high = \"65F\", "
                "supply_at_high = \"55F\""),
          18, "air_handler.supply_air_reset.supply_at_low",
          "outside the allowed range (-40 °F to 140 °F)");
  refuses(kBase + "supply_air_reset = \"55F\"\n", 18, "air_handler.supply_air_reset",
          "must be a table");
}

TEST_CASE("[loads]: the space, and its loads as coefficients or from a file, not both") {
  refuses(kBase + "[loads]\ninternal_sensible = \"150kBtu/h\"\n", 18, "loads.space_temp",
          "required key is missing (the space cooling setpoint, e.g. space_temp = \"75F\")");
  refuses(kBase + "[loads]\nspace_temp = \"75F\"\n", 18, "loads.internal_sensible",
          "or file = \"loads.csv\"");
  // Both forms: the error is at the coefficient and names the file's line.
  refuses(kPartLoad + "file = \"loads.csv\"\nsensible = { column = \"S\" }\n", 21,
          "loads.internal_sensible",
          "give the load coefficients or an hourly file, not both (file is on line 22)");
  refuses(kBase + "[loads]\nspace_temp = \"75F\"\nenvelope_ua = \"3kBtu/h/F\"\nfile = \"l.csv\"\n",
          20, "loads.envelope_ua", "not both (file is on line 21)");
  refuses(kBase + "[loads]\nspace_temp = \"75F\"\nfile = \"l.csv\"\n", 18, "loads.sensible",
          "required key is missing (the file's sensible-load column");
  refuses(kBase +
              "[loads]\nspace_temp = \"75F\"\nfile = \"l.csv\"\nsensible = { column = \"S\" "
              "}\nlatent = \"40kBtu/h\"\n",
          22, "loads.latent", "with file, latent names a column of the file");
  refuses(kPartLoad + "sensible = { column = \"S\" }\n", 22, "loads.sensible",
          "belongs to an hourly loads file");
  refuses(kPartLoad + "time_convention = \"hour-ending\"\n", 22, "loads.time_convention",
          "belongs to an hourly loads file");
  refuses(kPartLoad + "latent = { column = \"L\" }\n", 22, "loads.latent",
          "a column table belongs to an hourly loads file");
  refuses(kPartLoad + "colour = \"blue\"\n", 22, "loads.colour", "unknown key in [loads]");
  refuses(kBase + "loads = 3\n", 18, "air_handler.loads", "unknown key in [air_handler]");
  refuses("loads = 3\n" + kBase, 1, "loads", "must be a table ([loads])");
}

TEST_CASE("[loads] file form: the column tables and the time convention") {
  const std::string file = kBase + "[loads]\nspace_temp = \"75F\"\nfile = \"l.csv\"\n";  // 18–20
  refuses(file + "sensible = { column = \"S\", units = \"kW\" }\n", 21, "loads.sensible.units",
          "unknown key in a loads column (allowed: column, unit)");
  refuses(file + "sensible = { unit = \"kW\" }\n", 21, "loads.sensible.column",
          "required key is missing");
  refuses(file + "sensible = { column = \"  \" }\n", 21, "loads.sensible.column",
          "must not be empty");
  refuses(file + "sensible = { column = \"S\", unit = \"kWh\" }\n", 21, "loads.sensible.unit",
          "'kWh' is not a unit of power (allowed: kw, w, btu/h, kbtu/h, ton)");
  refuses(file + "sensible = \"S\"\n", 21, "loads.sensible", "must be a table");
  refuses(file + "sensible = { column = \"S\" }\nlatent = { column = 3 }\n", 22,
          "loads.latent.column", "must be a string");
  refuses(file + "sensible = { column = \"S\" }\ntime_convention = \"midday\"\n", 22,
          "loads.time_convention",
          "'midday' is not a time convention (allowed: automatic, hour-beginning, hour-ending)");
  refuses(replace(file, "file = \"l.csv\"", "file = \" \""), 20, "loads.file", "must not be empty");
  refuses(replace(file, "file = \"l.csv\"", "file = 7"), 20, "loads.file", "must be a string");
}

TEST_CASE("[loads] values: ranges, kinds, and the supply air that must carry the space's heat") {
  refuses(replace(kPartLoad, "space_temp = \"75F\"", "space_temp = \"55F\""), 20,
          "loads.space_temp",
          "55.0 °F is not above the warmest supply air 55.0 °F (air_handler.supply_air_temp, "
          "line 9); the supply air could not carry the space's heat");
  // With a reset the warmest supply air is the reset's.
  refuses(replace(kPartLoad, "[loads]",
                  "supply_air_reset = { outdoor_low = \"50F\", supply_at_low = \"76F\", "
                  "outdoor_high = \"65F\", supply_at_high = \"55F\" }\n[loads]"),
          21, "loads.space_temp",
          "75.0 °F is not above the warmest supply air 76.0 °F (air_handler.supply_air_reset, "
          "line 19)");
  refuses(replace(kPartLoad, "space_temp = \"75F\"", "space_temp = \"150F\""), 20,
          "loads.space_temp", "outside the allowed range (41 °F to 113 °F)");
  refuses(replace(kPartLoad, "space_temp = \"75F\"", "space_temp = \"28btu/lb\""), 20,
          "loads.space_temp", "not a temperature");
  refuses(kPartLoad + "return_air_rise = \"-1F\"\n", 22, "loads.return_air_rise",
          "outside the allowed range (0 °F to 18 °F)");
  refuses(kPartLoad + "envelope_ua = \"3kBtu/h\"\n", 22, "loads.envelope_ua",
          "which is not a conductance");
  refuses(kPartLoad + "envelope_ua = \"-1kW/K\"\n", 22, "loads.envelope_ua",
          "beyond any physical conductance");
  refuses(kPartLoad + "latent = \"-5kW\"\n", 22, "loads.latent", "outside the allowed range");
  refuses(replace(kPartLoad, "internal_sensible = \"150kBtu/h\"", "internal_sensible = \"150F\""),
          21, "loads.internal_sensible", "which is not a power");
  refuses(replace(kPartLoad, "internal_sensible = \"150kBtu/h\"", "internal_sensible = \"1e6kW\""),
          21, "loads.internal_sensible", "outside the allowed range");
  // A bare number plausible only in the other system: 500 kW/K is no space, 500 kBtu/h·°F is.
  refuses("units = \"si\"\n" + kPartLoad + "envelope_ua = 500\n", 23, "loads.envelope_ua",
          "500 in an SI file is 500 kW/K, outside the plausible range of the envelope "
          "conductance of one space (0 kW/K to 300 kW/K, common practice); if you meant "
          "500 kBtu/h·°F write \"500kBtu/h/F\"");
}

TEST_CASE("a latent gain needs outdoor air to leave by") {
  const std::string no_oa =
      replace(kPartLoad, "min_outdoor_air = \"25%\"", "min_outdoor_air = \"0%\"");
  refuses(no_oa + "latent = \"40kBtu/h\"\n", 22, "loads.latent",
          "a latent gain with no outdoor air (min_outdoor_air = 0%, line 12): the space's "
          "moisture would have no way out but the coil");
  refuses(replace(no_oa, "min_outdoor_air = \"0%\"", "min_outdoor_airflow = \"0cfm\"") +
              "latent = \"40kBtu/h\"\n",
          22, "loads.latent", "(min_outdoor_airflow = 0, line 12)");
  refuses(kBase.substr(0, kBase.find("min_outdoor_air")) + "min_outdoor_air = \"0%\"" +
              kBase.substr(kBase.find("\nmax_outdoor_air")) +
              "[loads]\nspace_temp = \"75F\"\nfile = \"l.csv\"\nsensible = { column = \"S\" }\n"
              "latent = { column = \"L\" }\n",
          22, "loads.latent", "a latent gain with no outdoor air");
  // No latent gain, or a ventilation minimum: accepted.
  CHECK_NOTHROW(parse_unit_file(no_oa + "latent = \"0kW\"\n", "unit.toml"));
  CHECK_NOTHROW(parse_unit_file(no_oa, "unit.toml"));
  CHECK_NOTHROW(parse_unit_file(kPartLoad + "latent = \"40kBtu/h\"\n", "unit.toml"));
}

TEST_CASE("[plant]: one cooling efficiency, both prices, and not with [energy]") {
  const std::string plant = kBase + "[plant]\n";  // line 18
  const std::string prices = "electricity_price = 0.12\nheating_price = 0.04\n";
  refuses(plant + "cooling_cop = 3.5\ncooling_kw_per_ton = 1.0\n" + prices, 20,
          "plant.cooling_kw_per_ton",
          "give cooling_cop or cooling_kw_per_ton, not both "
          "(cooling_cop is on line 19)");
  refuses(plant + prices, 18, "plant.cooling_cop",
          "required key is missing (the cooling plant's efficiency: cooling_cop = 3.5 or "
          "cooling_kw_per_ton = 1.0)");
  refuses(plant + "cooling_cop = 3.5\nelectricity_price = 0.12\n", 18, "plant.heating_price",
          "required key is missing");
  refuses(plant + "cooling_cop = 25\n" + prices, 19, "plant.cooling_cop",
          "25 is outside the allowed range (0.05 to 20)");
  refuses(plant + "cooling_kw_per_ton = 0.1\n" + prices, 19, "plant.cooling_kw_per_ton",
          "outside the allowed range (0.18 to 70 kW per ton");
  refuses(plant + "cooling_cop = \"high\"\n" + prices, 19, "plant.cooling_cop",
          "'high' is not a number");
  refuses(plant + "cooling_cop = 3.5\nheating_efficiency = 0\n" + prices, 20,
          "plant.heating_efficiency", "outside the allowed range (above 0, up to 6)");
  refuses(plant + "cooling_cop = 3.5\nheating_efficiency = \"700%\"\n" + prices, 20,
          "plant.heating_efficiency", "700.0% is outside the allowed range (above 0, up to 600%)");
  refuses(plant + "cooling_cop = 3.5\nelectricity_price = -0.1\nheating_price = 0.04\n", 20,
          "plant.electricity_price", "-0.1 is outside the allowed range (0 to 100 per kWh)");
  refuses(plant + "cooling_cop = 3.5\n" + prices + "fuel = \"gas\"\n", 22, "plant.fuel",
          "unknown key in [plant]");
  // The plant's own validation, raised at the line of the field it names.
  refuses(plant + "cooling_cop = 3.5\n" + prices + "currency = \"U$D\"\n", 22, "plant.currency",
          "'U$D' is not allowed (1 to 8 letters, e.g. USD)");
  refuses(plant + "cooling_cop = 3.5\nelectricity_price = 0\nheating_price = 0\n", 18, "plant",
          "electricity_price and heating_price are both 0");
  refuses(kBase + "[energy]\ncooling_weight = 1\n[plant]\ncooling_cop = 3.5\n" + prices, 20,
          "plant", "give [plant] (cost) or [energy] (weights), not both ([energy] is on line 18)");
}

TEST_CASE("implausible part-load values are used, each with a warning naming file, line, key") {
  const std::string text = kBase + R"(airflow_control = "variable"
min_airflow = "5%"
supply_air_reset = { outdoor_low = "50F", supply_at_low = "30F", outdoor_high = "65F", supply_at_high = "55F" }
[loads]
space_temp = "88F"
return_air_rise = "8F"
internal_sensible = "20000kBtu/h"
envelope_ua = "1000kBtu/h/F"
latent = "6000kBtu/h"
[plant]
cooling_cop = 12
heating_efficiency = 3.2
electricity_price = 2
heating_price = 0
)";
  const UnitFile u = parse_unit_file(text, "unit.toml");
  // Each is inside its allowed range and used as written.
  CHECK(u.control.min_airflow_fraction == doctest::Approx(0.05));
  CHECK(u.plant->heating_efficiency == 3.2);
  CHECK(u.space->space_temp_c == doctest::Approx((88.0 - 32.0) / 1.8));
  // The bands are common practice (src/model/plausible.cpp).
  const auto& w = u.warnings;
  CHECK(w.size() == 11);
  CHECK(has(w, "unit.toml:19: air_handler.min_airflow: '5%'", "a variable-airflow minimum"));
  CHECK(has(w, "unit.toml:20: air_handler.supply_air_reset.supply_at_low: '30F'",
            "a supply-air setpoint (41 °F to 77 °F"));
  CHECK(has(w, "unit.toml:22: loads.space_temp: '88F'",
            "a space cooling setpoint (64.4 °F to 86 °F"));
  CHECK(has(w, "unit.toml:23: loads.return_air_rise: '8F'", "a return-air rise above the space"));
  CHECK(has(w, "unit.toml:24: loads.internal_sensible: '20000kBtu/h'",
            "the sensible gains of one unit's space"));
  CHECK(has(w, "unit.toml:25: loads.envelope_ua: '1000kBtu/h/F'",
            "the envelope conductance of one space"));
  CHECK(has(w, "unit.toml:26: loads.latent: '6000kBtu/h'", "the latent gains of one unit's space"));
  CHECK(has(w,
            "unit.toml:28: plant.cooling_cop: 12 is outside the plausible range of a cooling "
            "COP (1.5 to 10, common practice); used as written",
            ""));
  CHECK(has(w,
            "unit.toml:29: plant.heating_efficiency: 3.2 is outside the plausible range of a "
            "heating efficiency (0.5 to 1, common practice); a heat pump's COP? (heating_price "
            "is then per kWh of electricity); used as written",
            ""));
  CHECK(has(w, "unit.toml:30: plant.electricity_price: 2 is outside", "a price per kWh"));
  CHECK(has(w, "unit.toml:31: plant.heating_price: 0 is outside", "a price per kWh (0.01 to 1"));
  // Inside their bands: no word (the first test's file has none either).
  CHECK(parse_unit_file(kPartLoad, "unit.toml").warnings.empty());
}

TEST_CASE("the README's unit file example reads, part-load tables and all, without a warning") {
  std::ifstream in(std::string(LIMITLINE_SOURCE_DIR) + "/README.md");
  std::string line, example;
  bool section = false, inside = false;
  while (std::getline(in, line)) {
    if (line == "## The unit file") section = true;
    if (!section) continue;
    if (!inside && line == "```toml") {
      inside = true;
      continue;
    }
    if (inside && line == "```") break;
    if (inside) example += line + "\n";
  }
  REQUIRE_FALSE(example.empty());
  const UnitFile u = parse_unit_file(example, "README.md");
  CHECK(u.warnings.empty());
  CHECK(u.control.airflow == limitline::part_load::AirflowControl::variable);
  REQUIRE(u.space);
  CHECK(u.space->coefficients);
  CHECK(u.plant);
  CHECK(u.strategies.size() == 2);
}

// --- Cooling capacity and the energy code's defaults ----------------------------------------

TEST_CASE("design_cooling_capacity: a power, bare numbers in the file's system, plausible band") {
  const auto with = [](const std::string& line) {
    return replace(kBase, "return_air_rh = \"50%\"\n", "return_air_rh = \"50%\"\n" + line + "\n");
  };
  // 1 W = 3.412141633 Btu/h (NIST SP 811); a bare number in an IP file is kBtu/h.
  const UnitFile a = parse_unit_file(with("design_cooling_capacity = \"60kBtu/h\""), "unit.toml");
  REQUIRE(a.design_cooling_capacity_kw);
  CHECK(*a.design_cooling_capacity_kw == doctest::Approx(60.0 / 3.412141633));
  CHECK(a.design_cooling_capacity_origin == "unit.toml:18: air_handler.design_cooling_capacity");
  CHECK(a.warnings.empty());
  const UnitFile b = parse_unit_file(with("design_cooling_capacity = 60"), "unit.toml");
  CHECK(*b.design_cooling_capacity_kw == doctest::Approx(60.0 / 3.412141633));
  const UnitFile t = parse_unit_file(with("design_cooling_capacity = \"5ton\""), "unit.toml");
  CHECK(*t.design_cooling_capacity_kw == doctest::Approx(5 * 3.516852842));  // 12,000 Btu/h
  // Outside 3–3000 kW (common practice for one unit): used, with a warning naming the key.
  const UnitFile small = parse_unit_file(with("design_cooling_capacity = \"1kW\""), "unit.toml");
  REQUIRE(small.warnings.size() == 1);
  CHECK(small.warnings[0].find("unit.toml:18: air_handler.design_cooling_capacity") == 0);
  refuses(with("design_cooling_capacity = \"0kW\""), 18, "air_handler.design_cooling_capacity",
          "more than 0");
  refuses(with("design_cooling_capacity = \"-5kW\""), 18, "air_handler.design_cooling_capacity",
          "outside the allowed range");
  refuses(with("design_cooling_capacity = \"60F\""), 18, "air_handler.design_cooling_capacity", "");
  const UnitFile none = parse_unit_file(kBase, "unit.toml");
  CHECK_FALSE(none.design_cooling_capacity_kw);
}

TEST_CASE("the cooling capacity is the key's, else an estimate from airflow and return air") {
  // Invented SI unit: 5 m³/s, coil leaving 13 °C, return air 24 °C with W = 0.008.
  const std::string text = R"(units = "si"
[air_handler]
supply_airflow = 5
supply_air_temp = 13
min_outdoor_air = "20%"
return_air_temp = 24
return_air_humidity_ratio = 0.008
)";
  const UnitFile u = parse_unit_file(text, "si.toml");
  const auto c = limitline::cooling_capacity(u);
  CHECK(c.estimated);
  CHECK(c.basis.find("estimated from the supply airflow") == 0);
  // Hand calculation, ASHRAE Fundamentals ch. 1 eq. 32: h = 1.006 t + W (2501 + 1.86 t). The
  // return air's dew point (about 10.7 °C, eqs. 20 and 38) is below 13 °C, so the coil is dry
  // and W is unchanged: Δh = (1.006 + 1.86 W)(24 − 13). Mass flow at standard air, 1.204 kg/m³
  // (common practice): ṁ = 5 × 1.204 kg/s.
  const double dh = (1.006 + 1.86 * 0.008) * (24.0 - 13.0);
  CHECK(c.kw == doctest::Approx(5 * 1.204 * dh).epsilon(1e-6));
  const UnitFile g = parse_unit_file(text + "design_cooling_capacity = 80\n", "si.toml");
  const auto given = limitline::cooling_capacity(g);
  CHECK_FALSE(given.estimated);
  CHECK(given.kw == 80.0);
  CHECK(given.basis == "si.toml:8: air_handler.design_cooling_capacity");
}

TEST_CASE("presets left unset take the [site] code's values; without a code, common practice") {
  // kBase names ANSI/ASHRAE/IES 90.1-2019, zone 4A: its fixed dry-bulb limit is 65 °F (Table
  // 6.5.1.1.3, from memory) where common practice is 75 °F.
  const UnitFile coded = parse_unit_file(kBase, "unit.toml");
  const auto with_code = limitline::strategies_or_presets(coded);
  REQUIRE(with_code.size() == hl::presets().size());
  const auto& fdb = with_code[0];
  REQUIRE(fdb.preset == "fixed-dry-bulb");
  CHECK(fdb.conditions[0].limit == doctest::Approx((65 - 32) / 1.8));
  CHECK(fdb.source(0) == hl::SettingSource::code);
  CHECK(fdb.code_source.find("ANSI/ASHRAE/IES Standard 90.1-2019 zone 4A") == 0);

  const std::string no_code = replace(replace(kBase, "energy_code = \"ashrae-90.1-2019\"\n", ""),
                                      "climate_zone = \"4A\"\n", "");
  const auto plain = limitline::strategies_or_presets(parse_unit_file(no_code, "unit.toml"));
  CHECK(plain[0].conditions[0].limit == doctest::Approx((75 - 32) / 1.8));
  CHECK(plain[0].source(0) == hl::SettingSource::common_practice);
  CHECK(plain[0].code_source.empty());

  // A [[strategy]] preset keeps what it writes, and takes the code's value for what it omits.
  const std::string blocks = kBase + R"(
[[strategy]]
name = "written"
preset = "fixed-dry-bulb"
dry_bulb_limit = "72F"

[[strategy]]
name = "left out"
preset = "fixed-dry-bulb"
deadband = "1F"
)";
  const auto s = limitline::strategies_or_presets(parse_unit_file(blocks, "unit.toml"));
  REQUIRE(s.size() == 2);
  CHECK(s[0].conditions[0].limit == doctest::Approx((72 - 32) / 1.8));
  CHECK(s[0].source(0) == hl::SettingSource::written);
  CHECK(s[1].conditions[0].limit == doctest::Approx((65 - 32) / 1.8));
  CHECK(s[1].conditions[0].deadband == doctest::Approx(1 / 1.8));
  CHECK(s[1].source(0) == hl::SettingSource::code);

  // A site naming an edition that is not loaded is refused with the key's line.
  const std::string bad = replace(kBase, "ashrae-90.1-2019", "ashrae-90.1-2099");
  try {
    (void)limitline::strategies_or_presets(parse_unit_file(bad, "unit.toml"));
    FAIL("no InputError");
  } catch (const InputError& e) {
    CHECK(std::string(e.what()).find("unit.toml:4: site.energy_code") == 0);
  }
}
