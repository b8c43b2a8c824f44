// One site-year: all presets and the three references (issue target ≤ 5 ms with the CSV parse,
// ≤ 2 ms without). Weather: the real Greensboro TMY3 year in tests/data (NREL NSRDB, via pvlib).
#include <limitline/io/schedule_file.hpp>
#include <limitline/analysis/annual.hpp>
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

}  // namespace
