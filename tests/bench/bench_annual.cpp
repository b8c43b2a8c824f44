// One site-year: all presets and the three references (issue target ≤ 5 ms with the CSV parse,
// ≤ 2 ms without; under the part-load model ≤ 2 ms without the parse). Weather: the real Greensboro
// TMY3 year in tests/data (NREL NSRDB, via pvlib).
#include <limitline/io/schedule_file.hpp>
#include <limitline/analysis/annual.hpp>
#include <limitline/analysis/tuning.hpp>
#include <limitline/io/unit_file.hpp>
#include <limitline/io/weather.hpp>
#include <limitline/app/year_job.hpp>

#include "../support/office.hpp"

#include <benchmark/benchmark.h>

#include <fstream>
#include <sstream>

namespace {

using namespace limitline;

const std::string kUnit = test::office_with_schedule();

std::string read(const std::string& path) {
  std::ifstream f(path, std::ios::binary);
  std::stringstream ss;
  ss << f.rdbuf();
  return ss.str();
}

const std::string& weather_text() {
  static const std::string t = read(test::greensboro_path());
  return t;
}

void BM_YearWithParse(benchmark::State& state) {
  const UnitFile unit = parse_unit_file(kUnit, "bench.toml");
  const Schedule schedule = read_schedule(*unit.schedule, unit.path);
  const auto strategies = strategies_or_presets(unit);
  for (auto _ : state) {
    const auto w = weather::read_text(weather_text(), "greensboro", weather::Mapping{},
                                      unit.site.design_pressure_kpa());
    const auto iv = outdoor_intervals(w);
    const auto p = annual::prepare(unit.air_handler, unit.return_air, iv, schedule, {});
    auto y = annual::evaluate(strategies, p);
    benchmark::DoNotOptimize(y);
  }
}
BENCHMARK(BM_YearWithParse)->Unit(benchmark::kMillisecond);

void BM_YearWithoutParse(benchmark::State& state) {
  const UnitFile unit = parse_unit_file(kUnit, "bench.toml");
  const Schedule schedule = read_schedule(*unit.schedule, unit.path);
  const auto strategies = strategies_or_presets(unit);
  const auto w = weather::read_text(weather_text(), "greensboro", weather::Mapping{},
                                    unit.site.design_pressure_kpa());
  const auto iv = outdoor_intervals(w);
  for (auto _ : state) {
    const auto p = annual::prepare(unit.air_handler, unit.return_air, iv, schedule, {});
    auto y = annual::evaluate(strategies, p);
    benchmark::DoNotOptimize(y);
  }
}
BENCHMARK(BM_YearWithoutParse)->Unit(benchmark::kMillisecond);

// The part-load model (variable airflow with a 30 % floor, space loads in coefficient form,
// return air from the space, supply-air reset): the same year, everything but the parse.
annual::PrepareOptions part_load_options() {
  annual::PrepareOptions opt;
  part_load::Space space;
  space.space_temp_c = 23.9;
  space.return_air_rise_k = 0.6;
  space.coefficients = part_load::LoadCoefficients{40.0, 0.8, 8.0};  // invented office loads
  opt.space = space;
  opt.control.airflow = part_load::AirflowControl::variable;
  opt.control.min_airflow_fraction = 0.3;
  opt.control.reset = part_load::SupplyAirReset{10.0, 15.6, 18.3, 12.8};
  return opt;
}

void BM_PartLoadYearWithoutParse(benchmark::State& state) {
  const UnitFile unit = parse_unit_file(kUnit, "bench.toml");
  const Schedule schedule = read_schedule(*unit.schedule, unit.path);
  const auto strategies = strategies_or_presets(unit);
  const auto w = weather::read_text(weather_text(), "greensboro", weather::Mapping{},
                                    unit.site.design_pressure_kpa());
  const auto iv = outdoor_intervals(w);
  const annual::PrepareOptions opt = part_load_options();
  for (auto _ : state) {
    const auto p = annual::prepare(unit.air_handler, unit.return_air, iv, schedule, opt);
    auto y = annual::evaluate(strategies, p);
    benchmark::DoNotOptimize(y);
  }
}
BENCHMARK(BM_PartLoadYearWithoutParse)->Unit(benchmark::kMillisecond);

// Setpoint tuning: all seven presets over their grids (41 settings, or 21 x 11 for the
// combined presets: 857 runs) on one prepared year of 8,760 fan-on hours, on one core (issue
// target ≤ 100 ms, about 13 ns per hour-run).
void BM_TuneAllPresetsOneCore(benchmark::State& state) {
  const UnitFile unit = parse_unit_file(kUnit, "bench.toml");
  const Schedule schedule;  // always occupied
  const auto strategies = strategies_or_presets(unit);
  const auto w = weather::read_text(weather_text(), "greensboro", weather::Mapping{},
                                    unit.site.design_pressure_kpa());
  const auto p =
      annual::prepare(unit.air_handler, unit.return_air, outdoor_intervals(w), schedule, {});
  const tuning::Baseline base = tuning::baseline_of(p);
  std::size_t runs = 0;
  for (auto _ : state) {
    runs = 0;
    for (const auto& s : strategies) {
      auto c = tuning::tune(s, tuning::default_axes(s, units::System::ip), {}, base, 1);
      runs += c->grid.size();
      benchmark::DoNotOptimize(c);
    }
  }
  state.counters["runs"] = static_cast<double>(runs);
  state.counters["ns_per_hour_run"] = benchmark::Counter(
      static_cast<double>(runs * p.intervals.size()),
      benchmark::Counter::kIsIterationInvariantRate | benchmark::Counter::kInvert);
}
BENCHMARK(BM_TuneAllPresetsOneCore)->Unit(benchmark::kMillisecond)->UseRealTime();

// The strategy loop alone: what each extra strategy (or sensor trial) costs.
void BM_StrategiesOnPreparedYear(benchmark::State& state) {
  const UnitFile unit = parse_unit_file(kUnit, "bench.toml");
  const Schedule schedule;  // always occupied: 8760 fan-on hours
  const auto strategies = strategies_or_presets(unit);
  const auto w = weather::read_text(weather_text(), "greensboro", weather::Mapping{},
                                    unit.site.design_pressure_kpa());
  const auto iv = outdoor_intervals(w);
  const auto p = annual::prepare(unit.air_handler, unit.return_air, iv, schedule, {});
  for (auto _ : state) {
    for (const auto& s : strategies) {
      auto r = annual::run(s, p);
      benchmark::DoNotOptimize(r);
    }
  }
  state.counters["ns_per_hour_strategy"] = benchmark::Counter(
      static_cast<double>(p.intervals.size() * strategies.size()),
      benchmark::Counter::kIsIterationInvariantRate | benchmark::Counter::kInvert);
}
BENCHMARK(BM_StrategiesOnPreparedYear)->Unit(benchmark::kMicrosecond);

// evaluate() alone on a prepared year: the three references and all presets in its one pass
// over the intervals, what a batch site costs after prepare (issue 18).
void BM_EvaluatePreparedYear(benchmark::State& state) {
  const UnitFile unit = parse_unit_file(kUnit, "bench.toml");
  const Schedule schedule;  // always occupied: 8760 fan-on hours
  const auto strategies = strategies_or_presets(unit);
  const auto w = weather::read_text(weather_text(), "greensboro", weather::Mapping{},
                                    unit.site.design_pressure_kpa());
  const auto p =
      annual::prepare(unit.air_handler, unit.return_air, outdoor_intervals(w), schedule, {});
  for (auto _ : state) {
    auto y = annual::evaluate(strategies, p);
    benchmark::DoNotOptimize(y);
  }
  state.counters["ns_per_hour_result"] = benchmark::Counter(
      static_cast<double>(p.intervals.size() * (strategies.size() + 3)),
      benchmark::Counter::kIsIterationInvariantRate | benchmark::Counter::kInvert);
}
BENCHMARK(BM_EvaluatePreparedYear)->Unit(benchmark::kMicrosecond);

// prepare() alone on the same always-occupied year: per hour the damper rule, the optimal
// damper and the dew points every strategy reads.
void BM_PrepareYear(benchmark::State& state) {
  const UnitFile unit = parse_unit_file(kUnit, "bench.toml");
  const Schedule schedule;
  const auto w = weather::read_text(weather_text(), "greensboro", weather::Mapping{},
                                    unit.site.design_pressure_kpa());
  const auto iv = outdoor_intervals(w);
  for (auto _ : state) {
    auto p = annual::prepare(unit.air_handler, unit.return_air, iv, schedule, {});
    benchmark::DoNotOptimize(p);
  }
}
BENCHMARK(BM_PrepareYear)->Unit(benchmark::kMicrosecond);

}  // namespace
