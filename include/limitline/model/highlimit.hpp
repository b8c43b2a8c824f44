#pragma once
// High-limit strategies (docs/model.md §High-limit conditions).
//
// A strategy is a list of conditions joined by OR: any tripped condition disables the
// economizer. A condition compares one outdoor quantity with a fixed limit or with the
// return-air value plus an offset; with a deadband, once tripped it clears only when the
// outdoor value falls below limit − deadband, so the state carries from one evaluation to the
// next. A value exactly at the limit does not trip (codes word the limits as "off when above").
#include <limitline/model/units.hpp>

#include <array>
#include <cstdint>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

namespace limitline::highlimit {

enum class Quantity : std::uint8_t { dry_bulb, enthalpy, dew_point, humidity_ratio };
inline constexpr std::size_t kQuantityCount = 4;

enum class Reference : std::uint8_t { fixed, return_air };

[[nodiscard]] std::string_view quantity_name(
    Quantity q);  // "dry-bulb", "enthalpy", "dew-point", ...
[[nodiscard]] std::optional<Quantity> quantity_from_name(std::string_view name);
[[nodiscard]] std::string_view reference_name(Reference r);  // "fixed", "return"
[[nodiscard]] std::optional<Reference> reference_from_name(std::string_view name);

// The kind of a quantity's values (limits, readings) and of its differences (offsets,
// deadbands, excess over a limit), for parsing and display at the edges.
[[nodiscard]] units::Kind quantity_kind(Quantity q);
[[nodiscard]] units::Kind quantity_difference_kind(Quantity q);

// The values a decision is made on (sensor readings, or the true state), SI, indexed by
// Quantity: °C, kJ/kg, °C, kg/kg.
struct AirValues {
  std::array<double, kQuantityCount> value{};
  double operator[](Quantity q) const { return value[static_cast<std::size_t>(q)]; }
  double& operator[](Quantity q) { return value[static_cast<std::size_t>(q)]; }
};
[[nodiscard]] AirValues air_values(double dry_bulb_c, double enthalpy_kj_per_kg, double dew_point_c,
                                   double humidity_ratio);

struct Condition {
  Quantity quantity = Quantity::dry_bulb;
  Reference reference = Reference::fixed;
  double limit = 0.0;     // fixed: the limit; return_air: the offset added to the return value
  double deadband = 0.0;  // ≥ 0, same kind as the quantity (a difference)

  [[nodiscard]] double effective_limit(const AirValues& ret) const {
    return reference == Reference::fixed ? limit : ret[quantity] + limit;
  }
};

// Where the setting (limit or offset) of a condition came from, so that descriptions and
// sequences can say whether a figure is the designer's, common practice or an energy code's.
enum class SettingSource : std::uint8_t {
  written,          // given in the unit file (custom conditions, or a preset key)
  common_practice,  // a preset's default (preset_defaults())
  code,             // the required value of the energy code the unit's site names
};

struct Strategy {
  std::string name;
  std::string preset;  // the preset it came from, empty for custom conditions
  std::vector<Condition> conditions;
  // One per condition for presets (make_preset: common_practice); empty means every setting
  // was written.
  std::vector<SettingSource> sources;
  // When any source is `code`: the code in words, "ANSI/ASHRAE/IES Standard 90.1-2019 zone 4A,
  // Table 6.5.1.1.3, from memory".
  std::string code_source;
  [[nodiscard]] SettingSource source(std::size_t condition) const {
    return condition < sources.size() ? sources[condition] : SettingSource::written;
  }
  [[nodiscard]] bool needs(
      Quantity q) const;  // any condition uses q (outdoor, or return when differential)
};

// --- Presets ---------------------------------------------------------------------------

// Settings a preset takes; each has a common-practice default (see preset_defaults()).
struct PresetSettings {
  double dry_bulb_limit_c;
  double enthalpy_limit_kj_per_kg;
  double dew_point_limit_c;
  double dry_bulb_offset_k;          // differential dry-bulb: off when t_o > t_r + offset
  double enthalpy_offset_kj_per_kg;  // differential enthalpy: off when h_o > h_r + offset
  double dry_bulb_deadband_k;
  double enthalpy_deadband_kj_per_kg;
  double dew_point_deadband_k;
};
// 75 °F dry-bulb, 28 Btu/lb enthalpy, 55 °F dew point, zero offsets and deadbands (common
// practice; the energy-code rows of data/codes give the required values per climate zone).
[[nodiscard]] PresetSettings preset_defaults();

struct PresetInfo {
  std::string_view name;         // "fixed-enthalpy+dry-bulb"
  std::string_view description;  // one line, original wording
};
[[nodiscard]] std::span<const PresetInfo> presets();
[[nodiscard]] bool is_preset(std::string_view name);

// Builds the strategy of a preset; throws InputError naming the preset when it is unknown.
[[nodiscard]] Strategy make_preset(std::string_view preset, const PresetSettings& settings,
                                   std::string name = {});
// Every preset with the given settings, in the order of presets().
[[nodiscard]] std::vector<Strategy> all_presets(const PresetSettings& settings);

// --- Decisions ------------------------------------------------------------------------

// Tripped flags of each condition of one strategy, carried between evaluations.
struct StrategyState {
  std::vector<std::uint8_t> tripped;
  explicit StrategyState(const Strategy& s) : tripped(s.conditions.size(), 0) {}
  StrategyState() = default;
};

enum class ConditionStatus : std::uint8_t {
  clear,    // at or below the limit (and below limit − deadband if it was tripped)
  tripped,  // above the limit
  held,     // within the deadband after a trip: still tripped
};

struct ConditionResult {
  double outdoor;  // the outdoor value compared
  double limit;    // effective limit (return value + offset for differential types)
  double excess;   // outdoor − limit (> 0 above the limit)
  ConditionStatus status;
  [[nodiscard]] bool disables() const { return status != ConditionStatus::clear; }
};

struct Decision {
  bool enabled;                          // no condition trips
  std::vector<ConditionResult> results;  // one per condition
  // The first condition (in the order written) that disables; -1 when enabled. Every
  // condition's own result is in `results`.
  int deciding_condition;
};

// One condition's new status given its previous tripped flag: trips above the limit, clears
// below limit − deadband, holds in between. Without a deadband there is nothing to hold: a
// value back at the limit is clear whatever came before (weather on a 0.1 °C grid sits exactly
// on a 24 °C limit often enough for this to matter).
[[nodiscard]] inline ConditionStatus condition_status(double outdoor, double limit, double deadband,
                                                      bool was_tripped) {
  if (outdoor > limit) return ConditionStatus::tripped;
  if (was_tripped && deadband > 0.0 && outdoor >= limit - deadband) return ConditionStatus::held;
  return ConditionStatus::clear;
}

// Evaluates the strategy and updates its state (the full account, for reports).
[[nodiscard]] Decision decide(const Strategy& s, const AirValues& outdoor, const AirValues& ret,
                              StrategyState& state);

// The same decision without the account, for annual loops: returns enabled. Inline: it runs
// for every strategy in every hour of a year.
[[nodiscard]] inline bool permits(const Strategy& s, const AirValues& outdoor, const AirValues& ret,
                                  StrategyState& state) {
  if (state.tripped.size() != s.conditions.size()) state = StrategyState(s);
  bool enabled = true;
  // Every condition is evaluated (not short-circuited) so each one's deadband state stays true.
  for (std::size_t i = 0; i < s.conditions.size(); ++i) {
    const Condition& c = s.conditions[i];
    const bool off = condition_status(outdoor[c.quantity], c.effective_limit(ret), c.deadband,
                                      state.tripped[i] != 0) != ConditionStatus::clear;
    state.tripped[i] = off;
    enabled = enabled && !off;
  }
  return enabled;
}

}  // namespace limitline::highlimit
