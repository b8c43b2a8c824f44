#pragma once
// Annual evaluation: every high-limit strategy and the three references, hour by hour with
// deadband state, over a year of weather and an occupancy schedule (docs/model.md
// §Annual evaluation).
//
// The work is split in two so that the sensor study can reuse it: `prepare` computes, once per
// interval, the true outdoor and return states and the disabled, enabled and optimal
// operations; `run` then only decides and accumulates, which is cheap per strategy.
#include <limitline/model/air_point.hpp>
#include <limitline/model/airside.hpp>
#include <limitline/model/highlimit.hpp>
#include <limitline/model/part_load.hpp>
#include <limitline/model/psychro.hpp>
#include <limitline/model/schedule.hpp>

#include <array>
#include <cstdint>
#include <optional>
#include <span>
#include <string>
#include <vector>

namespace limitline::annual {

// One interval of outdoor weather (hourly, or shorter), SI.
struct OutdoorInterval {
  int month;        // 1–12
  int day;          // 1–31
  int day_of_year;  // 0-based, for the schedule's weekday
  int start_min;    // minutes after midnight at which the interval starts
  double hours;     // length of the interval, h
  double dry_bulb_c;
  double humidity_ratio;
  double pressure_kpa;
};

// Energy and hours of one operation over one interval.
struct Outcome {
  double oa_fraction = 0;
  bool economizing = false;
  bool mechanical_cooling = false;
  double cooling_kwh = 0;  // coil total
  double sensible_kwh = 0;
  double latent_kwh = 0;
  double heating_kwh = 0;
  double energy_kwh = 0;  // weighted E = w_c·cooling + w_h·(heating + the hour's zone heating)
  double return_humidity_ratio = 0;  // the return air of this operation
  double supply_humidity_ratio = 0;  // coil-leaving (and supply) air
};

struct PreparedInterval {
  std::uint32_t source_index;  // index into the weather series
  std::uint8_t month;          // 1–12
  bool cooling_needed;
  double hours;                       // occupied hours in the interval (occupied share × length)
  double pressure_kpa;                // this interval's pressure (outdoor and return air alike)
  highlimit::AirValues outdoor, ret;  // ret: what the high-limit reads (at the minimum)
  Outcome disabled, enabled, optimal;
  // The hour's air handler (docs/model.md §Part load): equal to the design in the design model.
  double supply_temp_c;
  double mass_flow_kg_per_s;  // dry air
  double airflow_m3_per_s;    // the same at the airflow basis
  double min_oa_fraction;
  double zone_heating_kwh;  // heat that holds the space at setpoint when the supply overcools it
  double sensible_kwh;      // space loads of the interval (0 in the design model)
  double latent_kwh;
  [[nodiscard]] bool enabling_pays() const {
    return enabled.energy_kwh < disabled.energy_kwh - tolerance_kwh;
  }
  [[nodiscard]] bool enabling_hurts() const {
    return enabled.energy_kwh > disabled.energy_kwh + tolerance_kwh;
  }
  double tolerance_kwh;  // kDecisionToleranceKjPerKg at this interval's mass flow, length and
                         // largest weight
};

// Which model priced the hours, for the report's context block.
struct ModelSummary {
  bool part_load = false;     // a space ([loads]) drove airflow and return air
  bool hourly_loads = false;  // the loads came from a file, hour by hour
  part_load::AirflowControl airflow = part_load::AirflowControl::constant;
  bool supply_reset = false;
  double hours_beyond_design = 0;     // sensible load more than design airflow carries
  double hours_ventilation_held = 0;  // fixed outdoor airflow above the damper limit's share
  double space_sensible_kwh = 0, space_latent_kwh = 0, zone_heating_kwh = 0;
  double min_airflow_hours = 0;  // variable control at its floor
};

struct Prepared {
  std::vector<PreparedInterval> intervals;  // fan-on intervals only
  double total_hours = 0;                   // hours in the weather series
  double operating_hours = 0;               // fan-on hours
  std::array<double, 12> operating_hours_by_month{};
  bool has_dew_point = false;  // outdoor/return dew points were computed
  ModelSummary model;
};

struct PrepareOptions {
  airside::EnergyWeights weights;
  bool compute_dew_point = true;  // needed by dew-point conditions and hourly output
  part_load::Control control;
  // The space ([loads]); absent: the design model, with `ret` as the return air every hour.
  std::optional<part_load::Space> space;
  // One entry per weather interval when the space's loads come from a file (space without
  // coefficients); ignored otherwise.
  std::span<const part_load::SpaceLoads> hourly_loads;
};

// `ret` is the return air as the unit file gives it: its humidity ratio follows each
// interval's pressure. With a space it is only the fallback of an hour without a steady
// humidity; the return air then comes from the space (docs/model.md §Return air).
[[nodiscard]] Prepared prepare(const airside::AirHandler& unit, const AirPoint& ret,
                               std::span<const OutdoorInterval> weather, const Schedule& schedule,
                               const PrepareOptions& options);

// Accumulated results. Hours are occupied (fan-on) hours.
struct Totals {
  double hours_operating = 0;
  double hours_cooling_needed = 0;
  double hours_enabled = 0;       // high-limit permits economizing, fan on
  double hours_economizing = 0;   // damper above minimum
  double hours_free_cooling = 0;  // economizing with no mechanical cooling
  double hours_integrated = 0;    // economizing with mechanical cooling
  double cooling_kwh = 0;
  double sensible_kwh = 0;
  double latent_kwh = 0;
  double heating_kwh = 0;
  double zone_heating_kwh = 0;  // the same in every strategy: set by airflow, not by the damper
  double energy_kwh = 0;        // weighted, what the perfect changeover minimises
  double harmful_hours = 0;
  double harmful_kwh = 0;  // extra weighted energy of the harmful enables
  double missed_hours = 0;
  double missed_kwh = 0;  // weighted energy a missed enable would have saved
  void add(const Totals& o);
};

enum class Kind { strategy, no_economizer, perfect_changeover, optimal_damper };

struct StrategyResult {
  std::string name;  // the strategy's name, or the reference's: "no-economizer", …
  Kind kind = Kind::strategy;
  Totals annual;
  std::array<Totals, 12> monthly{};
  double savings_vs_no_economizer_kwh = 0;  // E(no economizer) − E(this)
  double shortfall_vs_perfect_kwh = 0;      // E(this) − E(perfect changeover)
  // Per prepared interval, when requested: 1 enabled, 0 disabled.
  std::vector<std::uint8_t> enabled_by_interval;
};

[[nodiscard]] std::string_view reference_name(Kind k);

struct RunOptions {
  bool keep_decisions = false;  // fill enabled_by_interval
};

// One strategy over the prepared year (deadband state starts clear and carries between
// fan-on intervals; the high-limit is not evaluated while the fan is off).
[[nodiscard]] StrategyResult run(const highlimit::Strategy& strategy, const Prepared& prepared,
                                 const RunOptions& options = {});
[[nodiscard]] StrategyResult run_reference(Kind reference, const Prepared& prepared,
                                           const RunOptions& options = {});

struct YearResult {
  std::vector<StrategyResult> strategies;  // ranked: smallest shortfall first
  StrategyResult no_economizer, perfect_changeover, optimal_damper;
  double total_hours = 0;
  double operating_hours = 0;
  ModelSummary model;  // which model priced the hours (copied from the prepared year)
  // The best strategy (first of `strategies`); empty when there are none.
  [[nodiscard]] const StrategyResult* best() const {
    return strategies.empty() ? nullptr : &strategies[0];
  }
};

// Runs every strategy and the references, fills savings and shortfall, and ranks.
[[nodiscard]] YearResult evaluate(std::span<const highlimit::Strategy> strategies,
                                  const Prepared& prepared, const RunOptions& options = {});

}  // namespace limitline::annual
