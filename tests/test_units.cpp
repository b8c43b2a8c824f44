// Quantities at the edges: parsing with units, bare numbers in the --units system, the
// enthalpy datum shift, error messages. Conversion factors are checked against NIST Special
// Publication 811 (2008), Appendix B ("NIST SP 811"; the exact ones are definitions there),
// recalled without the document at hand: "from memory".
#include <doctest/doctest.h>

#include <limitline/units.hpp>

#include <fmt/format.h>

#include <cmath>
#include <string>

namespace units = limitline::units;
using limitline::InputError;
using limitline::UsageError;
using units::Kind;
using units::System;

namespace {

double ip(Kind k, const char* text) { return units::parse(k, text, System::ip, "--test"); }
double si(Kind k, const char* text) { return units::parse(k, text, System::si, "--test"); }

void check_near(double got, double want, double tol, const std::string& what = {}) {
  INFO(what, " got ", fmt::format("{:.12g}", got), " want ", fmt::format("{:.12g}", want));
  CHECK(std::fabs(got - want) <= tol);
}

// The InputError message of parsing `text`, or "" when it parsed.
std::string parse_error(Kind k, const char* text, System bare = System::ip,
                        const char* origin = "--test") {
  try {
    const double v = units::parse(k, text, bare, origin);
    INFO("parsed '", text, "' as ", v);
    return "";
  } catch (const InputError& e) {
    return e.what();
  }
}

bool contains(const std::string& s, const std::string& part) {
  INFO("'", s, "' should contain '", part, "'");
  return s.find(part) != std::string::npos;
}

}  // namespace

TEST_CASE("temperatures with their unit, in either system") {
  // °C = (°F − 32)/1.8 and K = °C + 273.15 (NIST SP 811 B.8, exact; from memory).
  for (System bare : {System::ip, System::si}) {
    check_near(units::parse(Kind::temperature, "75F", bare, "t"), (75.0 - 32.0) / 1.8, 1e-12);
    check_near(units::parse(Kind::temperature, "23.9C", bare, "t"), 23.9, 1e-12);
    check_near(units::parse(Kind::temperature, "296.15K", bare, "t"), 23.0, 1e-12);
  }
  // The two scales meet at −40 (NIST SP 811, from the definitions above).
  check_near(ip(Kind::temperature, "-40F"), -40.0, 1e-12);
  // Spellings an engineer types: degree sign, spaces, case, a plus sign.
  for (const char* t : {"75 °F", "75°F", "75degF", "75f", " 75 F ", "+75F"})
    check_near(si(Kind::temperature, t), (75.0 - 32.0) / 1.8, 1e-12, t);
}

TEST_CASE("bare numbers take the --units system") {
  check_near(ip(Kind::temperature, "75"), (75.0 - 32.0) / 1.8, 1e-12, "°F");
  check_near(si(Kind::temperature, "24"), 24.0, 1e-12, "°C");
  check_near(ip(Kind::enthalpy, "28"), (28.0 - 7.68) * 2.326, 1e-12, "Btu/lb");
  check_near(si(Kind::enthalpy, "47"), 47.0, 1e-12, "kJ/kg");
  check_near(ip(Kind::pressure, "14.696"), 14.696 * 6.894757293, 1e-9, "psia");
  check_near(si(Kind::pressure, "101.325"), 101.325, 1e-12, "kPa");
  check_near(ip(Kind::length, "5000"), 1524.0, 1e-9, "ft");
  check_near(si(Kind::length, "1524"), 1524.0, 1e-12, "m");
  check_near(ip(Kind::airflow, "1000"), 0.4719474, 1e-7, "cfm");
  check_near(si(Kind::airflow, "0.5"), 0.5, 1e-12, "m³/s");
  // A humidity ratio is the same number in both systems (lb/lb = kg/kg).
  check_near(ip(Kind::humidity_ratio, "0.0093"), 0.0093, 1e-15);
  check_near(si(Kind::humidity_ratio, "0.0093"), 0.0093, 1e-15);
  // RH is a percentage whatever the system.
  check_near(ip(Kind::fraction, "50"), 0.5, 1e-15);
  check_near(si(Kind::fraction, "50"), 0.5, 1e-15);
}

TEST_CASE("relative humidity and fractions") {
  check_near(ip(Kind::fraction, "50%"), 0.5, 1e-15);
  check_near(ip(Kind::fraction, "100%"), 1.0, 1e-15);
  check_near(ip(Kind::fraction, "0"), 0.0, 0.0);
  check_near(ip(Kind::fraction, "1"), 0.01, 1e-15);  // a bare 1 is 1 %
}

TEST_CASE("a bare fraction strictly between 0 and 1 is refused as ambiguous") {
  const std::string e = parse_error(Kind::fraction, "0.5", System::ip, "--rh");
  CHECK(contains(e, "--rh"));
  CHECK(contains(e, "'0.5'"));
  CHECK(contains(e, "ambiguous"));
  CHECK(contains(e, "50%"));  // it offers both readings
  CHECK(contains(e, "0.5%"));
  CHECK(parse_error(Kind::fraction, "0.5%") == "");
}

TEST_CASE("humidity ratio spellings") {
  // 1 lb = 7000 grains (NIST SP 811 B.8, exact; from memory).
  check_near(si(Kind::humidity_ratio, "65gr/lb"), 65.0 / 7000.0, 1e-15);
  check_near(si(Kind::humidity_ratio, "9.3g/kg"), 0.0093, 1e-15);
  check_near(ip(Kind::humidity_ratio, "0.0093lb/lb"), 0.0093, 1e-15);
  check_near(ip(Kind::humidity_ratio, "0.0093kg/kg"), 0.0093, 1e-15);
}

TEST_CASE("enthalpy: 28 Btu/lb <-> 47.3 kJ/kg both ways, through the datum shift") {
  // 1 Btu/lb = 2.326 kJ/kg (NIST SP 811 B.8, exact for the IT Btu; from memory). IP enthalpy
  // counts dry air from 0 °F, SI from 0 °C: 0 °C dry air is 0.240 × 32 = 7.68 Btu/lb on the IP
  // datum (ASHRAE Handbook—Fundamentals IP ch. 1 eq. 32, h = 0.240·t + W·(1061 + 0.444·t);
  // from memory). Hence 28 Btu/lb ↔ (28 − 7.68)·2.326 = 47.26 kJ/kg.
  const double h_si = ip(Kind::enthalpy, "28btu/lb");
  check_near(h_si, 47.3, 0.05, "28 Btu/lb in kJ/kg");
  check_near(h_si, 47.26432, 1e-9);
  check_near(units::to_display(Kind::enthalpy, System::ip, si(Kind::enthalpy, "47.3kJ/kg")), 28.0,
             0.05, "47.3 kJ/kg in Btu/lb");
  CHECK(units::format(Kind::enthalpy, System::ip, h_si, 1) == "28.0 Btu/lb");
  CHECK(units::format(Kind::enthalpy, System::si, h_si, 1) == "47.3 kJ/kg");
  check_near(units::to_display(Kind::enthalpy, System::ip, 0.0), 7.68, 1e-12, "0 °C dry air");
  check_near(units::enthalpy_ip_from_si(47.26432), 28.0, 1e-9);
  check_near(units::enthalpy_si_from_ip(28.0), 47.26432, 1e-9);
  // Never converted as a plain energy: 28 × 2.326 = 65.1 would be wrong by the datum.
  CHECK(std::fabs(h_si - 28.0 * 2.326) > 17.0);
  check_near(si(Kind::enthalpy, "47kJ/kg"), 47.0, 1e-12);
  check_near(si(Kind::enthalpy, "47000J/kg"), 47.0, 1e-9);
  check_near(si(Kind::enthalpy, "28 BTU/LB"), h_si, 1e-12);
}

TEST_CASE("an enthalpy difference has no datum") {
  // Offsets and deadbands: 1 Btu/lb of difference is 2.326 kJ/kg (NIST SP 811, from memory).
  check_near(ip(Kind::enthalpy_difference, "1btu/lb"), 2.326, 1e-12);
  check_near(ip(Kind::enthalpy_difference, "1"), 2.326, 1e-12);
  check_near(units::to_display(Kind::enthalpy_difference, System::ip, 2.326), 1.0, 1e-12);
}

TEST_CASE("pressures") {
  // 1 psi = 6.894757 kPa; 1 inHg (32 °F) = 3.38638 kPa; 1 atm = 101.325 kPa (NIST SP 811 B.8,
  // from memory). 14.696 psia and 29.92 inHg are the standard atmosphere's sea level
  // (ASHRAE Handbook—Fundamentals IP ch. 1 Table 1, from memory).
  check_near(si(Kind::pressure, "14.696psia"), 101.325, 0.001);
  check_near(si(Kind::pressure, "14.696 psi"), 101.325, 0.001);
  check_near(ip(Kind::pressure, "101.325kPa"), 101.325, 1e-12);
  check_near(ip(Kind::pressure, "29.92inHg"), 101.325, 0.01);
  check_near(ip(Kind::pressure, "1atm"), 101.325, 1e-12);
  check_near(ip(Kind::pressure, "1013.25hPa"), 101.325, 1e-9);
  check_near(ip(Kind::pressure, "1.01325bar"), 101.325, 1e-9);
  check_near(ip(Kind::pressure, "101325Pa"), 101.325, 1e-9);
}

TEST_CASE("lengths") {
  // 1 ft = 0.3048 m (NIST SP 811 B.8, exact; from memory).
  check_near(ip(Kind::length, "5000ft"), 1524.0, 1e-9);
  check_near(ip(Kind::length, "1524m"), 1524.0, 1e-12);
  check_near(ip(Kind::length, "1.524km"), 1524.0, 1e-9);
}

TEST_CASE("airflows: cfm, L/s, m³/h") {
  // 1 ft³/min = 4.719474e-4 m³/s (NIST SP 811 B.8, from memory).
  check_near(si(Kind::airflow, "1000cfm"), 0.4719474, 1e-7);
  check_near(si(Kind::airflow, "1000 CFM"), 0.4719474, 1e-7);
  check_near(ip(Kind::airflow, "500L/s"), 0.5, 1e-12);
  check_near(ip(Kind::airflow, "1800m3/h"), 0.5, 1e-12);
  check_near(ip(Kind::airflow, "0.5m3/s"), 0.5, 1e-12);
}

TEST_CASE("temperature differences are not shifted") {
  check_near(ip(Kind::temperature_difference, "10F"), 10.0 / 1.8, 1e-12);
  check_near(ip(Kind::temperature_difference, "10"), 10.0 / 1.8, 1e-12);
  check_near(si(Kind::temperature_difference, "5K"), 5.0, 1e-12);
  check_near(si(Kind::temperature_difference, "5"), 5.0, 1e-12);
}

TEST_CASE("errors name the origin, the text, and what is allowed") {
  SUBCASE("unknown unit") {
    const std::string e = parse_error(Kind::temperature, "75X", System::ip, "--dry-bulb");
    CHECK(contains(e, "--dry-bulb"));
    CHECK(contains(e, "'75X'"));
    CHECK(contains(e, "a temperature"));
    CHECK(contains(e, "allowed:"));
    CHECK(contains(e, "f, °f"));
  }
  SUBCASE("a unit of another quantity") {
    const std::string e =
        parse_error(Kind::temperature, "28btu/lb", System::ip, "points.csv:7 column dry_bulb");
    CHECK(contains(e, "points.csv:7 column dry_bulb"));
    CHECK(contains(e, "btu/lb"));
    CHECK(contains(e, "not a temperature"));
  }
  SUBCASE("not a number") {
    const std::string e = parse_error(Kind::temperature, "warm", System::ip, "--dry-bulb");
    CHECK(contains(e, "--dry-bulb"));
    CHECK(contains(e, "'warm'"));
    CHECK(contains(e, "75F"));  // an example of what to write
    CHECK(contains(parse_error(Kind::enthalpy, ""), "not an enthalpy"));
    CHECK(contains(parse_error(Kind::enthalpy, "x"), "e.g. 28btu/lb or 47kJ/kg"));
    CHECK(contains(parse_error(Kind::fraction, "abc"), "e.g. 50%"));
  }
  SUBCASE("NaN, infinity and overflow are never a quantity") {
    for (const char* t : {"nan", "NaN", "inf", "-inf", "infinity", "nan%", "1e999", "1e999F"}) {
      INFO(t);
      CHECK(parse_error(Kind::temperature, t) != "");
      CHECK(parse_error(Kind::fraction, t) != "");
    }
  }
  SUBCASE("plain numbers") {
    check_near(units::parse_number(" 12.5 ", "x"), 12.5, 0.0);
    try {
      units::parse_number("12a", "points.csv:3 column rh");
      FAIL("12a parsed");
    } catch (const InputError& e) {
      CHECK(contains(e.what(), "points.csv:3 column rh: '12a' is not a number"));
    }
    CHECK_THROWS_AS(units::parse_number("nan", "x"), InputError);
  }
  SUBCASE("unit system") {
    CHECK(units::parse_system("IP") == System::ip);
    CHECK(units::parse_system("si") == System::si);
    try {
      units::parse_system("metric");
      FAIL("metric parsed");
    } catch (const UsageError& e) {
      CHECK(contains(e.what(), "--units"));
      CHECK(contains(e.what(), "'metric'"));
      CHECK(contains(e.what(), "ip or si"));
    }
  }
}

TEST_CASE("has_unit tells a bare number from one with a unit") {
  CHECK(units::has_unit("75F"));
  CHECK(units::has_unit("50 %"));
  CHECK_FALSE(units::has_unit("75"));
  CHECK_FALSE(units::has_unit(" 75 "));
  CHECK_FALSE(units::has_unit("warm"));
}

TEST_CASE("display conversion round trips for every kind in both systems") {
  const Kind kinds[] = {Kind::temperature, Kind::temperature_difference, Kind::enthalpy,
                        Kind::enthalpy_difference, Kind::pressure, Kind::length, Kind::fraction,
                        Kind::humidity_ratio, Kind::airflow, Kind::energy, Kind::power,
                        Kind::specific_volume, Kind::density};
  for (Kind k : kinds)
    for (System s : {System::ip, System::si})
      for (double v : {-40.0, 0.0, 0.0093, 1.0, 47.3, 101.325, 1524.0}) {
        INFO(units::kind_name(k), " ", units::system_name(s), " ", v);
        check_near(units::from_display(k, s, units::to_display(k, s, v)), v,
                   1e-12 * (1.0 + std::fabs(v)));
        // What is displayed parses back to the same SI value when written with its label.
        const std::string text =
            fmt::format("{:.17g}{}", units::to_display(k, s, v), units::unit_label(k, s));
        check_near(units::parse(k, text, s, "round trip"), v, 1e-9 * (1.0 + std::fabs(v)), text);
      }
}

TEST_CASE("display labels, key suffixes and formatting") {
  CHECK(units::unit_label(Kind::temperature, System::ip) == "°F");
  CHECK(units::unit_label(Kind::enthalpy, System::ip) == "Btu/lb");
  CHECK(units::unit_label(Kind::enthalpy, System::si) == "kJ/kg");
  CHECK(units::key_suffix(Kind::temperature, System::ip) == "f");
  CHECK(units::key_suffix(Kind::temperature, System::si) == "c");
  CHECK(units::key_suffix(Kind::enthalpy, System::ip) == "btu_per_lb");
  CHECK(units::key_suffix(Kind::enthalpy, System::si) == "kj_per_kg");
  CHECK(units::key_suffix(Kind::pressure, System::ip) == "psia");
  CHECK(units::format(Kind::temperature, System::ip, (75.0 - 32.0) / 1.8, 1) == "75.0 °F");
  CHECK(units::format(Kind::fraction, System::si, 0.5, 1) == "50.0%");
  CHECK(units::format(Kind::temperature, System::si, -0.0001, 1) == "0.0 °C");  // no "-0.0"
  CHECK(units::format(Kind::length, System::ip, 1524.0, 0) == "5000 ft");
}
