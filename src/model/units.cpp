// Quantities at the edges: one table of units, read both ways.
#include <limitline/model/units.hpp>

#include <limitline/text.hpp>

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
  std::string_view example;                 // what to write, for error messages
  std::string_view ip_written, si_written;  // the unit as a user writes it ("F", "kJ/kg")
  // Absolute bounds (SI): no air-side quantity of this kind lies beyond them, so a value
  // outside is a slip or an attack, refused before it can overflow a calculation.
  double min_si, max_si;
};

constexpr double kFahrenheitScale = 1.0 / 1.8;
constexpr double kEnthalpyIpScale = 2.326;

constexpr Unit kTemperature[] = {
    {"c", 1, 0},
    {"°c", 1, 0},
    {"degc", 1, 0},
    {"f", kFahrenheitScale, -32.0 / 1.8},
    {"°f", kFahrenheitScale, -32.0 / 1.8},
    {"degf", kFahrenheitScale, -32.0 / 1.8},
    {"k", 1, -273.15},
};
constexpr Unit kTemperatureDifference[] = {
    {"k", 1, 0},
    {"c", 1, 0},
    {"°c", 1, 0},
    {"degc", 1, 0},
    {"delta-c", 1, 0},
    {"f", kFahrenheitScale, 0},
    {"°f", kFahrenheitScale, 0},
    {"degf", kFahrenheitScale, 0},
    {"delta-f", kFahrenheitScale, 0},
    {"r", kFahrenheitScale, 0},
};
constexpr Unit kEnthalpy[] = {
    {"kj/kg", 1, 0},
    {"j/kg", 1e-3, 0},
    {"btu/lb", kEnthalpyIpScale, -7.68 * kEnthalpyIpScale},
    {"btu/lbm", kEnthalpyIpScale, -7.68 * kEnthalpyIpScale},
};
constexpr Unit kEnthalpyDifference[] = {
    {"kj/kg", 1, 0},
    {"j/kg", 1e-3, 0},
    {"btu/lb", kEnthalpyIpScale, 0},
    {"btu/lbm", kEnthalpyIpScale, 0},
};
constexpr Unit kPressure[] = {
    {"kpa", 1, 0},           {"pa", 1e-3, 0},       {"hpa", 0.1, 0},
    {"mbar", 0.1, 0},        {"bar", 100, 0},       {"psia", 6.894757293, 0},
    {"psi", 6.894757293, 0}, {"inhg", 3.386389, 0}, {"atm", 101.325, 0},
};
constexpr Unit kLength[] = {{"m", 1, 0}, {"km", 1000, 0}, {"ft", 0.3048, 0}};
constexpr Unit kFraction[] = {{"%", 0.01, 0}};
constexpr Unit kHumidityRatio[] = {
    {"kg/kg", 1, 0},
    {"lb/lb", 1, 0},
    {"g/kg", 1e-3, 0},
    {"gr/lb", 1.0 / 7000.0, 0},
};
constexpr Unit kAirflow[] = {
    {"m3/s", 1, 0},
    {"m³/s", 1, 0},
    {"l/s", 1e-3, 0},
    {"m3/h", 1.0 / 3600.0, 0},
    {"m³/h", 1.0 / 3600.0, 0},
    {"cfm", 0.3048 * 0.3048 * 0.3048 / 60.0, 0},
    {"ft3/min", 0.3048 * 0.3048 * 0.3048 / 60.0, 0},
};
constexpr Unit kEnergy[] = {
    {"kwh", 1, 0},
    {"mwh", 1000, 0},
    {"kbtu", 1.0 / 3.412141633, 0},
    {"btu", 1e-3 / 3.412141633, 0},
    {"ton-h", 3.516852842, 0},
};
constexpr Unit kPower[] = {
    {"kw", 1, 0},
    {"w", 1e-3, 0},
    {"btu/h", 1e-3 / 3.412141633, 0},
    {"kbtu/h", 1.0 / 3.412141633, 0},
    {"ton", 3.516852842, 0},
};

// A conductance in Btu/h per °F: 1 W = 3.412141633 Btu/h and 1 K = 1.8 °F, so
// 1 Btu/h·°F = 1.8/3.412141633 W/K = 0.5275 W/K. The spellings are those of the power units
// with a degree written after '/', '-' or '·' (and their labels: what is printed, is read).
constexpr double kBtuPerHourFahrenheit = 1.8e-3 / 3.412141633;  // kW/K
constexpr Unit kConductance[] = {
    {"kw/k", 1, 0},
    {"w/k", 1e-3, 0},
    {"kw/°c", 1, 0},
    {"w/°c", 1e-3, 0},
    {"kbtu/h/f", 1e3 * kBtuPerHourFahrenheit, 0},
    {"kbtu/h-f", 1e3 * kBtuPerHourFahrenheit, 0},
    {"kbtu/h·f", 1e3 * kBtuPerHourFahrenheit, 0},
    {"kbtu/h/°f", 1e3 * kBtuPerHourFahrenheit, 0},
    {"kbtu/h-°f", 1e3 * kBtuPerHourFahrenheit, 0},
    {"kbtu/h·°f", 1e3 * kBtuPerHourFahrenheit, 0},
    {"btu/h/f", kBtuPerHourFahrenheit, 0},
    {"btu/h-f", kBtuPerHourFahrenheit, 0},
    {"btu/h·f", kBtuPerHourFahrenheit, 0},
    {"btu/h/°f", kBtuPerHourFahrenheit, 0},
    {"btu/h-°f", kBtuPerHourFahrenheit, 0},
    {"btu/h·°f", kBtuPerHourFahrenheit, 0},
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

// Absolute bounds: temperatures from absolute zero to far beyond any air an air handler
// moves (psychrometrics stops at 200 °C); the rest a thousand times any air-side figure
// (common practice: the largest air handlers move about 200 m³/s, sites lie below 9 km).
constexpr double kAbsoluteZeroC = -273.15;
constexpr KindInfo kKinds[] = {
    {Kind::temperature, "a temperature", kTemperature, "f", "c", "°F", "°C", "f", "c",
     "75F or 23.9C", "F", "C", kAbsoluteZeroC, 1000.0},
    {Kind::temperature_difference, "a temperature difference", kTemperatureDifference, "f", "k",
     "°F", "K", "delta_f", "delta_k", "5F or 3K", "F", "K", -1000.0, 1000.0},
    {Kind::enthalpy, "an enthalpy", kEnthalpy, "btu/lb", "kj/kg", "Btu/lb", "kJ/kg", "btu_per_lb",
     "kj_per_kg", "28btu/lb or 47kJ/kg", "btu/lb", "kJ/kg", -1000.0, 10000.0},
    {Kind::enthalpy_difference, "an enthalpy difference", kEnthalpyDifference, "btu/lb", "kj/kg",
     "Btu/lb", "kJ/kg", "delta_btu_per_lb", "delta_kj_per_kg", "1btu/lb or 2kJ/kg", "btu/lb",
     "kJ/kg", -10000.0, 10000.0},
    {Kind::pressure, "a pressure", kPressure, "psia", "kpa", "psia", "kPa", "psia", "kpa",
     "14.696psia or 101.325kPa", "psia", "kPa", 0.0, 10000.0},
    {Kind::length, "a length", kLength, "ft", "m", "ft", "m", "ft", "m", "5000ft or 1524m", "ft",
     "m", -100000.0, 100000.0},
    {Kind::fraction, "a percentage", kFraction, "%", "%", "%", "%", "pct", "pct", "50%", "%", "%",
     -10.0, 10.0},
    {Kind::humidity_ratio, "a humidity ratio", kHumidityRatio, "lb/lb", "kg/kg", "lb/lb", "kg/kg",
     "lb_per_lb", "kg_per_kg", "0.0093 or 65gr/lb", "lb/lb", "kg/kg", -10.0, 10.0},
    {Kind::airflow, "an airflow", kAirflow, "cfm", "m3/s", "cfm", "m³/s", "cfm", "m3_per_s",
     "12000cfm or 5600L/s", "cfm", "m3/s", -100000.0, 100000.0},
    {Kind::energy, "an energy", kEnergy, "kbtu", "kwh", "kBtu", "kWh", "kbtu", "kwh",
     "3412kBtu or 1000kWh", "kBtu", "kWh", -1e12, 1e12},
    {Kind::power, "a power", kPower, "kbtu/h", "kw", "kBtu/h", "kW", "kbtu_per_h", "kw",
     "34kBtu/h or 10kW", "kBtu/h", "kW", -1e9, 1e9},
    {Kind::specific_volume, "a specific volume", kSpecificVolume, "ft3/lb", "m3/kg", "ft³/lb",
     "m³/kg", "ft3_per_lb", "m3_per_kg", "13.7ft3/lb or 0.85m3/kg", "ft3/lb", "m3/kg", 0.0, 1000.0},
    {Kind::density, "a density", kDensity, "lb/ft3", "kg/m3", "lb/ft³", "kg/m³", "lb_per_ft3",
     "kg_per_m3", "0.075lb/ft3 or 1.2kg/m3", "lb/ft3", "kg/m3", 0.0, 1000.0},
    // The envelope of the largest building one air handler serves is below 1,000 kW/K.
    {Kind::conductance, "a conductance", kConductance, "kbtu/h/f", "kw/k", "kBtu/h·°F", "kW/K",
     "kbtu_per_h_f", "kw_per_k", "3kBtu/h/F or 1.6kW/K", "kBtu/h/F", "kW/K", 0.0, 1e6},
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

// The leading number of s (sign, digits, point, exponent). Commas may group the digits
// before the point by three ("20,000", "1,250,000.5"); any other comma between digits is
// refused, since "1,5" may be a decimal comma and "20,00" a typing slip.
struct Number {
  std::size_t length = 0;  // 0: no number
  double value = 0.0;
  bool too_large = false;   // digits beyond the range of a double ("1e400")
  std::string comma_error;  // why the commas do not group digits, when they do not
};

Number read_number(std::string_view s) {
  Number n;
  // Where the integer digits end, and whether commas sit among them.
  std::size_t i = (!s.empty() && s.front() == '-') ? 1 : 0;
  const std::size_t digits_from = i;
  bool commas = false;
  while (i < s.size() && (std::isdigit(static_cast<unsigned char>(s[i])) ||
                          (s[i] == ',' && i + 1 < s.size() &&
                           std::isdigit(static_cast<unsigned char>(s[i + 1])) && i > digits_from)))
    commas |= s[i++] == ',';
  std::string plain;
  std::size_t comma_count = 0;
  if (commas) {
    // 1 to 3 digits, then groups of exactly three.
    std::size_t group = 0, groups = 0;
    bool ok = true;
    for (std::size_t k = digits_from; k < i; ++k) {
      if (s[k] != ',') {
        ++group;
        continue;
      }
      ok &= groups == 0 ? (group >= 1 && group <= 3) : group == 3;
      ++groups, group = 0;
    }
    ok &= group == 3;
    if (!ok) {
      n.comma_error =
          "commas in a number must group its digits by three (20,000); write a "
          "decimal with a point (1.5)";
      return n;
    }
    plain.assign(s.substr(0, i));
    comma_count = static_cast<std::size_t>(std::erase(plain, ','));
    plain.append(s.substr(i));
    s = plain;
  }
  double v = 0;
  auto r = std::from_chars(s.data(), s.data() + s.size(), v);
  if (r.ec == std::errc::result_out_of_range) {
    n.too_large = true;
  } else if (r.ec != std::errc() || !std::isfinite(v)) {
    // from_chars also reads "inf"/"nan"; those are never a quantity.
    return n;
  }
  n.value = v;
  n.length = static_cast<std::size_t>(r.ptr - s.data());
  // The length in the text as written: the commas all lie inside the number.
  n.length += comma_count;
  return n;
}

std::string allowed_spellings(const KindInfo& k) {
  std::string out;
  for (const Unit& u : k.units) {
    if (!out.empty()) out += ", ";
    out += u.spelling;
  }
  return out;
}

// A number as text followed by the kind's display label ("75 °C", "50%").
std::string with_label(Kind kind, System system, std::string_view number);

// Unit conversions leave about 1e-15 of relative noise ("36F" is 20.000000000000004 K); a
// bound 1e-9 wide absorbs it and nothing a user could mean.
constexpr double kRangeTolerance = 1e-9;

constexpr Named<System> kSystemNames[] = {{"ip", System::ip}, {"si", System::si}};

}  // namespace

System parse_system(std::string_view text, std::string_view origin) {
  if (const auto s = value_in(kSystemNames, text::lower_without_space(text))) return *s;
  throw InputError(fmt::format("{}: {} is not a unit system ({})", origin, echo(text),
                               names_in(kSystemNames, " or ")));
}

std::string_view system_name(System s) { return name_in(kSystemNames, s); }
std::span<const Named<System>> system_names() { return kSystemNames; }

std::string_view kind_name(Kind k) { return info(k).name; }

double unit_scale(Kind kind, std::string_view unit, std::string_view origin) {
  const KindInfo& k = info(kind);
  const std::string spelling = text::lower_without_space(unit);
  for (const Unit& u : k.units) {
    if (u.spelling != spelling) continue;
    if (u.offset != 0.0) throw std::logic_error("units: unit_scale of a unit with a datum");
    return u.scale;
  }
  throw InputError(fmt::format("{}: {} is not a unit of {} (allowed: {})", origin, echo(unit),
                               k.name.substr(k.name.find(' ') + 1), allowed_spellings(k)));
}

double parse_number(std::string_view text, std::string_view origin) {
  std::string_view s = text::trim(text);
  if (!s.empty() && s.front() == '+') s.remove_prefix(1);
  const Number n = read_number(s);
  if (!n.comma_error.empty())
    throw InputError(fmt::format("{}: {}: {}", origin, echo(text), n.comma_error));
  if (n.too_large)
    throw InputError(fmt::format("{}: {} is too large to be a number", origin, echo(text)));
  if (n.length == 0 || n.length != s.size())
    throw InputError(fmt::format("{}: {} is not a number", origin, echo(text)));
  return n.value;
}

bool has_unit(std::string_view text) {
  std::string_view s = text::trim(text);
  if (!s.empty() && s.front() == '+') s.remove_prefix(1);
  const Number n = read_number(s);
  return n.length > 0 && n.length < s.size();
}

double parse(Kind kind, std::string_view text, System bare, std::string_view origin) {
  const KindInfo& k = info(kind);
  std::string_view s = text::trim(text);
  if (!s.empty() && s.front() == '+') s.remove_prefix(1);
  const Number n = read_number(s);
  if (!n.comma_error.empty())
    throw InputError(fmt::format("{}: {}: {}", origin, echo(text), n.comma_error));
  if (n.length == 0)
    throw InputError(fmt::format("{}: {} is not {} (write a number with a unit, e.g. {})", origin,
                                 echo(text), k.name, k.example));
  const std::string suffix = text::lower_without_space(s.substr(n.length));
  const Unit* unit = nullptr;
  if (suffix.empty()) {
    if (kind == Kind::fraction && n.value > 0.0 && n.value < 1.0)
      throw InputError(
          fmt::format("{}: {} is ambiguous: write it as a percentage with %, "
                      "e.g. {:g}% or {:g}%",
                      origin, echo(text), n.value * 100.0, n.value));
    unit = &find_unit(k, bare == System::ip ? k.ip_default : k.si_default);
  } else {
    for (const Unit& u : k.units)
      if (u.spelling == suffix) unit = &u;
    if (unit == nullptr)
      throw InputError(fmt::format("{}: {} has unit {}, which is not {} (allowed: {})", origin,
                                   echo(text), echo(s.substr(n.length)), k.name,
                                   allowed_spellings(k)));
  }
  const double si = n.value * unit->scale + unit->offset;
  if (n.too_large || !within(si, k.min_si, k.max_si))
    throw InputError(fmt::format("{}: {} is beyond any physical {} (allowed: {})", origin,
                                 echo(text), k.name.substr(k.name.find(' ') + 1),
                                 format_range(kind, bare, k.min_si, k.max_si)));
  return si;
}

std::pair<double, double> absolute_bounds(Kind kind) {
  const KindInfo& k = info(kind);
  return {k.min_si, k.max_si};
}

bool within(double value, double lo, double hi) {
  const double eps = kRangeTolerance * std::max({1.0, std::fabs(lo), std::fabs(hi)});
  return value >= lo - eps && value <= hi + eps;
}

double held_within(double value, double lo, double hi) {
  return within(value, lo, hi) ? std::clamp(value, lo, hi) : value;
}

std::string_view written_unit(Kind kind, System system) {
  const KindInfo& k = info(kind);
  return system == System::ip ? k.ip_written : k.si_written;
}

std::string format_brief(Kind kind, System system, double si, int significant) {
  const double v = to_display(kind, system, si);
  if (v == 0.0 || !std::isfinite(v)) return with_label(kind, system, "0");
  // Fixed notation with `significant` digits (20000, not 2e+04), trailing zeros trimmed; the
  // exponent form only for magnitudes no quantity of the tool has.
  const double magnitude = std::floor(std::log10(std::fabs(v)));
  if (magnitude >= 15 || magnitude <= -10)
    return with_label(kind, system, fmt::format("{:.{}g}", v, significant));
  const int decimals = std::max(0, significant - 1 - static_cast<int>(magnitude));
  const double scale = std::pow(10.0, significant - 1 - magnitude);
  std::string text = fmt::format("{:.{}f}", std::round(v * scale) / scale, decimals);
  if (text.find('.') != std::string::npos) {
    text.erase(text.find_last_not_of('0') + 1);
    if (text.back() == '.') text.pop_back();
  }
  if (text == "-0") text = "0";
  return with_label(kind, system, text);
}

std::string format_range(Kind kind, System system, double lo_si, double hi_si) {
  // Each end rounded toward the inside at 4 decimals, after snapping conversion noise
  // (36.000000000000004 °F is 36 °F), so that an end written as shown is inside.
  auto end = [&](double si, bool low) {
    const double v = to_display(kind, system, si) * 1e4;
    const double snapped = std::fabs(v - std::round(v)) < 1e-6 ? std::round(v) : v;
    double r = (low ? std::ceil(snapped) : std::floor(snapped)) / 1e4;
    if (r == 0.0) r = 0.0;  // no "-0"
    std::string text = fmt::format("{:.4f}", r);
    text.erase(text.find_last_not_of('0') + 1);
    if (text.back() == '.') text.pop_back();
    return with_label(kind, system, text);
  };
  return fmt::format("{} to {}", end(lo_si, true), end(hi_si, false));
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

namespace {
std::string with_label(Kind kind, System system, std::string_view number) {
  const std::string_view label = unit_label(kind, system);
  return label == "%" ? fmt::format("{}%", number) : fmt::format("{} {}", number, label);
}
}  // namespace

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
