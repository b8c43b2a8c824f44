// The trend audit: measured-fraction uncertainty, a clean model-generated log, each injected
// fault alone, the committed example, and the audit command.
#include <limitline/analysis/audit.hpp>
#include <limitline/io/trend.hpp>
#include <limitline/io/unit_file.hpp>
#include <limitline/error.hpp>
#include <limitline/report/audit.hpp>

#include "support/cli.hpp"
#include "support/trend_example.hpp"

#include <doctest/doctest.h>

#include <algorithm>
#include <cmath>
#include <cstdlib>
#include <fstream>
#include <map>
#include <set>

using namespace limitline;
using limitline::test::contains;
using limitline::test::run_cli;

namespace {

const std::string kSource = LIMITLINE_SOURCE_DIR;

UnitFile example_unit() { return load_unit_file(kSource + "/examples/audit-office.toml"); }

// Independent propagation: x(t_o, t_r, t_m) differentiated numerically (central differences),
// then σ_x² = Σ (∂x/∂t_i · σ_i)² (first-order propagation of independent uncertainties, the
// GUM's law of propagation, JCGM 100:2008 eq. 10).
double numeric_sigma(double to, double tr, double tm, double so, double sr, double sm) {
  auto x = [](double o, double r, double m) { return (m - r) / (o - r); };
  const double h = 1e-5;
  const double dxo = (x(to + h, tr, tm) - x(to - h, tr, tm)) / (2 * h);
  const double dxr = (x(to, tr + h, tm) - x(to, tr - h, tm)) / (2 * h);
  const double dxm = (x(to, tr, tm + h) - x(to, tr, tm - h)) / (2 * h);
  return std::sqrt(dxo * dxo * so * so + dxr * dxr * sr * sr + dxm * dxm * sm * sm);
}

// Weights as the audit must give them: time to the next sample, capped at twice the median
// interval; the last sample counts for the median interval.
std::vector<double> weights_h(const std::vector<test::GeneratedRow>& rows) {
  std::vector<double> dt;
  for (std::size_t i = 1; i < rows.size(); ++i)
    dt.push_back(static_cast<double>(rows[i].time_s - rows[i - 1].time_s));
  std::vector<double> s = dt;
  std::sort(s.begin(), s.end());
  const double med = s[s.size() / 2];
  std::vector<double> w;
  for (std::size_t i = 0; i < rows.size(); ++i)
    w.push_back(std::min(i + 1 < rows.size() ? dt[i] : med, 2 * med) / 3600.0);
  return w;
}

// Hours of the generator's rows that a rule flags: Σ weights where `pred(row)`.
template <class Pred>
double expected_hours(const test::Generated& g, Pred pred) {
  const auto w = weights_h(g.rows);
  double h = 0;
  for (std::size_t i = 0; i < g.rows.size(); ++i)
    if (pred(g.rows[i])) h += w[i];
  return h;
}

// Expected hours of a measured-fraction rule, computed here from the generator's rows with the
// numeric propagation above: fan-on rows in the fault window that pass the gate and that
// `flag(x_measured, σ, row)` picks.
template <class Flag>
double expected_measured_hours(const test::Generated& g, Flag flag, double sensor_k = 0.5) {
  return expected_hours(g, [&](const test::GeneratedRow& r) {
    if (!r.fan || !r.in_fault ||
        std::abs(r.t_out_log - r.t_ret_log) < 4 * std::sqrt(3.0) * sensor_k)
      return false;
    const double x = (r.t_mix_log - r.t_ret_log) / (r.t_out_log - r.t_ret_log);
    return flag(
        x, numeric_sigma(r.t_out_log, r.t_ret_log, r.t_mix_log, sensor_k, sensor_k, sensor_k), r);
  });
}

struct Audited {
  test::Generated gen;
  trend::TrendLog log;
  audit::Result result;
};

// The generated log without its last column, the cooling status.
std::string without_cooling(const std::string& csv) {
  std::string out;
  std::size_t at = 0;
  while (at < csv.size()) {
    std::size_t end = csv.find('\n', at);
    std::string line = csv.substr(at, end - at);
    if (line.find(',') != std::string::npos) line = line.substr(0, line.rfind(','));
    out += line + "\n";
    at = end + 1;
  }
  return out;
}

Audited audit_generated(const std::vector<test::Fault>& faults, int days = 21,
                        audit::Accuracy acc = {}, bool cooling_column = true,
                        double cooler_k = 0.0) {
  const UnitFile unit = example_unit();
  Audited a{test::generate_trend(unit, faults, days, 20260504, cooler_k), {}, {}};
  a.log = trend::parse_trend(cooling_column ? a.gen.csv : without_cooling(a.gen.csv),
                             "generated.csv", {});
  REQUIRE(a.log.size() == a.gen.rows.size());
  audit::Options opt{unit.strategies.front(), acc, {}, audit::kSupplyToleranceK};
  a.result = audit::run(unit, a.log, opt);
  return a;
}

std::set<audit::FindingKind> kinds(const audit::Result& r) {
  std::set<audit::FindingKind> k;
  for (const auto& f : r.findings) k.insert(f.kind);
  return k;
}

std::string describe(const audit::Result& r) {
  std::string s;
  for (const auto& f : r.findings)
    s += fmt::format("{} {:.2f} h from {} ;", audit::finding_key(f.kind), f.hours,
                     trend::format_timestamp(f.first_s));
  return s;
}

const double kInterval_h = 0.25;

}  // namespace

TEST_CASE("measured outdoor-air fraction: value and first-order uncertainty") {
  const audit::Accuracy acc{0.5, 0.3, 0.4};
  struct Case {
    double to, tr, tm;
  };
  for (const Case c : {Case{5.0, 23.0, 19.4}, Case{30.0, 22.0, 25.0}, Case{12.0, 24.0, 12.5},
                       Case{-10.0, 21.0, 14.8}}) {
    const auto m = audit::measured_fraction(c.to, c.tr, c.tm, acc);
    REQUIRE(m);
    CHECK(m->fraction == doctest::Approx((c.tm - c.tr) / (c.to - c.tr)).epsilon(1e-12));
    CHECK(m->sigma ==
          doctest::Approx(numeric_sigma(c.to, c.tr, c.tm, 0.5, 0.3, 0.4)).epsilon(1e-6));
  }
  // Gate: 4 × √(0.5² + 0.3² + 0.4²) = 2.83 K.
  CHECK_FALSE(audit::measured_fraction(21.0, 23.5, 22.0, acc));
  CHECK(audit::measured_fraction(20.0, 23.0, 22.0, acc));
}

TEST_CASE("a clean log generated from the model has no findings") {
  const auto a = audit_generated({});
  INFO(describe(a.result));
  CHECK(a.result.findings.empty());
  CHECK(a.result.operating_intervals > 500);
  CHECK(a.result.fraction_intervals > 100);
  // The switching point is seen and agrees with the configured 70 °F, 2 °F deadband.
  REQUIRE(a.result.switch_points.size() == 1);
  const auto& sp = a.result.switch_points.front();
  CHECK_FALSE(sp.differs);
  CHECK(sp.estimate <= units::celsius_from_fahrenheit(70.0) + sp.tolerance);
  CHECK(sp.estimate >= units::celsius_from_fahrenheit(68.0) - sp.tolerance);
  CHECK(sp.tolerance == doctest::Approx(1.5));  // 3 × the outdoor sensor's 0.5 K
  // Coverage: the eighth day's five-hour outage is a gap.
  CHECK(a.log.coverage.gaps.size() >= 1);
  CHECK(a.log.coverage.covered_s < a.log.coverage.span_s);
}

TEST_CASE("stuck damper: found with its hours, nothing else") {
  const auto faults = std::vector<test::Fault>{test::example_faults()[0]};
  const auto a = audit_generated(faults);
  INFO(describe(a.result));
  CHECK(kinds(a.result) == std::set{audit::FindingKind::damper_not_following});
  const auto* f = a.result.find(audit::FindingKind::damper_not_following);
  REQUIRE(f);
  // Expected: fan-on samples in the window where the temperatures allow a measurement and the
  // commanded fraction is beyond 3σ + 0.15 of the real (minimum) one.
  const double expected =
      expected_measured_hours(a.gen, [](double x, double sig, const test::GeneratedRow& r) {
        return std::abs(x - r.x_command) > 3 * sig + 0.15;
      });
  CHECK(expected_hours(a.gen, [](const test::GeneratedRow& r) {
          return r.fan && r.in_fault && r.x_true != 0.2;
        }) == 0);
  CHECK(expected > 2.0);
  CHECK(std::abs(f->hours - expected) <= kInterval_h + 1e-9);
  CHECK(f->first_s >= faults[0].from_s);
  CHECK(f->last_s < faults[0].to_s);
  REQUIRE(f->energy_kwh);
  CHECK(*f->energy_kwh > 0);  // the economizer's free cooling lost
}

TEST_CASE("high-limit set 5 °F too high: economizing when disabled, and the switch point") {
  const auto faults = std::vector<test::Fault>{test::example_faults()[1]};
  const auto a = audit_generated(faults);
  INFO(describe(a.result));
  CHECK(kinds(a.result) == std::set{audit::FindingKind::economizing_when_disabled,
                                    audit::FindingKind::high_limit_elsewhere});
  // Counted only where the outdoor reading is clear of the 70 °F limit by 3 × 0.5 K: nearer,
  // the decision is in doubt (a sample at the limit is no finding).
  const double expected = expected_hours(a.gen, [](const test::GeneratedRow& r) {
    return r.fan && !r.configured_enabled && r.x_command > 0.2 + audit::kDamperMarginFraction &&
           r.t_out_log > units::celsius_from_fahrenheit(70.0) + 1.5;
  });
  const auto* f = a.result.find(audit::FindingKind::economizing_when_disabled);
  REQUIRE(f);
  CHECK(expected > 2.0);
  CHECK(std::abs(f->hours - expected) <= kInterval_h + 1e-9);
  CHECK(f->first_s >= faults[0].from_s);
  CHECK(f->last_s < faults[0].to_s);
  REQUIRE(a.result.switch_points.size() == 1);
  const auto& sp = a.result.switch_points.front();
  CHECK(sp.differs);
  // Economizing is seen above the configured 70 °F, up to near the raised 75 °F.
  CHECK(sp.highest_open > units::celsius_from_fahrenheit(70.0) + sp.tolerance);
  CHECK(sp.highest_open <= units::celsius_from_fahrenheit(75.0) + 0.01);
}

TEST_CASE("outdoor sensor reading 3 K high: mixed air out of range at full outdoor air only") {
  const auto faults = std::vector<test::Fault>{test::example_faults()[2]};
  const auto a = audit_generated(faults);
  INFO(describe(a.result));
  CHECK(kinds(a.result) == std::set{audit::FindingKind::mixed_air_out_of_range});
  const auto* f = a.result.find(audit::FindingKind::mixed_air_out_of_range);
  REQUIRE(f);
  // At full outdoor air the mixed air is the real outdoor air, 3 K below the reading: always
  // beyond 3 × √(0.5² + 0.5²) = 2.1 K. Modulating samples near full outdoor air can add some.
  const double full = expected_hours(
      a.gen, [](const test::GeneratedRow& r) { return r.fan && r.in_fault && r.x_true > 0.999; });
  const double near_full = expected_hours(
      a.gen, [](const test::GeneratedRow& r) { return r.fan && r.in_fault && r.x_true > 0.6; });
  CHECK(full > 2.0);
  CHECK(f->hours >= full - kInterval_h - 1e-9);
  CHECK(f->hours <= near_full + kInterval_h + 1e-9);
  CHECK(f->first_s >= faults[0].from_s);
  CHECK(f->last_s < faults[0].to_s);
  CHECK_FALSE(f->energy_kwh);  // the model cannot price a reading that is itself wrong
}

// The 70 °F limit's decision is clear where the reading lies farther than 3 × 0.5 K from both
// edges of its band, 70 °F and 68 °F (analysis/audit.hpp, the rule this test restates).
bool clear_of_band(double t_out_c) {
  return std::abs(t_out_c - units::celsius_from_fahrenheit(70.0)) > 1.5 &&
         std::abs(t_out_c - units::celsius_from_fahrenheit(68.0)) > 1.5;
}

std::vector<test::Fault> week_fault(test::FaultKind kind, double amount) {
  const std::int64_t start = trend::parse_timestamp("2026-05-04 00:00", "t");
  return {{kind, start + 7 * 86400, start + 12 * 86400, amount}};
}

TEST_CASE("damper stuck at 60 %: excess outdoor air at minimum command, and not following") {
  const auto faults = week_fault(test::FaultKind::damper_stuck_at, 0.6);
  const auto a = audit_generated(faults);
  INFO(describe(a.result));
  CHECK(kinds(a.result) ==
        std::set{audit::FindingKind::damper_not_following, audit::FindingKind::excess_outdoor_air});
  const double excess =
      expected_measured_hours(a.gen, [](double x, double sig, const test::GeneratedRow& r) {
        return r.x_command <= 0.2 + 0.05 && x > 0.2 + 3 * sig + 0.05;
      });
  const auto* f = a.result.find(audit::FindingKind::excess_outdoor_air);
  REQUIRE(f);
  CHECK(excess > 2.0);
  CHECK(std::abs(f->hours - excess) <= kInterval_h + 1e-9);
  CHECK(f->first_s >= faults[0].from_s);
  CHECK(f->last_s < faults[0].to_s);
}

TEST_CASE("damper closing fully at its minimum command: outdoor air below the minimum") {
  // The damper sits at its minimum only in the warm hours, when outdoor and return are a few
  // kelvin apart: sensors of ±0.1 K resolve the fraction there.
  const auto faults = week_fault(test::FaultKind::minimum_set_to, 0.0);
  const auto a = audit_generated(faults, 21, {0.1, 0.1, 0.1});
  INFO(describe(a.result));
  CHECK(kinds(a.result) == std::set{audit::FindingKind::below_minimum});
  const double below = expected_measured_hours(
      a.gen,
      [](double x, double sig, const test::GeneratedRow&) { return x < 0.2 - 3 * sig - 0.05; },
      0.1);
  const auto* f = a.result.find(audit::FindingKind::below_minimum);
  REQUIRE(f);
  CHECK(below > 2.0);
  CHECK(std::abs(f->hours - below) <= kInterval_h + 1e-9);
}

TEST_CASE(
    "economizer locked out, no cooling column: not economizing when enabled, switching point below "
    "the band") {
  const auto faults = week_fault(test::FaultKind::economizer_locked_out, 0.0);
  const auto a = audit_generated(faults, 21, {}, false);
  INFO(describe(a.result));
  CHECK(kinds(a.result) == std::set{audit::FindingKind::not_economizing_when_enabled,
                                    audit::FindingKind::high_limit_elsewhere});
  const double expected = expected_hours(a.gen, [](const test::GeneratedRow& r) {
    return r.fan && r.in_fault && r.configured_enabled && r.x_enabled > 0.2 + 0.10 &&
           clear_of_band(r.t_out_log);
  });
  const auto* f = a.result.find(audit::FindingKind::not_economizing_when_enabled);
  REQUIRE(f);
  CHECK(expected > 2.0);
  CHECK(std::abs(f->hours - expected) <= kInterval_h + 1e-9);
  REQUIRE(f->energy_kwh);
  CHECK(*f->energy_kwh > 0);  // free cooling lost
  REQUIRE(a.result.switch_points.size() == 1);
  CHECK(a.result.switch_points.front().differs);
  CHECK(a.result.switch_points.front().lowest_closed < units::celsius_from_fahrenheit(68.0) - 1.0);
}

TEST_CASE("the committed example log is the generator's output") {
  const UnitFile unit = example_unit();
  const auto g = test::generate_trend(unit, test::example_faults(), 21);
  const std::string path = kSource + "/examples/trend-office.csv";
  if (std::getenv("LIMITLINE_WRITE_EXAMPLES")) {
    std::ofstream(path, std::ios::binary) << g.csv;
  }
  CHECK(test::slurp(path) == g.csv);
  // All three faults are found in it.
  const auto log = trend::parse_trend(g.csv, "trend-office.csv", {});
  const auto r = audit::run(unit, log, {unit.strategies.front(), {}, {}, audit::kSupplyToleranceK});
  INFO(describe(r));
  CHECK(kinds(r) == std::set{audit::FindingKind::damper_not_following,
                             audit::FindingKind::economizing_when_disabled,
                             audit::FindingKind::high_limit_elsewhere,
                             audit::FindingKind::mixed_air_out_of_range});
}

TEST_CASE("audit command: text, markdown and JSON reports with coverage, mapping and cautions") {
  const auto t =
      run_cli({"audit", "examples/audit-office.toml", "examples/trend-office.csv"}, "audit");
  CHECK(t.rc == 0);
  CHECK(contains(t.out, "Measured outdoor air unlike the damper command"));
  CHECK(contains(t.out, "Damper opened past the minimum against the high-limit"));
  CHECK(contains(t.out, "consistent with the configured limit") !=
        contains(t.out, "differs from the configured limit"));
  CHECK(contains(t.out, "Columns used"));
  CHECK(contains(t.out, "OA Damper Cmd (%)"));
  CHECK(contains(t.out, "authority having jurisdiction"));
  CHECK(contains(t.out, "gap"));
  const auto md = run_cli({"audit", "examples/audit-office.toml", "examples/trend-office.csv",
                           "--format", "md", "--units", "si"},
                          "audit");
  CHECK(md.rc == 0);
  CHECK(contains(md.out, "## Findings"));
  CHECK(contains(md.out, "kWh"));
  const auto js = run_cli(
      {"audit", "examples/audit-office.toml", "examples/trend-office.csv", "--format", "json"},
      "audit");
  CHECK(js.rc == 0);
  CHECK(contains(js.out, "\"kind\": \"high-limit-elsewhere\""));
  CHECK(contains(js.out, "\"energy_kbtu\""));
  CHECK(contains(js.out, "\"configured_f\": 70"));
}

TEST_CASE("audit command: bad input and usage") {
  const auto none = run_cli({"audit", "examples/audit-office.toml"}, "audit");
  CHECK(none.rc == 1);
  const auto missing = run_cli({"audit", "examples/audit-office.toml", "no-such.csv"}, "audit");
  CHECK(missing.rc == 2);
  CHECK(contains(missing.err, "no-such.csv"));
  const auto strat = run_cli(
      {"audit", "examples/audit-office.toml", "examples/trend-office.csv", "--strategy", "nope"},
      "audit");
  CHECK(strat.rc == 2);
  CHECK(contains(strat.err, "dry-bulb 70F"));
  const auto col = run_cli({"audit", "examples/audit-office.toml", "examples/trend-office.csv",
                            "--column", "wind=Speed"},
                           "audit");
  CHECK(col.rc == 2);
  CHECK(contains(col.err, "outdoor-dry-bulb"));
  const auto acc = run_cli({"audit", "examples/audit-office.toml", "examples/trend-office.csv",
                            "--mixed-accuracy", "-1F"},
                           "audit");
  CHECK(acc.rc == 2);
  const auto zone = run_cli({"audit", "examples/audit-office.toml", "examples/trend-office.csv",
                             "--edition", "ashrae-90.1-2019"},
                            "audit");
  CHECK(zone.rc == 1);  // the example's site names no climate zone
}

TEST_CASE("audit command: the energy code's strategy with --edition and --zone") {
  const auto r =
      run_cli({"audit", "examples/audit-office.toml", "examples/trend-office.csv", "--edition",
               "ashrae-90.1-2019", "--zone", "4A", "--strategy", "fixed-dry-bulb"},
              "audit");
  CHECK(r.rc == 0);
  CHECK(contains(r.out, "ashrae-90.1-2019 zone 4A, fixed-dry-bulb"));
  const auto bad =
      run_cli({"audit", "examples/audit-office.toml", "examples/trend-office.csv", "--edition",
               "ashrae-90.1-2019", "--zone", "4A", "--strategy", "no-such-type"},
              "audit");
  CHECK(bad.rc == 2);
  CHECK(contains(bad.err, "allowed:"));
}

TEST_CASE("audit command: malformed logs give one-line errors naming file and line") {
  const auto dir = test::scratch_dir("audit-bad");
  auto write = [&](const std::string& name, const std::string& text) {
    std::ofstream(dir / name, std::ios::binary) << text;
    return (dir / name).string();
  };
  const std::string head = "Timestamp,OAT (°F),RAT (°F),MAT (°F),OA Damper Cmd (%),SF Status\n";
  const auto unsorted = write(
      "unsorted.csv", head + "2026-05-04 10:15,50,72,68,20,On\n2026-05-04 10:00,50,72,68,20,On\n");
  const auto r1 = run_cli({"audit", "examples/audit-office.toml", unsorted}, "audit");
  CHECK(r1.rc == 2);
  CHECK(contains(r1.err, "unsorted.csv:3: time 2026-05-04 10:00 is before"));
  const auto celsius = write(
      "celsius.csv", head + "2026-05-04 10:00,10,22,20,20,On\n2026-05-04 10:15,10,22,20,20,On\n");
  const auto r2 = run_cli({"audit", "examples/audit-office.toml", celsius}, "audit");
  CHECK(r2.rc == 2);
  CHECK(contains(r2.err, "is the column's unit right"));
  // The same file read with its real unit set by --column runs.
  const auto r3 = run_cli({"audit", "examples/audit-office.toml", celsius, "--column",
                           "outdoor-dry-bulb=OAT (°F):C", "--column", "return-dry-bulb=RAT (°F):C",
                           "--column", "mixed-air=MAT (°F):C", "--max-gap", "20"},
                          "audit");
  CHECK(r3.rc == 0);
  CHECK(contains(r3.out, "set by the user"));
  CHECK(contains(r3.out, "at most 20.0 min"));
  const auto r4 =
      run_cli({"audit", "examples/audit-office.toml", celsius, "--max-gap", "0"}, "audit");
  CHECK(r4.rc == 2);
  CHECK(contains(r4.err, "--max-gap"));
  const auto r5 = run_cli(
      {"audit", "examples/audit-office.toml", "examples/trend-office.csv", "--max-gap", "1e308"},
      "audit");
  CHECK(r5.rc == 2);
  CHECK(contains(r5.err, "--max-gap"));
}

TEST_CASE("audit command: a row with an extra field is refused, not read shifted into a finding") {
  // The example log with one cell doubled in row 100 (file line 103): read shifted, its
  // damper column would hold the fan's "On"/"Off" and the mixed air the return air's humidity.
  std::string text = test::slurp(kSource + "/examples/trend-office.csv");
  std::size_t at = 0;
  for (int line = 1; line < 103; ++line) at = text.find('\n', at) + 1;
  const std::size_t comma = text.find(',', at);
  text.insert(comma, ",55.0");
  const auto dir = test::scratch_dir("audit-extra");
  const auto path = (dir / "extra.csv").string();
  std::ofstream(path, std::ios::binary) << text;
  const auto r = run_cli({"audit", "examples/audit-office.toml", path}, "audit");
  CHECK(r.rc == 2);
  CHECK(contains(r.err, "extra.csv:103: the row has 11 fields but the header (line 3) has 10"));
  CHECK(r.out.empty());
}

// --- Findings from the cooling and supply-air columns ---------------------------------------

namespace {

// The example unit's mixed-air target, supply setpoint − fan heat: 55 °F − 1.5 °F.
const double kTargetC = units::celsius_from_fahrenheit(55.0 - 1.5);
const double kSupplyC = units::celsius_from_fahrenheit(55.0);
const double kFanHeatK = 1.5 / 1.8;
// A season 8 K cooler than the example's, so that outdoor air alone often meets the target.
const double kCoolerK = 8.0;

}  // namespace

TEST_CASE("cooling status stuck on: mechanical cooling while outdoor air alone would do, alone") {
  const auto faults = week_fault(test::FaultKind::cooling_stuck_on, 0.0);
  const auto a = audit_generated(faults, 21, {}, true, kCoolerK);
  INFO(describe(a.result));
  CHECK(kinds(a.result) == std::set{audit::FindingKind::cooling_with_free_air});
  // At the 100 % maximum the mix is the outdoor air: below the target by more than 3 × 0.5 K.
  const double expected = expected_hours(a.gen, [](const test::GeneratedRow& r) {
    return r.fan && r.in_fault && r.cooling && r.t_out_log < kTargetC - 1.5;
  });
  const auto* f = a.result.find(audit::FindingKind::cooling_with_free_air);
  REQUIRE(f);
  CHECK(expected > 2.0);
  CHECK(std::abs(f->hours - expected) <= kInterval_h + 1e-9);
  CHECK(f->first_s >= faults[0].from_s);
  CHECK(f->last_s < faults[0].to_s);
  REQUIRE(f->energy_kwh);
  CHECK(*f->energy_kwh >= 0);
  // The clean log's cooling runs only where outdoor air cannot carry the load.
  CHECK(audit_generated({}, 21, {}, true, kCoolerK).result.findings.empty());
}

TEST_CASE("economizer locked out with a cooling column: at minimum while cooling runs, alone") {
  const auto faults = week_fault(test::FaultKind::economizer_locked_out, 0.0);
  const auto a = audit_generated(faults);
  INFO(describe(a.result));
  CHECK(kinds(a.result) == std::set{audit::FindingKind::minimum_while_cooling});
  const double expected = expected_hours(a.gen, [](const test::GeneratedRow& r) {
    return r.fan && r.in_fault && r.cooling && r.configured_enabled && r.x_enabled > 0.2 + 0.10 &&
           clear_of_band(r.t_out_log);
  });
  const auto* f = a.result.find(audit::FindingKind::minimum_while_cooling);
  REQUIRE(f);
  CHECK(expected > 2.0);
  CHECK(std::abs(f->hours - expected) <= kInterval_h + 1e-9);
  REQUIRE(f->energy_kwh);
  CHECK(*f->energy_kwh > 0);  // free cooling lost to the compressor
  // The samples yielding to cooling do not move the switching point.
  REQUIRE(a.result.switch_points.size() == 1);
  CHECK_FALSE(a.result.switch_points.front().differs);
}

TEST_CASE("supply air 4 K above its setpoint while cooling: off its setpoint, alone") {
  const auto faults = week_fault(test::FaultKind::supply_off_setpoint, 4.0);
  const auto a = audit_generated(faults);
  INFO(describe(a.result));
  CHECK(kinds(a.result) == std::set{audit::FindingKind::supply_off_setpoint});
  // Beyond the 1 K tolerance + 3 × 0.5 K.
  const double expected = expected_hours(a.gen, [](const test::GeneratedRow& r) {
    return r.fan && r.cooling && std::abs(r.t_sup_log - kSupplyC) > 1.0 + 1.5;
  });
  const auto* f = a.result.find(audit::FindingKind::supply_off_setpoint);
  REQUIRE(f);
  CHECK(expected > 2.0);
  CHECK(std::abs(f->hours - expected) <= kInterval_h + 1e-9);
  CHECK(f->first_s >= faults[0].from_s);
  CHECK(f->last_s < faults[0].to_s);
  // A wider tolerance (5 K) takes it away.
  const UnitFile unit = example_unit();
  audit::Options wide{unit.strategies.front(), {}, {}, 5.0};
  CHECK_FALSE(audit::run(unit, a.log, wide).find(audit::FindingKind::supply_off_setpoint));
}

TEST_CASE("supply reading 4 K above the mixed air with the coil idle: fan heat unlike the unit's") {
  const auto faults = week_fault(test::FaultKind::fan_heat_is, 4.0);
  const auto a = audit_generated(faults, 21, {}, true, kCoolerK);
  INFO(describe(a.result));
  CHECK(kinds(a.result) == std::set{audit::FindingKind::fan_heat_mismatch});
  // Coil idle (cooling off), mixed air not below the target by 3 × 0.5 K, and supply − mixed
  // off the unit's 1.5 °F by more than 0.5 K + 3 × √(0.5² + 0.5²).
  const double expected = expected_hours(a.gen, [](const test::GeneratedRow& r) {
    return r.fan && !r.cooling && r.t_mix_log >= kTargetC - 1.5 &&
           std::abs(r.t_sup_log - r.t_mix_log - kFanHeatK) > 0.5 + 3 * std::sqrt(0.5);
  });
  const auto* f = a.result.find(audit::FindingKind::fan_heat_mismatch);
  REQUIRE(f);
  CHECK(expected > 2.0);
  CHECK(std::abs(f->hours - expected) <= kInterval_h + 1e-9);
  CHECK(f->first_s >= faults[0].from_s);
  CHECK(f->last_s < faults[0].to_s);
}

TEST_CASE("a switching point 0.2 °F above the limit with ±0.5 K sensors is consistent") {
  // The controller's limit 0.2 °F high all three weeks: 70.2 °F against the configured 70 °F.
  const std::int64_t start = trend::parse_timestamp("2026-05-04 00:00", "t");
  const std::vector<test::Fault> faults{
      {test::FaultKind::high_limit_raised, start, start + 21 * 86400, 0.2 / 1.8}};
  const auto a = audit_generated(faults);
  INFO(describe(a.result));
  CHECK(a.result.findings.empty());
  REQUIRE(a.result.switch_points.size() == 1);
  const auto& sp = a.result.switch_points.front();
  CHECK_FALSE(sp.differs);
  // √(0.5²) × 3 = 1.5 K for a fixed dry-bulb limit read by the outdoor sensor alone.
  CHECK(sp.tolerance == doctest::Approx(1.5));
  CHECK(sp.highest_open > units::celsius_from_fahrenheit(70.0));
  CHECK(sp.highest_open <= units::celsius_from_fahrenheit(70.2) + 1e-9);
  // The report says so in words.
  report::AuditContext ctx;
  ctx.unit_path = "unit.toml";
  ctx.strategy_text = "off above 70 °F";
  ctx.strategy_source = "test";
  const std::string text = report::audit_text(a.result, a.log, ctx);
  CHECK(contains(text, "consistent with the configured limit"));
  CHECK_FALSE(contains(text, "differs from the configured limit"));
}

// --- The [audit] table --------------------------------------------------------------------

TEST_CASE("[audit] settings and the equivalent options give identical reports") {
  const auto dir = test::scratch_dir("audit-table");
  // The example log with its mixed-air column renamed, so that it needs a mapping.
  std::string log = test::slurp(kSource + "/examples/trend-office.csv");
  const std::string from = "MA Temp (°F)";
  log.replace(log.find(from), from.size(), "Mixed T");
  const auto log_path = (dir / "trend.csv").string();
  std::ofstream(log_path, std::ios::binary) << log;
  const std::string base = test::slurp(kSource + "/examples/audit-office.toml");
  const auto unit_path = (dir / "unit.toml").string();
  const std::string table =
      "\n[audit]\n"
      "outdoor_accuracy = \"0.6K\"\n"
      "return_accuracy = \"0.7F\"\n"
      "mixed_accuracy = \"0.4K\"\n"
      "supply_accuracy = \"0.3K\"\n"
      "supply_tolerance = \"1.5F\"\n"
      "max_gap_minutes = 45\n"
      "utc_offset = \"-05:00\"\n"
      "min_samples = 3\n"
      "min_hours = 1.0\n"
      "[audit.columns]\n"
      "mixed-air = \"Mixed T:F\"\n";
  const std::vector<std::string> options = {
      "--outdoor-accuracy", "0.6K",   "--return-accuracy", "0.7F",
      "--mixed-accuracy",   "0.4K",   "--supply-accuracy", "0.3K",
      "--supply-tolerance", "1.5F",   "--max-gap",         "45",
      "--utc-offset",       "-05:00", "--min-samples",     "3",
      "--min-hours",        "1.0",    "--column",          "mixed-air=Mixed T:F"};
  for (const std::string format : {"text", "md", "json"}) {
    CAPTURE(format);
    std::ofstream(unit_path, std::ios::binary) << base + table;
    const auto by_table = run_cli({"audit", unit_path, log_path, "--format", format}, "audit");
    std::ofstream(unit_path, std::ios::binary) << base;
    std::vector<std::string> args = {"audit", unit_path, log_path, "--format", format};
    args.insert(args.end(), options.begin(), options.end());
    const auto by_options = run_cli(args, "audit");
    CHECK(by_table.rc == 0);
    CHECK(by_options.rc == 0);
    CHECK(by_table.out == by_options.out);
    CHECK(contains(by_table.out, "UTC−05:00"));
    CHECK(contains(by_table.out, "Mixed T"));
    // Without the settings the report differs: the settings are really applied.
    const auto plain = run_cli({"audit", unit_path, log_path, "--format", format}, "audit");
    CHECK(plain.out != by_table.out);
  }
  // An option overrides its key.
  std::ofstream(unit_path, std::ios::binary) << base + table;
  const auto over =
      run_cli({"audit", unit_path, log_path, "--min-samples", "0", "--min-hours", "0"}, "audit");
  CHECK(over.rc == 0);
  CHECK(contains(over.out, "more than 0 sample(s) and more than 0.00 h"));
}

TEST_CASE("[audit]: a bad value is a one-line error naming the key") {
  const std::string base = test::slurp(kSource + "/examples/audit-office.toml") + "\n[audit]\n";
  struct Case {
    std::string line, key, says;
  };
  for (const Case& c : {
           Case{"outdoor_accuracy = \"0K\"", "audit.outdoor_accuracy", "allowed range"},
           Case{"mixed_accuracy = \"9K\"", "audit.mixed_accuracy", "allowed range"},
           Case{"supply_accuracy = \"70%\"", "audit.supply_accuracy", ""},
           Case{"supply_tolerance = \"-1F\"", "audit.supply_tolerance", ""},
           Case{"max_gap_minutes = 0", "audit.max_gap_minutes", "allowed range"},
           Case{"max_gap_minutes = \"soon\"", "audit.max_gap_minutes", ""},
           Case{"min_samples = 2.5", "audit.min_samples", "whole number"},
           Case{"min_hours = -1", "audit.min_hours", "allowed range"},
           Case{"utc_offset = \"+25:00\"", "audit.utc_offset", "offset from UTC"},
           Case{"utc_offset = 5", "audit.utc_offset", "string"},
           Case{"columns = { wind = \"Speed\" }", "audit.columns.wind", "not a trend quantity"},
           Case{"columns = { mixed-air = 5 }", "audit.columns.mixed-air", "HEADER[:UNIT]"},
           Case{"columns = { mixed-air = \"MA:kelvin\" }", "audit.columns.mixed-air", ""},
           Case{"max_gap = 30", "audit.max_gap", "unknown key in [audit]"},
       }) {
    CAPTURE(c.line);
    try {
      (void)parse_unit_file(base + c.line + "\n", "u.toml");
      FAIL("accepted");
    } catch (const InputError& e) {
      const std::string m = e.what();
      CHECK(m.find('\n') == std::string::npos);
      CHECK(contains(m, "u.toml:"));
      CHECK(contains(m, c.key));
      CHECK(contains(m, c.says));
    }
  }
  // Valid but unusual: used, with a warning naming the key.
  const UnitFile u = parse_unit_file(base + "max_gap_minutes = 600\n", "u.toml");
  REQUIRE(u.audit);
  CHECK(*u.audit->max_gap_s == doctest::Approx(36000.0));
  bool warned = false;
  for (const auto& w : u.warnings) warned = warned || contains(w, "audit.max_gap_minutes");
  CHECK(warned);
}

TEST_CASE("UTC offsets of a log's clock") {
  CHECK(trend::parse_utc_offset("-05:00", "t") == -300);
  CHECK(trend::parse_utc_offset("UTC+0530", "t") == 330);
  CHECK(trend::parse_utc_offset("+14", "t") == 840);
  CHECK(trend::parse_utc_offset("Z", "t") == 0);
  CHECK(trend::format_utc_offset(-300) == "UTC−05:00");
  CHECK(trend::format_utc_offset(0) == "UTC");
  for (const char* bad : {"-13:00", "+05:60", "5", "+5:00", "EST", "+05:00:00"})
    CHECK_THROWS_AS((void)trend::parse_utc_offset(bad, "t"), InputError);
}
