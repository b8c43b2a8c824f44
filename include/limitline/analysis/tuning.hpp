#pragma once
// Setpoint tuning (docs/model.md §Setpoint tuning): one strategy's annual result over a grid of
// its setpoints, on a year prepared once. Each grid point is the strategy with its swept
// conditions' limits (fixed) or offsets (return-referenced) replaced; deadbands stay.
//
// The grid is one axis per swept condition, at most two: a preset on one quantity sweeps it
// at 41 points, a combined preset sweeps its primary condition at 21 and its dry-bulb limit
// at 11 (docs/model.md gives the ranges). The result names the best point, the points whose
// savings come within 1 % and 5 % of the best, and any extra settings asked for (the code's
// required value, the common-practice default) evaluated exactly.
#include <limitline/analysis/annual.hpp>
#include <limitline/model/highlimit.hpp>
#include <limitline/model/units.hpp>

#include <atomic>
#include <cstddef>
#include <cstdint>
#include <optional>
#include <span>
#include <string>
#include <vector>

namespace limitline::tuning {

// One swept setting: a condition of the strategy and the values it takes (SI: °C, kJ/kg,
// kg/kg; offsets as differences).
struct Axis {
  std::size_t condition = 0;  // index into Strategy::conditions
  highlimit::Quantity quantity = highlimit::Quantity::dry_bulb;
  highlimit::Reference reference = highlimit::Reference::fixed;
  std::vector<double> values;
  // The unit kind of its values: a quantity's for a limit, its difference's for an offset.
  [[nodiscard]] units::Kind kind() const {
    return reference == highlimit::Reference::fixed ? highlimit::quantity_kind(quantity)
                                                    : highlimit::quantity_difference_kind(quantity);
  }
};

// The practical range of a setting in the display system (round numbers there): `points`
// values from `lo` to `hi`. A preset on one quantity uses the one-axis range; combined presets
// use the primary and secondary ranges.
enum class Role { only, primary, secondary };
struct Range {
  double lo, hi;  // display units of `system`
  std::size_t points;
};
[[nodiscard]] Range practical_range(highlimit::Quantity q, highlimit::Reference r, Role role,
                                    units::System system);
// The axis of that range, converted to SI.
[[nodiscard]] Axis make_axis(std::size_t condition, highlimit::Quantity q, highlimit::Reference r,
                             const Range& range, units::System system);

// The axes a strategy is tuned on: every condition, up to two; with two, the dry-bulb limit
// is the secondary one. Empty for a strategy without conditions.
[[nodiscard]] std::vector<Axis> default_axes(const highlimit::Strategy& s, units::System system);

// The strategy with the settings of one grid point (one value per axis).
[[nodiscard]] highlimit::Strategy at_setting(const highlimit::Strategy& s,
                                             std::span<const Axis> axes,
                                             std::span<const double> values);

struct Point {
  std::vector<double> values;  // one per axis, SI
  double energy_kwh = 0;       // in the prepared year's measure (weighted energy, or cost)
  double shortfall_kwh = 0;    // against the perfect changeover
  double savings_kwh = 0;      // against no economizer
  double harmful_hours = 0, missed_hours = 0;
};

// The points whose savings are at least (1 − share) of the best point's: a designer's robust
// choice. Per axis, the lowest and highest value among them.
struct Band {
  double share = 0.01;
  std::size_t count = 0;
  std::vector<double> lo, hi;  // one per axis
  bool contiguous = true;      // one axis: the qualifying points form one unbroken run
};

// A named setting evaluated exactly beside the grid ("code", "default").
struct Extra {
  std::string label;
  std::vector<double> values;  // one per axis
};

struct Curve {
  std::string strategy;  // the strategy's name
  std::vector<Axis> axes;
  std::vector<Point> grid;  // row-major: the last axis varies fastest
  std::vector<Point> extras;
  std::vector<std::string> extra_labels;
  std::size_t best = 0;        // index into grid
  bool best_is_extra = false;  // an extra beats every grid point: best indexes extras
  Band within_1pct, within_5pct;
  [[nodiscard]] const Point& best_point() const {
    return best_is_extra ? extras[best] : grid[best];
  }
  // The loss of a point against the best, ≥ 0.
  [[nodiscard]] double loss(const Point& p) const { return p.energy_kwh - best_point().energy_kwh; }
};

// The perfect changeover's and no economizer's energy of the prepared year, shared by every
// curve (computed once).
struct Baseline {
  double perfect_kwh = 0;
  double none_kwh = 0;
  // What a run reads of each prepared interval, packed: the sweep's inner loop touches two
  // cache lines an hour instead of the whole PreparedInterval.
  struct Hour {
    highlimit::AirValues outdoor, ret;
    double disabled_kwh, enabled_kwh, hours;
    std::uint8_t month;  // 0–11
    bool harmful_if_enabled, missed_if_disabled;
  };
  std::vector<Hour> hours;
};
[[nodiscard]] Baseline baseline_of(const annual::Prepared& p);

// Runs every grid point and extra (on `threads` threads, 0: all cores; results do not depend
// on the thread count). When `*cancel` turns true, no further point starts and the curve is
// marked partial by returning std::nullopt.
[[nodiscard]] std::optional<Curve> tune(const highlimit::Strategy& s, std::vector<Axis> axes,
                                        std::span<const Extra> extras, const Baseline& ref,
                                        unsigned threads = 1,
                                        const std::atomic<bool>* cancel = nullptr);

// The band of points within `share` of the best's savings (exposed for tests).
[[nodiscard]] Band band_of(const Curve& c, double share);

// --- A unit's tuning, as the tune job assembles it ----------------------------------------

struct StrategyTuning {
  highlimit::Strategy strategy;  // as the unit file (or the preset defaults) gives it
  tuning::Curve curve;
  // What the code says of this control type in the unit's zone, one sentence; empty without a
  // code.
  std::string code_note;
  // The compliance word of the best setting, and of each extra (same order); empty without
  // a code.
  std::string best_verdict;
  std::vector<std::string> extra_verdicts;
  bool code_allows = false;               // the control type is allowed in the zone
  std::optional<std::size_t> code_extra;  // index of the "code" extra, when there is one
};

struct TuneResult {
  std::vector<StrategyTuning> strategies;  // in the unit file's order
  double perfect_savings = 0;  // the perfect changeover's savings (the tie tolerance's scale)
  std::string code_label;      // "ANSI/ASHRAE/IES Standard 90.1-2019, climate zone 4A"
  bool partial = false;        // interrupted: the strategies that finished
};

// Labels of the extras, as reports print them.
inline constexpr std::string_view kUnitSetting = "unit file";
inline constexpr std::string_view kDefaultSetting = "common practice";
inline constexpr std::string_view kCodeSetting = "code";

}  // namespace limitline::tuning
