// The study page's API (serve/api.hpp) against the commands: its results are the commands'
// for the same unit and weather, its errors their one-line errors. The unit files are the
// repository's invented examples and the weather a real TMY3 year (tests/data/SOURCES.md);
// every expected value here is what the command itself prints, never a number copied in.
#include "support/cli.hpp"

#include <limitline/report/json.hpp>
#include <limitline/serve/api.hpp>

#include <doctest/doctest.h>

#include <string>

namespace {

using limitline::serve::Api;
using limitline::serve::Fields;
using limitline::test::contains;
using limitline::test::run_cli;
using limitline::test::slurp;

const std::string kUnitPath = "examples/office-humid-coast.toml";
const std::string kWeatherPath = "tests/data/greensboro-nc-tmy3.csv";

std::string source(const std::string& rel) {
  return slurp(std::filesystem::path(LIMITLINE_SOURCE_DIR) / rel);
}

Api api() { return Api(limitline::serve::demo_start("harbourside"), "limitline test"); }

// The request of the page for a unit and weather, named as the command line names them.
Fields study_fields(const std::string& unit_text) {
  return {{"unit", unit_text},
          {"unit_name", kUnitPath},
          {"weather", source(kWeatherPath)},
          {"weather_name", "greensboro-nc-tmy3.csv"}};
}

// The numbers of a JSON text in order, as written: the byte-for-byte part of the comparison.
std::vector<std::string> numbers(const std::string& json) {
  std::vector<std::string> out;
  bool in_string = false;
  for (std::size_t i = 0; i < json.size(); ++i) {
    const char c = json[i];
    if (in_string) {
      if (c == '\\')
        ++i;
      else if (c == '"')
        in_string = false;
      continue;
    }
    if (c == '"') {
      in_string = true;
    } else if (c == '-' || (c >= '0' && c <= '9')) {
      std::size_t j = i;
      while (j < json.size() &&
             std::string_view("+-.eE0123456789").find(json[j]) != std::string::npos)
        ++j;
      out.push_back(json.substr(i, j - i));
      i = j - 1;
    }
  }
  return out;
}

std::filesystem::path scratch(const std::string& name) {
  return limitline::test::scratch_dir("serve_api") / name;
}

void write(const std::filesystem::path& p, const std::string& text) {
  std::ofstream(p, std::ios::binary) << text;
}

}  // namespace

TEST_CASE("/api/year is `limitline year --format json` for the same unit and weather") {
  const auto r = api().handle("year", study_fields(source(kUnitPath)));
  REQUIRE(r.status == 200);
  CHECK(r.content_type == "application/json");
  const auto cmd = run_cli({"year", kUnitPath, "--weather", kWeatherPath, "--format", "json"});
  REQUIRE(cmd.rc == 0);
  const auto got = numbers(r.body), want = numbers(cmd.out);
  REQUIRE(want.size() > 100);
  CHECK(got == want);
  // The labels name the uploads as the request names them: with the command's unit path and
  // the weather file's name the whole document is the command's, apart from the weather line,
  // which names the path the command was given.
  std::string body = r.body;
  const std::string given = "\"weather\": \"greensboro-nc-tmy3.csv\"";
  const auto at = body.find(given);
  REQUIRE(at != std::string::npos);
  body.replace(at, given.size(), "\"weather\": \"" + kWeatherPath + "\"");
  CHECK(body == cmd.out);
}

TEST_CASE("/api/study carries the year document of /api/year, the chart's axes and the pictures") {
  const Api a = api();
  const auto fields = study_fields(source(kUnitPath));
  const auto study = a.handle("study", fields);
  const auto year = a.handle("year", fields);
  REQUIRE(study.status == 200);
  CHECK(contains(study.body, year.body.substr(0, year.body.size() - 1)));
  CHECK(contains(study.body, "\"axes\""));
  CHECK(contains(study.body, "\"dry_bulb_min_c\""));
  CHECK(contains(study.body, "\"monthly_svg\": \"<svg"));
  CHECK(contains(study.body, "\"tuning\": ["));
}

TEST_CASE("a bad unit file gives the command's error, word for word") {
  std::string text = source(kUnitPath);
  const auto at = text.find("supply_air_temp = \"55F\"");
  REQUIRE(at != std::string::npos);
  text.replace(at, 23, "supply_air_temp = \"550F\"");
  const auto bad = scratch("bad-unit.toml");
  write(bad, text);
  const auto cmd = run_cli({"year", bad.string(), "--weather", kWeatherPath, "--format", "json"});
  REQUIRE(cmd.rc == 2);
  const std::string prefix = "limitline year: error: ";
  REQUIRE(cmd.err.rfind(prefix, 0) == 0);
  Fields f = study_fields(text);
  f.erase("unit_name");
  f.emplace("unit_name", bad.string());
  const auto r = api().handle("year", f);
  CHECK(r.status == 422);
  const std::string message = cmd.err.substr(prefix.size(), cmd.err.size() - prefix.size() - 1);
  CHECK(r.body == "{\n  \"error\": \"" + limitline::report::json_escape(message) + "\"\n}\n");
}

TEST_CASE("an edited unit file reproduces the page's results through the command") {
  const Api a = api();
  Fields edit = {{"unit", source(kUnitPath)},
                 {"unit_name", kUnitPath},
                 {"path", "air_handler.supply_air_temp"},
                 {"value", "58F"},
                 {"path", "strategy[1].dry_bulb_limit"},
                 {"value", "63F"}};
  const auto e = a.handle("edit", edit);
  REQUIRE(e.status == 200);
  // The edited text, as the page downloads it: the JSON string unescaped.
  const std::string key = "\"unit\": \"";
  std::string escaped = e.body.substr(e.body.find(key) + key.size());
  escaped.resize(escaped.rfind('"'));
  std::string toml;
  for (std::size_t i = 0; i < escaped.size(); ++i) {
    if (escaped[i] != '\\') {
      toml += escaped[i];
      continue;
    }
    const char n = escaped[++i];
    toml += n == 'n' ? '\n' : n == 't' ? '\t' : n;
  }
  const bool written =
      contains(toml, "supply_air_temp = '58F'") || contains(toml, "supply_air_temp = \"58F\"");
  CHECK(written);
  const auto saved = scratch("edited.toml");
  write(saved, toml);
  const auto cmd = run_cli({"year", saved.string(), "--weather", kWeatherPath, "--format", "json"});
  REQUIRE(cmd.rc == 0);
  const auto page = a.handle("year", study_fields(toml));
  REQUIRE(page.status == 200);
  CHECK(numbers(page.body) == numbers(cmd.out));
  // The change is a change: the original unit's numbers differ.
  CHECK(numbers(a.handle("year", study_fields(source(kUnitPath))).body) != numbers(page.body));
}

TEST_CASE("an edit the unit file would refuse is refused with its message") {
  const Api a = api();
  Fields edit = {{"unit", source(kUnitPath)},
                 {"unit_name", kUnitPath},
                 {"path", "air_handler.min_outdoor_air"},
                 {"value", "140%"}};
  const auto r = a.handle("edit", edit);
  CHECK(r.status == 422);
  CHECK(contains(r.body, kUnitPath + ":"));
  CHECK(contains(r.body, "min_outdoor_air"));
  SUBCASE("a key the form does not offer") {
    edit.erase("path");
    edit.emplace("path", "weather.file");
    const auto k = a.handle("edit", edit);
    CHECK(k.status == 422);
    CHECK(contains(k.body, "not a setting of the page's form"));
  }
}

TEST_CASE("/api/check is `limitline check --format json` at the point") {
  const Fields f = {
      {"unit", source(kUnitPath)}, {"unit_name", kUnitPath}, {"outdoor", "20.5C/w0.0091"}};
  const auto r = api().handle("check", f);
  REQUIRE(r.status == 200);
  const auto cmd = run_cli({"check", kUnitPath, "--outdoor", "20.5C/w0.0091", "--format", "json"});
  REQUIRE(cmd.rc == 0);
  CHECK(numbers(r.body) == numbers(cmd.out));
}

TEST_CASE("requests the API cannot serve are answered, never thrown") {
  const Api a = api();
  CHECK(a.handle("year", {{"unit", source(kUnitPath)}}).status == 400);
  CHECK(a.handle("nothing", {}).status == 404);
  Fields f = study_fields(source(kUnitPath));
  f.emplace("units", "metric");
  CHECK(a.handle("year", f).status == 422);
  CHECK(a.handle("year", {{"unit", "[[[["}, {"weather", "x"}}).status == 422);
  CHECK(a.handle("year", {{"unit", source(kUnitPath)}, {"weather", std::string(1000, '\0')}})
            .status == 422);
  SUBCASE("a unit naming a loads file is refused: a request never opens a file") {
    std::string text = source(kUnitPath);
    REQUIRE_FALSE(contains(text, "[loads]"));
    text +=
        "\n[loads]\nspace_temp = \"75F\"\nfile = \"/etc/passwd\"\nsensible = { column = \"s\" "
        "}\n";
    const auto l = a.handle("year", {{"unit", text}, {"weather", source(kWeatherPath)}});
    CHECK(l.status == 422);
    CHECK(contains(l.body, "uploaded unit file:"));
    CHECK(contains(l.body, "reads no file"));
  }
}

TEST_CASE("/api/start gives the start state and the demos; /api/report the HTML study") {
  const Api a = api();
  const auto s = a.handle("start", {});
  REQUIRE(s.status == 200);
  CHECK(contains(s.body, "\"unit_name\": \"demo-harbourside.toml\""));
  CHECK(contains(s.body, "\"mesa-alta\""));
  const auto r = a.handle("report", study_fields(source(kUnitPath)));
  REQUIRE(r.status == 200);
  CHECK(r.download_name == "limitline-study.html");
  CHECK(r.body.rfind("<!DOCTYPE html>", 0) == 0);
}

TEST_CASE("the downloaded unit file, saved beside the weather, reproduces the page") {
  // The demo unit with a real weather file read by its own header, as the page does when a
  // weather file is dropped on a demo.
  const Api a = api();
  const auto& start = a.start();
  Fields f = {{"unit", start.unit_text},
              {"unit_name", start.unit_name},
              {"weather", source(kWeatherPath)},
              {"weather_name", "greensboro-nc-tmy3.csv"},
              {"weather_by_header", "1"}};
  const auto page = a.handle("year", f);
  REQUIRE(page.status == 200);
  f.emplace("weather_file", "C:\\Users\\x/../greensboro-nc-tmy3.csv");
  const auto unit = a.handle("unit", f);
  REQUIRE(unit.status == 200);
  CHECK(unit.download_name == "demo-harbourside.toml");
  CHECK(contains(unit.body, "file = 'greensboro-nc-tmy3.csv'"));
  CHECK_FALSE(contains(unit.body, "dry_bulb_c"));
  const auto dir = limitline::test::scratch_dir("serve_api_download");
  write(dir / "study.toml", unit.body);
  std::filesystem::copy_file(std::filesystem::path(LIMITLINE_SOURCE_DIR) / kWeatherPath,
                             dir / "greensboro-nc-tmy3.csv",
                             std::filesystem::copy_options::overwrite_existing);
  const auto cmd = run_cli({"year", (dir / "study.toml").string(), "--format", "json"});
  REQUIRE(cmd.rc == 0);
  CHECK(numbers(page.body) == numbers(cmd.out));
  SUBCASE("a weather file name that is no name") {
    f.erase("weather_file");
    f.emplace("weather_file", "..");
    CHECK(a.handle("unit", f).status == 422);
  }
}
