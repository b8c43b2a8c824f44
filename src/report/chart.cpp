#include <limitline/report/chart.hpp>

#include <limitline/model/psychro.hpp>
#include <limitline/report/html.hpp>
#include <limitline/report/strategy.hpp>

#include "svg_draw.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <map>
#include <stdexcept>

namespace limitline::report {
namespace {

using highlimit::Quantity;
using highlimit::Reference;
using units::System;

// --- Style -----------------------------------------------------------------------------
// Warm drafting paper, ink-blue saturation curve, steel RH lines, ochre enthalpy lines,
// sage dotted wet-bulb lines; climate cells in moss / terracotta / slate; high-limits in
// dark inks with numbered badges.

using svg::kGridMajor;
using svg::kGridMinor;
using svg::kInk;
using svg::kInkSoft;
using svg::kPaper;
constexpr std::string_view kPaperAbove = "#efe9dc";
constexpr std::string_view kRh = "#8ea6bd";
constexpr std::string_view kEnthalpy = "#bf8a3f";
constexpr std::string_view kWetBulb = "#5f8f80";
constexpr std::string_view kTarget = "#7d5ba6";

struct OutcomeStyle {
  HourOutcome outcome;
  std::string_view name;
  std::string_view colour;
};
constexpr OutcomeStyle kOutcomes[] = {
    {HourOutcome::economize, "economize", svg::kEconomize},
    {HourOutcome::do_not_economize, "do not economize", svg::kDoNotEconomize},
    {HourOutcome::no_cooling_needed, "no cooling needed", svg::kNoCooling},
};

// Dark inks that stay apart from the three cell colours; each line is cased in paper colour.
constexpr std::string_view kStrategyColours[] = {"#5b2a86", "#0b4f9c", "#b0127f", "#6b4400",
                                                 "#1b1f2a", "#d18b00", "#0096c7", "#8c1c13"};

// Axes per unit system, in display units.
struct AxisStyle {
  double t_min, t_max, t_major, t_minor;
  double w_max, w_major, w_minor;  // gr/lb or g/kg
  double w_per_kgkg;               // display humidity units per kg/kg
  std::string_view w_unit;
  double h_step;   // enthalpy line spacing, display units
  double wb_step;  // wet-bulb line spacing
  BinSize bin;
};
constexpr AxisStyle kIp{20, 110, 10, 5, 180, 20, 10, 7000.0, "gr/lb", 5, 10, {1.0, 5.0}};
constexpr AxisStyle kSi{-5, 45, 5, 1, 26, 2, 1, 1000.0, "g/kg", 10, 5, {0.5, 0.5}};
const AxisStyle& axis_style(System s) { return s == System::ip ? kIp : kSi; }

// Limits are put on the chart (widening it) only inside this range: a limit far outside the
// weather is a typing error to see in the legend, not a reason to shrink the chart to nothing.
constexpr double kLimitRangeMinC = -40.0;
constexpr double kLimitRangeMaxC = 60.0;

constexpr double kWidth = 960.0;
constexpr PlotArea kPlot{48.0, 84.0, 812.0, 500.0};

// --- SVG text --------------------------------------------------------------------------

using svg::num;
using svg::text;
using svg::tick_label;

std::string esc(std::string_view s) { return html_escape(s); }

struct Px {
  double x, y;
};

std::string path_d(const std::vector<Px>& pts) {
  std::string d;
  for (std::size_t i = 0; i < pts.size(); ++i)
    d += fmt::format("{}{} {}", i ? " L" : "M", num(pts[i].x), num(pts[i].y));
  return d;
}

std::string svg_open(double height, std::string_view label) {
  return svg::open(kWidth, height, label);
}

// Greedy word wrap at `width` characters.
std::vector<std::string> wrap(const std::string& s, std::size_t width) {
  std::vector<std::string> lines;
  std::string line;
  std::size_t start = 0;
  while (start <= s.size()) {
    std::size_t end = s.find(' ', start);
    if (end == std::string::npos) end = s.size();
    const std::string word = s.substr(start, end - start);
    if (!line.empty() && line.size() + 1 + word.size() > width) {
      lines.push_back(line);
      line = word;
    } else {
      line += (line.empty() ? "" : " ") + word;
    }
    start = end + 1;
  }
  if (!line.empty()) lines.push_back(line);
  return lines;
}

// --- Display units ---------------------------------------------------------------------

double t_disp(double c, System s) { return units::to_display(units::Kind::temperature, s, c); }
double t_si(double d, System s) { return units::from_display(units::Kind::temperature, s, d); }
std::string_view t_unit(System s) { return units::unit_label(units::Kind::temperature, s); }

// --- Psychrometric curves in (t, W) ---------------------------------------------------------

using Curve = std::vector<ChartPoint>;

// Bisection for a monotone predicate: lo satisfies it, hi does not.
template <class F>
double bisect(double lo, double hi, F&& ok) {
  for (int i = 0; i < 60; ++i) {
    const double mid = 0.5 * (lo + hi);
    (ok(mid) ? lo : hi) = mid;
  }
  return lo;
}

struct Psy {
  double p;
  double w_sat(double t) const { return psychro::saturation_humidity_ratio(t, p); }
};

// Clips a polyline in (t, W) to the chart rectangle (Liang–Barsky per segment), giving the
// runs that are inside.
std::vector<Curve> clip(const Curve& c, const ChartGeometry& g) {
  std::vector<Curve> runs;
  Curve run;
  const double x0 = g.dry_bulb_min_c(), x1 = g.dry_bulb_max_c(), y0 = 0.0,
               y1 = g.humidity_ratio_max();
  auto flush = [&] {
    if (run.size() >= 2) runs.push_back(run);
    run.clear();
  };
  for (std::size_t i = 0; i + 1 < c.size(); ++i) {
    const ChartPoint a = c[i], b = c[i + 1];
    const double dx = b.dry_bulb_c - a.dry_bulb_c, dy = b.humidity_ratio - a.humidity_ratio;
    double u0 = 0.0, u1 = 1.0;
    bool inside = true;
    const double pq[4][2] = {{-dx, a.dry_bulb_c - x0},
                             {dx, x1 - a.dry_bulb_c},
                             {-dy, a.humidity_ratio - y0},
                             {dy, y1 - a.humidity_ratio}};
    for (const auto& e : pq) {
      if (e[0] == 0.0) {
        if (e[1] < 0.0) inside = false;
      } else {
        const double r = e[1] / e[0];
        if (e[0] < 0.0)
          u0 = std::max(u0, r);
        else
          u1 = std::min(u1, r);
      }
    }
    if (!inside || u0 > u1) {
      flush();
      continue;
    }
    const ChartPoint pa{a.dry_bulb_c + u0 * dx, a.humidity_ratio + u0 * dy};
    const ChartPoint pb{a.dry_bulb_c + u1 * dx, a.humidity_ratio + u1 * dy};
    if (run.empty()) run.push_back(pa);
    run.push_back(pb);
    if (u1 < 1.0) flush();
  }
  flush();
  return runs;
}

Curve sample_t(const ChartGeometry& g, int n, auto&& w_of_t) {
  Curve c;
  const double a = g.dry_bulb_min_c(), b = g.dry_bulb_max_c();
  for (int i = 0; i <= n; ++i) {
    const double t = a + (b - a) * i / n;
    c.push_back({t, w_of_t(t)});
  }
  return c;
}

Curve saturation_curve(const ChartGeometry& g, const Psy& psy) {
  return sample_t(g, 480, [&](double t) { return psy.w_sat(t); });
}

Curve rh_curve(const ChartGeometry& g, const Psy& psy, double rh) {
  return sample_t(g, 240, [&](double t) {
    return psychro::humidity_ratio_from_relative_humidity(t, rh, psy.p);
  });
}

// Dry-bulb at which the saturated air of the chart has enthalpy h, searched within the chart.
// Returns the dry-bulb range of the constant-enthalpy line inside the chart and under the
// saturation curve, or nothing.
std::optional<std::pair<double, double>> enthalpy_span(const ChartGeometry& g, const Psy& psy,
                                                       double h) {
  const double t_top = psychro::dry_bulb_from_enthalpy_c(h, g.humidity_ratio_max());
  const double t_zero = psychro::dry_bulb_from_enthalpy_c(h, 0.0);
  double a = std::max(g.dry_bulb_min_c(), t_top);
  const double b = std::min(g.dry_bulb_max_c(), t_zero);
  if (a >= b) return std::nullopt;
  auto above_sat = [&](double t) { return psychro::enthalpy_kj_per_kg(t, psy.w_sat(t)) < h; };
  if (above_sat(a)) {
    if (above_sat(b)) return std::nullopt;
    a = bisect(a, b, above_sat);
  }
  return std::make_pair(a, b);
}

// W on the constant-enthalpy line; at and beyond its dry-air end (W = 0) it is 0.
double w_at_enthalpy(double t, double h) {
  return t < psychro::dry_bulb_from_enthalpy_c(h, 0.0) ? psychro::humidity_ratio_from_enthalpy(t, h)
                                                       : 0.0;
}

Curve enthalpy_curve(const ChartGeometry& g, const Psy& psy, double h, int n = 24) {
  Curve c;
  const auto span = enthalpy_span(g, psy, h);
  if (!span) return c;
  for (int i = 0; i <= n; ++i) {
    const double t = span->first + (span->second - span->first) * i / n;
    c.push_back({t, std::min(w_at_enthalpy(t, h), g.humidity_ratio_max())});
  }
  return c;
}

std::optional<double> w_at_wet_bulb(double t, double wb, double p) {
  try {
    return psychro::humidity_ratio_from_wet_bulb(t, wb, p);
  } catch (const RangeError&) {
    return std::nullopt;
  }
}

Curve wet_bulb_curve(const ChartGeometry& g, const Psy& psy, double wb) {
  Curve c;
  const double a = std::max(wb, g.dry_bulb_min_c());
  double b = g.dry_bulb_max_c();
  if (a >= b || !w_at_wet_bulb(a, wb, psy.p)) return c;
  if (!w_at_wet_bulb(b, wb, psy.p))
    b = bisect(a, b, [&](double t) { return w_at_wet_bulb(t, wb, psy.p).has_value(); });
  for (int i = 0; i <= 24; ++i) {
    // Held to b: a + (b - a) rounds past b by an ulp, where no wet-bulb line may exist.
    const double t = std::min(b, a + (b - a) * i / 24);
    c.push_back({t, std::max(0.0, *w_at_wet_bulb(t, wb, psy.p))});
  }
  return c;
}

// --- High-limit boundaries ------------------------------------------------------------

highlimit::AirValues values_at(const ChartPoint& pt, double p) {
  // A dew point needs some vapour; the bottom edge (W = 0) is read as a trace of it.
  const double w_dp = std::max(pt.humidity_ratio, 1e-7);
  return highlimit::air_values(
      pt.dry_bulb_c, psychro::enthalpy_kj_per_kg(pt.dry_bulb_c, pt.humidity_ratio),
      psychro::dew_point_from_humidity_ratio_c(w_dp, p), pt.humidity_ratio);
}

enum class Family { vertical, enthalpy, horizontal };

struct Boundary {
  std::size_t strategy;
  std::size_t condition;
  Family family;
  double key;  // the line's constant: °C, kJ/kg or kg/kg
  std::vector<Curve> runs;
};

// The line of one condition at its effective limit, inside the chart and under saturation.
std::pair<Family, Curve> condition_line(const highlimit::Condition& c, double limit,
                                        const ChartGeometry& g, const Psy& psy, double& key) {
  Curve line;
  const double t0 = g.dry_bulb_min_c(), t1 = g.dry_bulb_max_c(), wm = g.humidity_ratio_max();
  switch (c.quantity) {
    case Quantity::dry_bulb: {
      key = limit;
      if (limit >= t0 && limit <= t1 && limit >= kLimitRangeMinC && limit <= kLimitRangeMaxC) {
        const double top = std::min(psy.w_sat(limit), wm);
        for (int i = 0; i <= 200; ++i) line.push_back({limit, top * i / 200});
      }
      return {Family::vertical, line};
    }
    case Quantity::enthalpy: {
      key = limit;
      return {Family::enthalpy, enthalpy_curve(g, psy, limit, 200)};
    }
    case Quantity::dew_point:
    case Quantity::humidity_ratio: {
      double w = limit, t_dew = 0.0;
      if (c.quantity == Quantity::dew_point) {
        if (limit < kLimitRangeMinC || limit > kLimitRangeMaxC) return {Family::horizontal, line};
        w = psychro::humidity_ratio_from_dew_point(limit, psy.p);
        t_dew = limit;
      } else {
        if (!(w > 0.0) || w > wm) return {Family::horizontal, line};
        t_dew = psychro::dew_point_from_humidity_ratio_c(w, psy.p);
      }
      key = w;
      if (w > wm || w <= 0.0 || t_dew >= t1) return {Family::horizontal, line};
      const double a = std::max(t0, t_dew);
      for (int i = 0; i <= 200; ++i) line.push_back({a + (t1 - a) * i / 200, w});
      return {Family::horizontal, line};
    }
  }
  return {Family::vertical, line};
}

bool others_clear(const highlimit::Strategy& s, std::size_t self, const ChartPoint& pt,
                  const highlimit::AirValues& ret, double p) {
  const highlimit::AirValues v = values_at(pt, p);
  for (std::size_t j = 0; j < s.conditions.size(); ++j) {
    if (j == self) continue;
    const auto& c = s.conditions[j];
    const double lim = c.effective_limit(ret);
    if (v[c.quantity] > lim + 1e-9 * std::max(1.0, std::fabs(lim))) return false;
  }
  return true;
}

// The parts of a condition's line where every other condition of the strategy is clear: the
// edge of the region where the strategy lets the economizer run.
std::vector<Boundary> boundaries(const std::vector<highlimit::Strategy>& strategies,
                                 const highlimit::AirValues& ret, const ChartGeometry& g,
                                 const Psy& psy) {
  std::vector<Boundary> out;
  for (std::size_t si = 0; si < strategies.size(); ++si) {
    const auto& s = strategies[si];
    for (std::size_t ci = 0; ci < s.conditions.size(); ++ci) {
      const auto& c = s.conditions[ci];
      Boundary b{si, ci, Family::vertical, 0.0, {}};
      auto [family, line] = condition_line(c, c.effective_limit(ret), g, psy, b.key);
      b.family = family;
      Curve run;
      auto keep = [&](const ChartPoint& pt) { return others_clear(s, ci, pt, ret, psy.p); };
      auto between = [](const ChartPoint& a, const ChartPoint& z, double u) {
        return ChartPoint{a.dry_bulb_c + u * (z.dry_bulb_c - a.dry_bulb_c),
                          a.humidity_ratio + u * (z.humidity_ratio - a.humidity_ratio)};
      };
      for (std::size_t i = 0; i < line.size(); ++i) {
        const bool k = keep(line[i]);
        if (i > 0 && k != keep(line[i - 1])) {
          // The crossing between the two samples, found on their chord.
          const ChartPoint a = line[i - 1], z = line[i];
          const bool from_kept = !k;
          const double u =
              bisect(0.0, 1.0, [&](double uu) { return keep(between(a, z, uu)) == from_kept; });
          const ChartPoint edge = between(a, z, u);
          if (from_kept) {
            run.push_back(edge);
            if (run.size() >= 2) b.runs.push_back(run);
            run.clear();
          } else {
            run.push_back(edge);
          }
        }
        if (k) run.push_back(line[i]);
      }
      if (run.size() >= 2) b.runs.push_back(run);
      out.push_back(std::move(b));
    }
  }
  return out;
}

// Straight families need only their ends; the enthalpy line keeps its samples.
Curve simplified(const Curve& run, Family f) {
  if (f == Family::enthalpy || run.size() <= 2) return run;
  return {run.front(), run.back()};
}

std::vector<Px> to_px(const Curve& c, const ChartGeometry& g) {
  std::vector<Px> out;
  out.reserve(c.size());
  for (const auto& p : c) out.push_back({g.x(p.dry_bulb_c), g.y(p.humidity_ratio)});
  return out;
}

std::string_view quantity_attr(Quantity q) { return highlimit::quantity_name(q); }

// --- Shared high-limit lines -------------------------------------------------------------
// Strategies often share a line (four of them stop at the same 75 °F dry-bulb). Each line of
// the chart (a quantity and its constant) is cut where a strategy's part of it begins or
// ends; every piece is drawn once and carries the numbers of the strategies it bounds.

struct Segment {
  Quantity quantity;
  Family family;
  double key;
  std::vector<std::size_t> members;  // strategy indices, ascending
  std::string references;            // "fixed", "return" or both, as the members have them
  std::vector<Px> pts;
};

// Position along a line: humidity ratio up a vertical, dry-bulb along the others.
double along_line(const ChartPoint& p, Family f) {
  return f == Family::vertical ? p.humidity_ratio : p.dry_bulb_c;
}

Curve line_between(Family f, double key, double a, double b, double w_max) {
  if (f == Family::vertical) return {{key, a}, {key, b}};
  if (f == Family::horizontal) return {{a, key}, {b, key}};
  Curve c;
  constexpr int kSamples = 60;
  for (int i = 0; i <= kSamples; ++i) {
    const double t = std::min(b, a + (b - a) * i / kSamples);
    c.push_back({t, std::min(w_at_enthalpy(t, key), w_max)});
  }
  return c;
}

std::vector<Segment> shared_segments(const std::vector<Boundary>& bs,
                                     const std::vector<highlimit::Strategy>& strategies,
                                     const ChartGeometry& g) {
  struct Part {
    std::size_t strategy;
    Reference reference;
    double a, b;
  };
  struct Line {
    Quantity quantity;
    Family family;
    double key;
    std::vector<Part> parts;
  };
  std::map<std::pair<int, long long>, Line> lines;
  for (const auto& b : bs) {
    const auto& cond = strategies[b.strategy].conditions[b.condition];
    const double scale = b.family == Family::horizontal ? 1e7 : 1e4;
    auto& line = lines[{static_cast<int>(cond.quantity), std::llround(b.key * scale)}];
    line.quantity = cond.quantity;
    line.family = b.family;
    line.key = b.key;
    for (const auto& run : b.runs) {
      const double u = along_line(run.front(), b.family), v = along_line(run.back(), b.family);
      line.parts.push_back({b.strategy, cond.reference, std::min(u, v), std::max(u, v)});
    }
  }
  std::vector<Segment> out;
  for (auto& entry : lines) {
    // A plain reference, not a structured binding: the lambdas below capture it (clang 14).
    auto& line = entry.second;
    // Ends closer than a quarter pixel are one end: the same edge found by two bisections.
    const double px_per_unit = line.family == Family::vertical
                                   ? g.area().height / g.humidity_ratio_max()
                                   : g.area().width / (g.dry_bulb_max_c() - g.dry_bulb_min_c());
    std::vector<double> cuts;
    for (const auto& p : line.parts) cuts.insert(cuts.end(), {p.a, p.b});
    std::sort(cuts.begin(), cuts.end());
    std::vector<double> ends;
    for (const double x : cuts)
      if (ends.empty() || (x - ends.back()) * px_per_unit > 0.25) ends.push_back(x);
    auto snap = [&](double x) {
      return *std::min_element(ends.begin(), ends.end(), [&](double l, double r) {
        return std::fabs(l - x) < std::fabs(r - x);
      });
    };
    Segment cur{line.quantity, line.family, line.key, {}, {}, {}};
    double cur_a = 0.0, cur_b = 0.0;
    auto flush = [&] {
      if (cur.members.empty()) return;
      Segment s = cur;
      s.pts = to_px(
          simplified(line_between(line.family, line.key, cur_a, cur_b, g.humidity_ratio_max()),
                     line.family),
          g);
      out.push_back(std::move(s));
    };
    for (std::size_t i = 0; i + 1 < ends.size(); ++i) {
      std::vector<std::size_t> members;
      std::string refs;
      for (const auto& p : line.parts) {
        if (!(snap(p.a) <= ends[i] && snap(p.b) >= ends[i + 1])) continue;
        if (std::find(members.begin(), members.end(), p.strategy) == members.end())
          members.push_back(p.strategy);
        const std::string_view r = highlimit::reference_name(p.reference);
        if (refs.find(r) == std::string::npos) refs += (refs.empty() ? "" : " ") + std::string(r);
      }
      std::sort(members.begin(), members.end());
      if (members == cur.members && refs == cur.references && !members.empty()) {
        cur_b = ends[i + 1];
        continue;
      }
      flush();
      cur.members = members;
      cur.references = refs;
      cur_a = ends[i];
      cur_b = ends[i + 1];
    }
    flush();
  }
  return out;
}

std::string members_attr(const std::vector<std::size_t>& members) {
  std::string s;
  for (const std::size_t m : members) s += (s.empty() ? "" : " ") + std::to_string(m + 1);
  return s;
}

// --- Placement of badges and labels ------------------------------------------------------
// Everything written inside the plot takes a box. Pieces are placed in order of importance
// (the marks and their labels, the mixed-air target's label, the strategy badges, then the
// RH, wet-bulb and enthalpy labels): each tries its candidate places, best first, and takes
// the first whose box is clear of every box before it; a line label with no clear place is
// left out rather than written over something else. Each written box is kept in the SVG as
// data-box="x0 y0 x1 y1" so a test can check the result.

struct Box {
  double x0, y0, x1, y1;
  bool hits(const Box& o) const { return x0 < o.x1 && o.x0 < x1 && y0 < o.y1 && o.y0 < y1; }
};
Box around(double x, double y, double rx, double ry) { return {x - rx, y - ry, x + rx, y + ry}; }

std::string box_attr(const Box& b) {
  return fmt::format(" data-box=\"{} {} {} {}\"", num(b.x0), num(b.y0), num(b.x1), num(b.y1));
}

// Advance width of text in DejaVu Sans (the first font asked for), in em: digits 0.636,
// space and point 0.318, per cent 0.95; letters taken at a generous 0.62 (capitals 0.72) so a
// fallback font is covered too. Counted per UTF-8 code point.
double text_width(std::string_view s, double size, bool bold) {
  double em = 0.0;
  for (const unsigned char ch : s) {
    if ((ch & 0xC0) == 0x80) continue;
    em += ch == ' ' || ch == '.' || ch == ',' ? 0.318
          : ch == '%'                         ? 0.95
          : ch >= '0' && ch <= '9'            ? 0.636
          : ch >= 'A' && ch <= 'Z'            ? 0.72
                                              : 0.62;
  }
  return em * size * (bold ? 1.1 : 1.0);
}

enum class Anchor { start, middle, end };

struct TextStyle {
  double size;
  bool bold;
  Anchor anchor;
  std::string attrs;  // fill, style; font-size and anchor are added from the fields
};

// Box of text set at (x, y) on its baseline, with its 1.5 px halo.
Box text_box(double x, double y, std::string_view s, const TextStyle& st) {
  const double w = text_width(s, st.size, st.bold);
  const double x0 = st.anchor == Anchor::start    ? x
                    : st.anchor == Anchor::middle ? x - w / 2
                                                  : x - w;
  return {x0 - 1.5, y - 0.76 * st.size - 1.5, x0 + w + 1.5, y + 0.24 * st.size + 1.5};
}

std::string text_attrs(const TextStyle& st) {
  constexpr std::string_view kAnchor[] = {"", " text-anchor=\"middle\"", " text-anchor=\"end\""};
  return fmt::format("font-size=\"{}\"{}{} {}", st.size, st.bold ? " font-weight=\"bold\"" : "",
                     kAnchor[static_cast<int>(st.anchor)], st.attrs);
}

// A point every `step` px along a polyline, with its distance from the start.
struct Station {
  Px p;
  double s;
};
std::vector<Station> stations(const std::vector<Px>& pts, double step) {
  std::vector<Station> out;
  double s0 = 0.0, next = 0.0;
  for (std::size_t i = 0; i + 1 < pts.size(); ++i) {
    const double len = std::hypot(pts[i + 1].x - pts[i].x, pts[i + 1].y - pts[i].y);
    for (; next <= s0 + len; next += step) {
      const double u = len > 0 ? (next - s0) / len : 0.0;
      out.push_back(
          {{pts[i].x + u * (pts[i + 1].x - pts[i].x), pts[i].y + u * (pts[i + 1].y - pts[i].y)},
           next});
    }
    s0 += len;
  }
  if (!pts.empty() && (out.empty() || out.back().s < s0 - 1e-9)) out.push_back({pts.back(), s0});
  return out;
}

double path_length(const std::vector<Px>& pts) {
  double s = 0.0;
  for (std::size_t i = 0; i + 1 < pts.size(); ++i)
    s += std::hypot(pts[i + 1].x - pts[i].x, pts[i + 1].y - pts[i].y);
  return s;
}

// The boxes placed so far, and the lines labels keep off (a label's halo would cut a
// high-limit or the saturation curve; a badge sits on its own line on purpose).
class Layout {
 public:
  Layout(const ChartGeometry& g, const Psy& psy) : g_(g), psy_(psy) {}

  void take(const Box& b) { taken_.push_back(b); }
  void keep_off_line(const std::vector<Px>& pts) {
    for (const auto& st : stations(pts, 2.5)) lines_.push_back(around(st.p.x, st.p.y, 1.0, 1.0));
  }
  bool clear(const Box& b, bool of_lines) const {
    auto hit = [&](const Box& o) { return b.hits(o); };
    return std::none_of(taken_.begin(), taken_.end(), hit) &&
           (!of_lines || std::none_of(lines_.begin(), lines_.end(), hit));
  }
  bool in_plot(const Box& b) const {
    const auto& a = g_.area();
    return b.x0 >= a.left + 1 && b.x1 <= a.left + a.width - 1 && b.y0 >= a.top + 1 &&
           b.y1 <= a.top + a.height - 1;
  }
  // Every corner on or under the saturation curve: no air exists above it.
  bool under_saturation(const Box& b) const {
    for (const double x : {b.x0, b.x1})
      for (const double y : {b.y0, b.y1})
        if (g_.humidity_ratio(y) > psy_.w_sat(g_.dry_bulb_c(x))) return false;
    return true;
  }

 private:
  const ChartGeometry& g_;
  const Psy& psy_;
  std::vector<Box> taken_;
  std::vector<Box> lines_;
};

// A label of a family of lines, with the places it may go, best first.
struct LabelRequest {
  std::string cls;  // the group it is written in
  std::string text;
  TextStyle style;
  bool halo = true;
  bool in_plot = true;
  std::vector<Px> places;  // baseline anchors
};

// The labels that found a clear place, as SVG, grouped by class.
std::string place_labels(const std::vector<LabelRequest>& requests, Layout& lay) {
  std::map<std::string, std::string> groups;
  std::vector<std::string> order;
  for (const auto& r : requests) {
    if (!groups.count(r.cls)) order.push_back(r.cls);
    auto& out = groups[r.cls];
    for (const Px& p : r.places) {
      const Box b = text_box(p.x, p.y, r.text, r.style);
      if ((r.in_plot && !lay.in_plot(b)) || !lay.clear(b, true)) continue;
      lay.take(b);
      out += text(p.x, p.y, r.text, text_attrs(r.style) + box_attr(b), r.halo);
      break;
    }
  }
  std::string svg;
  for (const auto& cls : order) svg += fmt::format("<g class=\"{}\">\n{}</g>\n", cls, groups[cls]);
  return svg;
}

// --- Drawing pieces ---------------------------------------------------------------------

struct Ctx {
  const ChartInput& in;
  const ChartGeometry& g;
  Psy psy;
  const AxisStyle& ax;
  System s;
  std::string out;
  std::vector<LabelRequest> labels;  // placed after the badges
};

double w_of_display(const Ctx& c, double d) { return d / c.ax.w_per_kgkg; }

void draw_paper(Ctx& c) {
  const auto& a = c.g.area();
  c.out += fmt::format("<rect x=\"0\" y=\"0\" width=\"{}\" height=\"100%\" fill=\"{}\"/>\n",
                       num(kWidth), kPaper);
  // The region above saturation is tinted: no air exists there.
  Curve sat = saturation_curve(c.g, c.psy);
  std::vector<Px> poly;
  const auto runs = clip(sat, c.g);
  if (!runs.empty()) {
    poly.push_back({a.left, a.top});
    const Curve& r = runs.front();
    if (r.back().humidity_ratio >= c.g.humidity_ratio_max() - 1e-12) {
      poly.push_back({c.g.x(r.back().dry_bulb_c), a.top});
    } else {
      poly.push_back({a.left + a.width, a.top});
      poly.push_back({a.left + a.width, c.g.y(r.back().humidity_ratio)});
    }
    for (auto it = r.rbegin(); it != r.rend(); ++it)
      poly.push_back({c.g.x(it->dry_bulb_c), c.g.y(it->humidity_ratio)});
    poly.push_back({a.left, c.g.y(r.front().humidity_ratio)});
  }
  c.out += fmt::format("<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"#fffdf8\"/>\n",
                       num(a.left), num(a.top), num(a.width), num(a.height));
  if (!poly.empty())
    c.out += fmt::format("<path class=\"above-saturation\" d=\"{} Z\" fill=\"{}\"/>\n",
                         path_d(poly), kPaperAbove);
}

void draw_grid(Ctx& c) {
  const auto& g = c.g;
  c.out += "<g class=\"grid\" fill=\"none\">\n";
  // Dry-bulb lines up to saturation.
  const double d0 = t_disp(g.dry_bulb_min_c(), c.s), d1 = t_disp(g.dry_bulb_max_c(), c.s);
  for (double d = std::ceil(d0 / c.ax.t_minor - 1e-9) * c.ax.t_minor; d <= d1 + 1e-9;
       d += c.ax.t_minor) {
    const double t = t_si(d, c.s);
    const bool major = std::fabs(std::remainder(d, c.ax.t_major)) < 1e-6;
    const double top = std::min(c.psy.w_sat(t), g.humidity_ratio_max());
    c.out += fmt::format("<path d=\"M{} {} L{} {}\" stroke=\"{}\" stroke-width=\"{}\"/>\n",
                         num(g.x(t)), num(g.y(0)), num(g.x(t)), num(g.y(top)),
                         major ? kGridMajor : kGridMinor, major ? "0.9" : "0.6");
  }
  // Humidity-ratio lines from the saturation curve to the right edge.
  const double wd1 = g.humidity_ratio_max() * c.ax.w_per_kgkg;
  for (double d = c.ax.w_minor; d <= wd1 + 1e-9; d += c.ax.w_minor) {
    const double w = w_of_display(c, d);
    const double t_dew = psychro::dew_point_from_humidity_ratio_c(w, c.psy.p);
    if (t_dew >= g.dry_bulb_max_c()) continue;
    const double a = std::max(t_dew, g.dry_bulb_min_c());
    const bool major = std::fabs(std::remainder(d, c.ax.w_major)) < 1e-6;
    c.out += fmt::format("<path d=\"M{} {} L{} {}\" stroke=\"{}\" stroke-width=\"{}\"/>\n",
                         num(g.x(a)), num(g.y(w)), num(g.x(g.dry_bulb_max_c())), num(g.y(w)),
                         major ? kGridMajor : kGridMinor, major ? "0.9" : "0.6");
  }
  c.out += "</g>\n";
}

void draw_rh(Ctx& c) {
  c.out += fmt::format(
      "<g class=\"relative-humidity\" fill=\"none\" stroke=\"{}\" stroke-width=\"0.8\">\n", kRh);
  // Labels stacked on one dry-bulb where they can: where the 90 % curve is at 85 % of the
  // height, or near the right edge when it stays lower; each moves along its own curve off
  // whatever is there.
  const double span = c.g.dry_bulb_max_c() - c.g.dry_bulb_min_c();
  double t_lab = c.g.dry_bulb_max_c() - 0.05 * span;
  auto below = [&](double t) {
    return psychro::humidity_ratio_from_relative_humidity(t, 0.9, c.psy.p) <
           0.85 * c.g.humidity_ratio_max();
  };
  if (!below(t_lab))
    t_lab = below(c.g.dry_bulb_min_c()) ? bisect(c.g.dry_bulb_min_c(), t_lab, below)
                                        : c.g.dry_bulb_min_c();
  const double x_pref = c.g.x(t_lab);
  constexpr double kReach = 160.0;  // px either way along the curve
  for (int k = 1; k <= 9; ++k) {
    const double rh = k / 10.0;
    LabelRequest req{"relative-humidity-labels",
                     fmt::format("{}%", k * 10),
                     {9.5, false, Anchor::middle, "fill=\"#4f6d8a\""},
                     true,
                     true,
                     {}};
    for (const auto& run : clip(rh_curve(c.g, c.psy, rh), c.g)) {
      const auto pts = to_px(run, c.g);
      c.out += fmt::format("<path d=\"{}\"/>\n", path_d(pts));
      for (const auto& st : stations(pts, 2.0))
        if (std::fabs(st.p.x - x_pref) <= kReach) req.places.push_back({st.p.x, st.p.y - 3});
    }
    std::stable_sort(req.places.begin(), req.places.end(), [&](const Px& a, const Px& b) {
      return std::fabs(a.x - x_pref) < std::fabs(b.x - x_pref);
    });
    c.labels.push_back(std::move(req));
  }
  c.out += "</g>\n";
}

void draw_enthalpy(Ctx& c) {
  const auto& g = c.g;
  const bool ip = c.s == System::ip;
  auto h_disp = [&](double h) { return ip ? units::enthalpy_ip_from_si(h) : h; };
  auto h_si = [&](double d) { return ip ? units::enthalpy_si_from_ip(d) : d; };
  const double lo = h_disp(psychro::enthalpy_kj_per_kg(g.dry_bulb_min_c(), 0.0));
  const double hi = h_disp(psychro::enthalpy_kj_per_kg(g.dry_bulb_max_c(), g.humidity_ratio_max()));
  c.out += fmt::format(
      "<g class=\"enthalpy\" fill=\"none\" stroke=\"{}\" stroke-width=\"0.7\" "
      "stroke-opacity=\"0.8\">\n",
      kEnthalpy);
  for (double d = std::ceil(lo / c.ax.h_step) * c.ax.h_step; d <= hi; d += c.ax.h_step) {
    const Curve line = enthalpy_curve(g, c.psy, h_si(d));
    if (line.size() < 2) continue;
    c.out += fmt::format("<path data-enthalpy=\"{}\" d=\"{}\"/>\n", num(d), path_d(to_px(line, g)));
    const ChartPoint start = line.front();
    const bool on_curve = std::fabs(start.humidity_ratio - c.psy.w_sat(start.dry_bulb_c)) < 1e-6;
    const bool on_top = start.humidity_ratio >= g.humidity_ratio_max() - 1e-12;
    if (!on_curve && !on_top) continue;
    LabelRequest req{"enthalpy-labels",
                     fmt::format("{:.0f}", d),
                     {9.5, false, Anchor::end, "fill=\"#8a5f22\" font-style=\"italic\""},
                     false,
                     false,
                     {}};
    req.places.push_back({g.x(start.dry_bulb_c) - 3, g.y(start.humidity_ratio) - 4});
    c.labels.push_back(std::move(req));
  }
  c.out += "</g>\n";
}

void draw_wet_bulb(Ctx& c) {
  const auto& g = c.g;
  const double d0 = t_disp(g.dry_bulb_min_c(), c.s), d1 = t_disp(g.dry_bulb_max_c(), c.s);
  c.out += fmt::format(
      "<g class=\"wet-bulb\" fill=\"none\" stroke=\"{}\" stroke-width=\"0.9\" "
      "stroke-dasharray=\"1.2 2.8\" "
      "stroke-linecap=\"round\">\n",
      kWetBulb);
  for (double d = std::ceil(d0 / c.ax.wb_step) * c.ax.wb_step; d < d1; d += c.ax.wb_step) {
    const double wb = t_si(d, c.s);
    const Curve line = wet_bulb_curve(g, c.psy, wb);
    for (const auto& run : clip(line, g)) {
      c.out +=
          fmt::format("<path data-wet-bulb=\"{}\" d=\"{}\"/>\n", num(d), path_d(to_px(run, g)));
      if (std::fabs(run.front().dry_bulb_c - wb) >= 1e-9 ||
          run.front().humidity_ratio >= g.humidity_ratio_max())
        continue;
      // From where the line leaves saturation, down along it when that place is taken.
      LabelRequest req{"wet-bulb-labels",
                       fmt::format("wb {:.0f}", d),
                       {8.5, false, Anchor::start, "fill=\"#3f6f61\""},
                       true,
                       true,
                       {}};
      for (const auto& st : stations(to_px(run, g), 3.0))
        if (st.s <= 120.0) req.places.push_back({st.p.x + 4, st.p.y + 11});
      c.labels.push_back(std::move(req));
    }
  }
  c.out += "</g>\n";
}

struct BinTally {
  std::array<double, kHourOutcomeCount> hours{};
  double total() const { return hours[0] + hours[1] + hours[2]; }
};

// Opacity of a cell from its hours: square-root scale, so a single hour still shows.
double cell_opacity(double hours, double max_hours) {
  return 0.16 + 0.74 * std::sqrt(std::clamp(hours / max_hours, 0.0, 1.0));
}

struct OverlaySummary {
  BinSize bin{};
  std::array<double, kHourOutcomeCount> hours{};
  double max_cell = 0.0;
  std::size_t cells = 0;
};

// The bin of a value on a grid of `step`: the quotient is held to ±1e15 (and a NaN to 0)
// before the cast, so no value can make the conversion to an integer undefined.
long bin_of(double value, double step) {
  const double q = std::floor(value / step);
  return q == q ? static_cast<long>(std::clamp(q, -1e15, 1e15)) : 0L;
}

// Share of the columns (or rows) spanned by the data that are empty between two filled ones.
double stripe_share(std::span<const ClimateHour> climate, double step, auto&& coordinate) {
  std::map<long, double> filled;
  for (const auto& h : climate) filled[bin_of(coordinate(h), step)] += h.hours;
  if (filled.size() < 3) return 0.0;
  const long lo = filled.begin()->first, hi = filled.rbegin()->first;
  long stripes = 0;
  for (long k = lo + 1; k < hi; ++k)
    if (!filled.count(k) && filled.count(k - 1) && filled.count(k + 1)) ++stripes;
  return static_cast<double>(stripes) / static_cast<double>(hi - lo + 1);
}

// More than this share of stripes is the recording's resolution showing, not the climate.
constexpr double kStripeShare = 0.05;

// Whether nearly every occupied hour's dry-bulb is a whole degree of `recorded`, give or take
// the 0.05 °C of a file that stores the reading in tenths of the other unit (TMY3 keeps whole
// °F readings as tenths of °C).
bool on_whole_degrees(std::span<const ClimateHour> climate, System recorded) {
  constexpr double kToleranceC = 0.06;
  constexpr double kShare = 0.95;
  double on = 0.0, all = 0.0;
  for (const auto& h : climate) {
    const double d = t_disp(h.outdoor.dry_bulb_c, recorded);
    const double off_c = std::fabs(t_si(d, recorded) - t_si(std::round(d), recorded));
    if (off_c <= kToleranceC) on += h.hours;
    all += h.hours;
  }
  return all > 0.0 && on >= kShare * all;
}

OverlaySummary draw_climate(Ctx& c) {
  OverlaySummary sum;
  if (c.in.climate.empty()) return sum;
  const BinSize bin = overlay_bin_size(c.in.climate, c.s);
  sum.bin = bin;
  std::map<std::pair<long, long>, BinTally> cells;
  for (const auto& h : c.in.climate) {
    const double td = t_disp(h.outdoor.dry_bulb_c, c.s);
    const double wd = h.outdoor.humidity_ratio * c.ax.w_per_kgkg;
    const auto key = std::make_pair(bin_of(td - bin.dry_bulb_origin, bin.dry_bulb),
                                    bin_of(wd, bin.humidity_ratio));
    cells[key].hours[static_cast<std::size_t>(h.outcome)] += h.hours;
    sum.hours[static_cast<std::size_t>(h.outcome)] += h.hours;
  }
  for (const auto& [k, t] : cells) sum.max_cell = std::max(sum.max_cell, t.total());
  sum.cells = cells.size();
  if (!(sum.max_cell > 0.0)) return sum;
  c.out += "<g class=\"climate\">\n";
  std::string mixed;
  for (const auto& [k, t] : cells) {
    const double total = t.total();
    if (!(total > 0.0)) continue;
    std::size_t dom = 0, second = 0;
    for (std::size_t i = 1; i < kHourOutcomeCount; ++i)
      if (t.hours[i] > t.hours[dom]) dom = i;
    second = dom == 0 ? 1 : 0;
    for (std::size_t i = 0; i < kHourOutcomeCount; ++i)
      if (i != dom && t.hours[i] > t.hours[second]) second = i;
    const double x0 = c.g.x(t_si(bin.dry_bulb_origin + k.first * bin.dry_bulb, c.s));
    const double x1 = c.g.x(t_si(bin.dry_bulb_origin + (k.first + 1) * bin.dry_bulb, c.s));
    const double y0 = c.g.y((k.second + 1) * bin.humidity_ratio / c.ax.w_per_kgkg);
    const double y1 = c.g.y(k.second * bin.humidity_ratio / c.ax.w_per_kgkg);
    c.out += fmt::format(
        "<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"{}\" "
        "fill-opacity=\"{:.3f}\"/>\n",
        num(x0), num(y0), num(x1 - x0), num(y1 - y0), kOutcomes[dom].colour,
        cell_opacity(total, sum.max_cell));
    // A cell where another outcome holds a fifth of the hours or more carries a dot of it.
    if (t.hours[second] >= 0.2 * total)
      mixed += fmt::format("<circle cx=\"{}\" cy=\"{}\" r=\"1.8\" fill=\"{}\"/>\n",
                           num(0.5 * (x0 + x1)), num(0.5 * (y0 + y1)), kOutcomes[second].colour);
  }
  c.out += "</g>\n<g class=\"climate-mixed\">\n" + mixed + "</g>\n";
  return sum;
}

void draw_saturation(Ctx& c) {
  for (const auto& run : clip(saturation_curve(c.g, c.psy), c.g))
    c.out += fmt::format(
        "<path id=\"saturation\" class=\"saturation\" d=\"{}\" fill=\"none\" stroke=\"{}\" "
        "stroke-width=\"2.4\" stroke-linejoin=\"round\"/>\n",
        path_d(to_px(run, c.g)), kInk);
}

std::string fmt_t(double c, System s) { return units::format(units::Kind::temperature, s, c, 1); }

// The mixed-air target line, and its label along it (rotated, reading upwards); the label's
// box is taken so nothing is placed over it.
void draw_target(Ctx& c, Layout& lay) {
  const double t = c.in.mixed_air_target_c;
  if (t < c.g.dry_bulb_min_c() || t > c.g.dry_bulb_max_c()) return;
  const double top = std::min(c.psy.w_sat(t), c.g.humidity_ratio_max());
  const double x = c.g.x(t);
  c.out += fmt::format(
      "<path class=\"mixed-air-target\" d=\"M{} {} L{} {}\" stroke=\"{}\" stroke-width=\"1.4\" "
      "stroke-dasharray=\"6 3 1.5 3\" fill=\"none\"/>\n",
      num(x), num(c.g.y(0)), num(x), num(c.g.y(top)), kTarget);
  const std::string label = "mixed-air target " + fmt_t(t, c.s);
  const double len = text_width(label, 10, false);
  const Box box{x - 4 - 7.6 - 1.5, c.g.y(0) - 8 - len - 1.5, x - 4 + 2.4 + 1.5, c.g.y(0) - 8 + 1.5};
  lay.take(box);
  c.out += fmt::format(
      "<text class=\"mixed-air-target-label\" transform=\"translate({} {}) rotate(-90)\" "
      "font-size=\"10\" fill=\"{}\" stroke=\"{}\" stroke-width=\"3\" paint-order=\"stroke\"{}>{}"
      "</text>\n",
      num(x - 4), num(c.g.y(0) - 8), kTarget, kPaper, box_attr(box), esc(label));
}

struct Mark {
  ChartPoint p;
  std::string_view shape, fill, cls;
  std::string label;
  double dx = 9, dy = -8;  // label offset
  Box box{};               // of the label
};

const TextStyle kMarkText{10.5, true, Anchor::start, ""};

Box mark_label_box(double x, double y, const Mark& m) {
  TextStyle st = kMarkText;
  st.anchor = m.dx < 0 ? Anchor::end : Anchor::start;
  return text_box(x + m.dx, y + m.dy, m.label, st);
}

std::string state_text(const ChartPoint& p, double pressure, System s) {
  const double rh =
      psychro::relative_humidity_from_humidity_ratio(p.dry_bulb_c, p.humidity_ratio, pressure);
  return fmt::format("{}, {:.0f}% RH", fmt_t(p.dry_bulb_c, s), 100.0 * rh);
}

// The marks of the chart; their symbols' boxes are taken.
std::vector<Mark> layout_marks(const Ctx& c, Layout& lay) {
  std::vector<Mark> marks;
  if (c.in.check) {
    const auto& k = *c.in.check;
    marks.push_back({k.outdoor, "circle", "#b03a2e", "outdoor",
                     "outdoor " + state_text(k.outdoor, c.psy.p, c.s)});
    marks.push_back(
        {k.ret, "diamond", kInk, "return-air", "return " + state_text(k.ret, c.psy.p, c.s)});
    marks.push_back({k.mixed, "square", "#1d6b52", "mixed-air",
                     fmt::format("mixed {} ({:.0f}% outdoor air)", fmt_t(k.mixed.dry_bulb_c, c.s),
                                 100.0 * k.oa_fraction)});
  } else {
    marks.push_back({c.in.return_air, "diamond", kInk, "return-air",
                     "return air " + state_text(c.in.return_air, c.psy.p, c.s)});
  }
  for (const auto& m : marks)
    lay.take(around(c.g.x(m.p.dry_bulb_c), c.g.y(m.p.humidity_ratio), 8, 8));
  return marks;
}

// Where the marks' labels go: the first place around each mark that is clear of what is
// placed before it and of the lines, else clear of the boxes alone, else the first place.
void place_mark_labels(const Ctx& c, std::vector<Mark>& marks, Layout& lay) {
  // Below right, above right, above left, below left of the mark, then further down and up.
  std::vector<std::pair<double, double>> places = {{10, 18}, {10, -9}, {-10, -9}, {-10, 18}};
  for (double step = 14; step <= 84; step += 14)
    for (const double dx : {10.0, -10.0})
      for (const double dy : {18 + step, -9 - step}) places.push_back({dx, dy});
  for (auto& m : marks) {
    const double x = c.g.x(m.p.dry_bulb_c), y = c.g.y(m.p.humidity_ratio);
    // A label next to its mark may cross a line; one far from it reads as no one's.
    constexpr std::size_t kNear = 6;
    bool placed = false;
    for (const auto& [reach, of_lines] :
         {std::pair{kNear, true}, std::pair{kNear, false}, std::pair{places.size(), true},
          std::pair{places.size(), false}}) {
      for (std::size_t i = 0; i < reach && !placed; ++i) {
        std::tie(m.dx, m.dy) = places[i];
        placed = lay.clear(mark_label_box(x, y, m), of_lines);
      }
      if (placed) break;
    }
    if (!placed) std::tie(m.dx, m.dy) = places.front();
    m.box = mark_label_box(x, y, m);
    lay.take(m.box);
  }
}

// --- Strategy lines and their badges -----------------------------------------------------

constexpr std::string_view kSharedLine = "#3d3832";  // graphite: a line of several strategies
constexpr double kBadgeStep = 15.0;                  // one number of a badge group
constexpr double kBadgeHalfHeight = 9.0;
// A piece this short is left without a badge when its strategies are numbered elsewhere.
constexpr double kMinBadgedPx = 18.0;

double badge_half_width(std::size_t n) { return n == 1 ? 9.0 : (kBadgeStep * n + 4.0) / 2; }

// Where a segment's badge goes: the centre on its own path, nearest to a point a little in
// from its upper end (the end nearest the saturation curve, where lines are furthest apart),
// inside the plot, wholly under saturation and clear of everything placed before it.
std::optional<Px> badge_place(const Segment& seg, const Layout& lay) {
  std::vector<Px> pts = seg.pts;
  const bool reverse =
      pts.back().y < pts.front().y - 1e-9 ||
      (std::fabs(pts.back().y - pts.front().y) <= 1e-9 && pts.back().x < pts.front().x);
  if (reverse) std::reverse(pts.begin(), pts.end());
  const double len = path_length(pts);
  const double preferred = std::min(26.0, len / 2);
  auto sts = stations(pts, 1.5);
  std::stable_sort(sts.begin(), sts.end(), [&](const Station& a, const Station& b) {
    return std::fabs(a.s - preferred) < std::fabs(b.s - preferred);
  });
  const double hw = badge_half_width(seg.members.size());
  // Then, on a crowded line, a place with only its centre under saturation.
  for (const bool whole : {true, false})
    for (const auto& st : sts) {
      const Box b = around(st.p.x, st.p.y, hw, kBadgeHalfHeight);
      const bool under =
          whole ? lay.under_saturation(b) : lay.under_saturation(around(st.p.x, st.p.y, 0, 0));
      if (lay.in_plot(b) && under && lay.clear(b, false)) return st.p;
    }
  return std::nullopt;
}

// A badge group; `in_plot` ones carry their place for tests, the legend's sample does not.
std::string badge_svg(const std::vector<std::size_t>& members, Px at, const Box& box,
                      bool in_plot = true) {
  std::string s =
      in_plot ? fmt::format(
                    "<g class=\"badge\" data-strategies=\"{}\" data-cx=\"{}\" data-cy=\"{}\"{}>",
                    members_attr(members), num(at.x), num(at.y), box_attr(box))
              : std::string("<g class=\"badge-sample\">");
  const std::size_t n = members.size();
  if (n > 1)
    s += fmt::format(
        "<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" rx=\"{}\" fill=\"{}\" stroke=\"{}\" "
        "stroke-width=\"1.5\"/>",
        num(box.x0), num(box.y0), num(box.x1 - box.x0), num(box.y1 - box.y0), num(kBadgeHalfHeight),
        kSharedLine, kPaper);
  for (std::size_t i = 0; i < n; ++i) {
    const double x = box.x0 + (n == 1 ? 9.0 : 2.0 + kBadgeStep * (i + 0.5));
    s += fmt::format(
        "<circle cx=\"{}\" cy=\"{}\" r=\"7.2\" fill=\"{}\"{}/>"
        "<text x=\"{}\" y=\"{}\" font-size=\"9.5\" font-weight=\"bold\" fill=\"#ffffff\" "
        "text-anchor=\"middle\">{}</text>",
        num(x), num(at.y), strategy_colour(members[i]),
        n == 1 ? fmt::format(" stroke=\"{}\" stroke-width=\"1.5\"", kPaper) : "", num(x),
        num(at.y + 3.4), members[i] + 1);
  }
  return s + "</g>\n";
}

// Draws the segments, cased in paper colour so each reads over the cells, and places their
// badges. A segment whose badge finds no clear place still gets one, at its preferred place
// on its line, so no strategy goes unnamed.
void draw_boundaries(Ctx& c, const std::vector<Segment>& segs, std::vector<bool>& drawn,
                     Layout& lay) {
  std::string casing, lines, badges;
  std::vector<bool> badged(c.in.strategies.size(), false);
  std::vector<std::size_t> order(segs.size());
  for (std::size_t i = 0; i < segs.size(); ++i) order[i] = i;
  // Longer pieces first: a short piece may then go without a badge of its own.
  std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
    return path_length(segs[a].pts) > path_length(segs[b].pts);
  });
  for (const std::size_t i : order) {
    const Segment& seg = segs[i];
    const bool shared = seg.members.size() > 1;
    const auto& st0 = c.in.strategies[seg.members.front()];
    casing += fmt::format("<path d=\"{}\"/>\n", path_d(seg.pts));
    std::string names;
    for (const std::size_t m : seg.members) {
      drawn[m] = true;
      names += (names.empty() ? "" : "; ") + c.in.strategies[m].name;
    }
    lines += fmt::format(
        "<path class=\"boundary\" data-strategies=\"{}\" data-strategy=\"{}\" "
        "data-quantity=\"{}\" data-reference=\"{}\" data-line-si=\"{}\" d=\"{}\" stroke=\"{}\" "
        "stroke-width=\"{}\"/>\n",
        members_attr(seg.members), esc(shared ? names : st0.name), quantity_attr(seg.quantity),
        seg.references, fmt::format("{:.8g}", seg.key), path_d(seg.pts),
        shared ? kSharedLine : strategy_colour(seg.members.front()), shared ? "3.8" : "2.2");
    // A shared line is hollow, a rail of graphite round a paper core: no strategy's colour.
    if (shared)
      lines +=
          fmt::format("<path class=\"shared-core\" d=\"{}\" stroke=\"{}\" stroke-width=\"1.2\"/>\n",
                      path_d(seg.pts), kPaper);
    const bool all_named = std::all_of(seg.members.begin(), seg.members.end(),
                                       [&](std::size_t m) { return badged[m]; });
    if (path_length(seg.pts) < kMinBadgedPx && all_named) continue;
    const std::optional<Px> at = badge_place(seg, lay);
    if (!at && all_named) continue;
    const Px p = at ? *at : seg.pts[seg.pts.size() / 2];
    const Box box = around(p.x, p.y, badge_half_width(seg.members.size()), kBadgeHalfHeight);
    lay.take(box);
    badges += badge_svg(seg.members, p, box);
    for (const std::size_t m : seg.members) badged[m] = true;
  }
  c.out += fmt::format(
      "<g class=\"high-limit-casing\" fill=\"none\" stroke=\"{}\" stroke-width=\"5\" "
      "stroke-opacity=\"0.9\">\n{}</g>\n",
      kPaper, casing);
  c.out += "<g class=\"high-limits\" fill=\"none\" stroke-linecap=\"butt\">\n" + lines + "</g>\n";
  c.out += "<g class=\"badges\">\n" + badges + "</g>\n";
}

void draw_marks(Ctx& c, const std::vector<Mark>& marks) {
  if (c.in.check) {
    const auto& k = *c.in.check;
    const std::vector<Px> mix = {{c.g.x(k.outdoor.dry_bulb_c), c.g.y(k.outdoor.humidity_ratio)},
                                 {c.g.x(k.ret.dry_bulb_c), c.g.y(k.ret.humidity_ratio)}};
    c.out += fmt::format(
        "<path class=\"mixing-line\" d=\"{}\" stroke=\"{}\" stroke-width=\"1.3\" fill=\"none\"/>\n",
        path_d(mix), kInkSoft);
  }
  for (const auto& m : marks) {
    const double x = c.g.x(m.p.dry_bulb_c), y = c.g.y(m.p.humidity_ratio);
    if (m.shape == "diamond")
      c.out += fmt::format(
          "<path class=\"{}\" d=\"M{} {} L{} {} L{} {} L{} {} Z\" fill=\"{}\" stroke=\"{}\" "
          "stroke-width=\"1.5\"/>\n",
          m.cls, num(x), num(y - 7), num(x + 7), num(y), num(x), num(y + 7), num(x - 7), num(y),
          m.fill, kPaper);
    else if (m.shape == "square")
      c.out += fmt::format(
          "<rect class=\"{}\" x=\"{}\" y=\"{}\" width=\"11\" height=\"11\" fill=\"{}\" "
          "stroke=\"{}\" "
          "stroke-width=\"1.5\"/>\n",
          m.cls, num(x - 5.5), num(y - 5.5), m.fill, kPaper);
    else
      c.out += fmt::format(
          "<circle class=\"{}\" cx=\"{}\" cy=\"{}\" r=\"6\" fill=\"{}\" stroke=\"{}\" "
          "stroke-width=\"1.5\"/>\n",
          m.cls, num(x), num(y), m.fill, kPaper);
    c.out += text(x + m.dx, y + m.dy, m.label,
                  fmt::format("font-size=\"10.5\" font-weight=\"bold\" fill=\"{}\"{}{}", m.fill,
                              m.dx < 0 ? " text-anchor=\"end\"" : "", box_attr(m.box)),
                  true);
  }
}

void draw_axes(Ctx& c) {
  const auto& a = c.g.area();
  const double bottom = a.top + a.height, right = a.left + a.width;
  c.out += fmt::format("<g class=\"axes\" stroke=\"{}\" stroke-width=\"1\">\n", kInk);
  c.out += fmt::format("<path d=\"M{} {} L{} {} L{} {}\" fill=\"none\"/>\n", num(a.left),
                       num(bottom), num(right), num(bottom), num(right), num(a.top));
  std::string labels;
  const double d0 = t_disp(c.g.dry_bulb_min_c(), c.s), d1 = t_disp(c.g.dry_bulb_max_c(), c.s);
  for (double d = std::ceil(d0 / c.ax.t_major - 1e-9) * c.ax.t_major; d <= d1 + 1e-9;
       d += c.ax.t_major) {
    const double x = c.g.x(t_si(d, c.s));
    c.out +=
        fmt::format("<path d=\"M{} {} L{} {}\"/>\n", num(x), num(bottom), num(x), num(bottom + 5));
    labels += text(x, bottom + 17, tick_label(d),
                   fmt::format("font-size=\"11\" fill=\"{}\" text-anchor=\"middle\"", kInk));
  }
  const double wd1 = c.g.humidity_ratio_max() * c.ax.w_per_kgkg;
  for (double d = 0; d <= wd1 + 1e-9; d += c.ax.w_major) {
    const double y = c.g.y(w_of_display(c, d));
    c.out +=
        fmt::format("<path d=\"M{} {} L{} {}\"/>\n", num(right), num(y), num(right + 5), num(y));
    labels +=
        text(right + 8, y + 4, tick_label(d), fmt::format("font-size=\"11\" fill=\"{}\"", kInk));
  }
  c.out += "</g>\n";
  c.out += labels;
  const std::string axis_attr =
      fmt::format("font-size=\"10.5\" fill=\"{}\" letter-spacing=\"1.2\"", kInkSoft);
  c.out += text(a.left + a.width / 2, bottom + 36, fmt::format("DRY-BULB {}", t_unit(c.s)),
                axis_attr + " text-anchor=\"middle\"");
  c.out += fmt::format(
      "<text transform=\"translate({} {}) rotate(90)\" {} text-anchor=\"middle\">{}</text>\n",
      num(kWidth - 20), num(a.top + a.height / 2), axis_attr,
      esc(fmt::format("HUMIDITY RATIO {} DRY AIR",
                      c.s == System::ip ? "GRAINS PER LB" : "G PER KG")));
}

void draw_title(Ctx& c) {
  const std::string pressure =
      units::format(units::Kind::pressure, c.s, c.in.pressure_kpa, c.s == System::ip ? 3 : 2);
  c.out += text(kPlot.left, 30, fmt::format("Psychrometric chart at {}", pressure),
                fmt::format("font-size=\"19\" font-weight=\"bold\" fill=\"{}\"", kInk));
  std::string sub = c.in.pressure_basis;
  if (!c.in.title.empty()) sub = c.in.title + (sub.empty() ? "" : " — " + sub);
  if (!sub.empty())
    c.out += text(kPlot.left, 50, sub, fmt::format("font-size=\"12\" fill=\"{}\"", kInkSoft));
  if (!c.in.climate_label.empty())
    c.out += text(kPlot.left, 66, "Occupied hours: " + c.in.climate_label,
                  fmt::format("font-size=\"11\" fill=\"{}\"", kInkSoft));
  else if (c.in.check)
    c.out += text(kPlot.left, 66, "Checked point — " + c.in.check->note,
                  fmt::format("font-size=\"11\" fill=\"{}\"", kInkSoft));
}

std::string hours_text(double h) { return fmt::format("{:.0f} h", h); }

// The legend under the plot; returns the height used.
double draw_legend(Ctx& c, double y, const std::vector<bool>& drawn,
                   const std::vector<std::size_t>& shared, const OverlaySummary& ov) {
  const double x = kPlot.left;
  const std::string head = fmt::format(
      "font-size=\"10\" font-weight=\"bold\" fill=\"{}\" letter-spacing=\"1.1\"", kInkSoft);
  const std::string body = fmt::format("font-size=\"11\" fill=\"{}\"", kInk);
  const double y0 = y;
  c.out += "<g class=\"legend\">\n";
  if (!c.in.strategies.empty()) {
    c.out += text(
        x, y, "HIGH-LIMITS — the economizer may run on the cooler, drier side of each line", head);
    y += 18;
    for (std::size_t i = 0; i < c.in.strategies.size(); ++i) {
      const auto& st = c.in.strategies[i];
      const std::string_view colour = strategy_colour(i);
      c.out += fmt::format("<circle cx=\"{}\" cy=\"{}\" r=\"7.5\" fill=\"{}\"/>", num(x + 8),
                           num(y - 4), colour);
      c.out +=
          text(x + 8, y - 0.6, std::to_string(i + 1),
               "font-size=\"9.5\" font-weight=\"bold\" fill=\"#ffffff\" text-anchor=\"middle\"");
      c.out += fmt::format("<path d=\"M{} {} L{} {}\" stroke=\"{}\" stroke-width=\"2.2\"/>\n",
                           num(x + 22), num(y - 4), num(x + 46), num(y - 4), colour);
      std::string line = st.name + " — " +
                         (st.conditions.empty() ? std::string("no high-limit: always permitted")
                                                : describe_strategy(st, c.s));
      if (!drawn[i] && !st.conditions.empty()) line += " (its limits lie outside this chart)";
      const auto lines = wrap(line, 118);
      for (std::size_t l = 0; l < lines.size(); ++l) {
        c.out += text(x + 54, y, lines[l], body);
        y += 15;
      }
      y += 2;
    }
    if (!shared.empty()) {
      // A sample of a shared line with the badge group of one on this chart.
      const double hw = badge_half_width(shared.size());
      const double cx = x + std::max(24.0, hw + 2);
      const std::vector<Px> rail = {{cx - hw - 6, y - 4}, {cx + hw + 6, y - 4}};
      c.out += fmt::format(
          "<path d=\"{0}\" stroke=\"{1}\" stroke-width=\"3.8\"/><path d=\"{0}\" "
          "stroke=\"{2}\" stroke-width=\"1.2\"/>\n",
          path_d(rail), kSharedLine, kPaper);
      c.out += badge_svg(shared, {cx, y - 4}, around(cx, y - 4, hw, kBadgeHalfHeight), false);
      c.out += text(std::max(x + 54, cx + hw + 14), y,
                    "hollow graphite line: shared by the strategies whose numbers its badge "
                    "group carries, drawn once",
                    body);
      y += 17;
    }
    y += 10;
  }
  if (!c.in.climate.empty()) {
    const double total = ov.hours[0] + ov.hours[1] + ov.hours[2];
    c.out += text(x, y,
                  fmt::format("OCCUPIED HOURS BY WHAT THE PERFECT CHANGEOVER DOES — {} in all",
                              hours_text(total)),
                  head);
    y += 20;
    double cx = x;
    for (const auto& o : kOutcomes) {
      const double h = ov.hours[static_cast<std::size_t>(o.outcome)];
      c.out += fmt::format(
          "<rect x=\"{}\" y=\"{}\" width=\"14\" height=\"14\" fill=\"{}\" "
          "fill-opacity=\"0.85\"/>\n",
          num(cx), num(y - 11), o.colour);
      const std::string label = fmt::format("{} {}", o.name, hours_text(h));
      c.out += text(cx + 20, y, label, body);
      cx += 34 + 6.6 * static_cast<double>(label.size());
    }
    y += 20;
    // Density key: four cells from one hour to the fullest cell.
    const BinSize bin = ov.bin;
    const std::string cell = fmt::format("one cell = {:.3g} {} × {:.3g} {}", bin.dry_bulb,
                                         t_unit(c.s), bin.humidity_ratio, c.ax.w_unit);
    const double qs[] = {std::min(1.0, ov.max_cell), ov.max_cell / 4, ov.max_cell / 2, ov.max_cell};
    double kx = x;
    for (double q : qs) {
      c.out += fmt::format(
          "<rect x=\"{}\" y=\"{}\" width=\"14\" height=\"14\" fill=\"{}\" "
          "fill-opacity=\"{:.3f}\"/>\n",
          num(kx), num(y - 11), kOutcomes[0].colour, cell_opacity(q, ov.max_cell));
      kx += 16;
    }
    c.out += text(
        kx + 6, y,
        fmt::format(
            "{}; shade from 1 h to {} in a cell; a dot marks a cell where another outcome holds a "
            "fifth of the hours or more",
            cell, hours_text(ov.max_cell)),
        body);
    y += 24;
  }
  c.out += text(x, y, "LINES AND MARKS", head);
  y += 18;
  const std::string h_unit =
      c.s == System::ip ? "Btu/lb (0 °F dry-air datum)" : "kJ/kg (0 °C dry-air datum)";
  const std::string lines[] = {
      fmt::format("relative humidity every 10 %; enthalpy every {} {} labelled above the "
                  "saturation curve; wet-bulb every {} {} (dotted)",
                  tick_label(c.ax.h_step), h_unit, tick_label(c.ax.wb_step), t_unit(c.s)),
      c.in.check ? "outdoor (circle), return (diamond) and mixed air (square) of the checked "
                   "point, on their mixing line; " +
                       c.in.check->note
                 : "return air (diamond): the state differential high-limits compare with",
      fmt::format("mixed-air target {} (dash-dot): supply setpoint less fan heat",
                  fmt_t(c.in.mixed_air_target_c, c.s)),
  };
  for (const auto& l : lines) {
    c.out += text(x, y, l, body);
    y += 15;
  }
  c.out += "</g>\n";
  return y - y0;
}

}  // namespace

// --- Public ------------------------------------------------------------------------------

ChartGeometry::ChartGeometry(double t0, double t1, double wmax, PlotArea area)
    : t_min_(t0), t_max_(t1), w_max_(wmax), area_(area) {
  if (!std::isfinite(t0) || !std::isfinite(t1) || !std::isfinite(wmax) || !(t1 > t0) ||
      !(wmax > 0) || !(area.width > 0) || !(area.height > 0))
    throw std::invalid_argument("ChartGeometry: empty or non-finite range");
}

double ChartGeometry::x(double t) const {
  return area_.left + (t - t_min_) / (t_max_ - t_min_) * area_.width;
}
double ChartGeometry::y(double w) const {
  return area_.top + area_.height - w / w_max_ * area_.height;
}
double ChartGeometry::dry_bulb_c(double x) const {
  return t_min_ + (x - area_.left) / area_.width * (t_max_ - t_min_);
}
double ChartGeometry::humidity_ratio(double y) const {
  return (area_.top + area_.height - y) / area_.height * w_max_;
}

std::string_view hour_outcome_name(HourOutcome o) {
  return kOutcomes[static_cast<std::size_t>(o)].name;
}

std::vector<ClimateHour> climate_hours(const annual::Prepared& prepared) {
  std::vector<ClimateHour> out;
  out.reserve(prepared.intervals.size());
  for (const auto& iv : prepared.intervals) {
    if (!(iv.hours > 0.0)) continue;
    const HourOutcome o = !iv.cooling_needed   ? HourOutcome::no_cooling_needed
                          : iv.enabling_pays() ? HourOutcome::economize
                                               : HourOutcome::do_not_economize;
    out.push_back(
        {{iv.outdoor[Quantity::dry_bulb], iv.outdoor[Quantity::humidity_ratio]}, iv.hours, o});
  }
  return out;
}

BinSize overlay_bin_size(std::span<const ClimateHour> climate, System s) {
  const AxisStyle& ax = axis_style(s);
  BinSize bin = ax.bin;
  // Readings in whole degrees of either system: one column per reading step, centred on the
  // readings, so every column holds the same readings and none is empty between full ones.
  for (const System recorded : {System::ip, System::si}) {
    if (!on_whole_degrees(climate, recorded)) continue;
    bin.dry_bulb = t_disp(t_si(1.0, recorded), s) - t_disp(t_si(0.0, recorded), s);
    bin.dry_bulb_origin = t_disp(t_si(-0.5, recorded), s);
    break;
  }
  auto dry_bulb = [&](const ClimateHour& h) {
    return t_disp(h.outdoor.dry_bulb_c, s) - bin.dry_bulb_origin;
  };
  for (int k = 0; k < 2 && stripe_share(climate, bin.dry_bulb, dry_bulb) > kStripeShare; ++k)
    bin.dry_bulb *= 2;
  for (int k = 0; k < 2 && stripe_share(climate, bin.humidity_ratio,
                                        [&](const ClimateHour& h) {
                                          return h.outdoor.humidity_ratio * ax.w_per_kgkg;
                                        }) > kStripeShare;
       ++k)
    bin.humidity_ratio *= 2;
  return bin;
}

std::string_view strategy_colour(std::size_t i) {
  return kStrategyColours[i % std::size(kStrategyColours)];
}

ChartGeometry chart_geometry(const ChartInput& in) {
  const AxisStyle& ax = axis_style(in.units);
  double t_lo = ax.t_min, t_hi = ax.t_max, w_hi = ax.w_max;
  auto take = [&](const ChartPoint& p) {
    const double d = t_disp(p.dry_bulb_c, in.units);
    t_lo = std::min(t_lo, d);
    t_hi = std::max(t_hi, d);
    w_hi = std::max(w_hi, p.humidity_ratio * ax.w_per_kgkg);
  };
  for (const auto& h : in.climate) take(h.outdoor);
  take(in.return_air);
  if (in.check) {
    take(in.check->outdoor);
    take(in.check->ret);
    take(in.check->mixed);
  }
  auto take_t = [&](double c) {
    if (c < kLimitRangeMinC || c > kLimitRangeMaxC) return;
    t_lo = std::min(t_lo, t_disp(c, in.units));
    t_hi = std::max(t_hi, t_disp(c, in.units));
  };
  take_t(in.mixed_air_target_c);
  highlimit::AirValues ret = values_at(in.return_air, in.pressure_kpa);
  for (const auto& s : in.strategies)
    for (const auto& c : s.conditions) {
      const double lim = c.effective_limit(ret);
      if (c.quantity == Quantity::dry_bulb) take_t(lim);
      if (c.quantity == Quantity::dew_point && lim >= kLimitRangeMinC && lim <= kLimitRangeMaxC)
        w_hi = std::max(w_hi, psychro::humidity_ratio_from_dew_point(lim, in.pressure_kpa) *
                                  ax.w_per_kgkg * 1.02);
    }
  t_lo = std::floor(t_lo / ax.t_major + 1e-9) * ax.t_major;
  t_hi = std::ceil(t_hi / ax.t_major - 1e-9) * ax.t_major;
  w_hi = std::ceil(w_hi / ax.w_major - 1e-9) * ax.w_major;
  return ChartGeometry(t_si(t_lo, in.units), t_si(t_hi, in.units), w_hi / ax.w_per_kgkg, kPlot);
}

std::string psychrometric_chart_svg(const ChartInput& in) {
  psychro::check_pressure(in.pressure_kpa, "chart pressure");
  const ChartGeometry g = chart_geometry(in);
  Ctx c{in, g, Psy{in.pressure_kpa}, axis_style(in.units), in.units, {}, {}};
  const highlimit::AirValues ret = values_at(in.return_air, in.pressure_kpa);
  const auto segs = shared_segments(boundaries(in.strategies, ret, g, c.psy), in.strategies, g);

  Layout lay(g, c.psy);
  for (const auto& run : clip(saturation_curve(g, c.psy), g)) lay.keep_off_line(to_px(run, g));
  for (const auto& seg : segs) lay.keep_off_line(seg.pts);
  if (in.mixed_air_target_c >= g.dry_bulb_min_c() && in.mixed_air_target_c <= g.dry_bulb_max_c())
    lay.keep_off_line({{g.x(in.mixed_air_target_c), g.y(0)},
                       {g.x(in.mixed_air_target_c), g.y(std::min(c.psy.w_sat(in.mixed_air_target_c),
                                                                 g.humidity_ratio_max()))}});

  draw_paper(c);
  draw_grid(c);
  draw_rh(c);
  draw_enthalpy(c);
  draw_wet_bulb(c);
  const OverlaySummary ov = draw_climate(c);
  draw_saturation(c);
  std::vector<Mark> marks = layout_marks(c, lay);
  draw_target(c, lay);
  std::vector<bool> drawn(in.strategies.size(), false);
  draw_boundaries(c, segs, drawn, lay);
  place_mark_labels(c, marks, lay);
  draw_marks(c, marks);
  c.out += place_labels(c.labels, lay);
  draw_axes(c);
  draw_title(c);
  const double legend_top = g.area().top + g.area().height + 66;
  // The legend explains shared lines with the smallest group on the chart.
  std::vector<std::size_t> shared;
  for (const auto& seg : segs)
    if (seg.members.size() > 1 && (shared.empty() || seg.members.size() < shared.size()))
      shared = seg.members;
  const double legend_h = draw_legend(c, legend_top, drawn, shared, ov);
  const double height = legend_top + legend_h + 14;

  const std::string pressure = units::format(units::Kind::pressure, in.units, in.pressure_kpa, 3);
  return svg_open(height, "Psychrometric chart at " + pressure + " with high-limit boundaries") +
         c.out + "</svg>\n";
}

}  // namespace limitline::report
