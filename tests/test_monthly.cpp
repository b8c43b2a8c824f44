// The month-by-month picture (report/monthly.hpp): one panel per strategy on one scale, each
// against the perfect changeover, with its wrong decisions below the baseline.
//
// The figures drawn are read back from the SVG and compared with the annual engine's own
// monthly totals (the picture must show what the tables print). Weather: the embedded invented
// demo climates.
#include <limitline/analysis/decision.hpp>
#include <limitline/app/year_job.hpp>
#include <limitline/report/chart.hpp>
#include <limitline/report/monthly.hpp>

#include "support/cli.hpp"
#include "support/svg.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <map>

using namespace limitline;
using limitline::test::contains;
using limitline::test::svg::attr;
using limitline::test::svg::check_standalone;
using limitline::test::svg::check_svg_renders;
using limitline::test::svg::tags_with;

namespace {

struct Year {
  YearInputs in;
  annual::YearResult result;
  std::vector<std::string> order;  // the unit file's
};

Year demo_year(const std::string& demo) {
  Year y{load_year_inputs(demo_unit(demo), {}), {}, {}};
  y.result = annual::evaluate(y.in.strategies, prepare_year(y.in));
  for (const auto& st : y.in.strategies) y.order.push_back(st.name);
  return y;
}

double num_attr(const std::string& tag, const std::string& name) {
  const std::string v = attr(tag, name);
  REQUIRE_MESSAGE(!v.empty(), (name + " missing in " + tag));
  return std::stod(v);
}

struct Bar {
  double hours, x, y, w, h;
};

Bar bar(const std::string& svg, const std::string& cls, const std::string& strategy, int month) {
  const auto t = tags_with(svg, {"class=\"" + cls + "\"", "data-strategy=\"" + strategy + "\"",
                                 "data-month=\"" + std::to_string(month) + "\""});
  REQUIRE_MESSAGE(t.size() == 1, (cls + " " + strategy + " " + std::to_string(month)));
  return {num_attr(t[0], "data-hours"), num_attr(t[0], "x"), num_attr(t[0], "y"),
          num_attr(t[0], "width"), num_attr(t[0], "height")};
}

}  // namespace

TEST_CASE("the monthly picture is a standalone SVG that renders to a picture that is not blank") {
  for (const std::string demo : {"harbourside", "mesa-alta"}) {
    const Year y = demo_year(demo);
    const std::string svg = report::monthly_hours_svg(y.result, y.order, "Economizing by month");
    check_standalone(svg);
    check_svg_renders(svg, "monthly", demo);
  }
}

TEST_CASE("each month shows the engine's hours, on one scale for every panel") {
  const Year y = demo_year("harbourside");
  const std::string svg = report::monthly_hours_svg(y.result, y.order, "hours");
  REQUIRE(tags_with(svg, {"class=\"panel\""}).size() == y.result.strategies.size());
  REQUIRE(!y.result.strategies.empty());
  // The perfect changeover's tallest month sets the scale; every bar of every panel must
  // agree with it to the 0.01 px the SVG is written in.
  const auto& first = y.result.strategies.front().name;
  Bar tallest{0, 0, 0, 0, 0};
  for (int m = 1; m <= 12; ++m) {
    const Bar b = bar(svg, "ideal", first, m);
    if (b.hours > tallest.hours) tallest = b;
  }
  REQUIRE(tallest.hours > 0);
  const double px_per_hour = tallest.h / tallest.hours;
  const auto same_scale = [&](double hours, double height) {
    CHECK(std::fabs(height - hours * px_per_hour) <= 0.011 + 1e-4 * height);
  };
  for (const auto& r : y.result.strategies)
    for (int m = 1; m <= 12; ++m) {
      CAPTURE(r.name);
      CAPTURE(m);
      const auto& t = r.monthly[static_cast<std::size_t>(m - 1)];
      const auto& perfect = y.result.perfect_changeover.monthly[static_cast<std::size_t>(m - 1)];
      const Bar econ = bar(svg, "economizing", r.name, m), ideal = bar(svg, "ideal", r.name, m),
                harm = bar(svg, "harmful", r.name, m), miss = bar(svg, "missed", r.name, m);
      CHECK(econ.hours == doctest::Approx(t.hours_economizing).epsilon(1e-6));
      CHECK(ideal.hours == doctest::Approx(perfect.hours_economizing).epsilon(1e-6));
      CHECK(harm.hours == doctest::Approx(t.harmful_hours).epsilon(1e-6));
      CHECK(miss.hours == doctest::Approx(t.missed_hours).epsilon(1e-6));
      for (const Bar* b : {&econ, &ideal, &harm, &miss}) same_scale(b->hours, b->h);
      // Economizing and the perfect changeover stand on the baseline; the wrong decisions
      // hang from it, harmful first, missed under it.
      const double base = econ.y + econ.h;
      CHECK(ideal.y + ideal.h == doctest::Approx(base).epsilon(1e-4));
      CHECK(harm.y >= base);
      CHECK(miss.y == doctest::Approx(harm.y + harm.h).epsilon(1e-4));
      // The outline of the perfect changeover frames the strategy's bar.
      CHECK(ideal.x < econ.x);
      CHECK(ideal.x + ideal.w > econ.x + econ.w);
    }
}

TEST_CASE("panels follow the unit file's order and colours, and state the year's verdict") {
  const Year y = demo_year("harbourside");
  const std::string svg = report::monthly_hours_svg(y.result, y.order, "hours");
  const auto panels = tags_with(svg, {"class=\"panel\""});
  REQUIRE(panels.size() == y.order.size());
  for (std::size_t i = 0; i < y.order.size(); ++i) {
    CHECK(attr(panels[i], "data-strategy") == y.order[i]);
    const auto b =
        tags_with(svg, {"class=\"economizing\"", "data-strategy=\"" + y.order[i] + "\""});
    REQUIRE(!b.empty());
    CHECK(contains(b[0], std::string(report::strategy_colour(i))));
  }
  const double perfect = y.result.perfect_changeover.savings_vs_no_economizer_kwh;
  REQUIRE(perfect > 0);
  for (const auto& r : y.result.strategies) {
    const std::string verdict = fmt::format(
        "wrong {:.0f} h · captures {}", r.annual.harmful_hours + r.annual.missed_hours,
        decision::share_text(std::clamp(r.savings_vs_no_economizer_kwh / perfect, 0.0, 1.0)));
    CHECK_MESSAGE(contains(svg, verdict), verdict);
  }
}

TEST_CASE("panels do not overlap and stay on the page, for one to seven strategies") {
  Year y = demo_year("harbourside");
  for (std::size_t n : {std::size_t{1}, std::size_t{3}, y.result.strategies.size()}) {
    CAPTURE(n);
    annual::YearResult cut = y.result;
    cut.strategies.resize(std::min(n, cut.strategies.size()));
    const std::string svg = report::monthly_hours_svg(cut, y.order, "hours");
    const double width = num_attr(tags_with(svg, {"<svg"})[0], "width");
    const double height = num_attr(tags_with(svg, {"<svg"})[0], "height");
    struct Box {
      double x0, y0, x1, y1;
    };
    std::map<std::string, Box> boxes;  // the extent of each panel's bars
    for (const auto& t : tags_with(svg, {"data-month=\""})) {
      const std::string s = attr(t, "data-strategy");
      const double x = num_attr(t, "x"), top = num_attr(t, "y");
      const double w = num_attr(t, "width"), h = num_attr(t, "height");
      auto [it, fresh] = boxes.try_emplace(s, Box{x, top, x + w, top + h});
      Box& b = it->second;
      b = {std::min(b.x0, x), std::min(b.y0, top), std::max(b.x1, x + w), std::max(b.y1, top + h)};
      CHECK(x >= 0);
      CHECK(x + w <= width);
      CHECK(top >= 0);
      CHECK(top + h <= height);
    }
    REQUIRE(boxes.size() == cut.strategies.size());
    for (auto a = boxes.begin(); a != boxes.end(); ++a)
      for (auto b = std::next(a); b != boxes.end(); ++b) {
        const bool apart = a->second.x1 <= b->second.x0 || b->second.x1 <= a->second.x0 ||
                           a->second.y1 <= b->second.y0 || b->second.y1 <= a->second.y0;
        CHECK_MESSAGE(apart, (a->first + " overlaps " + b->first));
      }
  }
}
