#pragma once
// Generates an invented trend log from the model: a controller running the unit file's first
// strategy on its own (rounded) readings, the damper rule of airside::choose, and mixing of the
// true outdoor air. Faults can be injected over a time window. The committed
// examples/trend-office.csv is this generator's output for examples/audit-office.toml (a test
// checks that it is reproduced byte for byte). Invented data: a demo, never a check value.
#include <limitline/model/airside.hpp>
#include <limitline/model/highlimit.hpp>
#include <limitline/model/psychro.hpp>
#include <limitline/io/trend.hpp>
#include <limitline/io/unit_file.hpp>
#include <limitline/model/units.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <string>
#include <vector>

namespace limitline::test {

enum class FaultKind {
  stuck_damper_at_minimum,
  high_limit_raised,      // amount: K added to every limit
  outdoor_sensor_offset,  // amount: K added to the outdoor reading
  damper_stuck_at,        // amount: the fraction the damper gives whatever its command
  economizer_locked_out,  // the controller never enables
  minimum_set_to,         // amount: the fraction the damper gives at its minimum command
  cooling_stuck_on,       // the cooling status reads On whenever the fan runs
  supply_off_setpoint,    // amount: K the supply air stands above its setpoint while cooling
  fan_heat_is,            // amount: K the supply air reads above the mixed air, coil idle
};

struct Fault {
  FaultKind kind;
  std::int64_t from_s, to_s;  // active for from ≤ t < to
  double amount = 0;          // raised limit (K) or sensor offset (K)
  bool active(std::int64_t t) const { return t >= from_s && t < to_s; }
};

struct GeneratedRow {
  std::int64_t time_s;
  bool fan;
  bool configured_enabled;                 // the unit file's strategy on the logged readings
  double x_command;                        // fraction the controller commands
  double x_true;                           // fraction the damper really gives
  double x_enabled;                        // fraction the model gives with the economizer enabled
  double t_out_log, t_ret_log, t_mix_log;  // °C, as the log reads back
  bool in_fault;
  bool cooling = false;    // the cooling status as logged
  double t_sup_log = 0.0;  // °C, as the log reads back (fan on)
};

struct Generated {
  std::string csv;
  std::vector<GeneratedRow> rows;
};

// A small deterministic generator (64-bit LCG, Knuth's MMIX constants) so the log is the same
// on every platform.
struct Lcg {
  std::uint64_t s;
  double next() {
    s = s * 6364136223846793005ULL + 1442695040888963407ULL;
    return static_cast<double>(s >> 11) / 9007199254740992.0;
  }
};

inline double round_to(double v, double step) { return std::round(v / step) * step; }

// `cooler_k` lowers every outdoor temperature (and dew point) by that much: a cooler season
// in which outdoor air alone often carries the load and the coil idles.
inline Generated generate_trend(const UnitFile& unit, const std::vector<Fault>& faults, int days,
                                std::uint64_t seed = 20260504, double cooler_k = 0.0) {
  const auto& ah = unit.air_handler;
  const double p = unit.site.design_pressure_kpa();
  const auto coil = airside::coil_limits(ah, p);
  const highlimit::Strategy configured = unit.strategies.front();
  highlimit::Strategy raised = configured;
  highlimit::StrategyState ctrl(configured), cfg(configured);
  Lcg rng{seed};
  const std::int64_t start = trend::parse_timestamp("2026-05-04 00:00", "generator");  // a Monday
  Generated g;
  g.csv =
      "# Invented trend log generated from examples/audit-office.toml by "
      "tests/support/trend_example.hpp; injected faults in examples/README-audit.md\n"
      "Trend export: AHU-3 economizer points (invented)\n"
      "Timestamp,OA Temp (°F),OA RH (%),RA Temp (°F),RA RH (%),MA Temp (°F),SA Temp (°F),"
      "OA Damper Cmd (%),SF Status,Clg Status\n";
  double day_mean = 18.0, day_dew = 11.0;
  for (std::int64_t k = 0; k < static_cast<std::int64_t>(days) * 96; ++k) {
    const std::int64_t nominal = start + k * 900;
    const int day = static_cast<int>(k / 96);
    const double hour = static_cast<double>(k % 96) / 4.0;
    if (k % 96 == 0) {  // a new day: the weather wanders
      day_mean = std::clamp(day_mean + (rng.next() - 0.5) * 6.0, 13.0, 25.0);
      day_dew = std::clamp(day_dew + (rng.next() - 0.5) * 4.0, 5.0, 17.0);
    }
    const double jitter = rng.next();
    const double drop = rng.next();
    // Gaps: about 2 % of samples lost, and one controller outage on the eighth day.
    if (drop < 0.02) continue;
    if (day == 7 && hour >= 10.0 && hour < 15.0) continue;
    const std::int64_t t = nominal + static_cast<std::int64_t>(jitter * 40.0);
    const bool weekday = day % 7 < 5;
    const bool fan = weekday && hour >= 6.0 && hour < 19.0;

    const double t_out_true =
        day_mean - cooler_k + 6.5 * std::sin(2.0 * 3.14159265358979 * (hour - 9.0) / 24.0);
    const double dew_true = std::min(day_dew - cooler_k, t_out_true - 0.5);
    const double t_ret_true = 23.3 + 0.4 * std::sin(2.0 * 3.14159265358979 * (hour - 11.0) / 24.0);
    double offset = 0.0;
    bool in_fault = false;
    const Fault* active = nullptr;
    for (const auto& f : faults)
      if (f.active(t)) active = &f, in_fault = true;
    if (active && active->kind == FaultKind::outdoor_sensor_offset) offset = active->amount;

    // What the controller logs (and decides on): readings rounded as a BAS trends them.
    const double oat_f = round_to(units::fahrenheit_from_celsius(t_out_true + offset), 0.1);
    const double w_true = psychro::humidity_ratio_from_dew_point(dew_true, p);
    const double rh_o = round_to(
        100.0 * psychro::relative_humidity_from_humidity_ratio(t_out_true + offset, w_true, p),
        0.1);
    const double rat_f = round_to(units::fahrenheit_from_celsius(t_ret_true), 0.1);
    const double rh_r = 45.0;
    const double t_o = units::celsius_from_fahrenheit(oat_f),
                 t_r = units::celsius_from_fahrenheit(rat_f);
    const double w_o =
        std::min(psychro::humidity_ratio_from_relative_humidity(t_o, rh_o / 100.0, p),
                 psychro::saturation_humidity_ratio(t_o, p));
    const double w_r =
        std::min(psychro::humidity_ratio_from_relative_humidity(t_r, rh_r / 100.0, p),
                 psychro::saturation_humidity_ratio(t_r, p));
    const auto out = airside::air_state(t_o, w_o), ret = airside::air_state(t_r, w_r);
    auto values = [&](const airside::AirState& a) {
      return highlimit::air_values(a.dry_bulb_c, a.enthalpy_kj_per_kg,
                                   psychro::dew_point_from_humidity_ratio_c(a.humidity_ratio, p),
                                   a.humidity_ratio);
    };
    const auto ov = values(out), rv = values(ret);
    const bool cfg_enabled = highlimit::permits(configured, ov, rv, cfg);
    raised = configured;
    if (active && active->kind == FaultKind::high_limit_raised)
      for (auto& c : raised.conditions) c.limit += active->amount;
    const bool ctrl_enabled = highlimit::permits(raised, ov, rv, ctrl) &&
                              !(active && active->kind == FaultKind::economizer_locked_out);

    GeneratedRow row{t, fan, cfg_enabled, 0.0, 0.0, 0.0, t_o, t_r, t_r, in_fault};
    std::string mat = fmt::format("{:.1f}", rat_f), sat = "", damper = "0.0", clg = "Off";
    if (fan) {
      const auto choice =
          airside::choose(ah, {out, ret, coil, std::nullopt, std::nullopt}, unit.weights);
      const auto& op = ctrl_enabled ? choice.enabled : choice.disabled;
      row.x_command = op.oa_fraction;
      row.x_enabled = choice.enabled.oa_fraction;
      row.x_true = op.oa_fraction;
      if (active && active->kind == FaultKind::stuck_damper_at_minimum)
        row.x_true = ah.min_oa_fraction;
      if (active && active->kind == FaultKind::damper_stuck_at) row.x_true = active->amount;
      if (active && active->kind == FaultKind::minimum_set_to &&
          op.oa_fraction <= ah.min_oa_fraction)
        row.x_true = active->amount;
      // The real mixed air comes from the real outdoor air.
      const auto out_true = airside::air_state(
          t_out_true, std::min(w_true, psychro::saturation_humidity_ratio(t_out_true, p)));
      const auto mixed = airside::mix(out_true, ret, row.x_true);
      const double mat_f = round_to(units::fahrenheit_from_celsius(mixed.dry_bulb_c), 0.1);
      row.t_mix_log = units::celsius_from_fahrenheit(mat_f);
      mat = fmt::format("{:.1f}", mat_f);
      const auto loads = airside::coil_loads(ah, coil, mixed);
      // A controller stages cooling on for a load of some size, not for the rounding of its
      // own readings: 0.5 kJ/kg is about 0.5 K of sensible cooling (an invented threshold).
      row.cooling =
          loads.cooling_kj_per_kg > 0.5 || (active && active->kind == FaultKind::cooling_stuck_on);
      double sat_f = round_to(units::fahrenheit_from_celsius(ah.supply_air_temp_c), 0.1);
      if (active && active->kind == FaultKind::supply_off_setpoint && row.cooling)
        sat_f =
            round_to(units::fahrenheit_from_celsius(ah.supply_air_temp_c + active->amount), 0.1);
      if (active && active->kind == FaultKind::fan_heat_is && !row.cooling)
        sat_f = round_to(mat_f + active->amount * 1.8, 0.1);
      row.t_sup_log = units::celsius_from_fahrenheit(sat_f);
      sat = fmt::format("{:.1f}", sat_f);
      damper = fmt::format("{:.1f}", round_to(row.x_command * 100.0, 0.1));
      clg = row.cooling ? "On" : "Off";
      // The log carries the command rounded; the row keeps what the audit will read back.
      row.x_command = round_to(row.x_command * 100.0, 0.1) / 100.0;
    }
    const std::string stamp = trend::format_timestamp(t);  // "YYYY-MM-DD HH:MM"
    // The BAS writes MM/DD/YYYY HH:MM:SS.
    g.csv += fmt::format("{}/{}/{} {}:{:02},{:.1f},{:.1f},{:.1f},{:.1f},{},{},{},{},{}\n",
                         stamp.substr(5, 2), stamp.substr(8, 2), stamp.substr(0, 4),
                         stamp.substr(11, 5), static_cast<int>(t % 60), oat_f, rh_o, rat_f, rh_r,
                         mat, sat, damper, fan ? "On" : "Off", clg);
    g.rows.push_back(row);
  }
  return g;
}

// The faults of the committed example log, in days from its start (Monday 2026-05-04).
inline std::vector<Fault> example_faults() {
  const std::int64_t start = trend::parse_timestamp("2026-05-04 00:00", "faults");
  const std::int64_t day = 86400;
  return {{FaultKind::stuck_damper_at_minimum, start + 2 * day, start + 5 * day, 0.0},
          {FaultKind::high_limit_raised, start + 7 * day, start + 12 * day, 5.0 / 1.8},
          {FaultKind::outdoor_sensor_offset, start + 14 * day, start + 19 * day, 3.0}};
}

}  // namespace limitline::test
