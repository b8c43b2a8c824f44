// Quantities at the edges: parsing with units, bare numbers in the --units system, the
// enthalpy datum shift, error messages. Conversion factors are checked against NIST Special
// Publication 811 (2008), Appendix B ("NIST SP 811"; the exact ones are definitions there),
// recalled without the document at hand: "from memory".
#include <doctest/doctest.h>

#include <limitline/model/plausible.hpp>
#include <limitline/model/units.hpp>

#include <fmt/format.h>

#include <cmath>
#include <string>

namespace units = limitline::units;
using limitline::InputError;
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

TEST_CASE("powers and conductances: kBtu/h, tons, kBtu/h·°F") {
  // 1 W = 3.412141633 Btu/h (the international-table Btu, NIST SP 811 B.8; from memory) and a
  // ton of refrigeration is 12,000 Btu/h (common practice).
  check_near(si(Kind::power, "150kBtu/h"), 150.0 / 3.412141633, 1e-12);
  check_near(si(Kind::power, "12000 Btu/h"), 12.0 / 3.412141633, 1e-12);
  check_near(si(Kind::power, "1ton"), 12.0 / 3.412141633, 1e-9);
  check_near(ip(Kind::power, "44kW"), 44.0, 1e-12);
  check_near(ip(Kind::power, "150"), 150.0 / 3.412141633, 1e-12);  // bare: kBtu/h in IP
  check_near(si(Kind::power, "150"), 150.0, 0.0);                  // bare: kW in SI
  // A conductance per degree: 1 Btu/h·°F = (1/3.412141633 W)/(1/1.8 K) = 1.8/3.412141633 W/K
  // = 0.52753 W/K (from the two factors above; 1 K = 1.8 °F, NIST SP 811, exact).
  const double btu_h_f = 1.8e-3 / 3.412141633;  // kW/K
  check_near(btu_h_f * 1000.0, 0.5275, 5e-5);
  for (const char* t : {"3kBtu/h/F", "3 kBtu/h-F", "3kBtu/h·°F", "3 KBTU/H/°F", "3kbtu/h-°f"})
    check_near(si(Kind::conductance, t), 3000.0 * btu_h_f, 1e-12, t);
  for (const char* t : {"3000Btu/h/F", "3000 Btu/h-F", "3000Btu/h·°F", "3000btu/h·f"})
    check_near(si(Kind::conductance, t), 3000.0 * btu_h_f, 1e-12, t);
  check_near(ip(Kind::conductance, "1.6kW/K"), 1.6, 1e-12);
  check_near(ip(Kind::conductance, "1600 W/K"), 1.6, 1e-12);
  check_near(ip(Kind::conductance, "1.6kW/°C"), 1.6, 1e-12);
  check_near(ip(Kind::conductance, "3"), 3000.0 * btu_h_f, 1e-12);  // bare: kBtu/h·°F in IP
  check_near(si(Kind::conductance, "3"), 3.0, 0.0);                 // bare: kW/K in SI
  CHECK(units::unit_label(Kind::conductance, System::ip) == "kBtu/h·°F");
  CHECK(units::unit_label(Kind::conductance, System::si) == "kW/K");
  CHECK(units::key_suffix(Kind::conductance, System::ip) == "kbtu_per_h_f");
  CHECK(units::key_suffix(Kind::conductance, System::si) == "kw_per_k");
  // A conductance is not negative, and a power per degree is not a power.
  CHECK(contains(parse_error(Kind::conductance, "-1kW/K"), "beyond any physical conductance"));
  CHECK(contains(parse_error(Kind::conductance, "3kBtu/h"), "which is not a conductance"));
}

TEST_CASE("unit_scale: one unit written apart from its value") {
  check_near(units::unit_scale(Kind::power, "kBtu/h", "x"), 1.0 / 3.412141633, 1e-15);
  check_near(units::unit_scale(Kind::power, " Btu/h ", "x"), 1e-3 / 3.412141633, 1e-18);
  check_near(units::unit_scale(Kind::power, "W", "x"), 1e-3, 0.0);
  check_near(units::unit_scale(Kind::power, "ton", "x"), 12.0 / 3.412141633, 1e-9);
  const std::string e = [] {
    try {
      (void)units::unit_scale(Kind::power, "kJ", "loads.csv: column 'Q'");
    } catch (const InputError& err) {
      return std::string(err.what());
    }
    return std::string();
  }();
  CHECK(e ==
        "loads.csv: column 'Q': 'kJ' is not a unit of power (allowed: kw, w, btu/h, kbtu/h, "
        "ton)");
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
      (void)units::parse_number("12a", "points.csv:3 column rh");
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
      (void)units::parse_system("metric");
      FAIL("metric parsed");
    } catch (const InputError& e) {
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
  const Kind kinds[] = {Kind::temperature, Kind::temperature_difference,
                        Kind::enthalpy,    Kind::enthalpy_difference,
                        Kind::pressure,    Kind::length,
                        Kind::fraction,    Kind::humidity_ratio,
                        Kind::airflow,     Kind::energy,
                        Kind::power,       Kind::specific_volume,
                        Kind::density,     Kind::conductance};
  for (Kind k : kinds)
    for (System s : {System::ip, System::si})
      for (double v : {-40.0, 0.0, 0.0093, 1.0, 47.3, 101.325, 1524.0}) {
        INFO(units::kind_name(k), " ", units::system_name(s), " ", v);
        check_near(units::from_display(k, s, units::to_display(k, s, v)), v,
                   1e-12 * (1.0 + std::fabs(v)));
        // What is displayed parses back to the same SI value when written with its label,
        // inside the kind's absolute bounds (no negative pressure, no 1524 °C); outside them
        // it is refused.
        const std::string text =
            fmt::format("{:.17g}{}", units::to_display(k, s, v), units::unit_label(k, s));
        const auto [lo, hi] = units::absolute_bounds(k);
        if (v >= lo && v <= hi)
          check_near(units::parse(k, text, s, "round trip"), v, 1e-9 * (1.0 + std::fabs(v)), text);
        else
          CHECK_THROWS_AS(units::parse(k, text, s, "round trip"), InputError);
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

// --- Thousands separators, absolute bounds, inclusive ends --------------------------------

TEST_CASE("commas that group digits by three are thousands separators") {
  // 1 cfm = 0.3048³/60 m³/s exactly (NIST SP 811).
  const double cfm = 0.3048 * 0.3048 * 0.3048 / 60.0;
  check_near(units::parse(Kind::airflow, "20,000cfm", System::ip, "x"), 20000 * cfm, 1e-12);
  check_near(units::parse(Kind::airflow, "20,000 cfm", System::ip, "x"), 20000 * cfm, 1e-12);
  check_near(units::parse(Kind::airflow, "1,250,000.5", System::ip, "x"), 1250000.5 * cfm, 1e-9);
  check_near(units::parse_number("-12,345", "x"), -12345.0, 0.0);
  CHECK_FALSE(units::has_unit("20,000"));
  CHECK(units::has_unit("20,000 cfm"));
}

TEST_CASE("a comma that does not group digits by three is refused, never read as a unit") {
  for (const char* t : {"20,00cfm", "1,5", "1,5F", "20,0000 cfm", "1234,567"}) {
    INFO(t);
    const std::string e = parse_error(Kind::airflow, t, System::ip, "air_handler.supply_airflow");
    CHECK(contains(e, "air_handler.supply_airflow"));
    CHECK(contains(e, "group its digits by three"));
    CHECK_FALSE(contains(e, "has unit"));
  }
  CHECK_THROWS_AS(units::parse_number("1,5", "x"), InputError);
}

TEST_CASE("magnitudes beyond any physical bound are refused for every kind") {
  SUBCASE("the cases that once overflowed to inf and nan") {
    const std::string e = parse_error(Kind::airflow, "1e308cfm", System::ip,
                                      "unit.toml:9: air_handler.supply_airflow");
    CHECK(contains(
        e, "unit.toml:9: air_handler.supply_airflow: '1e308cfm' is beyond any physical airflow"));
    CHECK(contains(parse_error(Kind::airflow, "1e400cfm"), "beyond any physical airflow"));
    CHECK(contains(parse_error(Kind::enthalpy, "1e300btu/lb"), "beyond any physical enthalpy"));
  }
  SUBCASE("below absolute zero") {
    // Absolute zero is -459.67 °F (NIST SP 811).
    const std::string e = parse_error(Kind::temperature, "-500F", System::ip, "--dry-bulb");
    CHECK(contains(e, "beyond any physical temperature (allowed: -459.67 °F to"));
    check_near(units::parse(Kind::temperature, "-459.67F", System::ip, "x"), -273.15, 1e-9);
  }
  SUBCASE("every kind has finite bounds") {
    for (Kind k : {Kind::temperature, Kind::temperature_difference, Kind::enthalpy,
                   Kind::enthalpy_difference, Kind::pressure, Kind::length, Kind::fraction,
                   Kind::humidity_ratio, Kind::airflow, Kind::energy, Kind::power,
                   Kind::specific_volume, Kind::density, Kind::conductance}) {
      INFO(units::kind_name(k));
      CHECK(contains(parse_error(k, "1e300", System::si), "beyond any physical"));
      CHECK(contains(parse_error(k, "-1e300", System::ip), "beyond any physical"));
    }
  }
}

TEST_CASE("range ends are inclusive through a unit conversion") {
  // 36 °F of difference is 20 K exactly (NIST SP 811), though 36/1.8 rounds to 20.000000000000004.
  const double k = units::parse(Kind::temperature_difference, "36F", System::ip, "x");
  CHECK(units::within(k, 0.0, 20.0));
  CHECK(units::held_within(k, 0.0, 20.0) == 20.0);
  CHECK_FALSE(units::within(20.001, 0.0, 20.0));
  CHECK(units::held_within(20.001, 0.0, 20.0) == 20.001);
  // A range is shown with its ends rounded inward, so an end written as shown is inside:
  // 20 kJ/kg is 8.59845 Btu/lb (÷ 2.326), shown 8.5984.
  CHECK(units::format_range(Kind::enthalpy_difference, System::ip, 0.0, 20.0) ==
        "0 Btu/lb to 8.5984 Btu/lb");
  CHECK(units::format_range(Kind::temperature_difference, System::ip, 0.0, 20.0) ==
        "0 °F to 36 °F");
  CHECK(units::format_range(Kind::temperature, System::ip, -40.0, 60.0) == "-40 °F to 140 °F");
  CHECK(units::format_brief(Kind::temperature, System::si, 75.0) == "75 °C");
  CHECK(units::written_unit(Kind::temperature, System::ip) == "F");
}

TEST_CASE("offending text is echoed safely: control characters escaped, long values cut") {
  const std::string e = parse_error(Kind::temperature, "75\x1b[31mF", System::ip, "--dry-bulb");
  CHECK(contains(e, "\\x1b"));
  CHECK_FALSE(contains(e, "\x1b"));
  const std::string long_text(100000, '7');
  const std::string l =
      parse_error(Kind::temperature, (long_text + "X").c_str(), System::ip, "--dry-bulb");
  CHECK(l.size() < 400);
  CHECK(contains(l, "(100001 characters)"));
}

// --- Plausible bands ----------------------------------------------------------------------

namespace {
namespace plausible = limitline::plausible;
const plausible::Source kSiFile{"unit.toml:12: air_handler.return_air_temp", "in an SI file"};
const plausible::Source kIpFile{"unit.toml:12: air_handler.return_air_temp", "in an IP file"};

std::string plausible_error(std::string_view band, std::string_view text, System bare,
                            const plausible::Source& source) {
  std::vector<std::string> warnings;
  try {
    (void)plausible::parse(*plausible::find(band), text, bare, source, warnings);
  } catch (const InputError& e) {
    return e.what();
  }
  return "";
}
}  // namespace

TEST_CASE("plausible bands are data: one per quantity, each inside its kind's absolute bounds") {
  for (const auto& b : plausible::bands()) {
    INFO(b.name);
    CHECK(b.lo < b.hi);
    CHECK(plausible::find(b.name) == &b);
    // The ends parse back as values of the kind (no end beyond the absolute bounds).
    CHECK_NOTHROW(units::parse(
        b.kind, fmt::format("{}", units::to_display(b.kind, System::si, b.hi)), System::si, "x"));
  }
  CHECK(plausible::find("air_handler.no_such_key") == nullptr);
}

TEST_CASE("a bare number plausible only in the other unit system is refused with both readings") {
  // Return air 10–40 °C (common practice); 75 °F is 23.9 °C (NIST SP 811).
  const std::string e = plausible_error("air_handler.return_air_temp", "75", System::si, kSiFile);
  CHECK(e ==
        "unit.toml:12: air_handler.return_air_temp: 75 in an SI file is 75 °C, outside the "
        "plausible range of a return-air dry-bulb (10 °C to 40 °C, common practice); if you "
        "meant 75 °F write \"75F\"");
  // Supply setpoint 5–25 °C: "13" in an IP file is 13 °F; 13 °C is meant.
  const std::string s = plausible_error("air_handler.supply_air_temp", "13", System::ip, kIpFile);
  CHECK(contains(s, "13 in an IP file is 13 °F"));
  CHECK(contains(s, "41 °F to 77 °F"));  // 5 °C and 25 °C in °F: the file's system
  CHECK(contains(s, "write \"13C\""));
  // 20000 in an SI file is 20000 m³/s; 20000 cfm (9.4 m³/s) is meant.
  const std::string a = plausible_error("air_handler.supply_airflow", "20000", System::si, kSiFile);
  CHECK(contains(a, "20000 in an SI file is 20000 m³/s"));
  CHECK(contains(a, "write \"20000cfm\""));
}

TEST_CASE("an implausible value with its unit, or implausible in both systems, is a warning") {
  std::vector<std::string> w;
  const auto& band = *plausible::find("air_handler.return_air_temp");
  CHECK(plausible::parse(band, "45C", System::ip, kIpFile, w) == 45.0);
  REQUIRE(w.size() == 1);
  CHECK(w[0].rfind("unit.toml:12: air_handler.return_air_temp: '45C' (113 °F) is outside the "
                   "plausible range of a return-air dry-bulb (50 °F to 104 °F, common practice)",
                   0) == 0);
  // 45 is neither 45 °C nor 45 °F (7.2 °C) of plausible return air: kept, with a word.
  CHECK(plausible::parse(band, "45", System::si, kSiFile, w) == 45.0);
  REQUIRE(w.size() == 2);
  CHECK(contains(w[1], "45 in an SI file is 45 °C, outside the plausible range"));
  // A percentage reads the same in both systems: never refused for its system.
  CHECK(plausible::parse(*plausible::find("air_handler.min_outdoor_air"), "95", System::si, kSiFile,
                         w) == doctest::Approx(0.95));
  CHECK(w.size() == 3);
  // Inside the band: no word.
  CHECK(plausible::parse(band, "24", System::si, kSiFile, w) == 24.0);
  CHECK(w.size() == 3);
}
