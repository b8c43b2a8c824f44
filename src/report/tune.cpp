#include <limitline/report/tune.hpp>

#include <limitline/analysis/decision.hpp>
#include <limitline/report/cautions.hpp>
#include <limitline/report/html.hpp>
#include <limitline/report/json.hpp>
#include <limitline/report/strategy.hpp>
#include <limitline/report/table.hpp>
#include <limitline/text.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

namespace limitline::report {
namespace {

using highlimit::Reference;
using tuning::Axis;
using tuning::Point;
using tuning::StrategyTuning;

// "dry-bulb limit", "enthalpy offset from the return air".
std::string axis_name(const Axis& a) {
  return fmt::format("{} {}", highlimit::quantity_name(a.quantity),
                     a.reference == Reference::fixed ? "limit" : "offset from the return air");
}

std::string value_text(const Axis& a, double v, units::System s) {
  return a.reference == Reference::fixed ? format_value(a.quantity, v, s)
                                         : format_difference(a.quantity, v, s);
}

// "68.5 °F" or "26.2 Btu/lb and 75.0 °F".
std::string setting_text(const tuning::Curve& c, const std::vector<double>& v, units::System s) {
  std::string out;
  for (std::size_t a = 0; a < c.axes.size() && a < v.size(); ++a)
    out += (a ? " and " : "") + value_text(c.axes[a], v[a], s);
  return out;
}

std::string range_text(const tuning::Curve& c, const tuning::Band& b, units::System s) {
  if (b.count == 0) return "none";
  std::string out;
  for (std::size_t a = 0; a < c.axes.size(); ++a) {
    const std::string lo = value_text(c.axes[a], b.lo[a], s),
                      hi = value_text(c.axes[a], b.hi[a], s);
    out += (a ? "; " : "") + (c.axes.size() > 1 ? axis_name(c.axes[a]) + " " : std::string()) +
           (lo == hi ? lo : lo + " to " + hi);
  }
  out += fmt::format(" ({} setting{}{})", b.count, b.count == 1 ? "" : "s",
                     c.axes.size() == 1 && !b.contiguous ? ", not one unbroken run" : "");
  return out;
}

std::string swept_text(const Axis& a, units::System s) {
  const double step = a.values.size() > 1 ? a.values[1] - a.values[0] : 0.0;
  return fmt::format(
      "{} {} to {} in steps of {} ({} settings)", axis_name(a), value_text(a, a.values.front(), s),
      value_text(a, a.values.back(), s),
      units::format_brief(highlimit::quantity_difference_kind(a.quantity), s, step, 3),
      a.values.size());
}

std::string verdict_of(const std::vector<std::string>& verdicts, std::size_t i) {
  return i < verdicts.size() ? verdicts[i] : std::string();
}

// The candidates of the recommendation: each strategy's best setting and, when the code sets
// one, the strategy at the code's setting.
std::vector<decision::Candidate> tuned_candidates(const TuneReport& r) {
  std::vector<decision::Candidate> out;
  const units::System s = r.context->units;
  for (const auto& t : r.tune->strategies) {
    const Point& best = t.curve.best_point();
    out.push_back({fmt::format("{} at {}", t.strategy.name, setting_text(t.curve, best.values, s)),
                   best.shortfall_kwh, t.best_verdict});
    if (t.code_extra && best.values != t.curve.extras[*t.code_extra].values) {
      const Point& code = t.curve.extras[*t.code_extra];
      out.push_back({fmt::format("{} at {} (the code's setting)", t.strategy.name,
                                 setting_text(t.curve, code.values, s)),
                     code.shortfall_kwh, verdict_of(t.extra_verdicts, *t.code_extra)});
    }
  }
  return out;
}

struct StrategyLines {
  std::string title;
  std::vector<std::string> lines;
};

StrategyLines strategy_lines(const StrategyTuning& t, const YearContext& c) {
  const units::System s = c.units;
  const Measure m(c);
  const std::string eu = m.unit();
  const tuning::Curve& cv = t.curve;
  StrategyLines out;
  out.title = fmt::format("{} — {}", t.strategy.name, describe_strategy(t.strategy, s));
  for (const Axis& a : cv.axes) out.lines.push_back("swept: " + swept_text(a, s));
  if (cv.axes.size() < t.strategy.conditions.size())
    out.lines.push_back("its other conditions are held as written");
  const Point& best = cv.best_point();
  std::string b = fmt::format("best: {} — {} {} short of the perfect changeover, saves {} {}",
                              setting_text(cv, best.values, s), m.format(best.shortfall_kwh), eu,
                              m.format(best.savings_kwh), eu);
  if (cv.best_is_extra)
    b += fmt::format(" (the {} setting, off the grid)", cv.extra_labels[cv.best]);
  if (!t.best_verdict.empty()) b += fmt::format("; code: {}", t.best_verdict);
  out.lines.push_back(b);
  // A best on the edge of its range may lie beyond it: say so rather than let it pass for an
  // optimum.
  for (std::size_t a = 0; a < cv.axes.size() && !cv.best_is_extra; ++a)
    if (best.values[a] == cv.axes[a].values.front() || best.values[a] == cv.axes[a].values.back())
      out.lines.push_back(
          fmt::format("the best {} is at the end of its swept range: the optimum may lie beyond it",
                      axis_name(cv.axes[a])));
  out.lines.push_back(
      fmt::format("within 1% of the best savings: {}", range_text(cv, cv.within_1pct, s)));
  out.lines.push_back(fmt::format("within 5%: {}", range_text(cv, cv.within_5pct, s)));
  for (std::size_t e = 0; e < cv.extras.size(); ++e) {
    const Point& p = cv.extras[e];
    std::string l =
        fmt::format("at the {} setting ({}): ", cv.extra_labels[e], setting_text(cv, p.values, s));
    const double loss = cv.loss(p);
    l += loss <= 0.0 ? "the best" : fmt::format("{} {} more than the best", m.format(loss), eu);
    if (const std::string v = verdict_of(t.extra_verdicts, e); !v.empty())
      l += fmt::format(" ({})", v);
    out.lines.push_back(l);
  }
  if (!t.code_note.empty()) out.lines.push_back("code: " + t.code_note);
  return out;
}

std::vector<std::string> header(const TuneReport& r) {
  std::vector<std::string> out = context_lines(*r.context);
  out.push_back(fmt::format("Fan-on hours: {:.0f}", r.operating_hours));
  if (!r.context->code_label.empty()) out.push_back("Energy code: " + r.context->code_label);
  if (r.tune->partial) out.push_back("PARTIAL RESULTS: interrupted; the strategies that finished");
  return out;
}

std::string basis_line(const TuneReport& r) {
  return fmt::format(
      "Each strategy re-run over the year at every setting of its practical range; figures are "
      "the shortfall against the perfect changeover and the savings against no economizer ({}).",
      Measure(*r.context).basis());
}

void json_setting(Json& j, const tuning::Curve& c, const std::vector<double>& v, units::System s) {
  j.key("setting").begin_object();
  for (std::size_t a = 0; a < c.axes.size(); ++a) {
    const Axis& ax = c.axes[a];
    const units::Kind k = ax.kind();
    std::string stem(highlimit::quantity_name(ax.quantity));
    std::replace(stem.begin(), stem.end(), '-', '_');
    j.field(fmt::format("{}_{}_{}", stem, ax.reference == Reference::fixed ? "limit" : "offset",
                        units::key_suffix(k, s)),
            units::to_display(k, s, v[a]), 8);
  }
  j.end_object();
}

void json_point(Json& j, const tuning::Curve& c, const Point& p, const Measure& m,
                units::System s) {
  json_setting(j, c, p.values, s);
  for (const auto& [k, v] : m.fields("shortfall_vs_perfect", p.shortfall_kwh)) j.field(k, v, 8);
  for (const auto& [k, v] : m.fields("savings_vs_no_economizer", p.savings_kwh)) j.field(k, v, 8);
  for (const auto& [k, v] : m.fields("loss_vs_best", c.loss(p))) j.field(k, v, 8);
  j.field("harmful_hours", p.harmful_hours, 8);
  j.field("missed_hours", p.missed_hours, 8);
}

}  // namespace

std::vector<std::string> tune_recommendation(const TuneReport& r) {
  std::vector<std::string> out;
  if (r.tune->strategies.empty()) return out;
  const Measure m(*r.context);
  const std::vector<decision::Candidate> cands = tuned_candidates(r);
  const decision::Recommendation rec =
      decision::recommend(cands, decision::tie_tolerance(r.perfect_savings, m.is_cost()));
  const std::string eu = m.unit();
  auto tied = [&](const std::vector<std::size_t>& g) {
    std::string t;
    for (std::size_t k = 1; k < g.size(); ++k) t += (k > 1 ? ", " : "") + cands[g[k]].name;
    return t.empty() ? std::string()
                     : fmt::format("; tied with {} (within {} {})", t, m.format(rec.tolerance), eu);
  };
  if (rec.all_tied) {
    out.push_back(
        fmt::format("Every strategy and setting evaluated gives the same result within {} {}: the "
                    "high-limit never acts where it matters here.",
                    m.format(rec.tolerance), eu));
    return out;
  }
  const auto& best = cands[rec.best.front()];
  if (rec.code_known) {
    if (!rec.best_compliant.empty()) {
      const auto& bc = cands[rec.best_compliant.front()];
      out.push_back(
          fmt::format("Recommended, the best the code allows: {} — {} {} short of the "
                      "perfect changeover{}.",
                      bc.name, m.format(bc.shortfall), eu, tied(rec.best_compliant)));
    } else {
      out.push_back("No setting evaluated complies with the code.");
    }
    if (rec.best_not_allowed())
      out.push_back(fmt::format("The best overall, {} ({} {} short), is {}.", best.name,
                                m.format(best.shortfall), eu, best.compliance));
  } else {
    out.push_back(fmt::format("Best: {} — {} {} short of the perfect changeover{}.", best.name,
                              m.format(best.shortfall), eu, tied(rec.best)));
  }
  return out;
}

std::string tune_text(const TuneReport& r) {
  std::string out = fmt::format("limitline tune — {}\n\n", r.context->title);
  for (const auto& l : header(r)) out += l + "\n";
  out += "\n" + basis_line(r) + "\n";
  for (const auto& t : r.tune->strategies) {
    const StrategyLines s = strategy_lines(t, *r.context);
    out += "\n" + s.title + "\n";
    for (const auto& l : s.lines) out += "  " + l + "\n";
  }
  out += "\nRecommendation:\n";
  for (const auto& l : tune_recommendation(r)) out += "  - " + l + "\n";
  out += "\n" + cautions_text(CautionTopic::design);
  return out;
}

std::string tune_markdown(const TuneReport& r) {
  std::string out = fmt::format("# Setpoint tuning — {}\n\n", markdown_escape(r.context->title));
  for (const auto& l : header(r))
    out +=
        (l.starts_with("  ") ? "  - " + markdown_escape(l.substr(2)) : "- " + markdown_escape(l)) +
        "\n";
  out += "\n" + markdown_escape(basis_line(r)) + "\n";
  for (const auto& t : r.tune->strategies) {
    const StrategyLines s = strategy_lines(t, *r.context);
    out += "\n## " + markdown_escape(s.title) + "\n\n";
    for (const auto& l : s.lines) out += "- " + markdown_escape(l) + "\n";
  }
  out += "\n## Recommendation\n\n";
  for (const auto& l : tune_recommendation(r)) out += "- " + markdown_escape(l) + "\n";
  out += "\n" + cautions_markdown(CautionTopic::design);
  return out;
}

std::string tune_summary_markdown(const TuneReport& r) {
  std::string out = markdown_escape(basis_line(r)) + "\n\n";
  for (const auto& t : r.tune->strategies) {
    const StrategyLines s = strategy_lines(t, *r.context);
    out += "- **" + markdown_escape(t.strategy.name) + "**\n";
    for (const auto& l : s.lines)
      if (!l.starts_with("swept") && !l.starts_with("code:"))
        out += "  - " + markdown_escape(l) + "\n";
  }
  out += "\n";
  for (const auto& l : tune_recommendation(r)) out += markdown_escape(l) + "\n\n";
  return out;
}

std::string tune_csv(const TuneReport& r) {
  const units::System s = r.context->units;
  const Measure m(*r.context);
  std::vector<Column> cols = {{"strategy", Align::left}, {"point", Align::left}};
  for (const char* k : {"setting_1", "value_1", "unit_1", "setting_2", "value_2", "unit_2"})
    cols.push_back({k, Align::left});
  for (const auto& [k, v] : m.fields("shortfall_vs_perfect", 0.0))
    cols.push_back({k, Align::right});
  for (const auto& [k, v] : m.fields("savings_vs_no_economizer", 0.0))
    cols.push_back({k, Align::right});
  for (const char* k : {"harmful_hours", "missed_hours", "verdict"})
    cols.push_back({k, Align::right});
  Table t(cols);
  auto g = [](double v) { return fmt::format("{:.8g}", v == 0.0 ? 0.0 : v); };
  for (const auto& st : r.tune->strategies) {
    const tuning::Curve& c = st.curve;
    auto row = [&](std::string kind, const Point& p, const std::string& verdict) {
      std::vector<std::string> cells = {st.strategy.name, std::move(kind)};
      for (std::size_t a = 0; a < 2; ++a) {
        if (a < c.axes.size()) {
          const Axis& ax = c.axes[a];
          const units::Kind k = ax.kind();
          cells.push_back(axis_name(ax));
          cells.push_back(g(units::to_display(k, s, p.values[a])));
          cells.emplace_back(units::unit_label(k, s));
        } else {
          cells.insert(cells.end(), {"", "", ""});
        }
      }
      for (const auto& [k, v] : m.fields("shortfall_vs_perfect", p.shortfall_kwh))
        cells.push_back(g(v));
      for (const auto& [k, v] : m.fields("savings_vs_no_economizer", p.savings_kwh))
        cells.push_back(g(v));
      cells.push_back(g(p.harmful_hours));
      cells.push_back(g(p.missed_hours));
      cells.push_back(verdict);
      t.add_row(std::move(cells));
    };
    for (std::size_t i = 0; i < c.grid.size(); ++i)
      row(!c.best_is_extra && i == c.best ? "grid (best)" : "grid", c.grid[i], "");
    for (std::size_t e = 0; e < c.extras.size(); ++e)
      row(c.extra_labels[e] + (c.best_is_extra && e == c.best ? " (best)" : ""), c.extras[e],
          verdict_of(st.extra_verdicts, e));
  }
  return t.csv();
}

std::string tune_json(const TuneReport& r) {
  const units::System s = r.context->units;
  const Measure m(*r.context);
  Json j;
  j.begin_object();
  json_context(j, *r.context);
  j.field("operating_hours", r.operating_hours, 8);
  j.field("partial", r.tune->partial);
  j.field("ranking_basis", m.is_cost() ? "cost" : "weighted-energy");
  if (!r.context->code_label.empty()) j.field("energy_code", r.context->code_label);
  j.key("strategies").begin_array();
  for (const auto& t : r.tune->strategies) {
    const tuning::Curve& c = t.curve;
    j.begin_object();
    j.field("name", t.strategy.name);
    j.field("description", describe_strategy(t.strategy, s));
    j.key("swept").begin_array();
    for (const Axis& a : c.axes) j.value(swept_text(a, s));
    j.end_array();
    j.key("best").begin_object();
    json_point(j, c, c.best_point(), m, s);
    if (c.best_is_extra) j.field("off_grid", c.extra_labels[c.best]);
    if (!t.best_verdict.empty()) j.field("compliance", t.best_verdict);
    j.end_object();
    for (const auto* band : {&c.within_1pct, &c.within_5pct}) {
      j.key(band == &c.within_1pct ? "within_1pct" : "within_5pct").begin_object();
      j.field("count", static_cast<int>(band->count));
      j.field("one_run", band->contiguous);
      j.key("low");
      json_setting(j, c, band->lo, s);
      j.key("high");
      json_setting(j, c, band->hi, s);
      j.end_object();
    }
    j.key("settings").begin_array();
    for (std::size_t e = 0; e < c.extras.size(); ++e) {
      j.begin_object();
      j.field("label", c.extra_labels[e]);
      json_point(j, c, c.extras[e], m, s);
      if (const std::string v = verdict_of(t.extra_verdicts, e); !v.empty())
        j.field("compliance", v);
      j.end_object();
    }
    j.end_array();
    if (!t.code_note.empty()) j.field("code_note", t.code_note);
    j.key("grid").begin_array();
    for (const Point& p : c.grid) {
      j.begin_object();
      json_point(j, c, p, m, s);
      j.end_object();
    }
    j.end_array();
    j.end_object();
  }
  j.end_array();
  j.key("recommendation").begin_array();
  for (const auto& l : tune_recommendation(r)) j.value(l);
  j.end_array();
  j.key("cautions").begin_array();
  for (const auto& c : cautions(CautionTopic::design)) j.value(c);
  j.end_array();
  j.end_object();
  return j.str();
}

namespace {

// Round tick positions covering [lo, hi]: steps of 1, 2, 2.5 or 5 times a power of ten, about
// `want` of them.
std::vector<double> ticks(double lo, double hi, int want) {
  std::vector<double> out;
  if (!(hi > lo)) {
    out.push_back(lo);
    return out;
  }
  const double raw = (hi - lo) / want;
  const double p = std::pow(10.0, std::floor(std::log10(raw)));
  double step = 10.0 * p;
  for (double f : {1.0, 2.0, 2.5, 5.0, 10.0})
    if (f * p >= raw) {
      step = f * p;
      break;
    }
  for (double v = std::ceil(lo / step - 1e-9) * step; v <= hi + 1e-9 * step; v += step)
    out.push_back(std::fabs(v) < 1e-12 * step ? 0.0 : v);
  return out;
}

std::string tick_text(double v) {
  std::string t = fmt::format("{:.4g}", v);
  return t == "-0" ? "0" : t;
}

}  // namespace

std::string tune_plot_svg(const tuning::StrategyTuning& t, const YearContext& c) {
  const tuning::Curve& cv = t.curve;
  const units::System s = c.units;
  const Measure m(c);
  constexpr double W = 640, H = 320, L = 70, R = 24, T = 40, B = 52;
  std::string out = fmt::format(
      "<svg xmlns=\"http://www.w3.org/2000/svg\" viewBox=\"0 0 {0} {1}\" width=\"{0}\" "
      "height=\"{1}\" font-family=\"DejaVu Sans, Arial, sans-serif\" font-size=\"11\">\n"
      "<rect width=\"{0}\" height=\"{1}\" fill=\"#fbf8f1\"/>\n",
      W, H);
  const std::string title = html_escape(t.strategy.name);
  out += fmt::format(
      "<text x=\"{}\" y=\"20\" font-size=\"13\" font-weight=\"700\" fill=\"#1f3347\">{}</text>\n",
      L, title);
  if (cv.axes.empty() || cv.grid.empty()) return out + "</svg>\n";
  const Axis& ax = cv.axes[0];
  const units::Kind k = ax.kind();
  // The slice along the primary setting, the others held at the best's values.
  const Point& best = cv.best_point();
  std::vector<const Point*> slice;
  for (const Point& p : cv.grid) {
    bool on = true;
    for (std::size_t a = 1; a < cv.axes.size(); ++a)
      if (p.values[a] != best.values[a]) on = false;
    if (on) slice.push_back(&p);
  }
  if (slice.empty())  // the best is off the grid: slice at the grid's own best
    for (const Point& p : cv.grid) {
      bool on = true;
      for (std::size_t a = 1; a < cv.axes.size(); ++a)
        if (p.values[a] != cv.grid[0].values[a]) on = false;
      if (on) slice.push_back(&p);
    }
  const double x0 = units::to_display(k, s, ax.values.front());
  const double x1 = units::to_display(k, s, ax.values.back());
  double ymax = 0;
  for (const Point* p : slice) ymax = std::max(ymax, m.display(cv.loss(*p)));
  if (!(ymax > 0)) ymax = 1;
  const auto yt = ticks(0, ymax, 5);
  ymax = std::max(ymax, yt.back());
  auto X = [&](double v) { return L + (v - x0) / (x1 - x0) * (W - L - R); };
  auto Y = [&](double v) { return H - B - v / ymax * (H - T - B); };
  // The 1 % band along the primary setting.
  if (cv.within_1pct.count > 0) {
    const double a = X(units::to_display(k, s, cv.within_1pct.lo[0]));
    const double b = X(units::to_display(k, s, cv.within_1pct.hi[0]));
    out += fmt::format(
        "<rect x=\"{:.1f}\" y=\"{}\" width=\"{:.1f}\" height=\"{}\" fill=\"#bf8a3f\" "
        "fill-opacity=\"0.18\"/>\n",
        a, T, std::max(1.0, b - a), H - T - B);
    out += fmt::format(
        "<text x=\"{:.1f}\" y=\"{}\" fill=\"#8a6a3a\" text-anchor=\"middle\">within 1%</text>\n",
        (a + b) / 2, T + 12);
  }
  // Axes, ticks and labels.
  out += fmt::format(
      "<g stroke=\"#1f3347\" stroke-width=\"1\"><line x1=\"{0}\" y1=\"{1}\" x2=\"{2}\" "
      "y2=\"{1}\"/><line x1=\"{0}\" y1=\"{3}\" x2=\"{0}\" y2=\"{1}\"/></g>\n",
      L, H - B, W - R, T);
  for (double v : ticks(x0, x1, 8))
    out += fmt::format(
        "<line x1=\"{0:.1f}\" y1=\"{1}\" x2=\"{0:.1f}\" y2=\"{2}\" stroke=\"#1f3347\"/><text "
        "x=\"{0:.1f}\" y=\"{3}\" text-anchor=\"middle\" fill=\"#1f3347\">{4}</text>\n",
        X(v), H - B, H - B + 4, H - B + 16, tick_text(v));
  for (double v : yt)
    out += fmt::format(
        "<line x1=\"{0}\" y1=\"{1:.1f}\" x2=\"{2}\" y2=\"{1:.1f}\" stroke=\"#d6ccb8\"/><text "
        "x=\"{3}\" y=\"{4:.1f}\" text-anchor=\"end\" fill=\"#1f3347\">{5}</text>\n",
        L, Y(v), W - R, L - 6, Y(v) + 4, tick_text(v));
  out += fmt::format(
      "<text x=\"{}\" y=\"{}\" text-anchor=\"middle\" fill=\"#1f3347\">{} ({})</text>\n",
      (L + W - R) / 2, H - 12, html_escape(axis_name(ax)),
      html_escape(std::string(units::unit_label(k, s))));
  out += fmt::format(
      "<text transform=\"translate(16 {}) rotate(-90)\" text-anchor=\"middle\" "
      "fill=\"#1f3347\">more than the best ({})</text>\n",
      (T + H - B) / 2, html_escape(m.unit()));
  // The curve.
  std::string pts;
  for (const Point* p : slice)
    pts += fmt::format("{:.1f},{:.1f} ", X(units::to_display(k, s, p->values[0])),
                       Y(m.display(cv.loss(*p))));
  out += fmt::format(
      "<polyline points=\"{}\" fill=\"none\" stroke=\"#1f3347\" stroke-width=\"2\"/>\n", pts);
  // The best and the named settings.
  // Each named setting keeps its colour from plot to plot.
  auto colour_of = [](std::string_view label) {
    if (label == tuning::kCodeSetting) return "#8a4f7d";
    if (label == tuning::kDefaultSetting) return "#2e6f57";
    return "#55606b";
  };
  int label_row = 0;
  for (std::size_t e = 0; e < cv.extras.size(); ++e) {
    const double v = units::to_display(k, s, cv.extras[e].values[0]);
    if (v < std::min(x0, x1) || v > std::max(x0, x1)) continue;
    const char* colour = colour_of(cv.extra_labels[e]);
    out += fmt::format(
        "<line x1=\"{0:.1f}\" y1=\"{1}\" x2=\"{0:.1f}\" y2=\"{2}\" stroke=\"{3}\" "
        "stroke-dasharray=\"4 3\"/>\n",
        X(v), T + 18, H - B, colour);
    out += fmt::format("<text x=\"{:.1f}\" y=\"{}\" fill=\"{}\" text-anchor=\"{}\">{} {}</text>\n",
                       X(v) + (X(v) > W / 2 ? -4 : 4), T + 30 + 13 * label_row++, colour,
                       X(v) > W / 2 ? "end" : "start", html_escape(cv.extra_labels[e]),
                       html_escape(value_text(ax, cv.extras[e].values[0], s)));
  }
  const double bx = X(units::to_display(k, s, best.values[0]));
  out += fmt::format(
      "<circle cx=\"{:.1f}\" cy=\"{:.1f}\" r=\"4.5\" fill=\"#bf8a3f\" stroke=\"#1f3347\"/>\n", bx,
      Y(0));
  std::string held;
  for (std::size_t a = 1; a < cv.axes.size(); ++a)
    held += fmt::format("; {} held at {}", axis_name(cv.axes[a]),
                        value_text(cv.axes[a], best.values[a], s));
  out += fmt::format("<text x=\"{}\" y=\"34\" fill=\"#55606b\">best {}{}</text>\n", L,
                     html_escape(value_text(ax, best.values[0], s)), html_escape(held));
  return out + "</svg>\n";
}

std::string plot_file_name(std::string_view strategy, std::size_t index) {
  std::string out = fmt::format("tune-{:02d}-", index + 1);
  for (char ch : strategy) {
    if (std::isalnum(static_cast<unsigned char>(ch)))
      out += text::to_lower(ch);
    else if (out.back() != '-')
      out += '-';
  }
  while (out.back() == '-') out.pop_back();
  return out + ".svg";
}

}  // namespace limitline::report
