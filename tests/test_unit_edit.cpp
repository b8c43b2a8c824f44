// Editing a unit file's text by key (io/unit_edit.hpp), as the study page's form does. The
// unit file is the embedded invented demo; what an edit must give is what the unit file
// reader then reads, so each edit is checked by parsing the result.
#include <limitline/error.hpp>
#include <limitline/io/embedded.hpp>
#include <limitline/io/unit_edit.hpp>
#include <limitline/io/unit_file.hpp>

#include <doctest/doctest.h>

#include <algorithm>
#include <string>

namespace {

using limitline::UnitEdit;
using limitline::UnitField;

std::string demo() { return std::string(*limitline::embedded::find("demo-harbourside.toml")); }

const UnitField* find(const std::vector<UnitField>& fields, const std::string& path) {
  const auto it = std::find_if(fields.begin(), fields.end(),
                               [&](const UnitField& f) { return f.path == path; });
  return it == fields.end() ? nullptr : &*it;
}

std::string edited(const std::vector<UnitEdit>& edits) {
  return limitline::edit_unit_text(demo(), "demo.toml", edits);
}

}  // namespace

TEST_CASE("the form's settings are the file's, with their values as written") {
  const auto fields = limitline::editable_fields(demo(), "demo.toml");
  REQUIRE(find(fields, "air_handler.supply_air_temp"));
  CHECK(find(fields, "air_handler.supply_air_temp")->value == "55F");
  CHECK(find(fields, "plant.cooling_cop")->value == "3.2");  // the shortest form of the number
  CHECK(find(fields, "site.climate_zone")->value == "3A");
  // The first strategy is "fixed dry-bulb 65F": its limit and deadband.
  CHECK(find(fields, "strategy[1].dry_bulb_limit")->value == "65F");
  CHECK(find(fields, "strategy[1].deadband")->value == "1F");
  // The differential dry-bulb strategy reads an offset the file leaves to its default.
  REQUIRE(find(fields, "strategy[3].dry_bulb_offset"));
  CHECK(find(fields, "strategy[3].dry_bulb_offset")->value.empty());
  CHECK_FALSE(find(fields, "strategy[1].enthalpy_limit"));
}

TEST_CASE("an edit sets the value the unit file then reads") {
  const auto text =
      edited({{"air_handler.supply_air_temp", "13C"}, {"strategy[1].dry_bulb_limit", "60F"}});
  const auto unit = limitline::parse_unit_file(text, "edited.toml");
  CHECK(unit.air_handler.supply_air_temp_c == doctest::Approx(13.0));
  REQUIRE(unit.strategies.size() == 6);
  CHECK(unit.strategies[0].conditions[0].limit == doctest::Approx((60.0 - 32.0) / 1.8));
  SUBCASE("a number stays a number, a string a string") {
    const auto t = edited({{"plant.cooling_cop", "3.5"}, {"site.climate_zone", "4"}});
    CHECK(t.find("cooling_cop = 3.5") != std::string::npos);
    CHECK(t.find("climate_zone = '4'") != std::string::npos);
  }
  SUBCASE("an empty value removes the key, so its default applies") {
    const auto t = edited({{"strategy[1].deadband", ""}});
    CHECK(limitline::parse_unit_file(t, "edited.toml").strategies.size() == 6);
    CHECK_FALSE(find(limitline::editable_fields(t, "e.toml"), "strategy[1].deadband"));
    CHECK(find(limitline::editable_fields(t, "e.toml"), "strategy[2].deadband"));
  }
  SUBCASE("no edit: the text as uploaded, comments and all") { CHECK(edited({}) == demo()); }
}

TEST_CASE("a path the form does not offer is refused, naming it") {
  for (const std::string& path :
       std::vector<std::string>{"weather.file", "loads.file", "strategy[7].dry_bulb_limit",
                                "strategy[0].deadband", "strategy[1].name", "supply_air_temp",
                                "strategy[x].deadband", "air_handler.supply_air_temp.x"}) {
    CAPTURE(path);
    try {
      (void)edited({{path, "1"}});
      FAIL("accepted");
    } catch (const limitline::InputError& e) {
      CHECK(std::string(e.what()).rfind("demo.toml: '" + path + "'", 0) == 0);
    }
  }
}

TEST_CASE("a table that is no table is refused, not written into") {
  for (const std::string& text :
       std::vector<std::string>{"air_handler = 5\n", "strategy = [1]\n"}) {
    CAPTURE(text);
    CHECK_THROWS_AS(
        (void)limitline::edit_unit_text(
            text, "odd.toml",
            std::vector<UnitEdit>{{"air_handler.fan_heat", "1F"}, {"strategy[1].deadband", "1F"}}),
        limitline::InputError);
  }
  CHECK_THROWS_AS(
      (void)limitline::edit_unit_text("strategy = [1]\n", "odd.toml",
                                      std::vector<UnitEdit>{{"strategy[1].deadband", "1F"}}),
      limitline::InputError);
}

TEST_CASE("the weather file of a download replaces the [weather] table when read by header") {
  const auto by_header = limitline::with_weather_file(demo(), "demo.toml", "site.csv", true);
  CHECK(by_header.find("[weather]\nfile = 'site.csv'") != std::string::npos);
  CHECK(by_header.find("dry_bulb_c") == std::string::npos);
  const auto kept = limitline::with_weather_file(demo(), "demo.toml", "site.csv", false);
  CHECK(kept.find("dry_bulb_c") != std::string::npos);
  CHECK(kept.find("file = 'site.csv'") != std::string::npos);
}
