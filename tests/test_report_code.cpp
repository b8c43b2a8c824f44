// The energy-code reports as library functions (report/code.hpp): the unit report's weather
// pressure line, and the cautions every report ends with. The unit and the weather label are
// invented scaffolding; the pressure figures are unit conversions by definition (101.325 kPa
// is 14.70 psia at 6.894757 kPa/psi, NIST SP 811) and the tables are the shipped ones (their
// values recalled from memory, as the tables say).
#include <doctest/doctest.h>

#include <limitline/io/codes.hpp>
#include <limitline/io/unit_file.hpp>
#include <limitline/report/cautions.hpp>
#include <limitline/report/code.hpp>

// After the limitline headers: <sys/wait.h> defines si_value as a macro.
#include "support/cli.hpp"

#include <filesystem>
#include <string>

namespace {

using limitline::test::contains;
using limitline::units::System;
namespace codes = limitline::codes;
namespace report = limitline::report;

const codes::CodeTables& shipped_tables() {
  static const codes::CodeTables t =
      codes::CodeTables::load(std::filesystem::path(LIMITLINE_SOURCE_DIR) / "data/codes");
  return t;
}

const std::string kUnit = R"toml([site]
name = "Code report unit (invented)"
[air_handler]
supply_airflow = "9000cfm"
supply_air_temp = "55F"
min_outdoor_air = "20%"
return_air_temp = "75F"
return_air_rh = "50%"
[[strategy]]
name = "db75"
preset = "fixed-dry-bulb"
dry_bulb_limit = "75F"
)toml";

struct Judged {
  limitline::UnitFile unit;
  codes::ZoneRequirements req;
  report::CodeVerdicts verdicts;
};

Judged judge() {
  Judged j{limitline::parse_unit_file(kUnit, "code-report.toml"),
           codes::requirements(shipped_tables().edition("ashrae-90.1-2019", "test"), "4A", {}),
           {}};
  j.verdicts.unit_path = j.unit.path;
  j.verdicts.strategies = limitline::strategies_or_presets(j.unit);
  for (const auto& st : j.verdicts.strategies)
    j.verdicts.checks.push_back(codes::check_strategy(j.req, st));
  j.verdicts.edition_from = "--edition";
  j.verdicts.zone_from = "--zone";
  return j;
}

}  // namespace

TEST_CASE(
    "the unit report sets the weather file's pressure beside the footnote's, and its source") {
  Judged j = judge();
  j.verdicts.req = &j.req;
  SUBCASE("no weather file: no line") {
    CHECK(!contains(report::code_unit_text(j.verdicts, System::ip), "Weather pressure"));
    CHECK(!contains(report::code_unit_json(j.verdicts, System::ip), "weather_pressure"));
  }
  SUBCASE("each source of the footnote's pressure is named") {
    const std::pair<report::FootnotePressure, std::string> sources[] = {
        {report::FootnotePressure::command_line, "(from the command line)"},
        {report::FootnotePressure::unit_site, "(from the unit's [site])"},
        {report::FootnotePressure::sea_level, "(sea level: the unit gives no elevation)"}};
    for (const auto& [from, words] : sources) {
      CAPTURE(words);
      j.verdicts.weather = report::WeatherPressure{{}, "site.csv", 98.7, 101.325, from};
      const std::string text = report::code_unit_text(j.verdicts, System::ip);
      CHECK(contains(text, "Weather pressure  the altitude footnote used 14.70 psia " + words +
                               "; the weather file site.csv has a median station pressure of "));
      CHECK(contains(report::code_unit_json(j.verdicts, System::ip),
                     "\"weather_pressure\": \"the altitude footnote used 14.70 psia "));
    }
  }
  SUBCASE("a file that cannot be read is said, with the reason") {
    j.verdicts.weather =
        report::WeatherPressure{"site.csv: cannot open the weather file", {}, 0, 0, {}};
    CHECK(
        contains(report::code_unit_markdown(j.verdicts, System::si),
                 "- **Weather pressure**: not compared: site.csv: cannot open the weather file\n"));
  }
}

TEST_CASE("every code report ends with the code cautions, in each format") {
  Judged j = judge();
  j.verdicts.req = &j.req;
  const auto& tables = shipped_tables();
  const std::string caution = report::cautions(report::CautionTopic::code).front();
  const std::string outputs[] = {
      report::code_zone_text(j.req, System::ip, std::nullopt),
      report::code_zone_markdown(j.req, System::ip, std::nullopt),
      report::code_zone_json(j.req, System::ip, std::nullopt),
      report::code_unit_text(j.verdicts, System::ip),
      report::code_unit_markdown(j.verdicts, System::ip),
      report::code_unit_json(j.verdicts, System::ip),
      report::code_matrix_text(tables, std::nullopt, std::nullopt, System::si),
      report::code_matrix_markdown(tables, std::nullopt, std::nullopt, System::si),
      report::code_matrix_json(tables, std::nullopt, std::nullopt, System::si),
      report::code_editions_text(tables),
      report::code_editions_markdown(tables),
      report::code_editions_json(tables)};
  for (std::size_t i = 0; i < std::size(outputs); ++i) {
    CAPTURE(i);
    const std::string& out = outputs[i];
    const std::size_t at = out.rfind(caution.substr(0, 40));
    REQUIRE(at != std::string::npos);
    // Nothing but the cautions follows: the last caution closes the text, or the JSON array.
    const std::string last = report::cautions(report::CautionTopic::code).back();
    CHECK(contains(out.substr(at), last.substr(0, 40)));
    if (i % 3 == 2) {
      const bool closes = out.ends_with("]\n}\n") || out.ends_with("]\n}");
      CHECK(closes);
    }
  }
}
