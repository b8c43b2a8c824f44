#include <limitline/model/highlimit.hpp>

#include <limitline/error.hpp>
#include <limitline/names.hpp>
#include <limitline/model/units.hpp>

#include <fmt/format.h>

#include <algorithm>

namespace limitline::highlimit {
namespace {

constexpr Named<Quantity> kQuantityNames[] = {
    {"dry-bulb", Quantity::dry_bulb},
    {"enthalpy", Quantity::enthalpy},
    {"dew-point", Quantity::dew_point},
    {"humidity-ratio", Quantity::humidity_ratio},
};
struct QuantityKinds {
  Quantity quantity;
  units::Kind value, difference;
};
constexpr QuantityKinds kQuantityKinds[] = {
    {Quantity::dry_bulb, units::Kind::temperature, units::Kind::temperature_difference},
    {Quantity::enthalpy, units::Kind::enthalpy, units::Kind::enthalpy_difference},
    {Quantity::dew_point, units::Kind::temperature, units::Kind::temperature_difference},
    {Quantity::humidity_ratio, units::Kind::humidity_ratio, units::Kind::humidity_ratio},
};
// "return" is the name written; "return-air" and "differential" are read as synonyms.
constexpr Named<Reference> kReferenceNames[] = {
    {"fixed", Reference::fixed},
    {"return", Reference::return_air},
    {"return-air", Reference::return_air},
    {"differential", Reference::return_air},
};

// Which setting of PresetSettings feeds a preset condition.
enum class Setting : std::uint8_t {
  dry_bulb_limit,
  enthalpy_limit,
  dew_point_limit,
  dry_bulb_offset,
  enthalpy_offset
};

struct PresetCondition {
  Quantity quantity;
  Reference reference;
  Setting setting;
};

struct PresetDefinition {
  PresetInfo info;
  std::array<std::optional<PresetCondition>, 2> conditions;
};

// The presets, as data: the trade's names, each a short list of conditions.
constexpr PresetDefinition kPresets[] = {
    {{"fixed-dry-bulb", "off when outdoor dry-bulb is above a fixed limit"},
     {PresetCondition{Quantity::dry_bulb, Reference::fixed, Setting::dry_bulb_limit}}},
    {{"differential-dry-bulb", "off when outdoor dry-bulb is above the return-air dry-bulb"},
     {PresetCondition{Quantity::dry_bulb, Reference::return_air, Setting::dry_bulb_offset}}},
    {{"fixed-enthalpy", "off when outdoor enthalpy is above a fixed limit"},
     {PresetCondition{Quantity::enthalpy, Reference::fixed, Setting::enthalpy_limit}}},
    {{"fixed-enthalpy+dry-bulb",
      "off when outdoor enthalpy or outdoor dry-bulb is above its fixed limit"},
     {PresetCondition{Quantity::enthalpy, Reference::fixed, Setting::enthalpy_limit},
      PresetCondition{Quantity::dry_bulb, Reference::fixed, Setting::dry_bulb_limit}}},
    {{"differential-enthalpy", "off when outdoor enthalpy is above the return-air enthalpy"},
     {PresetCondition{Quantity::enthalpy, Reference::return_air, Setting::enthalpy_offset}}},
    {{"differential-enthalpy+dry-bulb",
      "off when outdoor enthalpy is above return-air enthalpy or outdoor dry-bulb is above a "
      "fixed limit"},
     {PresetCondition{Quantity::enthalpy, Reference::return_air, Setting::enthalpy_offset},
      PresetCondition{Quantity::dry_bulb, Reference::fixed, Setting::dry_bulb_limit}}},
    {{"fixed-dew-point+dry-bulb",
      "off when outdoor dew point or outdoor dry-bulb is above its fixed limit"},
     {PresetCondition{Quantity::dew_point, Reference::fixed, Setting::dew_point_limit},
      PresetCondition{Quantity::dry_bulb, Reference::fixed, Setting::dry_bulb_limit}}},
};

double setting_value(const PresetSettings& s, Setting which) {
  switch (which) {
    case Setting::dry_bulb_limit: return s.dry_bulb_limit_c;
    case Setting::enthalpy_limit: return s.enthalpy_limit_kj_per_kg;
    case Setting::dew_point_limit: return s.dew_point_limit_c;
    case Setting::dry_bulb_offset: return s.dry_bulb_offset_k;
    case Setting::enthalpy_offset: return s.enthalpy_offset_kj_per_kg;
  }
  return 0.0;
}

double deadband_for(const PresetSettings& s, Quantity q) {
  switch (q) {
    case Quantity::dry_bulb: return s.dry_bulb_deadband_k;
    case Quantity::enthalpy: return s.enthalpy_deadband_kj_per_kg;
    case Quantity::dew_point: return s.dew_point_deadband_k;
    case Quantity::humidity_ratio: return 0.0;
  }
  return 0.0;
}

}  // namespace

std::string_view quantity_name(Quantity q) { return name_in(kQuantityNames, q); }

std::optional<Quantity> quantity_from_name(std::string_view name) {
  return value_in(kQuantityNames, name);
}

units::Kind quantity_kind(Quantity q) {
  for (const auto& k : kQuantityKinds)
    if (k.quantity == q) return k.value;
  return units::Kind::temperature;
}

units::Kind quantity_difference_kind(Quantity q) {
  for (const auto& k : kQuantityKinds)
    if (k.quantity == q) return k.difference;
  return units::Kind::temperature_difference;
}

std::string_view reference_name(Reference r) { return name_in(kReferenceNames, r); }

std::optional<Reference> reference_from_name(std::string_view name) {
  return value_in(kReferenceNames, name);
}

AirValues air_values(double dry_bulb_c, double enthalpy_kj_per_kg, double dew_point_c,
                     double humidity_ratio) {
  AirValues v;
  v[Quantity::dry_bulb] = dry_bulb_c;
  v[Quantity::enthalpy] = enthalpy_kj_per_kg;
  v[Quantity::dew_point] = dew_point_c;
  v[Quantity::humidity_ratio] = humidity_ratio;
  return v;
}

bool Strategy::needs(Quantity q) const {
  return std::any_of(conditions.begin(), conditions.end(),
                     [q](const Condition& c) { return c.quantity == q; });
}

PresetSettings preset_defaults() {
  PresetSettings s{};
  s.dry_bulb_limit_c = units::celsius_from_fahrenheit(75.0);
  s.enthalpy_limit_kj_per_kg = units::enthalpy_si_from_ip(28.0);
  s.dew_point_limit_c = units::celsius_from_fahrenheit(55.0);
  return s;
}

std::span<const PresetInfo> presets() {
  static const auto infos = [] {
    std::vector<PresetInfo> v;
    for (const auto& p : kPresets) v.push_back(p.info);
    return v;
  }();
  return infos;
}

bool is_preset(std::string_view name) {
  return std::any_of(std::begin(kPresets), std::end(kPresets),
                     [&](const PresetDefinition& p) { return p.info.name == name; });
}

Strategy make_preset(std::string_view preset, const PresetSettings& settings, std::string name) {
  for (const auto& p : kPresets) {
    if (p.info.name != preset) continue;
    Strategy s;
    s.name = name.empty() ? std::string(preset) : std::move(name);
    s.preset = std::string(preset);
    for (const auto& c : p.conditions) {
      if (!c) continue;
      s.conditions.push_back(Condition{c->quantity, c->reference,
                                       setting_value(settings, c->setting),
                                       deadband_for(settings, c->quantity)});
      s.sources.push_back(SettingSource::common_practice);
    }
    return s;
  }
  std::string allowed;
  for (const auto& p : kPresets)
    allowed += (allowed.empty() ? "" : ", ") + std::string(p.info.name);
  throw InputError(fmt::format("preset '{}' is not known (allowed: {})", preset, allowed));
}

std::vector<Strategy> all_presets(const PresetSettings& settings) {
  std::vector<Strategy> out;
  for (const auto& p : kPresets) out.push_back(make_preset(p.info.name, settings));
  return out;
}

Decision decide(const Strategy& s, const AirValues& outdoor, const AirValues& ret,
                StrategyState& state) {
  if (state.tripped.size() != s.conditions.size()) state = StrategyState(s);
  Decision d{true, {}, -1};
  d.results.reserve(s.conditions.size());
  for (std::size_t i = 0; i < s.conditions.size(); ++i) {
    const Condition& c = s.conditions[i];
    const double limit = c.effective_limit(ret);
    const double value = outdoor[c.quantity];
    const ConditionStatus st = condition_status(value, limit, c.deadband, state.tripped[i] != 0);
    d.results.push_back({value, limit, value - limit, st});
    state.tripped[i] = st != ConditionStatus::clear;
    if (st != ConditionStatus::clear && d.enabled) {
      d.enabled = false;
      d.deciding_condition = static_cast<int>(i);
    }
  }
  return d;
}

}  // namespace limitline::highlimit
