// The annual evaluation (`annual`) on real weather: identities, independent hour counts, and
// the published humid-climate fact about differential dry-bulb.
//
// Weather: tests/data/greensboro-nc-tmy3.csv, NREL NSRDB TMY3 for Greensboro NC (station
// 723170), as shipped in pvlib's sample data (see tests/data/SOURCES.md). Units in the tests
// are invented scenarios, not check values.
#include <doctest/doctest.h>

#include <limitline/io/schedule_file.hpp>
#include <limitline/analysis/annual.hpp>
#include <limitline/io/unit_file.hpp>
#include <limitline/io/weather.hpp>
#include <limitline/app/year_job.hpp>

#include "support/office.hpp"

#include <cmath>
#include <string>

using namespace limitline;

namespace {

const std::string kOffice = test::office_with_schedule();

const weather::WeatherSeries& greensboro() {
  static const weather::WeatherSeries w = weather::read_file(
      test::greensboro_path(), weather::Mapping{}, psychro::standard_pressure_kpa(273.0));
  return w;
}

struct Year {
  UnitFile unit;
  Schedule schedule;
  std::vector<annual::OutdoorInterval> weather;
  annual::Prepared prepared;
  annual::YearResult result;
};

Year run_year(const std::string& unit_text, std::vector<highlimit::Strategy> strategies = {},
              bool keep = false) {
  Year y{parse_unit_file(unit_text, "test.toml"), {}, outdoor_intervals(greensboro()), {}, {}};
  if (y.unit.schedule) y.schedule = read_schedule(*y.unit.schedule, "test.toml");
  if (strategies.empty()) strategies = strategies_or_presets(y.unit);
  y.prepared = annual::prepare(y.unit.air_handler, y.unit.return_air, y.weather, y.schedule, {});
  annual::RunOptions opt;
  opt.keep_decisions = keep;
  y.result = annual::evaluate(strategies, y.prepared, opt);
  return y;
}

const annual::StrategyResult& by_name(const annual::YearResult& y, std::string_view name) {
  for (const auto& s : y.strategies)
    if (s.name == name) return s;
  FAIL("no strategy " << name);
  return y.strategies.front();
}

}  // namespace

TEST_CASE("the Greensboro year imports whole, with its humidity and pressure columns") {
  // Source: the data file itself (8760 hourly rows, dew point and station pressure in mbar).
  const auto& w = greensboro();
  CHECK(w.hours.size() == 8760);
  CHECK(w.info.pressure_from_file);
  CHECK(w.info.humidity == weather::HumiditySource::dew_point);
  double hours = 0;
  for (const auto& h : w.hours) hours += h.weight_h;
  CHECK(hours == doctest::Approx(8760.0));
}

TEST_CASE("energy identities hold for every strategy") {
  const Year y = run_year(kOffice);
  const auto& r = y.result;
  const double e_none = r.no_economizer.annual.energy_kwh;
  const double e_perfect = r.perfect_changeover.annual.energy_kwh;
  const double e_optimal = r.optimal_damper.annual.energy_kwh;
  // The references bracket every changeover (docs/model.md §Reference operations).
  CHECK(e_none >= e_perfect);
  CHECK(e_perfect >= e_optimal - 1e-6);
  CHECK(r.perfect_changeover.annual.harmful_hours == 0.0);
  CHECK(r.perfect_changeover.annual.missed_hours == 0.0);
  double tolerance_kwh = 0;
  for (const auto& iv : y.prepared.intervals) tolerance_kwh += iv.tolerance_kwh;
  REQUIRE(r.strategies.size() == highlimit::presets().size());
  for (const auto& s : r.strategies) {
    CAPTURE(s.name);
    CHECK(s.annual.energy_kwh >= e_perfect - 1e-6);
    CHECK(s.savings_vs_no_economizer_kwh + s.shortfall_vs_perfect_kwh ==
          doctest::Approx(e_none - e_perfect));
    // The shortfall is the cost of the wrong decisions, up to ties within the tolerance.
    CHECK(std::fabs(s.shortfall_vs_perfect_kwh - s.annual.harmful_kwh - s.annual.missed_kwh) <=
          tolerance_kwh + 1e-6);
    annual::Totals sum;
    for (const auto& m : s.monthly) sum.add(m);
    CHECK(sum.cooling_kwh == doctest::Approx(s.annual.cooling_kwh));
    CHECK(sum.harmful_hours == doctest::Approx(s.annual.harmful_hours));
    CHECK(s.annual.hours_free_cooling + s.annual.hours_integrated ==
          doctest::Approx(s.annual.hours_economizing));
    CHECK(s.annual.cooling_kwh == doctest::Approx(s.annual.sensible_kwh + s.annual.latent_kwh));
  }
  // Ranked by shortfall.
  for (std::size_t i = 1; i < r.strategies.size(); ++i)
    CHECK(r.strategies[i - 1].shortfall_vs_perfect_kwh <= r.strategies[i].shortfall_vs_perfect_kwh);
}

TEST_CASE("hour counts agree with a plain loop written here") {
  // An independent count for a fixed dry-bulb limit without deadband, from the damper rule of
  // docs/model.md §Damper rule written out with psychro calls only.
  const Year y = run_year(kOffice);
  highlimit::PresetSettings ps = highlimit::preset_defaults();
  ps.dry_bulb_limit_c = units::celsius_from_fahrenheit(70.0);
  const auto strategy = highlimit::make_preset("fixed-dry-bulb", ps, "db70");
  const annual::StrategyResult got = annual::run(strategy, y.prepared);

  const auto& u = y.unit.air_handler;
  const double target = u.mixed_air_target_c();
  double operating = 0, enabled = 0, economizing = 0, free_cooling = 0, cooling_needed = 0;
  for (const auto& w : y.weather) {
    const double share = y.schedule.occupied_share(w.day_of_year, w.month, w.day, w.start_min, 60);
    if (share <= 0) continue;
    operating += share;
    const double w_r = psychro::humidity_ratio_from_relative_humidity(y.unit.return_air.dry_bulb_c,
                                                                      0.5, w.pressure_kpa);
    const double h_r = psychro::enthalpy_kj_per_kg(y.unit.return_air.dry_bulb_c, w_r);
    const double h_o = psychro::enthalpy_kj_per_kg(w.dry_bulb_c, w.humidity_ratio);
    auto t_mix = [&](double x) {
      const double wm = x * w.humidity_ratio + (1 - x) * w_r;
      return psychro::dry_bulb_from_enthalpy_c(x * h_o + (1 - x) * h_r, wm);
    };
    const bool on = !(w.dry_bulb_c > ps.dry_bulb_limit_c);
    if (on) enabled += share;
    if (t_mix(u.min_oa_fraction) <= target + 1e-9) continue;
    cooling_needed += share;
    if (!on) continue;
    economizing += share;  // integrated: opens to x* or x_max
    if (t_mix(u.max_oa_fraction) <= target + 1e-9) free_cooling += share;
  }
  CHECK(got.annual.hours_operating == doctest::Approx(operating));
  CHECK(got.annual.hours_enabled == doctest::Approx(enabled));
  CHECK(got.annual.hours_cooling_needed == doctest::Approx(cooling_needed));
  CHECK(got.annual.hours_economizing == doctest::Approx(economizing));
  CHECK(got.annual.hours_free_cooling == doctest::Approx(free_cooling));
}

TEST_CASE(
    "differential dry-bulb makes harmful decisions in a humid climate that differential enthalpy "
    "does not") {
  // ASHRAE 90.1 (2013–2022) high-limit table prohibits differential dry-bulb in climate zones
  // 1A–4A (from memory); Greensboro NC is zone 4A (from memory, see tests/data/SOURCES.md).
  // The reason shows up as hours that differential dry-bulb economizes at a loss.
  const Year y = run_year(kOffice, {}, true);
  const auto& ddb = by_name(y.result, "differential-dry-bulb");
  const auto& den = by_name(y.result, "differential-enthalpy");
  CHECK(ddb.annual.harmful_hours > 200.0);
  CHECK(ddb.annual.harmful_kwh > 10.0 * std::max(1.0, den.annual.harmful_kwh));
  // Hour by hour: most harmful hours of differential dry-bulb are right for enthalpy.
  double only_ddb = 0, only_den = 0;
  for (std::size_t i = 0; i < y.prepared.intervals.size(); ++i) {
    const auto& iv = y.prepared.intervals[i];
    const bool harm_ddb = ddb.enabled_by_interval[i] && iv.cooling_needed && iv.enabling_hurts();
    const bool harm_den = den.enabled_by_interval[i] && iv.cooling_needed && iv.enabling_hurts();
    if (harm_ddb && !harm_den) only_ddb += iv.hours;
    if (harm_den && !harm_ddb) only_den += iv.hours;
  }
  CHECK(only_ddb > 200.0);
  CHECK(only_den < 0.1 * only_ddb);
}

TEST_CASE("results are stable: same input, same numbers; half-hour rows give the same year") {
  const Year a = run_year(kOffice);
  const Year b = run_year(kOffice);
  REQUIRE(a.result.strategies.size() == b.result.strategies.size());
  for (std::size_t i = 0; i < a.result.strategies.size(); ++i) {
    CHECK(a.result.strategies[i].name == b.result.strategies[i].name);
    CHECK(a.result.strategies[i].annual.energy_kwh == b.result.strategies[i].annual.energy_kwh);
  }
  // Splitting every hour into two half-hour intervals of the same weather changes nothing
  // but the bookkeeping (sub-hourly rows are weighted by their time step).
  std::vector<annual::OutdoorInterval> halves;
  for (auto w : a.weather) {
    w.hours = 0.5;
    halves.push_back(w);
    w.start_min += 30;
    halves.push_back(w);
  }
  const auto p = annual::prepare(a.unit.air_handler, a.unit.return_air, halves, a.schedule, {});
  const auto h = annual::evaluate(strategies_or_presets(a.unit), p);
  CHECK(p.operating_hours == doctest::Approx(a.prepared.operating_hours));
  CHECK(h.no_economizer.annual.cooling_kwh ==
        doctest::Approx(a.result.no_economizer.annual.cooling_kwh));
  CHECK(h.perfect_changeover.annual.energy_kwh ==
        doctest::Approx(a.result.perfect_changeover.annual.energy_kwh));
}

TEST_CASE("the fan is off outside the schedule: no loads, no decisions") {
  const Year y = run_year(kOffice);
  // Mon–Fri 13 h + Sat 5 h = 70 h a week; 52 weeks and a day of a year starting on Monday.
  CHECK(y.prepared.operating_hours == doctest::Approx(52 * 70 + 13));
  for (const auto& s : y.result.strategies)
    CHECK(s.annual.hours_operating == doctest::Approx(y.prepared.operating_hours));
}
