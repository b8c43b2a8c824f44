// The climate survey: the manifest as read, shards, each site's record as it round-trips
// through a partial file, the summary by zone, failed sites kept apart, merge's refusals, and
// agreement with `limitline year` for the same site.
// Weather: tests/data/greensboro-nc-tmy3.csv and pvgis-tmy-45n-8e.csv (open data sets, see
// tests/data/SOURCES.md). Unit files, manifests and the corrupt file are invented for the test.
#include "support/cli.hpp"

#include <limitline/app/survey.hpp>
#include <limitline/io/json_read.hpp>

#include <sys/stat.h>

#include <bit>
#include <cmath>
#include <fstream>
#include <set>

using limitline::test::run_cli;
using limitline::test::scratch_dir;
using limitline::test::slurp;
namespace sv = limitline::survey;

namespace {

constexpr const char* kSuite = "survey";

std::string data(const std::string& f) { return std::string(LIMITLINE_TEST_DATA_DIR) + "/" + f; }

std::filesystem::path write(const std::string& name, const std::string& text) {
  const auto p = scratch_dir(kSuite) / name;
  std::ofstream(p, std::ios::binary) << text;
  return p;
}

constexpr const char* kUnit = R"(units = "ip"
[air_handler]
supply_airflow = "10000cfm"
supply_air_temp = "55F"
fan_heat = "1.5F"
min_outdoor_air = "20%"
return_air_temp = "75F"
return_air_rh = "50%"
[schedule]
mon-fri = "06:00-19:00"
)";

std::string manifest_text() {
  return "# test manifest\n"
         "site,weather,elevation,energy_code,climate_zone\n"
         "Greensboro," +
         data("greensboro-nc-tmy3.csv") +
         ",900ft,ashrae-90.1-2019,4A\n"
         "Piedmont," +
         data("pvgis-tmy-45n-8e.csv") +
         ",250m,ashrae-90.1-2019,4a\n"
         "Missing,no-such-weather.csv,,ashrae-90.1-2019,4A\n"
         "Corrupt,corrupt.csv,,ashrae-90.1-2019,5A\n"
         "Greensboro again," +
         data("greensboro-nc-tmy3.csv") + ",900ft,,\n";
}

struct Files {
  std::filesystem::path unit, manifest;
};

Files files() {
  write("corrupt.csv", "Date,Time,Dry-bulb (C)\n01/01/2020,01:00,warm\n");
  return {write("unit.toml", kUnit), write("sites.csv", manifest_text())};
}

sv::SurveyOptions options() {
  sv::SurveyOptions o;
  o.threads = 2;
  o.chunk = 2;  // several chunks even in a small manifest
  return o;
}

bool same_bits(double a, double b) {
  return std::bit_cast<std::uint64_t>(a) == std::bit_cast<std::uint64_t>(b);
}

}  // namespace

TEST_CASE("the manifest names its columns; paths are relative to it; errors name file and line") {
  const Files f = files();
  const sv::Manifest m = sv::read_manifest(f.manifest.string(), limitline::units::System::ip);
  REQUIRE(m.rows.size() == 5);
  CHECK(m.rows[0].line == 3);  // after the comment and the header
  CHECK(m.rows[0].site == "Greensboro");
  CHECK(m.rows[0].elevation_m.value() == doctest::Approx(900 * 0.3048));
  CHECK(m.rows[1].elevation_m.value() == doctest::Approx(250));
  CHECK(m.rows[2].weather_path == (f.manifest.parent_path() / "no-such-weather.csv").string());
  CHECK_FALSE(m.rows[2].elevation_m);

  const auto error_of = [](const std::string& text) {
    const auto p = write("bad.csv", text);
    try {
      (void)sv::read_manifest(p.string(), limitline::units::System::ip);
    } catch (const limitline::InputError& e) {
      return std::string(e.what());
    }
    return std::string("no error");
  };
  const std::string at = (scratch_dir(kSuite) / "bad.csv").string();
  CHECK(error_of("weather,altitude\nx.csv,3\n") ==
        at + ":1: column 'altitude' is not a manifest column; allowed: weather, site, elevation, "
             "energy_code, climate_zone, unit");
  CHECK(error_of("site,zone\n").find(":1: column 'zone' is not") != std::string::npos);
  CHECK(error_of("site\nA\n").find(":1: the header has no weather column") != std::string::npos);
  CHECK(error_of("weather,elevation\nx.csv,high\n").find(at + ":2: elevation") == 0);
  CHECK(error_of("weather,site\nx.csv,a,b\n") ==
        at + ":2: the row has 3 fields but the header (line 1) has 2");
  CHECK(error_of("weather,site\n,a\n").find(":2: weather: empty") != std::string::npos);
  CHECK(error_of("# nothing\n").find("the manifest is empty") != std::string::npos);
}

TEST_CASE("a shard K/N takes rows K-1, K-1+N, ...: the shards of one N cover every row once") {
  CHECK(sv::parse_shard("3/7").index == 3);
  CHECK(sv::parse_shard("3/7").count == 7);
  for (const char* bad : {"0/3", "4/3", "3", "a/b", "1/0", "1/100001", "-1/3", "1/3/5"})
    CHECK_THROWS_AS((void)sv::parse_shard(bad), limitline::InputError);
  for (std::size_t n : {1u, 2u, 3u, 7u}) {
    for (std::size_t row = 0; row < 50; ++row) {
      int owners = 0;
      for (std::size_t k = 1; k <= n; ++k) owners += sv::Shard{k, n}.has(row) ? 1 : 0;
      CHECK(owners == 1);
    }
  }
}

TEST_CASE("a missing file and a corrupt one fail with their errors; every other site is complete") {
  const Files f = files();
  const sv::Survey s(sv::read_manifest(f.manifest.string(), limitline::units::System::ip),
                     f.unit.string(), {}, options());
  std::vector<sv::SiteRecord> got;
  CHECK(s.run({1, 1}, [&](const sv::SiteRecord& r) { got.push_back(r); }));
  REQUIRE(got.size() == 5);
  for (std::size_t i = 0; i < got.size(); ++i) CHECK(got[i].row == i);
  CHECK(got[0].ok);
  CHECK(got[1].ok);
  CHECK(got[4].ok);
  REQUIRE_FALSE(got[2].ok);
  CHECK(got[2].error.find("no-such-weather.csv") != std::string::npos);
  REQUIRE_FALSE(got[3].ok);
  CHECK(got[3].error.find("corrupt.csv") != std::string::npos);
  CHECK(got[3].zone == "5A");  // a failed site still counts in its zone
  // Every strategy (the seven presets) ranked, best first; the code's verdicts where it has one.
  REQUIRE(got[0].strategies.size() == 7);
  for (std::size_t k = 1; k < 7; ++k)
    CHECK(got[0].strategies[k - 1].shortfall <= got[0].strategies[k].shortfall);
  CHECK_FALSE(got[0].strategies[0].compliance.empty());
  CHECK(got[4].strategies[0].compliance.empty());  // no code on that row
  CHECK(got[4].best_compliant.empty());
  // 90.1-2019 requires an economizer in 4A from 54,000 Btu/h (from memory); this unit's
  // estimated capacity is above it. Without a code nothing is said.
  CHECK(got[0].economizer == "required");
  CHECK(got[4].economizer.empty());
  CHECK(got[0].best.front() == got[0].strategies.front().name);
  // The same site at another elevation and code is another result.
  CHECK(got[0].strategies.front().name == got[4].strategies.front().name);
}

TEST_CASE("a record reads back from its partial line bit for bit, tuned settings included") {
  const Files f = files();
  sv::SurveyOptions o = options();
  o.tune = true;
  const sv::Survey s(sv::read_manifest(f.manifest.string(), limitline::units::System::ip),
                     f.unit.string(), {}, o);
  const sv::SiteRecord r = s.evaluate(s.manifest().rows[1]);
  REQUIRE(r.ok);
  const sv::SiteRecord back = sv::parse_record(sv::record_line(r), "test");
  CHECK(back.site == r.site);
  CHECK(same_bits(back.perfect_savings, r.perfect_savings));
  CHECK(same_bits(back.tolerance, r.tolerance));
  CHECK(back.best == r.best);
  CHECK(back.best_compliant == r.best_compliant);
  REQUIRE(back.strategies.size() == r.strategies.size());
  for (std::size_t k = 0; k < r.strategies.size(); ++k) {
    const auto &a = r.strategies[k], &b = back.strategies[k];
    CHECK(a.name == b.name);
    CHECK(a.compliance == b.compliance);
    CHECK(same_bits(a.shortfall, b.shortfall));
    CHECK(same_bits(a.savings, b.savings));
    CHECK(same_bits(a.harmful_hours, b.harmful_hours));
    REQUIRE(a.best_setting.size() == b.best_setting.size());
    REQUIRE_FALSE(a.best_setting.empty());
    for (std::size_t c = 0; c < a.best_setting.size(); ++c) {
      CHECK(a.best_setting[c].condition == b.best_setting[c].condition);
      CHECK(a.best_setting[c].kind == b.best_setting[c].kind);
      CHECK(same_bits(a.best_setting[c].value, b.best_setting[c].value));
    }
    CHECK(same_bits(*a.tuned_shortfall, *b.tuned_shortfall));
    // The swept grid holds the unit's own setting, so the tuned best never falls short more.
    CHECK(*a.tuned_shortfall <= a.shortfall + 1e-9);
  }
}

TEST_CASE("the summary by zone: wins with ties, medians, worst, zones in natural order") {
  sv::SummaryBuilder b;
  const auto site = [](std::string zone, double perfect,
                       std::vector<std::pair<std::string, double>> s,
                       std::vector<std::string> best) {
    sv::SiteRecord r;
    r.ok = true;
    r.zone = std::move(zone);
    r.code = "ashrae-90.1-2019";
    r.perfect_savings = perfect;
    for (auto& [n, v] : s) r.strategies.push_back({n, "complies", v, 0, 0, 0, {}, {}, {}});
    r.best = std::move(best);
    r.best_compliant = r.best;
    return r;
  };
  b.add(site("10A", 100, {{"a", 1}, {"b", 5}}, {"a"}));
  b.add(site("4a", 100, {{"a", 2}, {"b", 1}}, {"b", "a"}));
  b.add(site("4A", 200, {{"a", 8}, {"b", 3}}, {"b"}));
  b.add(site("4A", 100, {{"a", 4}, {"b", 6}}, {"a"}));
  sv::SiteRecord failed;
  failed.zone = "2A";
  b.add(failed);
  const auto zones = b.zones();
  REQUIRE(zones.size() == 3);
  CHECK(zones[0].zone == "2A");  // 2 before 4 before 10
  CHECK(zones[0].sites_failed == 1);
  CHECK(zones[1].zone == "4a");  // "4a" and "4A" are one zone, named as first written
  CHECK(zones[1].sites_ok == 3);
  CHECK(zones[2].zone == "10A");
  const auto& z = zones[1].strategies;
  REQUIRE(z.size() == 2);
  CHECK(z[0].name == "b");  // median 3 before a's median 4
  CHECK(z[0].median_shortfall == 3);
  CHECK(z[0].worst_shortfall == 6);
  CHECK(z[0].wins == 2);
  CHECK(z[1].wins == 2);  // the tie at the second site counts for both
  CHECK(z[1].median_shortfall == 4);
  CHECK(*z[1].median_share == doctest::Approx(0.04));  // 0.02, 0.04, 0.04
  CHECK(*z[1].worst_share == doctest::Approx(0.04));
  CHECK(sv::median({1, 2, 3, 10}) == 2.5);
}

TEST_CASE("merge refuses another survey, a missing or repeated shard, a cut or interrupted file") {
  const Files f = files();
  const sv::Survey s(sv::read_manifest(f.manifest.string(), limitline::units::System::ip),
                     f.unit.string(), {}, options());
  const auto part = [&](std::size_t k, std::size_t n, const std::string& name) {
    std::string text = sv::header_line(s.info(), {k, n});
    std::size_t count = 0;
    (void)s.run({k, n}, [&](const sv::SiteRecord& r) {
      text += sv::record_line(r);
      ++count;
    });
    return std::make_pair(write(name, text), text + sv::end_line(count, true));
  };
  auto [p1, t1] = part(1, 2, "p1.jsonl");
  auto [p2, t2] = part(2, 2, "p2.jsonl");
  write("p1.jsonl", t1);
  write("p2.jsonl", t2);
  std::vector<std::size_t> rows;
  const auto info = sv::merge_partials({p2.string(), p1.string()},
                                       [&](const sv::SiteRecord& r) { rows.push_back(r.row); });
  CHECK(info.fingerprint == s.info().fingerprint);
  CHECK(rows == std::vector<std::size_t>{0, 1, 2, 3, 4});

  const auto error_of = [](const std::vector<std::string>& paths) {
    try {
      (void)sv::merge_partials(paths, [](const sv::SiteRecord&) {});
    } catch (const limitline::InputError& e) {
      return std::string(e.what());
    }
    return std::string("no error");
  };
  CHECK(error_of({p1.string()}) == "merge: 1 of 2 shards missing: 2/2");
  CHECK(error_of({p1.string(), p1.string()}).find("shard 1/2 is also") != std::string::npos);
  // Cut short: no end line.
  const auto cut = write("cut.jsonl", t2.substr(0, t2.rfind("{\"end\"")));
  CHECK(error_of({p1.string(), cut.string()}).find("ends without its end line") !=
        std::string::npos);
  // Interrupted.
  std::string stopped = t2;
  stopped.replace(stopped.find("\"complete\":true"), 15, "\"complete\":false");
  const auto intr = write("intr.jsonl", stopped);
  CHECK(error_of({p1.string(), intr.string()}).find("was interrupted") != std::string::npos);
  // Another survey: the same shard from another unit.
  write("unit2.toml", std::string(kUnit) + "[energy]\ncooling_weight = 2\n");
  sv::SurveyOptions o = options();
  const sv::Survey other(sv::read_manifest(f.manifest.string(), limitline::units::System::ip),
                         (scratch_dir(kSuite) / "unit2.toml").string(), {}, o);
  const auto p2b =
      write("p2b.jsonl", sv::header_line(other.info(), {2, 2}) + sv::end_line(0, true));
  CHECK(error_of({p1.string(), p2b.string()}).find("another survey") != std::string::npos);
  // A line no partial of ours would hold.
  const auto huge =
      write("huge.jsonl", t1.substr(0, t1.find('\n') + 1) + std::string(2 << 20, ' '));
  CHECK(error_of({huge.string(), p2.string()}).find(":2: a line longer than") != std::string::npos);
  // Not a partial at all.
  const auto junk = write("junk.jsonl", "{\"a\":1}\n");
  CHECK(error_of({junk.string()}).find("not a partial survey result") != std::string::npos);
  const auto bad = write("bad.jsonl", "{\"a\":\n");
  CHECK(error_of({bad.string()}).find(":1: column") != std::string::npos);
}

TEST_CASE("each site's figures are those `limitline year` gives for the same unit and site") {
  const Files f = files();
  const sv::Survey s(sv::read_manifest(f.manifest.string(), limitline::units::System::ip),
                     f.unit.string(), {}, options());
  const sv::SiteRecord r = s.evaluate(s.manifest().rows[0]);
  REQUIRE(r.ok);
  // The template with the row's [site] written out, run by `year`.
  const auto unit = write(
      "site-unit.toml", std::string("[site]\nname = \"Greensboro\"\nelevation = \"900ft\"\n"
                                    "energy_code = \"ashrae-90.1-2019\"\nclimate_zone = \"4A\"\n") +
                            kUnit);
  const auto y = run_cli({"year", unit.string(), "--weather", data("greensboro-nc-tmy3.csv"),
                          "--format", "json", "--units", "si"},
                         kSuite);
  REQUIRE(y.rc == 0);
  const auto doc = limitline::json::parse(y.out, "year json");
  const auto& results = doc.object("year", "doc").at("results").object("year", "results");
  for (const auto& f2 : r.strategies) {
    INFO(f2.name);
    const auto& o = results.at(f2.name).object("year", f2.name);
    // year --format json prints 8 significant digits.
    CHECK(o.at("shortfall_vs_perfect_kwh").number("year", "s") ==
          doctest::Approx(f2.shortfall).epsilon(1e-7));
    CHECK(o.at("harmful_hours").number("year", "h") == doctest::Approx(f2.harmful_hours));
  }
}

TEST_CASE("the CLI: text, the failed sites listed, exit 2, and -o whole") {
  const Files f = files();
  const auto r = run_cli({"survey", f.manifest.string(), f.unit.string(), "--wide"}, kSuite);
  CHECK(r.rc == 2);
  CHECK(r.out.find("Climate zone 4A") != std::string::npos);
  CHECK(r.out.find("Climate zone 5A") != std::string::npos);  // only its failed site
  CHECK(r.out.find("Sites that failed (the others are complete):") != std::string::npos);
  CHECK(r.out.find("- Missing (no-such-weather.csv): ") != std::string::npos);
  CHECK(r.out.find("- Corrupt (corrupt.csv): ") != std::string::npos);
  CHECK(r.out.find("Cautions:") != std::string::npos);
  const auto json =
      run_cli({"survey", f.manifest.string(), f.unit.string(), "--format", "json"}, kSuite);
  const auto doc = limitline::json::parse(json.out, "survey json");
  CHECK(doc.object("s", "doc").at("failed").number("s", "failed") == 2);
  const auto out = scratch_dir(kSuite) / "survey.html";
  const auto h = run_cli(
      {"survey", f.manifest.string(), f.unit.string(), "--format", "html", "-o", out.string()},
      kSuite);
  CHECK(h.rc == 2);
  const std::string page = slurp(out);
  CHECK(page.find("<svg") != std::string::npos);
  CHECK(page.find("Sites that failed") != std::string::npos);
  // Usage: --shard with a report format, a bad shard, a missing unit.
  CHECK(run_cli(
            {"survey", f.manifest.string(), f.unit.string(), "--shard", "1/2", "--format", "json"},
            kSuite)
            .rc == 1);
  CHECK(run_cli({"survey", f.manifest.string(), f.unit.string(), "--shard", "3/2"}, kSuite).rc ==
        2);
  CHECK(run_cli({"survey", f.manifest.string()}, kSuite).rc == 1);
}

TEST_CASE("examples/survey-parts holds what --shard 1/2 and 2/2 write today") {
  for (const char* k : {"1", "2"}) {
    CAPTURE(k);
    const auto out = scratch_dir(kSuite) / (std::string("part-") + k + ".jsonl");
    const auto r = run_cli({"survey", "examples/survey-sites.csv", "examples/survey-office.toml",
                            "--shard", std::string(k) + "/2", "-o", out.string()},
                           kSuite);
    REQUIRE(r.rc == 0);
    // When the model changes on purpose, rewrite them with the command above from the
    // source folder.
    CHECK(slurp(out) == slurp(std::filesystem::path(LIMITLINE_SOURCE_DIR) / "examples" /
                              "survey-parts" / (std::string("part-") + k + ".jsonl")));
  }
}

TEST_CASE("a folder is a manifest of its .csv files, each named by its file") {
  const auto dir = scratch_dir(kSuite) / "folder";
  std::filesystem::remove_all(dir);
  std::filesystem::create_directories(dir);
  std::filesystem::copy_file(data("greensboro-nc-tmy3.csv"), dir / "b-greensboro.csv");
  std::filesystem::copy_file(data("pvgis-tmy-45n-8e.csv"), dir / "a-piedmont.csv");
  std::ofstream(dir / "c-broken.csv") << "not a weather file\n";
  std::ofstream(dir / "notes.txt") << "not a site\n";
  const Files f = files();
  const auto r = run_cli(
      {"survey", dir.string(), f.unit.string(), "--format", "csv", "--table", "sites"}, kSuite);
  CHECK(r.rc == 2);
  // Sorted by name; the broken file is a failed site with its error, the text file no site.
  CHECK(r.out.find("a-piedmont") < r.out.find("b-greensboro"));
  CHECK(r.out.find("c-broken,") != std::string::npos);
  CHECK(r.out.find(",failed,") != std::string::npos);
  CHECK(r.out.find("notes") == std::string::npos);
  CHECK(r.err.find("1 site failed") != std::string::npos);
}

TEST_CASE("a shard stopped by Ctrl-C writes the sites it finished, marked incomplete (exit 130)") {
  // The second site is a named pipe: when the command opens it the first site is done, and it
  // waits there for the interrupt.
  const auto dir = scratch_dir(kSuite) / "interrupt";
  std::filesystem::remove_all(dir);
  std::filesystem::create_directories(dir);
  REQUIRE(::mkfifo((dir / "pipe.csv").c_str(), 0600) == 0);
  const auto manifest =
      write("interrupt/sites.csv", "weather\n" + data("greensboro-nc-tmy3.csv") + "\npipe.csv\n" +
                                       data("pvgis-tmy-45n-8e.csv") + "\n");
  const Files f = files();
  const auto part = dir / "part.jsonl";
  const pid_t pid =
      limitline::test::spawn_cli({"survey", manifest.string(), f.unit.string(), "--threads", "1",
                                  "--shard", "1/1", "-o", part.string()},
                                 "/dev/null", (dir / "err").string());
  const int w = ::open((dir / "pipe.csv").c_str(), O_WRONLY);
  REQUIRE(w >= 0);
  limitline::test::signal_and_wait_taken(pid, SIGINT);
  ::close(w);
  CHECK(limitline::test::wait_cli(pid) == 130);
  const std::string text = slurp(part);
  CHECK(text.find("\"row\":0,") != std::string::npos);
  CHECK(text.find("\"row\":2,") == std::string::npos);  // not started after the interrupt
  CHECK(text.find("{\"end\":true,\"sites\":2,\"complete\":false}") != std::string::npos);
  const auto m = run_cli({"merge", part.string()}, kSuite);
  CHECK(m.rc == 2);
  CHECK(m.err.find("was interrupted before its last site; run it again") != std::string::npos);
}
