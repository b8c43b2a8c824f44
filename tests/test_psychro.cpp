// The psychrometric core against published values, its own inverse pairs, and its range
// checks. Sources are named beside each check. "ASHRAE HoF" is ASHRAE Handbook—Fundamentals
// (2017, SI), chapter 1; "IAPWS-95" the IAPWS formulation for ordinary water substance as
// tabulated in steam tables (e.g. the NIST Chemistry WebBook). The document was not at hand
// while writing this file: values marked "from memory" were recalled, not copied.
#include <doctest/doctest.h>

#include <limitline/model/psychro.hpp>
#include <limitline/model/units.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <functional>
#include <limits>
#include <string>

namespace psy = limitline::psychro;
namespace units = limitline::units;
using limitline::InputError;
using limitline::RangeError;

namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
constexpr double kInf = std::numeric_limits<double>::infinity();
constexpr double kSea = psy::kStandardPressureKpa;

// |got − want| ≤ tol, printing both at full precision when it is not.
void check_near(double got, double want, double tol, const std::string& what = {}) {
  INFO(what, " got ", fmt::format("{:.10g}", got), " want ", fmt::format("{:.10g}", want),
       " tolerance ", tol);
  CHECK(std::fabs(got - want) <= tol);
}
void check_relative(double got, double want, double rel, const std::string& what = {}) {
  check_near(got, want, rel * std::fabs(want), what);
}

// Throws RangeError and the message names `needle`.
void check_range_error(const std::function<void()>& f, const std::string& needle) {
  try {
    f();
    FAIL("no RangeError (expected one mentioning '", needle, "')");
  } catch (const RangeError& e) {
    INFO("message: ", std::string(e.what()));
    CHECK(std::string(e.what()).find(needle) != std::string::npos);
  }
}

}  // namespace

// --- Saturation pressure (eq. 5, eq. 6) ----------------------------------------------------

TEST_CASE("saturation pressure over water matches IAPWS-95 steam tables within 300 ppm") {
  // Tolerance: ASHRAE HoF ch. 1 states eq. 5/6 (Hyland–Wexler) agree with the IAPWS
  // formulations to about 300 ppm (from memory).
  struct Point {
    double t_c, p_kpa;
  };
  // IAPWS-95 saturation pressures (steam tables, from memory).
  const Point iapws[] = {
      {0.01, 0.611655},  // triple point
      {10.0, 1.2282},   {20.0, 2.3392},    {25.0, 3.1699}, {30.0, 4.2470},  {40.0, 7.3851},
      {50.0, 12.352},   {60.0, 19.946},    {80.0, 47.414}, {100.0, 101.42}, {150.0, 476.16},
      {200.0, 1554.9},  {99.974, 101.325},  // normal boiling point on ITS-90
  };
  for (const Point& pt : iapws)
    check_relative(psy::saturation_pressure_kpa(pt.t_c), pt.p_kpa, 300e-6,
                   fmt::format("IAPWS-95 at {} °C", pt.t_c));
  // IAPWS-IF97 computer-program verification value, T = 300 K: p_s = 3.53658941 kPa
  // (IAPWS-IF97 release, saturation-pressure verification table; from memory).
  check_relative(psy::saturation_pressure_kpa(300.0 - 273.15), 3.53658941, 300e-6, "IF97 300 K");
}

TEST_CASE("saturation pressure matches the ASHRAE HoF ch. 1 saturation table (Table 3)") {
  struct Point {
    double t_c, p_kpa, printed_step;  // last printed digit: half of it is rounding
  };
  // ASHRAE HoF 2017 ch. 1 Table 3, p_ws in kPa (over ice below 0 °C; from memory).
  const Point table3[] = {
      {-60.0, 0.00108, 1e-5}, {-40.0, 0.01285, 1e-5}, {-20.0, 0.10326, 1e-5},
      {-10.0, 0.25990, 1e-5}, {5.0, 0.87258, 1e-5},   {15.0, 1.7058, 1e-4},
      {20.0, 2.3393, 1e-4},   {35.0, 5.6290, 1e-4},
  };
  for (const Point& pt : table3)
    check_near(psy::saturation_pressure_kpa(pt.t_c), pt.p_kpa,
               300e-6 * pt.p_kpa + 0.5 * pt.printed_step, fmt::format("Table 3 at {} °C", pt.t_c));
}

TEST_CASE("saturation pressure at 0 °C: ice below, water from 0 °C, nearly continuous") {
  // IAPWS: over ice at 273.15 K 0.611154 kPa, over water 0.611213 kPa (from memory).
  check_relative(psy::saturation_pressure_kpa(-1e-9), 0.611154, 300e-6, "ice at 0 °C");
  check_relative(psy::saturation_pressure_kpa(0.0), 0.611213, 300e-6, "water at 0 °C");
  // The switch is at 0 °C (ASHRAE HoF ch. 1, eq. 5 "−100 to 0 °C", eq. 6 "0 to 200 °C").
  CHECK(psy::saturation_pressure_kpa(0.0) > psy::saturation_pressure_kpa(-1e-9));
  check_relative(psy::saturation_pressure_kpa(-1e-9), psy::saturation_pressure_kpa(0.0), 2e-4,
                 "jump at 0 °C");
}

TEST_CASE("slope of ln p_ws: matches the fit's own derivative and Clausius–Clapeyron") {
  for (double t : {-80.0, -30.0, -5.0, 5.0, 20.0, 45.0, 90.0, 180.0}) {
    const double h = 1e-4;
    const double numeric = (std::log(psy::saturation_pressure_kpa(t + h)) -
                            std::log(psy::saturation_pressure_kpa(t - h))) /
                           (2 * h);
    check_relative(psy::saturation_pressure_log_slope_per_k(t), numeric, 1e-7,
                   fmt::format("slope at {} °C", t));
  }
  // Clausius–Clapeyron for an ideal vapour, d ln p/dT = L/(R_v T²), with L = 2453.5 kJ/kg at
  // 20 °C (IAPWS-95 steam tables, from memory) and R_v = 0.461526 kJ/(kg·K) (ASHRAE HoF ch. 1):
  // agreement to 0.5 % (the ideal-vapour assumption costs about 0.1 %).
  const double T = 293.15;
  check_relative(psy::saturation_pressure_log_slope_per_k(20.0), 2453.5 / (0.461526 * T * T), 5e-3,
                 "Clausius–Clapeyron at 20 °C");
}

TEST_CASE("saturation pressure outside -100..200 °C is a RangeError, never NaN") {
  CHECK_NOTHROW(psy::saturation_pressure_kpa(-100.0));
  CHECK_NOTHROW(psy::saturation_pressure_kpa(200.0));
  check_range_error([] { (void)psy::saturation_pressure_kpa(-100.001); }, "-100 °C to 200 °C");
  check_range_error([] { (void)psy::saturation_pressure_kpa(200.001); }, "-100 °C to 200 °C");
  check_range_error([] { (void)psy::saturation_pressure_kpa(kNaN); }, "dry-bulb");
  check_range_error([] { (void)psy::saturation_pressure_kpa(kInf); }, "dry-bulb");
  check_range_error([] { (void)psy::saturation_pressure_kpa(-kInf); }, "dry-bulb");
  check_range_error([] { (void)psy::saturation_pressure_log_slope_per_k(250.0); }, "250");
}

// --- Saturation humidity ratio (eq. 23) ---------------------------------------------------

TEST_CASE("saturation humidity ratio at standard pressure against ASHRAE HoF ch. 1 Table 2") {
  // ASHRAE HoF ch. 1 Table 2, W_s at 101.325 kPa (from memory). The table includes the
  // enhancement factor f_s ≈ 1.004 of real moist air, which eq. 23 (perfect gases) leaves
  // out, so the two agree to about 0.5 %, eq. 23 being the lower.
  struct Point {
    double t_c, ws;
  };
  for (const Point& pt : {Point{0.0, 0.003789}, Point{10.0, 0.007661}, Point{20.0, 0.014758}}) {
    const double ws = psy::saturation_humidity_ratio(pt.t_c, kSea);
    check_relative(ws, pt.ws, 6e-3, fmt::format("Table 2 at {} °C", pt.t_c));
    CHECK(ws < pt.ws);
  }
}

TEST_CASE("saturation humidity ratio is refused at and above the boiling point") {
  // Water boils at 99.974 °C at 101.325 kPa (IAPWS-95, from memory): saturated moist air
  // cannot exist above it.
  CHECK(psy::saturation_humidity_ratio(99.0, kSea) > 10.0);
  check_range_error([] { (void)psy::saturation_humidity_ratio(100.0, kSea); }, "boiling point");
  check_range_error([] { (void)psy::saturation_humidity_ratio(20.0, kNaN); }, "pressure");
}

// --- Humidity ratio, vapour pressure, relative humidity (eq. 20, 22, 24) ------------------

TEST_CASE("humidity ratio <-> vapour pressure round trip") {
  for (double p : {60.0, 84.556, kSea, 110.0})
    for (double pw : {0.0, 1e-5, 0.1, 1.0, 3.0, 7.4, 19.9}) {
      const double w = psy::humidity_ratio_from_vapor_pressure(pw, p);
      check_near(psy::vapor_pressure_from_humidity_ratio(w, p), pw, 1e-12 * (1 + pw));
    }
  check_range_error([] { (void)psy::humidity_ratio_from_vapor_pressure(-0.1, kSea); }, "-0.1");
  check_range_error([] { (void)psy::humidity_ratio_from_vapor_pressure(kSea, kSea); }, "total");
  check_range_error([] { (void)psy::vapor_pressure_from_humidity_ratio(-0.001, kSea); }, "-0.001");
  check_range_error([] { (void)psy::vapor_pressure_from_humidity_ratio(kNaN, kSea); }, "humidity");
  check_range_error([] { (void)psy::vapor_pressure_from_humidity_ratio(0.01, kNaN); }, "pressure");
  check_range_error([] { (void)psy::vapor_pressure_from_humidity_ratio(0.01, 0.0); }, "pressure");
}

TEST_CASE("relative humidity <-> humidity ratio round trip") {
  for (double p : {60.0, kSea, 110.0})
    for (double t = -90.0; t <= 80.0; t += 7.5)
      for (double rh : {0.0, 0.01, 0.2, 0.5, 0.85, 1.0}) {
        const double w = psy::humidity_ratio_from_relative_humidity(t, rh, p);
        check_near(psy::relative_humidity_from_humidity_ratio(t, w, p), rh, 1e-12,
                   fmt::format("t={} rh={} p={}", t, rh, p));
      }
}

TEST_CASE("relative humidity above 100 % or below 0 % is a RangeError naming the value") {
  check_range_error([] { (void)psy::humidity_ratio_from_relative_humidity(24.0, 1.2, kSea); },
                    "relative humidity 120 %");
  check_range_error([] { (void)psy::humidity_ratio_from_relative_humidity(24.0, 1.2, kSea); },
                    "0 % to 100 %");
  check_range_error([] { (void)psy::humidity_ratio_from_relative_humidity(24.0, -0.01, kSea); },
                    "-1 %");
  check_range_error([] { (void)psy::humidity_ratio_from_relative_humidity(24.0, kNaN, kSea); },
                    "relative humidity");
  check_range_error([] { (void)psy::relative_humidity_from_humidity_ratio(24.0, -0.002, kSea); },
                    "-0.002");
  check_range_error([] { (void)psy::relative_humidity_from_humidity_ratio(24.0, 0.009, kNaN); },
                    "pressure");
}

// --- Dew point (eq. 38 with the exact inverse of eq. 5/6) ---------------------------------

TEST_CASE("dew point <-> humidity ratio round trip over the whole range") {
  for (double p : {60.0, kSea, 110.0})
    for (double td = -99.0; td <= 85.0; td += 0.73) {
      const double w = psy::humidity_ratio_from_dew_point(td, p);
      check_near(psy::dew_point_from_humidity_ratio_c(w, p), td, 1e-6,
                 fmt::format("td={} p={}", td, p));
    }
  // The ends of the fits, and both sides of the 0 °C junction.
  for (double td : {-100.0, -1e-6, 0.0, 1e-6, 150.0, 200.0})
    check_near(psy::dew_point_from_vapor_pressure_c(psy::saturation_pressure_kpa(td)), td, 1e-6,
               fmt::format("td={}", td));
}

TEST_CASE("dew point is the exact inverse of eq. 5/6 within 2e-8 K (against bisection)") {
  // Not the eq. 39/40 regressions: the inverse of the saturation-pressure fit itself, here
  // found by plain bisection on saturation_pressure_kpa() over the whole range.
  const double p_lo = psy::saturation_pressure_kpa(-100.0),
               p_hi = psy::saturation_pressure_kpa(200.0);
  double worst = 0.0;
  for (int i = 0; i <= 20000; ++i) {
    const double pw = p_lo * std::pow(p_hi / p_lo, i / 20000.0);
    double a = -100.0, b = 200.0;
    while (b - a > 1e-12) {
      const double m = 0.5 * (a + b);
      (psy::saturation_pressure_kpa(m) < pw ? a : b) = m;
    }
    worst = std::max(worst, std::fabs(psy::dew_point_from_vapor_pressure_c(pw) - 0.5 * (a + b)));
  }
  INFO("largest difference ", worst, " K");
  CHECK(worst <= 2e-8);
}

TEST_CASE("dew point of steam-table saturation pressures") {
  // IAPWS-95 (from memory): p_s(20 °C) = 2.3392 kPa, p_s(40 °C) = 7.3851 kPa. At 300 ppm in
  // pressure the dew point may be off by about 300e-6/(d ln p/dT) ≈ 0.005 K.
  check_near(psy::dew_point_from_vapor_pressure_c(2.3392), 20.0, 0.005, "IAPWS-95 20 °C");
  check_near(psy::dew_point_from_vapor_pressure_c(7.3851), 40.0, 0.006, "IAPWS-95 40 °C");
}

TEST_CASE("a vapour pressure between the ice and water fits at 0 °C has its dew point at 0 °C") {
  const double ice = psy::saturation_pressure_kpa(-1e-12),
               water = psy::saturation_pressure_kpa(0.0);
  CHECK(psy::dew_point_from_vapor_pressure_c(0.5 * (ice + water)) == 0.0);
}

TEST_CASE("dew point outside the fits is a RangeError") {
  check_range_error([] { (void)psy::dew_point_from_vapor_pressure_c(0.0); }, "dry air");
  check_range_error([] { (void)psy::dew_point_from_vapor_pressure_c(1e-7); }, "no dew point");
  check_range_error([] { (void)psy::dew_point_from_vapor_pressure_c(2000.0); }, "no dew point");
  check_range_error([] { (void)psy::dew_point_from_vapor_pressure_c(kNaN); }, "no dew point");
  check_range_error([] { (void)psy::dew_point_from_humidity_ratio_c(-1e-4, kSea); }, "-0.0001");
  check_range_error([] { (void)psy::humidity_ratio_from_dew_point(-120.0, kSea); }, "-100 °C");
}

// --- Wet-bulb (eq. 33 above freezing, eq. 35 below) ---------------------------------------

TEST_CASE("wet-bulb <-> humidity ratio round trip") {
  for (double p : {60.0, kSea, 110.0})
    for (double t = -40.0; t <= 60.0; t += 2.5)
      for (double depression : {0.0, 0.3, 1.0, 3.0, 6.0, 12.0, 20.0}) {
        const double wb = t - depression;
        double w = 0.0;
        try {
          w = psy::humidity_ratio_from_wet_bulb(t, wb, p);
        } catch (const RangeError&) {
          continue;  // wet-bulb too low for this dry-bulb: no air that dry exists
        }
        const double back = psy::wet_bulb_from_humidity_ratio_c(t, w, p);
        INFO(fmt::format("t={} wb={} p={} -> {:.9f}", t, wb, p, back));
        // Always a root of eq. 33/35 ...
        check_relative(psy::humidity_ratio_from_wet_bulb(t, back, p), w, 1e-7);
        // ... and the one we started from, unless eq. 33/35 have two roots for this W (the
        // jump at t* = 0 °C; see the next test case). The grid starts only at 0 or ≥ 0.3 K
        // below 0 °C, outside the band where that can happen.
        check_near(back, wb, 1e-5);
      }
}

TEST_CASE("wet-bulb of saturated air is the dry-bulb") {
  for (double t : {-30.0, -1.0, 0.0, 5.0, 24.0, 50.0}) {
    const double ws = psy::saturation_humidity_ratio(t, kSea);
    check_near(psy::wet_bulb_from_humidity_ratio_c(t, ws, kSea), t, 1e-6, fmt::format("t={}", t));
  }
}

TEST_CASE("eq. 33 and eq. 35 do not meet at t* = 0 °C: the solver returns a root either way") {
  // ASHRAE HoF ch. 1: eq. 35 (ice on the wick) replaces eq. 33 below freezing; the heat of
  // fusion makes W(t*) jump down at 0 °C, so W between the two limits has two roots.
  const double t = 5.0;
  const double below = psy::humidity_ratio_from_wet_bulb(t, -1e-12, kSea);
  const double above = psy::humidity_ratio_from_wet_bulb(t, 0.0, kSea);
  REQUIRE(below > above);
  const double w = 0.5 * (below + above);
  const double wb = psy::wet_bulb_from_humidity_ratio_c(t, w, kSea);
  CHECK(std::fabs(wb) < 1.0);
  check_relative(psy::humidity_ratio_from_wet_bulb(t, wb, kSea), w, 1e-7);
}

TEST_CASE("wet-bulb above dry-bulb, or too low for any humidity, is a RangeError") {
  check_range_error([] { (void)psy::humidity_ratio_from_wet_bulb(20.0, 21.0, kSea); },
                    "wet-bulb 21 °C is above dry-bulb 20 °C");
  check_range_error([] { (void)psy::humidity_ratio_from_wet_bulb(40.0, 5.0, kSea); }, "negative");
  check_range_error([] { (void)psy::humidity_ratio_from_wet_bulb(40.0, kNaN, kSea); }, "wet-bulb");
  check_range_error([] { (void)psy::wet_bulb_from_humidity_ratio_c(20.0, -0.001, kSea); },
                    "-0.001");
  check_range_error([] { (void)psy::wet_bulb_from_humidity_ratio_c(20.0, 0.05, kSea); },
                    "above saturation");
}

// --- Enthalpy, volume, density, degree of saturation (eq. 32, 26, 11, 12) -----------------

TEST_CASE("enthalpy <-> dry-bulb and enthalpy <-> humidity ratio round trips") {
  for (double t = -60.0; t <= 90.0; t += 3.7)
    for (double w : {0.0, 0.0005, 0.004, 0.0093, 0.02, 0.05}) {
      const double h = psy::enthalpy_kj_per_kg(t, w);
      check_near(psy::dry_bulb_from_enthalpy_c(h, w), t, 1e-10, fmt::format("t={} w={}", t, w));
      check_near(psy::humidity_ratio_from_enthalpy(t, h), w, 1e-13, fmt::format("t={} w={}", t, w));
    }
  // Dry air at 0 °C is the zero of the SI datum (ASHRAE HoF ch. 1, eq. 32).
  CHECK(psy::enthalpy_kj_per_kg(0.0, 0.0) == 0.0);
  check_range_error([] { (void)psy::humidity_ratio_from_enthalpy(30.0, 20.0); },
                    "below that of dry air");
}

TEST_CASE("specific volume and density of dry and standard air") {
  // Dry air at 0 °C and 101.325 kPa: v = 0.7738 m³/kg (ASHRAE HoF ch. 1 Table 2, from memory).
  check_near(psy::specific_volume_m3_per_kg(0.0, 0.0, kSea), 0.7738, 0.00005, "Table 2, 0 °C");
  // Standard air: dry, 20 °C, 101.325 kPa, 1.204 kg/m³ (ASHRAE HoF ch. 1, from memory).
  check_near(psy::density_kg_per_m3(20.0, 0.0, kSea), 1.204, 0.0005, "standard air");
  // Density counts the water too: (1 + W)/v (eq. 11).
  const double v = psy::specific_volume_m3_per_kg(30.0, 0.015, 90.0);
  check_relative(psy::density_kg_per_m3(30.0, 0.015, 90.0), 1.015 / v, 1e-14);
  check_range_error([] { (void)psy::specific_volume_m3_per_kg(20.0, 0.01, 0.0); }, "pressure");
  check_range_error([] { (void)psy::specific_volume_m3_per_kg(kNaN, 0.01, kSea); }, "dry-bulb");
  check_range_error([] { (void)psy::density_kg_per_m3(20.0, -0.01, kSea); }, "-0.01");
}

TEST_CASE("degree of saturation and relative humidity obey their exact relation") {
  // φ = μ / (1 − (1 − μ)·p_ws/p)  (ASHRAE HoF ch. 1, relation of φ and μ for perfect gases;
  // eq. 25 of the 2009 edition, from memory).
  for (double t : {-20.0, 5.0, 24.0, 45.0})
    for (double rh : {0.1, 0.5, 0.9, 1.0}) {
      const double w = psy::humidity_ratio_from_relative_humidity(t, rh, 90.0);
      const double mu = psy::degree_of_saturation(t, w, 90.0);
      const double ratio = psy::saturation_pressure_kpa(t) / 90.0;
      check_relative(mu / (1.0 - (1.0 - mu) * ratio), rh, 1e-12, fmt::format("t={} rh={}", t, rh));
    }
  check_range_error([] { (void)psy::degree_of_saturation(20.0, kNaN, kSea); }, "humidity ratio");
}

// --- Pressure and elevation (eq. 3) -------------------------------------------------------

TEST_CASE("standard pressure matches ASHRAE HoF ch. 1 Table 1 (standard atmosphere)") {
  struct Point {
    double z_m, p_kpa;
  };
  // ASHRAE HoF ch. 1 Table 1 (from memory).
  const Point table1[] = {{-500, 107.478}, {0, 101.325},   {500, 95.461},  {1000, 89.875},
                          {1500, 84.556},  {2000, 79.495}, {3000, 70.108}, {5000, 54.020},
                          {8000, 35.600},  {10000, 26.436}};
  for (const Point& pt : table1)
    check_near(psy::standard_pressure_kpa(pt.z_m), pt.p_kpa, 0.0015,
               fmt::format("Table 1 at {} m", pt.z_m));
  // IP: 14.696 psia at sea level, 12.228 psia at 5000 ft (ASHRAE HoF IP ch. 1 Table 1,
  // from memory).
  check_near(psy::standard_pressure_kpa(0.0) / 6.894757293, 14.696, 0.0005, "sea level");
  check_near(psy::standard_pressure_kpa(5000 * 0.3048) / 6.894757293, 12.228, 0.001, "5000 ft");
}

TEST_CASE("elevation <-> standard pressure round trip, and range errors") {
  for (double z = -500.0; z <= 11000.0; z += 250.0)
    check_near(psy::elevation_from_standard_pressure_m(psy::standard_pressure_kpa(z)), z, 1e-6,
               fmt::format("z={}", z));
  check_range_error([] { (void)psy::standard_pressure_kpa(-600.0); }, "-500 m to 11000 m");
  check_range_error([] { (void)psy::standard_pressure_kpa(12000.0); }, "12000");
  check_range_error([] { (void)psy::standard_pressure_kpa(kNaN); }, "elevation");
  check_range_error([] { (void)psy::elevation_from_standard_pressure_m(150.0); }, "150");
  check_range_error([] { (void)psy::elevation_from_standard_pressure_m(kNaN); }, "pressure");
}

// --- Complete states ----------------------------------------------------------------------

TEST_CASE("ASHRAE HoF ch. 1 worked example: 40 °C dry-bulb, 20 °C wet-bulb, 101.325 kPa") {
  // Answers of the handbook example (from memory): W = 0.00640 kg/kg, h = 56.7 kJ/kg,
  // dew point 7.4 °C, φ = 14 %, v = 0.896 m³/kg. Tolerances are half a unit of the
  // printed digit.
  const auto air = psy::state_from(40.0, psy::HumidityInput::wet_bulb, 20.0, kSea);
  const auto p = psy::properties(air);
  check_near(p.humidity_ratio, 0.00640, 0.000005, "W");
  check_near(p.enthalpy_kj_per_kg, 56.7, 0.05, "h");
  check_near(p.dew_point_c, 7.4, 0.05, "dew point");
  check_near(p.relative_humidity, 0.14, 0.005, "RH");
  check_near(p.specific_volume_m3_per_kg, 0.896, 0.0005, "v");
  check_near(p.wet_bulb_c, 20.0, 1e-5, "wet-bulb back");
}

TEST_CASE("75 °F / 50 % RH: 28.1 Btu/lb at sea level, 30.7 Btu/lb at about 6000 ft") {
  const double t = units::celsius_from_fahrenheit(75.0);
  auto h_ip = [&](double pressure_kpa) {
    const auto a = psy::state_from(t, psy::HumidityInput::relative_humidity, 0.5, pressure_kpa);
    return units::enthalpy_ip_from_si(psy::properties(a).enthalpy_kj_per_kg);
  };
  // 75 °F / 50 % at sea level ≈ 28.1 Btu/lb (ASHRAE psychrometric chart no. 1; the basis of
  // the 28 Btu/lb fixed-enthalpy high-limit of ASHRAE 90.1 Table 6.5.1.1.3; from memory).
  check_near(h_ip(kSea), 28.1, 0.05, "sea level");
  // ASHRAE 90.1 (2010 onwards) Table 6.5.1.1.3 footnote: at altitudes substantially different
  // from sea level set the fixed-enthalpy limit to the enthalpy at 75 °F and 50 % RH, "at
  // approximately 6000 ft elevation ... approximately 30.7 Btu/lb" (from memory).
  check_near(h_ip(psy::standard_pressure_kpa(6000 * 0.3048)), 30.7, 0.05, "6000 ft");
}

TEST_CASE("IP enthalpy via the datum shift equals the IP form of eq. 32") {
  // ASHRAE HoF (IP) ch. 1 eq. 32: h = 0.240·t + W·(1061 + 0.444·t), Btu/lb, t in °F
  // (from memory). The SI form with the 7.68 Btu/lb datum shift agrees within 0.05 Btu/lb
  // over the HVAC range (the two editions round their coefficients separately).
  for (double tf = -20.0; tf <= 120.0; tf += 10.0)
    for (double w : {0.0, 0.005, 0.01, 0.02}) {
      const double si = psy::enthalpy_kj_per_kg(units::celsius_from_fahrenheit(tf), w);
      check_near(units::enthalpy_ip_from_si(si), 0.240 * tf + w * (1061.0 + 0.444 * tf), 0.05,
                 fmt::format("t={} °F W={}", tf, w));
    }
}

TEST_CASE("every humidity input gives back the same state") {
  for (double p : {70.0, kSea})
    for (double t : {-25.0, 3.0, 24.0, 38.0}) {
      const auto ref =
          psy::properties(psy::state_from(t, psy::HumidityInput::relative_humidity, 0.45, p));
      using H = psy::HumidityInput;
      const std::pair<H, double> inputs[] = {{H::wet_bulb, ref.wet_bulb_c},
                                             {H::dew_point, ref.dew_point_c},
                                             {H::humidity_ratio, ref.humidity_ratio},
                                             {H::enthalpy, ref.enthalpy_kj_per_kg}};
      for (const auto& [kind, value] : inputs) {
        const auto a = psy::state_from(t, kind, value, p);
        check_relative(a.humidity_ratio, ref.humidity_ratio, 1e-7,
                       fmt::format("t={} p={} input {}", t, p, static_cast<int>(kind)));
      }
    }
}

TEST_CASE("properties of saturated air: dew point = wet-bulb = dry-bulb, RH = μ = 1") {
  const auto p =
      psy::properties(psy::state_from(22.0, psy::HumidityInput::relative_humidity, 1.0, kSea));
  check_near(p.dew_point_c, 22.0, 1e-6);
  check_near(p.wet_bulb_c, 22.0, 1e-6);
  check_near(p.relative_humidity, 1.0, 1e-12);
  check_near(p.degree_of_saturation, 1.0, 1e-12);
}

TEST_CASE("impossible states are RangeErrors (InputErrors) naming value and limit") {
  using H = psy::HumidityInput;
  check_range_error([] { (void)psy::state_from(24.0, H::relative_humidity, 1.2, kSea); }, "120 %");
  check_range_error([] { (void)psy::state_from(24.0, H::dew_point, 25.0, kSea); },
                    "dew point 25 °C is above dry-bulb 24 °C");
  check_range_error([] { (void)psy::state_from(24.0, H::wet_bulb, 24.5, kSea); },
                    "wet-bulb 24.5 °C is above dry-bulb 24 °C");
  check_range_error([] { (void)psy::state_from(24.0, H::humidity_ratio, -0.001, kSea); },
                    "0 or more");
  check_range_error([] { (void)psy::state_from(24.0, H::humidity_ratio, 0.03, kSea); },
                    "above saturation");
  check_range_error([] { (void)psy::state_from(24.0, H::enthalpy, 10.0, kSea); },
                    "below that of dry air");
  check_range_error([] { (void)psy::state_from(250.0, H::relative_humidity, 0.5, kSea); },
                    "-100 °C to 200 °C");
  check_range_error([] { (void)psy::state_from(24.0, H::relative_humidity, 0.5, 5.0); },
                    "10 kPa to 200 kPa");
  check_range_error([] { (void)psy::properties({24.0, kNaN, kSea}); }, "humidity ratio");
  check_range_error([] { (void)psy::properties({kNaN, 0.01, kSea}); }, "dry-bulb");
  // RangeError is an InputError: the front end maps both to exit code 2.
  CHECK_THROWS_AS(psy::state_from(24.0, H::relative_humidity, 1.2, kSea), InputError);
}

TEST_CASE("no property is ever NaN or infinite over a dense sweep of valid states") {
  for (double p : {10.0, 60.0, kSea, 200.0})
    for (double t = -100.0; t <= 90.0; t += 4.75)
      for (double rh : {0.0, 0.001, 0.3, 0.7, 1.0}) {
        psy::Properties r{};
        try {
          r = psy::properties(psy::state_from(t, psy::HumidityInput::relative_humidity, rh, p));
        } catch (const RangeError& e) {
          // Refused only where the model has no answer: boiling at this pressure, or no dew
          // point within −100…200 °C (dry air, or vapour too thin at the cold end).
          INFO(std::string(e.what()));
          const double pws = psy::saturation_pressure_kpa(t);
          CHECK((pws >= p || rh * pws < psy::saturation_pressure_kpa(-100.0)));
          continue;
        }
        const double all[] = {r.dry_bulb_c,
                              r.wet_bulb_c,
                              r.dew_point_c,
                              r.relative_humidity,
                              r.humidity_ratio,
                              r.enthalpy_kj_per_kg,
                              r.specific_volume_m3_per_kg,
                              r.density_kg_per_m3,
                              r.vapor_pressure_kpa,
                              r.pressure_kpa,
                              r.saturation_humidity_ratio,
                              r.degree_of_saturation};
        for (double v : all) CHECK(std::isfinite(v));
        CHECK(r.dew_point_c <= r.wet_bulb_c + 1e-6);
        CHECK(r.wet_bulb_c <= r.dry_bulb_c);
      }
}
