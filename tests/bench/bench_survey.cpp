// Survey throughput: site-years evaluated per second, every preset and the three references,
// with the weather parse, on all cores, as `limitline survey` runs them.
//
//   cmake --build build -j2 --target bench_survey && build/tests/bench/bench_survey
//
// Goal (issue 18): 1,000 site-years in 1.2 s on 2 cores as a whole process, i.e. about
// 2.4 core-ms per site-year all in. The manifest repeats the two open data sets of
// tests/data (sources in tests/data/SOURCES.md) under five climate zones; every row is read
// and parsed anew, as distinct files would be. The whole-process figure is measured with the
// command in the README ("Performance").
#include <benchmark/benchmark.h>

#include <limitline/app/survey.hpp>

#include <malloc.h>

#include <cstdint>
#include <filesystem>
#include <fstream>
#include <string>

namespace sv = limitline::survey;

namespace {

// As the command does (src/cli/common.cpp, prepare_process): megabyte vectors stay in the
// heap instead of faulting in fresh pages for every site.
const bool kHeapTuned = [] {
  mallopt(M_MMAP_THRESHOLD, 32 << 20);
  mallopt(M_TRIM_THRESHOLD, 64 << 20);
  return true;
}();

std::string manifest(std::size_t rows) {
  const auto path = std::filesystem::temp_directory_path() /
                    ("limitline-bench-survey-" + std::to_string(rows) + ".csv");
  std::ofstream out(path);
  out << "site,weather,elevation,energy_code,climate_zone\n";
  const std::string dir = LIMITLINE_TEST_DATA_DIR;
  const char* zones[] = {"2A", "3A", "4A", "5A", "6A"};
  for (std::size_t i = 0; i < rows; ++i)
    out << "site " << i << "," << dir
        << (i % 2 ? "/pvgis-tmy-45n-8e.csv" : "/greensboro-nc-tmy3.csv") << ",250m,"
        << "ashrae-90.1-2019," << zones[i % 5] << "\n";
  return path.string();
}

std::string unit() {
  const auto path = std::filesystem::temp_directory_path() / "limitline-bench-survey-unit.toml";
  std::ofstream(path) << R"(units = "ip"
[air_handler]
supply_airflow = "12000cfm"
supply_air_temp = "55F"
fan_heat = "1.5F"
min_outdoor_air = "20%"
return_air_temp = "75F"
return_air_rh = "50%"
[schedule]
mon-fri = "07:00-19:00"
)";
  return path.string();
}

// Every site of a 100-row manifest on `threads` threads (0: all cores).
void BM_SurveySiteYears(benchmark::State& state) {
  const std::string m = manifest(100), u = unit();
  sv::SurveyOptions o;
  o.threads = static_cast<unsigned>(state.range(0));
  const sv::Survey s(sv::read_manifest(m, limitline::units::System::ip), u, {}, o);
  std::size_t sites = 0, failed = 0;
  for (auto _ : state) {
    (void)s.run({1, 1}, [&](const sv::SiteRecord& r) {
      ++sites;
      failed += r.ok ? 0 : 1;
    });
  }
  if (failed) state.SkipWithError("a site failed");
  state.SetItemsProcessed(static_cast<std::int64_t>(sites));  // items: site-years
}

// One site, parse included, on the calling thread: the per-site cost the survey spreads.
void BM_SurveyOneSite(benchmark::State& state) {
  const std::string m = manifest(2), u = unit();
  sv::SurveyOptions o;
  o.threads = 1;
  const sv::Survey s(sv::read_manifest(m, limitline::units::System::ip), u, {}, o);
  const sv::ManifestRow& row = s.manifest().rows[static_cast<std::size_t>(state.range(0))];
  for (auto _ : state) {
    sv::SiteRecord r = s.evaluate(row);
    if (!r.ok) state.SkipWithError(r.error.c_str());
    benchmark::DoNotOptimize(r.strategies.data());
  }
}

}  // namespace

BENCHMARK(BM_SurveySiteYears)->Arg(1)->Arg(0)->Unit(benchmark::kMillisecond)->UseRealTime();
BENCHMARK(BM_SurveyOneSite)->Arg(0)->Arg(1)->Unit(benchmark::kMillisecond);
