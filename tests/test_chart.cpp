// The psychrometric chart (report/chart.hpp) and `limitline chart`.
//
// Every SVG is parsed by libxml2's xmllint and rendered by librsvg's rsvg-convert (Debian
// packages libxml2-utils and librsvg2-bin, installed by .ci/setup); the rendered PNG is read
// back by tests/tools/png_stats.js (Node's zlib) to show it is not blank. Geometry is read
// back out of the SVG text and mapped through ChartGeometry.
//
// Weather: tests/data/greensboro-nc-tmy3.csv (NREL TMY3, open data; tests/data/SOURCES.md) and
// the embedded invented demo climates. Unit files are invented scenarios of the test.
// The library before the test support: <sys/wait.h> brings a `si_value` macro from <signal.h>.
#include <limitline/model/psychro.hpp>
#include <limitline/report/chart.hpp>
#include <limitline/app/report_job.hpp>
#include <limitline/model/units.hpp>
#include <limitline/app/year_job.hpp>

#include "support/cli.hpp"
#include "support/svg.hpp"

#include <fmt/format.h>

#include <cmath>
#include <fstream>
#include <regex>

using namespace limitline;
using limitline::test::contains;
using limitline::test::run_cli;
using limitline::test::scratch_dir;
using limitline::test::slurp;
using limitline::test::svg::attr;
using limitline::test::svg::check_standalone;
using limitline::test::svg::check_svg_renders;
using limitline::test::svg::path_points;
using limitline::test::svg::tags_with;
using limitline::test::svg::Xy;

namespace {

constexpr double kHalfPixel = 0.5;

struct Demo {
  YearInputs in;
  annual::Prepared prepared;
};

const Demo& harbourside() {
  static const Demo d = [] {
    Demo x{load_year_inputs(demo_unit("harbourside"), {}), {}};
    x.prepared = prepare_year(x.in);
    return x;
  }();
  return d;
}

report::ChartInput demo_chart(units::System s) {
  const Demo& d = harbourside();
  report::ChartInput c = chart_input(d.in.unit, d.in.strategies, s);
  add_climate(c, d.prepared, d.in.weather_label);
  return c;
}

std::filesystem::path greensboro_unit(const std::string& name, const std::string& strategies) {
  const auto p = scratch_dir("chart") / name;
  std::ofstream(p)
      << "[site]\nname = \"test clinic (invented)\"\npressure = \"98kPa\"\n"
         "[air_handler]\nsupply_airflow = \"4000cfm\"\nsupply_air_temp = \"56F\"\n"
         "min_outdoor_air = \"25%\"\nreturn_air_temp = \"74F\"\nreturn_air_rh = \"45%\"\n"
      << strategies;
  return p;
}

std::string greensboro() {
  return std::string(LIMITLINE_TEST_DATA_DIR) + "/greensboro-nc-tmy3.csv";
}

}  // namespace

TEST_CASE("chart geometry maps dry-bulb and humidity ratio linearly and back") {
  const report::ChartGeometry g(-5.0, 45.0, 0.026, {48, 84, 812, 500});
  CHECK(g.x(-5.0) == doctest::Approx(48.0));
  CHECK(g.x(45.0) == doctest::Approx(860.0));
  CHECK(g.y(0.0) == doctest::Approx(584.0));
  CHECK(g.y(0.026) == doctest::Approx(84.0));
  for (double t : {-5.0, 0.0, 12.3, 44.9}) CHECK(g.dry_bulb_c(g.x(t)) == doctest::Approx(t));
  for (double w : {0.0, 0.004, 0.0199}) CHECK(g.humidity_ratio(g.y(w)) == doctest::Approx(w));
  CHECK_THROWS_AS(report::ChartGeometry(10, 10, 0.02, {0, 0, 100, 100}), std::invalid_argument);
  CHECK_THROWS_AS(report::ChartGeometry(0, 10, 0.0, {0, 0, 100, 100}), std::invalid_argument);
  CHECK_THROWS_AS(report::ChartGeometry(0, 10, 0.02, {0, 0, 0, 100}), std::invalid_argument);
  CHECK_THROWS_AS(report::ChartGeometry(0, std::nan(""), 0.02, {0, 0, 100, 100}),
                  std::invalid_argument);
}

TEST_CASE("the chart range covers every occupied hour and widens only to whole ticks") {
  const auto c = demo_chart(units::System::ip);
  const auto g = report::chart_geometry(c);
  double t_lo = 1e9, t_hi = -1e9, w_hi = 0;
  for (const auto& h : c.climate) {
    t_lo = std::min(t_lo, h.outdoor.dry_bulb_c);
    t_hi = std::max(t_hi, h.outdoor.dry_bulb_c);
    w_hi = std::max(w_hi, h.outdoor.humidity_ratio);
  }
  CHECK(g.dry_bulb_min_c() <= t_lo);
  CHECK(g.dry_bulb_max_c() >= t_hi);
  CHECK(g.humidity_ratio_max() >= w_hi);
  // Whole 10 °F ticks and 20 gr/lb (7000 grains to the pound, common practice).
  const double f0 = units::fahrenheit_from_celsius(g.dry_bulb_min_c());
  const double f1 = units::fahrenheit_from_celsius(g.dry_bulb_max_c());
  CHECK(std::fabs(f0 / 10 - std::round(f0 / 10)) < 1e-9);
  CHECK(std::fabs(f1 / 10 - std::round(f1 / 10)) < 1e-9);
  CHECK(std::fabs(g.humidity_ratio_max() * 7000 / 20 -
                  std::round(g.humidity_ratio_max() * 7000 / 20)) < 1e-9);
  // The default 20–110 °F is kept when the climate lies inside it.
  CHECK(f0 <= 20.0 + 1e-9);
  CHECK(f1 >= 110.0 - 1e-9);
  CHECK(f1 <= 110.0 + 1e-9);
}

TEST_CASE("points of the drawn saturation curve map back to saturation within half a pixel") {
  for (const units::System s : {units::System::ip, units::System::si}) {
    for (const std::string demo : {"harbourside", "mesa-alta"}) {
      CAPTURE(demo);
      const YearInputs in = load_year_inputs(demo_unit(demo), {});
      const report::ChartInput c = chart_input(in.unit, in.strategies, s);
      const auto g = report::chart_geometry(c);
      const std::string svg = report::psychrometric_chart_svg(c);
      const auto tags = tags_with(svg, {"id=\"saturation\""});
      REQUIRE(tags.size() == 1);
      const auto pts = path_points(attr(tags[0], "d"));
      REQUIRE(pts.size() > 100);
      double worst = 0, worst_sea_level = 0;
      for (const auto& p : pts) {
        const double t = g.dry_bulb_c(p.x);
        const double ws = psychro::saturation_humidity_ratio(t, c.pressure_kpa);
        if (ws > g.humidity_ratio_max()) continue;  // clipped at the top edge
        worst = std::max(worst, std::fabs(g.y(ws) - p.y));
        worst_sea_level = std::max(
            worst_sea_level,
            std::fabs(g.y(psychro::saturation_humidity_ratio(t, psychro::kStandardPressureKpa)) -
                      p.y));
      }
      CHECK(worst < kHalfPixel);
      // The chart is drawn at the site pressure: Mesa Alta (about 1800 m) is visibly not sea level.
      if (demo == "mesa-alta") CHECK(worst_sea_level > 5.0);
      // It ends where it meets the top edge, or at the right edge.
      CHECK((std::fabs(pts.back().y - g.area().top) < kHalfPixel ||
             std::fabs(pts.back().x - (g.area().left + g.area().width)) < kHalfPixel));
    }
  }
}

TEST_CASE("the saturation curve passes through a handbook saturation state") {
  // Saturation pressure of water at 20 °C: 2.339 kPa (ASHRAE Handbook—Fundamentals 2017 ch. 1
  // Table 3, from memory), so by eq. 23 at 101.325 kPa W_s = 0.621945·2.339/(101.325 − 2.339).
  // (Table 2's 0.01476 includes the enhancement factor, which the model leaves out.)
  const double ws20 = 0.621945 * 2.339 / (101.325 - 2.339);
  report::ChartInput c;
  c.units = units::System::si;
  c.pressure_kpa = 101.325;
  c.return_air = {24.0, 0.009};
  const auto g = report::chart_geometry(c);
  const auto pts = path_points(
      attr(tags_with(report::psychrometric_chart_svg(c), {"id=\"saturation\""}).at(0), "d"));
  // The drawn point nearest 20 °C, interpolated to 20 °C exactly.
  const double x20 = g.x(20.0);
  for (std::size_t i = 0; i + 1 < pts.size(); ++i) {
    if (pts[i].x <= x20 && pts[i + 1].x >= x20) {
      const double u = (x20 - pts[i].x) / (pts[i + 1].x - pts[i].x);
      const double y = pts[i].y + u * (pts[i + 1].y - pts[i].y);
      CHECK(std::fabs(y - g.y(ws20)) < kHalfPixel);
      return;
    }
  }
  FAIL("20 °C is not on the drawn curve");
}

TEST_CASE("each high-limit line sits where its limit is") {
  const auto c = demo_chart(units::System::ip);
  const auto g = report::chart_geometry(c);
  const std::string svg = report::psychrometric_chart_svg(c);
  const double p = c.pressure_kpa;

  SUBCASE("a fixed dry-bulb limit is a vertical line at its dry-bulb, up to saturation") {
    // The demo unit file sets 65 °F and 75 °F.
    for (const auto& [name, limit_f] :
         {std::pair{"fixed dry-bulb 65F", 65.0}, std::pair{"fixed dry-bulb 75F", 75.0}}) {
      const auto tags =
          tags_with(svg, {"class=\"boundary\"", std::string("data-strategy=\"") + name + "\"",
                          "data-quantity=\"dry-bulb\""});
      REQUIRE(tags.size() == 1);
      const auto pts = path_points(attr(tags[0], "d"));
      REQUIRE(pts.size() == 2);
      const double t = units::celsius_from_fahrenheit(limit_f);
      for (const auto& pt : pts) CHECK(std::fabs(pt.x - g.x(t)) < kHalfPixel);
      CHECK(std::fabs(std::max(pts[0].y, pts[1].y) - g.y(0.0)) < kHalfPixel);
      const double top = std::min(psychro::saturation_humidity_ratio(t, p), g.humidity_ratio_max());
      CHECK(std::fabs(std::min(pts[0].y, pts[1].y) - g.y(top)) < kHalfPixel);
    }
  }
  SUBCASE("a differential dry-bulb line stands at the return-air dry-bulb") {
    const auto tags =
        tags_with(svg, {"data-strategy=\"differential dry-bulb\"", "data-reference=\"return\""});
    REQUIRE(tags.size() == 1);
    for (const auto& pt : path_points(attr(tags[0], "d")))
      CHECK(std::fabs(pt.x - g.x(c.return_air.dry_bulb_c)) < kHalfPixel);
  }
  SUBCASE(
      "a fixed enthalpy limit follows its constant-enthalpy line, and the dry-bulb limit ends on "
      "it") {
    const double h = units::enthalpy_si_from_ip(28.0);  // the demo's 28 Btu/lb
    const auto e = tags_with(
        svg, {"data-strategy=\"fixed enthalpy + dry-bulb\"", "data-quantity=\"enthalpy\""});
    REQUIRE(e.size() == 1);
    const auto pts = path_points(attr(e[0], "d"));
    REQUIRE(pts.size() > 10);
    for (const auto& pt : pts) {
      const double t = g.dry_bulb_c(pt.x);
      CHECK(std::fabs(g.y(psychro::humidity_ratio_from_enthalpy(t, h)) - pt.y) < kHalfPixel);
    }
    // It runs from the saturation curve to the 75 °F limit, where the other condition trips.
    const double t75 = units::celsius_from_fahrenheit(75.0);
    CHECK(std::fabs(pts.back().x - g.x(t75)) < kHalfPixel);
    const double t_start = g.dry_bulb_c(pts.front().x);
    CHECK(std::fabs(g.y(psychro::saturation_humidity_ratio(t_start, p)) - pts.front().y) <
          kHalfPixel);
    const auto d = tags_with(
        svg, {"data-strategy=\"fixed enthalpy + dry-bulb\"", "data-quantity=\"dry-bulb\""});
    REQUIRE(d.size() == 1);
    const auto dp = path_points(attr(d[0], "d"));
    CHECK(std::fabs(std::min(dp[0].y, dp[1].y) -
                    g.y(psychro::humidity_ratio_from_enthalpy(t75, h))) < kHalfPixel);
  }
  SUBCASE("a dew-point limit is a horizontal line at its humidity ratio") {
    const double w =
        psychro::humidity_ratio_from_dew_point(units::celsius_from_fahrenheit(55.0), p);
    const auto tags =
        tags_with(svg, {"data-strategy=\"dew point + dry-bulb\"", "data-quantity=\"dew-point\""});
    REQUIRE(tags.size() == 1);
    const auto pts = path_points(attr(tags[0], "d"));
    for (const auto& pt : pts) CHECK(std::fabs(pt.y - g.y(w)) < kHalfPixel);
    CHECK(std::fabs(pts.front().x - g.x(units::celsius_from_fahrenheit(55.0))) <
          kHalfPixel);  // starts saturated
    CHECK(std::fabs(pts.back().x - g.x(units::celsius_from_fahrenheit(75.0))) <
          kHalfPixel);  // ends at 75 °F
  }
  SUBCASE("the return air and the mixed-air target are marked") {
    const auto r = tags_with(svg, {"class=\"return-air\""});
    REQUIRE(r.size() == 1);
    const auto rp = path_points(attr(r[0], "d"));  // a diamond around the state
    CHECK(std::fabs(rp[0].x - g.x(c.return_air.dry_bulb_c)) < kHalfPixel);
    CHECK(std::fabs(rp[1].y - g.y(c.return_air.humidity_ratio)) < kHalfPixel);
    const auto m = tags_with(svg, {"class=\"mixed-air-target\""});
    REQUIRE(m.size() == 1);
    // 55 °F supply less 1.5 °F fan heat (the demo unit file).
    CHECK(std::fabs(path_points(attr(m[0], "d"))[0].x - g.x(units::celsius_from_fahrenheit(53.5))) <
          kHalfPixel);
    CHECK(contains(svg, "mixed-air target 53.5 °F"));
  }
}

TEST_CASE("the climate overlay counts every occupied hour by the perfect changeover's outcome") {
  const Demo& d = harbourside();
  const auto c = demo_chart(units::System::ip);
  double econ = 0, not_econ = 0, none = 0;
  for (const auto& iv : d.prepared.intervals) {
    if (!iv.cooling_needed)
      none += iv.hours;
    else if (iv.enabling_pays())
      econ += iv.hours;
    else
      not_econ += iv.hours;
  }
  const std::string svg = report::psychrometric_chart_svg(c);
  CHECK(contains(svg, fmt::format("economize {:.0f} h", econ)));
  CHECK(contains(svg, fmt::format("do not economize {:.0f} h", not_econ)));
  CHECK(contains(svg, fmt::format("no cooling needed {:.0f} h", none)));
  CHECK(contains(svg, fmt::format("{:.0f} h in all", d.prepared.operating_hours)));
  // The perfect changeover economizes in exactly the hours it pays.
  const auto year = annual::evaluate(d.in.strategies, d.prepared);
  CHECK(year.perfect_changeover.annual.hours_economizing == doctest::Approx(econ));
  // Each cell is one 1 °F × 5 gr/lb bin, inside the plot.
  const auto g = report::chart_geometry(c);
  const auto cells = tags_with(svg, {"fill-opacity=\"0."});
  std::size_t inside = 0;
  for (const auto& t : cells) {
    const double x = std::stod(attr(t, "x")), y = std::stod(attr(t, "y"));
    const double w = std::stod(attr(t, "width")), h = std::stod(attr(t, "height"));
    if (y < g.area().top - 1e-6 || y + h > g.area().top + g.area().height + 1e-6)
      continue;  // legend keys
    ++inside;
    CHECK(w == doctest::Approx(g.x(units::celsius_from_fahrenheit(1.0)) -
                               g.x(units::celsius_from_fahrenheit(0.0)))
                   .epsilon(0.01));
    CHECK(h == doctest::Approx(g.y(0.0) - g.y(5.0 / 7000.0)).epsilon(0.01));
    CHECK(x >= g.area().left - 1e-6);
    CHECK(x + w <= g.area().left + g.area().width + 1e-6);
  }
  CHECK(inside > 100);
}

TEST_CASE(
    "overlay cells widen when the weather was recorded in whole degrees of the other system") {
  // The demo climate is recorded to 0.1 °C: the finest cells, 1 °F × 5 gr/lb and 0.5 °C × 0.5 g/kg.
  const auto climate = report::climate_hours(harbourside().prepared);
  auto ip = report::overlay_bin_size(climate, units::System::ip);
  CHECK(ip.dry_bulb == 1.0);
  CHECK(ip.humidity_ratio == 5.0);
  auto si = report::overlay_bin_size(climate, units::System::si);
  CHECK(si.dry_bulb == 0.5);
  CHECK(si.humidity_ratio == 0.5);
  // Whole °C readings are 1.8 °F apart, so 1 °F columns would alternate full and empty.
  std::vector<report::ClimateHour> whole_c;
  for (int t = -5; t <= 35; ++t)
    for (double w : {0.004, 0.006, 0.008})
      whole_c.push_back({{static_cast<double>(t), w}, 1.0, report::HourOutcome::economize});
  ip = report::overlay_bin_size(whole_c, units::System::ip);
  CHECK(ip.dry_bulb == 2.0);
  // Whole °F readings are 0.56 °C apart: 0.5 °C columns leave every ninth one empty.
  std::vector<report::ClimateHour> whole_f;
  for (int f = 20; f <= 100; ++f)
    whole_f.push_back(
        {{units::celsius_from_fahrenheit(f), 0.006}, 1.0, report::HourOutcome::economize});
  si = report::overlay_bin_size(whole_f, units::System::si);
  CHECK(si.dry_bulb == 1.0);
  // The chart says which cell it used.
  report::ChartInput c = chart_input(harbourside().in.unit, {}, units::System::ip);
  c.climate = whole_c;
  CHECK(contains(report::psychrometric_chart_svg(c), "one cell = 2 °F × 5 gr/lb"));
}

TEST_CASE("charts parse as XML, are standalone and render to a picture that is not blank") {
  for (const units::System s : {units::System::ip, units::System::si}) {
    const auto c = demo_chart(s);
    const std::string svg = report::psychrometric_chart_svg(c);
    check_standalone(svg);
    check_svg_renders(svg, "chart",
                      std::string("psychrometric-") + std::string(units::system_name(s)));
    CHECK(contains(svg, s == units::System::ip ? "GRAINS PER LB" : "G PER KG"));
    CHECK(contains(svg, s == units::System::ip
                            ? "14.678 psia"
                            : "101.20 kPa"));  // standard pressure at 33 ft, eq. 3
  }
}

TEST_CASE("limitline chart writes the demo chart and one checked point") {
  const auto dir = scratch_dir("chart");
  const auto out = (dir / "cli-demo.svg").string();
  auto r = run_cli({"chart", "-o", out}, "chart");
  REQUIRE(r.rc == 0);
  std::string svg = slurp(out);
  check_standalone(svg);
  CHECK(contains(svg, "class=\"climate\""));
  for (const auto& st : harbourside().in.strategies)
    CHECK(contains(svg, "data-strategy=\"" + st.name + "\""));

  // One point: outdoor, return and the mixed air on the line between them.
  const auto pt = (dir / "cli-point.svg").string();
  r = run_cli({"chart", "--outdoor", "68F/80%", "--return", "75F/50%", "-o", pt}, "chart");
  REQUIRE(r.rc == 0);
  svg = slurp(pt);
  check_standalone(svg);
  check_svg_renders(svg, "chart", "point");
  CHECK_FALSE(contains(svg, "class=\"climate\""));
  const auto o = tags_with(svg, {"class=\"outdoor\""}), m = tags_with(svg, {"class=\"mixed-air\""}),
             ret = tags_with(svg, {"class=\"return-air\""});
  REQUIRE((o.size() == 1 && m.size() == 1 && ret.size() == 1));
  const Xy po{std::stod(attr(o[0], "cx")), std::stod(attr(o[0], "cy"))};
  const Xy pm{std::stod(attr(m[0], "x")) + 5.5, std::stod(attr(m[0], "y")) + 5.5};
  const auto rd = path_points(attr(ret[0], "d"));
  const Xy pr{rd[0].x, rd[1].y};
  const double cross = (pm.x - po.x) * (pr.y - po.y) - (pm.y - po.y) * (pr.x - po.x);
  CHECK(std::fabs(cross) / std::hypot(pr.x - po.x, pr.y - po.y) < kHalfPixel);
  CHECK(contains(svg, "outdoor 68.0 °F, 80% RH"));
  CHECK(contains(svg, "return 75.0 °F, 50% RH"));

  // Only the strategies asked for.
  const auto one = (dir / "cli-one.svg").string();
  REQUIRE(run_cli({"chart", "--strategy", "fixed dry-bulb 65F", "-o", one}, "chart").rc == 0);
  svg = slurp(one);
  CHECK(contains(svg, "data-strategy=\"fixed dry-bulb 65F\""));
  CHECK_FALSE(contains(svg, "data-strategy=\"fixed dry-bulb 75F\""));
}

TEST_CASE("limitline chart reads a real weather year with a unit file") {
  const auto unit = greensboro_unit("gso.toml", R"(
[[strategy]]
name = "enthalpy 28"
preset = "fixed-enthalpy"
enthalpy_limit = "28btu/lb"
)");
  const auto out = (scratch_dir("chart") / "gso.svg").string();
  const auto r = run_cli(
      {"chart", unit.string(), "--weather", greensboro(), "--units", "si", "-o", out}, "chart");
  REQUIRE(r.rc == 0);
  const std::string svg = slurp(out);
  check_standalone(svg);
  check_svg_renders(svg, "chart", "greensboro");
  // Greensboro has hours below −5 °C (TMY3 file, dry-bulb column): the chart widens to show them.
  CHECK(contains(svg, ">-10</text>"));
  CHECK(contains(svg, "data-strategy=\"enthalpy 28\""));

  // A checked point on top of the same climate.
  const auto both = (scratch_dir("chart") / "gso-point.svg").string();
  REQUIRE(run_cli({"chart", unit.string(), "--weather", greensboro(), "--outdoor", "20C/dp15C",
                   "--units", "si", "-o", both},
                  "chart")
              .rc == 0);
  const std::string svg2 = slurp(both);
  CHECK(contains(svg2, "class=\"climate\""));
  CHECK(contains(svg2, "class=\"outdoor\""));
  CHECK(contains(svg2, "class=\"mixed-air\""));
}

TEST_CASE("bad chart input is a one-line error naming the option") {
  auto r = run_cli({"chart", "--return", "75F/50%", "-o", "-"}, "chart");
  CHECK(r.rc == 1);
  CHECK(contains(r.err, "--return needs --outdoor"));
  r = run_cli({"chart", "--outdoor", "68F/120%", "-o", "-"}, "chart");
  CHECK(r.rc == 2);
  CHECK(contains(r.err, "--outdoor"));
  CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
  r = run_cli({"chart", "--outdoor", "68F", "-o", "-"}, "chart");
  CHECK(r.rc == 2);
  CHECK(contains(r.err, "--outdoor"));
  r = run_cli({"chart", "--strategy", "no such thing", "-o", "-"}, "chart");
  CHECK(r.rc == 2);
  CHECK(contains(r.err, "'no such thing' is not a strategy"));
  CHECK(contains(r.err, "'fixed dry-bulb 65F'"));
  r = run_cli({"chart", "-o", "/nonexistent-dir/x.svg"}, "chart");
  CHECK(r.rc == 2);
  CHECK(contains(r.err, "--output: cannot write '/nonexistent-dir/x.svg'"));
  r = run_cli({"chart", "--units", "metric"}, "chart");
  CHECK(r.rc == 1);
}
