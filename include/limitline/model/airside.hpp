#pragma once
// The air handler: mixing box, outdoor-air fraction, fan heat, cooling coil and heating
// (docs/model.md §Air handler). SI throughout; loads per kg of dry air unless named otherwise.
//
// The economizer only ever chooses between two operations in an hour: economizer disabled
// (damper at the ventilation minimum) or enabled (damper per the damper rule). Both are
// computed once per hour here, so every high-limit strategy of an annual run shares them.
#include <limitline/model/psychro.hpp>
#include <limitline/names.hpp>

#include <optional>
#include <span>
#include <string_view>

namespace limitline::airside {

enum class FanPosition { draw_through, blow_through };
// "draw-through", "blow-through": as unit files, reports and sequences spell them.
[[nodiscard]] std::span<const Named<FanPosition>> fan_position_names();
[[nodiscard]] std::string_view fan_position_name(FanPosition f);
[[nodiscard]] std::optional<FanPosition> fan_position_from_name(std::string_view name);

enum class EconomizerType { integrated, non_integrated };
// "integrated", "non-integrated".
[[nodiscard]] std::span<const Named<EconomizerType>> economizer_names();
[[nodiscard]] std::string_view economizer_name(EconomizerType e);
[[nodiscard]] std::optional<EconomizerType> economizer_from_name(std::string_view name);

// Mass flow of dry air from a volume flow at standard air (common practice: 1.204 kg/m³,
// 0.075 lb/ft³), the basis on which supply airflows are scheduled.
inline constexpr double kStandardAirDensityKgPerM3 = 1.204;

struct AirHandler {
  double supply_airflow_m3_per_s = 0.0;  // at standard air
  double supply_air_temp_c = 12.8;       // t_s, the supply (discharge) setpoint
  double fan_heat_k = 0.0;               // Δt_f, supply-fan temperature rise
  FanPosition fan_position = FanPosition::draw_through;
  double min_oa_fraction = 0.0;  // x_min, ventilation minimum (dry-air mass fraction)
  double max_oa_fraction = 1.0;  // x_max, damper limit
  EconomizerType economizer = EconomizerType::integrated;
  double coil_leaving_rh_max = 0.95;  // φ_max: cap on the coil-leaving relative humidity

  // Mixed-air temperature the economizer aims at: t_s − Δt_f for either fan position.
  [[nodiscard]] double mixed_air_target_c() const { return supply_air_temp_c - fan_heat_k; }
  // Coil-leaving dry-bulb: t_s − Δt_f draw-through, t_s blow-through.
  [[nodiscard]] double coil_leaving_temp_c() const {
    return fan_position == FanPosition::draw_through ? supply_air_temp_c - fan_heat_k
                                                     : supply_air_temp_c;
  }
  [[nodiscard]] double dry_air_mass_flow_kg_per_s() const {
    return supply_airflow_m3_per_s * kStandardAirDensityKgPerM3;
  }
};

// Throws InputError naming the field when the air handler is contradictory (x_min > x_max,
// fractions outside 0–100 %, φ_max outside (0, 1], non-positive airflow, negative fan heat).
void validate(const AirHandler& unit);

// A state at a known pressure, with the enthalpy that mixing conserves.
struct AirState {
  double dry_bulb_c;
  double humidity_ratio;
  double enthalpy_kj_per_kg;
};
[[nodiscard]] AirState air_state(double dry_bulb_c, double humidity_ratio);

// Adiabatic mixing on dry-air mass (ASHRAE Fundamentals ch. 1, eqs. 42–44): enthalpy and
// humidity ratio mix linearly in the outdoor dry-air fraction x; t follows from eq. 32.
[[nodiscard]] AirState mix(const AirState& outdoor, const AirState& ret, double oa_fraction);

// The fraction x* at which the mixed air is at `target_c`, in closed form (h_m and W_m are
// linear in x, so t_m(x) = target is linear in x once eq. 32 is rearranged). Returns false
// when no finite x exists (outdoor and return air give the same mixed temperature for all x).
[[nodiscard]] bool oa_fraction_for_mixed_temp(const AirState& outdoor, const AirState& ret,
                                              double target_c, double& oa_fraction);

// The mixing estimate practitioners make by hand: t_m ≈ x·t_o + (1 − x)·t_r.
[[nodiscard]] constexpr double mixed_temp_by_temperature_weighting(double t_outdoor_c,
                                                                   double t_return_c,
                                                                   double oa_fraction) {
  return oa_fraction * t_outdoor_c + (1.0 - oa_fraction) * t_return_c;
}

// What heating or cooling must make up after mixing.
enum class Makeup { none, heating, cooling };

// The hand calculation: outdoor-air fraction needed for a target mixed-air temperature,
// whether it falls within [x_min, x_max], and the mixed air that results once the fraction is
// held within them.
struct MixedAirEstimate {
  bool target_reachable;    // a finite fraction exists at all
  double fraction_needed;   // x* (meaningful when target_reachable)
  bool within_limits;       // x_min ≤ x* ≤ x_max
  double fraction_applied;  // x* clamped to [x_min, x_max] (x_min when unreachable)
  AirState mixed;           // at fraction_applied
  Makeup makeup;            // heating when the mixed air ends below target, cooling above
  double makeup_k;          // |t_m − target|
};
[[nodiscard]] MixedAirEstimate estimate_mixed_air(const AirState& outdoor, const AirState& ret,
                                                  double target_c, double min_fraction,
                                                  double max_fraction);

// Per-pressure coil boundary: leaving dry-bulb and the leaving humidity-ratio cap
// W(t_cl, φ_max) at that pressure.
struct CoilLimits {
  double leaving_temp_c;
  double leaving_humidity_ratio_cap;
};
[[nodiscard]] CoilLimits coil_limits(const AirHandler& unit, double pressure_kpa);

// Loads of one operation, per kg of dry air.
struct CoilLoads {
  AirState entering;  // coil entering (mixed air, plus fan heat when blow-through)
  AirState leaving;
  double cooling_kj_per_kg;   // total coil load q_c, condensate enthalpy removed
  double sensible_kj_per_kg;  // h(t_ce, W_ce) − h(t_cl, W_ce)
  double latent_kj_per_kg;    // q_c − sensible
  double heating_kj_per_kg;   // q_h = h(t_cl, W_ce) − h(t_ce, W_ce) when t_ce < t_cl
};

// Cooling coil with leaving dry-bulb t_cl and W_cl = min(W_ce, W_cap):
// q_c = h_ce − h_cl − (W_ce − W_cl)·4.186·t_cl when t_ce > t_cl; heating when t_ce < t_cl.
[[nodiscard]] CoilLoads coil_loads(const AirHandler& unit, const CoilLimits& limits,
                                   const AirState& mixed);

// A cooling capacity estimated from the airflow alone, kW: the dry-air mass flow of the supply
// airflow at standard air times the coil load (coil_loads) of the design return air cooled
// to the coil-leaving state. No outdoor design state is known, so the coil sees the return
// air (mixed air at x_min with outdoor air at the return state): the outdoor-air share of a
// true design load is left out, and the figure is an estimate, not a rating.
[[nodiscard]] double return_air_coil_load_kw(const AirHandler& unit, const AirState& ret,
                                             double pressure_kpa);

// How cooling and heating energy are weighed against each other when choosing (E = w_c·q_c +
// w_h·q_h): defaults count a kWh of either as equal.
struct EnergyWeights {
  double cooling = 1.0;
  double heating = 1.0;
};

// Energy differences smaller than this (weighted kJ per kg of dry air) between enabling and
// disabling are a tie: neither choice counts as wrong. About 0.004 Btu/lb, far below what any
// sensor could resolve.
inline constexpr double kDecisionToleranceKjPerKg = 0.01;

// One hour's operation of the air handler.
struct Operation {
  double oa_fraction;
  bool economizing;         // damper above the minimum
  bool mechanical_cooling;  // coil cooling load > 0
  bool coil_off = false;    // outdoor air alone carries a light load: supply floats above t_s
  AirState ret;             // the return air of this operation
  AirState mixed;
  CoilLoads loads;
  double weighted_kj_per_kg;  // E
};

// The space behind the return air, when the unit serves one (docs/model.md §Return air): the
// return dry-bulb is the space's plus its rise, and its humidity follows the operation.
struct SpaceReturn {
  double return_temp_c;
  double moisture;    // W_r − W_s the space adds, q_l/(ṁ·h_g)
  double fallback_w;  // humidity ratio used where the space has no steady one (x = 0, dry coil)
};

// What a non-integrated economizer needs to know to run on outdoor air alone at part load: the
// hour's space sensible load, the most dry air the fan can move and the space temperature.
struct LightLoad {
  double sensible_kw;
  double max_mass_flow_kg_per_s;
  double space_temp_c;
};

// The outdoor and return air of an hour, with the coil limits at that hour's pressure.
struct HourAir {
  AirState outdoor;
  AirState ret;  // the return air; with a space, the one at the ventilation minimum
  CoilLimits coil;
  std::optional<SpaceReturn> space;  // absent: `ret` whatever the damper does
  std::optional<LightLoad> light_load;
};

// The return air when the damper is at x: `air.ret`, or with a space the steady state of
// part_load::return_humidity_ratio, in the regime (coil cooling or not) that x gives.
[[nodiscard]] AirState return_air_at(const AirHandler& unit, const HourAir& air, double x);
// The same, computed even at the minimum: what fills `ret` of a part-load hour.
[[nodiscard]] AirState steady_return_air(const AirHandler& unit, const HourAir& air, double x);

// The operation the damper rule gives (docs/model.md §Damper rule, steps 1–2).
[[nodiscard]] Operation operate(const AirHandler& unit, const HourAir& air, bool economizer_enabled,
                                const EnergyWeights& weights);

// Everything a high-limit can cause in one hour: the operation with the economizer disabled,
// the one with it enabled, and whether cooling is needed at all.
struct HourChoice {
  bool cooling_needed;  // t_m(x_min) > target
  Operation disabled;
  Operation enabled;
  // Enabling saves energy beyond `tolerance`: the perfect changeover's decision.
  [[nodiscard]] bool enabling_pays(double tolerance_kj_per_kg) const {
    return enabled.weighted_kj_per_kg < disabled.weighted_kj_per_kg - tolerance_kj_per_kg;
  }
  [[nodiscard]] bool enabling_hurts(double tolerance_kj_per_kg) const {
    return enabled.weighted_kj_per_kg > disabled.weighted_kj_per_kg + tolerance_kj_per_kg;
  }
};
[[nodiscard]] HourChoice choose(const AirHandler& unit, const HourAir& air,
                                const EnergyWeights& weights);

// The damper position in [x_min, x_max] that minimises E. E is piecewise linear in x (coil
// entering enthalpy and humidity are linear in x; the breakpoints are x* and the fraction at
// which the entering humidity reaches the coil's leaving cap), so its minimum is at one of
// those points or an end.
[[nodiscard]] Operation optimal_damper(const AirHandler& unit, const HourAir& air,
                                       const EnergyWeights& weights);

}  // namespace limitline::airside
