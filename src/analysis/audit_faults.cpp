#include <limitline/analysis/audit_faults.hpp>

#include <algorithm>
#include <array>
#include <stdexcept>

namespace limitline::audit {
namespace {

using trend::Channel;
using Need = std::vector<std::vector<Channel>>;

// What each finding reads (see the rules in analysis/audit.hpp): whether the damper is open
// comes from its signal or from the fraction measured with outdoor, return and mixed air.
struct KindNeeds {
  FindingKind kind;
  Need needs;
};
const std::array<KindNeeds, kFindingKindCount>& kind_needs() {
  static const std::array<KindNeeds, kFindingKindCount> table = {{
      {FindingKind::economizing_when_disabled,
       {{Channel::outdoor_dry_bulb, Channel::damper},
        {Channel::outdoor_dry_bulb, Channel::return_dry_bulb, Channel::mixed_air}}},
      {FindingKind::not_economizing_when_enabled,
       {{Channel::outdoor_dry_bulb, Channel::damper},
        {Channel::outdoor_dry_bulb, Channel::return_dry_bulb, Channel::mixed_air}}},
      {FindingKind::damper_not_following,
       {{Channel::outdoor_dry_bulb, Channel::return_dry_bulb, Channel::mixed_air,
         Channel::damper}}},
      {FindingKind::excess_outdoor_air,
       {{Channel::outdoor_dry_bulb, Channel::return_dry_bulb, Channel::mixed_air}}},
      {FindingKind::below_minimum,
       {{Channel::outdoor_dry_bulb, Channel::return_dry_bulb, Channel::mixed_air}}},
      {FindingKind::mixed_air_out_of_range,
       {{Channel::outdoor_dry_bulb, Channel::return_dry_bulb, Channel::mixed_air}}},
      {FindingKind::high_limit_elsewhere,
       {{Channel::outdoor_dry_bulb, Channel::damper},
        {Channel::outdoor_dry_bulb, Channel::return_dry_bulb, Channel::mixed_air}}},
      {FindingKind::cooling_with_free_air, {{Channel::outdoor_dry_bulb, Channel::cooling}}},
      {FindingKind::minimum_while_cooling,
       {{Channel::outdoor_dry_bulb, Channel::cooling, Channel::damper},
        {Channel::outdoor_dry_bulb, Channel::cooling, Channel::return_dry_bulb,
         Channel::mixed_air}}},
      {FindingKind::supply_off_setpoint, {{Channel::supply_air, Channel::cooling}}},
      {FindingKind::fan_heat_mismatch,
       {{Channel::supply_air, Channel::mixed_air, Channel::cooling}}},
  }};
  // Every kind has its row, in FindingKind order (checked once, when first used).
  static const bool complete = [] {
    for (std::size_t k = 0; k < kFindingKindCount; ++k)
      if (table[k].kind != static_cast<FindingKind>(k))
        throw std::logic_error("audit_faults: the needs table is out of FindingKind order");
    return true;
  }();
  (void)complete;
  return table;
}

// Which findings reveal each fault a code lists.
struct FaultShownBy {
  codes::Fault fault;
  std::vector<FindingKind> kinds;
};
const std::vector<FaultShownBy>& shown_by() {
  static const std::vector<FaultShownBy> table = {
      {codes::Fault::sensor_fault,
       {FindingKind::mixed_air_out_of_range, FindingKind::fan_heat_mismatch}},
      {codes::Fault::not_economizing_when_allowed,
       {FindingKind::not_economizing_when_enabled, FindingKind::minimum_while_cooling,
        FindingKind::cooling_with_free_air, FindingKind::high_limit_elsewhere}},
      {codes::Fault::economizing_when_locked_out,
       {FindingKind::economizing_when_disabled, FindingKind::high_limit_elsewhere}},
      {codes::Fault::damper_not_modulating, {FindingKind::damper_not_following}},
      {codes::Fault::outdoor_air_above_minimum, {FindingKind::excess_outdoor_air}},
  };
  return table;
}

}  // namespace

std::vector<std::vector<Channel>> finding_needs(FindingKind k) {
  for (const auto& n : kind_needs())
    if (n.kind == k) return n.needs;
  return {};
}

bool can_judge(FindingKind k, const trend::TrendLog& log) {
  const auto needs = finding_needs(k);
  return std::any_of(needs.begin(), needs.end(), [&](const std::vector<Channel>& all) {
    return std::all_of(all.begin(), all.end(), [&](Channel c) { return log.has(c); });
  });
}

std::vector<FindingKind> findings_showing(codes::Fault f) {
  for (const auto& s : shown_by())
    if (s.fault == f) return s.kinds;
  return {};
}

std::vector<FaultEvidence> fault_evidence(const codes::FaultDetection& required,
                                          const trend::TrendLog& log, const Result& result) {
  std::vector<FaultEvidence> out;
  for (const auto& r : required.faults) {
    FaultEvidence e{r.fault, r.code_term, {}, {}, {}};
    for (FindingKind k : findings_showing(r.fault)) {
      const bool judged = can_judge(k, log);
      (judged ? e.judged : e.not_judged).push_back(k);
      if (judged && result.find(k)) e.found.push_back(k);
    }
    out.push_back(std::move(e));
  }
  return out;
}

std::string needs_text(FindingKind k) {
  std::string out;
  const auto needs = finding_needs(k);
  for (std::size_t i = 0; i < needs.size(); ++i) {
    if (i) out += ", or ";
    for (std::size_t j = 0; j < needs[i].size(); ++j) {
      if (j) out += j + 1 == needs[i].size() ? " and " : ", ";
      out += trend::channel_name(needs[i][j]);
    }
  }
  return out;
}

}  // namespace limitline::audit
