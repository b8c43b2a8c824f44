// Energy-code tables: loading and validating data/codes/*.toml, and judging strategies.
#include <limitline/io/codes.hpp>

#include <limitline/io/input_file.hpp>

#include <limitline/error.hpp>
#include <limitline/names.hpp>
#include <limitline/model/psychro.hpp>
#include <limitline/io/toml_depth.hpp>

#include <fmt/format.h>
#include <toml++/toml.h>

#include <algorithm>
#include <cctype>
#include <cmath>
#include <cstdlib>
#include <fstream>
#include <map>
#include <set>
#include <sstream>

namespace limitline::codes {
namespace {

using highlimit::Quantity;
using highlimit::Reference;
using units::Kind;
using units::System;

constexpr std::string_view kAshraeZones[] = {"0A", "0B", "1A", "1B", "2A", "2B", "3A",
                                             "3B", "3C", "4A", "4B", "4C", "5A", "5B",
                                             "5C", "6A", "6B", "7",  "8"};
constexpr std::string_view kCaliforniaZones[] = {"CZ1",  "CZ2",  "CZ3",  "CZ4",  "CZ5",  "CZ6",
                                                 "CZ7",  "CZ8",  "CZ9",  "CZ10", "CZ11", "CZ12",
                                                 "CZ13", "CZ14", "CZ15", "CZ16"};

constexpr Named<ZoneSystem> kZoneSystemNames[] = {{"ashrae-169", ZoneSystem::ashrae169},
                                                  {"california", ZoneSystem::california}};
constexpr Named<Permission> kPermissionNames[] = {{"allowed", Permission::allowed},
                                                  {"prohibited", Permission::prohibited}};
constexpr Named<Verdict> kVerdictWords[] = {
    {"complies", Verdict::complies},
    {"complies-if-selectable", Verdict::complies_if_selectable},
    {"not-allowed", Verdict::not_allowed},
    {"set-wrong", Verdict::set_wrong},
    {"not-evaluable", Verdict::not_evaluable}};

constexpr Quantity kQuantities[] = {Quantity::dry_bulb, Quantity::enthalpy, Quantity::dew_point,
                                    Quantity::humidity_ratio};
constexpr Reference kReferences[] = {Reference::fixed, Reference::return_air};

// Presets never compare a humidity ratio (match_control reads it as a dew point), so this
// only bounds the comparison should a table ever carry one.
constexpr double kHumidityRatioTolerance = 0.00001;

std::string join(const std::vector<std::string>& items, std::string_view sep) {
  std::string out;
  for (const auto& s : items) out += (out.empty() ? "" : std::string(sep)) + s;
  return out;
}

std::string upper_without_blanks(std::string_view s) {
  std::string out;
  for (unsigned char c : s)
    if (!std::isspace(c) && c != '-') out.push_back(static_cast<char>(std::toupper(c)));
  return out;
}

// (quantity, reference) pairs of a preset's conditions, in order.
std::vector<std::pair<Quantity, Reference>> preset_signature(std::string_view preset) {
  std::vector<std::pair<Quantity, Reference>> out;
  for (const auto& c : highlimit::make_preset(preset, highlimit::preset_defaults()).conditions)
    out.emplace_back(c.quantity, c.reference);
  return out;
}

std::string setting_stem(Quantity q, Reference r) {
  std::string stem(highlimit::quantity_name(q));
  std::replace(stem.begin(), stem.end(), '-', '_');
  return r == Reference::return_air ? stem + "_offset" : stem;
}

// --- Reading TOML -----------------------------------------------------------------------

// Reads the keys of one table, remembering which were used so that every other key is an
// error (a misspelt key must not pass silently).
class TableReader {
 public:
  TableReader(const toml::table& table, std::string file, std::string context)
      : table_(table), file_(std::move(file)), context_(std::move(context)) {}

  const toml::node* node(std::string_view key) {
    used_.insert(std::string(key));
    return table_.get(key);
  }
  bool has(std::string_view key) const { return table_.contains(key); }

  [[noreturn]] void fail(std::string_view key, const std::string& message) const {
    const toml::node* n = table_.get(key);
    const auto line = n ? n->source().begin.line : table_.source().begin.line;
    throw InputError(fmt::format("{}:{}: {} key '{}': {}", file_, line, context_, key, message));
  }
  [[noreturn]] void fail_table(const std::string& message) const {
    throw InputError(
        fmt::format("{}:{}: {}: {}", file_, table_.source().begin.line, context_, message));
  }

  std::optional<std::string> string(std::string_view key, bool required) {
    const toml::node* n = node(key);
    if (!n) return missing<std::string>(key, required, "a string");
    if (!n->is_string()) fail(key, "must be a string");
    std::string s = *n->value<std::string>();
    if (required && s.empty()) fail(key, "must not be empty");
    return s;
  }
  std::optional<double> number(std::string_view key, bool required) {
    const toml::node* n = node(key);
    if (!n) return missing<double>(key, required, "a number");
    if (!n->is_number()) fail(key, "must be a number");
    const double v = *n->value<double>();
    if (!std::isfinite(v)) fail(key, "must be a finite number");
    return v;
  }
  std::optional<bool> boolean(std::string_view key, bool required) {
    const toml::node* n = node(key);
    if (!n) return missing<bool>(key, required, "true or false");
    if (!n->is_boolean()) fail(key, "must be true or false");
    return *n->value<bool>();
  }
  std::vector<std::string> strings(std::string_view key, bool required) {
    const toml::node* n = node(key);
    if (!n) {
      missing<int>(key, required, "a list of strings");
      return {};
    }
    const toml::array* a = n->as_array();
    if (!a) fail(key, "must be a list of strings");
    std::vector<std::string> out;
    for (const auto& e : *a) {
      if (!e.is_string()) fail(key, "must be a list of strings");
      out.push_back(*e.value<std::string>());
    }
    return out;
  }
  const toml::table* table(std::string_view key, bool required) {
    const toml::node* n = node(key);
    if (!n) return missing<const toml::table*>(key, required, "a table").value_or(nullptr);
    if (!n->is_table()) fail(key, "must be a table");
    return n->as_table();
  }

  // Every key not read is an error.
  void finish(std::string_view allowed) const {
    for (auto&& [k, v] : table_) {
      if (used_.count(std::string(k.str()))) continue;
      throw InputError(fmt::format("{}:{}: {}: key '{}' is not known (allowed: {})", file_,
                                   k.source().begin.line, context_, k.str(), allowed));
    }
  }

  const std::string& file() const { return file_; }
  std::size_t line() const { return table_.source().begin.line; }

 private:
  template <class T>
  std::optional<T> missing(std::string_view key, bool required, std::string_view what) const {
    if (required) fail_table(fmt::format("key '{}' is missing ({})", key, what));
    return std::nullopt;
  }

  const toml::table& table_;
  std::string file_;
  std::string context_;
  std::set<std::string> used_;
};

// Zones of a row: "all" or a list; each one a zone of the edition, named once.
std::vector<std::string> read_zones(TableReader& r, std::string_view key, const Edition& e) {
  const toml::node* n = r.node(key);
  if (!n) r.fail_table(fmt::format("key '{}' is missing (a list of zones, or \"all\")", key));
  if (n->is_string()) {
    if (*n->value<std::string>() != "all") r.fail(key, "must be \"all\" or a list of zones");
    return e.zones;
  }
  std::vector<std::string> out;
  for (const std::string& z : r.strings(key, true)) {
    std::string canon;
    try {
      canon = normalise_zone(e.zone_system, z, "zone");
    } catch (const InputError& err) {
      r.fail(key, err.what());
    }
    if (!e.has_zone(canon))
      r.fail(key, fmt::format("zone {} is not a zone of {} (its zones: {})", echo(z), e.id,
                              join(e.zones, ", ")));
    if (std::find(out.begin(), out.end(), canon) != out.end())
      r.fail(key, fmt::format("zone {} is listed twice", echo(z)));
    out.push_back(canon);
  }
  if (out.empty()) r.fail(key, "lists no zone");
  return out;
}

void check_agreement(TableReader& r, const StoredLimit& l) {
  const Kind kind = setting_kind(l.quantity, l.reference);
  const double from_ip = units::from_display(kind, System::ip, l.ip);
  const double from_si = units::from_display(kind, System::si, l.si);
  const bool enthalpy = l.quantity == Quantity::enthalpy;
  const double allowed = enthalpy ? kStoredAgreementKjPerKg : kStoredAgreementK;
  if (std::fabs(from_ip - from_si) <= allowed + 1e-9) return;
  const std::string si_key = setting_key(l.quantity, l.reference, System::si);
  r.fail(si_key, fmt::format("{} disagrees with {} = {}, which is {:.2f} {} (allowed difference "
                             "{} {})",
                             l.si, setting_key(l.quantity, l.reference, System::ip), l.ip,
                             units::to_display(kind, System::si, from_ip),
                             units::unit_label(kind, System::si), allowed,
                             units::unit_label(kind, System::si)));
}

constexpr std::string_view kRowKeys =
    "control, modelled, permission, zones, the limit keys of the control, site_enthalpy, "
    "description, clause, table, footnotes, provenance";

Row read_row(const toml::table& t, const std::string& file, const Edition& e) {
  TableReader r(t, file, "[[row]]");
  Row row;
  row.origin = fmt::format("{}:{}", file, r.line());
  row.control = *r.string("control", true);
  row.modelled = r.boolean("modelled", false).value_or(true);
  const bool preset = highlimit::is_preset(row.control);
  if (row.modelled && !preset) {
    std::vector<std::string> names;
    for (const auto& p : highlimit::presets()) names.emplace_back(p.name);
    r.fail("control", fmt::format("{} is not a strategy preset (presets: {}); record a type "
                                  "limitline does not model with modelled = false",
                                  echo(row.control), join(names, ", ")));
  }
  if (!row.modelled && preset)
    r.fail("modelled",
           fmt::format("'{}' is a preset limitline models; drop modelled = false", row.control));
  const std::string permission = *r.string("permission", true);
  if (permission == "allowed")
    row.permission = Permission::allowed;
  else if (permission == "prohibited")
    row.permission = Permission::prohibited;
  else
    r.fail("permission", fmt::format("{} is not allowed or prohibited", echo(permission)));
  row.zones = read_zones(r, "zones", e);

  // Limits: exactly the settings of the preset, both systems, on allowed modelled rows.
  const bool takes_limits = row.modelled && row.permission == Permission::allowed;
  const auto signature =
      takes_limits ? preset_signature(row.control) : std::vector<std::pair<Quantity, Reference>>{};
  for (auto [q, ref] : signature) {
    StoredLimit l{q, ref, 0, 0};
    l.ip = *r.number(setting_key(q, ref, System::ip), true);
    l.si = *r.number(setting_key(q, ref, System::si), true);
    check_agreement(r, l);
    row.limits.push_back(l);
  }
  for (Quantity q : kQuantities)
    for (Reference ref : kReferences)
      for (System s : {System::ip, System::si}) {
        const std::string key = setting_key(q, ref, s);
        const bool wanted =
            std::find(signature.begin(), signature.end(), std::pair{q, ref}) != signature.end();
        if (!r.has(key) || wanted) continue;
        if (!takes_limits)
          r.fail(key, row.modelled ? "a prohibited row takes no limits"
                                   : "a type limitline does not model takes no limits");
        std::vector<std::string> own;
        for (auto [sq, sr] : signature)
          for (System ss : {System::ip, System::si}) own.push_back(setting_key(sq, sr, ss));
        r.fail(key, fmt::format("is not a setting of '{}' (its settings: {})", row.control,
                                join(own, ", ")));
      }

  if (const toml::table* site = r.table("site_enthalpy", false)) {
    const bool has_fixed_enthalpy =
        std::find(signature.begin(), signature.end(),
                  std::pair{Quantity::enthalpy, Reference::fixed}) != signature.end();
    if (!has_fixed_enthalpy)
      r.fail("site_enthalpy", "only an allowed row with a fixed enthalpy limit takes it");
    TableReader sr(*site, file, "site_enthalpy");
    SiteEnthalpyRule rule{};
    rule.dry_bulb_f = *sr.number("dry_bulb_f", true);
    rule.dry_bulb_c = *sr.number("dry_bulb_c", true);
    const double rh = *sr.number("relative_humidity_pct", true);
    if (rh <= 0 || rh > 100) sr.fail("relative_humidity_pct", "must be above 0 and at most 100");
    rule.relative_humidity = rh / 100.0;
    StoredLimit as_limit{Quantity::dry_bulb, Reference::fixed, rule.dry_bulb_f, rule.dry_bulb_c};
    check_agreement(sr, as_limit);
    for (double t : {units::celsius_from_fahrenheit(rule.dry_bulb_f), rule.dry_bulb_c})
      if (t < psychro::kMinTemperatureC || t > psychro::kMaxTemperatureC)
        sr.fail("dry_bulb_c", "is outside the range of the psychrometric model");
    sr.finish("dry_bulb_f, dry_bulb_c, relative_humidity_pct");
    row.site_enthalpy = rule;
  }
  row.description = r.string("description", false).value_or("");
  if (!row.modelled && row.description.empty())
    r.fail_table("a type limitline does not model needs a description of its setting");
  row.clause = *r.string("clause", true);
  row.table = r.string("table", false).value_or("");
  row.footnotes = r.strings("footnotes", false);
  row.provenance = *r.string("provenance", true);
  r.finish(kRowKeys);
  return row;
}

// Rows of one file must not cover a zone twice for the same control.
void check_overlaps(const std::vector<Row>& rows) {
  for (std::size_t i = 0; i < rows.size(); ++i)
    for (std::size_t j = i + 1; j < rows.size(); ++j) {
      if (rows[i].control != rows[j].control) continue;
      for (const auto& z : rows[j].zones)
        if (std::find(rows[i].zones.begin(), rows[i].zones.end(), z) != rows[i].zones.end())
          throw InputError(
              fmt::format("{}: [[row]] control '{}' covers zone {} again (already "
                          "covered by the row at {})",
                          rows[j].origin, rows[j].control, z, rows[i].origin));
    }
}

// Every control type with rows, and every preset, covers every zone exactly once.
void check_coverage(const Edition& e, std::string_view where) {
  std::vector<std::string> controls;
  for (const auto& p : highlimit::presets()) controls.emplace_back(p.name);
  for (const auto& r : e.rows)
    if (std::find(controls.begin(), controls.end(), r.control) == controls.end())
      controls.push_back(r.control);
  for (const auto& c : controls) {
    std::vector<std::string> missing;
    for (const auto& z : e.zones) {
      int n = 0;
      for (const auto& r : e.rows)
        if (r.control == c) n += static_cast<int>(std::count(r.zones.begin(), r.zones.end(), z));
      if (n == 0) missing.push_back(z);
      if (n > 1)
        throw InputError(fmt::format("{}: edition {}: control '{}' covers zone {} more than once",
                                     where, e.id, c, z));
    }
    if (!missing.empty())
      throw InputError(fmt::format(
          "{}: edition {}: control '{}' has no row (allowed or prohibited) for zone{} {}; every "
          "control type must cover every zone",
          where, e.id, c, missing.size() > 1 ? "s" : "", join(missing, ", ")));
  }
}

IntegrationRule read_integration(const toml::table& t, const std::string& file) {
  TableReader r(t, file, "[integration]");
  IntegrationRule rule;
  rule.origin = fmt::format("{}:{}", file, r.line());
  rule.required = *r.boolean("required", true);
  rule.clause = *r.string("clause", true);
  rule.requirement = *r.string("requirement", true);
  rule.provenance = *r.string("provenance", true);
  r.finish("required, clause, requirement, provenance");
  return rule;
}

constexpr std::string_view kGroupKeys =
    "zones, required, capacity_kbtu_per_h, capacity_kw, inclusive, note, provenance";

std::string capacity_key(System s) {
  return fmt::format("capacity_{}", units::key_suffix(Kind::power, s));
}

// A cooling-capacity threshold stored in both systems (kBtu/h, kW), which must agree.
std::pair<double, double> read_capacity(TableReader& r) {
  const std::string ip_key = capacity_key(System::ip), si_key = capacity_key(System::si);
  const double ip = *r.number(ip_key, true), si = *r.number(si_key, true);
  for (const auto& [key, v] : {std::pair{ip_key, ip}, std::pair{si_key, si}})
    if (!(v >= 0.0)) r.fail(key, "must not be negative");
  const double from_ip = units::from_display(Kind::power, System::ip, ip);
  const double larger = std::max(from_ip, si);
  if (std::fabs(from_ip - si) > kCapacityAgreementShare * larger + 1e-9)
    r.fail(si_key, fmt::format("{} disagrees with {} = {}, which is {:.1f} kW (allowed "
                               "difference {:g} % of the threshold)",
                               si, ip_key, ip, from_ip, 100.0 * kCapacityAgreementShare));
  return {ip, si};
}

RequirementGroup read_group(const toml::table& t, const std::string& file, const Edition& e,
                            const std::string& table_provenance) {
  TableReader r(t, file, "[[economizer_requirement.group]]");
  RequirementGroup g;
  g.origin = fmt::format("{}:{}", file, r.line());
  g.zones = read_zones(r, "zones", e);
  g.required = *r.boolean("required", true);
  const std::string ip_key = capacity_key(System::ip), si_key = capacity_key(System::si);
  if (g.required) {
    std::tie(g.capacity_ip, g.capacity_si) = read_capacity(r);
    g.inclusive = *r.boolean("inclusive", true);
  } else {
    for (const std::string& key : {ip_key, si_key, std::string("inclusive")})
      if (r.has(key)) r.fail(key, "a group where no economizer is required takes no threshold");
  }
  g.note = r.string("note", false).value_or("");
  g.provenance = r.string("provenance", false).value_or(table_provenance);
  r.finish(kGroupKeys);
  return g;
}

// Every zone of the edition in exactly one group.
void check_group_coverage(const EconomizerRequirement& req, const Edition& e) {
  std::vector<std::string> missing;
  for (const auto& z : e.zones) {
    const RequirementGroup* first = nullptr;
    for (const auto& g : req.groups) {
      if (std::find(g.zones.begin(), g.zones.end(), z) == g.zones.end()) continue;
      if (first)
        throw InputError(fmt::format(
            "{}: [[economizer_requirement.group]] covers zone {} again (already covered by "
            "the group at {})",
            g.origin, z, first->origin));
      first = &g;
    }
    if (!first) missing.push_back(z);
  }
  if (!missing.empty())
    throw InputError(fmt::format(
        "{}: [economizer_requirement]: no group for zone{} {}; every zone of {} is in exactly "
        "one group (required = false for an exempt zone)",
        req.origin, missing.size() > 1 ? "s" : "", join(missing, ", "), e.id));
}

EconomizerRequirement read_requirement(const toml::table& t, const std::string& file,
                                       const Edition& e) {
  TableReader r(t, file, "[economizer_requirement]");
  EconomizerRequirement req;
  req.origin = fmt::format("{}:{}", file, r.line());
  req.clause = *r.string("clause", true);
  req.table = r.string("table", false).value_or("");
  req.requirement = *r.string("requirement", true);
  req.exceptions = r.strings("exceptions", false);
  req.provenance = *r.string("provenance", true);
  const toml::node* n = r.node("group");
  if (!n) r.fail_table("no [[economizer_requirement.group]] tables");
  const toml::array* a = n->as_array();
  if (!a || !a->is_array_of_tables() || a->empty())
    r.fail("group", "must be written as [[economizer_requirement.group]] tables");
  for (const auto& g : *a) req.groups.push_back(read_group(*g.as_table(), file, e, req.provenance));
  r.finish("clause, table, requirement, exceptions, provenance, group");
  check_group_coverage(req, e);
  return req;
}

// --- Economizer fault detection ------------------------------------------------------------

struct FaultInfo {
  std::string_view name;
  Fault value;
  std::string_view description;
};
constexpr FaultInfo kFaults[] = {
    {"sensor-fault", Fault::sensor_fault,
     "an air-temperature sensor has failed or reads outside what the other readings allow"},
    {"not-economizing-when-allowed", Fault::not_economizing_when_allowed,
     "the high-limit allows outdoor air and cooling is called for, but the damper stays at its "
     "minimum"},
    {"economizing-when-locked-out", Fault::economizing_when_locked_out,
     "the high-limit locks outdoor air out, but the damper is open beyond its minimum"},
    {"damper-not-modulating", Fault::damper_not_modulating,
     "the outdoor-air damper does not move as it is commanded"},
    {"outdoor-air-above-minimum", Fault::outdoor_air_above_minimum,
     "more outdoor air than the ventilation minimum while the unit is not economizing"},
};
static_assert(std::size(kFaults) == kFaultCount);

}  // namespace

std::string_view fault_name(Fault f) { return name_in(kFaults, f); }
std::string_view fault_description(Fault f) {
  for (const auto& i : kFaults)
    if (i.value == f) return i.description;
  return {};
}
std::optional<Fault> fault_from_name(std::string_view name) { return value_in(kFaults, name); }
std::string fault_names() { return names_in(kFaults); }

const RequiredFault* FaultDetection::find(Fault f) const {
  for (const auto& r : faults)
    if (r.fault == f) return &r;
  return nullptr;
}

std::optional<double> FaultDetection::threshold_kw(System compare_in) const {
  if (!capacity_ip) return std::nullopt;
  return compare_in == System::ip ? units::from_display(Kind::power, System::ip, *capacity_ip)
                                  : *capacity_si;
}

std::optional<double> FaultDetection::sensor_accuracy_k(System compare_in) const {
  if (!sensor_accuracy_ip) return std::nullopt;
  return compare_in == System::ip
             ? units::from_display(Kind::temperature_difference, System::ip, *sensor_accuracy_ip)
             : *sensor_accuracy_si;
}

bool FaultDetection::covers_capacity(double capacity_kw, System compare_in) const {
  const auto threshold = threshold_kw(compare_in);
  return !threshold || capacity_kw >= *threshold;
}

namespace {

constexpr Quantity kSelectableQuantities[] = {Quantity::dry_bulb, Quantity::enthalpy,
                                              Quantity::dew_point};

std::string allowance_key(Quantity q, System s) {
  return fmt::format("{}_{}", setting_stem(q, Reference::fixed),
                     units::key_suffix(highlimit::quantity_difference_kind(q), s));
}

SelectableSetpoints read_selectable(const toml::table& t, const std::string& file) {
  TableReader r(t, file, "[selectable_setpoints]");
  SelectableSetpoints f;
  f.origin = fmt::format("{}:{}", file, r.line());
  f.clause = *r.string("clause", true);
  f.table = r.string("table", false).value_or("");
  f.note = *r.string("note", true);
  std::string keys = "clause, table, note, provenance";
  for (Quantity q : kSelectableQuantities) {
    const std::string ip = allowance_key(q, System::ip), si = allowance_key(q, System::si);
    keys += ", " + ip + ", " + si;
    if (!r.has(ip) && !r.has(si)) continue;
    SelectableAllowance a{q, *r.number(ip, true), *r.number(si, true)};
    for (const auto& [key, v] : {std::pair{ip, a.ip}, std::pair{si, a.si}})
      if (!(v > 0.0)) r.fail(key, "must be above 0");
    const Kind kind = highlimit::quantity_difference_kind(q);
    const double from_ip = units::from_display(kind, System::ip, a.ip);
    const double from_si = units::from_display(kind, System::si, a.si);
    const double agree = q == Quantity::enthalpy ? kStoredAgreementKjPerKg : kStoredAgreementK;
    if (std::fabs(from_ip - from_si) > agree + 1e-9)
      r.fail(si, fmt::format("{} disagrees with {} = {}, which is {:.2f} {} (allowed difference "
                             "{} {})",
                             a.si, ip, a.ip, units::to_display(kind, System::si, from_ip),
                             units::unit_label(kind, System::si), agree,
                             units::unit_label(kind, System::si)));
    f.allowances.push_back(a);
  }
  if (f.allowances.empty())
    r.fail_table(fmt::format("gives no allowance (give at least one pair of {}, {})",
                             allowance_key(Quantity::dry_bulb, System::ip),
                             allowance_key(Quantity::dry_bulb, System::si)));
  f.provenance = *r.string("provenance", true);
  r.finish(keys);
  return f;
}

FaultDetection read_fault_detection(const toml::table& t, const std::string& file) {
  TableReader r(t, file, "[fault_detection]");
  FaultDetection f;
  f.origin = fmt::format("{}:{}", file, r.line());
  f.clause = *r.string("clause", true);
  f.applies_to = *r.string("applies_to", true);
  if (r.has(capacity_key(System::ip)) || r.has(capacity_key(System::si)))
    std::tie(f.capacity_ip, f.capacity_si) = read_capacity(r);
  f.sensors = r.strings("sensors", true);
  if (f.sensors.empty()) r.fail("sensors", "lists no sensor");
  if (r.has("sensor_accuracy_delta_f") || r.has("sensor_accuracy_delta_k")) {
    f.sensor_accuracy_ip = *r.number("sensor_accuracy_delta_f", true);
    f.sensor_accuracy_si = *r.number("sensor_accuracy_delta_k", true);
    if (!(*f.sensor_accuracy_ip > 0)) r.fail("sensor_accuracy_delta_f", "must be above 0");
    if (!(*f.sensor_accuracy_si > 0)) r.fail("sensor_accuracy_delta_k", "must be above 0");
    const Kind kind = highlimit::quantity_difference_kind(Quantity::dry_bulb);
    const double from_ip = units::from_display(kind, System::ip, *f.sensor_accuracy_ip);
    const double from_si = units::from_display(kind, System::si, *f.sensor_accuracy_si);
    if (std::fabs(from_ip - from_si) > 0.1 + 1e-9)
      r.fail("sensor_accuracy_delta_k",
             fmt::format("{} disagrees with sensor_accuracy_delta_f = {}, which is {:.2f} K "
                         "(allowed difference 0.1 K)",
                         *f.sensor_accuracy_si, *f.sensor_accuracy_ip, from_ip));
  }
  f.accuracy_range = r.string("accuracy_range", false).value_or("");
  f.status = r.strings("status", false);
  f.testing = r.string("testing", false).value_or("");
  f.reporting = *r.string("reporting", true);
  f.provenance = *r.string("provenance", true);
  const toml::node* n = r.node("fault");
  if (!n) r.fail_table("no [[fault_detection.fault]] tables");
  const toml::array* a = n->as_array();
  if (!a || !a->is_array_of_tables() || a->empty())
    r.fail("fault", "must be written as [[fault_detection.fault]] tables");
  for (const auto& node : *a) {
    TableReader fr(*node.as_table(), file, "[[fault_detection.fault]]");
    const std::string name = *fr.string("fault", true);
    const auto fault = fault_from_name(name);
    if (!fault) fr.fail("fault", fmt::format("{} is not one of {}", echo(name), fault_names()));
    if (f.find(*fault)) fr.fail("fault", fmt::format("{} is listed twice", echo(name)));
    f.faults.push_back({*fault, *fr.string("code_term", true)});
    fr.finish("fault, code_term");
  }
  r.finish(
      "clause, applies_to, capacity_kbtu_per_h, capacity_kw, sensors, sensor_accuracy_delta_f, "
      "sensor_accuracy_delta_k, accuracy_range, status, testing, reporting, provenance, fault");
  return f;
}

std::vector<Row> read_rows(TableReader& top, const Edition& e) {
  const toml::node* n = top.node("row");
  if (!n) top.fail_table("no [[row]] tables");
  const toml::array* a = n->as_array();
  if (!a || !a->is_array_of_tables()) top.fail("row", "must be written as [[row]] tables");
  std::vector<Row> rows;
  for (const auto& t : *a) rows.push_back(read_row(*t.as_table(), top.file(), e));
  check_overlaps(rows);
  return rows;
}

Edition read_edition(const toml::table& doc, const std::string& file) {
  TableReader top(doc, file, "file");
  const toml::table* et = top.table("edition", true);
  TableReader r(*et, file, "[edition]");
  Edition e;
  e.id = *r.string("id", true);
  for (unsigned char c : e.id)
    if (!(std::islower(c) || std::isdigit(c) || c == '-' || c == '.' || c == '+'))
      r.fail("id",
             fmt::format("{} must be lower-case letters, digits, '.', '-' or '+'", echo(e.id)));
  e.title = *r.string("title", true);
  const std::string system = *r.string("zone_system", true);
  if (const auto s = value_in(kZoneSystemNames, system))
    e.zone_system = *s;
  else
    r.fail("zone_system",
           fmt::format("{} is not {}", echo(system), names_in(kZoneSystemNames, " or ")));
  for (const std::string& z : r.strings("zones", true)) {
    std::string canon;
    try {
      canon = normalise_zone(e.zone_system, z, "zone");
    } catch (const InputError& err) {
      r.fail("zones", err.what());
    }
    if (e.has_zone(canon)) r.fail("zones", fmt::format("zone {} is listed twice", echo(z)));
    e.zones.push_back(canon);
  }
  if (e.zones.empty()) r.fail("zones", "lists no zone");
  const std::string governing = *r.string("governing_units", true);
  if (const auto s = value_in(units::system_names(), governing))
    e.governing_units = *s;
  else
    r.fail("governing_units",
           fmt::format("{} is not {}", echo(governing), names_in(units::system_names(), " or ")));
  e.si_note = r.string("si_note", false).value_or("");
  e.provenance = *r.string("provenance", true);
  r.finish("id, title, zone_system, zones, governing_units, si_note, provenance");

  e.integration = read_integration(*top.table("integration", true), file);
  if (const toml::table* req = top.table("economizer_requirement", false))
    e.economizer_requirement = read_requirement(*req, file, e);
  if (const toml::table* sel = top.table("selectable_setpoints", false))
    e.selectable = read_selectable(*sel, file);
  if (const toml::table* fdd = top.table("fault_detection", false))
    e.fault_detection = read_fault_detection(*fdd, file);
  e.rows = read_rows(top, e);
  top.finish(
      "edition, integration, economizer_requirement, selectable_setpoints, fault_detection, row");
  e.sources.push_back(file);
  check_coverage(e, file);
  return e;
}

// An amendment replaces, for each of its rows, the edition's rows of that control in the
// zones it names; an [integration] table replaces the edition's.
void apply_amendment(const toml::table& doc, const std::string& file,
                     std::vector<Edition>& editions) {
  TableReader top(doc, file, "file");
  TableReader r(*top.table("amendment", true), file, "[amendment]");
  const std::string id = *r.string("edition", true);
  auto it =
      std::find_if(editions.begin(), editions.end(), [&](const Edition& e) { return e.id == id; });
  if (it == editions.end()) {
    std::vector<std::string> ids;
    for (const auto& e : editions) ids.push_back(e.id);
    r.fail("edition",
           fmt::format("{} is not a loaded edition (loaded: {})", echo(id), join(ids, ", ")));
  }
  const std::string name = *r.string("name", true);
  r.string("provenance", true);
  r.finish("edition, name, provenance");
  Edition& e = *it;
  if (!top.has("integration") && !top.has("row") && !top.has("economizer_requirement") &&
      !top.has("selectable_setpoints") && !top.has("fault_detection"))
    r.fail_table(
        "changes nothing: give [[row]] tables, an [integration], [economizer_requirement], "
        "[selectable_setpoints] or [fault_detection] table");
  if (const toml::table* integ = top.table("integration", false))
    e.integration = read_integration(*integ, file);
  // Either table replaces the edition's whole table: its groups cover every zone again.
  if (const toml::table* req = top.table("economizer_requirement", false))
    e.economizer_requirement = read_requirement(*req, file, e);
  if (const toml::table* sel = top.table("selectable_setpoints", false))
    e.selectable = read_selectable(*sel, file);
  if (const toml::table* fdd = top.table("fault_detection", false))
    e.fault_detection = read_fault_detection(*fdd, file);
  const std::vector<Row> rows = top.has("row") ? read_rows(top, e) : std::vector<Row>{};
  top.finish(
      "amendment, integration, economizer_requirement, selectable_setpoints, fault_detection, "
      "row");
  for (const Row& amended : rows) {
    for (Row& old : e.rows) {
      if (old.control != amended.control) continue;
      std::erase_if(old.zones, [&](const std::string& z) {
        return std::find(amended.zones.begin(), amended.zones.end(), z) != amended.zones.end();
      });
    }
    std::erase_if(e.rows, [](const Row& row) { return row.zones.empty(); });
    e.rows.push_back(amended);
  }
  e.sources.push_back(fmt::format("{} ({})", file, name));
  check_coverage(e, file);
}

void add_document(std::vector<Edition>& editions, const std::string& origin,
                  const std::string& text) {
  toml::table doc;
  try {
    check_toml_depth(text, origin);
    doc = toml::parse(std::string_view(text), std::string_view(origin));
  } catch (const toml::parse_error& err) {
    throw InputError(fmt::format("{}:{}:{}: not valid TOML: {}", origin, err.source().begin.line,
                                 err.source().begin.column, err.description()));
  }
  if (doc.contains("amendment")) {
    if (doc.contains("edition"))
      throw InputError(
          fmt::format("{}: a file is an [edition] or an [amendment], not both", origin));
    apply_amendment(doc, origin, editions);
    return;
  }
  if (!doc.contains("edition"))
    throw InputError(
        fmt::format("{}: no [edition] or [amendment] table: not a code table", origin));
  Edition e = read_edition(doc, origin);
  for (const auto& other : editions)
    if (other.id == e.id)
      throw InputError(
          fmt::format("{}: edition {} is already loaded from {}; write an "
                      "[amendment] to change it",
                      origin, e.id, other.sources.front()));
  editions.push_back(std::move(e));
}

// A code table is a few hundred lines; anything near this size is not one.
constexpr std::uintmax_t kMaxCodeTableBytes = 4u << 20;

std::string read_file(const std::filesystem::path& path) {
  return read_input_file(path, "the code table", kMaxCodeTableBytes);
}

// --- Requirements -------------------------------------------------------------------------

RequiredSetting required_setting(const StoredLimit& l, const Row& row, System basis,
                                 std::optional<double> pressure_kpa) {
  const Kind kind = setting_kind(l.quantity, l.reference);
  const double tabulated = units::from_display(kind, basis, basis == System::ip ? l.ip : l.si);
  RequiredSetting s{l.quantity, l.reference, tabulated, tabulated, false, l.ip, l.si};
  if (l.quantity == Quantity::enthalpy && l.reference == Reference::fixed && row.site_enthalpy &&
      pressure_kpa) {
    const double at_site = site_enthalpy_kj_per_kg(*row.site_enthalpy, basis, *pressure_kpa);
    const double at_sea =
        site_enthalpy_kj_per_kg(*row.site_enthalpy, basis, psychro::kStandardPressureKpa);
    const double threshold = units::from_display(Kind::enthalpy_difference, System::ip,
                                                 kAltitudeFootnoteThresholdBtuPerLb);
    if (std::fabs(at_site - at_sea) > threshold) {
      s.value = at_site;
      s.site_adjusted = true;
    }
  }
  return s;
}

AllowedControl allowed_control(const Row& row, System basis, std::optional<double> pressure) {
  AllowedControl c{&row, {}};
  for (const auto& l : row.limits) c.settings.push_back(required_setting(l, row, basis, pressure));
  return c;
}

// How much a strategy has in common with an allowed type, to offer the closest first.
int closeness(const AllowedControl& c, const highlimit::Strategy& s) {
  int score = 0;
  for (const auto& r : c.settings) {
    bool same_quantity = false, same_pair = false;
    for (const auto& cond : s.conditions) {
      same_quantity = same_quantity || cond.quantity == r.quantity;
      same_pair = same_pair || (cond.quantity == r.quantity && cond.reference == r.reference);
    }
    score += same_pair ? 2 : same_quantity ? 1 : 0;
  }
  return score;
}

std::vector<AllowedControl> alternatives(const ZoneRequirements& zone,
                                         const highlimit::Strategy& s) {
  std::vector<AllowedControl> out;
  for (const auto& c : zone.allowed)
    if (c.row->modelled) out.push_back(c);
  std::stable_sort(out.begin(), out.end(), [&](const AllowedControl& a, const AllowedControl& b) {
    return closeness(a, s) > closeness(b, s);
  });
  return out;
}

std::string setting_name(Quantity q, Reference r) {
  return fmt::format("{} {}", highlimit::quantity_name(q),
                     r == Reference::fixed ? "limit" : "offset");
}

int decimals_for(Quantity q) { return q == Quantity::humidity_ratio ? 5 : 1; }

}  // namespace

// --- Zones --------------------------------------------------------------------------------

std::string_view zone_system_name(ZoneSystem s) { return name_in(kZoneSystemNames, s); }
std::string_view permission_name(Permission p) { return name_in(kPermissionNames, p); }
std::string_view verdict_word(Verdict v) { return name_in(kVerdictWords, v); }

std::span<const std::string_view> all_zones(ZoneSystem s) {
  if (s == ZoneSystem::california) return kCaliforniaZones;
  return kAshraeZones;
}

std::string normalise_zone(ZoneSystem s, std::string_view text, std::string_view origin) {
  std::string z = upper_without_blanks(text);
  if (s == ZoneSystem::california) {
    if (z.starts_with("CZ")) z.erase(0, 2);
    int n = 0;
    const bool digits =
        !z.empty() && z.size() <= 2 &&
        std::all_of(z.begin(), z.end(), [](unsigned char c) { return std::isdigit(c); });
    if (digits) n = std::stoi(z);
    if (!digits || n < 1 || n > 16)
      throw InputError(
          fmt::format("{}: {} is not a California climate zone (allowed: 1 to 16, "
                      "written 12 or CZ12)",
                      origin, echo(text)));
    return fmt::format("CZ{}", n);
  }
  for (std::string_view known : kAshraeZones)
    if (known == z) return z;
  if (z.size() == 2 && (z[0] == '7' || z[0] == '8'))
    throw InputError(
        fmt::format("{}: climate zone {}: ASHRAE 169 zones 7 and 8 have no A/B/C "
                    "split; write {}",
                    origin, echo(text), z[0]));
  if (z.size() == 1 && z[0] >= '0' && z[0] <= '6')
    throw InputError(
        fmt::format("{}: climate zone {} needs its moisture regime letter (for "
                    "example {}A)",
                    origin, echo(text), z));
  std::vector<std::string> all(std::begin(kAshraeZones), std::end(kAshraeZones));
  throw InputError(fmt::format("{}: {} is not an ASHRAE 169 climate zone (allowed: {})", origin,
                               echo(text), join(all, ", ")));
}

// --- Edition ------------------------------------------------------------------------------

const Row* Edition::row(std::string_view control, std::string_view zone) const {
  for (const auto& r : rows)
    if (r.control == control && std::find(r.zones.begin(), r.zones.end(), zone) != r.zones.end())
      return &r;
  return nullptr;
}

std::vector<std::string> Edition::controls() const {
  std::vector<std::string> out;
  for (const auto& p : highlimit::presets()) out.emplace_back(p.name);
  for (const auto& r : rows)
    if (std::find(out.begin(), out.end(), r.control) == out.end()) out.push_back(r.control);
  return out;
}

bool Edition::has_zone(std::string_view zone) const {
  return std::find(zones.begin(), zones.end(), zone) != zones.end();
}

// --- Loading ------------------------------------------------------------------------------

CodeTables CodeTables::from_documents(
    std::span<const std::pair<std::string, std::string>> documents) {
  CodeTables t;
  for (const auto& [origin, text] : documents) add_document(t.editions_, origin, text);
  return t;
}

CodeTables CodeTables::load(const std::filesystem::path& dir,
                            std::span<const std::filesystem::path> extra) {
  std::vector<std::filesystem::path> files;
  std::error_code ec;
  for (const auto& entry : std::filesystem::directory_iterator(dir, ec))
    if (entry.path().extension() == ".toml") files.push_back(entry.path());
  if (ec)
    throw InputError(
        fmt::format("{}: cannot read the code-table folder: {}", dir.string(), ec.message()));
  if (files.empty())
    throw InputError(fmt::format("{}: no code tables (*.toml) in this folder", dir.string()));
  std::sort(files.begin(), files.end());
  files.insert(files.end(), extra.begin(), extra.end());
  std::vector<std::pair<std::string, std::string>> docs;
  for (const auto& f : files) docs.emplace_back(f.string(), read_file(f));
  return from_documents(docs);
}

CodeTables CodeTables::load_installed(std::span<const std::filesystem::path> extra) {
  return load(code_table_dir(), extra);
}

std::filesystem::path code_table_dir() {
  namespace fs = std::filesystem;
  if (const char* env = std::getenv("LIMITLINE_DATA_DIR"); env && *env) {
    const fs::path dir = fs::path(env) / "codes";
    if (!fs::is_directory(dir))
      throw InputError(
          fmt::format("LIMITLINE_DATA_DIR={}: there is no codes folder there "
                      "(expected {})",
                      env, dir.string()));
    return dir;
  }
  for (const fs::path& dir : {fs::path(LIMITLINE_INSTALLED_DATA_DIR) / "codes",
                              fs::path(LIMITLINE_SOURCE_DATA_DIR) / "codes"})
    if (fs::is_directory(dir)) return dir;
  throw InputError(
      fmt::format("no code tables found: neither {}/codes nor {}/codes exists; set "
                  "LIMITLINE_DATA_DIR to the folder that holds codes/",
                  LIMITLINE_INSTALLED_DATA_DIR, LIMITLINE_SOURCE_DATA_DIR));
}

const Edition* CodeTables::find(std::string_view id) const {
  for (const auto& e : editions_)
    if (e.id == id) return &e;
  return nullptr;
}

const Edition& CodeTables::edition(std::string_view id, std::string_view origin) const {
  if (const Edition* e = find(id)) return *e;
  std::vector<std::string> ids;
  for (const auto& e : editions_) ids.push_back(e.id);
  throw InputError(fmt::format("{}: {} is not a loaded code edition (allowed: {})", origin,
                               echo(id), join(ids, ", ")));
}

// --- Requirements -------------------------------------------------------------------------

double site_enthalpy_kj_per_kg(const SiteEnthalpyRule& rule, System compare_in,
                               double pressure_kpa) {
  const double t =
      compare_in == System::ip ? units::celsius_from_fahrenheit(rule.dry_bulb_f) : rule.dry_bulb_c;
  const double w =
      psychro::humidity_ratio_from_relative_humidity(t, rule.relative_humidity, pressure_kpa);
  return psychro::enthalpy_kj_per_kg(t, w);
}

std::optional<highlimit::Strategy> AllowedControl::strategy(
    const highlimit::PresetSettings& base) const {
  if (!row->modelled) return std::nullopt;
  highlimit::PresetSettings s = base;
  for (const auto& r : settings) {
    const bool fixed = r.reference == Reference::fixed;
    switch (r.quantity) {
      case Quantity::dry_bulb: (fixed ? s.dry_bulb_limit_c : s.dry_bulb_offset_k) = r.value; break;
      case Quantity::enthalpy:
        (fixed ? s.enthalpy_limit_kj_per_kg : s.enthalpy_offset_kj_per_kg) = r.value;
        break;
      case Quantity::dew_point: s.dew_point_limit_c = r.value; break;
      case Quantity::humidity_ratio: break;
    }
  }
  return highlimit::make_preset(row->control, s);
}

ZoneRequirements requirements(const Edition& edition, std::string_view zone,
                              const SiteConditions& site, std::string_view origin) {
  const std::string z = normalise_zone(edition.zone_system, zone, origin);
  if (!edition.has_zone(z))
    throw InputError(fmt::format("{}: climate zone {} is not a zone of {} (its zones: {})", origin,
                                 z, edition.id, join(edition.zones, ", ")));
  if (site.pressure_kpa) psychro::check_pressure(*site.pressure_kpa, "site pressure");
  ZoneRequirements req{
      &edition, z, site.pressure_kpa, site.compare_in.value_or(edition.governing_units), {}, {}};
  for (const auto& control : edition.controls()) {
    const Row* row = edition.row(control, z);
    if (!row) continue;  // coverage is checked on load; a preset always has a row
    if (row->permission == Permission::allowed)
      req.allowed.push_back(allowed_control(*row, req.compare_in, req.pressure_kpa));
    else
      req.prohibited.push_back(row);
  }
  return req;
}

void check_site_code(std::string_view edition, std::string_view edition_origin,
                     std::string_view zone, std::string_view zone_origin) {
  if (edition.empty() && zone.empty()) return;
  if (edition.empty() || zone.empty())
    throw InputError(
        fmt::format("{}: the site names {} but no {}; give both energy_code and "
                    "climate_zone in [site], or neither",
                    edition.empty() ? zone_origin : edition_origin,
                    edition.empty() ? "a climate zone" : "an energy code",
                    edition.empty() ? "energy_code" : "climate_zone"));
  const CodeTables tables = CodeTables::load_installed();
  requirements(tables.edition(edition, edition_origin), zone, {}, zone_origin);
}

// --- Economizer requirement ----------------------------------------------------------------

double RequirementGroup::threshold_kw(System compare_in) const {
  return compare_in == System::ip ? units::from_display(Kind::power, System::ip, capacity_ip)
                                  : capacity_si;
}

const RequirementGroup* EconomizerRequirement::group(std::string_view zone) const {
  for (const auto& g : groups)
    if (std::find(g.zones.begin(), g.zones.end(), zone) != g.zones.end()) return &g;
  return nullptr;
}

std::optional<double> SelectableSetpoints::allowance(Quantity quantity, System compare_in) const {
  for (const auto& a : allowances)
    if (a.quantity == quantity)
      return units::from_display(highlimit::quantity_difference_kind(quantity), compare_in,
                                 compare_in == System::ip ? a.ip : a.si);
  return std::nullopt;
}

std::string_view need_text(Need n) {
  switch (n) {
    case Need::required: return "required";
    case Need::below_threshold: return "not required (below the threshold)";
    case Need::exempt_zone: return "not required in this zone";
    case Need::no_table: break;
  }
  return "not stated (the edition's file has no requirement table)";
}

NeedCheck economizer_need(const ZoneRequirements& zone, std::optional<double> capacity_kw) {
  NeedCheck out;
  if (!zone.edition->economizer_requirement) return out;
  out.table = &*zone.edition->economizer_requirement;
  out.group = out.table->group(zone.zone);
  if (!out.group) return out;  // coverage is checked on load
  if (!out.group->required) {
    out.need = Need::exempt_zone;
    return out;
  }
  out.threshold_kw = out.group->threshold_kw(zone.compare_in);
  out.need = Need::required;
  if (capacity_kw) {
    // Compared in the figure's own units, to the digit the table states it.
    const double shown = units::to_display(Kind::power, zone.compare_in, *capacity_kw);
    const double limit = units::to_display(Kind::power, zone.compare_in, out.threshold_kw);
    const bool reaches = out.group->inclusive ? shown >= limit - 1e-9 : shown > limit + 1e-9;
    if (!reaches) out.need = Need::below_threshold;
  }
  return out;
}

std::string threshold_text(const NeedCheck& n, System system) {
  if (!n.group) return std::string(need_text(n.need));
  if (!n.group->required)
    return fmt::format("no economizer is required in this zone ({})",
                       n.table->table.empty() ? n.table->clause : n.table->table);
  return fmt::format(
      "an air economizer is required on cooling systems of {} {} of cooling "
      "capacity ({})",
      n.group->inclusive ? "at least" : "more than",
      units::format(Kind::power, system, n.threshold_kw, 1),
      n.table->table.empty() ? n.table->clause : n.table->table);
}

// --- Preset settings from the code ----------------------------------------------------------

std::string code_source_text(const ZoneRequirements& zone, const Row& row) {
  const std::string& prov = row.provenance;
  const std::string first = prov.substr(0, prov.find(';'));
  return fmt::format("{} zone {}, {}{}{}", zone.edition->title, zone.zone,
                     row.table.empty() ? row.clause : row.table, first.empty() ? "" : ", ", first);
}

void apply_code_defaults(std::vector<highlimit::Strategy>& strategies,
                         const ZoneRequirements& zone) {
  for (auto& st : strategies) {
    if (st.preset.empty()) continue;
    const auto allowed = std::find_if(
        zone.allowed.begin(), zone.allowed.end(),
        [&](const AllowedControl& c) { return c.row->modelled && c.row->control == st.preset; });
    if (allowed == zone.allowed.end()) continue;  // prohibited: common practice, not-allowed
    bool any = false;
    for (std::size_t i = 0; i < st.conditions.size(); ++i) {
      if (st.source(i) != highlimit::SettingSource::common_practice) continue;
      highlimit::Condition& c = st.conditions[i];
      for (const auto& req : allowed->settings) {
        if (req.quantity != c.quantity || req.reference != c.reference) continue;
        c.limit = req.value;
        st.sources[i] = highlimit::SettingSource::code;
        any = true;
      }
    }
    if (any) st.code_source = code_source_text(zone, *allowed->row);
  }
}

// --- Matching -----------------------------------------------------------------------------

std::optional<MatchedControl> match_control(const highlimit::Strategy& strategy,
                                            double pressure_kpa) {
  // Conditions on the same quantity and reference are ORed: the lowest limit governs.
  std::map<std::pair<Quantity, Reference>, MatchedSetting> merged;
  for (const auto& c : strategy.conditions) {
    MatchedSetting m{{c.quantity, c.reference, c.limit}, 1, false};
    if (c.quantity == Quantity::humidity_ratio && c.reference == Reference::fixed) {
      // At one pressure a humidity ratio fixes the dew point (eq. 38 through eq. 20).
      try {
        m.setting.quantity = Quantity::dew_point;
        m.setting.value = psychro::dew_point_from_humidity_ratio_c(c.limit, pressure_kpa);
        m.from_humidity_ratio = true;
      } catch (const InputError&) {
        return std::nullopt;
      }
    }
    const auto key = std::pair{m.setting.quantity, m.setting.reference};
    auto it = merged.find(key);
    if (it == merged.end()) {
      merged.emplace(key, m);
      continue;
    }
    const int n = it->second.conditions + 1;
    if (m.setting.value < it->second.setting.value) it->second = m;
    it->second.conditions = n;
  }
  if (merged.empty()) return std::nullopt;
  for (const auto& p : highlimit::presets()) {
    const auto sig = preset_signature(p.name);
    if (sig.size() != merged.size()) continue;
    MatchedControl out{std::string(p.name), {}};
    for (const auto& key : sig) {
      auto it = merged.find(key);
      if (it == merged.end()) break;
      out.settings.push_back(it->second);
    }
    if (out.settings.size() == sig.size()) return out;
  }
  return std::nullopt;
}

// --- Verdicts -----------------------------------------------------------------------------

double tolerance(Quantity q, System system) {
  const bool ip = system == System::ip;
  switch (q) {
    case Quantity::dry_bulb:
    case Quantity::dew_point: return ip ? kTemperatureToleranceF : kTemperatureToleranceK;
    case Quantity::enthalpy: return ip ? kEnthalpyToleranceBtuPerLb : kEnthalpyToleranceKjPerKg;
    case Quantity::humidity_ratio: return kHumidityRatioTolerance;
  }
  return 0.0;
}

// Every deviation is of a fixed limit the edition's selectable-setpoint footnote covers, and
// within its allowance (compared as the tolerance is, in the figures of the verdict).
bool within_selectable(const ZoneRequirements& zone, const std::vector<Deviation>& deviations) {
  if (!zone.edition->selectable) return false;
  for (const auto& d : deviations) {
    if (d.reference != Reference::fixed) return false;
    const auto allowance = zone.edition->selectable->allowance(d.quantity, zone.compare_in);
    if (!allowance || std::fabs(d.difference()) > *allowance + 1e-9) return false;
  }
  return !deviations.empty();
}

StrategyCheck check_strategy(const ZoneRequirements& zone, const highlimit::Strategy& strategy) {
  StrategyCheck out;
  out.matched = match_control(strategy, zone.pressure_kpa.value_or(psychro::kStandardPressureKpa));
  if (!out.matched) {
    out.verdict = Verdict::not_evaluable;
    out.instead = alternatives(zone, strategy);
    return out;
  }
  out.row = zone.edition->row(out.matched->control, zone.zone);
  const auto allowed = std::find_if(zone.allowed.begin(), zone.allowed.end(),
                                    [&](const AllowedControl& c) { return c.row == out.row; });
  if (!out.row || allowed == zone.allowed.end()) {
    out.verdict = Verdict::not_allowed;
    out.instead = alternatives(zone, strategy);
    return out;
  }
  for (const auto& req : allowed->settings) {
    for (const auto& m : out.matched->settings) {
      if (m.setting.quantity != req.quantity || m.setting.reference != req.reference) continue;
      const Deviation d{req.quantity, req.reference, m.setting.value, req.value};
      // Differences are compared in the units of the figure the verdict uses.
      const double off = units::to_display(highlimit::quantity_difference_kind(req.quantity),
                                           zone.compare_in, d.difference());
      if (std::fabs(off) > tolerance(req.quantity, zone.compare_in) + 1e-9)
        out.deviations.push_back(d);
    }
  }
  out.verdict = out.deviations.empty() ? Verdict::complies : Verdict::set_wrong;
  if (out.verdict == Verdict::set_wrong && within_selectable(zone, out.deviations)) {
    out.verdict = Verdict::complies_if_selectable;
    out.selectable = &*zone.edition->selectable;
  }
  if (out.verdict != Verdict::complies) out.instead = {*allowed};
  return out;
}

IntegrationCheck check_integration(const Edition& edition, airside::EconomizerType type) {
  const bool ok = !edition.integration.required || type == airside::EconomizerType::integrated;
  return {ok, &edition.integration};
}

std::vector<std::string> compliance_words(const CodeTables& tables, std::string_view edition,
                                          std::string_view zone, std::optional<double> pressure_kpa,
                                          std::span<const highlimit::Strategy> strategies,
                                          std::string_view edition_origin,
                                          std::string_view zone_origin) {
  return compliance_words(requirements(tables.edition(edition, edition_origin), zone,
                                       SiteConditions{pressure_kpa, {}}, zone_origin),
                          strategies);
}

std::vector<std::string> compliance_words(const ZoneRequirements& zone,
                                          std::span<const highlimit::Strategy> strategies) {
  std::vector<std::string> out;
  for (const auto& s : strategies) out.emplace_back(verdict_word(check_strategy(zone, s).verdict));
  return out;
}

// --- Text ---------------------------------------------------------------------------------

Kind setting_kind(Quantity q, Reference r) {
  return r == Reference::fixed ? highlimit::quantity_kind(q)
                               : highlimit::quantity_difference_kind(q);
}

std::string setting_key(Quantity q, Reference r, System system) {
  return fmt::format("{}_{}", setting_stem(q, r), units::key_suffix(setting_kind(q, r), system));
}

std::string setting_text(const Setting& s, System system) {
  const Kind kind = setting_kind(s.quantity, s.reference);
  const std::string_view q = highlimit::quantity_name(s.quantity);
  if (s.reference == Reference::fixed)
    return fmt::format("outdoor {} > {}", q,
                       units::format(kind, system, s.value, decimals_for(s.quantity)));
  const double shown = units::to_display(kind, system, s.value);
  const double step = std::pow(10.0, -decimals_for(s.quantity));
  if (std::fabs(shown) < 0.5 * step) return fmt::format("outdoor {} > return {}", q, q);
  return fmt::format("outdoor {} > return {} {} {}", q, q, shown < 0 ? "−" : "+",
                     units::format(kind, system, std::fabs(s.value), decimals_for(s.quantity)));
}

std::string control_text(const AllowedControl& c, System system) {
  if (!c.row->modelled) return c.row->description;
  std::vector<std::string> parts;
  for (const auto& r : c.settings)
    parts.push_back(setting_text({r.quantity, r.reference, r.value}, system));
  return join(parts, " or ");
}

std::string deviation_text(const Deviation& d, System system) {
  const Kind kind = setting_kind(d.quantity, d.reference);
  const Kind diff_kind = highlimit::quantity_difference_kind(d.quantity);
  const int dec = decimals_for(d.quantity);
  const bool above = d.difference() > 0;
  return fmt::format("{} {} is {} {} the required {} ({})", setting_name(d.quantity, d.reference),
                     units::format(kind, system, d.actual, dec),
                     units::format(diff_kind, system, std::fabs(d.difference()), dec),
                     above ? "above" : "below", units::format(kind, system, d.required, dec),
                     above ? "the economizer would stay on in air the code excludes"
                           : "the economizer would shut off earlier than the code sets");
}

std::string verdict_text(const StrategyCheck& check, const ZoneRequirements& zone, System system) {
  const std::string where = fmt::format("zone {} of {}", zone.zone, zone.edition->id);
  std::string read_as;
  if (check.matched) {
    std::vector<std::string> notes;
    for (const auto& m : check.matched->settings) {
      if (m.conditions > 1)
        notes.push_back(fmt::format("{} conditions on outdoor {} act as the lowest, {}",
                                    m.conditions, highlimit::quantity_name(m.setting.quantity),
                                    setting_text(m.setting, system)));
      if (m.from_humidity_ratio)
        notes.push_back(fmt::format(
            "the humidity-ratio limit is read as {} at {}", setting_text(m.setting, system),
            units::format(Kind::pressure, system,
                          zone.pressure_kpa.value_or(psychro::kStandardPressureKpa),
                          system == System::ip ? 2 : 1)));
    }
    if (!notes.empty()) read_as = " (" + join(notes, "; ") + ")";
  }
  const auto cite = [](const Row& r) {
    return r.table.empty() ? r.clause : fmt::format("{}, {}", r.clause, r.table);
  };
  switch (check.verdict) {
    case Verdict::complies:
      return fmt::format("{} is allowed in {} and set as required ({}){}", check.matched->control,
                         where, cite(*check.row), read_as);
    case Verdict::not_allowed:
      return fmt::format("{} is not allowed in {} ({}){}", check.matched->control, where,
                         cite(*check.row), read_as);
    case Verdict::set_wrong: {
      std::vector<std::string> parts;
      for (const auto& d : check.deviations) parts.push_back(deviation_text(d, system));
      return fmt::format("{} is allowed in {} ({}), but {}{}", check.matched->control, where,
                         cite(*check.row), join(parts, "; "), read_as);
    }
    case Verdict::complies_if_selectable: {
      const SelectableSetpoints& f = *check.selectable;
      std::vector<std::string> parts, allowances;
      for (const auto& d : check.deviations) {
        parts.push_back(deviation_text(d, system));
        const Kind kind = highlimit::quantity_difference_kind(d.quantity);
        const std::string a =
            units::format(kind, system, *f.allowance(d.quantity, zone.compare_in), 1);
        if (std::find(allowances.begin(), allowances.end(), a) == allowances.end())
          allowances.push_back(a);
      }
      return fmt::format(
          "{} is allowed in {} ({}); {}; that is within the {} the edition allows a device "
          "whose setpoints are selectable in steps rather than adjustable ({}; {}), so it "
          "complies only on such a device with no step nearer the listed setting{}",
          check.matched->control, where, cite(*check.row), join(parts, "; "),
          join(allowances, " and "), f.table.empty() ? f.clause : f.table, f.provenance, read_as);
    }
    case Verdict::not_evaluable: break;
  }
  return "its conditions match no control type of the code tables (each condition must belong "
         "to one strategy preset, e.g. fixed-enthalpy+dry-bulb)";
}

}  // namespace limitline::codes
