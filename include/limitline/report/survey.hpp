#pragma once
// The survey's report: the summary by climate zone (how often each strategy is best, its
// median and worst shortfall, the median best setting when tuned), each site's answer, the
// sites that failed with their errors, and the cautions — as text, CSV, JSON and one
// self-contained HTML page with one picture per zone. Formatting only: every figure comes
// from the records and the summaries passed in (analysis/survey.hpp).
#include <limitline/analysis/survey.hpp>

#include <string>
#include <vector>

namespace limitline::report {

struct SurveyReport {
  survey::SurveyInfo info;
  std::vector<survey::SiteRecord> sites;  // manifest order
  std::vector<survey::ZoneSummary> zones;
  bool partial = false;  // interrupted: the sites before the first that did not run
};

std::string survey_text(const SurveyReport& r, std::size_t width);
// `sites`: one row per site and strategy; otherwise one row per zone and strategy.
std::string survey_csv(const SurveyReport& r, bool sites);
std::string survey_json(const SurveyReport& r);
std::string survey_html(const SurveyReport& r);

// One zone's picture: for each strategy a lane on one scale of shortfall as a share of each
// site's perfect-changeover savings, a dot per site, the median marked, and how often it is
// best. Standalone SVG.
std::string zone_picture_svg(const survey::ZoneSummary& zone);

}  // namespace limitline::report
