// The part-load model from the command line: the unit file's [loads], part-load
// [air_handler] keys and [plant] reach `limitline year`, the report says which model ran, the
// figures turn into a cost, and an hourly loads file prices the year exactly as the
// coefficients that wrote it.
// Weather: tests/data/greensboro-nc-tmy3.csv (NREL NSRDB TMY3 via pvlib; tests/data/SOURCES.md).
// The unit files and loads are invented inputs of the test, not check values.
#include "support/cli.hpp"

#include <algorithm>
#include <fstream>
#include <string>

using limitline::test::contains;
using limitline::test::run_cli;
using limitline::test::scratch_dir;

namespace {

const char* kUnit = R"([site]
name = "test office"
elevation = "897ft"
[air_handler]
supply_airflow = "10000cfm"
supply_air_temp = "55F"
fan_heat = "1.5F"
min_outdoor_air = "20%"
return_air_temp = "75F"
return_air_rh = "50%"
)";
const char* kVariable = R"(airflow_control = "variable"
min_airflow = "30%"
)";
const char* kSchedule = R"([schedule]
mon-fri = "06:00-19:00"
)";

// The unit with variable airflow, then `tables`.
std::string unit_with(const std::string& tables) {
  return std::string(kUnit) + kVariable + kSchedule + tables;
}

std::filesystem::path write(const std::string& name, const std::string& text) {
  const auto p = scratch_dir("part_load_cli") / name;
  std::ofstream(p) << text;
  return p;
}

std::string data(const std::string& f) { return std::string(LIMITLINE_TEST_DATA_DIR) + "/" + f; }

limitline::test::CliRun year(const std::filesystem::path& unit,
                             std::initializer_list<std::string> extra = {}) {
  std::vector<std::string> args = {"year", unit.string(), "--weather",
                                   data("greensboro-nc-tmy3.csv")};
  args.insert(args.end(), extra.begin(), extra.end());
  return run_cli(args, "part_load_cli");
}

// The value after "KEY": in a JSON text (the first one).
double json_number(const std::string& json, const std::string& key) {
  const auto at = json.find("\"" + key + "\":");
  REQUIRE(at != std::string::npos);
  return std::stod(json.substr(json.find_first_not_of(' ', at + key.size() + 3)));
}

}  // namespace

TEST_CASE("with [loads] the report names the part-load model; without, it cautions") {
  const auto part = year(write("part.toml", unit_with(R"([loads]
space_temp = "75F"
internal_sensible = "130kBtu/h"
envelope_ua = "2.5kBtu/h/F"
latent = "30kBtu/h"
)")));
  REQUIRE(part.rc == 0);
  CHECK(contains(part.out, "Air handler: part load: variable airflow (floor 30%)"));
  CHECK(contains(part.out, "space loads over the fan-on hours"));
  CHECK_FALSE(contains(part.out, "upper bound"));

  const auto design = year(write("design.toml", std::string(kUnit) + kSchedule));
  REQUIRE(design.rc == 0);
  CHECK(contains(design.out, "Air handler: design load"));
  CHECK(contains(design.out, "absolute savings are an upper bound"));
}

TEST_CASE("variable airflow without [loads] is refused with the reason") {
  const auto r = year(write("no-loads.toml", unit_with("")));
  CHECK(r.rc == 2);
  CHECK(contains(r.err, "airflow_control"));
  CHECK(contains(r.err, "[loads]"));
}

TEST_CASE("with a [plant] the ranking is a cost and the JSON carries electricity and fuel") {
  const std::string unit = unit_with(R"([loads]
space_temp = "75F"
internal_sensible = "130kBtu/h"
latent = "30kBtu/h"
[plant]
cooling_cop = 3.2
heating_efficiency = 0.85
electricity_price = 0.13
heating_price = 0.035
currency = "EUR"
)");
  const auto text = year(write("plant.toml", unit), {"--wide"});
  REQUIRE(text.rc == 0);
  CHECK(contains(text.out, "shortfall EUR"));
  CHECK(contains(text.out, "cost of electricity for cooling and fuel for heating, EUR"));
  const auto json = year(write("plant.toml", unit), {"--format", "json"});
  REQUIRE(json.rc == 0);
  CHECK(contains(json.out, "\"ranking_basis\": \"cost\""));
  CHECK(contains(json.out, "\"currency\": \"EUR\""));
  CHECK_FALSE(contains(json.out, "shortfall_vs_perfect_kwh"));
  // cost = 0.13/3.2 per kWh of coil cooling + 0.035/0.85 per kWh of heating (coil and zone),
  // the plant's figures applied to the same run's coil energy.
  const auto at = json.out.find("\"no-economizer\": {");
  REQUIRE(at != std::string::npos);
  const std::string none = json.out.substr(at);
  const double cooling = json_number(none, "cooling_kwh");
  const double heating = json_number(none, "heating_kwh") + json_number(none, "zone_heating_kwh");
  CHECK(json_number(none, "cost") ==
        doctest::Approx(0.13 / 3.2 * cooling + 0.035 / 0.85 * heating).epsilon(1e-7));
  CHECK(json_number(none, "cooling_electric_kwh") == doctest::Approx(cooling / 3.2).epsilon(1e-7));
  CHECK(json_number(none, "heating_fuel_kwh") == doctest::Approx(heating / 0.85).epsilon(1e-7));
}

TEST_CASE("an hourly loads file prices the year exactly as the coefficients it holds") {
  // 8760 rows by row (no time columns) of a constant 38 kW sensible and 8.8 kW latent: the same
  // loads as internal_sensible = 38 kW, latent = 8.8 kW with no envelope term.
  std::string csv = "sensible_kw,latent_kw\n";
  for (int i = 0; i < 8760; ++i) csv += "38,8.8\n";
  const auto loads = write("loads.csv", csv);
  const auto file_unit = write("file.toml", unit_with("") + "[loads]\nspace_temp = \"75F\"\n" +
                                                "file = \"" + loads.string() + "\"\n" +
                                                "sensible = { column = \"sensible_kw\", unit = "
                                                "\"kW\" }\nlatent = { column = \"latent_kw\", "
                                                "unit = \"kW\" }\n");
  const auto coef_unit = write("coef.toml", unit_with(R"([loads]
space_temp = "75F"
internal_sensible = "38kW"
latent = "8.8kW"
)"));
  const auto a = year(file_unit, {"--format", "json"});
  const auto b = year(coef_unit, {"--format", "json"});
  REQUIRE(a.rc == 0);
  REQUIRE(b.rc == 0);
  CHECK(contains(a.out, "\"hourly_loads\": true"));
  const auto results_a = a.out.substr(a.out.find("\"results\""));
  const auto results_b = b.out.substr(b.out.find("\"results\""));
  CHECK(results_a == results_b);
}

TEST_CASE("a loads file that does not match the weather is one line naming both") {
  const auto loads = write("short.csv", "sensible_kw\n38\n38\n");
  const auto unit = write("short.toml", unit_with("") + "[loads]\nspace_temp = \"75F\"\n" +
                                            "file = \"" + loads.string() + "\"\n" +
                                            "sensible = { column = \"sensible_kw\", unit = "
                                            "\"kW\" }\n");
  const auto r = year(unit);
  CHECK(r.rc == 2);
  CHECK(contains(r.err, "short.csv"));
  CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
}
