#pragma once
// The audit findings report: coverage, the column mapping used, the rules, the findings with
// their hours, share of operating time, first and worst stamps and energy, the switching
// points seen, and the cautions. Text, Markdown and JSON.
#include <limitline/analysis/audit.hpp>
#include <limitline/analysis/audit_faults.hpp>
#include <limitline/io/trend.hpp>
#include <limitline/model/units.hpp>
#include <limitline/report/table.hpp>

#include <string>
#include <vector>

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
  std::size_t text_width = kTextWidth;  // the width the text's tables fit (report/table.hpp)
  // The energy code's economizer fault-detection clause and what this log can show of it:
  // `fault_code` is "ANSI/ASHRAE/IES Standard 90.1-2019, 6.4.3.12" (empty: none to compare
  // with, `fault_code_note` says why); one entry per required fault.
  std::string fault_code;
  std::string fault_code_note;
  std::vector<audit::FaultEvidence> fault_evidence;
};

std::string audit_text(const audit::Result& r, const trend::TrendLog& log, const AuditContext& c);
std::string audit_markdown(const audit::Result& r, const trend::TrendLog& log,
                           const AuditContext& c);
std::string audit_json(const audit::Result& r, const trend::TrendLog& log, const AuditContext& c);

}  // namespace limitline::report
