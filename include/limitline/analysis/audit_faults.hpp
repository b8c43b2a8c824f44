#pragma once
// Which of an energy code's required economizer faults (io/codes FaultDetection) a trend log
// can show: each required fault is matched to the audit findings that reveal it, and each
// finding needs certain columns in the log. An inspector learns what this log proves and what
// must be checked another way (a functional test, the controller's own fault list).
#include <limitline/analysis/audit.hpp>
#include <limitline/io/codes.hpp>
#include <limitline/io/trend.hpp>

#include <string>
#include <vector>

namespace limitline::audit {

// The columns a finding needs, as alternatives: it can be judged when the log has every
// channel of at least one of them (e.g. a damper signal, or mixed and return air to measure
// the fraction).
[[nodiscard]] std::vector<std::vector<trend::Channel>> finding_needs(FindingKind k);
[[nodiscard]] bool can_judge(FindingKind k, const trend::TrendLog& log);

// The findings that reveal a fault (limitline's judgement, not the code's words).
[[nodiscard]] std::vector<FindingKind> findings_showing(codes::Fault f);

struct FaultEvidence {
  codes::Fault fault;
  std::string code_term;                // the code's words for it
  std::vector<FindingKind> judged;      // findings that reveal it and that this log can judge
  std::vector<FindingKind> not_judged;  // findings that reveal it but lack their columns
  std::vector<FindingKind> found;       // among `judged`, those the audit found
  [[nodiscard]] bool can_show() const { return !judged.empty(); }
};

// One entry per fault the clause requires, in its order.
[[nodiscard]] std::vector<FaultEvidence> fault_evidence(const codes::FaultDetection& required,
                                                        const trend::TrendLog& log,
                                                        const Result& result);

// "outdoor-dry-bulb and damper, or outdoor-dry-bulb, mixed-air and return-dry-bulb".
[[nodiscard]] std::string needs_text(FindingKind k);

}  // namespace limitline::audit
