// Reading the unit file: strict TOML with one-line errors that name file, line and key.
#include <limitline/io/unit_file.hpp>

#include <limitline/io/detail/raw_table.hpp>
#include <limitline/io/input_file.hpp>

#include <limitline/error.hpp>
#include <limitline/model/plausible.hpp>
#include <limitline/model/psychro.hpp>
#include <limitline/io/toml_depth.hpp>
#include <limitline/names.hpp>
#include <limitline/text.hpp>

#include <fmt/format.h>
#include <toml++/toml.h>

#include <algorithm>
#include <cmath>
#include <fstream>
#include <iterator>
#include <span>
#include <sstream>

namespace limitline {
namespace {

using highlimit::PresetSettings;
using highlimit::Quantity;
using highlimit::Reference;
using units::Kind;

constexpr std::string_view kTopKeys[] = {"units",    "site",    "air_handler", "energy",
                                         "strategy", "weather", "schedule",    "sensors"};
constexpr std::string_view kSiteKeys[] = {"name",        "elevation",    "pressure",
                                          "energy_code", "climate_zone", "units"};
constexpr std::string_view kAirHandlerKeys[] = {
    "supply_airflow",      "supply_air_temp",          "fan_heat",        "fan_position",
    "min_outdoor_air",     "min_outdoor_airflow",      "max_outdoor_air", "economizer",
    "coil_leaving_rh_max", "return_air_temp",          "return_air_rh",   "return_air_dew_point",
    "return_air_wet_bulb", "return_air_humidity_ratio"};
constexpr std::string_view kEnergyKeys[] = {"cooling_weight", "heating_weight"};
constexpr std::string_view kConditionKeys[] = {"quantity", "reference", "limit", "offset",
                                               "deadband"};

// The preset settings a [[strategy]] may carry: which condition of a preset each one feeds.
struct PresetKey {
  Quantity quantity;
  Reference reference;
  std::string_view key;
  double PresetSettings::*member;
};
constexpr PresetKey kPresetKeys[] = {
    {Quantity::dry_bulb, Reference::fixed, "dry_bulb_limit", &PresetSettings::dry_bulb_limit_c},
    {Quantity::dry_bulb, Reference::return_air, "dry_bulb_offset",
     &PresetSettings::dry_bulb_offset_k},
    {Quantity::enthalpy, Reference::fixed, "enthalpy_limit",
     &PresetSettings::enthalpy_limit_kj_per_kg},
    {Quantity::enthalpy, Reference::return_air, "enthalpy_offset",
     &PresetSettings::enthalpy_offset_kj_per_kg},
    {Quantity::dew_point, Reference::fixed, "dew_point_limit", &PresetSettings::dew_point_limit_c},
};
struct DeadbandKey {
  Quantity quantity;
  std::string_view key;
  double PresetSettings::*member;
};
constexpr DeadbandKey kDeadbandKeys[] = {
    {Quantity::dry_bulb, "dry_bulb_deadband", &PresetSettings::dry_bulb_deadband_k},
    {Quantity::enthalpy, "enthalpy_deadband", &PresetSettings::enthalpy_deadband_kj_per_kg},
    {Quantity::dew_point, "dew_point_deadband", &PresetSettings::dew_point_deadband_k},
};
constexpr std::string_view kSingleDeadbandKey = "deadband";

// Allowed ranges of strategy settings (SI), so that a slip such as "28btu/lb" written as
// "280" is caught: limits inside [limit_min, limit_max], offsets within ±difference_max,
// deadbands in [0, difference_max]. Their narrower plausible bands are in plausible.cpp.
struct SettingBounds {
  Quantity quantity;
  double limit_min, limit_max, difference_max;
};
constexpr SettingBounds kBounds[] = {
    {Quantity::dry_bulb, -40.0, 60.0, 15.0},
    {Quantity::enthalpy, -40.0, 150.0, 35.0},
    {Quantity::dew_point, -60.0, 40.0, 15.0},
    {Quantity::humidity_ratio, 0.0, 0.05, 0.02},
};

const SettingBounds& bounds(Quantity q) {
  for (const auto& b : kBounds)
    if (b.quantity == q) return b;
  return kBounds[0];
}

// The return-air humidity forms of [air_handler].
struct ReturnHumidityKey {
  std::string_view key;
  psychro::HumidityInput input;
};
constexpr ReturnHumidityKey kReturnHumidityKeys[] = {
    {"return_air_rh", psychro::HumidityInput::relative_humidity},
    {"return_air_dew_point", psychro::HumidityInput::dew_point},
    {"return_air_wet_bulb", psychro::HumidityInput::wet_bulb},
    {"return_air_humidity_ratio", psychro::HumidityInput::humidity_ratio},
};

template <class Range, class F>
std::string join(const Range& items, F&& name) {
  std::string out;
  for (const auto& i : items) {
    if (!out.empty()) out += ", ";
    out += name(i);
  }
  return out;
}

int decimals(Kind k, units::System s) {
  switch (k) {
    case Kind::temperature:
    case Kind::temperature_difference:
    case Kind::fraction: return 1;
    case Kind::enthalpy:
    case Kind::enthalpy_difference: return 2;
    case Kind::pressure: return 3;
    case Kind::humidity_ratio: return 5;
    case Kind::airflow: return s == units::System::ip ? 0 : 3;
    case Kind::length: return s == units::System::ip ? 0 : 1;
    default: return 3;
  }
}

std::uint32_t line_of(const toml::source_region& r) { return r.begin.line; }

// Reads one file: knows its name and the unit system bare numbers are in.
class Reader {
 public:
  explicit Reader(std::string file) : file_(std::move(file)) {}

  units::System system = units::System::ip;
  // Implausible values used as written (UnitFile::warnings).
  mutable std::vector<std::string> warnings;

  std::string origin(const toml::source_region& where, std::string_view key) const {
    return fmt::format("{}:{}: {}", file_, line_of(where), key);
  }

  [[noreturn]] void fail(const toml::source_region& where, std::string_view key,
                         std::string_view message) const {
    throw InputError(fmt::format("{}: {}", origin(where, key), message));
  }

  // A required key is missing from `table` (reported at the table's own line).
  [[noreturn]] void missing(const toml::table& table, std::string_view key,
                            std::string_view hint) const {
    fail(table.source(), key, fmt::format("required key is missing ({})", hint));
  }

  std::string show(Kind k, double si) const {
    return units::format(k, system, si, decimals(k, system));
  }

  void check_keys(const toml::table& t, std::string_view path,
                  std::span<const std::string_view> allowed, std::string_view where) const {
    for (auto&& [k, v] : t) {
      if (std::find(allowed.begin(), allowed.end(), k.str()) != allowed.end()) continue;
      fail(k.source(), join_path(path, k.str()),
           fmt::format("unknown key in {} (allowed: {})", where,
                       join(allowed, [](std::string_view s) { return std::string(s); })));
    }
  }

  static std::string join_path(std::string_view path, std::string_view key) {
    return path.empty() ? std::string(key) : fmt::format("{}.{}", path, key);
  }

  const toml::table* table(const toml::table& parent, std::string_view key,
                           std::string_view path) const {
    const toml::node* n = parent.get(key);
    if (n == nullptr) return nullptr;
    if (!n->is_table())
      fail(n->source(), join_path(path, key),
           fmt::format("must be a table ([{}]), not {}", join_path(path, key), type_name(*n)));
    return n->as_table();
  }

  std::optional<std::string> text(const toml::table& t, std::string_view key,
                                  std::string_view path) const {
    const toml::node* n = t.get(key);
    if (n == nullptr) return std::nullopt;
    if (const auto* s = n->as_string()) return s->get();
    fail(n->source(), join_path(path, key),
         fmt::format("must be a string in quotes, not {}", type_name(*n)));
  }

  // A quantity: a string with or without unit, or a bare TOML number in the file's system,
  // weighed against its plausible band (named `band`, else PATH.KEY).
  std::optional<double> quantity(const toml::table& t, std::string_view key, std::string_view path,
                                 Kind kind, std::string_view band = {}) const {
    const toml::node* n = t.get(key);
    if (n == nullptr) return std::nullopt;
    const std::string full = join_path(path, key);
    const std::string text = quantity_text(*n, full, kind);
    const std::string where = origin(n->source(), full);
    const plausible::Band* b = plausible::find(band.empty() ? std::string_view(full) : band);
    if (b == nullptr || b->kind != kind) return units::parse(kind, text, system, where);
    return plausible::parse(*b, text, system, {where, plausible::in_file(system)}, warnings);
  }

  // A dimensionless number: a TOML number, or a string holding one.
  std::optional<double> number(const toml::table& t, std::string_view key,
                               std::string_view path) const {
    const toml::node* n = t.get(key);
    if (n == nullptr) return std::nullopt;
    const std::string where = origin(n->source(), join_path(path, key));
    if (const auto* i = n->as_integer()) return static_cast<double>(i->get());
    if (const auto* f = n->as_floating_point()) {
      if (!std::isfinite(f->get()))
        fail(n->source(), join_path(path, key), "must be a finite number");
      return f->get();
    }
    if (const auto* s = n->as_string()) return units::parse_number(s->get(), where);
    fail(n->source(), join_path(path, key), fmt::format("must be a number, not {}", type_name(*n)));
  }

  template <class T>
  std::optional<T> choice(const toml::table& t, std::string_view key, std::string_view path,
                          std::span<const Named<T>> names) const {
    const auto s = text(t, key, path);
    if (!s) return std::nullopt;
    if (const auto v = value_in(names, text::normalise_name(*s))) return v;
    fail(t.get(key)->source(), join_path(path, key),
         fmt::format("{} is not allowed (allowed: {})", echo(*s), names_in(names)));
  }

  // Bounds are inclusive, up to the rounding of a unit conversion ("36F" is the 20 K end):
  // a value that rounds past an end is held to it. The error names the key's own line.
  void check_range(const toml::table& t, std::string_view key, std::string_view path, Kind kind,
                   double& value, double lo, double hi, std::string_view allowed = {}) const {
    if (units::within(value, lo, hi)) {
      value = units::held_within(value, lo, hi);
      return;
    }
    fail(t.get(key)->source(), join_path(path, key),
         fmt::format(
             "{} is outside the allowed range ({})", show(kind, value),
             allowed.empty() ? units::format_range(kind, system, lo, hi) : std::string(allowed)));
  }

  // The TOML type of a node with its article, for "must be ..., not a boolean".
  static std::string type_name(const toml::node& n) {
    switch (n.type()) {
      case toml::node_type::table: return "a table";
      case toml::node_type::array: return "an array";
      case toml::node_type::string: return "a string";
      case toml::node_type::integer: return "an integer";
      case toml::node_type::floating_point: return "a number";
      case toml::node_type::boolean: return "a boolean";
      case toml::node_type::date:
      case toml::node_type::time:
      case toml::node_type::date_time: return "a date or time";
      default: return "a value";
    }
  }

 private:
  std::string quantity_text(const toml::node& n, std::string_view key, Kind kind) const {
    if (const auto* s = n.as_string()) return s->get();
    if (const auto* i = n.as_integer()) return fmt::format("{}", i->get());
    if (const auto* f = n.as_floating_point()) return fmt::format("{}", f->get());
    fail(n.source(), key,
         fmt::format("must be {} (a string with its unit in quotes, or a bare number in {} "
                     "units), not {}",
                     units::kind_name(kind), units::system_name(system), type_name(n)));
  }

  std::string file_;
};

units::System read_units(const Reader& r, const toml::table& root, const toml::table* site) {
  const toml::node* top = root.get("units");
  const toml::node* in_site = site ? site->get("units") : nullptr;
  if (top && in_site)
    r.fail(in_site->source(), "site.units",
           fmt::format("the unit system is already set by the top-level units (line {}); give "
                       "it once",
                       line_of(top->source())));
  if (top) return *r.choice(root, "units", "", units::system_names());
  if (in_site) return *r.choice(*site, "units", "site", units::system_names());
  return units::System::ip;
}

Site read_site(const Reader& r, const toml::table* t) {
  Site s;
  if (t == nullptr) return s;
  r.check_keys(*t, "site", kSiteKeys, "[site]");
  if (auto n = r.text(*t, "name", "site")) s.name = *n;
  if (auto z = r.quantity(*t, "elevation", "site", Kind::length)) {
    r.check_range(*t, "elevation", "site", Kind::length, *z, psychro::kMinElevationM,
                  psychro::kMaxElevationM);
    s.elevation_m = z;
    s.pressure_origin = r.origin(t->get("elevation")->source(), "site.elevation");
  }
  if (auto p = r.quantity(*t, "pressure", "site", Kind::pressure)) {
    if (s.elevation_m)
      r.fail(t->get("pressure")->source(), "site.pressure",
             fmt::format("give elevation or pressure, not both (elevation is on line {})",
                         line_of(t->get("elevation")->source())));
    r.check_range(*t, "pressure", "site", Kind::pressure, *p, psychro::kMinPressureKpa,
                  psychro::kMaxPressureKpa);
    s.pressure_kpa = p;
    s.pressure_origin = r.origin(t->get("pressure")->source(), "site.pressure");
  }
  auto code_text = [&](std::string_view key, std::string& value, std::string& origin) {
    const toml::node* n = t->get(key);
    if (n == nullptr) return;
    // A climate zone may be written as a bare number (zones 7 and 8 carry no letter).
    if (const auto* i = n->as_integer())
      value = fmt::format("{}", i->get());
    else
      value = *r.text(*t, key, "site");
    origin = r.origin(n->source(), Reader::join_path("site", key));
    if (value.find_first_not_of(" \t") == std::string::npos)
      r.fail(n->source(), Reader::join_path("site", key), "must not be empty");
  };
  code_text("energy_code", s.energy_code, s.energy_code_origin);
  code_text("climate_zone", s.climate_zone, s.climate_zone_origin);
  return s;
}

// A quantity the [air_handler] table must give, in the example's form when it is missing.
double required_quantity(const Reader& r, const toml::table& t, std::string_view key, Kind kind,
                         std::string_view example) {
  auto v = r.quantity(t, key, "air_handler", kind);
  if (!v)
    r.missing(t, Reader::join_path("air_handler", key),
              fmt::format("e.g. {} = \"{}\"", key, example));
  return *v;
}

// The return air of [air_handler]: dry-bulb and exactly one humidity form, above the supply
// setpoint and a state that exists at the site pressure.
void read_return_air(const Reader& r, const toml::table& t, double pressure_kpa, UnitFile& u) {
  constexpr std::string_view P = "air_handler";
  const airside::AirHandler& a = u.air_handler;
  u.return_air.dry_bulb_c = required_quantity(r, t, "return_air_temp", Kind::temperature,
                                              r.system == units::System::ip ? "75F" : "24C");
  u.return_air.system = r.system;
  const ReturnHumidityKey* given = nullptr;
  for (const auto& h : kReturnHumidityKeys) {
    const toml::node* n = t.get(h.key);
    if (n == nullptr) continue;
    if (given)
      r.fail(n->source(), Reader::join_path(P, h.key),
             fmt::format("give one return-air humidity, not both {} (line {}) and {}", given->key,
                         line_of(t.get(given->key)->source()), h.key));
    given = &h;
    u.return_air.humidity_kind = h.input;
    const Kind kind = humidity_input_kind(h.input);
    u.return_air.humidity_value = *r.quantity(t, h.key, P, kind);
    if (kind == Kind::fraction &&
        !(u.return_air.humidity_value >= 0.0 && u.return_air.humidity_value <= 1.0))
      r.check_range(t, h.key, P, Kind::fraction, u.return_air.humidity_value, 0.0, 1.0,
                    "0% to 100%");
  }
  if (!given)
    r.missing(t, "air_handler.return_air_rh",
              "the return-air humidity: one of return_air_rh, return_air_dew_point, "
              "return_air_wet_bulb, return_air_humidity_ratio");
  if (a.supply_air_temp_c >= u.return_air.dry_bulb_c)
    r.fail(t.get("supply_air_temp")->source(), "air_handler.supply_air_temp",
           fmt::format("{} is not below return_air_temp {} (line {}); the supply setpoint must "
                       "be below the return air",
                       r.show(Kind::temperature, a.supply_air_temp_c),
                       r.show(Kind::temperature, u.return_air.dry_bulb_c),
                       line_of(t.get("return_air_temp")->source())));
  // The return state must exist at the site pressure (properties() throws when it does not).
  (void)u.return_air.properties(
      pressure_kpa, r.origin(t.get(given->key)->source(), Reader::join_path(P, given->key)));
}

void read_air_handler(const Reader& r, const toml::table& t, double pressure_kpa, UnitFile& u) {
  constexpr std::string_view P = "air_handler";
  r.check_keys(t, P, kAirHandlerKeys, "[air_handler]");
  airside::AirHandler& a = u.air_handler;
  const bool is_ip = r.system == units::System::ip;

  auto required = [&](std::string_view key, Kind kind, std::string_view example) {
    return required_quantity(r, t, key, kind, example);
  };
  a.supply_airflow_m3_per_s =
      required("supply_airflow", Kind::airflow, is_ip ? "12000cfm" : "5.6m3/s");
  if (!(a.supply_airflow_m3_per_s > 0.0))
    r.fail(t.get("supply_airflow")->source(), "air_handler.supply_airflow",
           fmt::format("{} is not allowed (more than 0)",
                       r.show(Kind::airflow, a.supply_airflow_m3_per_s)));

  a.supply_air_temp_c = required("supply_air_temp", Kind::temperature, is_ip ? "55F" : "13C");
  r.check_range(t, "supply_air_temp", P, Kind::temperature, a.supply_air_temp_c, -40.0, 60.0);

  if (auto f = r.quantity(t, "fan_heat", P, Kind::temperature_difference)) {
    r.check_range(t, "fan_heat", P, Kind::temperature_difference, *f, 0.0, 20.0);
    a.fan_heat_k = *f;
  }
  if (auto f = r.choice(t, "fan_position", P, airside::fan_position_names())) a.fan_position = *f;
  if (auto e = r.choice(t, "economizer", P, airside::economizer_names())) a.economizer = *e;

  // Ventilation minimum: a fraction, or an airflow (a ratio of standard-air volume flows is
  // the ratio of dry-air mass flows).
  const toml::node* min_frac = t.get("min_outdoor_air");
  const toml::node* min_flow = t.get("min_outdoor_airflow");
  if (min_frac && min_flow)
    r.fail(min_flow->source(), "air_handler.min_outdoor_airflow",
           fmt::format("give min_outdoor_air or min_outdoor_airflow, not both (min_outdoor_air "
                       "is on line {})",
                       line_of(min_frac->source())));
  std::string_view min_key;
  if (min_frac) {
    min_key = "min_outdoor_air";
    a.min_oa_fraction = *r.quantity(t, min_key, P, Kind::fraction);
    r.check_range(t, min_key, P, Kind::fraction, a.min_oa_fraction, 0.0, 1.0);
  } else if (min_flow) {
    min_key = "min_outdoor_airflow";
    double flow = *r.quantity(t, min_key, P, Kind::airflow);
    if (units::within(flow, 0.0, a.supply_airflow_m3_per_s))
      flow = units::held_within(flow, 0.0, a.supply_airflow_m3_per_s);
    else
      r.fail(min_flow->source(), "air_handler.min_outdoor_airflow",
             fmt::format("{} is outside the allowed range (0 up to supply_airflow {})",
                         r.show(Kind::airflow, flow),
                         r.show(Kind::airflow, a.supply_airflow_m3_per_s)));
    u.min_outdoor_airflow_m3_per_s = flow;
    a.min_oa_fraction = flow / a.supply_airflow_m3_per_s;
  } else {
    r.missing(t, "air_handler.min_outdoor_air",
              "the ventilation minimum: min_outdoor_air = \"20%\" or min_outdoor_airflow = "
              "\"2400cfm\"");
  }
  if (auto m = r.quantity(t, "max_outdoor_air", P, Kind::fraction)) {
    if (!(*m > 0.0 && *m <= 1.0))
      r.check_range(t, "max_outdoor_air", P, Kind::fraction, *m, 0.0, 1.0, "above 0%, up to 100%");
    a.max_oa_fraction = *m;
  }
  if (a.min_oa_fraction > a.max_oa_fraction) {
    const toml::node* max_node = t.get("max_outdoor_air");
    r.fail(t.get(min_key)->source(), Reader::join_path(P, min_key),
           fmt::format(
               "the minimum {} is above max_outdoor_air {}{}",
               r.show(Kind::fraction, a.min_oa_fraction), r.show(Kind::fraction, a.max_oa_fraction),
               max_node ? fmt::format(" (line {})", line_of(max_node->source())) : std::string()));
  }
  if (auto rh = r.quantity(t, "coil_leaving_rh_max", P, Kind::fraction)) {
    if (!(*rh > 0.0 && *rh <= 1.0))
      r.check_range(t, "coil_leaving_rh_max", P, Kind::fraction, *rh, 0.0, 1.0,
                    "above 0%, up to 100%");
    a.coil_leaving_rh_max = *rh;
  }

  read_return_air(r, t, pressure_kpa, u);
  try {
    airside::validate(a);
  } catch (const InputError& e) {
    r.fail(t.source(), "air_handler", e.what());
  }
}

airside::EnergyWeights read_energy(const Reader& r, const toml::table* t) {
  airside::EnergyWeights w;
  if (t == nullptr) return w;
  r.check_keys(*t, "energy", kEnergyKeys, "[energy]");
  for (auto [key, member] : {std::pair{"cooling_weight", &airside::EnergyWeights::cooling},
                             std::pair{"heating_weight", &airside::EnergyWeights::heating}}) {
    if (auto v = r.number(*t, key, "energy")) {
      if (!(*v >= 0.0 && *v <= 1000.0))
        r.fail(t->get(key)->source(), Reader::join_path("energy", key),
               fmt::format("{} is outside the allowed range (0 to 1000)", *v));
      w.*member = *v;
    }
  }
  if (w.cooling == 0.0 && w.heating == 0.0)
    r.fail(t->source(), "energy",
           "cooling_weight and heating_weight are both 0: nothing would "
           "cost energy");
  return w;
}

// The plausible band of a setting: "strategy.dew_point_limit" for a dew-point limit.
std::string setting_band(Quantity q, std::string_view role) {
  std::string stem(highlimit::quantity_name(q));
  std::replace(stem.begin(), stem.end(), '-', '_');
  return fmt::format("strategy.{}_{}", stem, role);
}

// A limit, offset or deadband of quantity q, within its allowed range.
double read_setting(const Reader& r, const toml::table& t, std::string_view key,
                    std::string_view path, Quantity q, Reference ref, bool is_deadband) {
  const SettingBounds& b = bounds(q);
  if (is_deadband) {
    const Kind k = highlimit::quantity_difference_kind(q);
    double v = *r.quantity(t, key, path, k, setting_band(q, "deadband"));
    r.check_range(t, key, path, k, v, 0.0, b.difference_max);
    return v;
  }
  if (ref == Reference::fixed) {
    const Kind k = highlimit::quantity_kind(q);
    double v = *r.quantity(t, key, path, k, setting_band(q, "limit"));
    r.check_range(t, key, path, k, v, b.limit_min, b.limit_max);
    return v;
  }
  const Kind k = highlimit::quantity_difference_kind(q);
  double v = *r.quantity(t, key, path, k, setting_band(q, "offset"));
  r.check_range(t, key, path, k, v, -b.difference_max, b.difference_max);
  return v;
}

std::string quantity_list() {
  std::string out;
  for (Quantity q :
       {Quantity::dry_bulb, Quantity::enthalpy, Quantity::dew_point, Quantity::humidity_ratio})
    out += (out.empty() ? "" : ", ") + std::string(highlimit::quantity_name(q));
  return out;
}

highlimit::Condition read_condition(const Reader& r, const toml::table& c,
                                    const std::string& path) {
  r.check_keys(c, path, kConditionKeys, "a condition");
  const auto qname = r.text(c, "quantity", path);
  if (!qname)
    r.missing(c, Reader::join_path(path, "quantity"), fmt::format("one of {}", quantity_list()));
  const auto q = highlimit::quantity_from_name(text::normalise_name(*qname));
  if (!q)
    r.fail(c.get("quantity")->source(), Reader::join_path(path, "quantity"),
           fmt::format("{} is not a quantity (allowed: {})", echo(*qname), quantity_list()));
  highlimit::Condition cond;
  cond.quantity = *q;
  if (const auto rname = r.text(c, "reference", path)) {
    const auto ref = highlimit::reference_from_name(text::normalise_name(*rname));
    if (!ref)
      r.fail(c.get("reference")->source(), Reader::join_path(path, "reference"),
             fmt::format("{} is not a reference (allowed: fixed, return)", echo(*rname)));
    cond.reference = *ref;
  }
  if (cond.reference == Reference::fixed) {
    if (const toml::node* o = c.get("offset"))
      r.fail(o->source(), Reader::join_path(path, "offset"),
             "a fixed condition takes limit, not offset (offset belongs to reference = "
             "\"return\")");
    if (!c.get("limit"))
      r.missing(c, Reader::join_path(path, "limit"), "a fixed condition needs its limit");
    cond.limit = read_setting(r, c, "limit", path, cond.quantity, Reference::fixed, false);
  } else {
    if (const toml::node* l = c.get("limit"))
      r.fail(l->source(), Reader::join_path(path, "limit"),
             "a return-referenced condition takes offset (added to the return-air value), not "
             "limit");
    if (c.get("offset"))
      cond.limit = read_setting(r, c, "offset", path, cond.quantity, Reference::return_air, false);
  }
  if (c.get("deadband"))
    cond.deadband = read_setting(r, c, "deadband", path, cond.quantity, cond.reference, true);
  return cond;
}

std::string preset_list() {
  return join(highlimit::presets(),
              [](const highlimit::PresetInfo& p) { return std::string(p.name); });
}

highlimit::Strategy read_preset_strategy(const Reader& r, const toml::table& t,
                                         const std::string& path, const std::string& preset,
                                         std::string name) {
  PresetSettings settings = highlimit::preset_defaults();
  // The preset's own conditions say which settings it takes.
  const highlimit::Strategy probe = highlimit::make_preset(preset, settings);
  std::vector<std::string_view> takes;
  for (const auto& pk : kPresetKeys)
    for (const auto& c : probe.conditions)
      if (c.quantity == pk.quantity && c.reference == pk.reference) takes.push_back(pk.key);
  std::vector<Quantity> quantities;
  for (const auto& c : probe.conditions)
    if (std::find(quantities.begin(), quantities.end(), c.quantity) == quantities.end())
      quantities.push_back(c.quantity);
  if (quantities.size() == 1) takes.push_back(kSingleDeadbandKey);
  for (const auto& dk : kDeadbandKeys)
    if (std::find(quantities.begin(), quantities.end(), dk.quantity) != quantities.end())
      takes.push_back(dk.key);
  auto uses = [&](std::string_view key) {
    return std::find(takes.begin(), takes.end(), key) != takes.end();
  };
  auto refuse_unused = [&](std::string_view key) {
    const toml::node* n = t.get(key);
    if (n == nullptr || uses(key)) return;
    r.fail(n->source(), Reader::join_path(path, key),
           fmt::format("preset '{}' does not use {} (it takes: {})", preset, key,
                       join(takes, [](std::string_view s) { return std::string(s); })));
  };

  for (const auto& pk : kPresetKeys) {
    refuse_unused(pk.key);
    if (t.get(pk.key))
      settings.*pk.member = read_setting(r, t, pk.key, path, pk.quantity, pk.reference, false);
  }
  for (const auto& dk : kDeadbandKeys) {
    refuse_unused(dk.key);
    if (t.get(dk.key))
      settings.*dk.member = read_setting(r, t, dk.key, path, dk.quantity, Reference::fixed, true);
  }
  if (const toml::node* n = t.get(kSingleDeadbandKey)) {
    if (!uses(kSingleDeadbandKey)) {
      std::string own;
      for (const auto& dk : kDeadbandKeys)
        if (uses(dk.key)) own += (own.empty() ? "" : ", ") + std::string(dk.key);
      r.fail(n->source(), Reader::join_path(path, kSingleDeadbandKey),
             fmt::format("preset '{}' has conditions on more than one quantity; give each its "
                         "own deadband ({})",
                         preset, own));
    }
    const Quantity q = quantities.front();
    for (const auto& dk : kDeadbandKeys) {
      if (dk.quantity != q) continue;
      if (const toml::node* both = t.get(dk.key))
        r.fail(both->source(), Reader::join_path(path, dk.key),
               fmt::format("give deadband or {}, not both (deadband is on line {})", dk.key,
                           line_of(n->source())));
      settings.*dk.member = read_setting(r, t, kSingleDeadbandKey, path, q, Reference::fixed, true);
    }
  }
  return highlimit::make_preset(preset, settings, std::move(name));
}

std::vector<highlimit::Strategy> read_strategies(const Reader& r, const toml::table& root) {
  std::vector<highlimit::Strategy> out;
  const toml::node* node = root.get("strategy");
  if (node == nullptr) return out;
  const toml::array* list = node->as_array();
  if (list == nullptr || !list->is_array_of_tables())
    r.fail(node->source(), "strategy",
           "must be an array of tables: write each strategy under its own [[strategy]] header");
  if (list->empty())
    r.fail(node->source(), "strategy", "is empty; give at least one [[strategy]] or none at all");

  std::vector<std::string_view> keys = {"name", "preset", "conditions", kSingleDeadbandKey};
  for (const auto& pk : kPresetKeys) keys.push_back(pk.key);
  for (const auto& dk : kDeadbandKeys) keys.push_back(dk.key);

  std::vector<std::uint32_t> name_lines;
  for (std::size_t i = 0; i < list->size(); ++i) {
    const toml::table& t = *list->get(i)->as_table();
    const std::string path = fmt::format("strategy[{}]", i + 1);
    r.check_keys(t, path, keys, "[[strategy]]");
    const auto preset_text = r.text(t, "preset", path);
    const toml::node* conditions = t.get("conditions");
    std::optional<std::string> name = r.text(t, "name", path);
    if (name) {
      const auto first = name->find_first_not_of(" \t");
      if (first == std::string::npos)
        r.fail(t.get("name")->source(), Reader::join_path(path, "name"), "must not be empty");
      *name = name->substr(first, name->find_last_not_of(" \t") - first + 1);
    }

    highlimit::Strategy s;
    if (preset_text && conditions)
      r.fail(conditions->source(), Reader::join_path(path, "conditions"),
             fmt::format("give preset or conditions, not both (preset is on line {})",
                         line_of(t.get("preset")->source())));
    if (preset_text) {
      const std::string preset = text::normalise_name(*preset_text);
      if (!highlimit::is_preset(preset))
        r.fail(t.get("preset")->source(), Reader::join_path(path, "preset"),
               fmt::format("{} is not a preset (allowed: {})", echo(*preset_text), preset_list()));
      s = read_preset_strategy(r, t, path, preset, name.value_or(preset));
    } else if (conditions) {
      for (const auto& pk : kPresetKeys)
        if (const toml::node* n = t.get(pk.key))
          r.fail(n->source(), Reader::join_path(path, pk.key),
                 "is a preset setting; with conditions, give the limit in the condition itself");
      for (std::string_view key : {std::string_view(kSingleDeadbandKey), kDeadbandKeys[0].key,
                                   kDeadbandKeys[1].key, kDeadbandKeys[2].key})
        if (const toml::node* n = t.get(key))
          r.fail(n->source(), Reader::join_path(path, key),
                 "is a preset setting; with conditions, give each condition its own deadband");
      if (!name)
        r.missing(t, Reader::join_path(path, "name"),
                  "a strategy with its own conditions needs a name");
      const toml::array* arr = conditions->as_array();
      if (arr == nullptr || !arr->is_array_of_tables() || arr->empty())
        r.fail(conditions->source(), Reader::join_path(path, "conditions"),
               "must be a non-empty list of conditions, e.g. [ { quantity = \"enthalpy\", "
               "reference = \"fixed\", limit = \"28btu/lb\" } ]");
      s.name = *name;
      for (std::size_t j = 0; j < arr->size(); ++j)
        s.conditions.push_back(read_condition(r, *arr->get(j)->as_table(),
                                              fmt::format("{}.conditions[{}]", path, j + 1)));
    } else {
      r.missing(t, Reader::join_path(path, "preset"),
                fmt::format("give preset (one of {}) or conditions", preset_list()));
    }

    const toml::source_region& name_at = name ? t.get("name")->source() : t.source();
    for (std::size_t k = 0; k < out.size(); ++k)
      if (out[k].name == s.name)
        r.fail(name_at, Reader::join_path(path, "name"),
               fmt::format("{} is already the name of strategy[{}] (line {}); names must "
                           "differ",
                           echo(s.name), k + 1, name_lines[k]));
    name_lines.push_back(line_of(name_at));
    out.push_back(std::move(s));
  }
  return out;
}

}  // namespace

double Site::design_pressure_kpa() const {
  if (pressure_kpa) return *pressure_kpa;
  if (elevation_m) return psychro::standard_pressure_kpa(*elevation_m);
  return psychro::kStandardPressureKpa;
}

UnitFile parse_unit_file(std::string_view text, std::string_view name) {
  check_toml_depth(text, name);
  toml::table root;
  try {
    root = toml::parse(text, std::string(name));
  } catch (const toml::parse_error& e) {
    throw InputError(
        fmt::format("{}:{}: TOML syntax error: {}", name, e.source().begin.line, e.description()));
  }
  Reader r{std::string(name)};
  r.check_keys(root, "", kTopKeys, "the unit file");

  UnitFile u;
  u.path = std::string(name);
  const toml::table* site = r.table(root, "site", "");
  r.system = read_units(r, root, site);
  u.units = r.system;
  u.site = read_site(r, site);

  const toml::table* ah = r.table(root, "air_handler", "");
  if (ah == nullptr)
    throw InputError(
        fmt::format("{}: [air_handler] is missing; it is required (see "
                    "the README section 'The unit file')",
                    name));
  read_air_handler(r, *ah, u.site.design_pressure_kpa(), u);
  u.weights = read_energy(r, r.table(root, "energy", ""));
  u.strategies = read_strategies(r, root);
  u.strategies_defaulted = u.strategies.empty();
  u.warnings = std::move(r.warnings);
  for (auto [key, slot] : {std::pair{"weather", &u.weather}, std::pair{"schedule", &u.schedule},
                           std::pair{"sensors", &u.sensors}})
    if (r.table(root, key, ""))
      *slot = detail::make_raw_table(std::move(*root.get(key)->as_table()));
  return u;
}

UnitFile load_unit_file(const std::string& path) {
  // A unit file is a page of settings; anything near this size is not one.
  constexpr std::uintmax_t kMaxUnitFileBytes = 1u << 20;
  return parse_unit_file(read_input_file(path, "the unit file", kMaxUnitFileBytes), path);
}

std::vector<highlimit::Strategy> strategies_or_presets(const UnitFile& unit) {
  if (!unit.strategies.empty()) return unit.strategies;
  return highlimit::all_presets(highlimit::preset_defaults());
}

}  // namespace limitline
