#include <limitline/analysis/point_check.hpp>

#include <limitline/model/air_point.hpp>

#include <algorithm>
#include <stdexcept>

namespace limitline {
namespace {

struct VerdictText {
  Verdict verdict;
  std::string_view name, key;
};
constexpr VerdictText kVerdicts[] = {
    {Verdict::right_decision, "right decision", "right_decision"},
    {Verdict::harmful_enable, "harmful enable", "harmful_enable"},
    {Verdict::missed_economizing, "missed economizing", "missed_economizing"},
    {Verdict::no_cooling_needed, "no cooling needed", "no_cooling_needed"},
};

const VerdictText& text(Verdict v) {
  for (const auto& t : kVerdicts)
    if (t.verdict == v) return t;
  return kVerdicts[0];
}

constexpr std::pair<TargetReach, std::string_view> kReachKeys[] = {
    {TargetReach::reachable, "reachable"},
    {TargetReach::same_dry_bulb, "same_dry_bulb"},
    {TargetReach::beyond_outdoor_air, "beyond_outdoor_air"},
    {TargetReach::beyond_return_air, "beyond_return_air"},
};

// A fraction this close to 0 or 1 is the end itself (rounding of the mixing line).
constexpr double kReachTolerance = 1e-9;

}  // namespace

std::string_view target_reach_key(TargetReach r) {
  for (const auto& [reach, key] : kReachKeys)
    if (reach == r) return key;
  return "reachable";
}

TargetReach target_reach(const airside::MixedAirEstimate& e) {
  if (!e.target_reachable) return TargetReach::same_dry_bulb;
  if (e.fraction_needed > 1.0 + kReachTolerance) return TargetReach::beyond_outdoor_air;
  if (e.fraction_needed < -kReachTolerance) return TargetReach::beyond_return_air;
  return TargetReach::reachable;
}

std::string_view verdict_name(Verdict v) { return text(v).name; }
std::string_view verdict_key(Verdict v) { return text(v).key; }

Verdict judge(const airside::HourChoice& choice, bool enabled, double tolerance) {
  if (!choice.cooling_needed) return Verdict::no_cooling_needed;
  if (enabled && choice.enabling_hurts(tolerance)) return Verdict::harmful_enable;
  if (!enabled && choice.enabling_pays(tolerance)) return Verdict::missed_economizing;
  return Verdict::right_decision;
}

PointCheck check_point(const airside::AirHandler& unit, const airside::EnergyWeights& weights,
                       std::span<const highlimit::Strategy> strategies,
                       const psychro::MoistAir& outdoor, const psychro::MoistAir& ret) {
  if (outdoor.pressure_kpa != ret.pressure_kpa)
    throw std::invalid_argument("check_point: outdoor and return air at different pressures");
  PointCheck pc{};
  pc.pressure_kpa = outdoor.pressure_kpa;
  pc.outdoor = psychro::properties(outdoor);
  pc.ret = psychro::properties(ret);
  pc.outdoor_values = air_values(pc.outdoor);
  pc.return_values = air_values(pc.ret);
  pc.mixed_air_target_c = unit.mixed_air_target_c();
  pc.dry_air_kg_per_s = unit.dry_air_mass_flow_kg_per_s();

  const airside::HourAir air{airside::air_state(outdoor.dry_bulb_c, outdoor.humidity_ratio),
                             airside::air_state(ret.dry_bulb_c, ret.humidity_ratio),
                             airside::coil_limits(unit, pc.pressure_kpa), std::nullopt,
                             std::nullopt};
  pc.estimate = airside::estimate_mixed_air(air.outdoor, air.ret, pc.mixed_air_target_c,
                                            unit.min_oa_fraction, unit.max_oa_fraction);
  pc.reach = target_reach(pc.estimate);
  pc.estimate_loads = airside::coil_loads(unit, air.coil, pc.estimate.mixed);

  pc.choice = airside::choose(unit, air, weights);
  pc.changeover_enables = pc.choice.cooling_needed && pc.choice.enabled.weighted_kj_per_kg <
                                                          pc.choice.disabled.weighted_kj_per_kg;
  pc.changeover_kj_per_kg =
      std::min(pc.choice.enabled.weighted_kj_per_kg, pc.choice.disabled.weighted_kj_per_kg);
  pc.optimal = airside::optimal_damper(unit, air, weights);

  pc.outcomes.reserve(strategies.size());
  for (const highlimit::Strategy& s : strategies) {
    highlimit::StrategyState state(s);
    StrategyOutcome o{s,
                      highlimit::decide(s, pc.outdoor_values, pc.return_values, state),
                      {},
                      Verdict::right_decision,
                      0.0};
    o.operation = o.decision.enabled ? pc.choice.enabled : pc.choice.disabled;
    o.verdict = judge(pc.choice, o.decision.enabled);
    o.excess_kj_per_kg = std::max(0.0, o.operation.weighted_kj_per_kg - pc.changeover_kj_per_kg);
    pc.outcomes.push_back(std::move(o));
  }
  return pc;
}

}  // namespace limitline
