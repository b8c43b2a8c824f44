// Quantities at the edges: one table of units, read both ways.
#include <limitline/units.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <cctype>
#include <charconv>
#include <cmath>
#include <span>

namespace limitline::units {
namespace {

// si = value·scale + offset
struct Unit {
  std::string_view spelling;  // lower case, no spaces
  double scale;
  double offset;
};

struct KindInfo {
  Kind kind;
  std::string_view name;
  std::span<const Unit> units;
  std::string_view ip_default, si_default;  // spelling used for bare numbers and display
  std::string_view ip_label, si_label;
  std::string_view ip_suffix, si_suffix;
  std::string_view example;  // what to write, for error messages
};

constexpr double kFahrenheitScale = 1.0 / 1.8;
constexpr double kEnthalpyIpScale = 2.326;

constexpr Unit kTemperature[] = {
    {"c", 1, 0},   {"°c", 1, 0},  {"degc", 1, 0}, {"f", kFahrenheitScale, -32.0 / 1.8},
    {"°f", kFahrenheitScale, -32.0 / 1.8},         {"degf", kFahrenheitScale, -32.0 / 1.8},
    {"k", 1, -273.15},
};
constexpr Unit kTemperatureDifference[] = {
    {"k", 1, 0},  {"c", 1, 0},  {"°c", 1, 0}, {"degc", 1, 0}, {"delta-c", 1, 0},
    {"f", kFahrenheitScale, 0}, {"°f", kFahrenheitScale, 0},  {"degf", kFahrenheitScale, 0},
    {"delta-f", kFahrenheitScale, 0}, {"r", kFahrenheitScale, 0},
};
constexpr Unit kEnthalpy[] = {
    {"kj/kg", 1, 0},
    {"j/kg", 1e-3, 0},
    {"btu/lb", kEnthalpyIpScale, -7.68 * kEnthalpyIpScale},
    {"btu/lbm", kEnthalpyIpScale, -7.68 * kEnthalpyIpScale},
};
constexpr Unit kEnthalpyDifference[] = {
    {"kj/kg", 1, 0}, {"j/kg", 1e-3, 0}, {"btu/lb", kEnthalpyIpScale, 0},
    {"btu/lbm", kEnthalpyIpScale, 0},
};
constexpr Unit kPressure[] = {
    {"kpa", 1, 0},          {"pa", 1e-3, 0},          {"hpa", 0.1, 0},    {"mbar", 0.1, 0},
    {"bar", 100, 0},        {"psia", 6.894757293, 0}, {"psi", 6.894757293, 0},
    {"inhg", 3.386389, 0},  {"atm", 101.325, 0},
};
constexpr Unit kLength[] = {{"m", 1, 0}, {"km", 1000, 0}, {"ft", 0.3048, 0}};
constexpr Unit kFraction[] = {{"%", 0.01, 0}};
constexpr Unit kHumidityRatio[] = {
    {"kg/kg", 1, 0}, {"lb/lb", 1, 0}, {"g/kg", 1e-3, 0}, {"gr/lb", 1.0 / 7000.0, 0},
};
constexpr Unit kAirflow[] = {
    {"m3/s", 1, 0},   {"m³/s", 1, 0},   {"l/s", 1e-3, 0}, {"m3/h", 1.0 / 3600.0, 0},
    {"m³/h", 1.0 / 3600.0, 0},          {"cfm", 0.3048 * 0.3048 * 0.3048 / 60.0, 0},
    {"ft3/min", 0.3048 * 0.3048 * 0.3048 / 60.0, 0},
};
constexpr Unit kEnergy[] = {
    {"kwh", 1, 0}, {"mwh", 1000, 0}, {"kbtu", 1.0 / 3.412141633, 0},
    {"btu", 1e-3 / 3.412141633, 0}, {"ton-h", 3.516852842, 0},
};
constexpr Unit kPower[] = {
    {"kw", 1, 0}, {"w", 1e-3, 0}, {"btu/h", 1e-3 / 3.412141633, 0},
    {"kbtu/h", 1.0 / 3.412141633, 0}, {"ton", 3.516852842, 0},
};

constexpr double kCubicFoot = 0.3048 * 0.3048 * 0.3048;
constexpr double kPound = 0.45359237;
// The display labels (m³/kg, lb/ft³) are spellings too: what the tool prints, it reads back.
constexpr Unit kSpecificVolume[] = {{"m3/kg", 1, 0},
                                    {"m³/kg", 1, 0},
                                    {"ft3/lb", kCubicFoot / kPound, 0},
                                    {"ft³/lb", kCubicFoot / kPound, 0}};
constexpr Unit kDensity[] = {{"kg/m3", 1, 0},
                             {"kg/m³", 1, 0},
                             {"lb/ft3", kPound / kCubicFoot, 0},
                             {"lb/ft³", kPound / kCubicFoot, 0}};

constexpr KindInfo kKinds[] = {
    {Kind::temperature, "a temperature", kTemperature, "f", "c", "°F", "°C", "f", "c",
     "75F or 23.9C"},
    {Kind::temperature_difference, "a temperature difference", kTemperatureDifference, "f",
     "k", "°F", "K", "delta_f", "delta_k", "5F or 3K"},
    {Kind::enthalpy, "an enthalpy", kEnthalpy, "btu/lb", "kj/kg", "Btu/lb", "kJ/kg",
     "btu_per_lb", "kj_per_kg", "28btu/lb or 47kJ/kg"},
    {Kind::enthalpy_difference, "an enthalpy difference", kEnthalpyDifference, "btu/lb",
     "kj/kg", "Btu/lb", "kJ/kg", "delta_btu_per_lb", "delta_kj_per_kg", "1btu/lb or 2kJ/kg"},
    {Kind::pressure, "a pressure", kPressure, "psia", "kpa", "psia", "kPa", "psia", "kpa",
     "14.696psia or 101.325kPa"},
    {Kind::length, "a length", kLength, "ft", "m", "ft", "m", "ft", "m", "5000ft or 1524m"},
    {Kind::fraction, "a percentage", kFraction, "%", "%", "%", "%", "pct", "pct", "50%"},
    {Kind::humidity_ratio, "a humidity ratio", kHumidityRatio, "lb/lb", "kg/kg", "lb/lb",
     "kg/kg", "lb_per_lb", "kg_per_kg", "0.0093 or 65gr/lb"},
    {Kind::airflow, "an airflow", kAirflow, "cfm", "m3/s", "cfm", "m³/s", "cfm", "m3_per_s",
     "12000cfm or 5600L/s"},
    {Kind::energy, "an energy", kEnergy, "kbtu", "kwh", "kBtu", "kWh", "kbtu", "kwh",
     "3412kBtu or 1000kWh"},
    {Kind::power, "a power", kPower, "kbtu/h", "kw", "kBtu/h", "kW", "kbtu_per_h", "kw",
     "34kBtu/h or 10kW"},
    {Kind::specific_volume, "a specific volume", kSpecificVolume, "ft3/lb", "m3/kg", "ft³/lb",
     "m³/kg", "ft3_per_lb", "m3_per_kg", "13.7ft3/lb or 0.85m3/kg"},
    {Kind::density, "a density", kDensity, "lb/ft3", "kg/m3", "lb/ft³", "kg/m³", "lb_per_ft3",
     "kg_per_m3", "0.075lb/ft3 or 1.2kg/m3"},
};

const KindInfo& info(Kind k) {
  for (const KindInfo& i : kKinds)
    if (i.kind == k) return i;
  throw std::logic_error("units: kind missing from the table");
}

const Unit& find_unit(const KindInfo& k, std::string_view spelling) {
  for (const Unit& u : k.units)
    if (u.spelling == spelling) return u;
  throw std::logic_error("units: default unit missing from its kind");
}

std::string normalise(std::string_view s) {
  std::string out;
  out.reserve(s.size());
  for (unsigned char c : s)
    if (!std::isspace(c)) out.push_back(static_cast<char>(std::tolower(c)));
  return out;
}

std::string_view trim(std::string_view s) {
  while (!s.empty() && std::isspace(static_cast<unsigned char>(s.front()))) s.remove_prefix(1);
  while (!s.empty() && std::isspace(static_cast<unsigned char>(s.back()))) s.remove_suffix(1);
  return s;
}

// Length of the leading number in s (sign, digits, point, exponent), 0 when there is none.
std::size_t number_length(std::string_view s) {
  double v;
  auto r = std::from_chars(s.data(), s.data() + s.size(), v);
  if (r.ec != std::errc()) return 0;
  // from_chars also reads "inf"/"nan"; those are never a quantity.
  if (!std::isfinite(v)) return 0;
  return static_cast<std::size_t>(r.ptr - s.data());
}

std::string allowed_spellings(const KindInfo& k) {
  std::string out;
  for (const Unit& u : k.units) {
    if (!out.empty()) out += ", ";
    out += u.spelling;
  }
  return out;
}

}  // namespace

System parse_system(std::string_view text, std::string_view origin) {
  const std::string t = normalise(text);
  if (t == "ip") return System::ip;
  if (t == "si") return System::si;
  throw UsageError(fmt::format("{}: '{}' is not a unit system (ip or si)", origin, text));
}

std::string_view system_name(System s) { return s == System::ip ? "ip" : "si"; }

std::string_view kind_name(Kind k) { return info(k).name; }

double parse_number(std::string_view text, std::string_view origin) {
  const std::string_view t = trim(text);
  std::string_view s = t;
  if (!s.empty() && s.front() == '+') s.remove_prefix(1);
  const std::size_t n = number_length(s);
  if (n == 0 || n != s.size())
    throw InputError(fmt::format("{}: '{}' is not a number", origin, text));
  double v = 0;
  std::from_chars(s.data(), s.data() + s.size(), v);
  return v;
}

bool has_unit(std::string_view text) {
  std::string_view s = trim(text);
  if (!s.empty() && s.front() == '+') s.remove_prefix(1);
  const std::size_t n = number_length(s);
  return n > 0 && n < s.size();
}

double parse(Kind kind, std::string_view text, System bare, std::string_view origin) {
  const KindInfo& k = info(kind);
  std::string_view s = trim(text);
  if (!s.empty() && s.front() == '+') s.remove_prefix(1);
  const std::size_t n = number_length(s);
  if (n == 0)
    throw InputError(fmt::format("{}: '{}' is not {} (write a number with a unit, e.g. {})",
                                 origin, text, k.name, k.example));
  double value = 0;
  std::from_chars(s.data(), s.data() + n, value);
  const std::string suffix = normalise(s.substr(n));
  const Unit* unit = nullptr;
  if (suffix.empty()) {
    if (kind == Kind::fraction && value > 0.0 && value < 1.0)
      throw InputError(fmt::format("{}: '{}' is ambiguous: write it as a percentage with %, "
                                   "e.g. {}% or {}%",
                                   origin, text, value * 100.0, value));
    unit = &find_unit(k, bare == System::ip ? k.ip_default : k.si_default);
  } else {
    for (const Unit& u : k.units)
      if (u.spelling == suffix) unit = &u;
    if (unit == nullptr)
      throw InputError(fmt::format("{}: '{}' has unit '{}', which is not {} (allowed: {})",
                                   origin, text, s.substr(n), k.name, allowed_spellings(k)));
  }
  return value * unit->scale + unit->offset;
}

double to_display(Kind kind, System system, double si) {
  const KindInfo& k = info(kind);
  const Unit& u = find_unit(k, system == System::ip ? k.ip_default : k.si_default);
  return (si - u.offset) / u.scale;
}

double from_display(Kind kind, System system, double display) {
  const KindInfo& k = info(kind);
  const Unit& u = find_unit(k, system == System::ip ? k.ip_default : k.si_default);
  return display * u.scale + u.offset;
}

std::string_view unit_label(Kind kind, System system) {
  const KindInfo& k = info(kind);
  return system == System::ip ? k.ip_label : k.si_label;
}

std::string_view key_suffix(Kind kind, System system) {
  const KindInfo& k = info(kind);
  return system == System::ip ? k.ip_suffix : k.si_suffix;
}

std::string format(Kind kind, System system, double si, int decimals) {
  double v = to_display(kind, system, si);
  // Avoid printing "-0.0" for values that round to zero.
  const double unit = std::pow(10.0, -decimals);
  if (std::fabs(v) < 0.5 * unit) v = 0.0;
  const std::string_view label = unit_label(kind, system);
  return label == "%" ? fmt::format("{:.{}f}%", v, decimals)
                      : fmt::format("{:.{}f} {}", v, decimals, label);
}

}  // namespace limitline::units
