// Moist-air properties, ASHRAE Handbook—Fundamentals (2017, SI), chapter 1.
#include <limitline/psychro.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

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

// ln p_ws (Pa) over ice, eq. 5.
inline double ln_pws_ice(double T, double lnT) {
  return C1 / T + C2 + T * (C3 + T * (C4 + T * (C5 + T * C6))) + C7 * lnT;
}
inline double ln_pws_ice_slope(double T) {
  return -C1 / (T * T) + C3 + T * (2 * C4 + T * (3 * C5 + T * 4 * C6)) + C7 / T;
}
// ln p_ws (Pa) over water, eq. 6.
inline double ln_pws_water(double T, double lnT) {
  return C8 / T + C9 + T * (C10 + T * (C11 + T * C12)) + C13 * lnT;
}
inline double ln_pws_water_slope(double T) {
  return -C8 / (T * T) + C10 + T * (2 * C11 + T * 3 * C12) + C13 / T;
}

inline double ln_pws_pa(double t_c) {
  const double T = t_c + kKelvinOffset;
  const double lnT = std::log(T);
  return t_c < 0.0 ? ln_pws_ice(T, lnT) : ln_pws_water(T, lnT);
}

[[noreturn]] void out_of_range(const char* what, double value, const char* unit,
                               const char* allowed) {
  throw RangeError(fmt::format("{} {:.6g} {} is outside the range the psychrometric model "
                               "supports ({})",
                               what, value, unit, allowed));
}

// Saturation pressure at the two ends of the fits, kPa (for the dew-point inverse).
const double kPwsAtMinKpa = std::exp(ln_pws_pa(kMinTemperatureC)) / 1000.0;
const double kPwsAtMaxKpa = std::exp(ln_pws_pa(kMaxTemperatureC)) / 1000.0;
// Both fits at 0 °C; the ice one is used below 0 °C, the water one from 0 °C.
const double kLnPwsWaterAt0 = ln_pws_water(kKelvinOffset, std::log(kKelvinOffset));

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
  if (!(w >= 0.0) || !std::isfinite(w))
    throw RangeError(fmt::format("{} {:.6g} kg/kg is not allowed (0 or more)", what, w));
  const double ws = saturation_humidity_ratio(t_c, p_kpa);
  // A relative tolerance absorbs rounding of values that were printed and read back.
  if (w > ws * (1.0 + 1e-6) + 1e-12)
    throw RangeError(fmt::format(
        "{} {:.6g} kg/kg is above saturation ({:.6g} kg/kg at {:.4g} °C, {:.6g} kPa)", what, w,
        ws, t_c, p_kpa));
}

double saturation_pressure_kpa(double t_c) {
  check_dry_bulb(t_c);
  return std::exp(ln_pws_pa(t_c)) * 1e-3;
}

double saturation_pressure_log_slope_per_k(double t_c) {
  check_dry_bulb(t_c);
  const double T = t_c + kKelvinOffset;
  return t_c < 0.0 ? ln_pws_ice_slope(T) : ln_pws_water_slope(T);
}

double humidity_ratio_from_vapor_pressure(double pw_kpa, double p_kpa) {
  if (!(pw_kpa >= 0.0 && pw_kpa < p_kpa))
    throw RangeError(fmt::format("vapour pressure {:.6g} kPa is not allowed at {:.6g} kPa "
                                 "total pressure (0 or more, below the total pressure)",
                                 pw_kpa, p_kpa));
  return kMolecularMassRatio * pw_kpa / (p_kpa - pw_kpa);
}

double vapor_pressure_from_humidity_ratio(double w, double p_kpa) {
  if (!(w >= 0.0) || !std::isfinite(w))
    throw RangeError(fmt::format("humidity ratio {:.6g} kg/kg is not allowed (0 or more)", w));
  return p_kpa * w / (kMolecularMassRatio + w);
}

double saturation_humidity_ratio(double t_c, double p_kpa) {
  const double pws = saturation_pressure_kpa(t_c);
  if (!(pws < p_kpa))
    throw RangeError(fmt::format("dry-bulb {:.4g} °C is at or above the boiling point at "
                                 "{:.6g} kPa; moist air cannot be saturated there",
                                 t_c, p_kpa));
  return kMolecularMassRatio * pws / (p_kpa - pws);
}

double humidity_ratio_from_relative_humidity(double t_c, double rh, double p_kpa) {
  if (!(rh >= 0.0 && rh <= 1.0))
    throw RangeError(fmt::format("relative humidity {:.6g} % is not allowed (0 % to 100 %)",
                                 rh * 100.0));
  return humidity_ratio_from_vapor_pressure(rh * saturation_pressure_kpa(t_c), p_kpa);
}

double relative_humidity_from_humidity_ratio(double t_c, double w, double p_kpa) {
  return vapor_pressure_from_humidity_ratio(w, p_kpa) / saturation_pressure_kpa(t_c);
}

double dew_point_from_vapor_pressure_c(double pw_kpa) {
  if (!(pw_kpa >= kPwsAtMinKpa && pw_kpa <= kPwsAtMaxKpa))
    throw RangeError(fmt::format("vapour pressure {:.6g} kPa has no dew point between -100 °C "
                                 "and 200 °C ({:.3g} kPa to {:.4g} kPa)",
                                 pw_kpa, kPwsAtMinKpa, kPwsAtMaxKpa));
  const double target = std::log(pw_kpa * 1000.0);
  const bool over_water = target >= kLnPwsWaterAt0;
  // Start from the Magnus-type fit (within a fraction of a kelvin over the HVAC range), then
  // Newton on ln p_ws(T), whose slope is cheap and smooth: two or three steps reach 1e-9 K.
  const double gamma = target - std::log(over_water ? 610.94 : 611.21);
  double t = over_water ? 243.04 * gamma / (17.625 - gamma) : 273.86 * gamma / (22.587 - gamma);
  double T = std::clamp(t, kMinTemperatureC, kMaxTemperatureC) + kKelvinOffset;
  for (int i = 0; i < 50; ++i) {
    const double lnT = std::log(T);
    const double f = (over_water ? ln_pws_water(T, lnT) : ln_pws_ice(T, lnT)) - target;
    const double step = f / (over_water ? ln_pws_water_slope(T) : ln_pws_ice_slope(T));
    T -= step;
    if (std::fabs(step) < 1e-9) break;
  }
  t = T - kKelvinOffset;
  // Where the ice fit at 0 °C lies below the water fit, a vapour pressure between them has
  // its dew point at the junction.
  if (!over_water && t > 0.0) t = 0.0;
  return std::clamp(t, kMinTemperatureC, kMaxTemperatureC);
}

double dew_point_from_humidity_ratio_c(double w, double p_kpa) {
  return dew_point_from_vapor_pressure_c(vapor_pressure_from_humidity_ratio(w, p_kpa));
}

double humidity_ratio_from_dew_point(double dew_point_c, double p_kpa) {
  return humidity_ratio_from_vapor_pressure(saturation_pressure_kpa(dew_point_c), p_kpa);
}

namespace {
// Eq. 33 (t* ≥ 0 °C) and eq. 35 (t* < 0 °C): numerator N and denominator D of W = N/D, and
// their derivatives with respect to t*, given W_s* and dW_s*/dt*.
struct WetBulbTerms {
  double n, d, dn, dd;
};
inline WetBulbTerms wet_bulb_terms(double t, double ts, double ws, double dws) {
  if (ts >= 0.0)
    return {(2501.0 - 2.326 * ts) * ws - 1.006 * (t - ts), 2501.0 + 1.86 * t - 4.186 * ts,
            -2.326 * ws + (2501.0 - 2.326 * ts) * dws + 1.006, -4.186};
  return {(2830.0 - 0.24 * ts) * ws - 1.006 * (t - ts), 2830.0 + 1.86 * t - 2.1 * ts,
          -0.24 * ws + (2830.0 - 0.24 * ts) * dws + 1.006, -2.1};
}
}  // namespace

double humidity_ratio_from_wet_bulb(double t_c, double wb_c, double p_kpa) {
  check_dry_bulb(t_c);
  check_dry_bulb(wb_c, "wet-bulb");
  if (wb_c > t_c)
    throw RangeError(fmt::format("wet-bulb {:.4g} °C is above dry-bulb {:.4g} °C", wb_c, t_c));
  const double ws = saturation_humidity_ratio(wb_c, p_kpa);
  const WetBulbTerms k = wet_bulb_terms(t_c, wb_c, ws, 0.0);
  const double w = k.n / k.d;
  if (w < 0.0)
    throw RangeError(fmt::format("wet-bulb {:.4g} °C is too low for dry-bulb {:.4g} °C at "
                                 "{:.6g} kPa: the air would need negative humidity",
                                 wb_c, t_c, p_kpa));
  return w;
}

double wet_bulb_from_humidity_ratio_c(double t_c, double w, double p_kpa) {
  check_dry_bulb(t_c);
  check_humidity_ratio(w, t_c, p_kpa);
  // Newton on W(t*) − W, which rises monotonically from below the dew point to W_s at t* = t.
  // Starting at t* = t converges from one side, so the iterate never leaves [t_low, t].
  double ts = t_c;
  double lo = kMinTemperatureC, hi = t_c;
  for (int i = 0; i < 60; ++i) {
    const double T = ts + kKelvinOffset;
    const double lnT = std::log(T);
    const bool ice = ts < 0.0;
    const double pws = std::exp(ice ? ln_pws_ice(T, lnT) : ln_pws_water(T, lnT)) * 1e-3;
    const double slope = ice ? ln_pws_ice_slope(T) : ln_pws_water_slope(T);
    const double ws = kMolecularMassRatio * pws / (p_kpa - pws);
    const double dws = kMolecularMassRatio * p_kpa * pws * slope / ((p_kpa - pws) * (p_kpa - pws));
    const WetBulbTerms k = wet_bulb_terms(t_c, ts, ws, dws);
    const double g = k.n / k.d - w;
    if (g > 0.0) hi = ts; else lo = ts;
    const double dg = (k.dn * k.d - k.n * k.dd) / (k.d * k.d);
    double next = ts - g / dg;
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);  // keep Newton inside the bracket
    const double step = next - ts;
    ts = next;
    if (std::fabs(step) < 1e-7) break;
  }
  return ts;
}

double humidity_ratio_from_enthalpy(double t_c, double h) {
  const double w = (h - 1.006 * t_c) / (2501.0 + 1.86 * t_c);
  if (!(w >= 0.0))
    throw RangeError(fmt::format("enthalpy {:.6g} kJ/kg is below that of dry air at {:.4g} °C "
                                 "({:.6g} kJ/kg)",
                                 h, t_c, 1.006 * t_c));
  return w;
}

double specific_volume_m3_per_kg(double t_c, double w, double p_kpa) {
  return 0.287042 * (t_c + kKelvinOffset) * (1.0 + 1.607858 * w) / p_kpa;
}

double density_kg_per_m3(double t_c, double w, double p_kpa) {
  return (1.0 + w) / specific_volume_m3_per_kg(t_c, w, p_kpa);
}

double degree_of_saturation(double t_c, double w, double p_kpa) {
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
    throw RangeError(fmt::format("pressure {:.6g} kPa is outside the standard atmosphere of "
                                 "eq. 3 ({:.4g} kPa to {:.5g} kPa, 11000 m to -500 m)",
                                 p_kpa, p_low, p_high));
  return (1.0 - std::pow(p_kpa / kStandardPressureKpa, 1.0 / 5.2559)) / 2.25577e-5;
}

Properties properties(const MoistAir& air) {
  const double t = air.dry_bulb_c, w = air.humidity_ratio, p = air.pressure_kpa;
  check_dry_bulb(t);
  check_pressure(p);
  check_humidity_ratio(w, t, p);
  Properties r{};
  r.dry_bulb_c = t;
  r.humidity_ratio = w;
  r.pressure_kpa = p;
  r.vapor_pressure_kpa = vapor_pressure_from_humidity_ratio(w, p);
  r.saturation_humidity_ratio = saturation_humidity_ratio(t, p);
  r.relative_humidity = std::min(1.0, r.vapor_pressure_kpa / saturation_pressure_kpa(t));
  r.degree_of_saturation = std::min(1.0, w / r.saturation_humidity_ratio);
  r.dew_point_c = std::min(t, dew_point_from_vapor_pressure_c(r.vapor_pressure_kpa));
  r.wet_bulb_c = wet_bulb_from_humidity_ratio_c(t, std::min(w, r.saturation_humidity_ratio), p);
  r.enthalpy_kj_per_kg = enthalpy_kj_per_kg(t, w);
  r.specific_volume_m3_per_kg = specific_volume_m3_per_kg(t, w, p);
  r.density_kg_per_m3 = density_kg_per_m3(t, w, p);
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
    case HumidityInput::wet_bulb:
      w = humidity_ratio_from_wet_bulb(t_c, value, p_kpa);
      break;
    case HumidityInput::dew_point:
      check_dry_bulb(value, "dew point");
      if (value > t_c)
        throw RangeError(fmt::format("dew point {:.4g} °C is above dry-bulb {:.4g} °C", value,
                                     t_c));
      w = humidity_ratio_from_dew_point(value, p_kpa);
      break;
    case HumidityInput::humidity_ratio:
      w = value;
      break;
    case HumidityInput::enthalpy:
      w = humidity_ratio_from_enthalpy(t_c, value);
      break;
  }
  check_humidity_ratio(w, t_c, p_kpa);
  return {t_c, w, p_kpa};
}

}  // namespace limitline::psychro
