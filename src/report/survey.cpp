#include "svg_draw.hpp"

#include <limitline/analysis/decision.hpp>
#include <limitline/report/cautions.hpp>
#include <limitline/report/html.hpp>
#include <limitline/report/json.hpp>
#include <limitline/report/survey.hpp>
#include <limitline/report/table.hpp>
#include <limitline/report/year.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

namespace limitline::report {
namespace {

using survey::SiteRecord;
using survey::StrategySummary;
using survey::ZoneSummary;

std::string zone_title(const ZoneSummary& z) {
  return z.zone.empty() ? std::string("No climate zone given") : "Climate zone " + z.zone;
}

std::string join(const std::vector<std::string>& v, std::string_view sep) {
  std::string out;
  for (std::size_t i = 0; i < v.size(); ++i) out += (i ? std::string(sep) : "") + v[i];
  return out;
}

std::string setting_text(const std::vector<survey::Setting>& v, units::System s) {
  std::string out;
  for (std::size_t i = 0; i < v.size(); ++i)
    out += (i ? " / " : "") + units::format(v[i].kind, s, v[i].value, 1);
  return out;
}

std::string share(const std::optional<double>& v) {
  return v ? decision::share_text(*v) : std::string("-");
}

std::string of(int n, int total) { return fmt::format("{} of {}", n, total); }

std::size_t failed_count(const SurveyReport& r) {
  return static_cast<std::size_t>(
      std::count_if(r.sites.begin(), r.sites.end(), [](const SiteRecord& s) { return !s.ok; }));
}

bool any_code(const ZoneSummary& z) { return !z.codes.empty(); }

// The first of the best (or best compliant) with the count of those tied with it.
std::string best_text(const std::vector<std::string>& best) {
  if (best.empty()) return "-";
  return best.size() == 1 ? best.front() : fmt::format("{} +{}", best.front(), best.size() - 1);
}

const survey::StrategyFigures* figures(const SiteRecord& s, const std::string& name) {
  for (const auto& f : s.strategies)
    if (f.name == name) return &f;
  return nullptr;
}

Table zone_table(const ZoneSummary& z, const SurveyReport& r) {
  const Measure m(r.info.units, r.info.currency);
  const bool code = any_code(z);
  std::vector<Column> cols = {
      {"strategy", Align::left, true},         {"best", Align::right},
      {"best allowed", Align::right},          {"allowed", Align::right},
      {m.unit() + " med/worst", Align::right}, {"% med/worst", Align::right}};
  if (r.info.tune) cols.push_back({"median best setting", Align::left, false, 1});
  Table t(cols);
  for (const StrategySummary& s : z.strategies) {
    std::vector<std::string> row = {
        s.name,
        of(s.wins, s.sites),
        code ? of(s.compliant_wins, s.sites) : "-",
        code ? of(s.compliant, s.sites) : "-",
        m.format(s.median_shortfall) + " / " + m.format(s.worst_shortfall),
        share(s.median_share) + " / " + share(s.worst_share)};
    if (r.info.tune) row.push_back(setting_text(s.median_best_setting, r.info.units));
    t.add_row(std::move(row));
  }
  return t;
}

// The zone's answer in one sentence each: the strategy most often best, and the one most
// often best among those the code allows.
std::vector<std::string> zone_lines(const ZoneSummary& z) {
  std::vector<std::string> out;
  const int n = z.sites_ok;
  out.push_back(fmt::format("{} site{} evaluated{}{}", n, n == 1 ? "" : "s",
                            z.sites_failed ? fmt::format(", {} failed", z.sites_failed) : "",
                            n == 0        ? ""
                            : any_code(z) ? "; code: " + join(z.codes, ", ")
                                          : "; no energy code"));
  if (z.economizer_judged)
    out.push_back(fmt::format("The code requires an economizer on this unit at {} of {} site{}",
                              z.economizer_required, z.economizer_judged,
                              z.economizer_judged == 1 ? "" : "s"));
  if (z.strategies.empty()) return out;
  const auto most = [&](int StrategySummary::*count) {
    return std::max_element(
        z.strategies.begin(), z.strategies.end(),
        [&](const StrategySummary& a, const StrategySummary& b) { return a.*count < b.*count; });
  };
  const auto w = most(&StrategySummary::wins);
  out.push_back(
      fmt::format("Most often best: {} ({} of {} sites, ties counted for each); least "
                  "median shortfall: {}",
                  w->name, w->wins, n, z.strategies.front().name));
  if (any_code(z)) {
    const auto c = most(&StrategySummary::compliant_wins);
    out.push_back(c->compliant_wins > 0
                      ? fmt::format("Most often best among those the code allows: {} ({} of {})",
                                    c->name, c->compliant_wins, n)
                      : std::string("No strategy the code allows was evaluated here"));
  }
  return out;
}

Table sites_table(const SurveyReport& r) {
  const Measure m(r.info.units, r.info.currency);
  std::vector<Column> cols = {
      {"site", Align::left, true},    {"zone", Align::left},
      {"best allowed", Align::left},  {"its shortfall " + m.unit(), Align::right},
      {"% of perfect", Align::right}, {"best", Align::left, false, 1}};
  if (r.info.tune) cols.push_back({"its best setting", Align::left, false, 1});
  Table t(cols);
  for (const SiteRecord& s : r.sites) {
    if (!s.ok) continue;
    // The figures of the best the code allows, else of the best.
    const std::string& pick = !s.best_compliant.empty() ? s.best_compliant.front() : s.best.front();
    const survey::StrategyFigures* f = figures(s, pick);
    std::vector<std::string> row = {
        s.site,
        s.zone.empty() ? "-" : s.zone,
        s.code.empty() ? "-" : best_text(s.best_compliant),
        f ? m.format(f->shortfall) : "-",
        f && s.perfect_savings > 0 ? decision::share_text(f->shortfall / s.perfect_savings) : "-",
        best_text(s.best)};
    if (r.info.tune) row.push_back(f ? setting_text(f->best_setting, r.info.units) : "-");
    t.add_row(std::move(row));
  }
  return t;
}

std::vector<std::string> failed_lines(const SurveyReport& r) {
  std::vector<std::string> out;
  for (const SiteRecord& s : r.sites)
    if (!s.ok) out.push_back(fmt::format("{} ({}): {}", s.site, s.weather, s.error));
  return out;
}

std::vector<std::string> note_lines(const SurveyReport& r) {
  std::vector<std::string> out;
  for (const std::string& w : r.info.unit_warnings) out.push_back("unit: " + w);
  for (const SiteRecord& s : r.sites)
    for (const std::string& w : s.warnings) out.push_back(s.site + ": " + w);
  return out;
}

std::vector<std::string> header_lines(const SurveyReport& r) {
  const Measure m(r.info.units, r.info.currency);
  const std::size_t failed = failed_count(r);
  std::vector<std::string> out = {
      fmt::format("Manifest: {} ({} site{}{}{})", r.info.manifest, r.info.rows,
                  r.info.rows == 1 ? "" : "s", failed ? fmt::format("; {} failed", failed) : "",
                  r.partial ? fmt::format("; interrupted after {}", r.sites.size()) : ""),
      fmt::format("Unit: {} (for every site whose row names none)", r.info.unit),
      fmt::format("Ranking: shortfall against the perfect changeover, {}", m.basis()),
      r.info.tune ? std::string("Setpoints: each strategy tuned per site over its practical "
                                "settings (as limitline tune)")
                  : std::string("Setpoints: as set (the code's where a site names one; --tune "
                                "sweeps them per site)"),
  };
  return out;
}

}  // namespace

std::string survey_text(const SurveyReport& r, std::size_t width) {
  std::string out =
      fmt::format("limitline survey — {} climate zone{}, {} site{}\n\n", r.zones.size(),
                  r.zones.size() == 1 ? "" : "s", r.info.rows, r.info.rows == 1 ? "" : "s");
  for (const std::string& l : header_lines(r)) out += l + "\n";
  out +=
      "\nBy climate zone: at how many sites each strategy is best (or tied with the best, "
      "+N), best among those the code allows, and allowed as set; its shortfall, median and "
      "worst, in energy and as a share of each site's perfect-changeover savings\n";
  for (const ZoneSummary& z : r.zones) {
    out += "\n" + zone_title(z) + "\n";
    for (const std::string& l : zone_lines(z)) out += "  " + l + "\n";
    if (!z.strategies.empty()) out += "\n" + zone_table(z, r).text(width);
  }
  const Table sites = sites_table(r);
  if (sites.rows())
    out +=
        "\nSites: the best strategy the site's code allows, what it falls short by, and the best "
        "overall\n\n" +
        sites.text(width);
  const auto failed = failed_lines(r);
  if (!failed.empty()) {
    out += "\nSites that failed (the others are complete):\n";
    for (const std::string& l : failed) out += "  - " + l + "\n";
  }
  const auto notes = note_lines(r);
  if (!notes.empty()) {
    out += "\nNotes:\n";
    for (const std::string& l : notes) out += "  - " + l + "\n";
  }
  out += "\n" + cautions_text(CautionTopic::survey);
  return fit_lines(out, width);
}

std::string survey_csv(const SurveyReport& r, bool sites) {
  const Measure m(r.info.units, r.info.currency);
  const std::string u = m.unit();
  if (!sites) {
    std::vector<Column> cols;
    for (const char* c : {"zone", "codes", "sites_ok", "sites_failed", "strategy", "sites", "wins",
                          "compliant_wins", "compliant"})
      cols.push_back({c, Align::left});
    for (const std::string c : {"median_shortfall", "worst_shortfall"})
      cols.push_back({c + "_" + u, Align::left});
    cols.push_back({"median_share", Align::left});
    cols.push_back({"worst_share", Align::left});
    if (r.info.tune) cols.push_back({"median_best_setting", Align::left});
    Table t(cols);
    for (const ZoneSummary& z : r.zones) {
      for (const StrategySummary& s : z.strategies) {
        const auto frac = [](const std::optional<double>& v) {
          return v ? fmt::format("{:.4f}", *v) : std::string();
        };
        std::vector<std::string> row = {z.zone,
                                        join(z.codes, ";"),
                                        std::to_string(z.sites_ok),
                                        std::to_string(z.sites_failed),
                                        s.name,
                                        std::to_string(s.sites),
                                        std::to_string(s.wins),
                                        std::to_string(s.compliant_wins),
                                        std::to_string(s.compliant),
                                        m.format(s.median_shortfall),
                                        m.format(s.worst_shortfall),
                                        frac(s.median_share),
                                        frac(s.worst_share)};
        if (r.info.tune) row.push_back(setting_text(s.median_best_setting, r.info.units));
        t.add_row(std::move(row));
      }
    }
    return t.csv();
  }
  std::vector<Column> cols;
  for (const char* c : {"row", "line", "site", "weather", "zone", "code", "status", "error",
                        "economizer", "strategy", "rank", "compliance", "best", "best_allowed"})
    cols.push_back({c, Align::left});
  for (const std::string c : {"shortfall", "savings"}) cols.push_back({c + "_" + u, Align::left});
  cols.push_back({"harmful_h", Align::left});
  cols.push_back({"missed_h", Align::left});
  if (r.info.tune) {
    cols.push_back({"best_setting", Align::left});
    cols.push_back({"tuned_shortfall_" + u, Align::left});
  }
  Table t(cols);
  const auto yes = [](const std::vector<std::string>& v, const std::string& n) {
    return std::find(v.begin(), v.end(), n) != v.end() ? "yes" : "no";
  };
  for (const SiteRecord& s : r.sites) {
    const std::vector<std::string> lead = {std::to_string(s.row + 1),
                                           std::to_string(s.line),
                                           s.site,
                                           s.weather,
                                           s.zone,
                                           s.code,
                                           s.ok ? "ok" : "failed",
                                           s.error,
                                           s.economizer};
    if (!s.ok) {
      std::vector<std::string> row = lead;
      row.resize(cols.size());
      t.add_row(std::move(row));
      continue;
    }
    for (std::size_t k = 0; k < s.strategies.size(); ++k) {
      const survey::StrategyFigures& f = s.strategies[k];
      std::vector<std::string> row = lead;
      for (std::string c :
           {f.name, std::to_string(k + 1), f.compliance, std::string(yes(s.best, f.name)),
            std::string(yes(s.best_compliant, f.name)), m.format(f.shortfall), m.format(f.savings),
            fmt::format("{:.0f}", f.harmful_hours), fmt::format("{:.0f}", f.missed_hours)})
        row.push_back(std::move(c));
      if (r.info.tune) {
        row.push_back(setting_text(f.best_setting, r.info.units));
        row.push_back(f.tuned_shortfall ? m.format(*f.tuned_shortfall) : "");
      }
      t.add_row(std::move(row));
    }
  }
  return t.csv();
}

std::string survey_json(const SurveyReport& r) {
  const Measure m(r.info.units, r.info.currency);
  Json j;
  j.begin_object();
  j.field("manifest", r.info.manifest);
  j.field("unit", r.info.unit);
  j.field("units", units::system_name(r.info.units));
  j.field("ranking_basis", m.is_cost() ? "cost" : "weighted-energy");
  if (m.is_cost()) j.field("currency", r.info.currency);
  j.field("tuned", r.info.tune);
  j.field("sites", r.info.rows);
  j.field("failed", failed_count(r));
  j.field("partial", r.partial);
  const auto figure = [&](std::string_view stem, double v) {
    for (const auto& [k, x] : m.fields(stem, v)) j.field(k, x, 8);
  };
  const auto settings = [&](std::string_view key, const std::vector<survey::Setting>& v) {
    j.key(key).begin_array();
    for (const survey::Setting& s : v) {
      j.begin_object();
      j.field("condition", s.condition);
      j.field("value", units::format(s.kind, r.info.units, s.value, 1));
      j.end_object();
    }
    j.end_array();
  };
  j.key("zones").begin_array();
  for (const ZoneSummary& z : r.zones) {
    j.begin_object();
    j.field("zone", z.zone);
    j.field("sites_ok", z.sites_ok);
    j.field("sites_failed", z.sites_failed);
    j.field("economizer_required", z.economizer_required);
    j.field("economizer_judged", z.economizer_judged);
    j.strings("codes", z.codes);
    j.key("strategies").begin_array();
    for (const StrategySummary& s : z.strategies) {
      j.begin_object();
      j.field("name", s.name);
      j.field("sites", s.sites);
      j.field("wins", s.wins);
      j.field("compliant_wins", s.compliant_wins);
      j.field("compliant", s.compliant);
      figure("median_shortfall", s.median_shortfall);
      figure("worst_shortfall", s.worst_shortfall);
      if (s.median_share)
        j.field("median_share", *s.median_share, 6);
      else
        j.key("median_share").null();
      if (s.worst_share)
        j.field("worst_share", *s.worst_share, 6);
      else
        j.key("worst_share").null();
      if (r.info.tune) settings("median_best_setting", s.median_best_setting);
      j.end_object();
    }
    j.end_array();
    j.end_object();
  }
  j.end_array();
  j.key("site_results").begin_array();
  for (const SiteRecord& s : r.sites) {
    j.begin_object();
    j.field("row", s.row + 1);
    j.field("line", s.line);
    j.field("site", s.site);
    j.field("weather", s.weather);
    j.field("zone", s.zone);
    j.field("code", s.code);
    j.field("status", s.ok ? "ok" : "failed");
    if (!s.ok) {
      j.field("error", s.error);
      j.end_object();
      continue;
    }
    if (!s.economizer.empty()) j.field("economizer", s.economizer);
    j.field("operating_hours", s.operating_hours, 8);
    figure("perfect_savings", s.perfect_savings);
    figure("tie_tolerance", s.tolerance);
    j.strings("best", s.best);
    j.strings("best_compliant", s.best_compliant);
    j.strings("warnings", s.warnings);
    j.key("strategies").begin_array();
    for (const auto& f : s.strategies) {
      j.begin_object();
      j.field("name", f.name);
      if (!f.compliance.empty()) j.field("compliance", f.compliance);
      figure("shortfall_vs_perfect", f.shortfall);
      figure("savings_vs_no_economizer", f.savings);
      j.field("harmful_hours", f.harmful_hours, 8);
      j.field("missed_hours", f.missed_hours, 8);
      if (f.tuned_shortfall) {
        settings("best_setting", f.best_setting);
        figure("tuned_shortfall_vs_perfect", *f.tuned_shortfall);
        if (!f.tuned_compliance.empty()) j.field("tuned_compliance", f.tuned_compliance);
      }
      j.end_object();
    }
    j.end_array();
    j.end_object();
  }
  j.end_array();
  j.strings("unit_warnings", r.info.unit_warnings);
  j.strings("cautions", cautions(CautionTopic::survey));
  j.end_object();
  return j.str();
}

std::string zone_picture_svg(const ZoneSummary& z) {
  constexpr double kWidth = 860, kLeft = 230, kRight = 150, kTop = 46, kLane = 30, kBottom = 62;
  const double plot_w = kWidth - kLeft - kRight;
  const double height = kTop + kLane * static_cast<double>(z.strategies.size()) + kBottom;
  double peak = 0;
  for (const StrategySummary& s : z.strategies)
    for (const double v : s.shares) peak = std::max(peak, v * 100.0);
  const double step = svg::round_step(std::max(peak, 1.0), 6);
  const double top = step * std::ceil(std::max(peak, 1.0) / step);
  const auto x = [&](double pct) { return kLeft + plot_w * std::clamp(pct, 0.0, top) / top; };
  std::string out = svg::open(
      kWidth, height, fmt::format("{}: shortfall of each strategy at each site", zone_title(z)));
  out += fmt::format(R"(<rect width="{}" height="{}" fill="{}"/>)", svg::num(kWidth),
                     svg::num(height), svg::kPaper);
  out += svg::text(
      12, 22, zone_title(z) + fmt::format(" — {} site{}", z.sites_ok, z.sites_ok == 1 ? "" : "s"),
      fmt::format(R"(font-size="15" font-weight="bold" fill="{}")", svg::kInk));
  out += svg::text(kWidth - 12, 22, "best at",
                   fmt::format(R"(font-size="12" text-anchor="end" fill="{}")", svg::kInkSoft));
  const double y_axis = kTop + kLane * static_cast<double>(z.strategies.size());
  for (double v = 0; v <= top + 1e-9; v += step) {
    out +=
        fmt::format(R"(<line x1="{0}" y1="{1}" x2="{0}" y2="{2}" stroke="{3}" stroke-width="1"/>)",
                    svg::num(x(v)), svg::num(kTop - 6), svg::num(y_axis), svg::kGridMajor);
    out +=
        svg::text(x(v), y_axis + 16, svg::tick_label(v) + "%",
                  fmt::format(R"(font-size="11" text-anchor="middle" fill="{}")", svg::kInkSoft));
  }
  out += svg::text(kLeft + plot_w / 2, y_axis + 32,
                   "shortfall against the perfect changeover, % of each site's possible savings",
                   fmt::format(R"(font-size="11" text-anchor="middle" fill="{}")", svg::kInkSoft));
  for (std::size_t i = 0; i < z.strategies.size(); ++i) {
    const StrategySummary& s = z.strategies[i];
    const double yc = kTop + kLane * (static_cast<double>(i) + 0.5);
    out += fmt::format(R"(<g class="lane" data-strategy="{}">)", html_escape(s.name));
    out += svg::text(kLeft - 10, yc + 4, s.name,
                     fmt::format(R"(font-size="12" text-anchor="end" fill="{}")", svg::kInk));
    out +=
        fmt::format(R"(<line x1="{0}" y1="{2}" x2="{1}" y2="{2}" stroke="{3}" stroke-width="1"/>)",
                    svg::num(kLeft), svg::num(kLeft + plot_w), svg::num(yc), svg::kGridMinor);
    for (const double v : s.shares)
      out += fmt::format(
          R"(<circle class="site" cx="{}" cy="{}" r="3.5" fill="{}" fill-opacity="0.55"/>)",
          svg::num(x(v * 100.0)), svg::num(yc), svg::kNoCooling);
    if (s.median_share)
      out += fmt::format(
          R"(<line class="median" x1="{0}" y1="{1}" x2="{0}" y2="{2}" stroke="{3}" stroke-width="3"/>)",
          svg::num(x(*s.median_share * 100.0)), svg::num(yc - 10), svg::num(yc + 10), svg::kInk);
    const std::string wins = fmt::format("{} of {}", s.wins, s.sites);
    out += svg::text(kWidth - 12, yc + 4, wins,
                     fmt::format(R"(font-size="12" text-anchor="end" fill="{}"{})",
                                 s.wins ? svg::kEconomize : svg::kInkSoft,
                                 s.wins ? R"( font-weight="bold")" : ""));
    out += "</g>";
  }
  out += svg::text(kLeft, y_axis + 52, "each dot a site; the bar is the median",
                   fmt::format(R"(font-size="10" fill="{}")", svg::kInkSoft));
  out += "</svg>\n";
  return out;
}

std::string survey_html(const SurveyReport& r) {
  PageHead head;
  head.kicker = "Economizer high-limit survey";
  head.title = fmt::format("{} sites, {} climate zone{}", r.info.rows, r.zones.size(),
                           r.zones.size() == 1 ? "" : "s");
  head.intro = join(header_lines(r), ". ") + ".";
  head.footer = "Written by limitline " + r.info.version;
  head.extra_css = ".zone-figure svg{max-width:100%;height:auto}";
  std::vector<PageSection> sections;
  std::string zones;
  for (const ZoneSummary& z : r.zones) {
    std::string md = "### " + markdown_escape(zone_title(z)) + "\n\n";
    for (const std::string& l : zone_lines(z)) md += "- " + markdown_escape(l) + "\n";
    zones += markdown_to_html(md);
    if (!z.strategies.empty()) {
      zones += R"(<div class="zone-figure">)" + zone_picture_svg(z) + "</div>";
      zones += markdown_to_html(zone_table(z, r).markdown());
    }
  }
  sections.push_back({"zones", "By climate zone", zones, ""});
  const Table sites = sites_table(r);
  if (sites.rows()) {
    std::string html;
    for (const Table& part : sites.parts()) html += markdown_to_html(part.markdown());
    sections.push_back({"sites", "Sites", html, ""});
  }
  const auto list = [](const std::vector<std::string>& lines) {
    std::string md;
    for (const std::string& l : lines) md += "- " + markdown_escape(l) + "\n";
    return markdown_to_html(md);
  };
  const auto failed = failed_lines(r);
  if (!failed.empty()) sections.push_back({"failed", "Sites that failed", list(failed), ""});
  const auto notes = note_lines(r);
  if (!notes.empty()) sections.push_back({"notes", "Notes", list(notes), ""});
  sections.push_back({"cautions", "Cautions", list(cautions(CautionTopic::survey)), "cautions"});
  return html_page(head, sections);
}

}  // namespace limitline::report
