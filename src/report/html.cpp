#include <limitline/report/html.hpp>

#include <limitline/report/chart.hpp>
#include <limitline/report/table.hpp>
#include <limitline/text.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <cctype>

namespace limitline::report {
namespace {

// --- Markdown subset → HTML -----------------------------------------------------------------

// Escaped text with **bold** spans; a backslash before ASCII punctuation makes it literal
// (markdown_escape), as in CommonMark.
std::string inline_html(std::string_view s) {
  std::string out;
  bool strong = false;
  for (std::size_t i = 0; i < s.size(); ++i) {
    if (s[i] == '\\' && i + 1 < s.size() && std::ispunct(static_cast<unsigned char>(s[i + 1]))) {
      out += html_escape(s.substr(++i, 1));
      continue;
    }
    if (s.compare(i, 2, "**") == 0 && (strong || s.find("**", i + 2) != std::string_view::npos)) {
      out += strong ? "</strong>" : "<strong>";
      strong = !strong;
      ++i;
      continue;
    }
    out += html_escape(s.substr(i, 1));
  }
  if (strong) out += "</strong>";
  return out;
}

std::vector<std::string> table_cells(std::string_view line) {
  std::vector<std::string> cells;
  std::string cell;
  std::size_t i = 0;
  if (!line.empty() && line[0] == '|') i = 1;
  for (; i < line.size(); ++i) {
    if (line[i] == '\\' && i + 1 < line.size()) {
      // An escaped character stays escaped for inline_html; an escaped pipe splits no cell.
      cell += line.substr(i, 2);
      ++i;
    } else if (line[i] == '|') {
      cells.push_back(cell);
      cell.clear();
    } else {
      cell += line[i];
    }
  }
  if (!cell.empty() && cell.find_first_not_of(' ') != std::string::npos) cells.push_back(cell);
  for (auto& c : cells) {
    const auto a = c.find_first_not_of(' ');
    const auto b = c.find_last_not_of(' ');
    c = a == std::string::npos ? std::string() : c.substr(a, b - a + 1);
  }
  return cells;
}

std::string table_html(const std::vector<std::string_view>& lines) {
  const auto head = table_cells(lines[0]);
  std::vector<std::string> align(head.size(), "");
  std::size_t first_row = 1;
  if (lines.size() > 1) {
    const auto spec = table_cells(lines[1]);
    bool is_spec = !spec.empty();
    for (const auto& s : spec)
      if (s.find_first_not_of(":-") != std::string::npos || s.find('-') == std::string::npos)
        is_spec = false;
    if (is_spec) {
      first_row = 2;
      for (std::size_t c = 0; c < spec.size() && c < align.size(); ++c)
        if (spec[c].back() == ':' && spec[c].front() != ':') align[c] = " class=\"r\"";
    }
  }
  std::string out = "<div class=\"scroll\"><table>\n<thead><tr>";
  for (std::size_t c = 0; c < head.size(); ++c)
    out += fmt::format("<th{}>{}</th>", align[c], inline_html(head[c]));
  out += "</tr></thead>\n<tbody>\n";
  for (std::size_t r = first_row; r < lines.size(); ++r) {
    const auto cells = table_cells(lines[r]);
    out += "<tr>";
    for (std::size_t c = 0; c < head.size(); ++c)
      out += fmt::format("<td{}>{}</td>", align[c], c < cells.size() ? inline_html(cells[c]) : "");
    out += "</tr>\n";
  }
  return out + "</tbody>\n</table></div>\n";
}

bool ordered_item(std::string_view line, std::size_t& text_at) {
  std::size_t i = 0;
  while (i < line.size() && std::isdigit(static_cast<unsigned char>(line[i]))) ++i;
  if (i == 0 || i + 1 >= line.size() || line[i] != '.' || line[i + 1] != ' ') return false;
  text_at = i + 2;
  return true;
}

// --- The study as sections ----------------------------------------------------------------

struct MdSection {
  std::string heading;
  std::string body;
};

struct MdDoc {
  std::string title;
  std::string preamble;  // before the first "## "
  std::vector<MdSection> sections;
};

MdDoc split_markdown(std::string_view md) {
  MdDoc d;
  std::size_t pos = 0;
  while (pos < md.size()) {
    std::size_t end = md.find('\n', pos);
    if (end == std::string_view::npos) end = md.size();
    const std::string_view line = md.substr(pos, end - pos);
    pos = end + 1;
    if (line.starts_with("# ") && d.title.empty() && d.sections.empty())
      d.title = std::string(line.substr(2));
    else if (line.starts_with("## "))
      d.sections.push_back({std::string(line.substr(3)), {}});
    else
      (d.sections.empty() ? d.preamble : d.sections.back().body) += std::string(line) + "\n";
  }
  return d;
}

enum class Figure { none, monthly, chart };

struct Block {
  std::string id;
  std::string heading;
  std::string md;
  std::string html;  // replaces markdown_to_html(md) in the page when set
  Figure figure = Figure::none;
  std::string css;
};

std::string slug(std::string_view s) {
  std::string out;
  for (char c : s) {
    if (std::isalnum(static_cast<unsigned char>(c)))
      out += text::to_lower(c);
    else if (!out.empty() && out.back() != '-')
      out += '-';
    if (out.size() >= 40) break;
  }
  while (!out.empty() && out.back() == '-') out.pop_back();
  return out.empty() ? "section" : out;
}

Block strategies_block(const ReportDocument& doc) {
  Block b{"strategies", "High-limit strategies weighed", {}, {}, Figure::none, "strategies"};
  b.html = "<ol class=\"strategy-list\">\n";
  for (std::size_t i = 0; i < doc.strategy_order.size(); ++i) {
    const std::string& name = doc.strategy_order[i];
    const auto it = doc.context.strategy_descriptions.find(name);
    const std::string desc = it == doc.context.strategy_descriptions.end() ? "" : it->second;
    b.md += fmt::format("{}. **{}** — {}\n", i + 1, markdown_escape(name), markdown_escape(desc));
    b.html += fmt::format(
        "<li><span class=\"swatch\" style=\"background:{}\">{}</span><strong>{}</strong> — "
        "{}</li>\n",
        strategy_colour(i), i + 1, html_escape(name), html_escape(desc));
  }
  b.html +=
      "</ol>\n<p class=\"note\">The numbers and colours are those of the pictures below.</p>\n";
  b.md += "\nThe numbers are those of the psychrometric chart.\n";
  return b;
}

Block unit_block(const MdDoc& y, const ReportDocument& doc) {
  Block b{"inputs", "The job and its inputs", {}, {}, Figure::none, "inputs"};
  b.md = y.preamble;
  b.md.erase(0, std::min(b.md.find_first_not_of('\n'), b.md.size()));
  while (!b.md.empty() && b.md.back() == '\n') b.md.pop_back();
  b.md += "\n";
  for (const auto& [k, v] : doc.unit_facts)
    b.md += fmt::format("- {}: {}\n", markdown_escape(k), markdown_escape(v));
  return b;
}

Block chart_block() {
  Block b{"chart", "Where the occupied hours fall", {}, {}, Figure::chart, "chart-section"};
  b.md =
      "Each occupied hour of the weather year sits on the chart at its outdoor state, binned and "
      "coloured by what the perfect changeover does with it. A high-limit is good for this climate "
      "when "
      "its line separates the green cells (economizing pays) from the terracotta ones (it does "
      "not): "
      "green cells beyond a line are missed free cooling, terracotta cells on the permitted side "
      "are "
      "harmful hours.\n";
  return b;
}

Block compliance_block(const ComplianceSection& c) {
  Block b{"code", "Energy-code compliance", {}, {}, Figure::none, "compliance"};
  b.md = fmt::format("Checked against {}.\n\n", markdown_escape(c.label));
  for (const auto& n : c.notes) b.md += "- " + markdown_escape(n) + "\n";
  b.md += "\n| strategy | verdict | reason |\n|:---|:---|:---|\n";
  b.html = fmt::format("<p>Checked against <strong>{}</strong>.</p>\n", html_escape(c.label));
  if (!c.notes.empty()) {
    b.html += "<ul class=\"notes\">\n";
    for (const auto& n : c.notes) b.html += "<li>" + html_escape(n) + "</li>\n";
    b.html += "</ul>\n";
  }
  b.html += "<ul class=\"verdicts\">\n";
  for (const auto& l : c.lines) {
    b.md += fmt::format("| {} | {} | {} |\n", markdown_escape(l.strategy),
                        markdown_escape(l.verdict), markdown_escape(l.explanation));
    b.html += fmt::format("<li><span class=\"verdict {}\">{}</span> <strong>{}</strong>: {}</li>\n",
                          slug(l.verdict), html_escape(l.verdict), html_escape(l.strategy),
                          html_escape(l.explanation));
  }
  b.html += "</ul>\n";
  return b;
}

Block tuning_block(const TuningSection& t) {
  Block b{"tuning", "Setpoint tuning", t.markdown, {}, Figure::none, "tuning"};
  b.html = markdown_to_html(t.markdown);
  auto inline_svg = [](std::string svg) {
    const std::string ns = " xmlns=\"http://www.w3.org/2000/svg\"";
    if (const auto at = svg.find(ns); at != std::string::npos) svg.erase(at, ns.size());
    return svg;
  };
  for (const auto& [name, svg] : t.plots)
    b.html += "<figure class=\"tuning\">\n" + inline_svg(svg) +
              fmt::format(
                  "<figcaption>{}: annual cost of each setting against the best, along "
                  "its swept setting; the shaded band is within 1% of the best "
                  "savings.</figcaption>\n</figure>\n",
                  html_escape(name));
  return b;
}

bool heading_is(const std::string& h, std::string_view prefix) { return h.starts_with(prefix); }

std::string with_swatches(std::string html, const ReportDocument& doc);

// The study in order: inputs, strategies, the annual report's sections with the pictures
// after the monthly economizing hours, compliance, cautions last.
std::vector<Block> blocks(const annual::YearResult& year, const ReportDocument& doc,
                          std::string& intro) {
  const MdDoc y = split_markdown(year_markdown(year, doc.context));
  std::vector<Block> out;
  out.push_back(unit_block(y, doc));
  out.push_back(strategies_block(doc));
  bool chart_done = false, code_done = false;
  auto add_code = [&] {
    if (doc.compliance && !code_done) out.push_back(compliance_block(*doc.compliance));
    if (doc.tuning && !code_done) out.push_back(tuning_block(*doc.tuning));
    code_done = true;
  };
  for (const auto& s : y.sections) {
    if (heading_is(s.heading, "Cautions")) {
      if (!chart_done) out.push_back(chart_block());
      chart_done = true;
      add_code();
    }
    std::string body = s.body;
    body.erase(0, body.find_first_not_of('\n') == std::string::npos ? body.size()
                                                                    : body.find_first_not_of('\n'));
    Block b{slug(s.heading), s.heading, body, {}, Figure::none, ""};
    if (heading_is(s.heading, "Strategies ranked")) {
      // The decision figures in the table; the hours and energies behind them in a second
      // one under it (not folded away: a folded part would not print), so each fits a laptop
      // screen without scrolling.
      b.css = "ranked";
      const auto parts = ranked_table(year, doc.context).parts();
      b.html = with_swatches(markdown_to_html(parts.front().markdown()), doc);
      for (std::size_t k = 1; k < parts.size(); ++k)
        b.html += "<p class=\"more\">Hours and energy behind the ranking:</p>\n" +
                  with_swatches(markdown_to_html(parts[k].markdown()), doc);
    }
    if (heading_is(s.heading, "Cautions")) b.css = "cautions";
    if (heading_is(s.heading, "Economizing hours by month")) b.figure = Figure::monthly;
    out.push_back(b);
    if (b.figure == Figure::monthly && !chart_done) {
      out.push_back(chart_block());
      chart_done = true;
    }
  }
  if (!chart_done) out.push_back(chart_block());
  add_code();
  const auto rec = recommendation_lines(year, doc.context);
  intro = fmt::format(
      "{} high-limit strategies for this air handler weighed hour by hour over the weather year of "
      "{}, each "
      "scored against the perfect changeover: the ideal high-limit that economizes exactly when it "
      "costs "
      "less than not economizing.{}",
      year.strategies.size(), doc.context.weather_source,
      rec.empty() ? std::string() : " " + rec.front());
  return out;
}

constexpr std::string_view kCss =
    R"(:root{--ink:#1f3347;--soft:#55606b;--paper:#fbf8f1;--rule:#d6ccb8;--accent:#bf8a3f;
--sans:'DejaVu Sans','Segoe UI','Helvetica Neue',Arial,sans-serif}
*{box-sizing:border-box}
html{background:#e9e2d2}
body{margin:0;color:var(--ink);font:15px/1.55 Charter,'Bitstream Charter','Sitka Text',Cambria,'DejaVu Serif',Georgia,serif}
main{max-width:62rem;margin:1.5rem auto;background:var(--paper);padding:2rem 2.6rem 2.5rem;box-shadow:0 1px 4px rgba(31,51,71,.18)}
header.title{border-bottom:3px solid var(--ink);padding-bottom:.8rem;margin-bottom:1.2rem}
.kicker{font:700 .72rem/1 var(--sans);letter-spacing:.16em;text-transform:uppercase;color:var(--accent);margin:0 0 .5rem}
h1{font:700 1.65rem/1.2 var(--sans);margin:0 0 .5rem}
.intro{margin:.4rem 0 0;max-width:48rem}
h2{font:700 1.1rem/1.3 var(--sans);margin:2.2rem 0 .7rem;padding-left:.6rem;border-left:4px solid var(--accent)}
section ul,section ol{padding-left:1.3rem}
section li{margin:.15rem 0}
table{border-collapse:collapse;font:.8rem/1.35 var(--sans);font-variant-numeric:tabular-nums}
th{text-align:left;vertical-align:bottom;border-bottom:2px solid var(--ink);padding:.3rem .5rem;white-space:nowrap}
td{padding:.25rem .5rem;border-bottom:1px solid #e6dfd0;white-space:nowrap}
th.r,td.r{text-align:right}
tbody tr:nth-child(even){background:#f4efe3}
.ranked tbody tr:first-child td{font-weight:700;background:#e3efe5}
.scroll{overflow-x:auto;-webkit-overflow-scrolling:touch;margin:.5rem 0 1rem;max-width:100%}
figure{margin:1rem 0 1.2rem}
figure svg{display:block;width:100%;height:auto;max-width:100%}
figcaption{font:.8rem/1.4 var(--sans);color:var(--soft);margin-top:.3rem}
.strategy-list{list-style:none;padding-left:0}
.strategy-list li{margin:.35rem 0;padding-left:2rem;text-indent:-2rem}
.swatch{display:inline-block;width:1.45em;height:1.45em;border-radius:50%;color:#fff;text-align:center;text-indent:0;
font:700 .72rem/1.45rem var(--sans);margin-right:.55em;vertical-align:.05em}
.swatch.small{width:1.25rem;height:1.25rem;font-size:.62rem;line-height:1.25rem;margin-right:.4em}
.note{font-size:.85rem;color:var(--soft)}
.verdicts{list-style:none;padding-left:0}
.verdicts li{margin:.45rem 0}
.verdict{font:700 .68rem/1 var(--sans);letter-spacing:.06em;text-transform:uppercase;padding:.2rem .45rem;border-radius:3px;
background:#e3e6ee;color:#394766}
.verdict.complies{background:#d9eedf;color:#1f5f3a}
.verdict.not-allowed,.verdict.set-wrong{background:#f6ddd2;color:#8a2f14}
.ranked th{white-space:normal;min-width:4.5em}
p.more{font:.8rem var(--sans);color:var(--soft);margin:1rem 0 .2rem}
section.cautions{border:1.5px solid var(--ink);padding:.2rem 1.2rem .6rem;background:#fffdf8;margin-top:2.2rem}
section.cautions h2{border-left:0;padding-left:0}
footer{margin-top:2rem;font:.75rem var(--sans);color:var(--soft);border-top:1px solid var(--rule);padding-top:.5rem}
@media (max-width:40rem){main{margin:0;padding:1rem .9rem 1.5rem;box-shadow:none}body{font-size:14px}h1{font-size:1.3rem}
table{font-size:.75rem}figure{overflow-x:auto;-webkit-overflow-scrolling:touch}figure svg{min-width:36rem}}
@page{margin:14mm 12mm 16mm}
@media print{html{background:none}body{font-size:10pt}
main{max-width:none;margin:0;padding:0;box-shadow:none;background:none}
.scroll{overflow:visible}table{font-size:7pt}th{white-space:normal}th,td{padding:1pt 3pt}
figure,tr,li,.cautions{break-inside:avoid}h2{break-after:avoid}section.chart-section{break-before:page}
tbody tr:nth-child(even){background:none}})";

// Table cells holding just a strategy's name get its chart number and colour, so the tables
// read against the pictures.
std::string with_swatches(std::string html, const ReportDocument& doc) {
  for (std::size_t i = 0; i < doc.strategy_order.size(); ++i) {
    const std::string cell = "<td>" + html_escape(doc.strategy_order[i]) + "</td>";
    const std::string marked =
        fmt::format("<td><span class=\"swatch small\" style=\"background:{}\">{}</span>{}</td>",
                    strategy_colour(i), i + 1, html_escape(doc.strategy_order[i]));
    for (std::size_t at = html.find(cell); at != std::string::npos;
         at = html.find(cell, at + marked.size()))
      html.replace(at, cell.size(), marked);
  }
  return html;
}

std::string figure_html(Figure f, const ReportDocument& doc) {
  // Inline SVG takes its namespace from the HTML parser; dropping the attribute keeps the
  // page free of any URL.
  auto inline_svg = [](std::string svg) {
    const std::string ns = " xmlns=\"http://www.w3.org/2000/svg\"";
    if (const auto at = svg.find(ns); at != std::string::npos) svg.erase(at, ns.size());
    return svg;
  };
  if (f == Figure::monthly)
    return "<figure class=\"monthly\">\n" + inline_svg(doc.monthly_svg) +
           "<figcaption>Each strategy month by month on one scale: the hours it economizes "
           "inside the outline of the perfect changeover's, and under the baseline the hours it "
           "decides wrongly.</figcaption>\n</figure>\n";
  if (f == Figure::chart)
    return "<figure class=\"psychrometric\">\n" + inline_svg(doc.chart_svg) +
           "<figcaption>Psychrometric chart at the site pressure with each strategy's high-limit "
           "line and the "
           "occupied hours of the weather year.</figcaption>\n</figure>\n";
  return {};
}

}  // namespace

std::string html_escape(std::string_view s) {
  std::string out;
  out.reserve(s.size());
  for (char c : s) {
    switch (c) {
      case '&': out += "&amp;"; break;
      case '<': out += "&lt;"; break;
      case '>': out += "&gt;"; break;
      case '"': out += "&quot;"; break;
      case '\'': out += "&#39;"; break;
      default: out += c;
    }
  }
  return out;
}

std::string markdown_to_html(std::string_view md) {
  std::vector<std::string_view> lines;
  for (std::size_t pos = 0; pos < md.size();) {
    std::size_t end = md.find('\n', pos);
    if (end == std::string_view::npos) end = md.size();
    lines.push_back(md.substr(pos, end - pos));
    pos = end + 1;
  }
  std::string out, para;
  std::string list;  // "ul", "ol" or empty: the open list
  bool nested = false, item_open = false;
  auto close_para = [&] {
    if (!para.empty()) out += "<p>" + inline_html(para) + "</p>\n";
    para.clear();
  };
  auto close_list = [&] {
    if (nested) out += "</ul>\n";
    nested = false;
    if (item_open) out += "</li>\n";
    item_open = false;
    if (!list.empty()) out += "</" + list + ">\n";
    list.clear();
  };
  for (std::size_t i = 0; i < lines.size(); ++i) {
    const std::string_view l = lines[i];
    std::size_t at = 0;
    if (l.find_first_not_of(' ') == std::string_view::npos) {
      close_para();
      close_list();
    } else if (l.starts_with("#")) {
      close_para();
      close_list();
      std::size_t level = l.find_first_not_of('#');
      if (level != std::string_view::npos && level <= 4 && l[level] == ' ')
        out += fmt::format("<h{0}>{1}</h{0}>\n", level, inline_html(l.substr(level + 1)));
      else
        para += std::string(l);
    } else if (l.starts_with("|")) {
      close_para();
      close_list();
      std::vector<std::string_view> rows;
      while (i < lines.size() && lines[i].starts_with("|")) rows.push_back(lines[i++]);
      --i;
      out += table_html(rows);
    } else if (l.starts_with("  - ") && !list.empty()) {
      if (!nested) out += "\n<ul>\n";
      nested = true;
      out += "<li>" + inline_html(l.substr(4)) + "</li>\n";
    } else if (l.starts_with("- ") || ordered_item(l, at)) {
      close_para();
      const std::string kind = l.starts_with("- ") ? "ul" : "ol";
      if (list != kind) close_list();
      if (list.empty()) out += "<" + kind + ">\n";
      list = kind;
      if (nested) out += "</ul>\n";
      nested = false;
      if (item_open) out += "</li>\n";
      out += "<li>" + inline_html(l.substr(kind == "ul" ? 2 : at));
      item_open = true;
    } else {
      close_list();
      para += (para.empty() ? "" : " ") + std::string(l);
    }
  }
  close_para();
  close_list();
  return out;
}

std::string html_page(const PageHead& head, const std::vector<PageSection>& sections) {
  std::string out =
      "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\"/>\n"
      "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\"/>\n";
  out += fmt::format("<title>{} — {}</title>\n", html_escape(head.kicker), html_escape(head.title));
  out += "<style>\n" + std::string(kCss) + "\n" + head.extra_css +
         "\n</style>\n</head>\n<body>\n<main>\n";
  out += fmt::format(
      "<header class=\"title\">\n<p class=\"kicker\">{}</p>\n<h1>{}</h1>\n<p "
      "class=\"intro\">{}</p>\n</header>\n",
      html_escape(head.kicker), html_escape(head.title), html_escape(head.intro));
  for (const auto& sec : sections) {
    out += fmt::format("<section id=\"{}\"{}>\n<h2>{}</h2>\n", sec.id,
                       sec.css_class.empty() ? "" : " class=\"" + sec.css_class + "\"",
                       html_escape(sec.heading));
    out += sec.html + "</section>\n";
  }
  if (!head.footer.empty()) out += fmt::format("<footer>{}</footer>\n", html_escape(head.footer));
  out += "</main>\n</body>\n</html>\n";
  return out;
}

std::string report_html(const annual::YearResult& year, const ReportDocument& doc) {
  PageHead head;
  head.kicker = "Economizer high-limit study";
  head.title = doc.context.title;
  const auto bs = blocks(year, doc, head.intro);
  if (!doc.generator.empty())
    head.footer = fmt::format("Written by {} from the inputs listed above.", doc.generator);
  std::vector<PageSection> sections;
  for (const auto& b : bs)
    sections.push_back({b.id, b.heading,
                        figure_html(b.figure, doc) +
                            (b.html.empty() ? with_swatches(markdown_to_html(b.md), doc) : b.html),
                        b.css});
  return html_page(head, sections);
}

std::string report_markdown(const annual::YearResult& year, const ReportDocument& doc,
                            std::string_view chart_file, std::string_view monthly_file) {
  std::string intro;
  const auto bs = blocks(year, doc, intro);
  std::string out = fmt::format("# Economizer high-limit study — {}\n\n{}\n",
                                markdown_escape(doc.context.title), markdown_escape(intro));
  for (const auto& b : bs) {
    out += fmt::format("\n## {}\n\n", b.heading);
    if (b.figure == Figure::monthly)
      out += fmt::format("![Economizing hours by month]({})\n\n", monthly_file);
    if (b.figure == Figure::chart)
      out += fmt::format("![Psychrometric chart with high-limit lines]({})\n\n", chart_file);
    std::string body = b.md;
    while (!body.empty() && body.back() == '\n') body.pop_back();
    out += body + "\n";
  }
  if (!doc.generator.empty())
    out += fmt::format("\n---\n\nWritten by {} from the inputs listed above.\n", doc.generator);
  return out;
}

}  // namespace limitline::report
