// Speed of the weather import: one year of hourly data parsed from memory.
//
//   cmake --build build -j2 --target bench_weather && build/tests/bench/bench_weather
//
// Target (issue 4): a site-year evaluation within 5 ms including the CSV parse, so the parse
// of an 8760-row file should take well under that. The files are the open data sets of
// tests/data (sources in tests/data/SOURCES.md), read into memory once; each iteration runs
// the whole import (header search, columns, units, time checks, psychrometrics per row).
#include <benchmark/benchmark.h>

#include <limitline/io/weather.hpp>

#include <fstream>
#include <sstream>
#include <stdexcept>
#include <string>

namespace wx = limitline::weather;

namespace {

std::string slurp(const std::string& name) {
  const std::string path = std::string(LIMITLINE_TEST_DATA_DIR) + "/" + name;
  std::ifstream in(path, std::ios::binary);
  if (!in) throw std::runtime_error("bench_weather: cannot open " + path);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

void parse_year(benchmark::State& state, const char* name) {
  const std::string text = slurp(name);
  const wx::Mapping mapping;
  std::size_t rows = 0;
  for (auto _ : state) {
    wx::WeatherSeries s = wx::read_text(text, name, mapping, 101.325);
    rows = s.hours.size();
    benchmark::DoNotOptimize(s.hours.data());
  }
  if (rows != 8760) state.SkipWithError("expected 8760 rows");
  state.counters["rows"] = static_cast<double>(rows);
  state.SetBytesProcessed(static_cast<std::int64_t>(state.iterations() * text.size()));
}

// Dew point, pressure in mbar, hour-ending stamps.
void BM_ParseGreensboroTmy3(benchmark::State& state) {
  parse_year(state, "greensboro-nc-tmy3.csv");
}
// RH (saturation pressure per row), pressure in Pa, legend lines, ten columns.
void BM_ParsePvgisTmy(benchmark::State& state) { parse_year(state, "pvgis-tmy-45n-8e.csv"); }

}  // namespace

BENCHMARK(BM_ParseGreensboroTmy3)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_ParsePvgisTmy)->Unit(benchmark::kMillisecond);
