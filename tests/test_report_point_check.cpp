// The point-check report as a library function (report/point_check.hpp): what the context
// carries reaches every format, and the three formats describe the same strategies. The unit
// written here is invented scaffolding, never a check value; the expectations are the
// report's own contract (the same facts in text, Markdown and JSON; unit-suffixed keys).
#include <doctest/doctest.h>

#include <limitline/analysis/point_check.hpp>
#include <limitline/io/unit_file.hpp>
#include <limitline/model/air_point.hpp>
#include <limitline/report/point_check.hpp>

// After the limitline headers: <sys/wait.h> defines si_value as a macro.
#include "support/cli.hpp"

#include <string>
#include <vector>

namespace {

using limitline::test::contains;
using limitline::units::System;
namespace report = limitline::report;

const std::string kUnit = R"toml([site]
name = "Report test unit (invented)"
[air_handler]
supply_airflow = "8000cfm"
supply_air_temp = "55F"
min_outdoor_air = "20%"
return_air_temp = "75F"
return_air_rh = "50%"

[[strategy]]
name = "db72"
preset = "fixed-dry-bulb"
dry_bulb_limit = "72F"

[[strategy]]
name = "diff-db"
preset = "differential-dry-bulb"
)toml";

struct Checked {
  limitline::UnitFile unit;
  limitline::PointCheck pc;
};

Checked check_at(const std::string& outdoor) {
  Checked c{limitline::parse_unit_file(kUnit, "report-test.toml"), {}};
  const double p = c.unit.site.design_pressure_kpa();
  const auto point = limitline::parse_air_point(outdoor, System::ip, "outdoor");
  c.pc = limitline::check_point(c.unit.air_handler, c.unit.weights,
                                limitline::strategies_or_presets(c.unit), point.state(p),
                                c.unit.return_air.state(p));
  return c;
}

}  // namespace

TEST_CASE("the check report shows the context's warnings and air sources in every format") {
  const Checked c = check_at("68F/80%");
  const report::PointCheckContext ctx{&c.unit,
                                      "measured at the intake",
                                      "assumed return",
                                      {"u.toml:3: a warning for the test"},
                                      System::ip};
  const std::string text = report::point_check_text(c.pc, ctx);
  const std::string md = report::point_check_markdown(c.pc, ctx);
  const std::string json = report::point_check_json(c.pc, ctx);
  CHECK(contains(text, "Warning      u.toml:3: a warning for the test\n"));
  CHECK(contains(md, "- **Warning:** u.toml:3: a warning for the test\n"));
  CHECK(contains(json, "\"warnings\": [\n    \"u.toml:3: a warning for the test\"\n  ]"));
  for (const std::string* out : {&text, &md}) {
    CHECK(contains(*out, "measured at the intake"));
    CHECK(contains(*out, "assumed return"));
  }
  CHECK(contains(json, "\"from\": \"measured at the intake\""));
  CHECK(contains(json, "\"from\": \"assumed return\""));
}

TEST_CASE("the check report names every strategy, in the context's units") {
  const Checked c = check_at("85F/40%");
  for (const System s : {System::ip, System::si}) {
    const report::PointCheckContext ctx{&c.unit, "--outdoor", "unit file", {}, s};
    const std::string text = report::point_check_text(c.pc, ctx);
    const std::string md = report::point_check_markdown(c.pc, ctx);
    const std::string json = report::point_check_json(c.pc, ctx);
    for (const char* name : {"db72", "diff-db"}) {
      CAPTURE(name);
      CHECK(contains(text, std::string("\n") + name + " "));
      CHECK(contains(md, std::string("| ") + name + " |"));
      CHECK(contains(json, std::string("\"name\": \"") + name + "\""));
    }
    CHECK(contains(json, s == System::ip ? "\"pressure_psia\"" : "\"pressure_kpa\""));
    CHECK(contains(text, s == System::ip ? "°F" : "°C"));
    CHECK(md.rfind("# Economizer high-limit check\n", 0) == 0);
  }
}
