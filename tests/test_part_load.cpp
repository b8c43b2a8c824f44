// The part-load air handler (docs/model.md §Part load): airflow that follows the space load,
// the return air the space makes, zone heating, and the energy balance that ties them.
//
// Weather: tests/data/greensboro-nc-tmy3.csv (NREL NSRDB TMY3 via pvlib; tests/data/SOURCES.md).
// The unit and its loads are invented inputs; every expected value is computed in the test
// from the handbook relations (ASHRAE Handbook—Fundamentals 2017, ch. 1: eq. 32 moist-air
// enthalpy h = 1.006·t + W·(2501 + 1.86·t), eq. 20 humidity ratio from vapour pressure,
// eq. 28 ideal-gas density) and the steady mass and energy balances of a space and a mixing
// box (common practice), written out here independently of the engine.
#include <doctest/doctest.h>

#include <limitline/analysis/annual.hpp>
#include <limitline/app/year_job.hpp>
#include <limitline/io/schedule_file.hpp>
#include <limitline/io/unit_file.hpp>
#include <limitline/io/weather.hpp>
#include <limitline/model/part_load.hpp>
#include <limitline/model/psychro.hpp>

#include "support/office.hpp"

#include <cmath>
#include <string>

using namespace limitline;

namespace {

const weather::WeatherSeries& greensboro() {
  static const weather::WeatherSeries w = weather::read_file(
      test::greensboro_path(), weather::Mapping{}, psychro::standard_pressure_kpa(273.0));
  return w;
}

// Eq. 32, written here rather than taken from the library.
double h_moist(double t_c, double w) { return 1.006 * t_c + w * (2501.0 + 1.86 * t_c); }
// Eq. 20: W = 0.621945·p_w/(p − p_w).
double w_from_pw(double pw, double p) { return 0.621945 * pw / (p - pw); }

struct Setup {
  UnitFile unit = parse_unit_file(test::office_with_schedule(), "office.toml");
  Schedule schedule = read_schedule(*unit.schedule, "office.toml");
  std::vector<annual::OutdoorInterval> weather = outdoor_intervals(greensboro());
  annual::PrepareOptions options;

  Setup() {
    part_load::Space space;
    space.space_temp_c = units::celsius_from_fahrenheit(75.0);
    space.return_air_rise_k = 1.0 / 1.8;
    space.coefficients = part_load::LoadCoefficients{40.0, 0.8, 8.0};
    options.space = space;
    options.control.airflow = part_load::AirflowControl::variable;
    options.control.min_airflow_fraction = 0.3;
  }
  [[nodiscard]] annual::Prepared prepare() const {
    return annual::prepare(unit.air_handler, unit.return_air, weather, schedule, options);
  }
};

}  // namespace

TEST_CASE(
    "over a year, the no-economizer coil energy balances the space, the fan and the "
    "outdoor air hour by hour") {
  // Balance of one hour at steady state (dry-air mass flow ṁ, outdoor fraction x):
  //   coil cooling − coil heating = q_s + q_zone + q_l + ṁ·c_s·(rise + fan heat)
  //                                 + ṁ·x·(h_o − h_r) − ṁ·(W_ce − W_cl)·4.186·t_cl
  // with c_s = 1.006 + 1.86·W_s the supply air's humid heat: the space's load is what the
  // supply air carries back as return air, the mixing box adds the outdoor air's share, and
  // the condensate leaves at the coil-leaving temperature.
  Setup s;
  const annual::Prepared p = s.prepare();
  REQUIRE(p.model.part_load);
  CHECK(p.model.hours_beyond_design == 0.0);
  const double t_space = s.options.space->space_temp_c;
  const double t_r = s.options.space->return_temp_c();
  const double fan = s.unit.air_handler.fan_heat_k;
  const double t_cl = s.unit.air_handler.coil_leaving_temp_c();
  double worst = 0.0, largest = 0.0;
  std::size_t checked = 0;
  for (const auto& iv : p.intervals) {
    const auto& w = s.weather[iv.source_index];
    const auto& o = iv.disabled;
    const double m = iv.mass_flow_kg_per_s, x = iv.min_oa_fraction;
    const double q_s = 40.0 + 0.8 * (w.dry_bulb_c - t_space), q_l = 8.0;
    const double w_r = o.return_humidity_ratio, w_s = o.supply_humidity_ratio;
    const double w_ce = x * w.humidity_ratio + (1.0 - x) * w_r;
    const double c_s = 1.006 + 1.86 * w_s;
    const double zone = iv.zone_heating_kwh / iv.hours;
    const double condensate = o.cooling_kwh > 0.0 ? m * (w_ce - w_s) * 4.186 * t_cl : 0.0;
    const double expected = q_s + zone + q_l + m * c_s * (t_r - t_space + fan) +
                            m * x * (h_moist(w.dry_bulb_c, w.humidity_ratio) - h_moist(t_r, w_r)) -
                            condensate;
    const double engine = (o.cooling_kwh - o.heating_kwh) / iv.hours;
    worst = std::max(worst, std::fabs(engine - expected));
    largest = std::max(largest, std::fabs(expected));
    ++checked;
  }
  CHECK(checked > 3000);
  CHECK(largest > 50.0);
  CHECK(worst < 1e-6);  // kW: rounding only
}

TEST_CASE("variable airflow is design airflow at the design load and its floor at light load") {
  // A humid hour, so the coil condenses and the supply air leaves at W_cap = W(t_cl, 95 %):
  // the design load is then ṁ_d·(1.006 + 1.86·W_cap)·(t_space − t_s) exactly.
  Setup s;
  const airside::AirHandler& u = s.unit.air_handler;
  const double p = 98.0;
  const double t_o = 30.0, w_o = 0.018;
  annual::OutdoorInterval hour{7, 15, 195, 10 * 60, 1.0, t_o, w_o, p};
  const double m_d = u.supply_airflow_m3_per_s * 1.204;  // standard air, 1.204 kg/m³
  const double t_cl = u.coil_leaving_temp_c();
  // p_ws at t_cl from the library's eq. 5/6 (cross-checked against psychrolib elsewhere).
  const double w_cap = w_from_pw(u.coil_leaving_rh_max * psychro::saturation_pressure_kpa(t_cl), p);
  const double t_space = s.options.space->space_temp_c;
  const double design = m_d * (1.006 + 1.86 * w_cap) * (t_space - u.supply_air_temp_c);
  auto flow_at = [&](double sensible_kw) {
    s.options.space->coefficients = part_load::LoadCoefficients{sensible_kw, 0.0, 8.0};
    const Schedule always;
    const auto pr = annual::prepare(u, s.unit.return_air, std::span(&hour, 1), always, s.options);
    REQUIRE(pr.intervals.size() == 1);
    return pr.intervals[0];
  };
  CHECK(flow_at(design).mass_flow_kg_per_s == doctest::Approx(m_d).epsilon(1e-9));
  CHECK(flow_at(design).zone_heating_kwh == doctest::Approx(0.0).scale(1.0).epsilon(1e-6));
  CHECK(flow_at(0.5 * design).mass_flow_kg_per_s == doctest::Approx(0.5 * m_d).epsilon(1e-9));
  // Below the floor (30 %) the airflow stays at the floor and the zone heats back what the
  // supply air over-cools.
  const auto light = flow_at(0.1 * design);
  CHECK(light.mass_flow_kg_per_s == doctest::Approx(0.3 * m_d).epsilon(1e-12));
  CHECK(light.zone_heating_kwh == doctest::Approx(0.2 * design).epsilon(1e-9));
  // More than the design airflow carries: held at design, and the hour is counted.
  const auto heavy = flow_at(1.2 * design);
  CHECK(heavy.mass_flow_kg_per_s == doctest::Approx(m_d).epsilon(1e-12));
}

TEST_CASE("variable and constant airflow agree when the floor is 100 %") {
  Setup s;
  s.options.control.min_airflow_fraction = 1.0;
  const auto variable = annual::evaluate(strategies_or_presets(s.unit), s.prepare());
  s.options.control.airflow = part_load::AirflowControl::constant;
  const auto constant = annual::evaluate(strategies_or_presets(s.unit), s.prepare());
  CHECK(variable.no_economizer.annual.energy_kwh == constant.no_economizer.annual.energy_kwh);
  REQUIRE(variable.strategies.size() == constant.strategies.size());
  for (std::size_t i = 0; i < variable.strategies.size(); ++i) {
    CHECK(variable.strategies[i].name == constant.strategies[i].name);
    CHECK(variable.strategies[i].annual.energy_kwh == constant.strategies[i].annual.energy_kwh);
  }
}

TEST_CASE("return humidity from the space's latent balance, by hand") {
  // Steady moisture balance of the space: ṁ·(W_r − W_s) = q_l/h_g with h_g = 2501 + 1.86·t_r
  // (the vapour term of eq. 32); of the mixing box: W_ce = x·W_o + (1 − x)·W_r.
  Setup s;
  const airside::AirHandler& u = s.unit.air_handler;
  const double p = 101.325;
  const Schedule always;
  const double t_r = s.options.space->return_temp_c();
  const double h_g = 2501.0 + 1.86 * t_r;
  auto hour_at = [&](double t_o, double w_o, double latent) {
    s.options.space->coefficients = part_load::LoadCoefficients{50.0, 0.0, latent};
    annual::OutdoorInterval hour{7, 15, 195, 10 * 60, 1.0, t_o, w_o, p};
    return annual::prepare(u, s.unit.return_air, std::span(&hour, 1), always, s.options)
        .intervals.at(0);
  };
  // Humid outdoor air: the coil condenses, W_s = W_cap, so W_r = W_cap + q_l/(ṁ·h_g).
  const double w_cap = w_from_pw(
      u.coil_leaving_rh_max * psychro::saturation_pressure_kpa(u.coil_leaving_temp_c()), p);
  const auto humid = hour_at(30.0, 0.018, 10.0);
  CHECK(humid.disabled.supply_humidity_ratio == doctest::Approx(w_cap).epsilon(1e-12));
  CHECK(humid.disabled.return_humidity_ratio ==
        doctest::Approx(w_cap + 10.0 / (humid.mass_flow_kg_per_s * h_g)).epsilon(1e-12));
  // Dry outdoor air: no condensation, the moisture leaves with the outdoor air alone:
  // x·(W_r − W_o) = q_l/(ṁ·h_g).
  const auto dry = hour_at(30.0, 0.004, 10.0);
  const double x = dry.min_oa_fraction;
  CHECK(dry.disabled.return_humidity_ratio ==
        doctest::Approx(0.004 + 10.0 / (dry.mass_flow_kg_per_s * h_g) / x).epsilon(1e-12));
  // The return dew point rises with the latent load.
  double last = -100.0;
  for (double latent : {0.0, 5.0, 10.0, 20.0, 40.0}) {
    const auto iv = hour_at(30.0, 0.018, latent);
    const double dew = iv.ret[highlimit::Quantity::dew_point];
    CHECK(dew > last);
    last = dew;
  }
}

TEST_CASE("a fixed outdoor airflow is a larger share of a smaller supply airflow") {
  // Common practice (ventilation at a fixed airflow): at half the supply airflow the same
  // outdoor airflow is twice the outdoor-air fraction.
  Setup s;
  const double v_oa = 0.2 * s.unit.air_handler.supply_airflow_m3_per_s;
  s.options.control.min_outdoor_airflow_m3_per_s = v_oa;
  const annual::Prepared p = s.prepare();
  std::size_t checked = 0;
  for (const auto& iv : p.intervals) {
    CHECK(iv.min_oa_fraction ==
          doctest::Approx(std::min(v_oa / iv.airflow_m3_per_s, 1.0)).epsilon(1e-12));
    ++checked;
  }
  CHECK(checked > 3000);
}

TEST_CASE("supply-air reset moves the supply temperature along its line") {
  part_load::SupplyAirReset r{10.0, 15.6, 18.3, 12.8};
  CHECK(r.supply_temp_c(0.0) == 15.6);
  CHECK(r.supply_temp_c(30.0) == 12.8);
  CHECK(r.supply_temp_c(14.15) == doctest::Approx(14.2));
}

TEST_CASE("the actual airflow basis scales the mass flow with pressure") {
  // Eq. 28 at constant temperature: ρ ∝ p.
  CHECK(part_load::air_density_kg_per_m3(part_load::AirflowBasis::actual, 84.0) ==
        doctest::Approx(1.204 * 84.0 / 101.325));
  CHECK(part_load::air_density_kg_per_m3(part_load::AirflowBasis::standard, 84.0) == 1.204);
}

TEST_CASE(
    "the part-load year is believable: less coil energy and smaller savings than at "
    "design load") {
  // Common practice: a unit at part load, with its return air following the space, needs less
  // coil energy than one held at design airflow all year, and its economizer has less to save.
  Setup s;
  const auto strategies = strategies_or_presets(s.unit);
  const auto part = annual::evaluate(strategies, s.prepare());
  const auto design = annual::evaluate(
      strategies,
      annual::prepare(s.unit.air_handler, s.unit.return_air, s.weather, s.schedule, {}));
  CHECK(part.no_economizer.annual.cooling_kwh < design.no_economizer.annual.cooling_kwh);
  CHECK(part.perfect_changeover.savings_vs_no_economizer_kwh <
        design.perfect_changeover.savings_vs_no_economizer_kwh);
  CHECK(part.perfect_changeover.savings_vs_no_economizer_kwh > 0.0);
  CHECK(part.perfect_changeover.annual.energy_kwh <= part.no_economizer.annual.energy_kwh);
  CHECK(part.optimal_damper.annual.energy_kwh <= part.perfect_changeover.annual.energy_kwh + 1e-6);
}

TEST_CASE("a non-integrated economizer carries a light load on outdoor air alone") {
  // Common practice: a non-integrated economizer that cannot reach the mixed-air target locks
  // out to the minimum and runs the compressor, unless the space's thermostat is satisfied by
  // outdoor air alone: the warmer supply air (here 60 °F outdoor + 1.5 °F fan heat against a
  // 75 °F space) then carries a light load within design airflow.
  Setup s;
  s.unit.air_handler.economizer = airside::EconomizerType::non_integrated;
  const Schedule always;
  const double t_o = units::celsius_from_fahrenheit(60.0);
  annual::OutdoorInterval hour{5, 15, 134, 10 * 60, 1.0, t_o, 0.006, 101.325};
  auto at = [&](double sensible_kw) {
    s.options.space->coefficients = part_load::LoadCoefficients{sensible_kw, 0.0, 5.0};
    return annual::prepare(s.unit.air_handler, s.unit.return_air, std::span(&hour, 1), always,
                           s.options)
        .intervals.at(0);
  };
  // The most the design airflow carries with 61.5 °F supply air: ṁ_d·c·(75 − 61.5) °F.
  const double m_d = s.unit.air_handler.supply_airflow_m3_per_s * 1.204;
  const double capacity = m_d * (1.006 + 1.86 * 0.006) * (13.5 / 1.8);
  const auto light = at(0.5 * capacity);
  CHECK(light.cooling_needed);
  CHECK(light.enabled.oa_fraction == 1.0);
  CHECK(light.enabled.cooling_kwh == 0.0);
  CHECK(light.disabled.cooling_kwh > 0.0);
  CHECK(light.enabling_pays());
  const auto heavy = at(1.05 * capacity);
  CHECK(heavy.enabled.oa_fraction == doctest::Approx(s.unit.air_handler.min_oa_fraction));
  CHECK(heavy.enabled.cooling_kwh == heavy.disabled.cooling_kwh);
}

TEST_CASE("the references still bracket every strategy under part load") {
  // docs/model.md §Reference operations: no economizer ≥ perfect changeover ≥ optimal damper,
  // and every changeover lies between the perfect one and the worst of each hour.
  Setup s;
  s.options.control.reset = part_load::SupplyAirReset{10.0, 15.6, 18.3, 12.8};
  const auto y = annual::evaluate(strategies_or_presets(s.unit), s.prepare());
  for (const auto& r : y.strategies) {
    CHECK(r.annual.energy_kwh >= y.perfect_changeover.annual.energy_kwh - 1e-6);
    CHECK(r.shortfall_vs_perfect_kwh ==
          doctest::Approx(r.annual.harmful_kwh + r.annual.missed_kwh).epsilon(1e-9));
  }
  CHECK(y.optimal_damper.annual.energy_kwh <= y.perfect_changeover.annual.energy_kwh + 1e-6);
  CHECK(y.perfect_changeover.annual.energy_kwh <= y.no_economizer.annual.energy_kwh);
}

TEST_CASE("on the mixed-air target the coil does nothing, with the return air x* itself makes") {
  // x* solves t_m(x) = target with W_r = W_o + m/x (docs/model.md §Return air). Were it off by
  // more than the 1e-9 K on-target tolerance, the coil would cool or heat a little: every
  // modulating free-cooling hour must carry exactly no coil load.
  Setup s;
  s.options.space->coefficients = part_load::LoadCoefficients{40.0, 0.8, 20.0};
  const annual::Prepared p = s.prepare();
  std::size_t modulating = 0;
  for (const auto& iv : p.intervals) {
    const auto& e = iv.enabled;
    if (!(e.oa_fraction > iv.min_oa_fraction + 1e-9 && e.oa_fraction < 1.0 - 1e-9)) continue;
    ++modulating;
    CHECK(e.cooling_kwh == 0.0);
    CHECK(e.heating_kwh == 0.0);
    // The mixed air's humidity is the mixing of outdoor air and the steady return.
    const double w_o = s.weather[iv.source_index].humidity_ratio;
    CHECK(e.supply_humidity_ratio ==
          doctest::Approx(e.oa_fraction * w_o + (1.0 - e.oa_fraction) * e.return_humidity_ratio)
              .epsilon(1e-12));
  }
  CHECK(modulating > 500);
}
