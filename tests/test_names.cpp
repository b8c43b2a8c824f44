// Enum ↔ name tables: each enum's names are written once, read both ways from that table.
// The spellings are the trade's: "draw-through" and "blow-through" for where the supply fan
// sits relative to the cooling coil (common practice); "integrated" and "non-integrated"
// economizers as ASHRAE 90.1 §6.5.1.3 names them (from memory).
#include <doctest/doctest.h>

#include <limitline/model/airside.hpp>
#include <limitline/model/highlimit.hpp>
#include <limitline/model/units.hpp>
#include <limitline/names.hpp>

#include <string>

namespace airside = limitline::airside;
using limitline::Named;

namespace {

enum class Colour { red, green };
constexpr Named<Colour> kColours[] = {
    {"red", Colour::red}, {"green", Colour::green}, {"verdant", Colour::green}};

// Every row's name reads back as its value; every value's name is its first row.
template <class Span, class FromName, class Name>
void check_round_trip(Span names, FromName from_name, Name name) {
  REQUIRE_FALSE(names.empty());
  for (const auto& n : names) {
    INFO(std::string(n.name));
    CHECK(from_name(n.name) == n.value);
    CHECK(name(n.value) == n.name);
  }
}

}  // namespace

TEST_CASE("a name table reads both ways; later rows are synonyms") {
  CHECK(limitline::name_in(kColours, Colour::green) == "green");
  CHECK(limitline::value_in(kColours, "verdant") == Colour::green);
  CHECK(limitline::value_in(kColours, "red") == Colour::red);
  SUBCASE("lookups are exact: callers normalise first") {
    CHECK_FALSE(limitline::value_in(kColours, "Red").has_value());
    CHECK_FALSE(limitline::value_in(kColours, "").has_value());
  }
  CHECK(limitline::names_in(kColours) == "red, green, verdant");
  CHECK(limitline::names_in(kColours, " or ") == "red or green or verdant");
}

TEST_CASE("fan positions and economizer types have one name each") {
  check_round_trip(airside::fan_position_names(), airside::fan_position_from_name,
                   airside::fan_position_name);
  check_round_trip(airside::economizer_names(), airside::economizer_from_name,
                   airside::economizer_name);
  CHECK(airside::fan_position_name(airside::FanPosition::draw_through) == "draw-through");
  CHECK(airside::fan_position_name(airside::FanPosition::blow_through) == "blow-through");
  CHECK(airside::economizer_name(airside::EconomizerType::integrated) == "integrated");
  CHECK(airside::economizer_name(airside::EconomizerType::non_integrated) == "non-integrated");
  CHECK_FALSE(airside::economizer_from_name("nonintegrated").has_value());
}

TEST_CASE("unit systems and high-limit references read from their tables") {
  namespace units = limitline::units;
  namespace highlimit = limitline::highlimit;
  CHECK(limitline::names_in(units::system_names(), " or ") == "ip or si");
  CHECK(units::system_name(units::System::si) == "si");
  CHECK(highlimit::reference_name(highlimit::Reference::return_air) == "return");
  CHECK(highlimit::reference_from_name("differential") == highlimit::Reference::return_air);
  CHECK(highlimit::quantity_from_name("dew-point") == highlimit::Quantity::dew_point);
}
