// Energy-code tables and compliance verdicts.
//
// Sources: the expected limits below are those of the issue that asked for the tables, which
// recalls them without the documents at hand: ASHRAE/IES 90.1-2010 Tables 6.5.1.1.3A/B,
// 90.1-2013 to -2022 Table 6.5.1.1.3, IECC 2015 to 2024 (high-limit shutoff table), and
// California Title 24 Part 6 (2013 to 2022) high-limit table of §140.4(e). Every such value is
// "from memory"; the tests check that the tables and the verdicts say what those sources say,
// and they must be re-checked against the adopted editions. Fixture files in tests/data/codes-*
// exercise the loader only; their figures are placeholders, never check values.
#include <doctest/doctest.h>

#include <limitline/io/codes.hpp>
#include <limitline/error.hpp>
#include <limitline/model/psychro.hpp>
#include <limitline/model/units.hpp>

#include <fmt/format.h>

#include <cmath>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <functional>
#include <map>
#include <set>
#include <sstream>
#include <string>

namespace codes = limitline::codes;
namespace hl = limitline::highlimit;
namespace units = limitline::units;
namespace psy = limitline::psychro;
using codes::Verdict;
using limitline::InputError;

namespace {

const std::filesystem::path kShipped = std::filesystem::path(LIMITLINE_SOURCE_DIR) / "data/codes";
const std::filesystem::path kTestData = LIMITLINE_TEST_DATA_DIR;
const std::string kProvenance = "from memory; verify against the adopted edition";

const codes::CodeTables& shipped() {
  static const codes::CodeTables t = codes::CodeTables::load(kShipped);
  return t;
}

std::string read(const std::filesystem::path& p) {
  std::ifstream in(p);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

// Settings in IP figures (°F, Btu/lb with the 0 °F datum, offsets in °F and Btu/lb).
struct Ip {
  double db = 75, h = 28, dp = 55, db_off = 0, h_off = 0;
};
hl::Strategy strategy(std::string_view preset, Ip ip) {
  hl::PresetSettings s = hl::preset_defaults();
  s.dry_bulb_limit_c = units::celsius_from_fahrenheit(ip.db);
  s.enthalpy_limit_kj_per_kg = units::enthalpy_si_from_ip(ip.h);
  s.dew_point_limit_c = units::celsius_from_fahrenheit(ip.dp);
  s.dry_bulb_offset_k = ip.db_off / 1.8;
  s.enthalpy_offset_kj_per_kg = ip.h_off * 2.326;
  return hl::make_preset(preset, s);
}

codes::ZoneRequirements zone_req(std::string_view edition, std::string_view zone,
                                 std::optional<double> p = {},
                                 const codes::CodeTables& t = shipped()) {
  return codes::requirements(t.edition(edition), zone, {p, {}});
}

Verdict verdict(std::string_view edition, std::string_view zone, const hl::Strategy& s,
                std::optional<double> p = {}) {
  return codes::check_strategy(zone_req(edition, zone, p), s).verdict;
}

// The InputError of `f`, whose message must contain every needle.
void check_error(const std::function<void()>& f, std::initializer_list<std::string> needles) {
  try {
    f();
    FAIL("no InputError");
  } catch (const InputError& e) {
    const std::string m = e.what();
    INFO("message: ", m);
    for (const auto& n : needles) CHECK(m.find(n) != std::string::npos);
    CHECK(m.find('\n') == std::string::npos);
  }
}

codes::CodeTables from_text(const std::string& text, const std::string& name = "mem.toml") {
  const std::pair<std::string, std::string> doc{name, text};
  return codes::CodeTables::from_documents(std::span(&doc, 1));
}

// --- What each zone allows (from the recollection; see the header) ------------------

struct Expect {
  std::optional<double> fixed_db;  // fixed-dry-bulb limit, °F
  std::optional<double> diff_db;   // differential-dry-bulb offset, °F
  std::optional<double> fixed_h;   // fixed-enthalpy limit, Btu/lb
  bool fixed_h_db = false;         // fixed-enthalpy+dry-bulb 28 Btu/lb or 75 °F
  bool diff_h = false;             // differential-enthalpy
  bool diff_h_db = false;          // differential-enthalpy+dry-bulb 75 °F
  bool dew_db = false;             // fixed-dew-point+dry-bulb 55 °F or 75 °F
};

const std::vector<std::string> kDry = {"1B", "2B", "3B", "3C", "4B", "4C",
                                       "5B", "5C", "6B", "7",  "8"};
const std::vector<std::string> kHumid = {"1A", "2A", "3A", "4A"};
const std::vector<std::string> kMid = {"5A", "6A"};

bool in(const std::vector<std::string>& v, const std::string& z) {
  return std::find(v.begin(), v.end(), z) != v.end();
}

// 90.1-2013 to -2022 and IECC 2015 to 2024 (from memory, per the issue).
Expect modern(const std::string& z) {
  Expect e;
  e.fixed_db = in(kDry, z) ? 75 : in(kMid, z) ? 70 : 65;
  if (!in(kHumid, z)) e.diff_db = 0;
  e.fixed_h_db = true;
  e.diff_h_db = true;
  return e;
}

// 90.1-2010 (from memory, per the issue).
Expect ashrae2010(const std::string& z) {
  Expect e;
  e.fixed_db = in(kDry, z) ? 75 : in(kMid, z) ? 70 : 65;
  if (!in(kHumid, z)) e.diff_db = 0;
  if (!in(kDry, z)) e.fixed_h = 28;
  e.diff_h = true;
  e.dew_db = true;
  return e;
}

// Title 24 Part 6 (from memory, per the issue).
Expect title24(const std::string& z) {
  const int n = std::stoi(z.substr(2));
  Expect e;
  const bool g73 = n == 2 || n == 4 || n == 10, g71 = n == 6 || n == 8 || n == 9, g69 = n == 7;
  e.fixed_db = g73 ? 73 : g71 ? 71 : g69 ? 69 : 75;
  e.diff_db = g73 ? -2 : g71 ? -4 : g69 ? -6 : 0;
  e.fixed_h_db = true;
  return e;
}

struct Case {
  std::string label;
  hl::Strategy strategy;
  Verdict want;
};

// Strategies around each required setting: at it, inside the tolerance, just outside on both
// sides, and far off; types the zone prohibits are not allowed whatever their setting. With
// the selectable-setpoint footnote (`selectable`: 2 °F, 2 Btu/lb, from memory), a fixed limit
// off by less than that is complies-if-selectable instead of set-wrong; offsets never are.
std::vector<Case> cases(const Expect& e, bool selectable) {
  std::vector<Case> out;
  auto add = [&](std::string label, std::string_view preset, Ip ip, bool allowed, Verdict v,
                 bool near_fixed = false) {
    if (selectable && near_fixed && v == Verdict::set_wrong) v = Verdict::complies_if_selectable;
    out.push_back({std::move(label), strategy(preset, ip), allowed ? v : Verdict::not_allowed});
  };
  const double L = e.fixed_db.value_or(75);
  for (auto [d, v] : {std::pair{0.0, Verdict::complies},
                      {0.04, Verdict::complies},
                      {-0.04, Verdict::complies},
                      {0.1, Verdict::set_wrong},
                      {-0.1, Verdict::set_wrong},
                      {5.0, Verdict::set_wrong}})
    add(fmt::format("fixed-dry-bulb {:+}", d), "fixed-dry-bulb", {.db = L + d},
        e.fixed_db.has_value(), v, std::fabs(d) <= 2.0);
  const double O = e.diff_db.value_or(0);
  for (auto [d, v] :
       {std::pair{0.0, Verdict::complies}, {0.1, Verdict::set_wrong}, {-1.0, Verdict::set_wrong}})
    add(fmt::format("differential-dry-bulb {:+}", d), "differential-dry-bulb", {.db_off = O + d},
        e.diff_db.has_value(), v);
  for (auto [d, v] : {std::pair{0.0, Verdict::complies}, {0.1, Verdict::set_wrong}})
    add(fmt::format("fixed-enthalpy {:+}", d), "fixed-enthalpy", {.h = 28 + d},
        e.fixed_h.has_value(), v, true);
  add("fixed-enthalpy+dry-bulb at", "fixed-enthalpy+dry-bulb", {}, e.fixed_h_db, Verdict::complies);
  add("fixed-enthalpy+dry-bulb inside", "fixed-enthalpy+dry-bulb", {.db = 74.96, .h = 27.96},
      e.fixed_h_db, Verdict::complies);
  add("fixed-enthalpy+dry-bulb h over", "fixed-enthalpy+dry-bulb", {.h = 28.1}, e.fixed_h_db,
      Verdict::set_wrong, true);
  add("fixed-enthalpy+dry-bulb t over", "fixed-enthalpy+dry-bulb", {.db = 75.1}, e.fixed_h_db,
      Verdict::set_wrong, true);
  add("differential-enthalpy at", "differential-enthalpy", {}, e.diff_h, Verdict::complies);
  add("differential-enthalpy over", "differential-enthalpy", {.h_off = 0.1}, e.diff_h,
      Verdict::set_wrong);
  add("differential-enthalpy+dry-bulb at", "differential-enthalpy+dry-bulb", {}, e.diff_h_db,
      Verdict::complies);
  add("differential-enthalpy+dry-bulb t over", "differential-enthalpy+dry-bulb", {.db = 75.1},
      e.diff_h_db, Verdict::set_wrong, true);
  add("fixed-dew-point+dry-bulb at", "fixed-dew-point+dry-bulb", {}, e.dew_db, Verdict::complies);
  add("fixed-dew-point+dry-bulb over", "fixed-dew-point+dry-bulb", {.dp = 55.1}, e.dew_db,
      Verdict::set_wrong, true);
  return out;
}

void check_grid(std::string_view edition, const std::vector<std::string>& zones,
                Expect (*expect)(const std::string&), bool selectable) {
  for (const auto& z : zones)
    for (const auto& c : cases(expect(z), selectable)) {
      const auto req = zone_req(edition, z);
      const auto got = codes::check_strategy(req, c.strategy);
      INFO(edition, " zone ", z, ": ", c.label, " -> ", codes::verdict_word(got.verdict), " (",
           codes::verdict_text(got, req, units::System::ip), ")");
      CHECK(got.verdict == c.want);
      if (got.verdict == Verdict::set_wrong || got.verdict == Verdict::complies_if_selectable) {
        CHECK(!got.deviations.empty());
        REQUIRE(got.instead.size() == 1);
        // The offered settings are the required ones of the same type, and they comply.
        const auto fixed = got.instead[0].strategy();
        REQUIRE(fixed.has_value());
        CHECK(codes::check_strategy(req, *fixed).verdict == Verdict::complies);
      }
      if (got.verdict == Verdict::not_allowed) {
        CHECK(!got.instead.empty());
        for (const auto& alt : got.instead)
          CHECK(codes::check_strategy(req, *alt.strategy()).verdict == Verdict::complies);
      }
    }
}

std::vector<std::string> ashrae_zones(bool zone0) {
  std::vector<std::string> z;
  if (zone0) z = {"0A", "0B"};
  for (const auto& s : {"1A", "1B", "2A", "2B", "3A", "3B", "3C", "4A", "4B", "4C", "5A", "5B",
                        "5C", "6A", "6B", "7", "8"})
    z.emplace_back(s);
  return z;
}

std::vector<std::string> without_zone0(const std::vector<std::string>& zones) {
  std::vector<std::string> out;
  for (const auto& z : zones)
    if (z[0] != '0') out.push_back(z);
  return out;
}

}  // namespace

// --- Loading and coverage -------------------------------------------------------------------

TEST_CASE("every shipped edition loads, with the zones it has") {
  // Zone 0 exists from 90.1-2016 and IECC 2021 on (from memory); Title 24 uses CZ 1–16.
  const std::map<std::string, bool> ashrae = {
      {"ashrae-90.1-2010", false}, {"ashrae-90.1-2013", false}, {"ashrae-90.1-2016", true},
      {"ashrae-90.1-2019", true},  {"ashrae-90.1-2022", true},  {"iecc-2015", false},
      {"iecc-2018", false},        {"iecc-2021", true},         {"iecc-2024", true}};
  const auto& t = shipped();
  CHECK(t.editions().size() == ashrae.size() + 4);
  for (const auto& [id, zone0] : ashrae) {
    CAPTURE(id);
    const auto& e = t.edition(id);
    CHECK(e.zone_system == codes::ZoneSystem::ashrae169);
    CHECK(e.zones == ashrae_zones(zone0));
    CHECK(e.governing_units == units::System::ip);
  }
  for (const auto* id : {"title24-2013", "title24-2016", "title24-2019", "title24-2022"}) {
    CAPTURE(id);
    const auto& e = t.edition(id);
    CHECK(e.zone_system == codes::ZoneSystem::california);
    REQUIRE(e.zones.size() == 16);
    CHECK(e.zones.front() == "CZ1");
    CHECK(e.zones.back() == "CZ16");
  }
}

TEST_CASE("every zone of every edition is covered exactly once per control type") {
  for (const auto& e : shipped().editions()) {
    const auto controls = e.controls();
    for (const auto& p : hl::presets())
      CHECK(std::find(controls.begin(), controls.end(), std::string(p.name)) != controls.end());
    for (const auto& c : controls)
      for (const auto& z : e.zones) {
        int n = 0;
        for (const auto& r : e.rows)
          if (r.control == c) n += static_cast<int>(std::count(r.zones.begin(), r.zones.end(), z));
        INFO(e.id, " ", c, " ", z);
        CHECK(n == 1);
      }
  }
}

TEST_CASE("every shipped row carries the from-memory provenance and a clause") {
  for (const auto& e : shipped().editions()) {
    CHECK(e.provenance == "from memory; verify against the adopted edition");
    CHECK(e.integration.provenance == "from memory; verify against the adopted edition");
    for (const auto& r : e.rows) {
      INFO(r.origin);
      CHECK(r.provenance == "from memory; verify against the adopted edition");
      CHECK(!r.clause.empty());
    }
  }
}

TEST_CASE("stored IP and SI limits agree through the enthalpy datum shift") {
  // 28 Btu/lb (0 °F datum) is 47.3 kJ/kg (0 °C datum): docs/model.md §Units and datums,
  // h_IP = h_SI/2.326 + 7.68.
  for (const auto& e : shipped().editions())
    for (const auto& r : e.rows)
      for (const auto& l : r.limits) {
        const auto kind = codes::setting_kind(l.quantity, l.reference);
        const double a = units::from_display(kind, units::System::ip, l.ip);
        const double b = units::from_display(kind, units::System::si, l.si);
        INFO(r.origin);
        CHECK(std::fabs(a - b) <= 0.5);
      }
  CHECK(units::enthalpy_si_from_ip(28) == doctest::Approx(47.26).epsilon(1e-3));
}

TEST_CASE("90.1-2010 records the manufacturer-curve type as one limitline does not model") {
  // 90.1-2010 Table 6.5.1.1.3A lists "electronic enthalpy" in every zone group (from memory).
  const auto req = zone_req("ashrae-90.1-2010", "4A");
  const auto it = std::find_if(req.allowed.begin(), req.allowed.end(), [](const auto& c) {
    return c.row->control == "electronic-enthalpy";
  });
  REQUIRE(it != req.allowed.end());
  CHECK_FALSE(it->row->modelled);
  CHECK(it->settings.empty());
  CHECK_FALSE(it->strategy().has_value());
  CHECK(codes::control_text(*it, units::System::ip) == it->row->description);
}

// --- Verdicts over zones × strategies × setpoints ---------------------------------------------

TEST_CASE("verdict grid: 90.1-2013 to -2022 and IECC 2015 to 2024 (from memory)") {
  for (const auto* id : {"ashrae-90.1-2013", "ashrae-90.1-2016", "ashrae-90.1-2019",
                         "ashrae-90.1-2022", "iecc-2015", "iecc-2018", "iecc-2021", "iecc-2024"}) {
    // Zone 0 rows are placed by analogy (the issue asks to verify them), so they are not
    // checked as values; coverage is checked above.
    check_grid(id, without_zone0(shipped().edition(id).zones), modern, true);
  }
}

TEST_CASE("verdict grid: 90.1-2010 (from memory)") {
  check_grid("ashrae-90.1-2010", shipped().edition("ashrae-90.1-2010").zones, ashrae2010, true);
}

TEST_CASE("verdict grid: Title 24 Part 6 2013 to 2022 (from memory)") {
  // No selectable-setpoint footnote is recalled for Title 24: every deviation is set-wrong.
  for (const auto* id : {"title24-2013", "title24-2016", "title24-2019", "title24-2022"})
    check_grid(id, shipped().edition(id).zones, title24, false);
}

TEST_CASE("a setting exactly at the limit complies; the deviation says how much and which way") {
  // 90.1-2019 Table 6.5.1.1.3: fixed dry-bulb 70 °F in 5A (from memory).
  const auto req = zone_req("ashrae-90.1-2019", "5A");
  CHECK(codes::check_strategy(req, strategy("fixed-dry-bulb", {.db = 70})).verdict ==
        Verdict::complies);
  const auto high = codes::check_strategy(req, strategy("fixed-dry-bulb", {.db = 75}));
  REQUIRE(high.verdict == Verdict::set_wrong);
  REQUIRE(high.deviations.size() == 1);
  CHECK(units::to_display(units::Kind::temperature_difference, units::System::ip,
                          high.deviations[0].difference()) == doctest::Approx(5.0));
  const std::string text = codes::deviation_text(high.deviations[0], units::System::ip);
  CHECK(text.find("dry-bulb limit 75.0 °F is 5.0 °F above the required 70.0 °F") == 0);
  const auto low = codes::check_strategy(req, strategy("fixed-dry-bulb", {.db = 68}));
  REQUIRE(low.deviations.size() == 1);
  CHECK(low.deviations[0].difference() < 0);
  CHECK(codes::deviation_text(low.deviations[0], units::System::si).find("K below") !=
        std::string::npos);
}

TEST_CASE("both settings of a two-condition type are checked") {
  const auto req = zone_req("ashrae-90.1-2019", "4A");
  const auto c =
      codes::check_strategy(req, strategy("fixed-enthalpy+dry-bulb", {.db = 78, .h = 31}));
  REQUIRE(c.verdict == Verdict::set_wrong);
  CHECK(c.deviations.size() == 2);
  const std::string text = codes::verdict_text(c, req, units::System::ip);
  CHECK(text.find("enthalpy limit 31.0 Btu/lb is 3.0 Btu/lb above the required 28.0 Btu/lb") !=
        std::string::npos);
  CHECK(text.find("dry-bulb limit 78.0 °F is 3.0 °F above the required 75.0 °F") !=
        std::string::npos);
  // One setting beyond the selectable-setpoint allowance (2 °F, from memory) keeps the whole
  // strategy set-wrong, even when the other is within it.
  CHECK(codes::check_strategy(req, strategy("fixed-enthalpy+dry-bulb", {.db = 76, .h = 31}))
            .verdict == Verdict::set_wrong);
}

TEST_CASE("Title 24 differential dry-bulb offsets below return air") {
  // Title 24 §140.4(e) high-limit table: CZ7 off when TOA > TRA − 6 °F (from memory).
  const auto req = zone_req("title24-2019", "7");
  CHECK(req.zone == "CZ7");
  CHECK(codes::check_strategy(req, strategy("differential-dry-bulb", {.db_off = -6})).verdict ==
        Verdict::complies);
  const auto c = codes::check_strategy(req, strategy("differential-dry-bulb", {.db_off = 0}));
  REQUIRE(c.verdict == Verdict::set_wrong);
  CHECK(codes::deviation_text(c.deviations[0], units::System::ip)
            .find("dry-bulb offset 0.0 °F is 6.0 °F above the required -6.0 °F") == 0);
  const auto& allowed = c.instead.at(0);
  CHECK(codes::control_text(allowed, units::System::ip) ==
        "outdoor dry-bulb > return dry-bulb − 6.0 °F");
}

TEST_CASE("a prohibited type gets the allowed alternatives, the closest first") {
  // 90.1-2019 has fixed enthalpy only together with a fixed dry-bulb limit (from memory).
  const auto req = zone_req("ashrae-90.1-2019", "4A");
  const auto c = codes::check_strategy(req, strategy("fixed-enthalpy", {}));
  REQUIRE(c.verdict == Verdict::not_allowed);
  REQUIRE(c.row != nullptr);
  CHECK(c.row->permission == codes::Permission::prohibited);
  REQUIRE(!c.instead.empty());
  CHECK(c.instead[0].row->control == "fixed-enthalpy+dry-bulb");
  // In 4A differential dry-bulb is prohibited (from memory): never offered.
  for (const auto& alt : c.instead) CHECK(alt.row->control != "differential-dry-bulb");
}

TEST_CASE("SI comparison uses the SI figures of the table") {
  // 90.1 SI edition: 18 °C for the 65 °F zones (from memory).
  const auto& e = shipped().edition("ashrae-90.1-2019");
  const auto si = codes::requirements(e, "4A", {{}, units::System::si});
  const auto ip = codes::requirements(e, "4A", {{}, units::System::ip});
  const auto at18 = hl::make_preset("fixed-dry-bulb", [] {
    auto s = hl::preset_defaults();
    s.dry_bulb_limit_c = 18.0;
    return s;
  }());
  CHECK(codes::check_strategy(si, at18).verdict == Verdict::complies);
  // Off by more than the tolerance, within the selectable-setpoint allowance (2 °F, 1.1 K).
  CHECK(codes::check_strategy(ip, at18).verdict ==
        Verdict::complies_if_selectable);  // 64.4 °F vs 65 °F
  CHECK(codes::check_strategy(ip, strategy("fixed-dry-bulb", {.db = 65})).verdict ==
        Verdict::complies);
  CHECK(codes::check_strategy(si, strategy("fixed-dry-bulb", {.db = 65})).verdict ==
        Verdict::complies_if_selectable);  // 18.3 °C vs 18 °C
}

// --- Matching custom conditions ---------------------------------------------------------------

TEST_CASE("custom conditions equivalent to a preset are judged as that preset") {
  const double p = psy::kStandardPressureKpa;
  hl::Strategy s;
  s.name = "custom";
  // Written in the other order from the preset.
  s.conditions = {
      {hl::Quantity::dry_bulb, hl::Reference::fixed, units::celsius_from_fahrenheit(75), 0},
      {hl::Quantity::enthalpy, hl::Reference::fixed, units::enthalpy_si_from_ip(28), 1.0}};
  const auto m = codes::match_control(s, p);
  REQUIRE(m.has_value());
  CHECK(m->control == "fixed-enthalpy+dry-bulb");
  REQUIRE(m->settings.size() == 2);
  CHECK(m->settings[0].setting.quantity == hl::Quantity::enthalpy);
  CHECK(verdict("ashrae-90.1-2019", "4A", s) == Verdict::complies);

  SUBCASE("two conditions on one quantity act as the lower limit") {
    hl::Strategy two;
    two.conditions = {
        {hl::Quantity::dry_bulb, hl::Reference::fixed, units::celsius_from_fahrenheit(75), 0},
        {hl::Quantity::dry_bulb, hl::Reference::fixed, units::celsius_from_fahrenheit(70), 0}};
    const auto m2 = codes::match_control(two, p);
    REQUIRE(m2.has_value());
    CHECK(m2->control == "fixed-dry-bulb");
    CHECK(m2->settings[0].conditions == 2);
    CHECK(units::fahrenheit_from_celsius(m2->settings[0].setting.value) == doctest::Approx(70));
    CHECK(verdict("ashrae-90.1-2019", "5A", two) == Verdict::complies);
  }
  SUBCASE("a fixed humidity ratio is a dew point at the site pressure") {
    // 90.1-2010: dew point 55 °F with dry-bulb 75 °F, all zones (from memory).
    const double w = psy::humidity_ratio_from_dew_point(units::celsius_from_fahrenheit(55), p);
    hl::Strategy hr;
    hr.conditions = {
        {hl::Quantity::humidity_ratio, hl::Reference::fixed, w, 0},
        {hl::Quantity::dry_bulb, hl::Reference::fixed, units::celsius_from_fahrenheit(75), 0}};
    const auto m3 = codes::match_control(hr, p);
    REQUIRE(m3.has_value());
    CHECK(m3->control == "fixed-dew-point+dry-bulb");
    CHECK(m3->settings[0].from_humidity_ratio);
    CHECK(units::fahrenheit_from_celsius(m3->settings[0].setting.value) ==
          doctest::Approx(55).epsilon(1e-9));
    CHECK(verdict("ashrae-90.1-2010", "4A", hr) == Verdict::complies);
    // The same humidity ratio at 5000 ft is a different dew point: set wrong there.
    CHECK(verdict("ashrae-90.1-2010", "4A", hr, psy::standard_pressure_kpa(1524)) ==
          Verdict::set_wrong);
  }
  SUBCASE("conditions that match no control type are not evaluable") {
    hl::Strategy odd;
    odd.conditions = {{hl::Quantity::dry_bulb, hl::Reference::fixed, 24, 0},
                      {hl::Quantity::dew_point, hl::Reference::return_air, 0, 0}};
    CHECK_FALSE(codes::match_control(odd, p).has_value());
    const auto req = zone_req("ashrae-90.1-2019", "4A");
    const auto c = codes::check_strategy(req, odd);
    CHECK(c.verdict == Verdict::not_evaluable);
    CHECK(c.row == nullptr);
    CHECK(!c.instead.empty());
    CHECK_FALSE(codes::match_control(hl::Strategy{}, p).has_value());
  }
}

// --- Altitude footnote -----------------------------------------------------------------------

TEST_CASE("fixed enthalpy limit at altitude follows the footnote") {
  // 90.1 high-limit table footnote: away from sea level the fixed enthalpy limit is the
  // enthalpy at 75 °F and 50 % RH at the site, about 30.7 Btu/lb near 6000 ft (from memory).
  const double p6000 = psy::standard_pressure_kpa(6000 * 0.3048);
  const auto enthalpy_of = [](const codes::ZoneRequirements& req) {
    for (const auto& c : req.allowed)
      if (c.row->control == "fixed-enthalpy+dry-bulb")
        for (const auto& s : c.settings)
          if (s.quantity == hl::Quantity::enthalpy) return s;
    FAIL("no fixed enthalpy setting");
    return codes::RequiredSetting{};
  };
  const auto high = enthalpy_of(zone_req("ashrae-90.1-2019", "5B", p6000));
  CHECK(high.site_adjusted);
  CHECK(units::enthalpy_ip_from_si(high.value) == doctest::Approx(30.7).epsilon(0.1 / 30.7));
  CHECK(units::enthalpy_ip_from_si(high.tabulated) == doctest::Approx(28.0));
  // Title 24 carries the same footnote (from memory).
  CHECK(enthalpy_of(zone_req("title24-2022", "CZ16", p6000)).site_adjusted);

  // At sea level the table's figure stands; the footnote is for sites well above it.
  const auto sea = enthalpy_of(zone_req("ashrae-90.1-2019", "5B", psy::kStandardPressureKpa));
  CHECK_FALSE(sea.site_adjusted);
  CHECK(units::enthalpy_ip_from_si(sea.value) == doctest::Approx(28.0));
  CHECK_FALSE(enthalpy_of(zone_req("ashrae-90.1-2019", "5B", psy::standard_pressure_kpa(300)))
                  .site_adjusted);
  CHECK(enthalpy_of(zone_req("ashrae-90.1-2019", "5B", psy::standard_pressure_kpa(600)))
            .site_adjusted);

  // The verdicts follow: 28 Btu/lb at 6000 ft shuts off early; the site figure complies.
  const auto at28 = strategy("fixed-enthalpy+dry-bulb", {});
  const auto c = codes::check_strategy(zone_req("ashrae-90.1-2019", "5B", p6000), at28);
  REQUIRE(c.verdict == Verdict::set_wrong);
  CHECK(c.deviations[0].difference() < 0);
  auto site = hl::preset_defaults();
  site.enthalpy_limit_kj_per_kg = high.value;
  CHECK(verdict("ashrae-90.1-2019", "5B", hl::make_preset("fixed-enthalpy+dry-bulb", site),
                p6000) == Verdict::complies);
  CHECK(verdict("ashrae-90.1-2019", "5B", at28, psy::kStandardPressureKpa) == Verdict::complies);
}

// --- Amendments ------------------------------------------------------------------------------

TEST_CASE("an amendment overriding one row changes exactly that verdict") {
  const auto base = codes::CodeTables::load(kShipped);
  const std::vector<std::filesystem::path> extra = {kTestData / "codes-amend-90.1-2019-4a.toml"};
  const auto amended = codes::CodeTables::load(kShipped, extra);

  std::vector<std::pair<std::string, hl::Strategy>> grid;
  for (double db : {65.0, 70.0, 75.0})
    grid.emplace_back(fmt::format("fdb {}", db), strategy("fixed-dry-bulb", {.db = db}));
  for (const auto& c : cases(Expect{}, false)) grid.emplace_back(c.label, c.strategy);
  auto all = [&](const codes::CodeTables& t) {
    std::map<std::string, Verdict> out;
    for (const auto& e : t.editions())
      for (const auto& z : e.zones) {
        const auto req = codes::requirements(e, z, {});
        for (const auto& [label, s] : grid)
          out[fmt::format("{} {} {}", e.id, z, label)] = codes::check_strategy(req, s).verdict;
      }
    return out;
  };
  const auto before = all(base), after = all(amended);
  REQUIRE(before.size() == after.size());
  std::set<std::string> changed;
  for (const auto& [k, v] : before)
    if (after.at(k) != v) changed.insert(k);
  // The table's 65 °F becomes the amendment's 70 °F: those two verdicts swap, nothing else.
  CHECK(changed ==
        std::set<std::string>{"ashrae-90.1-2019 4A fdb 65", "ashrae-90.1-2019 4A fdb 70"});
  CHECK(before.at("ashrae-90.1-2019 4A fdb 65") == Verdict::complies);
  CHECK(after.at("ashrae-90.1-2019 4A fdb 70") == Verdict::complies);
  const auto& e = amended.edition("ashrae-90.1-2019");
  CHECK(e.sources.size() == 2);
  CHECK(e.row("fixed-dry-bulb", "4A")->clause == "local 1");
  CHECK(e.row("fixed-dry-bulb", "3A")->clause == "6.5.1.1.3");
}

TEST_CASE("an extra file may add a whole edition") {
  const std::vector<std::filesystem::path> extra = {kTestData / "codes-minimal.toml"};
  const auto t = codes::CodeTables::load(kShipped, extra);
  const auto& e = t.edition("test-minimal");
  CHECK_FALSE(e.integration.required);
  CHECK(codes::check_integration(e, limitline::airside::EconomizerType::non_integrated).complies);
  check_error(
      [&] {
        (void)codes::CodeTables::load(kShipped, std::vector{extra[0], extra[0]});
      },
      {"codes-minimal.toml", "test-minimal", "already loaded", "[amendment]"});
}

// --- Malformed tables ------------------------------------------------------------------------

TEST_CASE("malformed table files are errors naming file, line and key") {
  auto load = [](const char* name) {
    return [name] { (void)codes::CodeTables::load(kShipped, std::vector{kTestData / name}); };
  };
  check_error(load("codes-bad-syntax.toml"), {"codes-bad-syntax.toml:23:", "not valid TOML"});
  check_error(load("codes-bad-key.toml"),
              {"codes-bad-key.toml:24:", "'dry_bulb_limit'", "not known"});
  check_error(load("codes-bad-units.toml"),
              {"codes-bad-units.toml:23:", "'dry_bulb_c'", "disagrees", "dry_bulb_f"});
  check_error(load("codes-bad-gap.toml"), {"codes-bad-gap.toml", "fixed-enthalpy", "CZ2"});
  check_error(load("codes-bad-overlap.toml"),
              {"codes-bad-overlap.toml:69", "codes-bad-overlap.toml:18", "CZ2", "fixed-dry-bulb"});
  check_error([] { (void)codes::CodeTables::load(kTestData / "no-such-folder"); },
              {"no-such-folder"});
  check_error([] { (void)codes::CodeTables::load(kShipped, std::vector{kTestData / "none.toml"}); },
              {"none.toml", "cannot open"});
}

TEST_CASE("each malformation of a row names its line and key") {
  const std::string base = read(kTestData / "codes-minimal.toml");
  // Line 21 is `dry_bulb_f = 75` in the first [[row]] (line 17) of the fixture.
  REQUIRE(base.find("dry_bulb_f = 75\n") != std::string::npos);
  auto with = [&](const std::string& from, const std::string& to) {
    std::string t = base;
    const auto at = t.find(from);
    REQUIRE(at != std::string::npos);
    return t.replace(at, from.size(), to);
  };
  auto fails = [&](const std::string& text, std::initializer_list<std::string> needles) {
    check_error([&] { (void)from_text(text); }, needles);
  };
  fails(with("dry_bulb_f = 75", "dry_bulb_f = \"75\""), {"mem.toml:21:", "'dry_bulb_f'", "number"});
  fails(with("dry_bulb_f = 75", "dry_bulb_f = inf"), {"mem.toml:21:", "'dry_bulb_f'", "finite"});
  fails(with("dry_bulb_f = 75\n", ""), {"mem.toml:17:", "'dry_bulb_f'", "missing"});
  fails(with("clause = \"T.2\"\nprovenance", "provenance"),
        {"mem.toml:17:", "'clause'", "missing"});
  fails(with("control = \"fixed-dry-bulb\"", "control = \"fixed-drybulb\""),
        {"mem.toml:18:", "'control'", "fixed-drybulb", "modelled = false"});
  fails(with("zones = \"all\"\ndry_bulb_f", "zones = [\"CZ1\", \"CZ3\"]\ndry_bulb_f"),
        {"mem.toml:20:", "'zones'", "CZ3", "not a zone of test-minimal"});
  fails(with("zones = \"all\"\ndry_bulb_f", "zones = [\"CZ1\", \"1\"]\ndry_bulb_f"),
        {"mem.toml:20:", "'zones'", "twice"});
  fails(with("permission = \"allowed\"", "permission = \"maybe\""),
        {"mem.toml:19:", "'permission'"});
  fails(with("permission = \"prohibited\"\nzones = \"all\"\nclause",
             "permission = \"prohibited\"\nzones = \"all\"\ndry_bulb_offset_delta_f = 0\nclause"),
        {"'dry_bulb_offset_delta_f'", "prohibited row takes no limits"});
  fails(with("dry_bulb_c = 23.9", "dry_bulb_c = 23.9\ndew_point_f = 55"),
        {"mem.toml:23:", "'dew_point_f'", "not a setting of 'fixed-dry-bulb'"});
  fails(with("dry_bulb_c = 23.9",
             "dry_bulb_c = 23.9\nsite_enthalpy = { dry_bulb_f = 75, dry_bulb_c = 23.9, "
             "relative_humidity_pct = 50 }"),
        {"mem.toml:23:", "'site_enthalpy'", "fixed enthalpy"});
  fails(with("zone_system = \"california\"", "zone_system = \"ashrae\""),
        {"mem.toml:6:", "'zone_system'"});
  fails(with("zones = [\"CZ1\", \"CZ2\"]", "zones = [\"CZ1\", \"CZ17\"]"),
        {"mem.toml:7:", "'zones'", "CZ17"});
  fails(with("required = false", "required = \"no\""), {"mem.toml:12:", "'required'"});
  fails(with("governing_units = \"ip\"", "governing_units = \"metric\""),
        {"mem.toml:8:", "'governing_units'"});
  fails(with("[edition]", "[amendment]\nedition = \"x\"\n[edition]"), {"mem.toml", "not both"});
  fails("title = \"nothing\"\n", {"mem.toml", "no [edition] or [amendment]"});
  // An enthalpy converted as a plain energy (28 × 2.326 = 65.1) misses the datum shift.
  const std::string enth =
      with("control = \"fixed-enthalpy\"\npermission = \"prohibited\"\nzones = \"all\"",
           "control = \"fixed-enthalpy\"\npermission = \"allowed\"\nzones = \"all\"\n"
           "enthalpy_btu_per_lb = 28\nenthalpy_kj_per_kg = 65.1");
  fails(enth, {"'enthalpy_kj_per_kg'", "disagrees"});
  CHECK_NOTHROW((void)from_text(base));
  CHECK_NOTHROW((void)from_text(
      with("control = \"fixed-enthalpy\"\npermission = \"prohibited\"\nzones = \"all\"",
           "control = \"fixed-enthalpy\"\npermission = \"allowed\"\nzones = \"all\"\n"
           "enthalpy_btu_per_lb = 28\nenthalpy_kj_per_kg = 47.3")));
}

TEST_CASE("a type limitline does not model is recorded, never selected") {
  const std::string base = read(kTestData / "codes-minimal.toml");
  const std::string extra =
      "\n[[row]]\ncontrol = \"maker-curve\"\nmodelled = false\npermission = \"allowed\"\n"
      "zones = \"all\"\ndescription = \"a changeover curve\"\nclause = \"T.4\"\n"
      "provenance = \"test fixture\"\n";
  const auto t = from_text(base + extra);
  const auto req = codes::requirements(t.edition("test-minimal"), "CZ1", {});
  REQUIRE(req.allowed.size() == 2);
  CHECK(req.allowed[1].row->control == "maker-curve");
  const auto c = codes::check_strategy(req, strategy("differential-dry-bulb", {}));
  CHECK(c.verdict == Verdict::not_allowed);
  for (const auto& alt : c.instead) CHECK(alt.row->modelled);
  // Only some zones: the coverage check names the gap.
  std::string partial = base + extra;
  partial.replace(partial.rfind("zones = \"all\""), 13, "zones = [\"CZ2\"]");
  check_error([&] { (void)from_text(partial); }, {"maker-curve", "CZ1", "every zone"});
  check_error(
      [&] {
        (void)from_text(base + "\n[[row]]\ncontrol = \"fixed-dry-bulb\"\nmodelled = false\n");
      },
      {"'modelled'", "preset"});
  std::string nodesc = base + extra;
  nodesc.erase(nodesc.find("description = \"a changeover curve\"\n"), 35);
  check_error([&] { (void)from_text(nodesc); }, {"description"});
}

TEST_CASE("amendments are checked like tables") {
  const std::string minimal = read(kTestData / "codes-minimal.toml");
  auto docs = [&](const std::string& amendment) {
    const std::vector<std::pair<std::string, std::string>> d = {{"base.toml", minimal},
                                                                {"amend.toml", amendment}};
    return codes::CodeTables::from_documents(d);
  };
  check_error(
      [&] { (void)docs("[amendment]\nedition = \"nope\"\nname = \"x\"\nprovenance = \"y\"\n"); },
      {"amend.toml:2:", "'edition'", "nope", "test-minimal"});
  check_error([&] { (void)docs("[amendment]\nedition = \"test-minimal\"\nname = \"x\"\n"); },
              {"amend.toml:1:", "'provenance'", "missing"});
  check_error(
      [&] {
        (void)docs("[amendment]\nedition = \"test-minimal\"\nname = \"x\"\nprovenance = \"y\"\n");
      },
      {"amend.toml", "changes nothing"});
  // A new control type in an amendment must still cover every zone.
  check_error(
      [&] {
        (void)docs(
            "[amendment]\nedition = \"test-minimal\"\nname = \"x\"\nprovenance = \"y\"\n\n"
            "[[row]]\ncontrol = \"curve\"\nmodelled = false\npermission = \"allowed\"\n"
            "zones = [\"CZ1\"]\ndescription = \"d\"\nclause = \"c\"\nprovenance = \"p\"\n");
      },
      {"amend.toml", "curve", "CZ2"});
  const auto t = docs(
      "[amendment]\nedition = \"test-minimal\"\nname = \"x\"\nprovenance = \"y\"\n\n"
      "[integration]\nrequired = true\nclause = \"L\"\nrequirement = \"r\"\n"
      "provenance = \"p\"\n");
  CHECK(t.edition("test-minimal").integration.required);
}

// --- Zones, integration, helpers -------------------------------------------------------------

TEST_CASE("climate zones are read in the spellings people write") {
  using codes::ZoneSystem;
  CHECK(codes::normalise_zone(ZoneSystem::ashrae169, "4a", "z") == "4A");
  CHECK(codes::normalise_zone(ZoneSystem::ashrae169, " 7 ", "z") == "7");
  CHECK(codes::normalise_zone(ZoneSystem::california, "12", "z") == "CZ12");
  CHECK(codes::normalise_zone(ZoneSystem::california, "cz 3", "z") == "CZ3");
  CHECK(codes::normalise_zone(ZoneSystem::california, "CZ-16", "z") == "CZ16");
  check_error([] { (void)codes::normalise_zone(ZoneSystem::ashrae169, "7A", "--zone"); },
              {"--zone", "7A", "no A/B/C split"});
  check_error([] { (void)codes::normalise_zone(ZoneSystem::ashrae169, "4", "--zone"); },
              {"--zone", "moisture regime"});
  check_error([] { (void)codes::normalise_zone(ZoneSystem::ashrae169, "9C", "--zone"); },
              {"--zone", "9C", "0A"});
  check_error([] { (void)codes::normalise_zone(ZoneSystem::california, "17", "--zone"); },
              {"--zone", "17", "1 to 16"});
  check_error([] { (void)zone_req("ashrae-90.1-2013", "0A"); },
              {"--zone", "0A", "not a zone of ashrae-90.1-2013"});
  check_error([] { (void)shipped().edition("ashrae-90.1-2020"); },
              {"--edition", "ashrae-90.1-2020", "ashrae-90.1-2019"});
  check_error(
      [] {
        (void)codes::requirements(shipped().edition("iecc-2021"), "4A", {5.0, {}});
      },
      {"site pressure"});
}

TEST_CASE("integrated economizers are required by every shipped edition (from memory)") {
  // 90.1 §6.5.1.3, IECC C403.3.1 (2015) / C403.5.1, Title 24 §140.4(e) (all from memory).
  for (const auto& e : shipped().editions()) {
    CAPTURE(e.id);
    CHECK(e.integration.required);
    CHECK(codes::check_integration(e, limitline::airside::EconomizerType::integrated).complies);
    CHECK_FALSE(
        codes::check_integration(e, limitline::airside::EconomizerType::non_integrated).complies);
  }
}

TEST_CASE("compliance words for the annual report") {
  const auto s = hl::all_presets(hl::preset_defaults());  // 75 °F, 28 Btu/lb, 55 °F
  const auto words = codes::compliance_words(shipped(), "ashrae-90.1-2019", "4A", {}, s);
  REQUIRE(words.size() == s.size());
  // 90.1-2019 in 4A (from memory): 65 °F fixed dry-bulb, no differential dry-bulb, the
  // enthalpy types only with the 75 °F dry-bulb limit, no dew-point type.
  const std::map<std::string, std::string> want = {{"fixed-dry-bulb", "set-wrong"},
                                                   {"differential-dry-bulb", "not-allowed"},
                                                   {"fixed-enthalpy", "not-allowed"},
                                                   {"fixed-enthalpy+dry-bulb", "complies"},
                                                   {"differential-enthalpy", "not-allowed"},
                                                   {"differential-enthalpy+dry-bulb", "complies"},
                                                   {"fixed-dew-point+dry-bulb", "not-allowed"}};
  for (std::size_t i = 0; i < s.size(); ++i) {
    CAPTURE(s[i].preset);
    CHECK(words[i] == want.at(s[i].preset));
  }
  check_error([&] { (void)codes::compliance_words(shipped(), "ashrae-90.1-2019", "4D", {}, s); },
              {"climate_zone", "4D"});
  check_error([&] { (void)codes::compliance_words(shipped(), "ashrae-2019", "4A", {}, s); },
              {"energy_code", "ashrae-2019"});
}

TEST_CASE("the code-table folder is found from the environment, else the install or source") {
  const char* old = std::getenv("LIMITLINE_DATA_DIR");
  const std::string saved = old ? old : "";
  setenv("LIMITLINE_DATA_DIR", (std::string(LIMITLINE_SOURCE_DIR) + "/data").c_str(), 1);
  CHECK(std::filesystem::equivalent(codes::code_table_dir(), kShipped));
  setenv("LIMITLINE_DATA_DIR", (kTestData / "no-such-folder").c_str(), 1);
  check_error([] { (void)codes::code_table_dir(); }, {"LIMITLINE_DATA_DIR", "no-such-folder"});
  unsetenv("LIMITLINE_DATA_DIR");
  CHECK(std::filesystem::is_directory(codes::code_table_dir()));
  CHECK(codes::CodeTables::load_installed().editions().size() >= 13);
  if (old) setenv("LIMITLINE_DATA_DIR", saved.c_str(), 1);
}

TEST_CASE("setting keys follow the JSON key convention") {
  using hl::Quantity;
  using hl::Reference;
  CHECK(codes::setting_key(Quantity::dry_bulb, Reference::fixed, units::System::ip) ==
        "dry_bulb_f");
  CHECK(codes::setting_key(Quantity::enthalpy, Reference::fixed, units::System::si) ==
        "enthalpy_kj_per_kg");
  CHECK(codes::setting_key(Quantity::dry_bulb, Reference::return_air, units::System::si) ==
        "dry_bulb_offset_delta_k");
  CHECK(codes::setting_key(Quantity::enthalpy, Reference::return_air, units::System::ip) ==
        "enthalpy_offset_delta_btu_per_lb");
  CHECK(codes::tolerance(Quantity::dry_bulb, units::System::ip) == codes::kTemperatureToleranceF);
  CHECK(codes::tolerance(Quantity::enthalpy, units::System::si) ==
        codes::kEnthalpyToleranceKjPerKg);
}

TEST_CASE("a code table nested beyond 64 levels is refused before the parser sees it") {
  std::string dotted;
  for (int i = 0; i < 50000; ++i) dotted += i ? ".a" : "a";
  check_error([&] { (void)from_text("[edition]\nid = \"x\"\n" + dotted + " = 1\n", "deep.toml"); },
              {"deep.toml:3:", "nested more than 64 levels deep"});
  check_error([&] { (void)from_text("[" + dotted + "]\n", "deep.toml"); },
              {"deep.toml:1:", "nested more than 64 levels deep"});
  check_error([&] { (void)from_text("x = " + std::string(50000, '[') + "\n", "deep.toml"); },
              {"deep.toml:1:", "nested more than 64 levels deep"});
}

TEST_CASE("a unit's [site] energy_code and climate_zone are checked, naming FILE:LINE") {
  CHECK_NOTHROW(codes::check_site_code("", "", "", ""));
  CHECK_NOTHROW(codes::check_site_code("ashrae-90.1-2019", "u.toml:4: site.energy_code", "4a",
                                       "u.toml:5: site.climate_zone"));
  check_error(
      [] {
        codes::check_site_code("ashrae-90.1-2099", "u.toml:4: site.energy_code", "4A",
                               "u.toml:5: site.climate_zone");
      },
      {"u.toml:4: site.energy_code: 'ashrae-90.1-2099' is not a loaded code edition",
       "ashrae-90.1-2019"});
  check_error(
      [] {
        codes::check_site_code("ashrae-90.1-2019", "u.toml:4: site.energy_code", "4D",
                               "u.toml:5: site.climate_zone");
      },
      {"u.toml:5: site.climate_zone:", "4D"});
  check_error(
      [] { codes::check_site_code("ashrae-90.1-2019", "u.toml:4: site.energy_code", "", ""); },
      {"u.toml:4: site.energy_code: the site names an energy code but no climate_zone"});
  check_error([] { codes::check_site_code("", "", "4A", "u.toml:5: site.climate_zone"); },
              {"u.toml:5: site.climate_zone: the site names a climate zone but no energy_code"});
}

TEST_CASE("zone and edition errors echo the value safely") {
  check_error(
      [] { (void)codes::normalise_zone(codes::ZoneSystem::ashrae169, "4\x1b[2J", "--zone"); },
      {"--zone", "'4\\x1b[2J'"});
  check_error([] { (void)shipped().edition(std::string(500, 'x')); },
              {"--edition", "(500 characters)"});
}

// --- Economizer requirement (from memory; see the header of each data/codes file) ----------------

namespace {

struct RequirementExpect {
  std::string edition;
  std::vector<std::string> exempt;  // zones where no economizer is required
  bool inclusive;                   // required at the threshold itself
  std::string clause;
};

}  // namespace

TEST_CASE("economizer requirement: thresholds and exempt zones per edition (from memory)") {
  // Recalled without the documents at hand: 90.1 Table 6.5.1-1 (6.5.1A in 2010) requires an
  // air or water economizer from 54,000 Btu/h in zones 2A–8, none in 1A/1B (and zone 0 where
  // the edition has it); IECC C403.3 (2015) / C403.5 (2018 on) the same figure and zones;
  // Title 24 Part 6 §140.4(e) over 54,000 Btu/h in every California zone.
  const std::vector<RequirementExpect> table = {
      {"ashrae-90.1-2010", {"1A", "1B"}, true, "6.5.1"},
      {"ashrae-90.1-2013", {"1A", "1B"}, true, "6.5.1"},
      {"ashrae-90.1-2016", {"0A", "0B", "1A", "1B"}, true, "6.5.1"},
      {"ashrae-90.1-2019", {"0A", "0B", "1A", "1B"}, true, "6.5.1"},
      {"ashrae-90.1-2022", {"0A", "0B", "1A", "1B"}, true, "6.5.1"},
      {"iecc-2015", {"1A", "1B"}, true, "C403.3"},
      {"iecc-2018", {"1A", "1B"}, true, "C403.5"},
      {"iecc-2021", {"0A", "0B", "1A", "1B"}, true, "C403.5"},
      {"iecc-2024", {"0A", "0B", "1A", "1B"}, true, "C403.5"},
      {"title24-2013", {}, false, "§140.4(e)"},
      {"title24-2016", {}, false, "§140.4(e)"},
      {"title24-2019", {}, false, "§140.4(e)"},
      {"title24-2022", {}, false, "§140.4(e)"},
  };
  CHECK(table.size() == shipped().editions().size());
  const double threshold_kw = 54.0 / 3.412141633;  // 54,000 Btu/h (1 W = 3.412141633 Btu/h)
  for (const auto& x : table) {
    CAPTURE(x.edition);
    const auto& e = shipped().edition(x.edition);
    REQUIRE(e.economizer_requirement.has_value());
    const auto& r = *e.economizer_requirement;
    CHECK(r.clause == x.clause);
    CHECK(r.provenance == kProvenance);
    CHECK_FALSE(r.exceptions.empty());
    for (const auto& z : e.zones) {
      CAPTURE(z);
      const auto need = codes::economizer_need(codes::requirements(e, z, {}));
      if (in(x.exempt, z)) {
        CHECK(need.need == codes::Need::exempt_zone);
        continue;
      }
      REQUIRE(need.need == codes::Need::required);
      CHECK(need.threshold_kw == doctest::Approx(threshold_kw));
      CHECK(need.group->inclusive == x.inclusive);
      CHECK(need.group->provenance.find("from memory") == 0);
    }
  }
}

TEST_CASE("a unit's capacity against the threshold: at, above, below, and 'over' editions") {
  const double at_kw = 54.0 / 3.412141633;  // 54,000 Btu/h
  const auto ashrae = zone_req("ashrae-90.1-2019", "4A");
  CHECK(codes::economizer_need(ashrae, at_kw).need == codes::Need::required);
  CHECK(codes::economizer_need(ashrae, at_kw * 1.01).need == codes::Need::required);
  CHECK(codes::economizer_need(ashrae, at_kw * 0.99).need == codes::Need::below_threshold);
  // Title 24 requires it only over the figure (from memory): the figure itself is below.
  const auto t24 = zone_req("title24-2022", "12");
  CHECK(codes::economizer_need(t24, at_kw).need == codes::Need::below_threshold);
  CHECK(codes::economizer_need(t24, at_kw * 1.01).need == codes::Need::required);
  // An exempt zone stays exempt whatever the capacity.
  CHECK(codes::economizer_need(zone_req("ashrae-90.1-2019", "1A"), 1000.0).need ==
        codes::Need::exempt_zone);
  CHECK(codes::threshold_text(codes::economizer_need(ashrae), units::System::ip)
            .find("at least 54.0 kBtu/h") != std::string::npos);
  CHECK(codes::threshold_text(codes::economizer_need(t24), units::System::ip)
            .find("more than 54.0 kBtu/h") != std::string::npos);
  // An edition whose file gives no requirement table says so rather than guessing.
  const auto minimal = from_text(read(kTestData / "codes-minimal.toml"));
  const auto none = codes::requirements(minimal.edition("test-minimal"), "CZ1", {});
  CHECK(codes::economizer_need(none, 100.0).need == codes::Need::no_table);
  CHECK(std::string(codes::need_text(codes::Need::no_table)).find("no requirement table") !=
        std::string::npos);
}

TEST_CASE("each malformation of a requirement or selectable table names its line and key") {
  const std::string base = read(kTestData / "codes-minimal.toml");
  const std::string head = base.substr(0, base.find("[[row]]"));
  const std::string rows = base.substr(base.find("[[row]]"));
  // The fixture's [[row]] tables start on line 17; the tables below are inserted there.
  REQUIRE(std::count(head.begin(), head.end(), '\n') == 16);
  const std::string req =
      "[economizer_requirement]\n"          // 17
      "clause = \"T.5\"\n"                  // 18
      "requirement = \"test\"\n"            // 19
      "provenance = \"test fixture\"\n"     // 20
      "[[economizer_requirement.group]]\n"  // 21
      "zones = [\"CZ1\"]\n"                 // 22
      "required = false\n"                  // 23
      "[[economizer_requirement.group]]\n"  // 24
      "zones = [\"CZ2\"]\n"                 // 25
      "required = true\n"                   // 26
      "capacity_kbtu_per_h = 54\n"          // 27
      "capacity_kw = 15.8\n"                // 28
      "inclusive = true\n";                 // 29
  auto doc = [&](const std::string& tables) { return head + tables + rows; };
  auto with = [&](const std::string& from, const std::string& to) {
    std::string t = req;
    const auto at = t.find(from);
    REQUIRE(at != std::string::npos);
    return t.replace(at, from.size(), to);
  };
  auto fails = [&](const std::string& tables, std::initializer_list<std::string> needles) {
    check_error([&] { (void)from_text(doc(tables)); }, needles);
  };
  const auto ok = from_text(doc(req));
  const auto& e = ok.edition("test-minimal");
  REQUIRE(e.economizer_requirement);
  CHECK(e.economizer_requirement->groups.size() == 2);
  CHECK(e.economizer_requirement->groups[1].origin == "mem.toml:24");
  CHECK(e.economizer_requirement->groups[1].provenance == "test fixture");  // inherited

  fails(with("capacity_kw = 15.8", "capacity_kw = 20"),
        {"mem.toml:28:", "'capacity_kw'", "disagrees", "capacity_kbtu_per_h"});
  fails(with("capacity_kw = 15.8\n", ""), {"mem.toml:24:", "'capacity_kw'", "missing"});
  fails(with("capacity_kbtu_per_h = 54", "capacity_kbtu_per_h = \"54\""),
        {"mem.toml:27:", "'capacity_kbtu_per_h'", "number"});
  fails(with("required = false\n", "required = false\ncapacity_kw = 10\n"),
        {"mem.toml:24:", "'capacity_kw'", "takes no threshold"});
  fails(with("zones = [\"CZ2\"]", "zones = [\"CZ1\"]"), {"mem.toml:24", "CZ1", "mem.toml:21"});
  fails(with("zones = [\"CZ2\"]", "zones = [\"CZ9\"]"), {"mem.toml:25:", "'zones'", "CZ9"});
  fails(with("inclusive = true\n", "inclusive = true\nthreshold = 3\n"),
        {"mem.toml:30:", "'threshold'", "not known"});
  fails(with("[[economizer_requirement.group]]\nzones = [\"CZ2\"]\nrequired = true\n"
             "capacity_kbtu_per_h = 54\ncapacity_kw = 15.8\ninclusive = true\n",
             ""),
        {"mem.toml:17", "CZ2", "no group"});
  fails(with("clause = \"T.5\"\n", ""), {"mem.toml:17:", "'clause'", "missing"});

  const std::string sel =
      "[selectable_setpoints]\n"          // 17
      "clause = \"T.6\"\n"                // 18
      "note = \"steps\"\n"                // 19
      "dry_bulb_delta_f = 2\n"            // 20
      "dry_bulb_delta_k = 1.1\n"          // 21
      "provenance = \"test fixture\"\n";  // 22
  CHECK_NOTHROW((void)from_text(doc(sel)));
  auto sel_with = [&](const std::string& from, const std::string& to) {
    std::string t = sel;
    return t.replace(t.find(from), from.size(), to);
  };
  fails(sel_with("dry_bulb_delta_k = 1.1", "dry_bulb_delta_k = 3"),
        {"mem.toml:21:", "'dry_bulb_delta_k'", "disagrees"});
  fails(sel_with("dry_bulb_delta_k = 1.1\n", ""),
        {"mem.toml:17:", "'dry_bulb_delta_k'", "missing"});
  fails(sel_with("dry_bulb_delta_f = 2", "dry_bulb_delta_f = -2"),
        {"mem.toml:20:", "'dry_bulb_delta_f'", "above 0"});
  fails(sel_with("dry_bulb_delta_f = 2\ndry_bulb_delta_k = 1.1\n", ""),
        {"mem.toml:17:", "no allowance"});
  fails(sel_with("note = \"steps\"", "note = \"steps\"\nhumidity_delta = 1"),
        {"mem.toml:20:", "'humidity_delta'", "not known"});
}

TEST_CASE("an amendment may replace the requirement table, and is checked like one") {
  const std::string amend =
      "[amendment]\nedition = \"ashrae-90.1-2019\"\nname = \"test\"\nprovenance = \"test\"\n"
      "[economizer_requirement]\nclause = \"A.1\"\nrequirement = \"r\"\nprovenance = \"test\"\n"
      "[[economizer_requirement.group]]\nzones = \"all\"\nrequired = false\n";
  std::vector<std::pair<std::string, std::string>> docs;
  for (const auto& f : std::filesystem::directory_iterator(kShipped))
    docs.emplace_back(f.path().string(), read(f.path()));
  std::sort(docs.begin(), docs.end());
  docs.emplace_back("amend.toml", amend);
  const auto t = codes::CodeTables::from_documents(docs);
  CHECK(codes::economizer_need(codes::requirements(t.edition("ashrae-90.1-2019"), "4A", {}), 100.0)
            .need == codes::Need::exempt_zone);
  docs.back().second = amend.substr(0, amend.find("[[economizer"));
  check_error([&] { (void)codes::CodeTables::from_documents(docs); },
              {"amend.toml:5:", "economizer_requirement.group"});
}

// --- Economizer fault detection ---------------------------------------------------------------

TEST_CASE("fault-detection requirements per edition (from memory): which editions, which faults") {
  const auto t = codes::CodeTables::load(kShipped);
  // From memory: the clause entered 90.1 with the 2013 edition, the IECC with 2015 and Title 24
  // with 2013; Title 24 applies it from 54,000 Btu/h (4.5 tons), the others to any unit the
  // clause's equipment types cover.
  const std::pair<std::string_view, std::string_view> clauses[] = {
      {"ashrae-90.1-2013", "6.4.3.12"}, {"ashrae-90.1-2016", "6.4.3.12"},
      {"ashrae-90.1-2019", "6.4.3.12"}, {"ashrae-90.1-2022", "6.4.3.12"},
      {"iecc-2015", "C403.2.4.7"},      {"iecc-2018", "C403.5.5"},
      {"iecc-2021", "C403.5.5"},        {"iecc-2024", "C403.5.5"},
      {"title24-2013", "§120.2(i)"},    {"title24-2016", "§120.2(i)"},
      {"title24-2019", "§120.2(i)"},    {"title24-2022", "§120.2(i)"}};
  for (const auto& [id, clause] : clauses) {
    CAPTURE(id);
    const auto& e = t.edition(id);
    REQUIRE(e.fault_detection);
    const auto& d = *e.fault_detection;
    CHECK(d.clause == clause);
    CHECK(d.faults.size() == codes::kFaultCount);  // every fault limitline names
    CHECK(d.find(codes::Fault::outdoor_air_above_minimum) != nullptr);
    CHECK(d.sensor_accuracy_ip.value_or(0) == 2.0);  // ±2 °F, from memory
    CHECK(d.provenance.find("from memory") != std::string::npos);
    const bool california = id.starts_with("title24");
    CHECK(d.capacity_ip.has_value() == california);
    // 53 kW is under 54,000 Btu/h (15.8 kW); 16 kW over it.
    CHECK(d.covers_capacity(16.0, units::System::ip));
    CHECK(d.covers_capacity(10.0, units::System::ip) == !california);
  }
  CHECK_FALSE(t.edition("ashrae-90.1-2010").fault_detection);
}

TEST_CASE("each malformation of a fault-detection table names its line and key") {
  const std::string base = read(kTestData / "codes-minimal.toml");
  const std::string head = base.substr(0, base.find("[[row]]"));
  const std::string rows = base.substr(base.find("[[row]]"));
  REQUIRE(std::count(head.begin(), head.end(), '\n') == 16);  // the table starts on line 17
  const std::string fdd =
      "[fault_detection]\n"                     // 17
      "clause = \"T.7\"\n"                      // 18
      "applies_to = \"test units\"\n"           // 19
      "capacity_kbtu_per_h = 54\n"              // 20
      "capacity_kw = 15.8\n"                    // 21
      "sensors = [\"outdoor\", \"supply\"]\n"   // 22
      "sensor_accuracy_delta_f = 2\n"           // 23
      "sensor_accuracy_delta_k = 1.1\n"         // 24
      "reporting = \"locally\"\n"               // 25
      "provenance = \"test fixture\"\n"         // 26
      "[[fault_detection.fault]]\n"             // 27
      "fault = \"damper-not-modulating\"\n"     // 28
      "code_term = \"the damper is stuck\"\n";  // 29
  const auto with = [&](const std::string& from, const std::string& to) {
    std::string t = fdd;
    const auto at = t.find(from);
    REQUIRE(at != std::string::npos);
    return head + t.replace(at, from.size(), to) + rows;
  };
  const auto fails = [&](const std::string& text, std::initializer_list<std::string> needles) {
    check_error([&] { (void)from_text(text); }, needles);
  };
  const auto ok = from_text(head + fdd + rows);
  const auto& d = *ok.edition("test-minimal").fault_detection;
  CHECK(d.origin == "mem.toml:17");
  REQUIRE(d.faults.size() == 1);
  CHECK(d.faults[0].fault == codes::Fault::damper_not_modulating);
  CHECK(d.faults[0].code_term == "the damper is stuck");

  fails(with("capacity_kw = 15.8", "capacity_kw = 30"),
        {"mem.toml:21:", "'capacity_kw'", "disagrees"});
  fails(with("sensor_accuracy_delta_k = 1.1", "sensor_accuracy_delta_k = 2"),
        {"mem.toml:24:", "'sensor_accuracy_delta_k'", "disagrees"});
  fails(with("sensor_accuracy_delta_k = 1.1\n", ""),
        {"mem.toml:17:", "'sensor_accuracy_delta_k'", "missing"});
  fails(with("\"damper-not-modulating\"", "\"stuck-damper\""),
        {"mem.toml:28:", "'fault'", "stuck-damper", "sensor-fault"});
  fails(with("code_term = \"the damper is stuck\"\n",
             "code_term = \"a\"\n[[fault_detection.fault]]\nfault = \"damper-not-modulating\"\n"
             "code_term = \"b\"\n"),
        {"mem.toml:31:", "'fault'", "listed twice"});
  fails(with("sensors = [\"outdoor\", \"supply\"]", "sensors = []"),
        {"mem.toml:22:", "'sensors'", "no sensor"});
  fails(with("reporting = \"locally\"\n", ""), {"mem.toml:17:", "'reporting'", "missing"});
  fails(with("[[fault_detection.fault]]\nfault = \"damper-not-modulating\"\n"
             "code_term = \"the damper is stuck\"\n",
             ""),
        {"mem.toml:17:", "fault_detection.fault"});
  fails(with("provenance = \"test fixture\"", "provenance = \"t\"\ninterval = 5"),
        {"mem.toml:27:", "'interval'", "not known"});
}

// --- The selectable-setpoint footnote ---------------------------------------------------------

TEST_CASE("selectable setpoints: 74 °F against a listed 75 °F, and where the footnote is absent") {
  // 90.1-2019 Table 6.5.1.1.3 (from memory): 75 °F in 5B, and a footnote letting a device with
  // selectable setpoints be set within 2 °F and 2 Btu/lb of the listed setting.
  const auto req = zone_req("ashrae-90.1-2019", "5B");
  const auto c = codes::check_strategy(req, strategy("fixed-dry-bulb", {.db = 74}));
  REQUIRE(c.verdict == Verdict::complies_if_selectable);
  CHECK(codes::verdict_word(c.verdict) == "complies-if-selectable");
  REQUIRE(c.selectable != nullptr);
  REQUIRE(c.deviations.size() == 1);
  CHECK(units::to_display(units::Kind::temperature_difference, units::System::ip,
                          c.deviations[0].difference()) == doctest::Approx(-1.0));
  const std::string text = codes::verdict_text(c, req, units::System::ip);
  INFO(text);
  CHECK(text.find("dry-bulb limit 74.0 °F is 1.0 °F below the required 75.0 °F") !=
        std::string::npos);
  CHECK(text.find("within the 2.0 °F") != std::string::npos);
  CHECK(text.find("selectable") != std::string::npos);
  CHECK(text.find("from memory") != std::string::npos);  // the footnote's provenance
  REQUIRE(c.instead.size() == 1);  // the listed setting, for an adjustable device
  // 3 °F off is beyond the allowance: an ordinary set-wrong.
  CHECK(verdict("ashrae-90.1-2019", "5B", strategy("fixed-dry-bulb", {.db = 72})) ==
        Verdict::set_wrong);
  // Exactly at the allowance still counts (within 2 °F).
  CHECK(verdict("ashrae-90.1-2019", "5B", strategy("fixed-dry-bulb", {.db = 77})) ==
        Verdict::complies_if_selectable);
  // An offset from the return air has no listed step: the footnote does not apply.
  CHECK(verdict("ashrae-90.1-2019", "5B", strategy("differential-dry-bulb", {.db_off = -1})) ==
        Verdict::set_wrong);
  // Title 24 (from memory) has no such footnote: 74 °F against 75 °F in CZ1 is set-wrong.
  CHECK(verdict("title24-2022", "1", strategy("fixed-dry-bulb", {.db = 74})) == Verdict::set_wrong);
  CHECK_FALSE(shipped().edition("title24-2022").selectable.has_value());
  // Enthalpy: 27 Btu/lb against 28 in 4A is within 2 Btu/lb.
  CHECK(verdict("ashrae-90.1-2019", "4A", strategy("fixed-enthalpy+dry-bulb", {.h = 27})) ==
        Verdict::complies_if_selectable);
}

TEST_CASE("the footnote's allowance in SI figures is the SI row of the table") {
  // 2 °F is 1.11 K; the table stores 1.1 K for SI comparisons (a conversion, from memory).
  const auto& e = shipped().edition("ashrae-90.1-2019");
  REQUIRE(e.selectable);
  CHECK(*e.selectable->allowance(hl::Quantity::dry_bulb, units::System::ip) ==
        doctest::Approx(2.0 / 1.8));
  CHECK(*e.selectable->allowance(hl::Quantity::dry_bulb, units::System::si) ==
        doctest::Approx(1.1));
  CHECK(*e.selectable->allowance(hl::Quantity::enthalpy, units::System::ip) ==
        doctest::Approx(2.0 * 2.326));
  CHECK_FALSE(e.selectable->allowance(hl::Quantity::humidity_ratio, units::System::ip));
}

// --- Preset settings from the code ------------------------------------------------------------

TEST_CASE("code defaults: only the settings left to common practice, only where allowed") {
  // 90.1-2019 Table 6.5.1.1.3, zone 4A (from memory): fixed dry-bulb 65 °F; fixed enthalpy
  // 28 Btu/lb with 75 °F; differential dry-bulb prohibited.
  const auto req = zone_req("ashrae-90.1-2019", "4A");
  auto all = hl::all_presets(hl::preset_defaults());
  auto written = strategy("fixed-dry-bulb", {.db = 70});
  written.name = "written";
  written.sources.assign(1, hl::SettingSource::written);
  all.push_back(written);
  codes::apply_code_defaults(all, req);
  auto find = [&](const std::string& name) -> const hl::Strategy& {
    for (const auto& s : all)
      if (s.name == name) return s;
    FAIL("no strategy ", name);
    return all.front();
  };
  const auto& fdb = find("fixed-dry-bulb");
  CHECK(fdb.conditions[0].limit == doctest::Approx(units::celsius_from_fahrenheit(65)));
  CHECK(fdb.source(0) == hl::SettingSource::code);
  CHECK(fdb.code_source ==
        "ANSI/ASHRAE/IES Standard 90.1-2019 zone 4A, Table 6.5.1.1.3, from memory");
  CHECK(codes::check_strategy(req, fdb).verdict == Verdict::complies);
  const auto& fh = find("fixed-enthalpy+dry-bulb");
  CHECK(fh.source(0) == hl::SettingSource::code);
  CHECK(fh.source(1) == hl::SettingSource::code);
  // Prohibited in 4A: common practice kept, and its verdict says not-allowed.
  const auto& ddb = find("differential-dry-bulb");
  CHECK(ddb.source(0) == hl::SettingSource::common_practice);
  CHECK(ddb.code_source.empty());
  CHECK(codes::check_strategy(req, ddb).verdict == Verdict::not_allowed);
  // A written setting is never replaced.
  const auto& w = find("written");
  CHECK(w.conditions[0].limit == doctest::Approx(units::celsius_from_fahrenheit(70)));
  CHECK(w.source(0) == hl::SettingSource::written);
  CHECK(w.code_source.empty());
}
