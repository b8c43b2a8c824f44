#include <limitline/model/airside.hpp>

#include <limitline/error.hpp>
#include <limitline/model/part_load.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <cmath>

namespace limitline::airside {
namespace {

constexpr Named<FanPosition> kFanPositionNames[] = {
    {"draw-through", FanPosition::draw_through},
    {"blow-through", FanPosition::blow_through},
};
constexpr Named<EconomizerType> kEconomizerNames[] = {
    {"integrated", EconomizerType::integrated},
    {"non-integrated", EconomizerType::non_integrated},
};

// Mixed-air temperatures this close to the target count as on target (rounding of x*).
constexpr double kTargetToleranceK = 1e-9;
constexpr double kFractionTolerance = 1e-12;

// The coil cools entering air that is above its leaving temperature (beyond rounding).
bool coil_cools(const AirHandler& unit, const CoilLimits& lim, const AirState& mixed) {
  const double t_ce =
      mixed.dry_bulb_c + (unit.fan_position == FanPosition::blow_through ? unit.fan_heat_k : 0.0);
  return t_ce > lim.leaving_temp_c + kTargetToleranceK;
}

Operation operation_at(const AirHandler& unit, const HourAir& air, double x,
                       const EnergyWeights& w) {
  Operation op;
  op.oa_fraction = x;
  op.economizing = x > unit.min_oa_fraction + kFractionTolerance;
  op.ret = return_air_at(unit, air, x);
  op.mixed = mix(air.outdoor, op.ret, x);
  op.loads = coil_loads(unit, air.coil, op.mixed);
  op.mechanical_cooling = op.loads.cooling_kj_per_kg > 0.0;
  op.weighted_kj_per_kg =
      w.cooling * op.loads.cooling_kj_per_kg + w.heating * op.loads.heating_kj_per_kg;
  return op;
}

// x* with the return air that x* itself makes. On the target the coil does nothing, so the
// return humidity is W_r = W_o + m/x (part_load::return_humidity_ratio without a coil) and the
// mixed air W_m = W_o + m/x − m. Putting both into t_m(x) = target (eq. 32 rearranged, as in
// oa_fraction_for_mixed_temp) and multiplying by x gives a quadratic A·x² + B·x + C = 0 with
// h_r0 = h(t_r, W_o), k = 2501 + 1.86·target:
//   A = h_o − h_r0,  B = h_r0 − m·b_r − (W_o − m)·k − 1.006·target,  C = m·(b_r − k),
// b_r = 2501 + 1.86·t_r. With m = 0 it is the linear case times x.
bool fraction_for_target(const AirHandler& /*unit*/, const HourAir& air, double target_c,
                         double& x) {
  double estimate = 0.0;  // with the return air at the minimum: close, and on the right side
  if (!oa_fraction_for_mixed_temp(air.outdoor, air.ret, target_c, estimate)) estimate = NAN;
  if (!air.space) {
    x = estimate;
    return std::isfinite(x);
  }
  const SpaceReturn& sp = *air.space;
  const double m = std::max(0.0, sp.moisture), w_o = air.outdoor.humidity_ratio;
  const double b_r = 2501.0 + 1.86 * sp.return_temp_c, k = 2501.0 + 1.86 * target_c;
  const double h_r0 = 1.006 * sp.return_temp_c + w_o * b_r;
  const double a = air.outdoor.enthalpy_kj_per_kg - h_r0;
  const double b = h_r0 - m * b_r - (w_o - m) * k - 1.006 * target_c;
  const double c = m * (b_r - k);
  double root = NAN;
  if (std::fabs(a) < 1e-12) {
    if (std::fabs(b) > 1e-15) root = -c / b;
  } else if (c == 0.0) {
    root = -b / a;  // no moisture: the linear case
  } else {
    const double disc = b * b - 4.0 * a * c;
    if (disc < 0.0) return false;
    // The stable pair of roots: q/a and c/q (never the difference of two near-equal numbers).
    const double q = -0.5 * (b + std::copysign(std::sqrt(disc), b));
    const double r1 = q / a, r2 = q != 0.0 ? c / q : NAN;
    // The positive root nearer the estimate (with A < 0, the usual case, only one is positive).
    const double near = std::isfinite(estimate) ? estimate : 0.5;
    auto distance = [&](double r) {
      return std::isfinite(r) && r > 0.0 ? std::fabs(r - near) : INFINITY;
    };
    root = distance(r1) <= distance(r2) ? r1 : r2;
  }
  if (!std::isfinite(root) || !(root > 0.0)) return false;
  x = root;
  return true;
}

// A non-integrated economizer whose outdoor air cannot reach the mixed-air target still
// carries a light load alone when the fan can move enough of the warmer supply air: the coil
// stays off and the supply floats (fan energy for the extra airflow is not counted).
std::optional<Operation> outdoor_air_alone(const AirHandler& unit, const HourAir& air,
                                           const AirState& at_max) {
  if (unit.economizer != EconomizerType::non_integrated || !air.light_load) return std::nullopt;
  const LightLoad& l = *air.light_load;
  const double t_supply = at_max.dry_bulb_c + unit.fan_heat_k;
  if (!(l.sensible_kw > 0.0) || !(t_supply < l.space_temp_c)) return std::nullopt;
  const double cp = 1.006 + 1.86 * at_max.humidity_ratio;  // eq. 32's dry air + vapour
  if (l.sensible_kw / (cp * (l.space_temp_c - t_supply)) > l.max_mass_flow_kg_per_s)
    return std::nullopt;
  Operation op{};
  op.oa_fraction = unit.max_oa_fraction;
  op.economizing = unit.max_oa_fraction > unit.min_oa_fraction + kFractionTolerance;
  op.coil_off = true;
  op.ret = return_air_at(unit, air, unit.max_oa_fraction);
  op.mixed = at_max;
  op.loads.entering = at_max;
  op.loads.leaving = at_max;
  return op;
}

}  // namespace

std::span<const Named<FanPosition>> fan_position_names() { return kFanPositionNames; }
std::string_view fan_position_name(FanPosition f) { return name_in(kFanPositionNames, f); }
std::optional<FanPosition> fan_position_from_name(std::string_view name) {
  return value_in(kFanPositionNames, name);
}

std::span<const Named<EconomizerType>> economizer_names() { return kEconomizerNames; }
std::string_view economizer_name(EconomizerType e) { return name_in(kEconomizerNames, e); }
std::optional<EconomizerType> economizer_from_name(std::string_view name) {
  return value_in(kEconomizerNames, name);
}

void validate(const AirHandler& u) {
  auto fail = [](const char* field, double v, const char* allowed) {
    throw InputError(fmt::format("air handler {} = {:.6g} is not allowed ({})", field, v, allowed));
  };
  if (!(u.supply_airflow_m3_per_s > 0.0))
    fail("supply_airflow (m³/s)", u.supply_airflow_m3_per_s, "more than 0");
  if (!(u.min_oa_fraction >= 0.0 && u.min_oa_fraction <= 1.0))
    fail("min_outdoor_air (fraction)", u.min_oa_fraction, "0 % to 100 %");
  if (!(u.max_oa_fraction > 0.0 && u.max_oa_fraction <= 1.0))
    fail("max_outdoor_air (fraction)", u.max_oa_fraction, "above 0 %, up to 100 %");
  if (u.min_oa_fraction > u.max_oa_fraction)
    throw InputError(
        fmt::format("air handler min_outdoor_air {:.4g}% is above max_outdoor_air "
                    "{:.4g}%",
                    u.min_oa_fraction * 100, u.max_oa_fraction * 100));
  if (!(u.fan_heat_k >= 0.0 && u.fan_heat_k <= 20.0))
    fail("fan_heat (K)", u.fan_heat_k, "0 K to 20 K");
  if (!(u.coil_leaving_rh_max > 0.0 && u.coil_leaving_rh_max <= 1.0))
    fail("coil_leaving_rh_max (fraction)", u.coil_leaving_rh_max, "above 0 %, up to 100 %");
  if (!(u.supply_air_temp_c >= -40.0 && u.supply_air_temp_c <= 60.0))
    fail("supply_air_temp (°C)", u.supply_air_temp_c, "-40 °C to 60 °C");
}

AirState air_state(double t_c, double w) { return {t_c, w, psychro::enthalpy_kj_per_kg(t_c, w)}; }

AirState mix(const AirState& o, const AirState& r, double x) {
  const double w = r.humidity_ratio + x * (o.humidity_ratio - r.humidity_ratio);
  const double h = r.enthalpy_kj_per_kg + x * (o.enthalpy_kj_per_kg - r.enthalpy_kj_per_kg);
  return {psychro::dry_bulb_from_enthalpy_c(h, w), w, h};
}

bool oa_fraction_for_mixed_temp(const AirState& o, const AirState& r, double target_c, double& x) {
  // t_m = target  ⇔  h_m − W_m·(2501 + 1.86·target) − 1.006·target = 0, linear in x.
  const double k = 2501.0 + 1.86 * target_c;
  const double a = r.enthalpy_kj_per_kg - r.humidity_ratio * k - 1.006 * target_c;
  const double b =
      (o.enthalpy_kj_per_kg - r.enthalpy_kj_per_kg) - (o.humidity_ratio - r.humidity_ratio) * k;
  if (std::fabs(b) < 1e-12) return false;
  x = -a / b;
  return std::isfinite(x);
}

MixedAirEstimate estimate_mixed_air(const AirState& o, const AirState& r, double target_c,
                                    double x_min, double x_max) {
  MixedAirEstimate e{};
  e.target_reachable = oa_fraction_for_mixed_temp(o, r, target_c, e.fraction_needed);
  if (!e.target_reachable) e.fraction_needed = x_min;
  e.within_limits = e.target_reachable && e.fraction_needed >= x_min - kFractionTolerance &&
                    e.fraction_needed <= x_max + kFractionTolerance;
  e.fraction_applied = e.target_reachable ? std::clamp(e.fraction_needed, x_min, x_max) : x_min;
  e.mixed = mix(o, r, e.fraction_applied);
  const double diff = e.mixed.dry_bulb_c - target_c;
  e.makeup = diff < -1e-6 ? Makeup::heating : diff > 1e-6 ? Makeup::cooling : Makeup::none;
  e.makeup_k = e.makeup == Makeup::none ? 0.0 : std::fabs(diff);
  return e;
}

AirState return_air_at(const AirHandler& unit, const HourAir& air, double x) {
  // `ret` is the return at the minimum already (HourAir's contract): the common case.
  if (!air.space || x == unit.min_oa_fraction) return air.ret;
  return steady_return_air(unit, air, x);
}

AirState steady_return_air(const AirHandler& unit, const HourAir& air, double x) {
  if (!air.space) return air.ret;
  const SpaceReturn& sp = *air.space;
  auto at = [&](bool dehumidifies) {
    return air_state(sp.return_temp_c, part_load::return_humidity_ratio(
                                           air.outdoor.humidity_ratio, sp.moisture, x, dehumidifies,
                                           air.coil.leaving_humidity_ratio_cap, sp.fallback_w));
  };
  // The regime without coil cooling is tried first: on the mixed-air target itself (x*) it is
  // the consistent one, and the coil then does nothing, as coil_loads() says.
  const AirState dry = at(false);
  if (!coil_cools(unit, air.coil, mix(air.outdoor, dry, x))) return dry;
  return at(true);
}

CoilLimits coil_limits(const AirHandler& unit, double pressure_kpa) {
  const double t_cl = unit.coil_leaving_temp_c();
  return {t_cl, psychro::humidity_ratio_from_relative_humidity(t_cl, unit.coil_leaving_rh_max,
                                                               pressure_kpa)};
}

CoilLoads coil_loads(const AirHandler& unit, const CoilLimits& lim, const AirState& mixed) {
  CoilLoads c{};
  c.entering = unit.fan_position == FanPosition::blow_through
                   ? air_state(mixed.dry_bulb_c + unit.fan_heat_k, mixed.humidity_ratio)
                   : mixed;
  const double t_cl = lim.leaving_temp_c;
  const double w_ce = c.entering.humidity_ratio;
  // Entering air on the leaving temperature (the economizer's x*, up to rounding of the mixed
  // dry-bulb) needs neither coil. Without the tolerance, humid air above the leaving cap would
  // flip between zero and a latent load on the last bit of t_m.
  if (std::fabs(c.entering.dry_bulb_c - t_cl) <= kTargetToleranceK) {
    c.leaving = c.entering;
    return c;
  }
  if (c.entering.dry_bulb_c > t_cl) {
    const double w_cl = std::min(w_ce, lim.leaving_humidity_ratio_cap);
    c.leaving = air_state(t_cl, w_cl);
    // Condensate leaves at the coil-leaving temperature, carrying 4.186·t_cl kJ/kg of water.
    c.cooling_kj_per_kg =
        c.entering.enthalpy_kj_per_kg - c.leaving.enthalpy_kj_per_kg - (w_ce - w_cl) * 4.186 * t_cl;
    c.sensible_kj_per_kg = c.entering.enthalpy_kj_per_kg - psychro::enthalpy_kj_per_kg(t_cl, w_ce);
    c.latent_kj_per_kg = c.cooling_kj_per_kg - c.sensible_kj_per_kg;
  } else {
    c.leaving = air_state(t_cl, w_ce);
    c.heating_kj_per_kg = c.leaving.enthalpy_kj_per_kg - c.entering.enthalpy_kj_per_kg;
  }
  return c;
}

double return_air_coil_load_kw(const AirHandler& unit, const AirState& ret, double pressure_kpa) {
  const CoilLoads c = coil_loads(unit, coil_limits(unit, pressure_kpa), ret);
  return unit.dry_air_mass_flow_kg_per_s() * c.cooling_kj_per_kg;
}

Operation operate(const AirHandler& unit, const HourAir& air, bool enabled,
                  const EnergyWeights& w) {
  const double target = unit.mixed_air_target_c();
  const double x_min = unit.min_oa_fraction, x_max = unit.max_oa_fraction;
  const AirState at_min = mix(air.outdoor, return_air_at(unit, air, x_min), x_min);
  // Step 1: no cooling needed at the minimum; the damper stays there (heating if below).
  if (at_min.dry_bulb_c <= target + kTargetToleranceK || !enabled)
    return operation_at(unit, air, x_min, w);
  // Step 2, enabled: free cooling when full outdoor air reaches the target, else integrated
  // operation at the damper limit, or back to the minimum for a non-integrated economizer
  // (unless outdoor air alone carries a light load).
  const AirState at_max = mix(air.outdoor, return_air_at(unit, air, x_max), x_max);
  if (at_max.dry_bulb_c <= target + kTargetToleranceK) {
    double x = x_max;
    if (fraction_for_target(unit, air, target, x)) x = std::clamp(x, x_min, x_max);
    return operation_at(unit, air, x, w);
  }
  if (unit.economizer == EconomizerType::integrated) return operation_at(unit, air, x_max, w);
  if (auto alone = outdoor_air_alone(unit, air, at_max)) return *alone;
  return operation_at(unit, air, x_min, w);
}

HourChoice choose(const AirHandler& unit, const HourAir& air, const EnergyWeights& w) {
  HourChoice c;
  c.disabled = operate(unit, air, false, w);
  c.cooling_needed = c.disabled.mixed.dry_bulb_c > unit.mixed_air_target_c() + kTargetToleranceK;
  c.enabled = c.cooling_needed ? operate(unit, air, true, w) : c.disabled;
  return c;
}

Operation optimal_damper(const AirHandler& unit, const HourAir& air, const EnergyWeights& w) {
  const double lo = unit.min_oa_fraction, hi = unit.max_oa_fraction;
  std::array<double, 4> candidates{lo, hi, lo, lo};
  double x = 0.0;
  if (fraction_for_target(unit, air, unit.mixed_air_target_c(), x))
    candidates[2] = std::clamp(x, lo, hi);
  const double w_o = air.outdoor.humidity_ratio, w_cap = air.coil.leaving_humidity_ratio_cap;
  if (air.space) {
    // The coil starts to condense where W_o + m/x = W_cap + m (part_load::return_humidity_ratio).
    const double m = air.space->moisture, room = w_cap + m - w_o;
    if (m > 0.0 && room > 1e-15) candidates[3] = std::clamp(m / room, lo, hi);
  } else {
    const double dw = w_o - air.ret.humidity_ratio;
    if (std::fabs(dw) > 1e-15) {
      const double x_wet = (w_cap - air.ret.humidity_ratio) / dw;
      if (std::isfinite(x_wet)) candidates[3] = std::clamp(x_wet, lo, hi);
    }
  }
  std::sort(candidates.begin(), candidates.end());
  Operation best = operation_at(unit, air, candidates[0], w);
  for (std::size_t i = 1; i < candidates.size(); ++i) {
    if (candidates[i] == candidates[i - 1]) continue;
    Operation op = operation_at(unit, air, candidates[i], w);
    if (op.weighted_kj_per_kg < best.weighted_kj_per_kg - 1e-12) best = op;
  }
  // A non-integrated economizer's light-load operation is a damper position too.
  if (unit.economizer == EconomizerType::non_integrated) {
    const AirState at_max = mix(air.outdoor, return_air_at(unit, air, hi), hi);
    if (at_max.dry_bulb_c > unit.mixed_air_target_c() + kTargetToleranceK)
      if (auto alone = outdoor_air_alone(unit, air, at_max);
          alone && alone->weighted_kj_per_kg < best.weighted_kj_per_kg - 1e-12)
        best = *alone;
  }
  return best;
}

}  // namespace limitline::airside
