#pragma once
// The audit findings report: coverage, the column mapping used, the rules, the findings with
// their hours, share of operating time, first and worst stamps and energy, the switching
// points seen, and the cautions. Text, Markdown and JSON.
#include <limitline/analysis/audit.hpp>
#include <limitline/io/trend.hpp>
#include <limitline/model/units.hpp>

#include <string>

namespace limitline::report {

struct AuditContext {
  std::string unit_path;
  std::string strategy_text;    // "off when outdoor dry-bulb above 70 °F ..."
  std::string strategy_source;  // "first strategy of the unit file", "--strategy", "code ..."
  audit::Accuracy accuracy;
  units::System units = units::System::ip;
  audit::Significance significance;
  double supply_tolerance_k = audit::kSupplyToleranceK;
  // The log's clock as the user stated it ("UTC−05:00"); empty when not stated.
  std::string log_clock;
};

std::string audit_text(const audit::Result& r, const trend::TrendLog& log, const AuditContext& c);
std::string audit_markdown(const audit::Result& r, const trend::TrendLog& log,
                           const AuditContext& c);
std::string audit_json(const audit::Result& r, const trend::TrendLog& log, const AuditContext& c);

}  // namespace limitline::report
