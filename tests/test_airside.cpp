// The air handler: mixing, the outdoor-air fraction, the damper rule, coil loads and the
// optimal damper. Sources are named beside each check. "ASHRAE HoF" is ASHRAE Handbook—
// Fundamentals (2017, SI), chapter 1; the document was not at hand while writing this file,
// so values marked "from memory" were recalled, not copied. "By hand" values were worked out
// from the named equations with a calculator (the working is in the comment), not by this
// library.
#include <doctest/doctest.h>

#include <limitline/model/airside.hpp>
#include <limitline/error.hpp>
#include <limitline/model/psychro.hpp>
#include <limitline/model/units.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <string>

namespace air = limitline::airside;
namespace psy = limitline::psychro;
using limitline::units::celsius_from_fahrenheit;
using limitline::units::fahrenheit_from_celsius;

namespace {

constexpr double kSea = psy::kStandardPressureKpa;

void check_near(double got, double want, double tol, const std::string& what = {}) {
  INFO(what, " got ", fmt::format("{:.10g}", got), " want ", fmt::format("{:.10g}", want),
       " tolerance ", tol);
  CHECK(std::fabs(got - want) <= tol);
}

double F(double f) { return celsius_from_fahrenheit(f); }

air::AirState state_rh(double t_c, double rh, double p = kSea) {
  return air::air_state(t_c, psy::humidity_ratio_from_relative_humidity(t_c, rh, p));
}

// An ordinary rooftop unit: 55 °F supply, 1.5 °F fan heat, 20 % minimum outdoor air.
air::AirHandler rooftop(air::FanPosition fan = air::FanPosition::draw_through,
                        air::EconomizerType econ = air::EconomizerType::integrated) {
  air::AirHandler u;
  u.supply_airflow_m3_per_s = 5.0;
  u.supply_air_temp_c = F(55.0);
  u.fan_heat_k = 1.5 / 1.8;
  u.fan_position = fan;
  u.min_oa_fraction = 0.20;
  u.max_oa_fraction = 1.0;
  u.economizer = econ;
  u.coil_leaving_rh_max = 0.95;
  return u;
}

air::HourAir hour(const air::AirHandler& u, const air::AirState& o, const air::AirState& r,
                  double p = kSea) {
  return {o, r, air::coil_limits(u, p), std::nullopt, std::nullopt};
}

}  // namespace

// --- Mixing ------------------------------------------------------------------------------

TEST_CASE("mixing conserves dry air, water and enthalpy (ASHRAE HoF ch. 1, adiabatic mixing)") {
  // ASHRAE HoF ch. 1 "Adiabatic mixing of two moist airstreams": m1·h1 + m2·h2 = m3·h3 and
  // m1·W1 + m2·W2 = m3·W3, so the mixed state lies on the straight line between the two in
  // (W, h) and divides it in the inverse ratio of the dry-air masses:
  // (h2 − h3)/(h3 − h1) = (W2 − W3)/(W3 − W1) = m1/m2.
  const air::AirState o = state_rh(F(95.0), 0.40);
  const air::AirState r = state_rh(F(75.0), 0.50);
  for (double x : {0.05, 0.2, 0.5, 0.8, 0.95}) {
    const double m_o = x, m_r = 1.0 - x;  // per kg of mixed dry air
    const air::AirState m = air::mix(o, r, x);
    check_near(m_o * o.enthalpy_kj_per_kg + m_r * r.enthalpy_kj_per_kg, m.enthalpy_kj_per_kg, 1e-12,
               "energy balance");
    check_near(m_o * o.humidity_ratio + m_r * r.humidity_ratio, m.humidity_ratio, 1e-15,
               "water balance");
    check_near((r.enthalpy_kj_per_kg - m.enthalpy_kj_per_kg) /
                   (m.enthalpy_kj_per_kg - o.enthalpy_kj_per_kg),
               m_o / m_r, 1e-9, "lever rule on enthalpy");
    check_near((r.humidity_ratio - m.humidity_ratio) / (m.humidity_ratio - o.humidity_ratio),
               m_o / m_r, 1e-9, "lever rule on humidity ratio");
    // The mixed dry-bulb is the one eq. 32 gives for the mixed h and W.
    check_near(psy::enthalpy_kj_per_kg(m.dry_bulb_c, m.humidity_ratio), m.enthalpy_kj_per_kg, 1e-12,
               "eq. 32 at the mixed state");
  }
  // The ends are the two streams themselves.
  check_near(air::mix(o, r, 0.0).dry_bulb_c, r.dry_bulb_c, 1e-12);
  check_near(air::mix(o, r, 1.0).dry_bulb_c, o.dry_bulb_c, 1e-12);
}

TEST_CASE("mixing reproduces the ASHRAE HoF ch. 1 adiabatic-mixing example") {
  // ASHRAE HoF ch. 1, example "adiabatic mixing of two moist airstreams" (from memory):
  // 2 m³/s of outdoor air at 4 °C dry-bulb, 2 °C thermodynamic wet-bulb mixed with
  // 6.25 m³/s of recirculated air at 25 °C dry-bulb, 18 °C wet-bulb, standard pressure;
  // answer read from the chart: t3 = 19.5 °C, t3* = 14.6 °C. The chart solution is good to
  // about ±0.3 K.
  const double w1 = psy::humidity_ratio_from_wet_bulb(4.0, 2.0, kSea);
  const double w2 = psy::humidity_ratio_from_wet_bulb(25.0, 18.0, kSea);
  const double m1 = 2.0 / psy::specific_volume_m3_per_kg(4.0, w1, kSea);
  const double m2 = 6.25 / psy::specific_volume_m3_per_kg(25.0, w2, kSea);
  const air::AirState m =
      air::mix(air::air_state(4.0, w1), air::air_state(25.0, w2), m1 / (m1 + m2));
  check_near(m.dry_bulb_c, 19.5, 0.3, "t3");
  check_near(psy::wet_bulb_from_humidity_ratio_c(m.dry_bulb_c, m.humidity_ratio, kSea), 14.6, 0.3,
             "t3*");
}

TEST_CASE("temperature-weighted hand mixing is within 0.5 F of enthalpy mixing, -20..100 F") {
  // Common practice: t_m ≈ x·t_o + (1 − x)·t_r is good to a fraction of a degree against
  // mass-weighted enthalpy mixing for outdoor air from −20 °F to 100 °F and return air near
  // 75 °F; the difference grows with the humidity-ratio difference (the 1.86·W part of the
  // moist specific heat in eq. 32).
  const air::AirState r = state_rh(F(75.0), 0.50);
  double worst_f = 0.0;
  for (double of = -20.0; of <= 100.0 + 1e-9; of += 5.0) {
    for (double rh : {0.0, 0.3, 0.6, 0.9}) {
      const double t_o = F(of);
      // Outdoor air hotter than 90 °F at 90 % RH is outside the climates this covers.
      if (of > 90.0 && rh > 0.6) continue;
      const air::AirState o = state_rh(t_o, rh);
      for (double x = 0.0; x <= 1.0 + 1e-9; x += 0.05) {
        const double exact = air::mix(o, r, x).dry_bulb_c;
        const double hand = air::mixed_temp_by_temperature_weighting(t_o, r.dry_bulb_c, x);
        worst_f = std::max(worst_f, std::fabs(exact - hand) * 1.8);
      }
    }
  }
  INFO("largest difference ", worst_f, " °F");
  CHECK(worst_f <= 0.5);
  CHECK(worst_f > 0.01);  // the two are not the same formula

  // ... and the difference grows with the humidity-ratio difference at the same temperatures.
  auto gap = [&](double rh) {
    return std::fabs(air::mix(state_rh(F(95.0), rh), r, 0.5).dry_bulb_c -
                     air::mixed_temp_by_temperature_weighting(F(95.0), r.dry_bulb_c, 0.5));
  };
  CHECK(gap(0.6) > gap(0.3));
}

// --- Outdoor-air fraction ----------------------------------------------------------------

TEST_CASE("the closed-form x* puts the mixed air exactly at the target") {
  const air::AirState r = state_rh(F(75.0), 0.5);
  for (double of : {-10.0, 20.0, 40.0, 50.0, 60.0, 70.0, 90.0}) {
    const air::AirState o = state_rh(F(of), 0.4);
    double x = 0.0;
    REQUIRE(air::oa_fraction_for_mixed_temp(o, r, F(55.0), x));
    check_near(air::mix(o, r, x).dry_bulb_c, F(55.0), 1e-9, fmt::format("outdoor {} F", of));
  }
  // Outdoor at the return dry-bulb and humidity: no fraction changes the mixed air.
  double x = 0.0;
  CHECK_FALSE(air::oa_fraction_for_mixed_temp(r, r, F(55.0), x));
}

TEST_CASE("OA-fraction hand calculation: examples solved by hand from the mixing equations") {
  // Each case solved by hand: with h = 1.006·t + W·(2501 + 1.86·t) (ASHRAE HoF eq. 32),
  // h_m = h_r + x·(h_o − h_r) and W_m = W_r + x·(W_o − W_r) (adiabatic mixing), the target
  // t_m = T gives x = −a/b with a = h_r − W_r·(2501 + 1.86·T) − 1.006·T and
  // b = (h_o − h_r) − (W_o − W_r)·(2501 + 1.86·T). Target 55 °F = 12.7778 °C throughout.
  struct Case {
    const char* name;
    double outdoor_f, w_o, return_f, w_r, x_min;
    double x_needed;  // by hand
    bool within;
    double x_applied;
    double mixed_f;  // by hand, at x_applied
    air::Makeup makeup;
  };
  const Case cases[] = {
      // 40 °F / 0.0030 against 75 °F / 0.0093: x = 0.5742 (temperature weighting: 20/35 = 0.5714).
      {"mild, within limits", 40, 0.0030, 75, 0.0093, 0.20, 0.574247, true, 0.574247, 55.0,
       air::Makeup::none},
      // 10 °F / 0.0010 against 72 °F / 0.0080: x = 0.2768 < 30 % minimum; at 30 % the mixed
      // air is 53.567 °F, so heating makes up 1.433 °F.
      {"cold, below the minimum: heating", 10, 0.0010, 72, 0.0080, 0.30, 0.276755, false, 0.30,
       53.5667, air::Makeup::heating},
      // 65 °F / 0.0080 against 75 °F / 0.0093: x = 1.9953 > 100 %; at 100 % the mixed air is
      // the outdoor air, 65 °F: cooling makes up 10 °F.
      {"warm, above the maximum: cooling", 65, 0.0080, 75, 0.0093, 0.20, 1.995285, false, 1.0, 65.0,
       air::Makeup::cooling},
      // 85 °F / 0.0120 against 75 °F / 0.0093: x = −1.9710, below the 20 % minimum; at 20 %
      // the mixed air is 77.008 °F: cooling makes up 22.008 °F.
      {"warm, below the minimum: cooling", 85, 0.0120, 75, 0.0093, 0.20, -1.970981, false, 0.20,
       77.0078, air::Makeup::cooling},
  };
  for (const Case& c : cases) {
    INFO(c.name);
    const air::AirState o = air::air_state(F(c.outdoor_f), c.w_o);
    const air::AirState r = air::air_state(F(c.return_f), c.w_r);
    const air::MixedAirEstimate e = air::estimate_mixed_air(o, r, F(55.0), c.x_min, 1.0);
    REQUIRE(e.target_reachable);
    check_near(e.fraction_needed, c.x_needed, 1e-5, "fraction needed");
    CHECK(e.within_limits == c.within);
    check_near(e.fraction_applied, c.x_applied, 1e-5, "fraction applied");
    check_near(fahrenheit_from_celsius(e.mixed.dry_bulb_c), c.mixed_f, 1e-3, "mixed air");
    CHECK(e.makeup == c.makeup);
    check_near(e.makeup_k * 1.8, std::fabs(c.mixed_f - 55.0), 1e-3, "make-up");
  }
}

// --- The rule of thumb against the perfect changeover -------------------------------------

TEST_CASE("rule of thumb holds for dry outdoor air and fails for humid air of higher enthalpy") {
  // Common practice: "economize when the outdoor dry-bulb is below the return and above the
  // mixed-air target". The perfect changeover (docs/model.md §Reference operations) enables
  // only when it costs less.
  const air::AirHandler u = rooftop();
  const air::AirState r = state_rh(F(75.0), 0.50);  // h ≈ 28.1 Btu/lb
  auto rule_of_thumb = [&](const air::AirState& o) {
    return o.dry_bulb_c < r.dry_bulb_c && o.dry_bulb_c > u.mixed_air_target_c();
  };
  const air::EnergyWeights w;

  // Dry: 70 °F at 20 % RH has less enthalpy than the return air; enabling pays.
  const air::AirState dry = state_rh(F(70.0), 0.20);
  REQUIRE(rule_of_thumb(dry));
  REQUIRE(dry.enthalpy_kj_per_kg < r.enthalpy_kj_per_kg);
  const air::HourChoice c_dry = air::choose(u, hour(u, dry, r), w);
  CHECK(c_dry.cooling_needed);
  CHECK(c_dry.enabling_pays(0.01));

  // Humid: 72 °F at 90 % RH is cooler than the return but carries more enthalpy; the rule of
  // thumb still says economize, the perfect changeover says disable.
  const air::AirState humid = state_rh(F(72.0), 0.90);
  REQUIRE(rule_of_thumb(humid));
  REQUIRE(humid.enthalpy_kj_per_kg > r.enthalpy_kj_per_kg);
  const air::HourChoice c_humid = air::choose(u, hour(u, humid, r), w);
  CHECK(c_humid.cooling_needed);
  CHECK(c_humid.enabling_hurts(0.01));
  CHECK_FALSE(c_humid.enabling_pays(0.01));
}

// --- Cooling coil ------------------------------------------------------------------------

TEST_CASE("coil: leaving air never supersaturated, total = sensible + latent, loads >= 0") {
  for (auto fan : {air::FanPosition::draw_through, air::FanPosition::blow_through}) {
    const air::AirHandler u = rooftop(fan);
    for (double p : {kSea, psy::standard_pressure_kpa(1800.0)}) {
      const air::CoilLimits lim = air::coil_limits(u, p);
      for (double tf = 20.0; tf <= 110.0; tf += 2.5) {
        for (double rh = 0.0; rh <= 1.0 + 1e-9; rh += 0.1) {
          const air::AirState in = state_rh(F(tf), std::min(rh, 1.0), p);
          const air::CoilLoads l = air::coil_loads(u, lim, in);
          INFO("entering ", tf, " F, ", rh * 100, " % RH, ", p, " kPa");
          CHECK(l.leaving.humidity_ratio <=
                psy::saturation_humidity_ratio(l.leaving.dry_bulb_c, p) * (1.0 + 1e-12));
          // The leaving-RH cap binds where the coil cools (heating keeps W).
          if (l.cooling_kj_per_kg > 0.0)
            CHECK(psy::relative_humidity_from_humidity_ratio(l.leaving.dry_bulb_c,
                                                             l.leaving.humidity_ratio,
                                                             p) <= u.coil_leaving_rh_max + 1e-9);
          check_near(l.sensible_kj_per_kg + l.latent_kj_per_kg, l.cooling_kj_per_kg, 1e-12);
          CHECK(l.cooling_kj_per_kg >= 0.0);
          CHECK(l.latent_kj_per_kg >= -1e-12);
          CHECK(l.heating_kj_per_kg >= 0.0);
          CHECK((l.cooling_kj_per_kg == 0.0 || l.heating_kj_per_kg == 0.0));
          check_near(l.leaving.dry_bulb_c, u.coil_leaving_temp_c(), 1e-12);
        }
      }
    }
  }
}

TEST_CASE("coil: a dehumidifying case worked by hand") {
  // Draw-through, leaving 53.5 °F = 11.9444 °C, cap 95 % RH. Entering 80 °F = 26.6667 °C at
  // W = 0.0120. Worked independently of this library: p_ws(11.9444 °C) = 1.39746 kPa (eq. 6),
  // W_cap = 0.621945·0.95·p_ws/(101.325 − 0.95·p_ws) = 0.0082571 (eqs. 20, 24);
  // h_ce = 1.006·26.6667 + 0.0120·(2501 + 1.86·26.6667) = 57.4339 (eq. 32);
  // h_cl = 1.006·11.9444 + 0.0082571·(2501 + 1.86·11.9444) = 32.8505;
  // condensate (0.0120 − 0.0082571)·4.186·11.9444 = 0.1871;
  // q_c = 57.4339 − 32.8505 − 0.1871 = 24.3962 kJ/kg.
  // Sensible: h(26.6667, 0.0120) − h(11.9444, 0.0120) = 14.7222·(1.006 + 1.86·0.0120)
  // = 15.1392 kJ/kg.
  const air::AirHandler u = rooftop();
  const air::CoilLimits lim = air::coil_limits(u, kSea);
  check_near(lim.leaving_humidity_ratio_cap, 0.0082571, 1e-7, "W cap");
  const air::CoilLoads l = air::coil_loads(u, lim, air::air_state(F(80.0), 0.0120));
  check_near(l.cooling_kj_per_kg, 24.3962, 0.0005, "total");
  check_near(l.sensible_kj_per_kg, 15.1392, 0.0005, "sensible");
  check_near(l.latent_kj_per_kg, 24.3962 - 15.1392, 0.001, "latent");
}

TEST_CASE("coil: zero load when the entering air is at the coil-leaving temperature") {
  const air::AirHandler u = rooftop();
  const air::CoilLimits lim = air::coil_limits(u, kSea);
  // Dry enough, and humid beyond the leaving cap: at t_ce = t_cl there is no load either way.
  for (double rh : {0.3, 0.99}) {
    const air::CoilLoads l = air::coil_loads(u, lim, state_rh(u.coil_leaving_temp_c(), rh));
    CHECK(l.cooling_kj_per_kg == 0.0);
    CHECK(l.heating_kj_per_kg == 0.0);
  }
  // And the economizer's own x* lands there: mixing cool humid outdoor air (foggy marine air,
  // 52 °F saturated) with return air to the target gives no load, whatever the rounding.
  const air::AirState o = state_rh(F(52.0), 1.0), r = state_rh(F(75.0), 0.55);
  double x = 0.0;
  REQUIRE(air::oa_fraction_for_mixed_temp(o, r, u.mixed_air_target_c(), x));
  const air::AirState m = air::mix(o, r, x);
  REQUIRE(m.humidity_ratio > lim.leaving_humidity_ratio_cap);
  const air::CoilLoads l = air::coil_loads(u, lim, m);
  CHECK(l.cooling_kj_per_kg == 0.0);
  CHECK(l.heating_kj_per_kg == 0.0);
}

TEST_CASE("coil: heating below the leaving temperature at constant humidity ratio") {
  const air::AirHandler u = rooftop();
  const air::CoilLimits lim = air::coil_limits(u, kSea);
  const air::AirState in = air::air_state(F(45.0), 0.004);
  const air::CoilLoads l = air::coil_loads(u, lim, in);
  // By hand: (11.9444 − 7.2222)·(1.006 + 1.86·0.004) = 4.7222·1.01344 = 4.7857 kJ/kg.
  check_near(l.heating_kj_per_kg, 4.7857, 0.0005);
  CHECK(l.cooling_kj_per_kg == 0.0);
  CHECK(l.leaving.humidity_ratio == in.humidity_ratio);
}

// --- Damper rule ---------------------------------------------------------------------------

TEST_CASE("damper rule step 1: no cooling needed keeps the minimum, enabled or not") {
  air::AirHandler u = rooftop();
  u.min_oa_fraction = 0.25;
  // 25 % of −10 °F outdoor air with 72 °F return mixes near 51.5 °F (temperature weighting):
  // below the 53.5 °F target, so no cooling is needed and the damper stays at the minimum.
  const air::HourAir cold = hour(u, state_rh(F(-10.0), 0.6), state_rh(F(72.0), 0.4));
  REQUIRE(air::mix(cold.outdoor, cold.ret, u.min_oa_fraction).dry_bulb_c < u.mixed_air_target_c());
  CHECK_FALSE(air::choose(u, cold, {}).cooling_needed);
  for (bool enabled : {false, true}) {
    const air::Operation op = air::operate(u, cold, enabled, {});
    CHECK(op.oa_fraction == u.min_oa_fraction);
    CHECK_FALSE(op.economizing);
    CHECK(op.loads.heating_kj_per_kg > 0.0);
    CHECK(op.loads.cooling_kj_per_kg == 0.0);
  }
}

TEST_CASE("damper rule step 2: disabled at minimum, enabled at x* or the damper limit") {
  const air::AirState r = state_rh(F(75.0), 0.5);
  SUBCASE("cool outdoor air: enabled finds x*, free cooling at the target") {
    const air::AirHandler u = rooftop();
    const air::HourAir h = hour(u, state_rh(F(45.0), 0.5), r);
    const air::Operation off = air::operate(u, h, false, {});
    const air::Operation on = air::operate(u, h, true, {});
    CHECK(off.oa_fraction == u.min_oa_fraction);
    CHECK(off.mechanical_cooling);
    CHECK(on.economizing);
    CHECK(on.oa_fraction > u.min_oa_fraction);
    CHECK(on.oa_fraction < u.max_oa_fraction);
    check_near(on.mixed.dry_bulb_c, u.mixed_air_target_c(), 1e-9);
    CHECK(on.loads.cooling_kj_per_kg == 0.0);
    CHECK(on.loads.heating_kj_per_kg == 0.0);
    CHECK_FALSE(on.mechanical_cooling);
  }
  SUBCASE("mild outdoor air above target: integrated opens fully, non-integrated falls back") {
    const air::HourAir h = hour(rooftop(), state_rh(F(65.0), 0.4), r);
    const air::Operation integ = air::operate(rooftop(), h, true, {});
    CHECK(integ.oa_fraction == 1.0);
    CHECK(integ.mechanical_cooling);
    const air::AirHandler ni =
        rooftop(air::FanPosition::draw_through, air::EconomizerType::non_integrated);
    const air::Operation non = air::operate(ni, h, true, {});
    CHECK(non.oa_fraction == ni.min_oa_fraction);
    CHECK_FALSE(non.economizing);
    // Integrated economizing with cooler, drier air costs less than the minimum.
    CHECK(integ.weighted_kj_per_kg < non.weighted_kj_per_kg);
  }
  SUBCASE("outdoor warmer than return: a wrongly enabled economizer still opens fully") {
    const air::AirHandler u = rooftop();
    const air::HourAir h = hour(u, state_rh(F(90.0), 0.4), r);
    const air::HourChoice c = air::choose(u, h, {});
    CHECK(c.enabled.oa_fraction == 1.0);
    CHECK(c.enabling_hurts(0.01));
  }
  SUBCASE("a damper limit below 100 % is where integrated operation stops") {
    air::AirHandler u = rooftop();
    u.max_oa_fraction = 0.7;
    const air::Operation on = air::operate(u, hour(u, state_rh(F(65.0), 0.4), r), true, {});
    CHECK(on.oa_fraction == 0.7);
  }
}

TEST_CASE("fan position: same mixed-air target, different coil boundaries") {
  const air::AirHandler draw = rooftop(air::FanPosition::draw_through);
  const air::AirHandler blow = rooftop(air::FanPosition::blow_through);
  // Both aim the mixed air at t_s − Δt_f (docs/model.md §Fan heat).
  check_near(draw.mixed_air_target_c(), F(53.5), 1e-12);
  check_near(blow.mixed_air_target_c(), F(53.5), 1e-12);
  // Draw-through: the coil leaves at t_s − Δt_f and the fan heat is added after it.
  // Blow-through: the fan heat is added before the coil, which leaves at t_s.
  check_near(draw.coil_leaving_temp_c(), F(53.5), 1e-12);
  check_near(blow.coil_leaving_temp_c(), F(55.0), 1e-12);
  const air::AirState m = state_rh(F(70.0), 0.5);
  const air::CoilLoads ld = air::coil_loads(draw, air::coil_limits(draw, kSea), m);
  const air::CoilLoads lb = air::coil_loads(blow, air::coil_limits(blow, kSea), m);
  check_near(ld.entering.dry_bulb_c, m.dry_bulb_c, 1e-12);
  check_near(lb.entering.dry_bulb_c, m.dry_bulb_c + 1.5 / 1.8, 1e-12);
  // The same sensible duty either way when the air stays dry of the coil cap: the fan heat is
  // removed by the coil whichever side of it the fan is on.
  const air::AirState dry = state_rh(F(70.0), 0.2);
  check_near(air::coil_loads(draw, air::coil_limits(draw, kSea), dry).sensible_kj_per_kg,
             air::coil_loads(blow, air::coil_limits(blow, kSea), dry).sensible_kj_per_kg, 1e-3);
}

// --- Optimal damper -----------------------------------------------------------------------

TEST_CASE("optimal damper is no worse than disabled, enabled or a brute-force scan of x") {
  for (auto fan : {air::FanPosition::draw_through, air::FanPosition::blow_through}) {
    for (auto econ : {air::EconomizerType::integrated, air::EconomizerType::non_integrated}) {
      air::AirHandler u = rooftop(fan, econ);
      u.max_oa_fraction = 0.9;
      for (const air::EnergyWeights w : {air::EnergyWeights{1.0, 1.0}, air::EnergyWeights{1.0, 0.3},
                                         air::EnergyWeights{0.3, 1.0}}) {
        for (double rf : {70.0, 78.0}) {
          const air::AirState r = state_rh(F(rf), 0.5);
          for (double of = -10.0; of <= 100.0; of += 10.0) {
            for (double rh : {0.1, 0.5, 0.9}) {
              const air::HourAir h = hour(u, state_rh(F(of), rh), r);
              const air::Operation best = air::optimal_damper(u, h, w);
              const air::HourChoice c = air::choose(u, h, w);
              INFO("outdoor ", of, " F ", rh * 100, " % RH, return ", rf, " F");
              CHECK(best.weighted_kj_per_kg <= c.disabled.weighted_kj_per_kg + 1e-12);
              CHECK(best.weighted_kj_per_kg <= c.enabled.weighted_kj_per_kg + 1e-12);
              CHECK(best.oa_fraction >= u.min_oa_fraction);
              CHECK(best.oa_fraction <= u.max_oa_fraction);
              // Independent check: scan x in steps of 0.001 and evaluate E with the coil
              // model directly.
              double scan = std::numeric_limits<double>::infinity();
              for (int i = 0; i <= 1000; ++i) {
                const double x =
                    u.min_oa_fraction + (u.max_oa_fraction - u.min_oa_fraction) * i / 1000.0;
                const air::CoilLoads l = air::coil_loads(u, h.coil, air::mix(h.outdoor, h.ret, x));
                scan = std::min(scan,
                                w.cooling * l.cooling_kj_per_kg + w.heating * l.heating_kj_per_kg);
              }
              CHECK(best.weighted_kj_per_kg <= scan + 1e-9);
              // A 0.001 step cannot miss a minimum of a piecewise-linear E by much.
              CHECK(best.weighted_kj_per_kg >= scan - 0.05);
            }
          }
        }
      }
    }
  }
}

// --- Validation -----------------------------------------------------------------------------

TEST_CASE("validate refuses contradictory air handlers, naming the field") {
  auto refuses = [](air::AirHandler u, const char* field) {
    try {
      air::validate(u);
      FAIL("accepted a bad ", field);
    } catch (const limitline::InputError& e) {
      INFO(e.what());
      CHECK(std::string(e.what()).find(field) != std::string::npos);
    }
  };
  air::AirHandler u = rooftop();
  CHECK_NOTHROW(air::validate(u));
  u.min_oa_fraction = 0.5;
  u.max_oa_fraction = 0.4;
  refuses(u, "min_outdoor_air");
  u = rooftop();
  u.supply_airflow_m3_per_s = 0.0;
  refuses(u, "supply_airflow");
  u = rooftop();
  u.coil_leaving_rh_max = 1.2;
  refuses(u, "coil_leaving_rh_max");
  u = rooftop();
  u.fan_heat_k = -1.0;
  refuses(u, "fan_heat");
}
