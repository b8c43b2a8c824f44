#pragma once
// The report of `limitline tune`: per strategy the best setpoint, the settings within 1 % and
// 5 % of its savings, what the code's, the common-practice and the unit file's settings cost
// against it, and what the code says; then the recommendation among compliant settings and
// the cautions. Text, Markdown, CSV (every grid point), JSON, and one SVG plot per strategy
// of the loss against the setpoint.
#include <limitline/analysis/tuning.hpp>
#include <limitline/report/year.hpp>

#include <string>
#include <vector>

namespace limitline::report {

struct TuneReport {
  const tuning::TuneResult* tune = nullptr;
  const YearContext* context = nullptr;  // header lines, units, measure
  double operating_hours = 0;
  double perfect_savings = 0;  // the perfect changeover's savings (tie tolerance)
};

std::string tune_text(const TuneReport& r);
std::string tune_markdown(const TuneReport& r);
std::string tune_csv(const TuneReport& r);
std::string tune_json(const TuneReport& r);

// The recommendation among the tuned settings: the best setting the code allows (each allowed
// strategy at its best compliant setting: the code's own when the code fixes it) and the best
// overall, with ties, in sentences.
std::vector<std::string> tune_recommendation(const TuneReport& r);

// The per-strategy summary as Markdown list items (the report's tuning section), then the
// recommendation.
std::string tune_summary_markdown(const TuneReport& r);

// Loss against the best setting, along the primary swept setting (with a second setting held
// at its best), the 1 % band shaded and the named settings marked. Standalone SVG.
std::string tune_plot_svg(const tuning::StrategyTuning& t, const YearContext& c);

// A file name for a strategy's plot: its name in lower case, letters, digits and '-' only.
std::string plot_file_name(std::string_view strategy, std::size_t index);

}  // namespace limitline::report
