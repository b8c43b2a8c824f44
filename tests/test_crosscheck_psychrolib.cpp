// Cross-check of the psychrometric core against psychrolib 1.1.1 (npm package, pinned in
// tests/crosscheck/package-lock.json), a general-purpose implementation of the same ASHRAE
// Handbook—Fundamentals (2017) ch. 1 equations. The CTest fixture crosscheck_psychrolib_setup
// installs it and writes the reference states (tests/crosscheck/generate.js: fixed seed,
// −40…50 °C, 1–100 % RH, 60–110 kPa); this suite fails when that file is missing.
//
// Where the two implementations legitimately differ, the rows are set aside and counted, and
// the count is bounded so an exclusion can never swallow the check:
//  * psychrolib uses the ice formula (eq. 5) up to and including the triple point 0.01 °C,
//    the handbook (and limitline) only below 0 °C. A saturation pressure evaluated in
//    [0, 0.01] °C therefore differs by up to 0.07 % — a model choice, not an error.
//  * Eq. 35 (wet-bulb below freezing) and eq. 33 (above) do not meet at 0 °C: W(t*) jumps
//    down by the latent heat of fusion there, so for a band of humidity ratios at dry-bulbs
//    above freezing the handbook equations have two wet-bulb solutions, one on each side of
//    0 °C. Either is a correct answer of eq. 33/35; in that band we check that psychrolib's
//    answer is a root of our equations instead of demanding the same root.
#include <doctest/doctest.h>

#include <limitline/model/psychro.hpp>

#include <algorithm>
#include <charconv>
#include <cmath>
#include <fstream>
#include <string>
#include <string_view>
#include <vector>

namespace psy = limitline::psychro;

namespace {

// Columns written by tests/crosscheck/generate.js, in order.
struct Row {
  double t, rh, p_pa, z_m;
  double w, h_j, dew, wet, rh_round_trip, w_from_wet, w_from_dew, v, mu, p_std_pa;
  std::size_t line;
  double p() const { return p_pa / 1000.0; }
};
constexpr std::string_view kColumns =
    "dry_bulb_c,rh,pressure_pa,elevation_m,hum_ratio,enthalpy_j_per_kg,dew_point_c,wet_bulb_c,"
    "rh_round_trip,hum_ratio_from_wet_bulb,hum_ratio_from_dew_point,volume_m3_per_kg,"
    "degree_of_saturation,standard_pressure_pa";
constexpr std::size_t kMinRows = 10000;
// Excluded rows may not exceed this share of the file.
constexpr double kMaxExcludedShare = 0.01;

struct Reference {
  std::string meta;
  std::vector<Row> rows;
};

Reference load() {
  Reference ref;
  std::ifstream in(LIMITLINE_CROSSCHECK_CSV);
  REQUIRE_MESSAGE(in.good(), "missing " LIMITLINE_CROSSCHECK_CSV
                             ": run the CTest fixture crosscheck_psychrolib_setup");
  std::string line;
  REQUIRE(std::getline(in, ref.meta));
  REQUIRE(std::getline(in, line));
  REQUIRE(line == kColumns);
  std::size_t line_no = 2;
  while (std::getline(in, line)) {
    ++line_no;
    double v[14];
    const char* p = line.data();
    const char* end = line.data() + line.size();
    for (int i = 0; i < 14; ++i) {
      auto r = std::from_chars(p, end, v[i]);
      REQUIRE_MESSAGE(r.ec == std::errc(), "unreadable number at line ", line_no);
      p = r.ptr;
      if (i < 13) {
        REQUIRE_MESSAGE((p < end && *p == ','), "too few fields at line ", line_no);
        ++p;
      }
    }
    REQUIRE_MESSAGE(p == end, "too many fields at line ", line_no);
    ref.rows.push_back({v[0], v[1], v[2], v[3], v[4], v[5], v[6], v[7], v[8], v[9], v[10], v[11],
                        v[12], v[13], line_no});
  }
  return ref;
}

const Reference& reference() {
  static const Reference ref = load();
  return ref;
}

// psychrolib evaluates eq. 5 (ice) here, the handbook eq. 6 (water).
bool between_freezing_and_triple_point(double t_c) { return t_c >= 0.0 && t_c <= 0.01; }

double relative_difference(double a, double b) { return std::fabs(a - b) / std::fabs(b); }

void check_exclusions(std::size_t excluded, std::size_t total) {
  CHECK(static_cast<double>(excluded) <= kMaxExcludedShare * static_cast<double>(total));
}

}  // namespace

TEST_CASE("the reference file comes from psychrolib 1.1.1 and covers the required range") {
  const Reference& ref = reference();
  CHECK(ref.meta.find("psychrolib 1.1.1 ") != std::string::npos);
  REQUIRE(ref.rows.size() >= kMinRows);
  double t_lo = 1e9, t_hi = -1e9, rh_lo = 1e9, rh_hi = -1e9, p_lo = 1e9, p_hi = -1e9;
  for (const Row& r : ref.rows) {
    t_lo = std::min(t_lo, r.t), t_hi = std::max(t_hi, r.t);
    rh_lo = std::min(rh_lo, r.rh), rh_hi = std::max(rh_hi, r.rh);
    p_lo = std::min(p_lo, r.p()), p_hi = std::max(p_hi, r.p());
  }
  // The states spread over the whole requested box, not a corner of it.
  CHECK(t_lo >= -40.0);
  CHECK(t_lo < -39.0);
  CHECK(t_hi <= 50.0);
  CHECK(t_hi > 49.0);
  CHECK(rh_lo >= 0.01);
  CHECK(rh_lo < 0.02);
  CHECK(rh_hi <= 1.0);
  CHECK(rh_hi > 0.99);
  CHECK(p_lo >= 60.0);
  CHECK(p_lo < 61.0);
  CHECK(p_hi <= 110.0);
  CHECK(p_hi > 109.0);
}

TEST_CASE("humidity ratio and enthalpy from dry-bulb and RH agree to 1e-7 (psychrolib 1.1.1)") {
  const auto& rows = reference().rows;
  std::size_t excluded = 0, failures = 0;
  for (const Row& r : rows) {
    if (between_freezing_and_triple_point(r.t)) {
      ++excluded;
      continue;
    }
    const double w = psy::humidity_ratio_from_relative_humidity(r.t, r.rh, r.p());
    const double h = psy::enthalpy_kj_per_kg(r.t, w);
    const bool ok =
        relative_difference(w, r.w) <= 1e-7 && relative_difference(h * 1000.0, r.h_j) <= 1e-7;
    if (!ok && ++failures <= 5) {
      INFO("line ", r.line, ": t=", r.t, " rh=", r.rh, " p=", r.p());
      CHECK(w == doctest::Approx(r.w).epsilon(1e-7).scale(0));
      CHECK(h * 1000.0 == doctest::Approx(r.h_j).epsilon(1e-7).scale(0));
    }
  }
  CHECK(failures == 0);
  check_exclusions(excluded, rows.size());
}

TEST_CASE("relative humidity round trips (psychrolib 1.1.1)") {
  const auto& rows = reference().rows;
  std::size_t excluded = 0, failures = 0;
  for (const Row& r : rows) {
    // psychrolib's own round trip: its RH from its W gives the RH it started from.
    if (std::fabs(r.rh_round_trip - r.rh) > 1e-9 && ++failures <= 5)
      CHECK_MESSAGE(r.rh_round_trip == doctest::Approx(r.rh).epsilon(1e-9).scale(0), "line ",
                    r.line);
    if (between_freezing_and_triple_point(r.t)) {
      ++excluded;
      continue;
    }
    // Ours on psychrolib's humidity ratio gives back psychrolib's RH, and our own round trip.
    const double from_theirs = psy::relative_humidity_from_humidity_ratio(r.t, r.w, r.p());
    const double own = psy::relative_humidity_from_humidity_ratio(
        r.t, psy::humidity_ratio_from_relative_humidity(r.t, r.rh, r.p()), r.p());
    if ((relative_difference(from_theirs, r.rh) > 1e-7 || relative_difference(own, r.rh) > 1e-12) &&
        ++failures <= 5) {
      INFO("line ", r.line, ": t=", r.t, " rh=", r.rh, " p=", r.p());
      CHECK(from_theirs == doctest::Approx(r.rh).epsilon(1e-7).scale(0));
      CHECK(own == doctest::Approx(r.rh).epsilon(1e-12).scale(0));
    }
  }
  CHECK(failures == 0);
  check_exclusions(excluded, rows.size());
}

TEST_CASE("dew point from humidity ratio agrees within 0.002 K (psychrolib 1.1.1)") {
  const auto& rows = reference().rows;
  std::size_t excluded = 0, failures = 0;
  double worst = 0.0;
  for (const Row& r : rows) {
    const double ours = psy::dew_point_from_humidity_ratio_c(r.w, r.p());
    if (between_freezing_and_triple_point(ours) || between_freezing_and_triple_point(r.dew)) {
      ++excluded;
      continue;
    }
    worst = std::max(worst, std::fabs(ours - r.dew));
    if (std::fabs(ours - r.dew) > 0.002 && ++failures <= 5)
      CHECK_MESSAGE(std::fabs(ours - r.dew) <= 0.002, "line ", r.line, ": t=", r.t, " W=", r.w,
                    " p=", r.p(), " ours=", ours, " psychrolib=", r.dew);
  }
  MESSAGE("largest dew-point difference ", worst, " K over ", rows.size() - excluded, " states");
  CHECK(failures == 0);
  check_exclusions(excluded, rows.size());
}

TEST_CASE("wet-bulb from humidity ratio agrees within 0.002 K (psychrolib 1.1.1)") {
  const auto& rows = reference().rows;
  std::size_t excluded = 0, failures = 0, other_root = 0;
  double worst = 0.0;
  for (const Row& r : rows) {
    const double ours = psy::wet_bulb_from_humidity_ratio_c(r.t, r.w, r.p());
    if (between_freezing_and_triple_point(ours) || between_freezing_and_triple_point(r.wet)) {
      ++excluded;
      continue;
    }
    const double diff = std::fabs(ours - r.wet);
    if (diff <= 0.002) {
      worst = std::max(worst, diff);
      continue;
    }
    // Two roots (see the top of this file) exist only for dry-bulbs above freezing, with W
    // between eq. 33 at t* = 0 and eq. 35 just below it.
    bool two_roots = false, theirs_is_root = false;
    if (r.t > 0.0) {
      const double w_water = psy::humidity_ratio_from_wet_bulb(r.t, 0.0, r.p());
      const double w_ice = psy::humidity_ratio_from_wet_bulb(r.t, -1e-12, r.p());
      two_roots = r.w >= std::min(w_water, w_ice) && r.w <= std::max(w_water, w_ice);
      // psychrolib's answer is a root of our eq. 33/35 when W(t*) crosses W within 0.002 K of
      // it, on its own side of 0 °C.
      const double lo = r.wet - 0.002;
      const double hi = r.wet < 0.0 ? std::min(r.wet + 0.002, -1e-12) : r.wet + 0.002;
      theirs_is_root = psy::humidity_ratio_from_wet_bulb(r.t, lo, r.p()) <= r.w &&
                       psy::humidity_ratio_from_wet_bulb(r.t, hi, r.p()) >= r.w;
    }
    const bool ours_is_root =
        relative_difference(psy::humidity_ratio_from_wet_bulb(r.t, ours, r.p()), r.w) <= 1e-6;
    if (two_roots && theirs_is_root && ours_is_root && (ours < 0.0) != (r.wet < 0.0)) {
      ++other_root;
      continue;
    }
    if (++failures <= 5)
      CHECK_MESSAGE(diff <= 0.002, "line ", r.line, ": t=", r.t, " W=", r.w, " p=", r.p(),
                    " ours=", ours, " psychrolib=", r.wet);
  }
  MESSAGE("largest wet-bulb difference ", worst, " K; ", other_root,
          " states where eq. 33/35 have two roots and psychrolib took the other one");
  CHECK(failures == 0);
  check_exclusions(excluded + other_root, rows.size());
}

TEST_CASE("humidity ratio from wet-bulb and from dew point agree to 1e-7 (psychrolib 1.1.1)") {
  const auto& rows = reference().rows;
  std::size_t excluded = 0, failures = 0;
  for (const Row& r : rows) {
    if (between_freezing_and_triple_point(r.wet) || between_freezing_and_triple_point(r.dew)) {
      ++excluded;
      continue;
    }
    const double from_wet = psy::humidity_ratio_from_wet_bulb(r.t, r.wet, r.p());
    const double from_dew = psy::humidity_ratio_from_dew_point(r.dew, r.p());
    if ((relative_difference(from_wet, r.w_from_wet) > 1e-7 ||
         relative_difference(from_dew, r.w_from_dew) > 1e-7) &&
        ++failures <= 5) {
      INFO("line ", r.line, ": t=", r.t, " wet-bulb=", r.wet, " dew point=", r.dew);
      CHECK(from_wet == doctest::Approx(r.w_from_wet).epsilon(1e-7).scale(0));
      CHECK(from_dew == doctest::Approx(r.w_from_dew).epsilon(1e-7).scale(0));
    }
  }
  CHECK(failures == 0);
  check_exclusions(excluded, rows.size());
}

TEST_CASE("specific volume, degree of saturation and standard pressure agree (psychrolib 1.1.1)") {
  const auto& rows = reference().rows;
  std::size_t excluded = 0, failures = 0;
  for (const Row& r : rows) {
    const double p_std = psy::standard_pressure_kpa(r.z_m) * 1000.0;
    const double v = psy::specific_volume_m3_per_kg(r.t, r.w, r.p());
    bool ok = relative_difference(p_std, r.p_std_pa) <= 1e-7 && relative_difference(v, r.v) <= 1e-7;
    if (between_freezing_and_triple_point(r.t)) {
      ++excluded;  // W_s at the dry-bulb comes from different fits
    } else {
      ok = ok && relative_difference(psy::degree_of_saturation(r.t, r.w, r.p()), r.mu) <= 1e-7;
    }
    if (!ok && ++failures <= 5) {
      INFO("line ", r.line, ": t=", r.t, " W=", r.w, " p=", r.p(), " z=", r.z_m);
      CHECK(p_std == doctest::Approx(r.p_std_pa).epsilon(1e-7).scale(0));
      CHECK(v == doctest::Approx(r.v).epsilon(1e-7).scale(0));
      CHECK(psy::degree_of_saturation(r.t, r.w, r.p()) ==
            doctest::Approx(r.mu).epsilon(1e-7).scale(0));
    }
  }
  CHECK(failures == 0);
  check_exclusions(excluded, rows.size());
}
