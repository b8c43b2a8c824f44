#pragma once
// Moist-air properties, ASHRAE Handbook—Fundamentals (2017, SI), chapter 1.
//
// Every quantity is SI and its unit is in the name: dry-bulb, wet-bulb and dew point in °C,
// pressure in kPa, humidity ratio in kg water per kg dry air, enthalpy in kJ per kg dry air
// (0 °C dry-air datum), specific volume in m³ per kg dry air, relative humidity as a fraction.
// Outside the range an equation supports the functions throw limitline::RangeError; they never
// return NaN.
#include <limitline/error.hpp>

namespace limitline::psychro {

// Validity of the saturation-pressure fits (eq. 5 below 0 °C, eq. 6 from 0 °C).
inline constexpr double kMinTemperatureC = -100.0;
inline constexpr double kMaxTemperatureC = 200.0;
// Standard sea-level pressure (eq. 3 at Z = 0).
inline constexpr double kStandardPressureKpa = 101.325;
// Ratio of molecular masses of water vapour and dry air (eq. 20).
inline constexpr double kMolecularMassRatio = 0.621945;
// Range of total pressure accepted: from high mountain passes to pressurised test rooms.
inline constexpr double kMinPressureKpa = 10.0;
inline constexpr double kMaxPressureKpa = 200.0;
// Elevation range of eq. 3 (the standard atmosphere it comes from is defined to 11 km).
inline constexpr double kMinElevationM = -500.0;
inline constexpr double kMaxElevationM = 11000.0;

// --- Saturation -----------------------------------------------------------------------

// Saturation vapour pressure over ice (t < 0 °C, eq. 5) or liquid water (t ≥ 0 °C, eq. 6).
[[nodiscard]] double saturation_pressure_kpa(double dry_bulb_c);

// d(ln p_ws)/dt of the same fit, per kelvin.
[[nodiscard]] double saturation_pressure_log_slope_per_k(double dry_bulb_c);

// Humidity ratio of saturated air (eq. 23).
[[nodiscard]] double saturation_humidity_ratio(double dry_bulb_c, double pressure_kpa);

// --- Humidity ratio and vapour pressure ------------------------------------------------

// W = 0.621945·p_w/(p − p_w)  (eq. 20 with eq. 22).
[[nodiscard]] double humidity_ratio_from_vapor_pressure(double vapor_pressure_kpa,
                                                        double pressure_kpa);

// p_w = p·W/(0.621945 + W)  (eq. 20 solved for p_w).
[[nodiscard]] double vapor_pressure_from_humidity_ratio(double humidity_ratio, double pressure_kpa);

// From relative humidity φ = p_w/p_ws (eq. 24).
[[nodiscard]] double humidity_ratio_from_relative_humidity(double dry_bulb_c,
                                                           double relative_humidity,
                                                           double pressure_kpa);
[[nodiscard]] double relative_humidity_from_humidity_ratio(double dry_bulb_c, double humidity_ratio,
                                                           double pressure_kpa);

// Dew point: saturation pressure at the dew point equals the vapour pressure (eq. 38),
// solved as the exact inverse of eq. 5/6 (not the eq. 39/40 fits).
[[nodiscard]] double dew_point_from_vapor_pressure_c(double vapor_pressure_kpa);
[[nodiscard]] double dew_point_from_humidity_ratio_c(double humidity_ratio, double pressure_kpa);
[[nodiscard]] double humidity_ratio_from_dew_point(double dew_point_c, double pressure_kpa);

// Wet-bulb (thermodynamic): eq. 33 when t* ≥ 0 °C, eq. 35 below.
[[nodiscard]] double humidity_ratio_from_wet_bulb(double dry_bulb_c, double wet_bulb_c,
                                                  double pressure_kpa);
[[nodiscard]] double wet_bulb_from_humidity_ratio_c(double dry_bulb_c, double humidity_ratio,
                                                    double pressure_kpa);

// --- Enthalpy, volume, density --------------------------------------------------------

// h = 1.006·t + W·(2501 + 1.86·t)  (eq. 32).
[[nodiscard]] constexpr double enthalpy_kj_per_kg(double dry_bulb_c, double humidity_ratio) {
  return 1.006 * dry_bulb_c + humidity_ratio * (2501.0 + 1.86 * dry_bulb_c);
}
// Eq. 32 solved for t.
[[nodiscard]] constexpr double dry_bulb_from_enthalpy_c(double enthalpy_kj_per_kg,
                                                        double humidity_ratio) {
  return (enthalpy_kj_per_kg - 2501.0 * humidity_ratio) / (1.006 + 1.86 * humidity_ratio);
}
// Eq. 32 solved for W; throws when the result would be negative.
[[nodiscard]] double humidity_ratio_from_enthalpy(double dry_bulb_c, double enthalpy_kj_per_kg);

// v = 0.287042·(t + 273.15)·(1 + 1.607858·W)/p  (eq. 26), m³ per kg dry air.
[[nodiscard]] double specific_volume_m3_per_kg(double dry_bulb_c, double humidity_ratio,
                                               double pressure_kpa);
// Moist-air density (1 + W)/v  (eq. 11), kg moist air per m³.
[[nodiscard]] double density_kg_per_m3(double dry_bulb_c, double humidity_ratio,
                                       double pressure_kpa);

// Degree of saturation μ = W/W_s  (eq. 12).
[[nodiscard]] double degree_of_saturation(double dry_bulb_c, double humidity_ratio,
                                          double pressure_kpa);

// --- Pressure and elevation -----------------------------------------------------------

// p = 101.325·(1 − 2.25577e-5·Z)^5.2559  (eq. 3), Z in metres.
[[nodiscard]] double standard_pressure_kpa(double elevation_m);
[[nodiscard]] double elevation_from_standard_pressure_m(double pressure_kpa);

// --- Range checks (throw RangeError naming the quantity and the allowed range) ----------

void check_dry_bulb(double dry_bulb_c, const char* what = "dry-bulb");
void check_pressure(double pressure_kpa, const char* what = "pressure");
void check_humidity_ratio(double humidity_ratio, double dry_bulb_c, double pressure_kpa,
                          const char* what = "humidity ratio");

// --- A complete state -----------------------------------------------------------------

// The independent variables that fix a moist-air state.
struct MoistAir {
  double dry_bulb_c = 0.0;
  double humidity_ratio = 0.0;
  double pressure_kpa = kStandardPressureKpa;
};

// Every property of a state, computed once.
struct Properties {
  double dry_bulb_c;
  double wet_bulb_c;
  double dew_point_c;
  double relative_humidity;
  double humidity_ratio;
  double enthalpy_kj_per_kg;
  double specific_volume_m3_per_kg;
  double density_kg_per_m3;
  double vapor_pressure_kpa;
  double pressure_kpa;
  double saturation_humidity_ratio;
  double degree_of_saturation;
};

// Validates the state (range, not supersaturated beyond rounding) and computes everything.
[[nodiscard]] Properties properties(const MoistAir& air);

// The ways a state is given in practice: dry-bulb plus one humidity input.
enum class HumidityInput { relative_humidity, wet_bulb, dew_point, humidity_ratio, enthalpy };

// Resolves dry-bulb + one humidity input to a state; throws InputError for impossible states
// (RH above 100 %, dew point or wet-bulb above dry-bulb, negative humidity ratio).
// `value` is SI: fraction, °C, kg/kg or kJ/kg.
[[nodiscard]] MoistAir state_from(double dry_bulb_c, HumidityInput kind, double value,
                                  double pressure_kpa);

}  // namespace limitline::psychro
