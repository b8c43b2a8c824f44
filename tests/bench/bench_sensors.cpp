// The sensor study: 1,000 trials × 8760 hours × the 7 presets (issue target ≤ 2 s wall on 2
// cores, about 30 ns per hour-strategy-trial). Weather: the real Greensboro TMY3 year in
// tests/data (NREL NSRDB, via pvlib), always occupied so every hour of the year is fan-on.
#include <limitline/analysis/annual.hpp>
#include <limitline/analysis/sensors.hpp>
#include <limitline/io/unit_file.hpp>
#include <limitline/io/weather.hpp>
#include <limitline/app/year_job.hpp>

#include "../support/office.hpp"

#include <benchmark/benchmark.h>

#include <thread>

namespace {

using namespace limitline;

const std::string kUnit = test::kOfficeUnit;

struct Setup {
  UnitFile unit = parse_unit_file(kUnit, "bench.toml");
  std::vector<highlimit::Strategy> strategies =
      highlimit::all_presets(highlimit::preset_defaults());
  annual::Prepared prepared;
  Setup() {
    const auto w = weather::read_file(test::greensboro_path(), weather::Mapping{},
                                      unit.site.design_pressure_kpa());
    prepared =
        annual::prepare(unit.air_handler, unit.return_air, outdoor_intervals(w), Schedule{}, {});
  }
};

const Setup& setup() {
  static const Setup s;
  return s;
}

void counters(benchmark::State& state, const sensors::Engine& e, std::size_t trials) {
  state.counters["ns_per_hour_strategy_trial"] = benchmark::Counter(
      static_cast<double>(e.intervals() * e.strategies().size() * trials),
      benchmark::Counter::kIsIterationInvariantRate | benchmark::Counter::kInvert);
}

// The whole study on every core, as `limitline sensors` runs it: wall time is the figure.
void BM_Study1000Trials(benchmark::State& state) {
  const Setup& s = setup();
  const sensors::Engine engine(s.prepared, s.strategies, sensors::HumidityKind::relative_humidity);
  const sensors::SensorSet set = sensors::typical_sensors();
  sensors::StudyOptions opt;
  opt.trials = 1000;
  sensors::RunControl control;
  control.threads = static_cast<unsigned>(state.range(0));
  for (auto _ : state) {
    auto r = sensors::run_study(engine, set, opt, control);
    benchmark::DoNotOptimize(r);
  }
  counters(state, engine, opt.trials);
  state.counters["threads"] =
      static_cast<double>(control.threads ? control.threads : std::thread::hardware_concurrency());
}
BENCHMARK(BM_Study1000Trials)->Arg(0)->Arg(1)->Unit(benchmark::kMillisecond)->UseRealTime();

// One trial on one thread, with each humidity-sensor kind (dew points are needed by the
// dew-point preset, so every kind pays for them here).
void BM_OneTrial(benchmark::State& state) {
  const Setup& s = setup();
  const auto kind = static_cast<sensors::HumidityKind>(state.range(0));
  const sensors::Engine engine(s.prepared, s.strategies, kind);
  const sensors::SensorSet set = sensors::typical_sensors(kind);
  auto ws = engine.workspace();
  std::vector<sensors::TrialOutcome> out(engine.strategies().size());
  sensors::Clamps clamps;
  std::uint64_t trial = 0;
  for (auto _ : state) {
    engine.run(sensors::draw_biases(set, 1, trial++), ws, out, clamps);
    benchmark::DoNotOptimize(out.data());
  }
  counters(state, engine, 1);
}
BENCHMARK(BM_OneTrial)->DenseRange(0, 2)->Unit(benchmark::kMicrosecond);

// The break-even search on its default trials: every pair of a humidity strategy and a
// dry-bulb-only strategy among the presets.
void BM_BreakEven(benchmark::State& state) {
  const Setup& s = setup();
  const sensors::Engine engine(s.prepared, s.strategies, sensors::HumidityKind::relative_humidity);
  const sensors::SensorSet set = sensors::typical_sensors();
  for (auto _ : state) {
    auto r = sensors::break_even(engine, set, {});
    benchmark::DoNotOptimize(r);
  }
}
BENCHMARK(BM_BreakEven)->Unit(benchmark::kMillisecond)->UseRealTime();

}  // namespace
