// Moist-air properties, ASHRAE Handbook—Fundamentals (2017, SI), chapter 1.
#include <limitline/model/psychro.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <vector>

namespace limitline::psychro {
namespace {

constexpr double kKelvinOffset = 273.15;

// Hyland–Wexler coefficients, ln p_ws in Pa with T in K.
// Over ice, −100 to 0 °C (eq. 5).
constexpr double C1 = -5.6745359e3, C2 = 6.3925247, C3 = -9.6778430e-3, C4 = 6.2215701e-7,
                 C5 = 2.0747825e-9, C6 = -9.4840240e-13, C7 = 4.1635019;
// Over liquid water, 0 to 200 °C (eq. 6).
constexpr double C8 = -5.8002206e3, C9 = 1.3914993, C10 = -4.8640239e-2, C11 = 4.1764768e-5,
                 C12 = -1.4452093e-8, C13 = 6.5459673;

// ln p_ws (Pa) over ice (eq. 5) and over water (eq. 6), with the first and second derivative
// in T, all from T, 1/T and ln T so that one division and one logarithm serve all three.
inline double ln_pws_ice(double T, double inv, double lnT) {
  return C1 * inv + C2 + T * (C3 + T * (C4 + T * (C5 + T * C6))) + C7 * lnT;
}
inline double ln_pws_ice_slope(double T, double inv) {
  return (-C1 * inv + C7) * inv + C3 + T * (2 * C4 + T * (3 * C5 + T * 4 * C6));
}
inline double ln_pws_ice_curvature(double T, double inv) {
  return (2 * C1 * inv - C7) * inv * inv + 2 * C4 + T * (6 * C5 + T * 12 * C6);
}
inline double ln_pws_water(double T, double inv, double lnT) {
  return C8 * inv + C9 + T * (C10 + T * (C11 + T * C12)) + C13 * lnT;
}
inline double ln_pws_water_slope(double T, double inv) {
  return (-C8 * inv + C13) * inv + C10 + T * (2 * C11 + T * 3 * C12);
}
inline double ln_pws_water_curvature(double T, double inv) {
  return (2 * C8 * inv - C13) * inv * inv + 2 * C11 + T * 6 * C12;
}

// The fit in use at t: ice below 0 °C, water from 0 °C.
inline double ln_pws_pa(double t_c) {
  const double T = t_c + kKelvinOffset;
  return t_c < 0.0 ? ln_pws_ice(T, 1.0 / T, std::log(T)) : ln_pws_water(T, 1.0 / T, std::log(T));
}

// p_ws (kPa) at one temperature with the first two derivatives of ln p_ws: what each step of
// the wet-bulb solver needs.
struct Saturation {
  double pws_kpa;
  double log_slope_per_k;       // d ln p_ws/dT
  double log_curvature_per_k2;  // d² ln p_ws/dT²
};
inline Saturation saturation_at(double t_c) {
  const double T = t_c + kKelvinOffset;
  const double inv = 1.0 / T;
  const double lnT = std::log(T);
  if (t_c < 0.0)
    return {std::exp(ln_pws_ice(T, inv, lnT)) * 1e-3, ln_pws_ice_slope(T, inv),
            ln_pws_ice_curvature(T, inv)};
  return {std::exp(ln_pws_water(T, inv, lnT)) * 1e-3, ln_pws_water_slope(T, inv),
          ln_pws_water_curvature(T, inv)};
}

[[noreturn]] void out_of_range(const char* what, double value, const char* unit,
                               const char* allowed) {
  throw RangeError(
      fmt::format("{} {:.6g} {} is outside the range the psychrometric model "
                  "supports ({})",
                  what, value, unit, allowed));
}

void check_non_negative(double w, const char* what) {
  if (!(w >= 0.0) || !std::isfinite(w))
    throw RangeError(fmt::format("{} {:.6g} kg/kg is not allowed (0 or more)", what, w));
}

// W_s from p_ws (eq. 23), refusing temperatures at which water boils at this pressure.
double saturation_ratio(double pws_kpa, double t_c, double p_kpa) {
  if (!(pws_kpa < p_kpa))
    throw RangeError(
        fmt::format("dry-bulb {:.4g} °C is at or above the boiling point at "
                    "{:.6g} kPa; moist air cannot be saturated there",
                    t_c, p_kpa));
  return kMolecularMassRatio * pws_kpa / (p_kpa - pws_kpa);
}

void check_not_supersaturated(double w, double ws, double t_c, double p_kpa, const char* what) {
  // A relative tolerance absorbs rounding of values that were printed and read back.
  if (w > ws * (1.0 + 1e-6) + 1e-12)
    throw RangeError(
        fmt::format("{} {:.6g} kg/kg is above saturation ({:.6g} kg/kg at {:.4g} °C, {:.6g} kPa)",
                    what, w, ws, t_c, p_kpa));
}

// Saturation pressure at the two ends of the fits, kPa, computed exactly as
// saturation_pressure_kpa() does, so saturated air at either end still has a dew point.
const double kPwsAtMinKpa = std::exp(ln_pws_pa(kMinTemperatureC)) * 1e-3;
const double kPwsAtMaxKpa = std::exp(ln_pws_pa(kMaxTemperatureC)) * 1e-3;

// One branch of eq. 5/6 inverted: t(y) with y = ln p_ws (Pa), tabulated on a uniform grid in
// y together with the exact slope dt/dy = 1/(d ln p_ws/dT) at each node (each node solved to
// 1e-12 K). Cubic Hermite interpolation between nodes reproduces the exact inverse within
// 2e-8 K over the whole range (the error bound of the cubic at this step, checked by
// test_psychro against bisection), for one logarithm and a few multiplications instead of
// the three or four logarithms of a Newton iteration from a rough start.
class InverseBranch {
 public:
  InverseBranch(bool ice, double t_lo, double t_hi) : ice_(ice) {
    y_lo_ = ln_pws(t_lo);
    const double span = ln_pws(t_hi) - y_lo_;
    const int intervals = static_cast<int>(std::ceil(span / kMaxStep));
    const double step = span / intervals;
    inv_step_ = 1.0 / step;
    nodes_.reserve(static_cast<std::size_t>(intervals) + 1);
    double t = t_lo;
    for (int i = 0; i <= intervals; ++i) {
      t = i == 0 ? t_lo : i == intervals ? t_hi : newton(y_lo_ + i * step, t, 1e-12);
      nodes_.push_back({t, step / log_slope(t)});
    }
  }

  double ln_pws(double t_c) const {
    const double T = t_c + kKelvinOffset;
    return ice_ ? ln_pws_ice(T, 1.0 / T, std::log(T)) : ln_pws_water(T, 1.0 / T, std::log(T));
  }
  double log_slope(double t_c) const {
    const double T = t_c + kKelvinOffset;
    return ice_ ? ln_pws_ice_slope(T, 1.0 / T) : ln_pws_water_slope(T, 1.0 / T);
  }

  // t with ln p_ws(t) = y, for y within the branch.
  double invert(double y) const {
    const double x = (y - y_lo_) * inv_step_;
    // Held to the table before the cast, so no argument makes the conversion undefined.
    const std::size_t i = static_cast<std::size_t>(
        x > 0.0 ? std::min(x, static_cast<double>(nodes_.size() - 2)) : 0.0);
    const double u = x - static_cast<double>(i);
    const Node& a = nodes_[i];
    const Node& b = nodes_[i + 1];
    const double rise = b.t - a.t;
    return a.t +
           u * (a.dt + u * ((3.0 * rise - 2.0 * a.dt - b.dt) + u * (a.dt + b.dt - 2.0 * rise)));
  }

 private:
  static constexpr double kMaxStep = 0.05;  // in ln p: 260 ice and 157 water intervals
  struct Node {
    double t;   // °C
    double dt;  // dt/dy times the grid step
  };
  double newton(double y, double t, double tolerance) const {
    for (int k = 0; k < 100; ++k) {
      const double step = (ln_pws(t) - y) / log_slope(t);
      t -= step;
      if (std::fabs(step) < tolerance) break;
    }
    return t;
  }
  bool ice_;
  double y_lo_ = 0.0, inv_step_ = 0.0;
  std::vector<Node> nodes_;
};

struct DewPointTables {
  InverseBranch ice{true, kMinTemperatureC, 0.0};
  InverseBranch water{false, 0.0, kMaxTemperatureC};
  double y_ice_top = ice.ln_pws(0.0);
  double y_water_bottom = water.ln_pws(0.0);
};
// Built on first use, so no static initialisation elsewhere can run before it exists.
const DewPointTables& dew_point_tables() {
  static const DewPointTables tables;
  return tables;
}

}  // namespace

void check_dry_bulb(double t_c, const char* what) {
  if (!(t_c >= kMinTemperatureC && t_c <= kMaxTemperatureC))
    out_of_range(what, t_c, "°C", "-100 °C to 200 °C");
}

void check_pressure(double p_kpa, const char* what) {
  if (!(p_kpa >= kMinPressureKpa && p_kpa <= kMaxPressureKpa))
    out_of_range(what, p_kpa, "kPa", "10 kPa to 200 kPa");
}

void check_humidity_ratio(double w, double t_c, double p_kpa, const char* what) {
  check_non_negative(w, what);
  check_not_supersaturated(w, saturation_humidity_ratio(t_c, p_kpa), t_c, p_kpa, what);
}

double saturation_pressure_kpa(double t_c) {
  check_dry_bulb(t_c);
  return std::exp(ln_pws_pa(t_c)) * 1e-3;
}

double saturation_pressure_log_slope_per_k(double t_c) {
  check_dry_bulb(t_c);
  return saturation_at(t_c).log_slope_per_k;
}

double humidity_ratio_from_vapor_pressure(double pw_kpa, double p_kpa) {
  if (!(pw_kpa >= 0.0 && pw_kpa < p_kpa))
    throw RangeError(
        fmt::format("vapour pressure {:.6g} kPa is not allowed at {:.6g} kPa "
                    "total pressure (0 or more, below the total pressure)",
                    pw_kpa, p_kpa));
  return kMolecularMassRatio * pw_kpa / (p_kpa - pw_kpa);
}

double vapor_pressure_from_humidity_ratio(double w, double p_kpa) {
  check_non_negative(w, "humidity ratio");
  check_pressure(p_kpa);
  return p_kpa * w / (kMolecularMassRatio + w);
}

double saturation_humidity_ratio(double t_c, double p_kpa) {
  check_pressure(p_kpa);
  return saturation_ratio(saturation_pressure_kpa(t_c), t_c, p_kpa);
}

double humidity_ratio_from_relative_humidity(double t_c, double rh, double p_kpa) {
  if (!(rh >= 0.0 && rh <= 1.0))
    throw RangeError(
        fmt::format("relative humidity {:.6g} % is not allowed (0 % to 100 %)", rh * 100.0));
  return humidity_ratio_from_vapor_pressure(rh * saturation_pressure_kpa(t_c), p_kpa);
}

double relative_humidity_from_humidity_ratio(double t_c, double w, double p_kpa) {
  return vapor_pressure_from_humidity_ratio(w, p_kpa) / saturation_pressure_kpa(t_c);
}

double dew_point_from_vapor_pressure_c(double pw_kpa) {
  // The margin lets saturated air at either end of the range, whose vapour pressure went
  // through a humidity ratio and back with rounding, keep its dew point.
  if (pw_kpa == 0.0)
    throw RangeError(
        "perfectly dry air (vapour pressure 0) has no dew point; give a humidity "
        "above 0 (a dew point of -100 °C or more)");
  if (!(pw_kpa >= kPwsAtMinKpa * (1.0 - 1e-9) && pw_kpa <= kPwsAtMaxKpa * (1.0 + 1e-9)))
    throw RangeError(
        fmt::format("vapour pressure {:.6g} kPa has no dew point between -100 °C "
                    "and 200 °C ({:.3g} kPa to {:.4g} kPa)",
                    pw_kpa, kPwsAtMinKpa, kPwsAtMaxKpa));
  const DewPointTables& tables = dew_point_tables();
  const double y = std::log(pw_kpa * 1000.0);
  if (y >= tables.y_water_bottom) return std::clamp(tables.water.invert(y), 0.0, kMaxTemperatureC);
  if (y < tables.y_ice_top) return std::clamp(tables.ice.invert(y), kMinTemperatureC, 0.0);
  // The ice fit at 0 °C lies below the water fit: a vapour pressure between the two has its
  // dew point at the junction.
  return 0.0;
}

double dew_point_from_humidity_ratio_c(double w, double p_kpa) {
  return dew_point_from_vapor_pressure_c(vapor_pressure_from_humidity_ratio(w, p_kpa));
}

double humidity_ratio_from_dew_point(double dew_point_c, double p_kpa) {
  return humidity_ratio_from_vapor_pressure(saturation_pressure_kpa(dew_point_c), p_kpa);
}

namespace {
// Eq. 33 (t* ≥ 0 °C) and eq. 35 (t* < 0 °C) as W = (A·W_s* − 1.006·(t − t*))/D with A and D
// linear in t*: A = a0 + a1·t*, D = d0 + d1·t*.
struct WetBulbLine {
  double a0, a1, d0, d1;
};
inline WetBulbLine wet_bulb_line(double t, double ts) {
  if (ts >= 0.0) return {2501.0, -2.326, 2501.0 + 1.86 * t, -4.186};  // eq. 33
  return {2830.0, -0.24, 2830.0 + 1.86 * t, -2.1};                    // eq. 35
}

// Wet-bulb of a validated state, given the saturation at the dry-bulb. Halley's method on
// F(t*) = 0.621945·A·p_ws* − R·(p − p_ws*),  R = 1.006·(t − t*) + W·D:
// eq. 33/35 multiplied by D·(p − p_ws*) > 0, so F has the sign of W(t*) − W and the same
// root, with no division but the step's. Halley (cubic convergence) needs two or three
// steps from t* = t over the HVAC range, Newton three or four, each costing an exp and a
// log. The root stays inside the bracket [lo, hi]; a step that would leave it bisects.
double solve_wet_bulb(double t_c, double w, double p_kpa, Saturation sat) {
  double ts = t_c, lo = kMinTemperatureC, hi = t_c;
  for (int i = 0; i < 60; ++i) {
    const WetBulbLine k = wet_bulb_line(t_c, ts);
    const double q = sat.pws_kpa, s = sat.log_slope_per_k;
    const double dq = q * s, d2q = q * (s * s + sat.log_curvature_per_k2);
    const double a = k.a0 + k.a1 * ts;
    const double r = 1.006 * (t_c - ts) + w * (k.d0 + k.d1 * ts), dr = w * k.d1 - 1.006;
    const double f = kMolecularMassRatio * a * q - r * (p_kpa - q);
    const double df = kMolecularMassRatio * (k.a1 * q + a * dq) - dr * (p_kpa - q) + r * dq;
    const double d2f = kMolecularMassRatio * (2.0 * k.a1 * dq + a * d2q) + 2.0 * dr * dq + r * d2q;
    if (f > 0.0)
      hi = ts;
    else
      lo = ts;
    const double step = 2.0 * f * df / (2.0 * df * df - f * d2f);
    const double next = ts - step;
    if (std::fabs(step) < 1e-3) {
      // After a Halley step s the error is of order s³/100 K: below 1e-9 K here. A step
      // across t* = 0 °C lands on the other equation, which jumps there: the answer is then
      // the junction itself (within 1e-3 K, or W lies in the gap between eq. 33 and eq. 35).
      if ((next < 0.0) == (ts < 0.0)) return std::clamp(next, lo, hi);
      return std::clamp(0.0, lo, hi);
    }
    if (hi - lo < 1e-9) return 0.5 * (lo + hi);
    ts = next > lo && next < hi ? next : 0.5 * (lo + hi);
    sat = saturation_at(ts);
  }
  return ts;
}
}  // namespace

double humidity_ratio_from_wet_bulb(double t_c, double wb_c, double p_kpa) {
  check_dry_bulb(t_c);
  check_dry_bulb(wb_c, "wet-bulb");
  if (wb_c > t_c)
    throw RangeError(fmt::format("wet-bulb {:.4g} °C is above dry-bulb {:.4g} °C", wb_c, t_c));
  const double ws = saturation_humidity_ratio(wb_c, p_kpa);
  const WetBulbLine k = wet_bulb_line(t_c, wb_c);
  const double w = ((k.a0 + k.a1 * wb_c) * ws - 1.006 * (t_c - wb_c)) / (k.d0 + k.d1 * wb_c);
  if (w < 0.0)
    throw RangeError(
        fmt::format("wet-bulb {:.4g} °C is too low for dry-bulb {:.4g} °C at "
                    "{:.6g} kPa: the air would need negative humidity",
                    wb_c, t_c, p_kpa));
  return w;
}

double wet_bulb_from_humidity_ratio_c(double t_c, double w, double p_kpa) {
  check_dry_bulb(t_c);
  check_pressure(p_kpa);
  check_non_negative(w, "humidity ratio");
  const Saturation sat = saturation_at(t_c);
  check_not_supersaturated(w, saturation_ratio(sat.pws_kpa, t_c, p_kpa), t_c, p_kpa,
                           "humidity ratio");
  return solve_wet_bulb(t_c, w, p_kpa, sat);
}

double humidity_ratio_from_enthalpy(double t_c, double h) {
  const double w = (h - 1.006 * t_c) / (2501.0 + 1.86 * t_c);
  if (!(w >= 0.0))
    throw RangeError(
        fmt::format("enthalpy {:.6g} kJ/kg is below that of dry air at {:.4g} °C "
                    "({:.6g} kJ/kg)",
                    h, t_c, 1.006 * t_c));
  return w;
}

double specific_volume_m3_per_kg(double t_c, double w, double p_kpa) {
  check_dry_bulb(t_c);
  check_pressure(p_kpa);
  check_non_negative(w, "humidity ratio");
  return 0.287042 * (t_c + kKelvinOffset) * (1.0 + 1.607858 * w) / p_kpa;
}

double density_kg_per_m3(double t_c, double w, double p_kpa) {
  return (1.0 + w) / specific_volume_m3_per_kg(t_c, w, p_kpa);
}

double degree_of_saturation(double t_c, double w, double p_kpa) {
  check_non_negative(w, "humidity ratio");
  return w / saturation_humidity_ratio(t_c, p_kpa);
}

double standard_pressure_kpa(double z_m) {
  if (!(z_m >= kMinElevationM && z_m <= kMaxElevationM))
    out_of_range("elevation", z_m, "m", "-500 m to 11000 m");
  return kStandardPressureKpa * std::pow(1.0 - 2.25577e-5 * z_m, 5.2559);
}

double elevation_from_standard_pressure_m(double p_kpa) {
  const double p_low = standard_pressure_kpa(kMaxElevationM);
  const double p_high = standard_pressure_kpa(kMinElevationM);
  if (!(p_kpa >= p_low && p_kpa <= p_high))
    throw RangeError(
        fmt::format("pressure {:.6g} kPa is outside the standard atmosphere of "
                    "eq. 3 ({:.4g} kPa to {:.5g} kPa, 11000 m to -500 m)",
                    p_kpa, p_low, p_high));
  return (1.0 - std::pow(p_kpa / kStandardPressureKpa, 1.0 / 5.2559)) / 2.25577e-5;
}

Properties properties(const MoistAir& air) {
  const double t = air.dry_bulb_c, w = air.humidity_ratio, p = air.pressure_kpa;
  check_dry_bulb(t);
  check_pressure(p);
  check_non_negative(w, "humidity ratio");
  // The saturation at the dry-bulb feeds W_s, RH, μ and the wet-bulb's first step: once.
  const Saturation sat = saturation_at(t);
  const double ws = saturation_ratio(sat.pws_kpa, t, p);
  check_not_supersaturated(w, ws, t, p, "humidity ratio");
  Properties r{};
  r.dry_bulb_c = t;
  r.humidity_ratio = w;
  r.pressure_kpa = p;
  r.vapor_pressure_kpa = p * w / (kMolecularMassRatio + w);
  r.saturation_humidity_ratio = ws;
  r.relative_humidity = std::min(1.0, r.vapor_pressure_kpa / sat.pws_kpa);
  r.degree_of_saturation = std::min(1.0, w / ws);
  r.dew_point_c = std::min(t, dew_point_from_vapor_pressure_c(r.vapor_pressure_kpa));
  r.wet_bulb_c = solve_wet_bulb(t, std::min(w, ws), p, sat);
  r.enthalpy_kj_per_kg = enthalpy_kj_per_kg(t, w);
  r.specific_volume_m3_per_kg = 0.287042 * (t + kKelvinOffset) * (1.0 + 1.607858 * w) / p;
  r.density_kg_per_m3 = (1.0 + w) / r.specific_volume_m3_per_kg;
  return r;
}

MoistAir state_from(double t_c, HumidityInput kind, double value, double p_kpa) {
  check_dry_bulb(t_c);
  check_pressure(p_kpa);
  double w = 0.0;
  switch (kind) {
    case HumidityInput::relative_humidity:
      w = humidity_ratio_from_relative_humidity(t_c, value, p_kpa);
      break;
    case HumidityInput::wet_bulb: w = humidity_ratio_from_wet_bulb(t_c, value, p_kpa); break;
    case HumidityInput::dew_point:
      check_dry_bulb(value, "dew point");
      if (value > t_c)
        throw RangeError(
            fmt::format("dew point {:.4g} °C is above dry-bulb {:.4g} °C", value, t_c));
      w = humidity_ratio_from_dew_point(value, p_kpa);
      break;
    case HumidityInput::humidity_ratio: w = value; break;
    case HumidityInput::enthalpy: w = humidity_ratio_from_enthalpy(t_c, value); break;
  }
  check_humidity_ratio(w, t_c, p_kpa);
  return {t_c, w, p_kpa};
}

}  // namespace limitline::psychro
