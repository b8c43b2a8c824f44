#pragma once
// The report of `limitline check`: the unit and site, the air the decisions are made on, the
// practitioner's hand calculation, the operation disabled, enabled and at the optimal damper,
// every strategy's decision and verdict, and each condition; then the design cautions. Text,
// Markdown and JSON. Formatting only: every number comes from the PointCheck.
#include <limitline/analysis/point_check.hpp>
#include <limitline/io/unit_file.hpp>
#include <limitline/model/units.hpp>
#include <limitline/report/table.hpp>

#include <string>
#include <vector>

namespace limitline::report {

struct PointCheckContext {
  const UnitFile* unit = nullptr;     // the unit the point was checked for
  std::string outdoor_source;         // where each air state came from: "--outdoor",
  std::string return_source;          // "unit file", "--return"
  std::vector<std::string> warnings;  // the unit file's and the options'
  units::System units = units::System::ip;
  std::size_t text_width = kTextWidth;  // the width the text's tables fit (report/table.hpp)
};

std::string point_check_text(const PointCheck& pc, const PointCheckContext& c);
std::string point_check_markdown(const PointCheck& pc, const PointCheckContext& c);
std::string point_check_json(const PointCheck& pc, const PointCheckContext& c);

}  // namespace limitline::report
