#include <limitline/report/audit_record.hpp>

#include <limitline/report/html.hpp>

#include "svg_draw.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <functional>
#include <limits>
#include <optional>
#include <vector>

namespace limitline::report {
namespace {

using svg::num;
using svg::text;

// One colour per finding kind, in FindingKind order; our own, apart from the line inks.
constexpr std::array<std::string_view, audit::kFindingKindCount> kKindColours = {
    "#c8623c", "#3d7fae", "#8e5bb5", "#d1a21a", "#b8325a", "#5b8c3a",
    "#6b6b6b", "#2f8f8f", "#a0522d", "#4b5fa8", "#9a8a3a"};

constexpr double kWidth = 960;
constexpr double kLeft = 64, kRight = 24;
constexpr double kPanelH = 120, kPanelGap = 26, kLaneH = 10, kLaneGap = 17;  // gap holds the label

struct Scale {
  double t0, t1, x0, x1;
  double x(double t) const { return x0 + (t - t0) / (t1 - t0) * (x1 - x0); }
};

// Per pixel column, the lowest and highest value, so a year of 5-minute samples still draws
// every excursion; a gap longer than the log's cap breaks the line.
std::string envelope_path(
    const audit::Timeline& t, const trend::TrendLog& log, const Scale& sx,
    const std::function<std::optional<double>(const audit::TimelineSample&)>& value,
    const std::function<double(double)>& y) {
  std::string d;
  bool open = false;
  long column = std::numeric_limits<long>::min();
  double lo = 0, hi = 0;
  std::int64_t previous = 0;
  const auto flush = [&] {
    if (column == std::numeric_limits<long>::min()) return;
    const double x = static_cast<double>(column) + 0.5;
    d += fmt::format("{}{} {}", open ? " L" : " M", num(x), num(y(lo)));
    if (hi != lo) d += fmt::format(" L{} {}", num(x), num(y(hi)));
    open = true;
  };
  for (std::size_t i = 0; i < t.samples.size(); ++i) {
    const auto& s = t.samples[i];
    const auto v = value(s);
    const bool gap = i > 0 && static_cast<double>(s.time_s - previous) > log.coverage.max_gap_s;
    previous = s.time_s;
    if (!v || gap) {
      flush();
      column = std::numeric_limits<long>::min();
      open = false;
      if (!v) continue;
    }
    const long c = std::lround(std::floor(sx.x(static_cast<double>(s.time_s))));
    if (c != column) {
      flush();
      column = c;
      lo = hi = *v;
    } else {
      lo = std::min(lo, *v);
      hi = std::max(hi, *v);
    }
  }
  flush();
  return d;
}

struct Tick {
  double t;
  std::string label;
};

// Round times along the log: 6-hourly, daily, weekly (Mondays) or monthly by its span.
std::vector<Tick> time_ticks(std::int64_t first, std::int64_t last) {
  constexpr std::int64_t kDay = 86400;
  const double span = static_cast<double>(last - first);
  std::vector<Tick> out;
  const auto stamp = [](std::int64_t s) { return trend::format_timestamp(s); };
  if (span <= 3 * kDay) {
    for (std::int64_t s = (first / (6 * 3600) + 1) * 6 * 3600; s <= last; s += 6 * 3600)
      out.push_back({static_cast<double>(s), stamp(s).substr(5, 11)});
  } else if (span <= 21 * kDay) {
    for (std::int64_t s = (first / kDay + 1) * kDay; s <= last; s += kDay)
      out.push_back({static_cast<double>(s), stamp(s).substr(5, 5)});
  } else if (span <= 150 * kDay) {
    // 1970-01-01 was a Thursday: Mondays are 4 days on from a multiple of 7 days.
    std::int64_t s = ((first - 4 * kDay) / (7 * kDay) + 1) * 7 * kDay + 4 * kDay;
    for (; s <= last; s += 7 * kDay) out.push_back({static_cast<double>(s), stamp(s).substr(5, 5)});
  } else {
    for (std::int64_t s = (first / kDay + 1) * kDay; s <= last; s += kDay)
      if (stamp(s).substr(8, 2) == "01")
        out.push_back({static_cast<double>(s), stamp(s).substr(0, 7)});
  }
  return out;
}

}  // namespace

std::string audit_log_svg(const audit::Timeline& t, const trend::TrendLog& log,
                          const AuditContext& c) {
  const units::System s = c.units;
  const auto tk = units::Kind::temperature;
  std::array<bool, audit::kFindingKindCount> present{};
  for (const auto& smp : t.samples)
    for (std::size_t k = 0; k < audit::kFindingKindCount; ++k)
      if (smp.breaks(static_cast<audit::FindingKind>(k))) present[k] = true;
  const auto lanes = static_cast<double>(std::count(present.begin(), present.end(), true));

  const double top1 = 58, top2 = top1 + kPanelH + kPanelGap;
  const double lanes_top = top2 + kPanelH + 34 + kLaneGap;
  const double height = lanes_top + lanes * (kLaneH + kLaneGap) + 40;
  std::string out = fmt::format("<rect x=\"0\" y=\"0\" width=\"{}\" height=\"{}\" fill=\"{}\"/>\n",
                                num(kWidth), num(height), svg::kPaper);
  const std::string label = fmt::format("font-size=\"11\" fill=\"{}\"", svg::kInk);
  const std::string soft = fmt::format("font-size=\"10\" fill=\"{}\"", svg::kInkSoft);
  out += text(kLeft, 24, "Outdoor air and damper over the log",
              fmt::format("font-size=\"15\" font-weight=\"bold\" fill=\"{}\"", svg::kInk));
  out += text(kLeft, 42,
              t.damper_from_signal
                  ? "Outdoor dry-bulb; damper signal as outdoor-air fraction; each finding's "
                    "samples on its own lane."
                  : "Outdoor dry-bulb; outdoor-air fraction measured from temperatures; each "
                    "finding's samples on its own lane.",
              soft);
  if (t.samples.empty() || log.coverage.last_s <= log.coverage.first_s) {
    out += text(kLeft, top1 + 20, "The log has too few samples to draw.", label);
    return svg::open(kWidth, height, "Trend log over time") + out + "</svg>\n";
  }
  const Scale sx{static_cast<double>(log.coverage.first_s),
                 static_cast<double>(log.coverage.last_s), kLeft, kWidth - kRight};

  // Outdoor dry-bulb panel, in display units, on round ticks.
  double lo = std::numeric_limits<double>::infinity(), hi = -lo;
  for (const auto& smp : t.samples)
    if (smp.outdoor_c) {
      const double v = units::to_display(tk, s, *smp.outdoor_c);
      lo = std::min(lo, v);
      hi = std::max(hi, v);
    }
  if (!(hi >= lo)) lo = 0, hi = 1;
  const double step = svg::round_step(std::max(hi - lo, 1.0), 4);
  lo = std::floor(lo / step) * step;
  hi = std::max(lo + step, std::ceil(hi / step) * step);
  const auto y_t = [&](double display) {
    return top1 + kPanelH - (display - lo) / (hi - lo) * kPanelH;
  };
  const auto y_f = [&](double f) { return top2 + kPanelH - std::clamp(f, 0.0, 1.0) * kPanelH; };

  // Shading of any finding across both panels, drawn first so the lines sit over it.
  std::string shade, lanes_svg;
  double lane_y = lanes_top;
  for (std::size_t k = 0; k < audit::kFindingKindCount; ++k) {
    if (!present[k]) continue;
    const auto kind = static_cast<audit::FindingKind>(k);
    lanes_svg += text(kLeft, lane_y - 3,
                      fmt::format("{} ({})", audit::finding_title(kind), audit::finding_key(kind)),
                      fmt::format("font-size=\"9.5\" fill=\"{}\"", svg::kInk));
    lanes_svg += fmt::format(
        "<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"none\" stroke=\"{}\" "
        "stroke-width=\"0.6\"/>\n",
        num(kLeft), num(lane_y), num(kWidth - kRight - kLeft), num(kLaneH), svg::kGridMajor);
    // Runs of consecutive samples breaking the rule, each to the end of its last sample.
    for (std::size_t i = 0; i < t.samples.size();) {
      if (!t.samples[i].breaks(kind)) {
        ++i;
        continue;
      }
      std::size_t j = i;
      while (j + 1 < t.samples.size() && t.samples[j + 1].breaks(kind)) ++j;
      const double from = static_cast<double>(t.samples[i].time_s);
      const double to = static_cast<double>(t.samples[j].time_s) + log.weight_s(j);
      const double x0 = sx.x(from), w = std::max(1.0, std::min(sx.x(to), sx.x1) - x0);
      lanes_svg += fmt::format(
          "<rect class=\"finding\" data-kind=\"{}\" data-from=\"{:.0f}\" data-to=\"{:.0f}\" "
          "x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"{}\"/>\n",
          audit::finding_key(kind), from, to, num(x0), num(lane_y + 1), num(w), num(kLaneH - 2),
          kKindColours[k]);
      shade += fmt::format(
          "<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"{}\" "
          "fill-opacity=\"0.13\"/>\n",
          num(x0), num(top1), num(w), num(top2 + kPanelH - top1), kKindColours[k]);
      i = j + 1;
    }
    lane_y += kLaneH + kLaneGap;
  }
  out += "<g class=\"shading\">\n" + shade + "</g>\n";

  // Frames, gridlines and their labels.
  for (double v = lo; v <= hi + 1e-9; v += step) {
    out += fmt::format("<path d=\"M{} {} L{} {}\" stroke=\"{}\" stroke-width=\"0.7\"/>\n",
                       num(kLeft), num(y_t(v)), num(sx.x1), num(y_t(v)), svg::kGridMinor);
    out += text(kLeft - 6, y_t(v) + 3.5, svg::tick_label(v),
                fmt::format("font-size=\"10\" fill=\"{}\" text-anchor=\"end\"", svg::kInk));
  }
  for (double f : {0.0, 0.5, 1.0}) {
    out += fmt::format("<path d=\"M{} {} L{} {}\" stroke=\"{}\" stroke-width=\"0.7\"/>\n",
                       num(kLeft), num(y_f(f)), num(sx.x1), num(y_f(f)), svg::kGridMinor);
    out += text(kLeft - 6, y_f(f) + 3.5, fmt::format("{:.0f}%", 100 * f),
                fmt::format("font-size=\"10\" fill=\"{}\" text-anchor=\"end\"", svg::kInk));
  }
  out += fmt::format(
      "<path class=\"minimum\" d=\"M{} {} L{} {}\" stroke=\"{}\" stroke-width=\"1\" "
      "stroke-dasharray=\"5 3\"/>\n",
      num(kLeft), num(y_f(t.min_oa_fraction)), num(sx.x1), num(y_f(t.min_oa_fraction)),
      svg::kInkSoft);
  out +=
      text(sx.x1 - 4, y_f(t.min_oa_fraction) - 4,
           fmt::format("ventilation minimum {:.0f}%", 100 * t.min_oa_fraction),
           fmt::format("font-size=\"9.5\" fill=\"{}\" text-anchor=\"end\"", svg::kInkSoft), true);
  out += text(kLeft, top1 - 4, fmt::format("OUTDOOR DRY-BULB, {}", units::unit_label(tk, s)),
              fmt::format("font-size=\"9.5\" letter-spacing=\"1\" fill=\"{}\"", svg::kInkSoft));
  out += text(kLeft, top2 - 4,
              t.damper_from_signal ? "DAMPER SIGNAL (OUTDOOR-AIR FRACTION)"
                                   : "MEASURED OUTDOOR-AIR FRACTION",
              fmt::format("font-size=\"9.5\" letter-spacing=\"1\" fill=\"{}\"", svg::kInkSoft));

  const auto outdoor = [&](const audit::TimelineSample& x) -> std::optional<double> {
    if (!x.outdoor_c) return std::nullopt;
    return units::to_display(tk, s, *x.outdoor_c);
  };
  const auto damper = [](const audit::TimelineSample& x) { return x.damper; };
  out += fmt::format(
      "<path class=\"outdoor\" d=\"{}\" fill=\"none\" stroke=\"{}\" stroke-width=\"1.1\"/>\n",
      envelope_path(t, log, sx, outdoor, y_t), svg::kInk);
  out += fmt::format(
      "<path class=\"damper\" d=\"{}\" fill=\"none\" stroke=\"#0b4f9c\" stroke-width=\"1.1\"/>\n",
      envelope_path(t, log, sx, damper, y_f));
  for (double top : {top1, top2})
    out += fmt::format(
        "<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"none\" stroke=\"{}\" "
        "stroke-width=\"1\"/>\n",
        num(kLeft), num(top), num(sx.x1 - kLeft), num(kPanelH), svg::kInk);

  // Time axis under the second panel.
  const double axis_y = top2 + kPanelH;
  for (const Tick& tick : time_ticks(log.coverage.first_s, log.coverage.last_s)) {
    const double x = sx.x(tick.t);
    out += fmt::format("<path d=\"M{} {} L{} {}\" stroke=\"{}\" stroke-width=\"1\"/>\n", num(x),
                       num(axis_y), num(x), num(axis_y + 4), svg::kInk);
    out += text(x, axis_y + 15, tick.label,
                fmt::format("font-size=\"9.5\" fill=\"{}\" text-anchor=\"middle\"", svg::kInk));
  }
  if (lanes > 0)
    out += text(kLeft, lanes_top - kLaneGap - 4, "FINDINGS (SAMPLES BREAKING EACH RULE)",
                fmt::format("font-size=\"9.5\" letter-spacing=\"1\" fill=\"{}\"", svg::kInkSoft));
  out += "<g class=\"lanes\">\n" + lanes_svg + "</g>\n";
  return svg::open(kWidth, height, "Trend log over time with the audit's findings") + out +
         "</svg>\n";
}

namespace {

// The Markdown report cut at its "## " headings: (heading, body) pairs, the title dropped and
// the text before the first heading returned as the intro.
std::vector<std::pair<std::string, std::string>> split_sections(const std::string& md,
                                                                std::string& intro) {
  std::vector<std::pair<std::string, std::string>> out;
  std::size_t pos = 0;
  std::string* body = &intro;
  while (pos < md.size()) {
    std::size_t end = md.find('\n', pos);
    if (end == std::string::npos) end = md.size();
    const std::string line = md.substr(pos, end - pos);
    pos = end + 1;
    if (line.starts_with("# ")) continue;
    if (line.starts_with("## ")) {
      out.emplace_back(line.substr(3), std::string());
      body = &out.back().second;
      continue;
    }
    *body += line + "\n";
  }
  return out;
}

std::string section_id(std::string_view heading) {
  std::string id;
  for (char ch : heading) {
    const auto u = static_cast<unsigned char>(ch);
    if (std::isalnum(u))
      id += static_cast<char>(std::tolower(u));
    else if (!id.empty() && id.back() != '-')
      id += '-';
  }
  while (!id.empty() && id.back() == '-') id.pop_back();
  return id;
}

constexpr std::string_view kRecordCss =
    R"(main table th{white-space:normal}main table td:not(.r){white-space:normal}
table.signoff{width:100%;margin:.6rem 0 0;font-size:.9rem}
table.signoff th{width:14rem;border-bottom:1px solid var(--rule);vertical-align:top;padding:.9rem .5rem .3rem}
table.signoff td{border-bottom:1px solid var(--ink);height:2.4rem;white-space:normal}
table.signoff tr:nth-child(even){background:none}
@media print{table.signoff td{height:1.2cm}section#review{break-inside:avoid}})";

}  // namespace

std::string audit_record_html(const audit::Result& r, const trend::TrendLog& log,
                              const AuditContext& c, const audit::Timeline& t,
                              std::string_view generator) {
  std::string intro_md;
  const auto parts = split_sections(audit_markdown(r, log, c), intro_md);
  PageHead head;
  head.kicker = "Economizer trend audit record";
  head.title = log.path;
  head.intro =
      fmt::format("Unit file {}; strategy {} ({}): {}. {} found in {} h of fan operation.",
                  c.unit_path, r.strategy_name, c.strategy_source, c.strategy_text,
                  r.findings.empty() ? std::string("No finding")
                                     : fmt::format("{} kind{} of finding", r.findings.size(),
                                                   r.findings.size() == 1 ? "" : "s"),
                  fmt::format("{:.1f}", r.operating_hours));
  if (!generator.empty())
    head.footer =
        fmt::format("Written by {} from the unit file and trend log named above.", generator);
  head.extra_css = std::string(kRecordCss);
  std::vector<PageSection> sections;
  std::string cautions;
  for (const auto& [heading, body] : parts) {
    if (heading == "Cautions") {
      cautions = body;
      continue;
    }
    sections.push_back({section_id(heading), heading, markdown_to_html(body), ""});
    if (heading == "Findings")
      sections.push_back({"log", "The log over time",
                          "<figure class=\"log\">\n" + audit_log_svg(t, log, c) +
                              "<figcaption>Outdoor dry-bulb and the damper's outdoor-air "
                              "fraction over the log; the samples of each finding on its own "
                              "lane, and shaded across both panels.</figcaption>\n</figure>\n",
                          ""});
  }
  sections.push_back(
      {"review", "Review",
       "<p>The reviewer has compared the findings above with the unit as installed and its "
       "controls as programmed, and records the outcome here.</p>\n"
       "<table class=\"signoff\">\n<tbody>\n"
       "<tr><th>Reviewed by</th><td></td></tr>\n"
       "<tr><th>Organisation and licence or certification</th><td></td></tr>\n"
       "<tr><th>Date</th><td></td></tr>\n"
       "<tr><th>Outcome and actions</th><td></td></tr>\n"
       "<tr><th>Signature</th><td></td></tr>\n"
       "</tbody>\n</table>\n",
       ""});
  if (!cautions.empty())
    sections.push_back({"cautions", "Cautions", markdown_to_html(cautions), "cautions"});
  return html_page(head, sections);
}

}  // namespace limitline::report
