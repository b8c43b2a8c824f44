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
#include <limitline/model/air_point.hpp>
#include <limitline/model/psychro.hpp>
#include <limitline/report/chart.hpp>
#include <limitline/app/report_job.hpp>
#include <limitline/model/units.hpp>
#include <limitline/app/year_job.hpp>

#include "support/cli.hpp"
#include "support/svg.hpp"

#include <fmt/format.h>

#include <cmath>
#include <algorithm>
#include <fstream>
#include <regex>
#include <set>
#include <sstream>

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

// The demo's six strategies and a seventh, the demo's 28 Btu/lb enthalpy limit alone, which
// shares the enthalpy line of "fixed enthalpy + dry-bulb" up to the 75 °F cut.
std::vector<highlimit::Strategy> seven_strategies(std::vector<highlimit::Strategy> six) {
  highlimit::Strategy alone;
  for (const auto& st : six)
    if (st.name == "fixed enthalpy + dry-bulb")
      for (std::size_t i = 0; i < st.conditions.size(); ++i)
        if (st.conditions[i].quantity == highlimit::Quantity::enthalpy) {
          alone.conditions.push_back(st.conditions[i]);
          alone.sources.push_back(st.source(i));
        }
  alone.name = "fixed enthalpy alone";
  six.push_back(alone);
  return six;
}

// What the chart wrote: each boundary segment with its strategy numbers, each badge group,
// and every box (badges, line labels, mark labels, the mixed-air target label).
struct Written {
  struct Line {
    std::vector<int> members;
    std::string quantity;
    double key_si;
    std::vector<Xy> pts;
  };
  struct Badge {
    std::vector<int> members;
    Xy centre;
  };
  struct Box {
    double x0, y0, x1, y1;
    std::string tag;
  };
  std::vector<Line> lines;
  std::vector<Badge> badges;
  std::vector<Box> boxes;
};

std::vector<int> numbers(const std::string& s) {
  std::vector<int> out;
  std::istringstream in(s);
  for (int n; in >> n;) out.push_back(n);
  return out;
}

Written read_back(const std::string& svg) {
  Written w;
  for (const auto& t : tags_with(svg, {"class=\"boundary\""}))
    w.lines.push_back({numbers(attr(t, "data-strategies")), attr(t, "data-quantity"),
                       std::stod(attr(t, "data-line-si")), path_points(attr(t, "d"))});
  for (const auto& t : tags_with(svg, {"class=\"badge\""}))
    w.badges.push_back({numbers(attr(t, "data-strategies")),
                        {std::stod(attr(t, "data-cx")), std::stod(attr(t, "data-cy"))}});
  for (const auto& t : tags_with(svg, {"data-box=\""})) {
    std::istringstream in(attr(t, "data-box"));
    Written::Box b{0, 0, 0, 0, t};
    in >> b.x0 >> b.y0 >> b.x1 >> b.y1;
    w.boxes.push_back(b);
  }
  return w;
}

double distance_to_path(const Xy& p, const std::vector<Xy>& pts) {
  double best = 1e9;
  for (std::size_t i = 0; i + 1 < pts.size(); ++i) {
    const double dx = pts[i + 1].x - pts[i].x, dy = pts[i + 1].y - pts[i].y;
    const double len2 = dx * dx + dy * dy;
    const double u =
        len2 > 0 ? std::clamp(((p.x - pts[i].x) * dx + (p.y - pts[i].y) * dy) / len2, 0.0, 1.0)
                 : 0.0;
    best = std::min(best, std::hypot(p.x - pts[i].x - u * dx, p.y - pts[i].y - u * dy));
  }
  return best;
}

// The placement rules every chart keeps: each badge on a line of exactly its strategies,
// inside the plot and under the saturation curve; every strategy with a line named by a
// badge; no two written boxes overlapping.
void check_placement(const report::ChartInput& c, const std::string& svg) {
  const auto g = report::chart_geometry(c);
  const Written w = read_back(svg);
  REQUIRE(!w.lines.empty());
  REQUIRE(!w.badges.empty());
  constexpr double kOnLinePx = 3.0;
  for (const auto& b : w.badges) {
    CAPTURE(b.centre.x);
    CAPTURE(b.centre.y);
    double nearest = 1e9;
    for (const auto& l : w.lines)
      if (l.members == b.members) nearest = std::min(nearest, distance_to_path(b.centre, l.pts));
    CHECK(nearest < kOnLinePx);
    CHECK(b.centre.x > g.area().left);
    CHECK(b.centre.x < g.area().left + g.area().width);
    CHECK(b.centre.y > g.area().top);
    CHECK(b.centre.y < g.area().top + g.area().height);
    // Saturation from the model's own property equations (ASHRAE Fundamentals ch. 1, eq. 23).
    const double t = g.dry_bulb_c(b.centre.x);
    CHECK(g.humidity_ratio(b.centre.y) <=
          psychro::saturation_humidity_ratio(t, c.pressure_kpa) + 1e-9);
  }
  for (const auto& l : w.lines)
    for (const int m : l.members) {
      CAPTURE(m);
      CHECK(std::any_of(w.badges.begin(), w.badges.end(), [&](const Written::Badge& b) {
        return std::find(b.members.begin(), b.members.end(), m) != b.members.end();
      }));
    }
  REQUIRE(w.boxes.size() > w.badges.size());
  for (std::size_t i = 0; i < w.boxes.size(); ++i)
    for (std::size_t j = i + 1; j < w.boxes.size(); ++j) {
      const auto &a = w.boxes[i], &b = w.boxes[j];
      const bool overlap =
          a.x0 < b.x1 - 0.01 && b.x0 < a.x1 - 0.01 && a.y0 < b.y1 - 0.01 && b.y0 < a.y1 - 0.01;
      if (overlap) FAIL_CHECK("overlapping boxes:\n  " << a.tag << "\n  " << b.tag);
    }
}

// The points of every segment that bounds strategy number `m` on lines of `quantity`.
std::vector<Xy> line_of(const std::string& svg, int m, const std::string& quantity) {
  std::vector<Xy> out;
  for (const auto& l : read_back(svg).lines)
    if (l.quantity == quantity &&
        std::find(l.members.begin(), l.members.end(), m) != l.members.end())
      out.insert(out.end(), l.pts.begin(), l.pts.end());
  return out;
}

double min_y(const std::vector<Xy>& pts) {
  double y = 1e9;
  for (const auto& p : pts) y = std::min(y, p.y);
  return y;
}
double max_y(const std::vector<Xy>& pts) {
  double y = -1e9;
  for (const auto& p : pts) y = std::max(y, p.y);
  return y;
}

report::CheckMarks demo_point(const report::ChartInput& c, const std::string& outdoor) {
  const Demo& d = harbourside();
  std::vector<std::string> warnings;
  const AirPoint o =
      parse_air_point(outdoor, units::System::ip, "outdoor", AirRole::outdoor, warnings);
  return check_marks(d.in.unit, c.strategies, o, "outdoor", d.in.unit.return_air, "return air");
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
    // The demo unit file sets 65 °F (strategy 1) and 75 °F (strategy 2); the 75 °F line is
    // shared with others and drawn in pieces, which together reach from W = 0 to saturation.
    for (const auto& [number, limit_f] : {std::pair{1, 65.0}, std::pair{2, 75.0}}) {
      const auto pts = line_of(svg, number, "dry-bulb");
      REQUIRE(pts.size() >= 2);
      const double t = units::celsius_from_fahrenheit(limit_f);
      for (const auto& pt : pts) CHECK(std::fabs(pt.x - g.x(t)) < kHalfPixel);
      CHECK(std::fabs(max_y(pts) - g.y(0.0)) < kHalfPixel);
      const double top = std::min(psychro::saturation_humidity_ratio(t, p), g.humidity_ratio_max());
      CHECK(std::fabs(min_y(pts) - g.y(top)) < kHalfPixel);
    }
    CHECK(tags_with(svg, {"class=\"boundary\"", "data-strategy=\"fixed dry-bulb 65F\""}).size() ==
          1);
  }
  SUBCASE("a differential dry-bulb line stands at the return-air dry-bulb") {
    const auto pts = line_of(svg, 3, "dry-bulb");
    REQUIRE(pts.size() >= 2);
    for (const auto& pt : pts) CHECK(std::fabs(pt.x - g.x(c.return_air.dry_bulb_c)) < kHalfPixel);
    CHECK(!tags_with(svg, {"class=\"boundary\"", "data-strategies=\"2 3 4 5 6\"",
                           "data-reference=\"fixed return\""})
               .empty());
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
    const auto dp = line_of(svg, 4, "dry-bulb");
    REQUIRE(dp.size() >= 2);
    CHECK(std::fabs(min_y(dp) - g.y(psychro::humidity_ratio_from_enthalpy(t75, h))) < kHalfPixel);
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

TEST_CASE("strategies sharing a line draw it once, with one badge group naming them") {
  SUBCASE("two strategies with the same 65 °F limit") {
    const Demo& d = harbourside();
    auto twins = std::vector<highlimit::Strategy>{d.in.strategies.at(0), d.in.strategies.at(0)};
    twins[1].name = "the same limit again";
    report::ChartInput c = chart_input(d.in.unit, twins, units::System::ip);
    const std::string svg = report::psychrometric_chart_svg(c);
    const Written w = read_back(svg);
    REQUIRE(w.lines.size() == 1);
    CHECK(w.lines[0].members == std::vector<int>{1, 2});
    REQUIRE(w.badges.size() == 1);
    CHECK(w.badges[0].members == std::vector<int>{1, 2});
    // Both names stay in the legend.
    CHECK(contains(svg, "the same limit again"));
    check_placement(c, svg);
  }
  SUBCASE("the demo's 75 °F vertical, shared by five strategies") {
    auto c = demo_chart(units::System::ip);
    const std::string svg = report::psychrometric_chart_svg(c);
    const auto g = report::chart_geometry(c);
    const double x75 = g.x(units::celsius_from_fahrenheit(75.0));
    std::vector<Written::Line> on75;
    for (const auto& l : read_back(svg).lines)
      if (l.quantity == "dry-bulb" && std::fabs(l.pts.front().x - x75) < kHalfPixel)
        on75.push_back(l);
    REQUIRE(on75.size() >= 2);
    // The pieces tile the line: no height of it is drawn twice.
    std::vector<std::pair<double, double>> spans;
    for (const auto& l : on75) spans.push_back({min_y(l.pts), max_y(l.pts)});
    std::sort(spans.begin(), spans.end());
    for (std::size_t i = 0; i + 1 < spans.size(); ++i)
      CHECK(spans[i].second <= spans[i + 1].first + 1e-6);
    // From W = 0 up to the dew-point line all five share it (strategy 1 is the 65 °F line).
    const auto bottom =
        std::max_element(on75.begin(), on75.end(),
                         [](const auto& a, const auto& b) { return max_y(a.pts) < max_y(b.pts); });
    CHECK(bottom->members == std::vector<int>{2, 3, 4, 5, 6});
    const Written w = read_back(svg);
    CHECK(std::count_if(w.badges.begin(), w.badges.end(), [](const Written::Badge& b) {
            return b.members == std::vector<int>{2, 3, 4, 5, 6};
          }) == 1);
  }
}

TEST_CASE("badges sit on their own lines under saturation, and nothing written overlaps") {
  const Demo& d = harbourside();
  SUBCASE("the demo year with seven strategies") {
    auto c = demo_chart(units::System::ip);
    c.strategies = seven_strategies(c.strategies);
    const std::string svg = report::psychrometric_chart_svg(c);
    check_placement(c, svg);
    check_svg_renders(svg, "chart", "placement-demo");
    // The seventh shares the 28 Btu/lb line with strategy 4.
    bool shared = false;
    for (const auto& l : read_back(svg).lines)
      shared = shared || (l.quantity == "enthalpy" && l.members == std::vector<int>{4, 7});
    CHECK(shared);
  }
  SUBCASE("the demo in SI with seven strategies") {
    auto c = demo_chart(units::System::si);
    c.strategies = seven_strategies(c.strategies);
    check_placement(c, report::psychrometric_chart_svg(c));
  }
  for (const std::string outdoor : {"68F/80%", "90F/40%", "55F/95%", "75F/50%"}) {
    SUBCASE(("one checked point, outdoor " + outdoor).c_str()) {
      report::ChartInput c =
          chart_input(d.in.unit, seven_strategies(d.in.strategies), units::System::ip);
      c.check = demo_point(c, outdoor);
      c.return_air = c.check->ret;
      check_placement(c, report::psychrometric_chart_svg(c));
    }
  }
  SUBCASE("the high-altitude demo in SI") {
    const YearInputs in = load_year_inputs(demo_unit("mesa-alta"), {});
    report::ChartInput c = chart_input(in.unit, seven_strategies(in.strategies), units::System::si);
    add_climate(c, prepare_year(in), in.weather_label);
    check_placement(c, report::psychrometric_chart_svg(c));
  }
  for (const units::System s : {units::System::ip, units::System::si}) {
    SUBCASE(("a real TMY3 year (Greensboro NC), " + std::string(units::system_name(s))).c_str()) {
      WeatherOverrides w;
      w.file = greensboro();
      const YearInputs in =
          load_year_inputs({greensboro_unit("gso-seven.toml", "").string(), false}, w);
      report::ChartInput c = chart_input(in.unit, seven_strategies(d.in.strategies), s);
      add_climate(c, prepare_year(in), in.weather_label);
      check_placement(c, report::psychrometric_chart_svg(c));
    }
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
  // (1 °C = 1.8 °F exactly, by definition of the scales): columns one reading wide, centred.
  ip = report::overlay_bin_size(whole_c, units::System::ip);
  CHECK(ip.dry_bulb == doctest::Approx(1.8));
  CHECK(ip.dry_bulb_origin == doctest::Approx(31.1));  // −0.5 °C
  // Whole °F readings are 0.56 °C apart: 0.5 °C columns would leave every ninth one empty.
  std::vector<report::ClimateHour> whole_f;
  for (int f = 20; f <= 100; ++f)
    whole_f.push_back(
        {{units::celsius_from_fahrenheit(f), 0.006}, 1.0, report::HourOutcome::economize});
  si = report::overlay_bin_size(whole_f, units::System::si);
  CHECK(si.dry_bulb == doctest::Approx(5.0 / 9.0));
  CHECK(si.dry_bulb_origin == doctest::Approx(units::celsius_from_fahrenheit(-0.5)));
  // The chart says which cell it used.
  report::ChartInput c = chart_input(harbourside().in.unit, {}, units::System::ip);
  c.climate = whole_c;
  CHECK(contains(report::psychrometric_chart_svg(c), "one cell = 1.8 °F × 5 gr/lb"));
}

TEST_CASE("a TMY3 year (whole °F kept as tenths of °C) bins without empty columns") {
  // NREL TMY3 Greensboro NC (tests/data/SOURCES.md): dry-bulbs such as 6.1, 6.7, 7.2 °C are
  // 43, 44, 45 °F rounded to a tenth of °C.
  WeatherOverrides w;
  w.file = greensboro();
  const YearInputs in = load_year_inputs({greensboro_unit("gso-bins.toml", "").string(), false}, w);
  const auto climate = report::climate_hours(prepare_year(in));
  REQUIRE(climate.size() > 1000);
  // Interior columns with no hours, for columns `step` wide starting at `origin`.
  auto gaps = [&](double step, double origin, units::System s) {
    std::set<long> filled;
    for (const auto& h : climate)
      filled.insert(static_cast<long>(std::floor(
          (units::to_display(units::Kind::temperature, s, h.outdoor.dry_bulb_c) - origin) / step)));
    long empty = 0;
    for (long k = *filled.begin(); k <= *filled.rbegin(); ++k) empty += filled.count(k) ? 0 : 1;
    return empty;
  };
  const auto ip = report::overlay_bin_size(climate, units::System::ip);
  CHECK(ip.dry_bulb == doctest::Approx(1.0));
  CHECK(ip.dry_bulb_origin == doctest::Approx(-0.5));
  CHECK(gaps(ip.dry_bulb, ip.dry_bulb_origin, units::System::ip) == 0);
  // Columns from whole °F split the readings that rounding put just under a whole degree.
  CHECK(gaps(1.0, 0.0, units::System::ip) > 5);
  const auto si = report::overlay_bin_size(climate, units::System::si);
  CHECK(si.dry_bulb == doctest::Approx(5.0 / 9.0));
  CHECK(gaps(si.dry_bulb, si.dry_bulb_origin, units::System::si) == 0);
  CHECK(gaps(0.5, 0.0, units::System::si) > 5);
  // The embedded demo climate, in tenths of °C, keeps the finest fixed cells.
  CHECK(report::overlay_bin_size(report::climate_hours(harbourside().prepared), units::System::ip)
            .dry_bulb_origin == 0.0);
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
  for (std::size_t i = 0; i < harbourside().in.strategies.size(); ++i)
    CHECK(!line_of(svg, static_cast<int>(i) + 1, "dry-bulb").empty());

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
