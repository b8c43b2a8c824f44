// Speed of the trend audit: an invented log from the model (tests/support/trend_example.hpp,
// the example unit examples/audit-office.toml, the example's three faults) read and audited.
//
//   cmake --build build -j2 --target bench_audit && build/tests/bench/bench_audit
//
// Memory is measured by hand, not here: the same program writes a large log, and
// /usr/bin/time -v reports the peak resident size of `limitline audit` on it (DEVELOPERS.md,
// "Memory of the audit"):
//
//   build/tests/bench/bench_audit --write-log /tmp/trend-100mb.csv 18000
//   /usr/bin/time -v build/limitline audit examples/audit-office.toml /tmp/trend-100mb.csv
#include <limitline/analysis/audit.hpp>
#include <limitline/io/trend.hpp>
#include <limitline/io/unit_file.hpp>

#include "../support/trend_example.hpp"

#include <benchmark/benchmark.h>

#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <string>
#include <string_view>

namespace {

using namespace limitline;

// The example unit, beside tests/data in the source tree.
const std::string kUnitPath =
    std::string(LIMITLINE_TEST_DATA_DIR) + "/../../examples/audit-office.toml";

struct Setup {
  UnitFile unit = load_unit_file(kUnitPath);
  std::string csv;
  explicit Setup(int days) { csv = test::generate_trend(unit, test::example_faults(), days).csv; }
};

const Setup& setup() {
  static const Setup s(365);  // a year of 15-minute samples, about 2 MB
  return s;
}

void BM_ReadTrendYear(benchmark::State& state) {
  const auto& s = setup();
  for (auto _ : state) {
    auto log = trend::parse_trend(s.csv, "bench.csv", {});
    benchmark::DoNotOptimize(log.time_s.data());
  }
  state.SetBytesProcessed(static_cast<std::int64_t>(state.iterations() * s.csv.size()));
}

void BM_AuditTrendYear(benchmark::State& state) {
  const auto& s = setup();
  const auto log = trend::parse_trend(s.csv, "bench.csv", {});
  const audit::Options opt{s.unit.strategies.front(), {}, {}, audit::kSupplyToleranceK};
  for (auto _ : state) {
    auto r = audit::run(s.unit, log, opt);
    benchmark::DoNotOptimize(r.findings.data());
  }
  state.counters["samples"] = static_cast<double>(log.size());
}

BENCHMARK(BM_ReadTrendYear)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_AuditTrendYear)->Unit(benchmark::kMillisecond);

// --write-log PATH DAYS: the generated log of DAYS days (about 5.6 kB a day) written to PATH.
int write_log(const char* path, const char* days_text) {
  const int days = std::atoi(days_text);
  if (days < 2) {
    std::fprintf(stderr, "bench_audit: --write-log PATH DAYS needs DAYS of 2 or more\n");
    return 1;
  }
  const Setup s(days);
  std::ofstream out(path, std::ios::binary);
  out << s.csv;
  if (!out.flush()) {
    std::fprintf(stderr, "bench_audit: cannot write %s\n", path);
    return 2;
  }
  std::printf("%s: %zu bytes, %d days\n", path, s.csv.size(), days);
  return 0;
}

}  // namespace

int main(int argc, char** argv) {
  if (argc == 4 && std::string_view(argv[1]) == "--write-log") return write_log(argv[2], argv[3]);
  benchmark::Initialize(&argc, argv);
  if (benchmark::ReportUnrecognizedArguments(argc, argv)) return 1;
  benchmark::RunSpecifiedBenchmarks();
  benchmark::Shutdown();
  return 0;
}
