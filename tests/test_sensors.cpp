// The sensor-error study: readings, draws, the trial engine, sweeps, break-even, [sensors] and
// the `sensors` command.
//
// Weather: the real Greensboro, NC TMY3 year in tests/data (NREL NSRDB via pvlib; see
// tests/data/SOURCES.md). The unit is an invented office, input only: every check below is an
// identity (against annual::evaluate, against psychro, against a loop written here) or a
// property of the model, never a number copied from a previous run.
#include <limitline/io/schedule_file.hpp>
#include <limitline/analysis/annual.hpp>
#include <limitline/model/psychro.hpp>
#include <limitline/report/sensors.hpp>
#include <limitline/analysis/sensors.hpp>
#include <limitline/io/unit_file.hpp>
#include <limitline/io/weather.hpp>
#include <limitline/app/year_job.hpp>

#include "support/office.hpp"

#include "support/cli.hpp"

#include <doctest/doctest.h>

#include <algorithm>
#include <cmath>
#include <csignal>
#include <fstream>
#include <sstream>
#include <string>
#include <sys/wait.h>
#include <thread>
#include <unistd.h>

namespace {

using namespace limitline;
using sensors::HumidityKind;
using sensors::Sensor;

const std::string kOffice = test::office_with_schedule();

const std::string kGreensboro = test::greensboro_path();

struct Year {
  UnitFile unit = parse_unit_file(kOffice, "office.toml");
  std::vector<highlimit::Strategy> strategies;
  annual::Prepared prepared;
  Year() {
    strategies = highlimit::all_presets(highlimit::preset_defaults());
    // A deadband, so that state carried from hour to hour is exercised too.
    highlimit::PresetSettings s = highlimit::preset_defaults();
    s.dry_bulb_deadband_k = 2.0 / 1.8;
    s.enthalpy_deadband_kj_per_kg = 1.0;
    strategies.push_back(
        highlimit::make_preset("fixed-dry-bulb", s, "fixed dry-bulb, 2F deadband"));
    strategies.push_back(highlimit::make_preset("fixed-enthalpy", s, "fixed enthalpy, deadband"));
    const auto w =
        weather::read_file(kGreensboro, weather::Mapping{}, unit.site.design_pressure_kpa());
    prepared = annual::prepare(unit.air_handler, unit.return_air, outdoor_intervals(w),
                               read_schedule(*unit.schedule, unit.path), {});
  }
};

const Year& year() {
  static const Year y;
  return y;
}

const highlimit::Strategy& by_name(const std::vector<highlimit::Strategy>& list,
                                   std::string_view name) {
  for (const auto& s : list)
    if (s.name == name) return s;
  FAIL("no strategy " << name);
  return list.front();
}

std::vector<sensors::TrialOutcome> one_trial(const sensors::Engine& e, const sensors::Biases& b,
                                             std::vector<std::uint8_t>* decisions = nullptr,
                                             sensors::Clamps* clamps = nullptr) {
  auto ws = e.workspace();
  std::vector<sensors::TrialOutcome> out(e.strategies().size());
  sensors::Clamps c;
  if (decisions) decisions->assign(e.strategies().size() * e.intervals(), 0);
  e.run(b, ws, out, clamps ? *clamps : c,
        decisions ? std::span(*decisions) : std::span<std::uint8_t>{});
  return out;
}

void check_same(const sensors::TrialOutcome& a, const annual::StrategyResult& r) {
  CHECK(a.energy_kwh == r.annual.energy_kwh);
  CHECK(a.shortfall_kwh == r.shortfall_vs_perfect_kwh);
  CHECK(a.enabled_hours == r.annual.hours_enabled);
  CHECK(a.harmful_hours == r.annual.harmful_hours);
  CHECK(a.harmful_kwh == r.annual.harmful_kwh);
  CHECK(a.missed_hours == r.annual.missed_hours);
  CHECK(a.missed_kwh == r.annual.missed_kwh);
}

bool same(const sensors::TrialOutcome& a, const sensors::TrialOutcome& b) {
  return a.energy_kwh == b.energy_kwh && a.shortfall_kwh == b.shortfall_kwh &&
         a.enabled_hours == b.enabled_hours && a.harmful_hours == b.harmful_hours &&
         a.harmful_kwh == b.harmful_kwh && a.missed_hours == b.missed_hours &&
         a.missed_kwh == b.missed_kwh;
}

}  // namespace

// --- Exact sensors reproduce the annual evaluation --------------------------------------------

TEST_CASE("exact sensors reproduce annual::evaluate exactly, every strategy and kind") {
  const Year& y = year();
  const annual::YearResult ref = annual::evaluate(y.strategies, y.prepared);
  for (HumidityKind kind :
       {HumidityKind::relative_humidity, HumidityKind::dew_point, HumidityKind::enthalpy}) {
    CAPTURE(sensors::humidity_kind_name(kind));
    const sensors::Engine engine(y.prepared, y.strategies, kind);
    CHECK(engine.perfect_energy_kwh() == ref.perfect_changeover.annual.energy_kwh);
    CHECK(engine.no_economizer_energy_kwh() == ref.no_economizer.annual.energy_kwh);
    sensors::SensorSet zero = sensors::typical_sensors(kind);
    zero.accuracy = {};
    sensors::StudyOptions opt;
    opt.trials = 6;
    const auto study = sensors::run_study(engine, zero, opt);
    REQUIRE(study.trials_completed() == 6);
    CHECK_FALSE(study.partial);
    for (const auto& s : study.ranked) {
      CAPTURE(s.name);
      const annual::StrategyResult& r =
          *std::find_if(ref.strategies.begin(), ref.strategies.end(),
                        [&](const auto& x) { return x.name == s.name; });
      check_same(s.exact, r);
      for (std::size_t k = 0; k < study.trials_completed(); ++k)
        check_same(study.outcome(k, s.index), r);
      for (double q :
           {s.shortfall_kwh.p10, s.shortfall_kwh.p50, s.shortfall_kwh.p90, s.shortfall_kwh.worst})
        CHECK(q == r.shortfall_vs_perfect_kwh);
      CHECK(s.shortfall_kwh.mean == doctest::Approx(r.shortfall_vs_perfect_kwh).epsilon(1e-12));
      CHECK(s.harmful_hours.worst == r.annual.harmful_hours);
      CHECK(s.missed_hours.worst == r.annual.missed_hours);
    }
    // Identical trials: a strategy beats another in all of them or in none.
    for (const auto& x : study.ranked)
      for (const auto& z : study.ranked)
        if (x.index != z.index)
          CHECK(study.beats[x.index][z.index] ==
                (x.exact.shortfall_kwh < z.exact.shortfall_kwh - 1e-6 ? 1.0 : 0.0));
  }
}

TEST_CASE("decisions with exact sensors are the annual decisions, hour by hour") {
  const Year& y = year();
  annual::RunOptions keep;
  keep.keep_decisions = true;
  const sensors::Engine engine(y.prepared, y.strategies, HumidityKind::relative_humidity);
  std::vector<std::uint8_t> d;
  one_trial(engine, sensors::Biases{}, &d);
  for (std::size_t s = 0; s < y.strategies.size(); ++s) {
    const auto r = annual::run(y.strategies[s], y.prepared, keep);
    std::size_t differ = 0;
    for (std::size_t i = 0; i < engine.intervals(); ++i)
      differ += d[i * y.strategies.size() + s] != r.enabled_by_interval[i];
    CHECK_MESSAGE(differ == 0, y.strategies[s].name);
  }
}

// --- A bias away from a limit only removes trips ---------------------------------------------

namespace {
// Runs `strategy` with exact sensors and with `b`; every hour disabled with the bias must be
// disabled without it, and the bias must change some hours (else the check proves nothing).
void check_only_removes_trips(const highlimit::Strategy& strategy, const sensors::Biases& b,
                              HumidityKind kind) {
  const Year& y = year();
  const std::vector<highlimit::Strategy> one = {strategy};
  const sensors::Engine engine(y.prepared, one, kind);
  std::vector<std::uint8_t> exact, biased;
  one_trial(engine, sensors::Biases{}, &exact);
  one_trial(engine, b, &biased);
  std::size_t added = 0, removed = 0;
  for (std::size_t i = 0; i < exact.size(); ++i) {
    added += exact[i] && !biased[i];
    removed += !exact[i] && biased[i];
  }
  CAPTURE(strategy.name);
  CHECK(added == 0);
  CHECK(removed > 0);
}
}  // namespace

TEST_CASE("a bias that moves readings away from the limit can only remove trips") {
  const Year& y = year();
  SUBCASE("outdoor dry-bulb reading low, fixed dry-bulb limit (with and without deadband)") {
    sensors::Biases b{};
    at(b, Sensor::outdoor_dry_bulb) = -1.0;
    check_only_removes_trips(by_name(y.strategies, "fixed-dry-bulb"), b,
                             HumidityKind::relative_humidity);
    check_only_removes_trips(by_name(y.strategies, "fixed dry-bulb, 2F deadband"), b,
                             HumidityKind::relative_humidity);
  }
  SUBCASE("outdoor RH reading low, fixed enthalpy limit (with and without deadband)") {
    sensors::Biases b{};
    at(b, Sensor::outdoor_humidity) = -0.05;
    check_only_removes_trips(by_name(y.strategies, "fixed-enthalpy"), b,
                             HumidityKind::relative_humidity);
    check_only_removes_trips(by_name(y.strategies, "fixed enthalpy, deadband"), b,
                             HumidityKind::relative_humidity);
  }
  SUBCASE("outdoor dew-point reading low, fixed dew-point limit") {
    sensors::Biases b{};
    at(b, Sensor::outdoor_humidity) = -1.0;
    check_only_removes_trips(by_name(y.strategies, "fixed-dew-point+dry-bulb"), b,
                             HumidityKind::dew_point);
  }
  SUBCASE("return dry-bulb reading high, differential dry-bulb") {
    sensors::Biases b{};
    at(b, Sensor::return_dry_bulb) = 0.5;
    check_only_removes_trips(by_name(y.strategies, "differential-dry-bulb"), b,
                             HumidityKind::relative_humidity);
  }
  SUBCASE("return RH reading high, differential enthalpy") {
    sensors::Biases b{};
    at(b, Sensor::return_rh) = 0.04;
    check_only_removes_trips(by_name(y.strategies, "differential-enthalpy"), b,
                             HumidityKind::relative_humidity);
  }
}

// --- Determinism ----------------------------------------------------------------------------

TEST_CASE("results are identical for 1 and N threads at the same seed") {
  const Year& y = year();
  const sensors::Engine engine(y.prepared, y.strategies, HumidityKind::relative_humidity);
  const sensors::SensorSet set = sensors::typical_sensors();
  sensors::StudyOptions opt;
  opt.trials = 48;
  opt.seed = 20240917;
  sensors::RunControl one, many;
  one.threads = 1;
  many.threads = 3;
  const auto a = sensors::run_study(engine, set, opt, one);
  const auto b = sensors::run_study(engine, set, opt, many);
  REQUIRE(a.trial_outcomes.size() == b.trial_outcomes.size());
  for (std::size_t i = 0; i < a.trial_outcomes.size(); ++i)
    CHECK(same(a.trial_outcomes[i], b.trial_outcomes[i]));
  CHECK(a.trial_biases == b.trial_biases);
  CHECK(a.beats == b.beats);
  for (std::size_t s = 0; s < a.ranked.size(); ++s) {
    CHECK(a.ranked[s].name == b.ranked[s].name);
    CHECK(a.ranked[s].shortfall_kwh.mean == b.ranked[s].shortfall_kwh.mean);
    CHECK(a.ranked[s].shortfall_kwh.p90 == b.ranked[s].shortfall_kwh.p90);
  }
  // A different seed draws different biases.
  opt.seed = 20240918;
  const auto c = sensors::run_study(engine, set, opt, many);
  CHECK(c.trial_biases != a.trial_biases);

  sensors::BreakEvenOptions be;
  be.trials = 12;
  be.bisection_steps = 3;
  const auto e1 = sensors::break_even(engine, set, be, one);
  const auto e2 = sensors::break_even(engine, set, be, many);
  REQUIRE(e1.pairs.size() == e2.pairs.size());
  for (std::size_t i = 0; i < e1.pairs.size(); ++i) {
    CHECK(e1.pairs[i].verdict == e2.pairs[i].verdict);
    CHECK(e1.pairs[i].scale == e2.pairs[i].scale);
    CHECK(e1.pairs[i].dry_mean_kwh == e2.pairs[i].dry_mean_kwh);
  }
}

TEST_CASE("interrupting keeps the finished trials, each as in the full run") {
  const Year& y = year();
  const sensors::Engine engine(y.prepared, y.strategies, HumidityKind::relative_humidity);
  const sensors::SensorSet set = sensors::typical_sensors();
  sensors::StudyOptions opt;
  opt.trials = 40;
  const auto full = sensors::run_study(engine, set, opt);
  std::atomic<bool> stop{false};
  sensors::RunControl control;
  control.threads = 2;
  control.cancel = &stop;
  control.progress = [&](std::string_view, std::size_t done, std::size_t) {
    if (done >= 5) stop = true;
  };
  const auto part = sensors::run_study(engine, set, opt, control);
  CHECK(part.partial);
  CHECK(part.trials_completed() >= 5);
  CHECK(part.trials_completed() < 40);
  for (std::size_t k = 0; k < part.trials_completed(); ++k)
    for (std::size_t s = 0; s < part.names.size(); ++s)
      CHECK(same(part.outcome(k, s), full.outcome(part.trial[k], s)));
  // Nothing finished: still a report, with no NaN.
  stop = true;
  const auto none = sensors::run_study(engine, set, opt, control);
  CHECK(none.trials_completed() == 0);
  CHECK(none.ranked.front().shortfall_kwh.mean == 0.0);
  const report::YearContext ctx;
  report::SensorsReport rep;
  rep.context = &ctx;
  rep.study = &none;
  rep.interrupted_note = "interrupted";
  const std::string json = report::sensors_json(rep);
  CHECK(json.find("nan") == std::string::npos);
  CHECK(json.find("\"trials_completed\": 0") != std::string::npos);
  CHECK(report::sensors_text(rep).find("No trial finished") != std::string::npos);
}

// --- Draws -------------------------------------------------------------------------------------

TEST_CASE("uniform and normal biases are unbiased and have the stated spread") {
  // Tolerance: 4 standard errors of each estimate, with this fixed seed.
  constexpr std::size_t n = 20000;
  SUBCASE("uniform within ± accuracy: mean 0 (s.e. a/sqrt(3n)), variance a²/3") {
    sensors::SensorSet s = sensors::typical_sensors();
    s.accuracy = {0.5, 0.05, 1.0, 0.03};
    std::array<double, 4> sum{}, sum2{};
    for (std::size_t k = 0; k < n; ++k) {
      const auto b = sensors::draw_biases(s, 7, k);
      for (std::size_t i = 0; i < 4; ++i) {
        CHECK(std::fabs(b[i]) <= s.accuracy[i]);
        sum[i] += b[i];
        sum2[i] += b[i] * b[i];
      }
    }
    for (std::size_t i = 0; i < 4; ++i) {
      const double a = s.accuracy[i];
      const double mean = sum[i] / n;
      CHECK(std::fabs(mean) < 4.0 * a / std::sqrt(3.0 * n));
      // Var of b² for b uniform on ±a is 4a⁴/45.
      CHECK(std::fabs(sum2[i] / n - a * a / 3.0) < 4.0 * std::sqrt(4.0 * a * a * a * a / 45.0 / n));
    }
  }
  SUBCASE("normal with σ: mean 0 (s.e. σ/sqrt(n)), variance σ² (s.e. σ²·sqrt(2/n))") {
    sensors::SensorSet s = sensors::typical_sensors();
    s.distribution = sensors::BiasDistribution::normal;
    s.accuracy = {0.5, 0.05, 1.0, 0.03};
    std::array<double, 4> sum{}, sum2{};
    for (std::size_t k = 0; k < n; ++k) {
      const auto b = sensors::draw_biases(s, 11, k);
      for (std::size_t i = 0; i < 4; ++i) sum[i] += b[i], sum2[i] += b[i] * b[i];
    }
    for (std::size_t i = 0; i < 4; ++i) {
      const double sigma = s.accuracy[i];
      CHECK(std::fabs(sum[i] / n) < 4.0 * sigma / std::sqrt(double(n)));
      CHECK(std::fabs(sum2[i] / n - sigma * sigma) < 4.0 * sigma * sigma * std::sqrt(2.0 / n));
    }
  }
  SUBCASE("draws depend on seed and trial only, and the sensors are not correlated") {
    CHECK(sensors::standard_draws(3, 9, sensors::BiasDistribution::uniform) ==
          sensors::standard_draws(3, 9, sensors::BiasDistribution::uniform));
    CHECK(sensors::standard_draws(3, 9, sensors::BiasDistribution::uniform) !=
          sensors::standard_draws(3, 10, sensors::BiasDistribution::uniform));
    double cross = 0.0;
    for (std::size_t k = 0; k < n; ++k) {
      const auto z = sensors::standard_draws(5, k, sensors::BiasDistribution::uniform);
      cross += z[0] * z[1];
    }
    // E[z0·z1] = 0, s.e. (1/3)/sqrt(n) for independent uniforms on ±1.
    CHECK(std::fabs(cross / n) < 4.0 / 3.0 / std::sqrt(double(n)));
  }
}

TEST_CASE("the study's mean bias effect agrees with the trial mean within its standard error") {
  // The summary's mean and standard error are those of the per-trial values.
  const Year& y = year();
  const sensors::Engine engine(y.prepared, y.strategies, HumidityKind::relative_humidity);
  sensors::StudyOptions opt;
  opt.trials = 30;
  const auto st = sensors::run_study(engine, sensors::typical_sensors(), opt);
  for (const auto& s : st.ranked) {
    double sum = 0, sum2 = 0;
    for (std::size_t k = 0; k < st.trials_completed(); ++k) {
      const double x = st.outcome(k, s.index).shortfall_kwh;
      sum += x;
      sum2 += x * x;
    }
    const double n = static_cast<double>(st.trials_completed());
    const double mean = sum / n;
    CHECK(s.shortfall_kwh.mean == doctest::Approx(mean).epsilon(1e-12));
    const double var = (sum2 - n * mean * mean) / (n - 1);
    CHECK(s.shortfall_kwh.std_error ==
          doctest::Approx(std::sqrt(std::max(var, 0.0) / n)).epsilon(1e-6));
    CHECK(s.shortfall_kwh.p10 <= s.shortfall_kwh.p50);
    CHECK(s.shortfall_kwh.p50 <= s.shortfall_kwh.p90);
    CHECK(s.shortfall_kwh.p90 <= s.shortfall_kwh.worst);
  }
}

TEST_CASE("summarise: type-7 quantiles on a small set") {
  // Linear interpolation between order statistics (common practice; the default of R and
  // NumPy): for 1..11, P10 = 2, P50 = 6, P90 = 10.
  std::vector<double> v;
  for (int i = 11; i >= 1; --i) v.push_back(i);
  const auto s = sensors::summarise(v);
  CHECK(s.mean == 6.0);
  CHECK(s.p10 == doctest::Approx(2.0));
  CHECK(s.p50 == doctest::Approx(6.0));
  CHECK(s.p90 == doctest::Approx(10.0));
  CHECK(s.worst == 11.0);
  CHECK(s.std_error == doctest::Approx(std::sqrt(11.0 / 11.0)));  // sample variance 11
  const auto e = sensors::summarise({});
  CHECK(e.mean == 0.0);
}

// --- Readings ---------------------------------------------------------------------------------

TEST_CASE("derived readings follow psychro, and clamps are counted, never NaN") {
  const double p = psychro::kStandardPressureKpa;
  SUBCASE("an RH reading derives W, h and dew point as psychro does") {
    const auto r = sensors::derive_reading(30.0, HumidityKind::relative_humidity, 0.5, p, true);
    CHECK_FALSE(r.clamped);
    const double w = psychro::humidity_ratio_from_relative_humidity(30.0, 0.5, p);
    CHECK(r.values[highlimit::Quantity::humidity_ratio] == doctest::Approx(w).epsilon(1e-14));
    CHECK(r.values[highlimit::Quantity::enthalpy] ==
          doctest::Approx(psychro::enthalpy_kj_per_kg(30.0, w)).epsilon(1e-14));
    CHECK(r.values[highlimit::Quantity::dew_point] ==
          doctest::Approx(psychro::dew_point_from_humidity_ratio_c(w, p)).epsilon(1e-10));
  }
  SUBCASE("RH above 100 % is held at saturation, below 0 % at dry air") {
    const auto hi = sensors::derive_reading(30.0, HumidityKind::relative_humidity, 1.07, p, true);
    CHECK(hi.clamped);
    CHECK(hi.values[highlimit::Quantity::humidity_ratio] ==
          doctest::Approx(psychro::saturation_humidity_ratio(30.0, p)).epsilon(1e-12));
    CHECK(hi.values[highlimit::Quantity::dew_point] == doctest::Approx(30.0).epsilon(1e-9));
    const auto lo = sensors::derive_reading(-20.0, HumidityKind::relative_humidity, -0.04, p, true);
    CHECK(lo.clamped);
    CHECK(lo.values[highlimit::Quantity::humidity_ratio] == 0.0);
    CHECK(lo.values[highlimit::Quantity::dew_point] == psychro::kMinTemperatureC);
  }
  SUBCASE("a dew-point reading above the dry-bulb reading is held at it") {
    const auto r = sensors::derive_reading(20.0, HumidityKind::dew_point, 21.0, p, true);
    CHECK(r.clamped);
    CHECK(r.values[highlimit::Quantity::dew_point] == 20.0);
    CHECK(r.values[highlimit::Quantity::humidity_ratio] ==
          doctest::Approx(psychro::saturation_humidity_ratio(20.0, p)).epsilon(1e-12));
  }
  SUBCASE("an enthalpy reading below dry air gives W = 0; above saturation W = W_s") {
    const auto lo = sensors::derive_reading(25.0, HumidityKind::enthalpy, 20.0, p, true);
    CHECK(lo.clamped);
    CHECK(lo.values[highlimit::Quantity::humidity_ratio] == 0.0);
    CHECK(lo.values[highlimit::Quantity::enthalpy] == 20.0);  // the reading itself is compared
    const auto hi = sensors::derive_reading(25.0, HumidityKind::enthalpy, 90.0, p, false);
    CHECK(hi.clamped);
    CHECK(hi.values[highlimit::Quantity::humidity_ratio] ==
          doctest::Approx(psychro::saturation_humidity_ratio(25.0, p)).epsilon(1e-12));
  }
  SUBCASE("absurd readings stay finite") {
    for (double t : {-180.0, -95.0, 150.0, 250.0})
      for (HumidityKind k :
           {HumidityKind::relative_humidity, HumidityKind::dew_point, HumidityKind::enthalpy}) {
        const double hum = k == HumidityKind::relative_humidity ? 1.5
                           : k == HumidityKind::dew_point       ? t + 5
                                                                : 900.0;
        const auto r = sensors::derive_reading(t, k, hum, 60.0, true);
        for (double v : r.values.value) CHECK(std::isfinite(v));
      }
  }
  SUBCASE("the engine counts exactly the intervals whose RH reading left 0–100 %") {
    const Year& y = year();
    const sensors::Engine engine(y.prepared, y.strategies, HumidityKind::relative_humidity);
    sensors::Biases b{};
    at(b, Sensor::outdoor_humidity) = 0.08;
    sensors::Clamps c;
    one_trial(engine, b, nullptr, &c);
    std::uint32_t expected = 0;
    for (const auto& iv : y.prepared.intervals) {
      const double rh = psychro::relative_humidity_from_humidity_ratio(
          iv.outdoor[highlimit::Quantity::dry_bulb],
          iv.outdoor[highlimit::Quantity::humidity_ratio], iv.pressure_kpa);
      expected += rh + 0.08 > 1.0;
    }
    CHECK(expected > 0);
    CHECK(c.outdoor == expected);
    CHECK(c.ret == 0);  // return RH 50 % + 0 stays inside
  }
}

// --- [sensors] ----------------------------------------------------------------------------------

namespace {
sensors::SensorSet read_table(const std::string& table, const std::string& top = "") {
  const UnitFile u =
      parse_unit_file(top + std::string(kOffice) + "\n[sensors]\n" + table, "u.toml");
  return sensors::read_sensors(u.sensors ? &*u.sensors : nullptr, u.path, u.units);
}
std::string error_of(const std::string& table, const std::string& top = "") {
  try {
    read_table(table, top);
  } catch (const InputError& e) {
    return e.what();
  }
  return "no error";
}
// Line of the first key under [sensors] in the assembled file.
const int kFirstLine = static_cast<int>(std::count(kOffice.begin(), kOffice.end(), '\n')) + 3;
}  // namespace

TEST_CASE("[sensors]: defaults, values, units and kinds") {
  SUBCASE("no table: typical commercial figures (common practice)") {
    const auto s = sensors::read_sensors(nullptr, "u.toml", units::System::ip);
    CHECK_FALSE(s.from_file);
    CHECK(at(s.accuracy, Sensor::outdoor_dry_bulb) == doctest::Approx(1.0 / 1.8));
    CHECK(at(s.accuracy, Sensor::outdoor_humidity) == doctest::Approx(0.05));
    CHECK(at(s.accuracy, Sensor::return_dry_bulb) == doctest::Approx(1.0 / 1.8));
    CHECK(at(s.accuracy, Sensor::return_rh) == doctest::Approx(0.05));
    CHECK(s.distribution == sensors::BiasDistribution::uniform);
  }
  SUBCASE("values with units, bare numbers in the file's system, omitted keys typical") {
    const auto s = read_table("outdoor_dry_bulb = \"0.5K\"\noutdoor_rh = 3\nreturn_dry_bulb = 2\n");
    CHECK(at(s.accuracy, Sensor::outdoor_dry_bulb) == doctest::Approx(0.5));
    CHECK(at(s.accuracy, Sensor::outdoor_humidity) == doctest::Approx(0.03));
    CHECK(at(s.accuracy, Sensor::return_dry_bulb) == doctest::Approx(2.0 / 1.8));  // bare: °F
    CHECK(at(s.accuracy, Sensor::return_rh) == doctest::Approx(0.05));
    CHECK(s.given == std::array<bool, 4>{true, true, true, false});
    const auto si = read_table("outdoor_dry_bulb = 0.4\n", "units = \"si\"\n");
    CHECK(at(si.accuracy, Sensor::outdoor_dry_bulb) == doctest::Approx(0.4));  // bare: K
  }
  SUBCASE("the humidity kind follows the key, or outdoor_humidity_kind") {
    const auto d = read_table("outdoor_dew_point = \"1.5F\"\ndistribution = \"normal\"\n");
    CHECK(d.outdoor_humidity == HumidityKind::dew_point);
    CHECK(at(d.accuracy, Sensor::outdoor_humidity) == doctest::Approx(1.5 / 1.8));
    CHECK(d.distribution == sensors::BiasDistribution::normal);
    const auto e = read_table("outdoor_humidity_kind = \"enthalpy\"\n");
    CHECK(e.outdoor_humidity == HumidityKind::enthalpy);
    CHECK(at(e.accuracy, Sensor::outdoor_humidity) == doctest::Approx(2.326));  // 1 Btu/lb typical
    const auto h =
        read_table("outdoor_humidity_kind = \"dew_point\"\noutdoor_dew_point = \"0.5K\"\n");
    CHECK(h.outdoor_humidity == HumidityKind::dew_point);
  }
}

TEST_CASE("[sensors]: every error names file, line and key") {
  auto line = [](int offset) {
    return "u.toml:" + std::to_string(kFirstLine + offset) + ": sensors.";
  };
  std::string e = error_of("outdoor_rh = \"5%\"\noutdoor_tempurature = \"1F\"\n");
  CHECK(e.find(line(1) +
               "outdoor_tempurature: unknown key in [sensors] (allowed: outdoor_dry_bulb") == 0);
  e = error_of("outdoor_rh = \"-2%\"\n");
  CHECK(e.find(line(0) + "outdoor_rh: -2.00% is outside the allowed range (0% to 30%") == 0);
  e = error_of("outdoor_dry_bulb = \"25F\"\n");
  CHECK(e.find(line(0) + "outdoor_dry_bulb: 25.00 °F is outside the allowed range") == 0);
  e = error_of("outdoor_dry_bulb = \"5btu/lb\"\n");
  CHECK(
      e.find(
          line(0) +
          "outdoor_dry_bulb: '5btu/lb' has unit 'btu/lb', which is not a temperature difference") ==
      0);
  e = error_of("outdoor_dry_bulb = true\n");
  CHECK(e.find(line(0) + "outdoor_dry_bulb: must be an accuracy") == 0);
  e = error_of("distribution = \"gaussian\"\n");
  CHECK(e.find(line(0) + "distribution: 'gaussian' is not allowed (allowed: uniform, normal") == 0);
  e = error_of("outdoor_humidity_kind = \"wet-bulb\"\n");
  CHECK(e.find(line(0) + "outdoor_humidity_kind: 'wet-bulb' is not allowed (allowed: rh,") == 0);
  e = error_of("outdoor_humidity_kind = \"rh\"\noutdoor_dew_point = \"2F\"\n");
  CHECK(e.find(line(1) + "outdoor_dew_point: outdoor_humidity_kind is \"rh\" (line " +
               std::to_string(kFirstLine) + "); give outdoor_rh instead") == 0);
  e = error_of("outdoor_rh = \"5%\"\noutdoor_enthalpy = \"1btu/lb\"\n");
  CHECK(e.find(line(1) +
               "outdoor_enthalpy: give one outdoor humidity sensor; outdoor_rh is already given on "
               "line " +
               std::to_string(kFirstLine)) == 0);
  e = error_of("outdoor_rh = \"0.5\"\n");
  CHECK(e.find(line(0) + "outdoor_rh: '0.5' is ambiguous") == 0);
}

TEST_CASE("[sensors]: the largest accuracy is accepted as documented, in either system") {
  // README: at most 10 K (18 °F), 30 % RH, 20 kJ/kg; 18 °F is 10 K exactly (NIST SP 811).
  const auto s =
      read_table("outdoor_dry_bulb = \"18F\"\nreturn_dry_bulb = \"10K\"\noutdoor_rh = \"30%\"\n");
  CHECK(at(s.accuracy, Sensor::outdoor_dry_bulb) == 10.0);
  CHECK(at(s.accuracy, Sensor::return_dry_bulb) == 10.0);
  CHECK(at(s.accuracy, Sensor::outdoor_humidity) == doctest::Approx(0.30));
  const auto e = read_table("outdoor_enthalpy = \"20kJ/kg\"\n");
  CHECK(at(e.accuracy, Sensor::outdoor_humidity) == 20.0);
  // Valid but far beyond any sensor in service (common practice): kept, with a warning on
  // the key's own line.
  REQUIRE(s.warnings.size() == 3);
  CHECK(s.warnings[0].rfind(
            "u.toml:" + std::to_string(kFirstLine) + ": sensors.outdoor_dry_bulb: '18F'", 0) == 0);
  CHECK(s.warnings[0].find("outside the plausible range of a dry-bulb sensor accuracy") !=
        std::string::npos);
  // Just past the end is refused, naming the end that is accepted.
  const std::string err = error_of("outdoor_rh = \"5%\"\noutdoor_dry_bulb = \"18.1F\"\n");
  CHECK(err.find(
            "u.toml:" + std::to_string(kFirstLine + 1) +
            ": sensors.outdoor_dry_bulb: 18.10 °F is outside the allowed range (0 °F to 18 °F") ==
        0);
}

// --- Sweep --------------------------------------------------------------------------------------

namespace {
// The library's sweep from "SENSOR=FROM:TO:STEP" as the command line splits it (the syntax
// errors themselves are the command line's: see test_sensors_cli's --sweep case).
sensors::SweepSpec parse_sweep(std::string_view text, HumidityKind configured, units::System bare,
                               std::string_view origin) {
  const auto eq = text.find('=');
  const std::string_view range = text.substr(eq + 1);
  const auto c1 = range.find(':'), c2 = range.find(':', c1 + 1);
  return sensors::sweep_spec(
      text.substr(0, eq),
      {range.substr(0, c1), range.substr(c1 + 1, c2 - c1 - 1), range.substr(c2 + 1)}, configured,
      bare, origin);
}
}  // namespace

TEST_CASE("--sweep: parsing") {
  const auto s = parse_sweep("outdoor_rh=-10%:10%:1%", HumidityKind::relative_humidity,
                             units::System::ip, "--sweep");
  CHECK(s.sensor == Sensor::outdoor_humidity);
  REQUIRE(s.biases.size() == 21);
  CHECK(s.biases.front() == doctest::Approx(-0.10));
  CHECK(s.biases.back() == doctest::Approx(0.10));
  CHECK(std::count(s.biases.begin(), s.biases.end(), 0.0) == 1);  // the exact point is exact
  const auto t = parse_sweep("return-dry-bulb=-2:2:0.5", HumidityKind::relative_humidity,
                             units::System::ip, "--sweep");
  CHECK(t.sensor == Sensor::return_dry_bulb);
  CHECK(t.biases.size() == 9);
  CHECK(t.biases.front() == doctest::Approx(-2.0 / 1.8));  // bare numbers in --units ip: °F
  const auto d = parse_sweep("outdoor_dew_point=-2F:2F:1F", HumidityKind::relative_humidity,
                             units::System::ip, "--sweep");
  CHECK(d.outdoor_kind == HumidityKind::dew_point);

  auto err = [](const char* text) -> std::string {
    try {
      parse_sweep(text, HumidityKind::relative_humidity, units::System::ip, "--sweep");
    } catch (const std::exception& e) {
      return e.what();
    }
    return "no error";
  };
  CHECK(err("indoor_rh=1%:2%:1%")
            .find("--sweep: 'indoor_rh' is not a sensor (allowed: outdoor_dry_bulb") == 0);
  // A STEP so small the count overflows any integer: said in words, never a wrapped number.
  const std::string tiny = err("outdoor_rh=-10%:10%:1e-300%");
  CHECK(tiny.find("--sweep: more than a billion biases asked for; at most 401") == 0);
  CHECK(tiny.find("-9223372036854775807") == std::string::npos);
  CHECK(err("outdoor_rh=-10%:10%:0.01%").find("--sweep: 2001 biases asked for; at most 401") == 0);
  CHECK(err("outdoor_rh=5%:-5%:1%").find("--sweep: FROM 5.00% is above TO -5.00%") == 0);
  CHECK(err("outdoor_rh=-5%:5%:0%").find("--sweep: STEP 0.00% must be more than 0") == 0);
  CHECK(err("outdoor_rh=-50%:5%:1%").find("--sweep: bias -50.00% is outside the allowed range") ==
        0);
  CHECK(err("outdoor_rh=-10%:10%:0.01%").find("--sweep: 2001 biases asked for; at most 401") == 0);
  CHECK(err("outdoor_rh=-10%:ten:1%").find("--sweep TO: 'ten' is not a percentage") == 0);
}

TEST_CASE("sweep: exact at zero, unaffected strategies flat, monotone harmful hours") {
  const Year& y = year();
  const auto spec = parse_sweep("outdoor_rh=-10%:10%:2%", HumidityKind::relative_humidity,
                                units::System::ip, "--sweep");
  const auto sw = sensors::run_sweep(y.prepared, y.strategies, spec);
  const annual::YearResult ref = annual::evaluate(y.strategies, y.prepared);
  REQUIRE_FALSE(sw.partial);
  CHECK(spec.biases[sw.reference] == 0.0);
  for (std::size_t s = 0; s < y.strategies.size(); ++s) {
    CAPTURE(y.strategies[s].name);
    const auto& r = *std::find_if(ref.strategies.begin(), ref.strategies.end(),
                                  [&](const auto& x) { return x.name == y.strategies[s].name; });
    check_same(sw.outcomes[sw.reference][s], r);
    const bool reads_humidity = sensors::uses_humidity(y.strategies[s]);
    CHECK(bool(sw.humidity_based[s]) == reads_humidity);
    for (std::size_t i = 0; i < spec.biases.size(); ++i) {
      if (!reads_humidity) CHECK(same(sw.outcomes[i][s], sw.outcomes[sw.reference][s]));
      // A fixed-enthalpy limit with a drier reading enables more hours: harmful hours can only
      // grow and missed hours only shrink as the bias goes down.
      if (y.strategies[s].preset == "fixed-enthalpy" && i + 1 < spec.biases.size()) {
        CHECK(sw.outcomes[i][s].harmful_hours >= sw.outcomes[i + 1][s].harmful_hours);
        CHECK(sw.outcomes[i][s].missed_hours <= sw.outcomes[i + 1][s].missed_hours);
      }
    }
  }
  // The turn points, recomputed here from the outcomes.
  for (std::size_t s = 0; s < y.strategies.size(); ++s) {
    if (!sw.humidity_based[s]) continue;
    std::optional<double> above;
    for (std::size_t i = sw.reference + 1; i < spec.biases.size() && !above; ++i) {
      double best_db = 1e300;
      for (std::size_t d = 0; d < y.strategies.size(); ++d)
        if (sensors::dry_bulb_only(y.strategies[d]))
          best_db = std::min(best_db, sw.outcomes[i][d].shortfall_kwh);
      if (sw.outcomes[i][s].shortfall_kwh > best_db) above = spec.biases[i];
    }
    CHECK(sw.falls_behind[s].above == above);
  }
}

// --- Break-even ---------------------------------------------------------------------------------

TEST_CASE("break-even: 'never', 'always' and a crossing, each checked independently") {
  const Year& y = year();
  highlimit::PresetSettings s = highlimit::preset_defaults();
  // Constructed to be hopeless: an enthalpy limit so low that the economizer hardly ever runs,
  // and a dry-bulb limit so low that it never does.
  s.enthalpy_limit_kj_per_kg = -20.0;
  const auto starved_enthalpy = highlimit::make_preset("fixed-enthalpy", s, "enthalpy -20 kJ/kg");
  s.dry_bulb_limit_c = -40.0;
  const auto starved_dry_bulb = highlimit::make_preset("fixed-dry-bulb", s, "dry-bulb -40C");
  s = highlimit::preset_defaults();
  s.dry_bulb_limit_c = (65.0 - 32.0) / 1.8;
  const auto db65 = highlimit::make_preset("fixed-dry-bulb", s, "dry-bulb 65F");
  const auto diff_enthalpy = highlimit::make_preset("differential-enthalpy", s);
  const auto good_enthalpy = highlimit::make_preset("fixed-enthalpy+dry-bulb", s);

  const std::vector<highlimit::Strategy> list = {starved_enthalpy, good_enthalpy, diff_enthalpy,
                                                 db65, starved_dry_bulb};
  const sensors::Engine engine(y.prepared, list, HumidityKind::relative_humidity);
  const sensors::SensorSet set = sensors::typical_sensors();
  sensors::BreakEvenOptions opt;
  opt.trials = 40;
  const auto be = sensors::break_even(engine, set, opt);
  CHECK(be.max_scale == doctest::Approx(0.25 / 0.05));
  REQUIRE(be.pairs.size() == 6);  // 3 humidity-based × 2 dry-bulb-only
  auto pair = [&](std::string_view h, std::string_view d) -> const sensors::BreakEvenPair& {
    for (const auto& p : be.pairs)
      if (p.humid_name == h && p.dry_name == d) return p;
    FAIL("no pair");
    return be.pairs.front();
  };
  CHECK(pair("enthalpy -20 kJ/kg", "dry-bulb 65F").verdict == sensors::Verdict::never);
  CHECK(pair("fixed-enthalpy+dry-bulb", "dry-bulb -40C").verdict == sensors::Verdict::always);
  CHECK(pair("differential-enthalpy", "dry-bulb -40C").verdict == sensors::Verdict::always);

  // Mean shortfalls of two strategies at a scale, through run_study (another path).
  auto means_at = [&](const highlimit::Strategy& a, const highlimit::Strategy& b, double scale) {
    const std::vector<highlimit::Strategy> two = {a, b};
    const sensors::Engine e2(y.prepared, two, HumidityKind::relative_humidity);
    sensors::SensorSet sc = set;
    at(sc.accuracy, Sensor::outdoor_humidity) *= scale;
    at(sc.accuracy, Sensor::return_rh) *= scale;
    sensors::StudyOptions so;
    so.trials = opt.trials;
    so.seed = opt.seed;
    const auto st = sensors::run_study(e2, sc, so);
    const auto mean = [&](std::size_t i) {
      return std::find_if(st.ranked.begin(), st.ranked.end(),
                          [&](const auto& x) { return x.index == i; })
          ->shortfall_kwh.mean;
    };
    return std::pair{mean(0), mean(1)};
  };
  {
    const auto& p = pair("enthalpy -20 kJ/kg", "dry-bulb 65F");
    const auto [h, d] = means_at(starved_enthalpy, db65, 0.0);
    CHECK(h >= d);
    CHECK(p.humid_mean_at_zero_kwh == doctest::Approx(h));
  }
  {
    const auto [h, d] = means_at(good_enthalpy, starved_dry_bulb, be.max_scale);
    CHECK(h < d);
  }
  // Differential enthalpy against a 65 °F dry-bulb limit crosses inside the search in this
  // climate; the bracket must hold on both sides.
  const auto& cross = pair("differential-enthalpy", "dry-bulb 65F");
  REQUIRE(cross.verdict == sensors::Verdict::crosses);
  CHECK(cross.scale_low < cross.scale_high);
  CHECK(cross.scale >= cross.scale_low);
  CHECK(cross.scale <= cross.scale_high);
  CHECK(cross.scale_high - cross.scale_low == doctest::Approx(be.max_scale / 128.0));
  const auto [h_lo, d_lo] = means_at(diff_enthalpy, db65, cross.scale_low);
  const auto [h_hi, d_hi] = means_at(diff_enthalpy, db65, cross.scale_high);
  CHECK(h_lo < d_lo);
  CHECK(h_hi >= d_hi);
  CHECK(d_lo == d_hi);  // the dry-bulb strategy reads no humidity sensor
}

TEST_CASE("break-even with no humidity-based or no dry-bulb-only strategy has no pairs") {
  const Year& y = year();
  const std::vector<highlimit::Strategy> only_db = {by_name(y.strategies, "fixed-dry-bulb")};
  const sensors::Engine engine(y.prepared, only_db, HumidityKind::relative_humidity);
  const auto be = sensors::break_even(engine, sensors::typical_sensors(), {});
  CHECK(be.pairs.empty());
  CHECK_FALSE(engine.uses_humidity());
}

// --- The command ------------------------------------------------------------------------------

namespace {
// Runs `limitline ARGS...` and sends it SIGINT once it has installed its handler (bit 2 of
// SigCgt in /proc/PID/status), to stop it the way Ctrl-C does.
test::CliRun run_and_interrupt(std::vector<std::string> args) {
  int out_pipe[2], err_pipe[2];
  REQUIRE(pipe(out_pipe) == 0);
  REQUIRE(pipe(err_pipe) == 0);
  const pid_t pid = fork();
  REQUIRE(pid >= 0);
  if (pid == 0) {
    dup2(out_pipe[1], 1);
    dup2(err_pipe[1], 2);
    close(out_pipe[0]);
    close(err_pipe[0]);
    std::string exe = LIMITLINE_EXE;
    std::vector<char*> argv = {exe.data()};
    for (auto& a : args) argv.push_back(a.data());
    argv.push_back(nullptr);
    execv(exe.c_str(), argv.data());
    _exit(127);
  }
  close(out_pipe[1]);
  close(err_pipe[1]);
  for (int i = 0; i < 600; ++i) {
    // Until execv the child is a copy of this test, whose doctest catches SIGINT too: only
    // the command's own handler counts.
    std::ifstream cmdline("/proc/" + std::to_string(pid) + "/cmdline");
    std::string argv0;
    std::getline(cmdline, argv0, '\0');
    if (argv0 != LIMITLINE_EXE) {
      std::this_thread::sleep_for(std::chrono::milliseconds(50));
      continue;
    }
    std::ifstream status("/proc/" + std::to_string(pid) + "/status");
    bool caught = false;
    for (std::string line; std::getline(status, line);)
      if (line.rfind("SigCgt:", 0) == 0)
        caught = (std::stoull(line.substr(7), nullptr, 16) >> (SIGINT - 1)) & 1;
    if (caught) break;
    std::this_thread::sleep_for(std::chrono::milliseconds(50));
  }
  std::this_thread::sleep_for(std::chrono::milliseconds(300));  // let some trials finish
  kill(pid, SIGINT);
  test::CliRun r;
  auto drain = [](int fd, std::string& into) {
    char buf[4096];
    for (ssize_t n; (n = ::read(fd, buf, sizeof buf)) > 0;)
      into.append(buf, static_cast<std::size_t>(n));
    close(fd);
  };
  std::thread err_reader(drain, err_pipe[0], std::ref(r.err));
  drain(out_pipe[0], r.out);
  err_reader.join();
  int st = 0;
  waitpid(pid, &st, 0);
  r.rc = WIFEXITED(st) ? WEXITSTATUS(st) : 128 + WTERMSIG(st);
  return r;
}

std::string write_unit(const std::string& name, const std::string& extra) {
  const std::string path = (test::scratch_dir("sensors") / name).string();
  std::ofstream(path) << kOffice << extra;
  return path;
}
}  // namespace

TEST_CASE("sensors command: text, JSON, per-trial CSV and errors") {
  const std::string unit =
      write_unit("sensors-test-unit.toml", "\n[sensors]\noutdoor_rh = \"4%\"\n");
  const std::string csv = (test::scratch_dir("sensors") / "trials.csv").string();
  SUBCASE("text, with a sweep, ends with the cautions") {
    const test::CliRun r =
        test::run_cli({"sensors", unit, "--weather", kGreensboro, "--trials", "20",
                       "--break-even-trials", "8", "--sweep", "return_rh=-4%:4%:2%"});
    REQUIRE(r.rc == 0);
    CHECK(r.out.find("outdoor RH         ±4.0%") != std::string::npos);
    CHECK(r.out.find("Trials: 20 requested, 20 finished (seed 1)") != std::string::npos);
    CHECK(r.out.find("Break-even humidity-sensor accuracy") != std::string::npos);
    CHECK(r.out.find("Bias sweep: the return RH sensor") != std::string::npos);
    CHECK(r.out.find("Cautions:") != std::string::npos);
  }
  SUBCASE("JSON and CSV") {
    const test::CliRun r = test::run_cli({"sensors", unit, "--weather", kGreensboro, "--trials",
                                          "12", "--break-even-trials", "0", "--format", "json",
                                          "--units", "si", "--trials-csv", csv, "--seed", "5"});
    REQUIRE(r.rc == 0);
    for (const char* key :
         {"\"trials_completed\": 12", "\"partial\": false", "\"shortfall_kwh\"", "\"p90\"",
          "\"harmful_hours\"", "\"missed_hours\"", "\"beats\"", "\"outdoor_rh_pct\": 4",
          "\"outdoor_dry_bulb_delta_k\"", "\"cautions\""})
      CHECK_MESSAGE(r.out.find(key) != std::string::npos, key);
    CHECK(r.out.find("shortfall_kbtu") == std::string::npos);  // SI only
    std::ifstream f(csv);
    std::string header;
    std::getline(f, header);
    CHECK(
        header.rfind(
            "trial,outdoor_dry_bulb_bias_delta_k,outdoor_rh_bias_pct,return_dry_bulb_bias_delta_k,"
            "return_rh_bias_pct,outdoor_humidity_clamped,return_rh_clamped,strategy,shortfall_kwh,",
            0) == 0);
    std::size_t rows = 0;
    for (std::string line; std::getline(f, line);) ++rows;
    CHECK(rows == 12 * 7);
  }
  SUBCASE("bad input: exit 2 with one line naming the value") {
    const std::string bad =
        write_unit("sensors-test-bad.toml", "\n[sensors]\nreturn_rh = \"45%\"\n");
    test::CliRun r = test::run_cli({"sensors", bad, "--weather", kGreensboro});
    CHECK(r.rc == 2);
    CHECK(r.err.find("sensors-test-bad.toml:" + std::to_string(kFirstLine) +
                     ": sensors.return_rh: 45.00% is outside the allowed range") !=
          std::string::npos);
    r = test::run_cli({"sensors", unit, "--weather", kGreensboro, "--trials", "0"});
    CHECK(r.rc == 2);
    CHECK(r.err.find("--trials: 0 is outside the allowed range (1 to 100000)") !=
          std::string::npos);
    r = test::run_cli(
        {"sensors", unit, "--weather", kGreensboro, "--sweep", "outdoor_rh=-5%:5%:0%"});
    CHECK(r.rc == 2);
    CHECK(r.err.find("--sweep: STEP 0.00% must be more than 0") != std::string::npos);
    r = test::run_cli({"sensors", unit, "--format", "csv"});
    CHECK(r.rc == 1);
  }
  SUBCASE("--sweep syntax is the command line's: exit 1 with the form to write") {
    for (const char* text : {"outdoor_rh", "outdoor_rh=1%:2%", "outdoor_rh=1%:2%:1%:4%"}) {
      const test::CliRun r =
          test::run_cli({"sensors", unit, "--weather", kGreensboro, "--sweep", text});
      CHECK(r.rc == 1);
      CHECK(r.err.find("FROM:TO:STEP") != std::string::npos);
    }
  }
}

TEST_CASE("sensors command: Ctrl-C reports the finished trials, marked partial") {
  const test::CliRun r =
      run_and_interrupt({"sensors", "--trials", "100000", "--break-even-trials", "0"});
  CHECK(r.rc == 130);
  CHECK(r.out.find("PARTIAL RESULTS: interrupted; ") != std::string::npos);
  CHECK(r.out.find(" of 100000 trials finished") != std::string::npos);
  CHECK(r.out.find("Cautions:") != std::string::npos);
  CHECK(r.err.find("interrupted; partial results written") != std::string::npos);
}
