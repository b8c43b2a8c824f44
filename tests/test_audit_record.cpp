// The audit record (report/audit_record.hpp) and the per-sample timeline behind its picture
// (analysis/audit_timeline.hpp), on the invented example of examples/README-audit.md. These
// are checks of agreement (the picture and the record show what the audit found), not check
// values: the example is demo data.
#include <limitline/analysis/audit.hpp>
#include <limitline/analysis/audit_faults.hpp>
#include <limitline/analysis/audit_timeline.hpp>
#include <limitline/io/codes.hpp>
#include <limitline/io/trend.hpp>
#include <limitline/io/unit_file.hpp>
#include <limitline/report/audit_record.hpp>

#include "support/cli.hpp"
#include "support/svg.hpp"

#include <algorithm>
#include <cmath>

using namespace limitline;
using limitline::test::contains;
using limitline::test::run_cli;
using limitline::test::scratch_dir;
using limitline::test::slurp;
using limitline::test::svg::attr;
using limitline::test::svg::tags_with;

namespace {

const std::string kSource = LIMITLINE_SOURCE_DIR;

struct Example {
  UnitFile unit = load_unit_file(kSource + "/examples/audit-office.toml");
  trend::TrendLog log = trend::load_trend(kSource + "/examples/trend-office.csv", {});
  audit::Options options;
  Example() { options.strategy = unit.strategies.front(); }
};

const Example& example() {
  static const Example e;
  return e;
}

report::AuditContext context(const Example& e) {
  report::AuditContext c;
  c.unit_path = e.unit.path;
  c.strategy_text = "the example's first strategy";
  c.strategy_source = "first strategy of the unit file";
  c.accuracy = e.options.accuracy;
  c.significance = e.options.significance;
  c.supply_tolerance_k = e.options.supply_tolerance_k;
  c.fault_code_note = "no code named";
  return c;
}

}  // namespace

TEST_CASE("the timeline breaks the same rules, sample by sample, as the audit tallies") {
  const Example& e = example();
  const audit::Result r = audit::run(e.unit, e.log, e.options);
  const audit::Timeline t = audit::timeline(e.unit, e.log, e.options);
  REQUIRE(t.samples.size() == e.log.size());
  CHECK(t.damper_from_signal);
  REQUIRE(r.findings.size() >= 3);  // the example's three injected faults (and more)
  for (const auto& f : r.findings) {
    if (f.kind == audit::FindingKind::high_limit_elsewhere) continue;  // judged on the whole log
    CAPTURE(audit::finding_key(f.kind));
    double hours = 0;
    int samples = 0;
    for (std::size_t i = 0; i < t.samples.size(); ++i)
      if (t.samples[i].breaks(f.kind)) {
        hours += e.log.weight_s(i) / 3600.0;
        ++samples;
      }
    CHECK(samples == f.intervals);
    CHECK(hours == doctest::Approx(f.hours).epsilon(1e-9));
  }
  for (std::size_t i = 0; i < t.samples.size(); ++i) {
    CHECK(t.samples[i].time_s == e.log.time_s[i]);
    if (t.samples[i].damper) CHECK(*t.samples[i].damper == e.log.value(trend::Channel::damper, i));
  }
}

TEST_CASE("the log picture marks each finding's runs of samples on its own lane") {
  const Example& e = example();
  const audit::Timeline t = audit::timeline(e.unit, e.log, e.options);
  const std::string svg = report::audit_log_svg(t, e.log, context(e));
  limitline::test::svg::check_standalone(svg);
  limitline::test::svg::check_svg_renders(svg, "audit_record", "log");
  const double width = std::stod(attr(tags_with(svg, {"<svg"})[0], "width"));
  for (std::size_t k = 0; k < audit::kFindingKindCount; ++k) {
    const auto kind = static_cast<audit::FindingKind>(k);
    CAPTURE(audit::finding_key(kind));
    // Runs of consecutive breaking samples, from the timeline.
    std::vector<std::pair<std::int64_t, std::int64_t>> runs;
    for (std::size_t i = 0; i < t.samples.size(); ++i)
      if (t.samples[i].breaks(kind)) {
        if (i > 0 && t.samples[i - 1].breaks(kind))
          runs.back().second = t.samples[i].time_s;
        else
          runs.emplace_back(t.samples[i].time_s, t.samples[i].time_s);
      }
    const auto rects = tags_with(
        svg, {"class=\"finding\"", "data-kind=\"" + std::string(audit::finding_key(kind)) + "\""});
    REQUIRE(rects.size() == runs.size());
    double lane_y = -1;
    for (std::size_t j = 0; j < runs.size(); ++j) {
      CHECK(std::stoll(attr(rects[j], "data-from")) == runs[j].first);
      CHECK(std::stoll(attr(rects[j], "data-to")) > runs[j].second);  // to the run's end
      const double x = std::stod(attr(rects[j], "x")), w = std::stod(attr(rects[j], "width"));
      CHECK(x >= 0);
      CHECK(x + w <= width);
      CHECK(w >= 1.0);  // a single sample stays visible
      const double y = std::stod(attr(rects[j], "y"));
      if (lane_y < 0) lane_y = y;
      CHECK(y == lane_y);  // one lane per kind
    }
  }
  CHECK(contains(svg, "class=\"outdoor\""));
  CHECK(contains(svg, "class=\"damper\""));
  CHECK(contains(svg, "ventilation minimum 20%"));
}

TEST_CASE("the record is one well-formed page with the findings, the picture and a sign-off") {
  const Example& e = example();
  const audit::Result r = audit::run(e.unit, e.log, e.options);
  const std::string html = report::audit_record_html(
      r, e.log, context(e), audit::timeline(e.unit, e.log, e.options), "limitline test");
  const auto dir = scratch_dir("audit_record");
  const auto file = dir / "record.html";
  std::ofstream(file, std::ios::binary) << html;
  CHECK(limitline::test::svg::sh("xmllint --noout " + limitline::test::shell_quote(file.string()) +
                                 " 2>/dev/null") == 0);
  CHECK(html.starts_with("<!DOCTYPE html>"));
  for (const std::string id :
       {"coverage", "columns-used", "findings", "log", "rules", "review", "cautions"})
    CHECK_MESSAGE(contains(html, "<section id=\"" + id + "\""), id);
  CHECK(html.find("id=\"findings\"") < html.find("id=\"log\""));
  CHECK(html.find("id=\"review\"") < html.find("id=\"cautions\""));
  for (const auto& f : r.findings) CHECK(contains(html, std::string(audit::finding_title(f.kind))));
  for (const std::string row : {"Reviewed by", "Date", "Signature"})
    CHECK(contains(html, "<tr><th>" + row + "</th><td></td></tr>"));
  CHECK_FALSE(contains(html, "href="));  // nothing fetched, nothing linked
  CHECK_FALSE(contains(html, "src="));
}

TEST_CASE("limitline audit --format html writes the record, whole, to -o") {
  const auto dir = scratch_dir("audit_record");
  const std::string out = (dir / "cli-record.html").string();
  const auto r = run_cli({"audit", kSource + "/examples/audit-office.toml",
                          kSource + "/examples/trend-office.csv", "--format", "html", "-o", out},
                         "audit_record");
  INFO(r.err);
  REQUIRE(r.rc == 0);
  CHECK(r.out.empty());
  const std::string html = slurp(out);
  CHECK(contains(html, "Economizer trend audit record"));
  CHECK(contains(html, "<svg"));
  const auto bad = run_cli({"audit", kSource + "/examples/audit-office.toml",
                            kSource + "/examples/trend-office.csv", "--format", "pdf"},
                           "audit_record");
  CHECK(bad.rc == 1);
  CHECK(contains(bad.err, "text, md, json, html"));
}

TEST_CASE("which of a code's required faults a log can show depends on its columns") {
  // 90.1-2019 6.4.3.12 lists five faults (from memory; data/codes).
  const auto tables = codes::CodeTables::load(kSource + "/data/codes");
  const auto& required = *tables.edition("ashrae-90.1-2019").fault_detection;
  const Example& e = example();
  const audit::Result full = audit::run(e.unit, e.log, e.options);
  const auto all = audit::fault_evidence(required, e.log, full);
  REQUIRE(all.size() == required.faults.size());
  for (const auto& f : all) CHECK_MESSAGE(f.can_show(), codes::fault_name(f.fault));
  // The example's injected stuck damper is found as the code's damper fault.
  const auto damper = std::find_if(all.begin(), all.end(), [](const audit::FaultEvidence& f) {
    return f.fault == codes::Fault::damper_not_modulating;
  });
  REQUIRE(damper != all.end());
  CHECK(damper->found == std::vector{audit::FindingKind::damper_not_following});

  // A log of outdoor air and the damper signal alone: the damper's state is known, but no
  // outdoor-air fraction can be measured, so neither a sensor fault, a damper that does not
  // follow, nor excess outdoor air can be shown.
  const std::string csv =
      "Timestamp,OAT (°F),OA Damper Cmd (%),SF Status\n"
      "2026-05-04 08:00,60,20,on\n2026-05-04 08:15,61,20,on\n2026-05-04 08:30,62,20,on\n";
  const trend::TrendLog thin = trend::parse_trend(csv, "thin.csv", {});
  const audit::Result r = audit::run(e.unit, thin, e.options);
  const auto some = audit::fault_evidence(required, thin, r);
  for (const auto& f : some) {
    CAPTURE(codes::fault_name(f.fault));
    const bool needs_fraction = f.fault == codes::Fault::sensor_fault ||
                                f.fault == codes::Fault::damper_not_modulating ||
                                f.fault == codes::Fault::outdoor_air_above_minimum;
    CHECK(f.can_show() == !needs_fraction);
    if (needs_fraction) CHECK(!f.not_judged.empty());
  }
  CHECK(audit::needs_text(audit::FindingKind::excess_outdoor_air) ==
        "outdoor-dry-bulb, return-dry-bulb and mixed-air");
}

TEST_CASE("audit names the code's fault-detection clause and what the log shows of it") {
  const std::vector<std::string> base = {"audit", kSource + "/examples/audit-office.toml",
                                         kSource + "/examples/trend-office.csv"};
  auto with = [&](std::initializer_list<std::string> extra) {
    auto a = base;
    a.insert(a.end(), extra.begin(), extra.end());
    return run_cli(a, "audit_record");
  };
  const auto text = with({"--edition", "ashrae-90.1-2019", "--zone", "4A", "--wide"});
  REQUIRE(text.rc == 0);
  CHECK(contains(text.out, "Fault detection the code requires:"));
  CHECK(contains(text.out, "required by ANSI/ASHRAE/IES Standard 90.1-2019, 6.4.3.12"));
  CHECK(contains(text.out,
                 "\"damper not modulating\" [damper-not-modulating]: this log can show "
                 "it (Measured outdoor air unlike the damper command); found: "));
  const auto json = with({"--edition", "ashrae-90.1-2019", "--zone", "4A", "--format", "json"});
  CHECK(contains(json.out, "\"fault_detection\": {"));
  CHECK(contains(json.out, "\"log_can_show\": true"));
  const auto none = with({"--format", "json"});
  CHECK(contains(none.out, "\"fault_detection\": null"));
  const auto old = with({"--edition", "ashrae-90.1-2010", "--zone", "4A"});
  REQUIRE(old.rc == 0);
  CHECK(contains(old.out, "ashrae-90.1-2010 has no economizer fault-detection clause"));
}
