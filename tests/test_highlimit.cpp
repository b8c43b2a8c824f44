// High-limit strategies: each preset's conditions, the comparison at and around each limit,
// deadband hold and clear, and the decision account. Facts of the trade with no document
// named say "common practice".
#include <doctest/doctest.h>

#include <limitline/error.hpp>
#include <limitline/model/highlimit.hpp>
#include <limitline/model/units.hpp>

#include <fmt/format.h>

#include <cmath>
#include <random>
#include <string>
#include <vector>

namespace hl = limitline::highlimit;
namespace units = limitline::units;
using hl::ConditionStatus;
using hl::Quantity;
using hl::Reference;

namespace {

hl::AirValues values(double t_c, double h, double dp_c, double w) {
  return hl::air_values(t_c, h, dp_c, w);
}

// Return air 75 °F / 50 % RH at sea level, as its four decision values (rounded).
const hl::AirValues kReturn = values(23.889, 47.57, 12.84, 0.00925);

hl::Strategy one(Quantity q, Reference r, double limit, double deadband = 0.0) {
  hl::Strategy s;
  s.name = "test";
  s.conditions.push_back({q, r, limit, deadband});
  return s;
}

// Outdoor values with only quantity q set to v (the others far below any limit).
hl::AirValues outdoor_with(Quantity q, double v) {
  hl::AirValues a = values(-30.0, -30.0, -40.0, 0.0);
  a[q] = v;
  return a;
}

}  // namespace

TEST_CASE("every preset has the conditions its trade name says") {
  // Common practice: the high-limit control types as energy codes list them — fixed or
  // differential dry-bulb, fixed or differential enthalpy (alone or with a fixed dry-bulb
  // limit), fixed dew point with fixed dry-bulb. Each condition turns the economizer off when
  // the outdoor value is above its limit.
  struct Expected {
    const char* preset;
    std::vector<std::pair<Quantity, Reference>> conditions;
  };
  const Expected expected[] = {
      {"fixed-dry-bulb", {{Quantity::dry_bulb, Reference::fixed}}},
      {"differential-dry-bulb", {{Quantity::dry_bulb, Reference::return_air}}},
      {"fixed-enthalpy", {{Quantity::enthalpy, Reference::fixed}}},
      {"fixed-enthalpy+dry-bulb",
       {{Quantity::enthalpy, Reference::fixed}, {Quantity::dry_bulb, Reference::fixed}}},
      {"differential-enthalpy", {{Quantity::enthalpy, Reference::return_air}}},
      {"differential-enthalpy+dry-bulb",
       {{Quantity::enthalpy, Reference::return_air}, {Quantity::dry_bulb, Reference::fixed}}},
      {"fixed-dew-point+dry-bulb",
       {{Quantity::dew_point, Reference::fixed}, {Quantity::dry_bulb, Reference::fixed}}},
  };
  REQUIRE(hl::presets().size() == std::size(expected));
  const hl::PresetSettings d = hl::preset_defaults();
  for (std::size_t i = 0; i < std::size(expected); ++i) {
    const Expected& e = expected[i];
    INFO(e.preset);
    CHECK(hl::presets()[i].name == e.preset);
    CHECK(hl::is_preset(e.preset));
    const hl::Strategy s = hl::make_preset(e.preset, d);
    CHECK(s.name == e.preset);
    CHECK(s.preset == e.preset);
    REQUIRE(s.conditions.size() == e.conditions.size());
    for (std::size_t c = 0; c < s.conditions.size(); ++c) {
      CHECK(s.conditions[c].quantity == e.conditions[c].first);
      CHECK(s.conditions[c].reference == e.conditions[c].second);
    }
  }
  CHECK(hl::all_presets(d).size() == std::size(expected));
  CHECK_FALSE(hl::is_preset("fixed-wet-bulb"));
}

TEST_CASE("preset settings feed the right condition, with the enthalpy datum shift") {
  hl::PresetSettings s = hl::preset_defaults();
  // The defaults: 75 °F, 28 Btu/lb (0 °F datum), 55 °F dew point (common practice).
  CHECK(s.dry_bulb_limit_c == doctest::Approx(23.8889).epsilon(1e-5));
  // docs/model.md §Units and datums: 28 Btu/lb ↔ 47.3 kJ/kg through h_IP = h_SI/2.326 + 7.68.
  CHECK(s.enthalpy_limit_kj_per_kg == doctest::Approx(47.2643).epsilon(1e-5));
  CHECK(s.dew_point_limit_c == doctest::Approx(12.7778).epsilon(1e-5));
  CHECK(s.dry_bulb_offset_k == 0.0);
  CHECK(s.enthalpy_offset_kj_per_kg == 0.0);

  s.dry_bulb_limit_c = 21.0;
  s.enthalpy_limit_kj_per_kg = 45.0;
  s.dew_point_limit_c = 11.0;
  s.dry_bulb_offset_k = -1.0;
  s.enthalpy_offset_kj_per_kg = 2.0;
  s.dry_bulb_deadband_k = 0.5;
  s.enthalpy_deadband_kj_per_kg = 1.5;
  s.dew_point_deadband_k = 0.7;
  const hl::Strategy fe = hl::make_preset("fixed-enthalpy+dry-bulb", s, "mine");
  CHECK(fe.name == "mine");
  CHECK(fe.conditions[0].limit == 45.0);
  CHECK(fe.conditions[0].deadband == 1.5);
  CHECK(fe.conditions[1].limit == 21.0);
  CHECK(fe.conditions[1].deadband == 0.5);
  const hl::Strategy dd = hl::make_preset("differential-dry-bulb", s);
  CHECK(dd.conditions[0].limit == -1.0);
  CHECK(dd.conditions[0].effective_limit(kReturn) ==
        doctest::Approx(kReturn[Quantity::dry_bulb] - 1.0));
  const hl::Strategy de = hl::make_preset("differential-enthalpy", s);
  CHECK(de.conditions[0].limit == 2.0);
  const hl::Strategy dp = hl::make_preset("fixed-dew-point+dry-bulb", s);
  CHECK(dp.conditions[0].limit == 11.0);
  CHECK(dp.conditions[0].deadband == 0.7);
}

TEST_CASE("unknown preset names are refused with the allowed list") {
  try {
    (void)hl::make_preset("enthalpy-ish", hl::preset_defaults());
    FAIL("accepted an unknown preset");
  } catch (const limitline::InputError& e) {
    const std::string m = e.what();
    CHECK(m.find("enthalpy-ish") != std::string::npos);
    CHECK(m.find("differential-enthalpy+dry-bulb") != std::string::npos);
  }
}

TEST_CASE("at the limit the economizer stays enabled; just above it trips") {
  // Codes word the high-limit as "off when outdoor is above the limit" (common practice).
  struct Q {
    Quantity q;
    double limit, step;
  };
  const Q quantities[] = {{Quantity::dry_bulb, 23.8889, 1e-9},
                          {Quantity::enthalpy, 47.2643, 1e-9},
                          {Quantity::dew_point, 12.7778, 1e-9},
                          {Quantity::humidity_ratio, 0.0090, 1e-12}};
  for (const Q& q : quantities) {
    INFO(hl::quantity_name(q.q));
    const hl::Strategy s = one(q.q, Reference::fixed, q.limit);
    hl::StrategyState st(s);
    auto at = [&](double v) { return hl::decide(s, outdoor_with(q.q, v), kReturn, st); };
    const hl::Decision eq = at(q.limit);
    CHECK(eq.enabled);
    CHECK(eq.results[0].status == ConditionStatus::clear);
    CHECK(eq.results[0].excess == 0.0);
    CHECK(eq.deciding_condition == -1);
    const hl::Decision above = at(q.limit + q.step);
    CHECK_FALSE(above.enabled);
    CHECK(above.results[0].status == ConditionStatus::tripped);
    CHECK(above.results[0].excess > 0.0);
    CHECK(above.deciding_condition == 0);
    // Without a deadband it clears as soon as it is back at the limit.
    CHECK(at(q.limit).enabled);
  }
}

TEST_CASE("differential conditions compare with return air plus the offset") {
  for (Quantity q : {Quantity::dry_bulb, Quantity::enthalpy}) {
    INFO(hl::quantity_name(q));
    for (double offset : {0.0, -1.0, 1.5}) {
      const hl::Strategy s = one(q, Reference::return_air, offset);
      hl::StrategyState st(s);
      const double limit = kReturn[q] + offset;
      CHECK(hl::decide(s, outdoor_with(q, limit), kReturn, st).enabled);
      const hl::Decision d = hl::decide(s, outdoor_with(q, limit + 1e-9), kReturn, st);
      CHECK_FALSE(d.enabled);
      CHECK(d.results[0].limit == doctest::Approx(limit));
    }
  }
}

TEST_CASE("deadband: trips above, holds down to limit - deadband, clears only below it") {
  const double limit = 23.8889, band = 0.5556;  // 75 °F with a 1 °F deadband
  const hl::Strategy s = one(Quantity::dry_bulb, Reference::fixed, limit, band);
  hl::StrategyState st(s);
  auto status = [&](double t) {
    return hl::decide(s, outdoor_with(Quantity::dry_bulb, t), kReturn, st).results[0].status;
  };
  // Before any trip the deadband does nothing: below the limit is clear.
  CHECK(status(limit - 0.1) == ConditionStatus::clear);
  CHECK(status(limit) == ConditionStatus::clear);
  CHECK(status(limit + 0.01) == ConditionStatus::tripped);
  CHECK(status(limit - 0.1) == ConditionStatus::held);
  CHECK(status(limit) == ConditionStatus::held);         // back at the limit: still off
  CHECK(status(limit - band) == ConditionStatus::held);  // "clears only below limit − deadband"
  CHECK(status(limit - band - 1e-9) == ConditionStatus::clear);
  CHECK(status(limit - 0.1) == ConditionStatus::clear);  // cleared: no longer held
  // A held condition disables, and is the deciding one.
  CHECK(status(limit + 1.0) == ConditionStatus::tripped);
  const hl::Decision d = hl::decide(s, outdoor_with(Quantity::dry_bulb, limit - 0.2), kReturn, st);
  CHECK(d.results[0].status == ConditionStatus::held);
  CHECK_FALSE(d.enabled);
  CHECK(d.deciding_condition == 0);
}

TEST_CASE("conditions join by OR; the first disabling one decides; every one keeps its state") {
  hl::PresetSettings set = hl::preset_defaults();
  set.dry_bulb_deadband_k = 1.0;
  set.enthalpy_deadband_kj_per_kg = 2.0;
  const hl::Strategy s = hl::make_preset("fixed-enthalpy+dry-bulb", set);
  hl::StrategyState st(s);
  const double h_lim = set.enthalpy_limit_kj_per_kg, t_lim = set.dry_bulb_limit_c;
  // Both above: disabled, enthalpy (written first) decides, both tripped.
  hl::Decision d = hl::decide(s, values(t_lim + 2, h_lim + 3, 0, 0), kReturn, st);
  CHECK_FALSE(d.enabled);
  CHECK(d.deciding_condition == 0);
  CHECK(d.results[1].status == ConditionStatus::tripped);
  // Enthalpy clears below its deadband; dry-bulb still within its own: held, and it decides.
  d = hl::decide(s, values(t_lim - 0.5, h_lim - 3, 0, 0), kReturn, st);
  CHECK(d.results[0].status == ConditionStatus::clear);
  CHECK(d.results[1].status == ConditionStatus::held);
  CHECK(d.deciding_condition == 1);
  // Both clear: enabled.
  d = hl::decide(s, values(t_lim - 1.5, h_lim - 3, 0, 0), kReturn, st);
  CHECK(d.enabled);
}

TEST_CASE("permits() and decide() agree over a long random sequence with deadbands") {
  hl::PresetSettings set = hl::preset_defaults();
  set.dry_bulb_deadband_k = 0.8;
  set.dew_point_deadband_k = 0.6;
  const hl::Strategy s = hl::make_preset("fixed-dew-point+dry-bulb", set);
  hl::StrategyState a(s), b(s);
  std::mt19937 rng(7);
  std::uniform_real_distribution<double> t(18.0, 28.0), dp(8.0, 17.0);
  int disagreements = 0, held = 0;
  for (int i = 0; i < 20000; ++i) {
    const hl::AirValues o = values(t(rng), 40.0, dp(rng), 0.008);
    const hl::Decision d = hl::decide(s, o, kReturn, a);
    if (d.enabled != hl::permits(s, o, kReturn, b)) ++disagreements;
    for (const auto& r : d.results) held += r.status == ConditionStatus::held;
  }
  CHECK(disagreements == 0);
  CHECK(held > 0);  // the sequence exercised the deadbands
  CHECK(a.tripped == b.tripped);
}

TEST_CASE("names and kinds of quantities and references") {
  for (Quantity q :
       {Quantity::dry_bulb, Quantity::enthalpy, Quantity::dew_point, Quantity::humidity_ratio}) {
    const auto back = hl::quantity_from_name(hl::quantity_name(q));
    REQUIRE(back);
    CHECK(*back == q);
  }
  CHECK_FALSE(hl::quantity_from_name("wet-bulb"));
  CHECK(hl::reference_from_name("fixed") == Reference::fixed);
  CHECK(hl::reference_from_name("return") == Reference::return_air);
  CHECK_FALSE(hl::reference_from_name("outdoor"));
  // A limit is a value of its quantity; an offset, deadband or excess is a difference (an
  // enthalpy difference carries no datum shift, docs/model.md §Units and datums).
  CHECK(hl::quantity_kind(Quantity::enthalpy) == units::Kind::enthalpy);
  CHECK(hl::quantity_difference_kind(Quantity::enthalpy) == units::Kind::enthalpy_difference);
  CHECK(hl::quantity_kind(Quantity::dew_point) == units::Kind::temperature);
  CHECK(hl::quantity_difference_kind(Quantity::dry_bulb) == units::Kind::temperature_difference);
  CHECK(hl::quantity_kind(Quantity::humidity_ratio) == units::Kind::humidity_ratio);
}

TEST_CASE("Strategy::needs names the quantities its conditions use") {
  const hl::Strategy s = hl::make_preset("fixed-dew-point+dry-bulb", hl::preset_defaults());
  CHECK(s.needs(Quantity::dew_point));
  CHECK(s.needs(Quantity::dry_bulb));
  CHECK_FALSE(s.needs(Quantity::enthalpy));
}
