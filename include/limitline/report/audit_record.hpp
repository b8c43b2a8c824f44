#pragma once
// The audit as a record to sign: one self-contained HTML page in the study report's style with
// the findings, a picture of the log (outdoor dry-bulb and damper position over time, the
// samples of each finding marked on their own lane), coverage, the columns used, the rules,
// the cautions and a block for the reviewer's name, organisation, date and signature.
#include <limitline/analysis/audit.hpp>
#include <limitline/analysis/audit_timeline.hpp>
#include <limitline/io/trend.hpp>
#include <limitline/report/audit.hpp>

#include <string>
#include <string_view>

namespace limitline::report {

// The log over time as a standalone SVG: outdoor dry-bulb above, the damper's outdoor-air
// fraction below (with the ventilation minimum dashed), then one lane per finding kind that
// occurs, marking its samples. Long logs are drawn as per-pixel envelopes; gaps in the log
// break the lines. Elements carry data-kind, data-from and data-to (epoch seconds) for tests.
std::string audit_log_svg(const audit::Timeline& t, const trend::TrendLog& log,
                          const AuditContext& c);

// The whole record. `generator` is "limitline 0.x.y".
std::string audit_record_html(const audit::Result& r, const trend::TrendLog& log,
                              const AuditContext& c, const audit::Timeline& t,
                              std::string_view generator);

}  // namespace limitline::report
