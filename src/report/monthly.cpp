#include <limitline/report/monthly.hpp>

#include <limitline/analysis/decision.hpp>
#include <limitline/report/chart.hpp>
#include <limitline/report/html.hpp>

#include "svg_draw.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <utility>
#include <vector>

namespace limitline::report {
namespace {

using svg::num;
using svg::text;

constexpr std::string_view kMonthInitials[] = {"J", "F", "M", "A", "M", "J",
                                               "J", "A", "S", "O", "N", "D"};
constexpr std::string_view kMonthNames[] = {"Jan", "Feb", "Mar", "Apr", "May", "Jun",
                                            "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"};

constexpr double kWidth = 960.0;
constexpr double kMargin = 40.0;       // left and right of the panels
constexpr double kGutter = 36.0;       // between panel columns
constexpr double kAxisRoom = 34.0;     // left of each panel's bars, for the scale
constexpr double kHeadingRoom = 26.0;  // panel heading above the bars
constexpr double kUpPx = 78.0;         // height of the scale's top value above the baseline
constexpr double kMonthRoom = 16.0;    // month initials under the lowest bar
constexpr double kPanelGap = 18.0;

// The strategies in the given order, each with its number on the chart (1-based).
std::vector<std::pair<std::size_t, const annual::StrategyResult*>> panels_in_order(
    const annual::YearResult& year, std::span<const std::string> order) {
  std::vector<std::pair<std::size_t, const annual::StrategyResult*>> rows;
  std::vector<bool> used(year.strategies.size(), false);
  for (std::size_t i = 0; i < order.size(); ++i)
    for (std::size_t j = 0; j < year.strategies.size(); ++j)
      if (!used[j] && year.strategies[j].name == order[i]) {
        rows.emplace_back(i, &year.strategies[j]);
        used[j] = true;
        break;
      }
  for (std::size_t j = 0; j < year.strategies.size(); ++j)
    if (!used[j]) rows.emplace_back(order.size() + j, &year.strategies[j]);
  return rows;
}

std::string hours_text(double h) { return fmt::format("{:.0f} h", h); }

std::string rect(std::string_view cls, const std::string& strategy, std::size_t month, double hours,
                 double x, double y, double w, double h, std::string_view style,
                 const std::string& tip) {
  return fmt::format(
      "<rect class=\"{}\" data-strategy=\"{}\" data-month=\"{}\" data-hours=\"{:.3f}\" x=\"{}\" "
      "y=\"{}\" width=\"{}\" height=\"{}\" {}><title>{}</title></rect>\n",
      cls, html_escape(strategy), month + 1, hours, num(x), num(y), num(w), num(std::max(h, 0.0)),
      style, html_escape(tip));
}

// The key above the panels: what the four marks of a month mean.
std::string key(double y, double* bottom) {
  const std::string body = fmt::format("font-size=\"11\" fill=\"{}\"", svg::kInk);
  struct Entry {
    std::string swatch;
    std::string_view label;
  };
  const Entry entries[] = {
      {fmt::format("fill=\"{}\"", svg::kInkSoft), "economizes (strategy's colour)"},
      {fmt::format("fill=\"none\" stroke=\"{}\" stroke-width=\"1.3\"", svg::kInk),
       "perfect changeover economizes"},
      {fmt::format("fill=\"{}\"", svg::kDoNotEconomize), "economizes although it costs"},
      {fmt::format("fill=\"{}\"", svg::kEconomize), "at minimum although outdoor air saves"},
  };
  std::string out = "<g class=\"key\">\n";
  double x = kMargin;
  for (const auto& e : entries) {
    const double w = 17 + 6.6 * static_cast<double>(e.label.size());
    if (x > kMargin && x + w > kWidth - kMargin) {  // wrap rather than run off the page
      x = kMargin;
      y += 17;
    }
    out += fmt::format("<rect x=\"{}\" y=\"{}\" width=\"12\" height=\"11\" {}/>\n", num(x),
                       num(y - 10), e.swatch);
    out += text(x + 17, y, e.label, body);
    x += w + 20;
  }
  *bottom = y + 17;
  out += text(kMargin, y + 17,
              "Above each baseline: hours economizing. Below it, on the same scale: wrong "
              "decisions against the perfect changeover.",
              fmt::format("font-size=\"10.5\" fill=\"{}\"", svg::kInkSoft));
  return out + "</g>\n";
}

}  // namespace

std::string monthly_hours_svg(const annual::YearResult& year, std::span<const std::string> order,
                              std::string_view title) {
  const auto rows = panels_in_order(year, order);
  const annual::StrategyResult& ideal = year.perfect_changeover;

  // One scale for every panel: the same hour is the same height everywhere.
  double up_peak = 0.0, down_peak = 0.0;
  for (const auto& m : ideal.monthly) up_peak = std::max(up_peak, m.hours_economizing);
  for (const auto& [i, r] : rows)
    for (const auto& m : r->monthly) {
      up_peak = std::max(up_peak, m.hours_economizing);
      down_peak = std::max(down_peak, m.harmful_hours + m.missed_hours);
    }
  const double step = svg::round_step(up_peak, 4);  // the top value close over the peak
  const double top_value = std::max(step, std::ceil(up_peak / step - 1e-9) * step);
  const double px_per_hour = kUpPx / top_value;
  const double down_px = down_peak * px_per_hour;
  const double panel_h = kHeadingRoom + kUpPx + down_px + 4 + kMonthRoom;

  const std::size_t columns = rows.size() >= 4 ? 2 : 1;
  const double panel_w =
      (kWidth - 2 * kMargin - kGutter * static_cast<double>(columns - 1)) / columns;

  std::string out =
      fmt::format("<rect x=\"0\" y=\"0\" width=\"{}\" height=\"100%\" fill=\"{}\"/>\n", num(kWidth),
                  svg::kPaper);
  out += text(kMargin, 30, std::string(title),
              fmt::format("font-size=\"17\" font-weight=\"bold\" fill=\"{}\"", svg::kInk));
  double key_bottom = 0;
  out += key(56, &key_bottom);
  const double first_top = key_bottom + 23;

  const std::string small = fmt::format("font-size=\"10\" fill=\"{}\"", svg::kInkSoft);
  const double ideal_savings = ideal.savings_vs_no_economizer_kwh;
  for (std::size_t p = 0; p < rows.size(); ++p) {
    const auto& [ci, r] = rows[p];
    const double left = kMargin + static_cast<double>(p % columns) * (panel_w + kGutter);
    const double top = first_top + static_cast<double>(p / columns) * (panel_h + kPanelGap);
    const double base = top + kHeadingRoom + kUpPx;
    const double bars_left = left + kAxisRoom;
    const double bars_w = panel_w - kAxisRoom;
    const double slot = bars_w / 12.0;
    const double bar_w = slot * 0.62;
    const std::string_view colour = strategy_colour(ci);

    out += fmt::format("<g class=\"panel\" data-strategy=\"{}\">\n", html_escape(r->name));
    // Heading: the chart's badge, the name, and the year's verdict in two figures.
    out += fmt::format(
        "<circle cx=\"{}\" cy=\"{}\" r=\"7.5\" fill=\"{}\"/><text x=\"{}\" y=\"{}\" "
        "font-size=\"9.5\" font-weight=\"bold\" fill=\"#ffffff\" "
        "text-anchor=\"middle\">{}</text>\n",
        num(left + 8), num(top + 6), colour, num(left + 8), num(top + 9.4), ci + 1);
    std::string verdict =
        fmt::format("wrong {}", hours_text(r->annual.harmful_hours + r->annual.missed_hours));
    if (ideal_savings > 0)
      verdict += " · captures " + decision::share_text(std::clamp(
                                      r->savings_vs_no_economizer_kwh / ideal_savings, 0.0, 1.0));
    const double verdict_w = 6.0 * static_cast<double>(verdict.size());
    // The name gets what the verdict leaves, cut with an ellipsis rather than run into it.
    std::string name = r->name;
    const auto name_room =
        static_cast<std::size_t>(std::max(8.0, (panel_w - 28 - verdict_w - 12) / 6.9));
    if (name.size() > name_room) name = name.substr(0, name_room - 1) + "…";
    out += text(left + 21, top + 10, name,
                fmt::format("font-size=\"12\" font-weight=\"bold\" fill=\"{}\"", svg::kInk));
    out += text(left + panel_w, top + 10, verdict,
                fmt::format("font-size=\"10.5\" fill=\"{}\" text-anchor=\"end\"", svg::kInkSoft));
    // Scale: the top value and the baseline.
    const double y_top = base - kUpPx;
    out += fmt::format("<path d=\"M{} {} L{} {}\" stroke=\"{}\" stroke-width=\"0.8\"/>\n",
                       num(bars_left), num(y_top), num(bars_left + bars_w), num(y_top),
                       svg::kGridMinor);
    out += text(bars_left - 5, y_top + 3.5, hours_text(top_value),
                fmt::format("font-size=\"9.5\" fill=\"{}\" text-anchor=\"end\"", svg::kInkSoft));
    out += text(bars_left - 5, base + 3.5, "0",
                fmt::format("font-size=\"9.5\" fill=\"{}\" text-anchor=\"end\"", svg::kInkSoft));
    for (std::size_t m = 0; m < 12; ++m) {
      const auto& t = r->monthly[m];
      const double x = bars_left + slot * static_cast<double>(m) + (slot - bar_w) / 2;
      const double econ = t.hours_economizing, perfect = ideal.monthly[m].hours_economizing;
      const std::string when = fmt::format("{} {}", kMonthNames[m], r->name);
      out += rect("economizing", r->name, m, econ, x, base - econ * px_per_hour, bar_w,
                  econ * px_per_hour, fmt::format("fill=\"{}\"", colour),
                  fmt::format("{}: economizes {}", when, hours_text(econ)));
      out += rect("ideal", r->name, m, perfect, x - 2, base - perfect * px_per_hour, bar_w + 4,
                  perfect * px_per_hour,
                  fmt::format("fill=\"none\" stroke=\"{}\" stroke-width=\"1.3\"", svg::kInk),
                  fmt::format("{}: the perfect changeover economizes {}", kMonthNames[m],
                              hours_text(perfect)));
      const double harmful = t.harmful_hours * px_per_hour, missed = t.missed_hours * px_per_hour;
      out += rect("harmful", r->name, m, t.harmful_hours, x, base + 1, bar_w, harmful,
                  fmt::format("fill=\"{}\"", svg::kDoNotEconomize),
                  fmt::format("{}: economizes {} although it costs energy", when,
                              hours_text(t.harmful_hours)));
      out += rect("missed", r->name, m, t.missed_hours, x, base + 1 + harmful, bar_w, missed,
                  fmt::format("fill=\"{}\"", svg::kEconomize),
                  fmt::format("{}: at minimum {} although outdoor air would save", when,
                              hours_text(t.missed_hours)));
      out += text(x + bar_w / 2, base + 4 + down_px + kMonthRoom - 4, kMonthInitials[m],
                  fmt::format("font-size=\"9.5\" fill=\"{}\" text-anchor=\"middle\"", svg::kInk));
    }
    out += fmt::format("<path d=\"M{} {} L{} {}\" stroke=\"{}\" stroke-width=\"1\"/>\n",
                       num(bars_left), num(base + 0.5), num(bars_left + bars_w), num(base + 0.5),
                       svg::kInk);
    out += "</g>\n";
  }
  const double panel_rows = static_cast<double>((rows.size() + columns - 1) / columns);
  const double height = first_top + panel_rows * (panel_h + kPanelGap) + 4;
  if (rows.empty()) out += text(kMargin, first_top + 20, "No strategy to show.", small);
  return svg::open(kWidth, std::max(height, first_top + 40), std::string(title)) + out + "</svg>\n";
}

}  // namespace limitline::report
