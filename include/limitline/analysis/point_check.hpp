#pragma once
// One operating point weighed for every strategy: at these outdoor and return conditions,
// which high-limits let the unit economize, and what each decision costs against the perfect
// changeover (docs/model.md §Reference operations).
#include <limitline/model/airside.hpp>
#include <limitline/model/highlimit.hpp>
#include <limitline/model/psychro.hpp>

#include <cstdint>
#include <span>
#include <string_view>
#include <vector>

namespace limitline {

// An enable counts as harmful, and a disable as missed economizing, only when the weighted
// energy of the two choices differs by more than this, per kg of dry air. 0.01 kJ/kg
// (0.0043 Btu/lb, about 0.01 K of sensible cooling) is far below what any sensor resolves and
// well above rounding, so ties in the model never count as wrong decisions.
inline constexpr double kVerdictToleranceKjPerKg = 0.01;

enum class Verdict : std::uint8_t {
  right_decision,      // the strategy chose what the perfect changeover chooses (or a tie)
  harmful_enable,      // enabled while enabling costs more than disabling
  missed_economizing,  // disabled while enabling would cost less
  no_cooling_needed,   // mixed air at the minimum is at or below target: the choice is moot
};
[[nodiscard]] std::string_view verdict_name(Verdict v);  // "right decision", "harmful enable", ...
[[nodiscard]] std::string_view verdict_key(Verdict v);   // "right_decision", "harmful_enable", ...

// The verdict on one decision given the hour's two possible operations.
[[nodiscard]] Verdict judge(const airside::HourChoice& choice, bool economizer_enabled,
                            double tolerance_kj_per_kg = kVerdictToleranceKjPerKg);

// Whether mixing outdoor and return air can reach the mixed-air target at all: the fraction
// it needs must lie within 0–100 %. Beyond 100 % the target lies past the outdoor air;
// below 0 % past the return air, on the side away from the outdoor air.
enum class TargetReach : std::uint8_t {
  reachable,
  same_dry_bulb,       // outdoor and return air at one dry-bulb: no fraction changes it
  beyond_outdoor_air,  // would need more than 100 % outdoor air
  beyond_return_air,   // would need less than 0 %: outdoor air moves the mix away
};
[[nodiscard]] std::string_view target_reach_key(
    TargetReach r);  // "reachable", "same_dry_bulb", ...
[[nodiscard]] TargetReach target_reach(const airside::MixedAirEstimate& estimate);

struct StrategyOutcome {
  highlimit::Strategy strategy;
  highlimit::Decision decision;  // each condition's value, limit, excess and status
  airside::Operation operation;  // what the unit does under that decision
  Verdict verdict;
  double excess_kj_per_kg;  // weighted energy above the perfect changeover's, ≥ 0
};

struct PointCheck {
  double pressure_kpa;
  psychro::Properties outdoor;  // the true states the decisions and the energy use
  psychro::Properties ret;
  highlimit::AirValues outdoor_values, return_values;
  double mixed_air_target_c;
  double dry_air_kg_per_s;  // at the supply airflow, standard air

  // The practitioner's first calculation: outdoor air needed for the mixed-air target.
  airside::MixedAirEstimate estimate;
  TargetReach reach;                  // whether any damper position reaches the target
  airside::CoilLoads estimate_loads;  // the make-up heating or cooling at that mixed air

  airside::HourChoice choice;             // the operation disabled and enabled
  bool changeover_enables;                // the perfect changeover's choice
  double changeover_kj_per_kg;            // its weighted energy: min(disabled, enabled)
  airside::Operation optimal;             // best damper position in [x_min, x_max]
  std::vector<StrategyOutcome> outcomes;  // one per strategy, in the order given

  // A per-kg rate at the supply airflow, kW (kJ/kg × kg/s); per hour it is kWh.
  [[nodiscard]] double kw(double kj_per_kg) const { return kj_per_kg * dry_air_kg_per_s; }
};

// Evaluates every strategy at one point, each from a fresh (untripped) deadband state.
// Outdoor and return air must be at the same pressure (std::invalid_argument otherwise).
[[nodiscard]] PointCheck check_point(const airside::AirHandler& unit,
                                     const airside::EnergyWeights& weights,
                                     std::span<const highlimit::Strategy> strategies,
                                     const psychro::MoistAir& outdoor,
                                     const psychro::MoistAir& ret);

}  // namespace limitline
