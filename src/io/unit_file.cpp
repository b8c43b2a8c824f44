// Reading the unit file: strict TOML with one-line errors that name file, line and key.
#include <limitline/io/unit_file.hpp>

#include <limitline/io/codes.hpp>
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
#include <tuple>

namespace limitline {
namespace {

using highlimit::PresetSettings;
using highlimit::Quantity;
using highlimit::Reference;
using units::Kind;

// The largest design_cooling_capacity accepted at all: 50 MW, far beyond one air handler.
constexpr double kMaxCoolingCapacityKw = 50000.0;

constexpr std::string_view kTopKeys[] = {"units",    "site",    "air_handler", "loads",
                                         "plant",    "energy",  "strategy",    "weather",
                                         "schedule", "sensors", "audit"};
constexpr std::string_view kAuditKeys[] = {
    "columns",         "outdoor_accuracy", "return_accuracy", "mixed_accuracy", "supply_accuracy",
    "max_gap_minutes", "utc_offset",       "min_samples",     "min_hours",      "supply_tolerance"};
// The most an accuracy or tolerance may be: beyond 5 K a sensor tells nothing of an economizer.
constexpr double kAuditMaxAccuracyK = 5.0;
constexpr double kAuditMaxToleranceK = 10.0;
constexpr std::string_view kSiteKeys[] = {"name",        "elevation",    "pressure",
                                          "energy_code", "climate_zone", "units"};
constexpr std::string_view kAirHandlerKeys[] = {"supply_airflow",
                                                "supply_air_temp",
                                                "fan_heat",
                                                "fan_position",
                                                "min_outdoor_air",
                                                "min_outdoor_airflow",
                                                "max_outdoor_air",
                                                "economizer",
                                                "coil_leaving_rh_max",
                                                "return_air_temp",
                                                "return_air_rh",
                                                "return_air_dew_point",
                                                "return_air_wet_bulb",
                                                "return_air_humidity_ratio",
                                                "airflow_control",
                                                "min_airflow",
                                                "airflow_basis",
                                                "supply_air_reset",
                                                "design_cooling_capacity"};
constexpr std::string_view kResetKeys[] = {"outdoor_low", "supply_at_low", "outdoor_high",
                                           "supply_at_high"};
constexpr std::string_view kLoadsKeys[] = {"space_temp",  "return_air_rise", "internal_sensible",
                                           "envelope_ua", "latent",          "file",
                                           "sensible",    "time_convention"};
constexpr std::string_view kLoadsCoefficientKeys[] = {"internal_sensible", "envelope_ua"};
constexpr std::string_view kLoadsFileOnlyKeys[] = {"sensible", "time_convention"};
constexpr std::string_view kLoadsColumnKeys[] = {"column", "unit"};
constexpr std::string_view kPlantKeys[] = {"cooling_cop",        "cooling_kw_per_ton",
                                           "heating_efficiency", "electricity_price",
                                           "heating_price",      "currency"};
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
    case Kind::power:
    case Kind::conductance: return 2;
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
  const toml::table* document = nullptr;  // the whole file, for validated()
  // Implausible values used as written (UnitFile::warnings).
  mutable std::vector<std::string> warnings;

  std::string origin(const toml::source_region& where, std::string_view key) const {
    return fmt::format("{}:{}: {}", file_, line_of(where), key);
  }

  [[noreturn]] void fail(const toml::source_region& where, std::string_view key,
                         std::string_view message) const {
    throw InputError(fmt::format("{}: {}", origin(where, key), message));
  }

  // A model's validation message ("FIELD: ..." or "FIELD = ..."), raised again at the line of
  // FIELD in this file ("air_handler.min_airflow"), or of its table when the key is absent.
  template <class Check>
  void validated(Check&& check) const {
    try {
      check();
    } catch (const InputError& e) {
      const std::string m = e.what();
      const std::string field = m.substr(0, m.find_first_of(": "));
      std::string_view path = field;
      const toml::node* n = nullptr;
      while (!path.empty() && n == nullptr) {
        n = document->at_path(path).node();
        const std::size_t dot = path.rfind('.');
        path = dot == std::string_view::npos ? std::string_view() : path.substr(0, dot);
      }
      throw InputError(
          fmt::format("{}:{}: {}", file_, line_of(n ? n->source() : document->source()), m));
    }
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

// supply_air_reset = { outdoor_low, supply_at_low, outdoor_high, supply_at_high }: all four,
// supply temperatures in the range of the supply setpoint, a line rising in outdoor air.
part_load::SupplyAirReset read_reset(const Reader& r, const toml::table& t) {
  constexpr std::string_view P = "air_handler.supply_air_reset";
  r.check_keys(t, P, kResetKeys, "supply_air_reset");
  const bool is_ip = r.system == units::System::ip;
  struct Point {
    std::string_view key, band;
    double lo, hi;
    std::string_view example_ip, example_si;
    double part_load::SupplyAirReset::*member;
  };
  using R = part_load::SupplyAirReset;
  constexpr Point kPoints[] = {
      {"outdoor_low", "outdoor.dry_bulb", -60.0, 60.0, "50F", "10C", &R::outdoor_low_c},
      {"supply_at_low", "air_handler.supply_air_temp", -40.0, 60.0, "60F", "15.5C",
       &R::supply_at_low_c},
      {"outdoor_high", "outdoor.dry_bulb", -60.0, 60.0, "65F", "18C", &R::outdoor_high_c},
      {"supply_at_high", "air_handler.supply_air_temp", -40.0, 60.0, "55F", "13C",
       &R::supply_at_high_c},
  };
  R reset;
  for (const Point& p : kPoints) {
    auto v = r.quantity(t, p.key, P, Kind::temperature, p.band);
    if (!v)
      r.missing(t, Reader::join_path(P, p.key),
                fmt::format("all four points of the reset are required, e.g. {} = \"{}\"", p.key,
                            is_ip ? p.example_ip : p.example_si));
    r.check_range(t, p.key, P, Kind::temperature, *v, p.lo, p.hi);
    reset.*p.member = *v;
  }
  if (!(reset.outdoor_high_c > reset.outdoor_low_c))
    r.fail(t.get("outdoor_high")->source(), Reader::join_path(P, "outdoor_high"),
           fmt::format("{} is not above outdoor_low {}; the reset runs from a lower to a higher "
                       "outdoor dry-bulb",
                       r.show(Kind::temperature, reset.outdoor_high_c),
                       r.show(Kind::temperature, reset.outdoor_low_c)));
  return reset;
}

// The part-load keys of [air_handler]: how the airflow and the supply temperature follow the
// hour.
void read_control(const Reader& r, const toml::table& t, UnitFile& u) {
  constexpr std::string_view P = "air_handler";
  part_load::Control& c = u.control;
  if (auto v = r.choice(t, "airflow_control", P, part_load::airflow_control_names()))
    c.airflow = *v;
  if (auto b = r.choice(t, "airflow_basis", P, part_load::airflow_basis_names())) c.basis = *b;
  if (const toml::node* n = t.get("min_airflow")) {
    if (c.airflow != part_load::AirflowControl::variable)
      r.fail(n->source(), "air_handler.min_airflow",
             "is the floor of variable airflow; with constant airflow control the unit always "
             "runs at supply_airflow (set airflow_control = \"variable\", or remove "
             "min_airflow)");
    double m = *r.quantity(t, "min_airflow", P, Kind::fraction);
    if (!(m > 0.0))
      r.fail(n->source(), "air_handler.min_airflow",
             fmt::format("{} is not allowed (above 0%, up to 100%)", r.show(Kind::fraction, m)));
    r.check_range(t, "min_airflow", P, Kind::fraction, m, 0.0, 1.0, "above 0%, up to 100%");
    c.min_airflow_fraction = m;
  }
  if (const toml::table* reset = r.table(t, "supply_air_reset", P)) c.reset = read_reset(r, *reset);
  const airside::AirHandler& design = u.air_handler;
  r.validated([&] { part_load::validate(c, design); });
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
    u.control.min_outdoor_airflow_m3_per_s = flow;
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

  if (auto q = r.quantity(t, "design_cooling_capacity", P, Kind::power)) {
    // Up to a large central plant's worth on one unit; the plausible band warns well before.
    r.check_range(t, "design_cooling_capacity", P, Kind::power, *q, 0.0, kMaxCoolingCapacityKw);
    if (!(*q > 0.0))
      r.fail(t.get("design_cooling_capacity")->source(), "air_handler.design_cooling_capacity",
             fmt::format("{} is not allowed (more than 0)", r.show(Kind::power, *q)));
    u.design_cooling_capacity_kw = q;
    u.design_cooling_capacity_origin =
        r.origin(t.get("design_cooling_capacity")->source(), "air_handler.design_cooling_capacity");
  }
  read_return_air(r, t, pressure_kpa, u);
  try {
    airside::validate(a);
  } catch (const InputError& e) {
    r.fail(t.source(), "air_handler", e.what());
  }
  read_control(r, t, u);
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

// A column of the hourly loads file: { column = "...", unit = "kW" }; the unit may be left to
// the column's header.
void read_loads_column(const Reader& r, const toml::table& t, std::string_view key,
                       std::string& column, std::string& unit, std::string& origin) {
  const std::string path = Reader::join_path("loads", key);
  const toml::table* c = r.table(t, key, "loads");
  r.check_keys(*c, path, kLoadsColumnKeys, "a loads column");
  const auto name = r.text(*c, "column", path);
  if (!name)
    r.missing(*c, Reader::join_path(path, "column"),
              "the header of the column in the loads file, e.g. column = \"Sensible (kW)\"");
  if (text::trim(*name).empty())
    r.fail(c->get("column")->source(), Reader::join_path(path, "column"), "must not be empty");
  column = std::string(text::trim(*name));
  if (auto u = r.text(*c, "unit", path)) {
    const std::string unit_path = Reader::join_path(path, "unit");
    (void)units::unit_scale(Kind::power, *u, r.origin(c->get("unit")->source(), unit_path));
    unit = *u;
  }
  origin = r.origin(c->source(), path);
}

// [loads] in its file form: the hourly loads come from a CSV the app layer reads.
UnitFile::LoadsFile read_loads_file(const Reader& r, const toml::table& t) {
  for (std::string_view key : kLoadsCoefficientKeys)
    if (const toml::node* n = t.get(key))
      r.fail(n->source(), Reader::join_path("loads", key),
             fmt::format("give the load coefficients or an hourly file, not both (file is on "
                         "line {})",
                         line_of(t.get("file")->source())));
  UnitFile::LoadsFile f;
  const toml::node* file = t.get("file");
  f.path = *r.text(t, "file", "loads");
  if (text::trim(f.path).empty()) r.fail(file->source(), "loads.file", "must not be empty");
  f.origin = r.origin(file->source(), "loads.file");
  if (!t.get("sensible"))
    r.missing(t, "loads.sensible",
              "the file's sensible-load column, e.g. sensible = { column = \"Sensible (kW)\" }");
  read_loads_column(r, t, "sensible", f.sensible_column, f.sensible_unit, f.sensible_origin);
  if (const toml::node* l = t.get("latent")) {
    if (!l->is_table())
      r.fail(l->source(), "loads.latent",
             fmt::format("with file, latent names a column of the file, e.g. latent = {{ "
                         "column = \"Latent (kW)\" }}, not {} (a latent power belongs to the "
                         "coefficient form, without file)",
                         Reader::type_name(*l)));
    read_loads_column(r, t, "latent", f.latent_column, f.latent_unit, f.latent_origin);
  }
  if (auto c = r.text(t, "time_convention", "loads"))
    f.time_convention = weather::parse_time_convention(
        *c, r.origin(t.get("time_convention")->source(), "loads.time_convention"));
  return f;
}

// [loads] in its coefficient form: q_s = internal_sensible + UA·(t_out − t_space), q_l = latent.
part_load::LoadCoefficients read_load_coefficients(const Reader& r, const toml::table& t) {
  constexpr std::string_view P = "loads";
  for (std::string_view key : kLoadsFileOnlyKeys)
    if (const toml::node* n = t.get(key))
      r.fail(n->source(), Reader::join_path(P, key),
             "belongs to an hourly loads file: give file = \"loads.csv\" with it, or the "
             "load coefficients without it");
  if (!t.get("internal_sensible"))
    r.missing(t, "loads.internal_sensible",
              r.system == units::System::ip
                  ? "the space loads: internal_sensible = \"150kBtu/h\" (with envelope_ua and "
                    "latent), or file = \"loads.csv\" with sensible = { column = \"...\" }"
                  : "the space loads: internal_sensible = \"44kW\" (with envelope_ua and "
                    "latent), or file = \"loads.csv\" with sensible = { column = \"...\" }");
  if (const toml::node* l = t.get("latent"); l && l->is_table())
    r.fail(l->source(), "loads.latent",
           "a column table belongs to an hourly loads file (file = \"...\"); without file, "
           "latent is a power, e.g. latent = \"40kBtu/h\"");
  part_load::LoadCoefficients k;
  // Wide bounds that catch a slip of units or digits; part_load::validate holds the same.
  k.internal_sensible_kw = *r.quantity(t, "internal_sensible", P, Kind::power);
  r.check_range(t, "internal_sensible", P, Kind::power, k.internal_sensible_kw, -1e5, 1e5);
  if (auto ua = r.quantity(t, "envelope_ua", P, Kind::conductance)) {
    r.check_range(t, "envelope_ua", P, Kind::conductance, *ua, 0.0, 1e4);
    k.envelope_ua_kw_per_k = *ua;
  }
  if (auto l = r.quantity(t, "latent", P, Kind::power)) {
    r.check_range(t, "latent", P, Kind::power, *l, 0.0, 1e5);
    k.latent_kw = *l;
  }
  return k;
}

// [loads]: the space the unit serves, with its loads as coefficients or from a file.
void read_loads(const Reader& r, const toml::table* t, const toml::table& ah, UnitFile& u) {
  if (t == nullptr) return;
  constexpr std::string_view P = "loads";
  r.check_keys(*t, P, kLoadsKeys, "[loads]");
  part_load::Space s;
  const auto space = r.quantity(*t, "space_temp", P, Kind::temperature);
  if (!space)
    r.missing(*t, "loads.space_temp",
              r.system == units::System::ip ? "the space cooling setpoint, e.g. space_temp = "
                                              "\"75F\""
                                            : "the space cooling setpoint, e.g. space_temp = "
                                              "\"24C\"");
  s.space_temp_c = *space;
  r.check_range(*t, "space_temp", P, Kind::temperature, s.space_temp_c, 5.0, 45.0);
  if (auto rise = r.quantity(*t, "return_air_rise", P, Kind::temperature_difference)) {
    r.check_range(*t, "return_air_rise", P, Kind::temperature_difference, *rise, 0.0, 10.0);
    s.return_air_rise_k = *rise;
  }
  // The supply air must carry the space's heat at every hour's supply temperature.
  const part_load::Control& c = u.control;
  double warmest = u.air_handler.supply_air_temp_c;
  std::string_view warmest_key = "supply_air_temp";
  if (c.reset) {
    warmest = std::max(c.reset->supply_at_low_c, c.reset->supply_at_high_c);
    warmest_key = "supply_air_reset";
  }
  if (!(warmest < s.space_temp_c))
    r.fail(
        t->get("space_temp")->source(), "loads.space_temp",
        fmt::format("{} is not above the warmest supply air {} (air_handler.{}, line {}); the "
                    "supply air could not carry the space's heat",
                    r.show(Kind::temperature, s.space_temp_c), r.show(Kind::temperature, warmest),
                    warmest_key, line_of(ah.get(warmest_key)->source())));
  if (t->get("file"))
    u.loads_file = read_loads_file(r, *t);
  else
    s.coefficients = read_load_coefficients(r, *t);
  r.validated([&] { part_load::validate(s, u.air_handler, c); });
  u.space = s;
}

// The unit file's part-load settings that only make sense together.
void check_part_load(const Reader& r, const toml::table& ah, const toml::table* loads,
                     const UnitFile& u) {
  if (u.control.airflow == part_load::AirflowControl::variable && !u.space)
    r.fail(ah.get("airflow_control")->source(), "air_handler.airflow_control",
           "\"variable\" needs a [loads] table: the airflow follows the space load (give "
           "[loads], or airflow_control = \"constant\")");
  if (!u.space) return;
  const bool latent = (u.space->coefficients && u.space->coefficients->latent_kw > 0.0) ||
                      (u.loads_file && !u.loads_file->latent_column.empty());
  if (!latent || u.air_handler.min_oa_fraction > 0.0) return;
  const toml::node* min =
      ah.get("min_outdoor_air") ? ah.get("min_outdoor_air") : ah.get("min_outdoor_airflow");
  r.fail(loads->get("latent")->source(), "loads.latent",
         fmt::format(
             "a latent gain with no outdoor air ({}, line {}): the space's moisture "
             "would have no way out but the coil, and no steady return humidity "
             "exists in the hours the coil is dry (allowed: a ventilation minimum "
             "above 0, or no latent gain)",
             min == ah.get("min_outdoor_air") ? "min_outdoor_air = 0%" : "min_outdoor_airflow = 0",
             line_of(min->source())));
}

// A plain number of [plant] within [lo, hi] (`allowed` says so), weighed against its
// plausible band.
double plant_number(const Reader& r, const toml::table& t, std::string_view key, double lo,
                    double hi, std::string_view allowed) {
  double v = *r.number(t, key, "plant");
  const std::string path = Reader::join_path("plant", key);
  const toml::node* n = t.get(key);
  if (!(v >= lo && v <= hi))
    r.fail(n->source(), path, fmt::format("{:g} is outside the allowed range ({})", v, allowed));
  if (const plausible::NumberBand* b = plausible::find_number(path))
    plausible::weigh(*b, v, r.origin(n->source(), path), r.warnings);
  return v;
}

// [plant]: what a kWh of coil energy costs. With it, [energy] has no place.
std::optional<Plant> read_plant(const Reader& r, const toml::table* t, const toml::table* energy) {
  if (t == nullptr) return std::nullopt;
  if (energy)
    r.fail(t->source(), "plant",
           fmt::format("give [plant] (cost) or [energy] (weights), not both ([energy] is on "
                       "line {}); with a plant each kWh is weighed by its price",
                       line_of(energy->source())));
  constexpr std::string_view P = "plant";
  r.check_keys(*t, P, kPlantKeys, "[plant]");
  Plant p;
  const toml::node* cop = t->get("cooling_cop");
  const toml::node* kw = t->get("cooling_kw_per_ton");
  if (cop && kw)
    r.fail(kw->source(), "plant.cooling_kw_per_ton",
           fmt::format("give cooling_cop or cooling_kw_per_ton, not both (cooling_cop is on "
                       "line {})",
                       line_of(cop->source())));
  if (cop)
    p.cooling_cop = plant_number(r, *t, "cooling_cop", 0.05, 20.0, "0.05 to 20");
  else if (kw)
    p.cooling_cop = Plant::cop_from_kw_per_ton(plant_number(
        r, *t, "cooling_kw_per_ton", 0.18, 70.0, "0.18 to 70 kW per ton: a COP of 19.5 to 0.05"));
  else
    r.missing(*t, "plant.cooling_cop",
              "the cooling plant's efficiency: cooling_cop = 3.5 or cooling_kw_per_ton = 1.0");
  if (const toml::node* e = t->get("heating_efficiency")) {
    // A number (0.9), or a percentage written with its sign ("90%").
    const auto* s = e->as_string();
    if (s && text::trim(s->get()).ends_with('%')) {
      const std::string path = "plant.heating_efficiency";
      p.heating_efficiency =
          units::parse(Kind::fraction, s->get(), r.system, r.origin(e->source(), path));
      if (!(p.heating_efficiency > 0.0 && p.heating_efficiency <= 6.0))
        r.fail(e->source(), path,
               fmt::format("{} is outside the allowed range (above 0, up to 600%)",
                           r.show(Kind::fraction, p.heating_efficiency)));
      plausible::weigh(*plausible::find_number(path), p.heating_efficiency,
                       r.origin(e->source(), path), r.warnings);
    } else {
      p.heating_efficiency =
          plant_number(r, *t, "heating_efficiency", 1e-3, 6.0, "above 0, up to 6");
    }
  }
  for (auto [key, member] : {std::pair{"electricity_price", &Plant::electricity_price},
                             std::pair{"heating_price", &Plant::heating_price}}) {
    if (!t->get(key))
      r.missing(*t, Reader::join_path(P, key),
                fmt::format("the price of a kWh, e.g. {} = {}", key,
                            member == &Plant::electricity_price ? "0.12" : "0.04"));
    p.*member = plant_number(r, *t, key, 0.0, 100.0, "0 to 100 per kWh");
  }
  if (auto c = r.text(*t, "currency", P)) p.currency = std::string(text::trim(*c));
  r.validated([&] { validate(p); });
  return p;
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

  std::vector<std::pair<Quantity, Reference>> written;
  for (const auto& pk : kPresetKeys) {
    refuse_unused(pk.key);
    if (!t.get(pk.key)) continue;
    settings.*pk.member = read_setting(r, t, pk.key, path, pk.quantity, pk.reference, false);
    written.emplace_back(pk.quantity, pk.reference);
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
  highlimit::Strategy s = highlimit::make_preset(preset, settings, std::move(name));
  // The settings left out stay common practice until an energy code's defaults apply.
  for (std::size_t i = 0; i < s.conditions.size(); ++i)
    if (std::find(written.begin(), written.end(),
                  std::pair{s.conditions[i].quantity, s.conditions[i].reference}) != written.end())
      s.sources[i] = highlimit::SettingSource::written;
  return s;
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

// [audit]: every key checked here, as the other tables are; the audit command applies them.
std::optional<AuditSettings> read_audit(const Reader& r, const toml::table* t) {
  if (t == nullptr) return std::nullopt;
  constexpr std::string_view P = "audit";
  r.check_keys(*t, P, kAuditKeys, "[audit]");
  AuditSettings a;
  if (const toml::table* cols = r.table(*t, "columns", P))
    for (auto&& [k, v] : *cols) {
      const std::string path = fmt::format("audit.columns.{}", k.str());
      const auto* header = v.as_string();
      if (header == nullptr)
        r.fail(v.source(), path,
               fmt::format("must be a string \"HEADER[:UNIT]\" in quotes, not {}",
                           Reader::type_name(v)));
      a.columns.push_back(trend::parse_column_override(
          fmt::format("{}={}", text::normalise_name(k.str()), header->get()),
          r.origin(v.source(), path)));
    }
  for (auto [key, slot, hi] :
       {std::tuple{"outdoor_accuracy", &a.outdoor_accuracy_k, kAuditMaxAccuracyK},
        std::tuple{"return_accuracy", &a.return_accuracy_k, kAuditMaxAccuracyK},
        std::tuple{"mixed_accuracy", &a.mixed_accuracy_k, kAuditMaxAccuracyK},
        std::tuple{"supply_accuracy", &a.supply_accuracy_k, kAuditMaxAccuracyK},
        std::tuple{"supply_tolerance", &a.supply_tolerance_k, kAuditMaxToleranceK}}) {
    *slot = r.quantity(*t, key, P, Kind::temperature_difference);
    if (!*slot) continue;
    // An accuracy of zero would make every reading exact; a tolerance of zero is a choice.
    const bool accuracy = std::string_view(key) != "supply_tolerance";
    if ((accuracy && !(**slot > 0)) || **slot < 0 || **slot > hi + 1e-9)
      r.fail(t->get(key)->source(), Reader::join_path(P, key),
             fmt::format("{} is outside the allowed range ({} {} to {})",
                         r.show(Kind::temperature_difference, **slot),
                         accuracy ? "more than" : "from", r.show(Kind::temperature_difference, 0.0),
                         r.show(Kind::temperature_difference, hi)));
  }
  auto plain = [&](std::string_view key, double lo, double hi, bool lo_open,
                   std::string_view allowed) -> std::optional<double> {
    const auto v = r.number(*t, key, P);
    if (!v) return v;
    const std::string path = Reader::join_path(P, key);
    const toml::node* n = t->get(key);
    if (!(lo_open ? *v > lo : *v >= lo) || !(*v <= hi))
      r.fail(n->source(), path, fmt::format("{:g} is outside the allowed range ({})", *v, allowed));
    if (const plausible::NumberBand* b = plausible::find_number(path))
      plausible::weigh(*b, *v, r.origin(n->source(), path), r.warnings);
    return v;
  };
  if (const auto m = plain("max_gap_minutes", 0.0, trend::kMaxGapLimitS / 60.0, true,
                           "minutes above 0, at most 527040, a year"))
    a.max_gap_s = *m * 60.0;
  if (const auto n = plain("min_samples", 0.0, 100000.0, false, "a whole number 0 to 100000")) {
    if (*n != std::floor(*n))
      r.fail(t->get("min_samples")->source(), "audit.min_samples",
             fmt::format("{:g} is not a whole number of samples", *n));
    a.min_samples = static_cast<int>(*n);
  }
  a.min_hours = plain("min_hours", 0.0, 8784.0, false, "hours from 0 to 8784, a leap year");
  if (const auto z = r.text(*t, "utc_offset", P))
    a.utc_offset_min =
        trend::parse_utc_offset(*z, r.origin(t->get("utc_offset")->source(), "audit.utc_offset"));
  return a;
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
  r.document = &root;
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
  const toml::table* loads = r.table(root, "loads", "");
  read_loads(r, loads, *ah, u);
  check_part_load(r, *ah, loads, u);
  const toml::table* energy = r.table(root, "energy", "");
  u.weights = read_energy(r, energy);
  u.plant = read_plant(r, r.table(root, "plant", ""), energy);
  u.strategies = read_strategies(r, root);
  u.strategies_defaulted = u.strategies.empty();
  u.audit = read_audit(r, r.table(root, "audit", ""));
  u.warnings = std::move(r.warnings);
  for (auto [key, slot] : {std::pair{"weather", &u.weather}, std::pair{"schedule", &u.schedule},
                           std::pair{"sensors", &u.sensors}})
    if (r.table(root, key, ""))
      *slot = detail::make_raw_table(std::move(*root.get(key)->as_table()));
  return u;
}

UnitFile load_unit_file(const std::string& path) {
  return parse_unit_file(read_input_file(path, "the unit file", kMaxUnitFileBytes), path);
}

namespace {
std::vector<highlimit::Strategy> written_or_presets(const UnitFile& unit) {
  return unit.strategies.empty() ? highlimit::all_presets(highlimit::preset_defaults())
                                 : unit.strategies;
}
// Only a site that names both takes defaults from the code; a site naming one of them is
// refused by each command that judges compliance, with the key at fault.
bool names_code(const Site& site) {
  return !site.energy_code.empty() && !site.climate_zone.empty();
}
}  // namespace

std::vector<highlimit::Strategy> strategies_or_presets(const UnitFile& unit) {
  if (!names_code(unit.site)) return written_or_presets(unit);
  return strategies_or_presets(unit, codes::CodeTables::load_installed());
}

std::vector<highlimit::Strategy> strategies_or_presets(const UnitFile& unit,
                                                       const codes::CodeTables& tables) {
  std::vector<highlimit::Strategy> out = written_or_presets(unit);
  const Site& site = unit.site;
  if (!names_code(site)) return out;
  std::optional<double> pressure;
  if (site.pressure_kpa || site.elevation_m) pressure = site.design_pressure_kpa();
  const codes::ZoneRequirements zone =
      codes::requirements(tables.edition(site.energy_code, site.energy_code_origin),
                          site.climate_zone, {pressure, std::nullopt}, site.climate_zone_origin);
  codes::apply_code_defaults(out, zone);
  return out;
}

CoolingCapacity cooling_capacity(const UnitFile& unit) {
  if (unit.design_cooling_capacity_kw)
    return {*unit.design_cooling_capacity_kw, false, unit.design_cooling_capacity_origin};
  const double p = unit.site.design_pressure_kpa();
  const double kw = airside::return_air_coil_load_kw(unit.air_handler, unit.return_air.at(p), p);
  return {kw, true,
          "estimated from the supply airflow at standard air, 1.204 kg/m³, × (return-air "
          "enthalpy − coil-leaving enthalpy) at the design return air; no outdoor design state "
          "is known, so the outdoor-air load is left out; give air_handler."
          "design_cooling_capacity for the rated figure"};
}

}  // namespace limitline
