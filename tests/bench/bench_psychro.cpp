// Speed of the psychrometric core and of `state --batch` streaming.
//
//   cmake --build build -j2 --target bench_psychro && build/tests/bench/bench_psychro
//
// Targets (issue 2): humidity ratio + enthalpy from (dry-bulb, RH) ≤ 30 ns; dew point from
// humidity ratio ≤ 40 ns within 1e-4 K of the exact inverse; wet-bulb from humidity ratio
// ≤ 150 ns within 1e-3 K. The inputs cycle through a table of varied states so neither the
// branch predictor nor the compiler sees one repeated value. Each solver benchmark first
// checks its accuracy on every state of the table and stops with an error when it misses.
#include <benchmark/benchmark.h>

#include <limitline/model/psychro.hpp>
#include <limitline/app/state_batch.hpp>

#include <fmt/format.h>

#include <cmath>
#include <cstdint>
#include <sstream>
#include <string>
#include <vector>

namespace psy = limitline::psychro;

namespace {

struct State {
  double t, rh, p, w;
};

// The cross-check's box: −40…50 °C, 1–100 % RH, 60–110 kPa; fixed seed (xorshift32).
std::vector<State> make_states() {
  std::uint32_t x = 0x9e3779b9u;
  auto next = [&x] {
    x ^= x << 13;
    x ^= x >> 17;
    x ^= x << 5;
    return x / 4294967296.0;
  };
  std::vector<State> s(4096);
  for (State& st : s) {
    st.t = -40.0 + 90.0 * next();
    st.rh = 0.01 + 0.99 * next();
    st.p = 60.0 + 50.0 * next();
    st.w = psy::humidity_ratio_from_relative_humidity(st.t, st.rh, st.p);
  }
  return s;
}

const std::vector<State>& states() {
  static const std::vector<State> s = make_states();
  return s;
}

void BM_SaturationPressure(benchmark::State& state) {
  const auto& s = states();
  std::size_t i = 0;
  for (auto _ : state) {
    benchmark::DoNotOptimize(psy::saturation_pressure_kpa(s[i].t));
    i = (i + 1) & (s.size() - 1);
  }
}
BENCHMARK(BM_SaturationPressure);

void BM_HumidityRatioAndEnthalpyFromRh(benchmark::State& state) {
  const auto& s = states();
  std::size_t i = 0;
  for (auto _ : state) {
    const double w = psy::humidity_ratio_from_relative_humidity(s[i].t, s[i].rh, s[i].p);
    const double h = psy::enthalpy_kj_per_kg(s[i].t, w);
    benchmark::DoNotOptimize(w);
    benchmark::DoNotOptimize(h);
    i = (i + 1) & (s.size() - 1);
  }
}
BENCHMARK(BM_HumidityRatioAndEnthalpyFromRh);

// Largest distance, in kelvin, from the solver's answer to a root of `residual` (which
// changes sign at every exact answer): grows the bracket [x − d, x + d] until it holds one.
template <class Residual>
double distance_to_root(double x, Residual residual) {
  for (double d = 1e-9; d < 1.0; d *= 1.25) {
    const double a = residual(x - d), b = residual(x + d);
    if ((a <= 0.0 && b >= 0.0) || (a >= 0.0 && b <= 0.0)) return d;
  }
  return 1.0;
}

void BM_DewPointFromHumidityRatio(benchmark::State& state) {
  const auto& s = states();
  double worst = 0.0;
  for (const State& st : s) {
    const double pw = psy::vapor_pressure_from_humidity_ratio(st.w, st.p);
    const double td = psy::dew_point_from_humidity_ratio_c(st.w, st.p);
    worst = std::max(worst, distance_to_root(td, [&](double x) {
                       return psy::saturation_pressure_kpa(x) - pw;
                     }));
  }
  state.counters["max_error_K"] = worst;
  if (worst > 1e-4) {
    state.SkipWithError(fmt::format("dew point {:.3g} K from the exact inverse", worst).c_str());
    return;
  }
  std::size_t i = 0;
  for (auto _ : state) {
    benchmark::DoNotOptimize(psy::dew_point_from_humidity_ratio_c(s[i].w, s[i].p));
    i = (i + 1) & (s.size() - 1);
  }
}
BENCHMARK(BM_DewPointFromHumidityRatio);

void BM_WetBulbFromHumidityRatio(benchmark::State& state) {
  const auto& s = states();
  double worst = 0.0;
  for (const State& st : s) {
    const double tw = psy::wet_bulb_from_humidity_ratio_c(st.t, st.w, st.p);
    // Eq. 33/35 jump at t* = 0 °C; keep the bracket on the answer's side of it.
    worst =
        std::max(worst, distance_to_root(tw, [&](double x) {
                   if ((x < 0.0) != (tw < 0.0)) x = tw < 0.0 ? -1e-12 : 0.0;
                   return psy::humidity_ratio_from_wet_bulb(st.t, std::min(x, st.t), st.p) - st.w;
                 }));
  }
  state.counters["max_error_K"] = worst;
  if (worst > 1e-3) {
    state.SkipWithError(fmt::format("wet-bulb {:.3g} K from the exact root", worst).c_str());
    return;
  }
  std::size_t i = 0;
  for (auto _ : state) {
    benchmark::DoNotOptimize(psy::wet_bulb_from_humidity_ratio_c(s[i].t, s[i].w, s[i].p));
    i = (i + 1) & (s.size() - 1);
  }
}
BENCHMARK(BM_WetBulbFromHumidityRatio);

void BM_Properties(benchmark::State& state) {
  const auto& s = states();
  std::size_t i = 0;
  for (auto _ : state) {
    benchmark::DoNotOptimize(psy::properties({s[i].t, s[i].w, s[i].p}));
    i = (i + 1) & (s.size() - 1);
  }
}
BENCHMARK(BM_Properties);

// `state --batch` without the terminal: CSV text in, CSV text out, per row.
void BM_StateBatchRows(benchmark::State& state) {
  const auto& s = states();
  std::string csv = "dry_bulb,rh,pressure\n";
  for (const State& st : s)
    csv += fmt::format("{:.2f}C,{:.1f}%,{:.3f}kPa\n", st.t, st.rh * 100.0, st.p);
  const limitline::StateBatchOptions options{limitline::units::System::si, 101.325, "bench"};
  std::size_t rows = 0;
  for (auto _ : state) {
    std::istringstream in(csv);
    std::ostringstream out;
    rows += limitline::write_state_batch(in, out, options);
    benchmark::DoNotOptimize(out.str().size());
  }
  state.SetItemsProcessed(static_cast<std::int64_t>(rows));
  // Seconds per row (shown with an SI prefix).
  state.counters["time_per_row"] = benchmark::Counter(
      static_cast<double>(rows), benchmark::Counter::kIsRate | benchmark::Counter::kInvert);
}
BENCHMARK(BM_StateBatchRows)->Unit(benchmark::kMillisecond);

}  // namespace
