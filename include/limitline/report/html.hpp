#pragma once
// The study report a design engineer sends to a client or an inspector: one self-contained
// HTML page (inline CSS and SVG, nothing fetched), or Markdown with the pictures as files
// beside it. It gathers the annual report of `year` (inputs, ranked strategies, findings,
// monthly tables, cautions), the two pictures of report/chart.hpp and, when the site names an
// energy code, the compliance of each strategy. Formatting only: every number comes from the
// results passed in.
#include <limitline/analysis/annual.hpp>
#include <limitline/report/year.hpp>

#include <optional>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace limitline::report {

// One strategy's energy-code verdict.
struct ComplianceLine {
  std::string strategy;
  std::string verdict;      // one word: "complies", "not-allowed", "set-wrong", "not-evaluable"
  std::string explanation;  // one sentence: what the verdict is and why
};

struct ComplianceSection {
  std::string label;               // "ashrae-90.1-2019, climate zone 3A"
  std::vector<std::string> notes;  // economizer integration, provenance of the tables
  std::vector<ComplianceLine> lines;
};

// The setpoint tuning of each strategy (limitline tune), in short, with its plots.
struct TuningSection {
  std::string markdown;  // the summary: one item per strategy, then the recommendation
  std::vector<std::pair<std::string, std::string>> plots;  // (strategy, standalone SVG)
};

struct ReportDocument {
  YearContext context;  // the annual report's context (its compliance column filled when known)
  // Facts of the air handler, in order: ("Supply air", "8000 cfm at 55.0 °F"), ...
  std::vector<std::pair<std::string, std::string>> unit_facts;
  // Strategy names in the unit file's order: the numbers and colours of the pictures.
  std::vector<std::string> strategy_order;
  std::string chart_svg;    // psychrometric_chart_svg()
  std::string monthly_svg;  // monthly_hours_svg()
  std::optional<ComplianceSection> compliance;
  std::optional<TuningSection> tuning;
  std::string generator;  // "limitline 0.1.0"
};

// A page in the report's style (its CSS, title block and footer) around sections of HTML:
// what the study report and the audit record share. `extra_css` is added after the house CSS.
struct PageHead {
  std::string kicker;  // the small line above the title: "Economizer high-limit study"
  std::string title;
  std::string intro;   // one paragraph of text (escaped here)
  std::string footer;  // text (escaped here); empty: none
  std::string extra_css;
};
struct PageSection {
  std::string id;
  std::string heading;  // text (escaped here)
  std::string html;     // the section's body, already HTML
  std::string css_class;
};
std::string html_page(const PageHead& head, const std::vector<PageSection>& sections);

// The whole page: HTML5 that is also well-formed XML (void elements closed, no named entities
// beyond the five of XML), with print rules for A4 and Letter and a layout for phones.
std::string report_html(const annual::YearResult& year, const ReportDocument& doc);

// The same content as Markdown; the pictures are linked as `chart_file` and `monthly_file`
// (paths relative to the Markdown file), which the caller writes beside it.
std::string report_markdown(const annual::YearResult& year, const ReportDocument& doc,
                            std::string_view chart_file, std::string_view monthly_file);

// The Markdown the report formatters write (headings, "- " lists with one level of nesting,
// "1. " lists, pipe tables with alignment rows, paragraphs, **bold**, backslash escapes) as an
// HTML fragment with every character of text escaped.
std::string markdown_to_html(std::string_view markdown);

// Text escaped for HTML and XML (& < > " ').
std::string html_escape(std::string_view text);

}  // namespace limitline::report
