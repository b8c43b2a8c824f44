// The audit in its two steps: one sample judged alone (audit::judge_sample) and the verdicts
// tallied into findings (audit::FindingsTally). The unit and the logs are invented inputs
// written here, never check values; the expectations are the audit's own rules as
// analysis/audit.hpp states them (the damper's opening above the minimum, the deadband of
// docs/model.md §High-limit, a sample's weight as the time to the next one).
#include <doctest/doctest.h>

#include <limitline/analysis/audit.hpp>
#include <limitline/io/trend.hpp>
#include <limitline/io/unit_file.hpp>

#include "support/cli.hpp"

#include <fmt/format.h>

#include <memory>
#include <optional>
#include <string>
#include <vector>

namespace audit = limitline::audit;
namespace trend = limitline::trend;
using audit::FindingKind;
using audit::SampleUse;
using limitline::test::contains;

namespace {

// Fixed dry-bulb 70 °F with a 2 °F deadband: off above 70 °F, on again below 68 °F.
const std::string kUnit = R"toml([site]
name = "Audit steps unit (invented)"
[air_handler]
supply_airflow = "8000cfm"
supply_air_temp = "55F"
min_outdoor_air = "20%"
return_air_temp = "74F"
return_air_rh = "45%"
[[strategy]]
name = "db70"
preset = "fixed-dry-bulb"
dry_bulb_limit = "70F"
deadband = "2F"
)toml";

const std::string kHeader = "Timestamp,OA Temp (°F),RA Temp (°F),OA Damper Cmd (%),SF Status\n";
// A closing sample that breaks no rule, since a log needs two samples to be a series.
const std::string kLast = "2026-05-04 12:00,60,74,20,On\n";

struct Audit {
  limitline::UnitFile unit;
  trend::TrendLog log;
  audit::Options options;
  audit::SampleContext context;
};

// The log's samples judged in order, as audit::run judges them.
std::vector<audit::SampleVerdict> judge_all(const Audit& a) {
  limitline::highlimit::StrategyState state(a.options.strategy);
  std::vector<audit::SampleVerdict> out;
  for (std::size_t i = 0; i < a.log.size(); ++i)
    out.push_back(audit::judge_sample(a.context, i, state));
  return out;
}

// A heap object, so the context's pointers to the unit, log and options stay valid. Sensors
// of ±0.1 K put the high-limit's decision in doubt only within 0.3 K of its edges, and no
// significance minimum hides the few samples these logs have.
std::unique_ptr<Audit> make_audit(const std::string& rows,
                                  audit::Accuracy accuracy = {0.1, 0.1, 0.1, 0.1},
                                  audit::Significance significance = {0, 0.0}) {
  auto a = std::make_unique<Audit>();
  a->unit = limitline::parse_unit_file(kUnit, "steps.toml");
  a->log = trend::parse_trend(kHeader + rows, "steps.csv", {});
  a->options = {a->unit.strategies.front(), accuracy, significance};
  a->context = audit::sample_context(a->unit, a->log, a->options);
  return a;
}

}  // namespace

TEST_CASE("one sample judged alone: a damper open while the high-limit says off") {
  const auto a = make_audit("2026-05-04 10:00,75,74,60,On\n" + kLast);
  const auto v = judge_all(*a).front();
  CHECK(v.use == SampleUse::operating);
  // 75 °F is above the 70 °F limit, so the economizer is off; the damper stands 60 % open
  // against a 20 % minimum: economizing by 0.40 of outdoor air above the minimum.
  REQUIRE(v[FindingKind::economizing_when_disabled]);
  CHECK(v[FindingKind::economizing_when_disabled]->excess == doctest::Approx(0.40));
  CHECK(v[FindingKind::economizing_when_disabled]->energy_kwh.has_value());
  CHECK(!v[FindingKind::not_economizing_when_enabled]);
  // No mixed-air column: no measured fraction, so no rule that needs one can fire.
  CHECK(!v.fraction_measured);
  CHECK(!v[FindingKind::damper_not_following]);
  CHECK(!v[FindingKind::mixed_air_out_of_range]);
  CHECK(!v[FindingKind::high_limit_elsewhere]);  // the tally's, from the whole log
}

TEST_CASE("the deadband carries from sample to sample, fan-off samples included") {
  // 69 °F lies in the deadband (68 to 70 °F): off if the limit had tripped, on if it had not.
  const std::string in_band = "2026-05-04 10:15,69,74,60,On\n";
  const auto tripped = make_audit("2026-05-04 10:00,71,74,0,Off\n" + in_band + kLast);
  const auto tv = judge_all(*tripped);
  CHECK(tv[0].use == SampleUse::fan_off);
  CHECK(tv[1][FindingKind::economizing_when_disabled]);
  const auto fresh = make_audit(in_band + kLast);
  CHECK(!judge_all(*fresh)[0][FindingKind::economizing_when_disabled]);
}

TEST_CASE("a sample without the readings a decision needs is left out, and counted") {
  const auto a = make_audit("2026-05-04 10:00,,74,60,On\n2026-05-04 10:15,65,74,20,On\n");
  const auto v = judge_all(*a);
  CHECK(v[0].use == SampleUse::incomplete);
  CHECK(v[1].use == SampleUse::operating);
  audit::FindingsTally tally(a->context);
  for (std::size_t i = 0; i < v.size(); ++i) tally.add(i, v[i]);
  const audit::Result r = tally.finish();
  CHECK(r.operating_intervals == 1);
  bool said = false;
  for (const auto& n : r.notes)
    said = said || contains(n, "1 sample(s) without the readings a decision needs");
  CHECK(said);
}

TEST_CASE("the tally keeps each finding's first and worst sample, and adds hours and energy") {
  // Three samples 15 minutes apart: each stands for 0.25 h (the last for the median interval).
  const auto a = make_audit(
      "2026-05-04 10:00,65,74,20,On\n2026-05-04 10:15,65,74,20,On\n"
      "2026-05-04 10:30,65,74,20,On\n");
  audit::FindingsTally tally(a->context);
  const double excess[] = {0.1, 0.3, 0.2};
  const std::optional<double> energy[] = {1.0, 2.0, std::nullopt};
  for (std::size_t i = 0; i < 3; ++i) {
    audit::SampleVerdict v;
    v.use = SampleUse::operating;
    v.findings[static_cast<std::size_t>(FindingKind::damper_not_following)] =
        audit::SampleFinding{excess[i], energy[i]};
    if (i < 2)
      v.findings[static_cast<std::size_t>(FindingKind::below_minimum)] =
          audit::SampleFinding{0.05, 1.5};
    tally.add(i, v);
  }
  const audit::Result r = tally.finish();
  CHECK(r.operating_hours == doctest::Approx(0.75));
  REQUIRE(r.findings.size() == 2);
  // In FindingKind order.
  CHECK(r.findings[0].kind == FindingKind::damper_not_following);
  CHECK(r.findings[1].kind == FindingKind::below_minimum);
  const audit::Finding& d = r.findings[0];
  CHECK(d.intervals == 3);
  CHECK(d.hours == doctest::Approx(0.75));
  CHECK(d.share_of_operating == doctest::Approx(1.0));
  CHECK(d.first_line == a->log.line[0]);
  CHECK(d.worst_line == a->log.line[1]);
  CHECK(d.worst_excess == doctest::Approx(0.3));
  CHECK(d.last_s == a->log.time_s[2]);
  CHECK(!d.energy_kwh);  // one sample the model cannot price leaves the total unknown
  const audit::Finding& b = r.findings[1];
  CHECK(b.hours == doctest::Approx(0.5));
  REQUIRE(b.energy_kwh);
  CHECK(*b.energy_kwh == doctest::Approx(3.0));
}

TEST_CASE("judging every sample and tallying the verdicts is the audit") {
  const auto a = make_audit(
      "2026-05-04 10:00,75,74,60,On\n2026-05-04 10:15,71,74,0,Off\n"
      "2026-05-04 10:30,69,74,60,On\n2026-05-04 10:45,,74,60,On\n"
      "2026-05-04 11:00,60,74,20,On\n");
  audit::FindingsTally tally(a->context);
  const auto v = judge_all(*a);
  for (std::size_t i = 0; i < v.size(); ++i) tally.add(i, v[i]);
  const audit::Result stepwise = tally.finish();
  const audit::Result whole = audit::run(a->unit, a->log, a->options);
  CHECK(stepwise.operating_hours == whole.operating_hours);
  CHECK(stepwise.notes == whole.notes);
  REQUIRE(stepwise.findings.size() == whole.findings.size());
  for (std::size_t k = 0; k < whole.findings.size(); ++k) {
    CHECK(stepwise.findings[k].kind == whole.findings[k].kind);
    CHECK(stepwise.findings[k].hours == whole.findings[k].hours);
    CHECK(stepwise.findings[k].energy_kwh == whole.findings[k].energy_kwh);
  }
  CHECK(whole.find(FindingKind::economizing_when_disabled)->intervals == 2);
}

TEST_CASE("a sample exactly at the limit is no finding; the same samples clear of it are") {
  // Six samples at 70.0 °F, the configured limit, with the damper at its 20 % minimum: the
  // strategy allows the economizer at the limit and the model would open the damper, but a
  // reading at the limit may have been either side of it for the controller's sensor.
  std::string at, clear;
  for (int k = 0; k < 6; ++k) {
    at += fmt::format("2026-05-04 {:02}:{:02},70.0,74,20,On\n", 10 + k / 4, 15 * (k % 4));
    clear += fmt::format("2026-05-04 {:02}:{:02},65.0,74,20,On\n", 10 + k / 4, 15 * (k % 4));
  }
  for (const audit::Accuracy acc : {audit::Accuracy{}, audit::Accuracy{0.01, 0.01, 0.01, 0.01}}) {
    const auto a = make_audit(at, acc, {});
    const audit::Result r = audit::run(a->unit, a->log, a->options);
    CHECK(r.findings.empty());
    CHECK(r.below_significance.empty());
  }
  // 65 °F is 2.8 K below the limit, beyond 3 × 0.5 K: 6 samples, 1.5 h, a finding.
  const auto c = make_audit(clear, {}, {});
  const audit::Result r = audit::run(c->unit, c->log, c->options);
  REQUIRE(r.find(FindingKind::not_economizing_when_enabled));
  CHECK(r.find(FindingKind::not_economizing_when_enabled)->intervals == 6);
}

TEST_CASE("a finding needs more samples and hours than the significance minimum") {
  // Three samples 15 minutes apart with the damper open at 75 °F: 3 samples, 0.75 h.
  const std::string rows =
      "2026-05-04 10:00,75,74,60,On\n2026-05-04 10:15,75,74,60,On\n"
      "2026-05-04 10:30,75,74,60,On\n";
  struct Case {
    audit::Significance sig;
    bool reported;
  };
  for (const Case c : {Case{{2, 0.5}, true}, Case{{3, 0.5}, false}, Case{{2, 0.75}, false},
                       Case{{0, 0.7}, true}}) {
    const auto a = make_audit(rows, {}, c.sig);
    const audit::Result r = audit::run(a->unit, a->log, a->options);
    CAPTURE(c.sig.min_samples);
    CAPTURE(c.sig.min_hours);
    CHECK((r.find(FindingKind::economizing_when_disabled) != nullptr) == c.reported);
    CHECK(r.below_significance.size() == (c.reported ? 0u : 1u));
    bool noted = false;
    for (const auto& n : r.notes) noted = noted || contains(n, "economizing-when-disabled (3");
    CHECK(noted == !c.reported);
  }
}
