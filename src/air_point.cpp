#include <limitline/air_point.hpp>

#include <limitline/error.hpp>

#include <fmt/format.h>

#include <cctype>

namespace limitline {
namespace {

using psychro::HumidityInput;
using units::Kind;

constexpr std::pair<HumidityInput, Kind> kInputKinds[] = {
    {HumidityInput::relative_humidity, Kind::fraction},
    {HumidityInput::wet_bulb, Kind::temperature},
    {HumidityInput::dew_point, Kind::temperature},
    {HumidityInput::humidity_ratio, Kind::humidity_ratio},
    {HumidityInput::enthalpy, Kind::enthalpy},
};

// Prefix of each humidity form, lower case; longer prefixes first so "wb" is not read as "w"
// followed by "b...". The empty prefix is a relative humidity written without one.
constexpr std::pair<std::string_view, HumidityInput> kForms[] = {
    {"dp", HumidityInput::dew_point},     {"wb", HumidityInput::wet_bulb},
    {"rh", HumidityInput::relative_humidity}, {"w", HumidityInput::humidity_ratio},
    {"h", HumidityInput::enthalpy},       {"", HumidityInput::relative_humidity},
};

std::string_view trim(std::string_view s) {
  while (!s.empty() && std::isspace(static_cast<unsigned char>(s.front()))) s.remove_prefix(1);
  while (!s.empty() && std::isspace(static_cast<unsigned char>(s.back()))) s.remove_suffix(1);
  return s;
}

bool starts_with_nocase(std::string_view s, std::string_view prefix) {
  if (s.size() < prefix.size()) return false;
  for (std::size_t i = 0; i < prefix.size(); ++i)
    if (std::tolower(static_cast<unsigned char>(s[i])) != prefix[i]) return false;
  return true;
}

}  // namespace

units::Kind humidity_input_kind(HumidityInput input) {
  for (const auto& [i, k] : kInputKinds)
    if (i == input) return k;
  return Kind::fraction;
}

AirPoint parse_air_point(std::string_view text, units::System bare, std::string_view origin) {
  const std::string_view t = trim(text);
  const std::size_t slash = t.find('/');
  if (slash == std::string_view::npos)
    throw InputError(fmt::format("{}: '{}' needs a dry-bulb and a humidity separated by '/' "
                                 "(allowed: {})",
                                 origin, text, kAirPointForms));
  AirPoint p;
  p.dry_bulb_c = units::parse(Kind::temperature, trim(t.substr(0, slash)), bare,
                              fmt::format("{} dry-bulb", origin));
  const std::string_view humidity = trim(t.substr(slash + 1));
  if (humidity.empty())
    throw InputError(fmt::format("{}: '{}' has nothing after '/' (allowed: {})", origin, text,
                                 kAirPointForms));
  for (const auto& [prefix, input] : kForms) {
    if (!starts_with_nocase(humidity, prefix)) continue;
    // A prefix only counts when a number follows it ("hot" is not an enthalpy).
    const std::string_view rest = trim(humidity.substr(prefix.size()));
    if (!prefix.empty() && (rest.empty() || !(std::isdigit(static_cast<unsigned char>(rest[0])) ||
                                              rest[0] == '.' || rest[0] == '-' || rest[0] == '+')))
      continue;
    p.humidity_kind = input;
    p.humidity_value = units::parse(humidity_input_kind(input), rest, bare,
                                    fmt::format("{} humidity", origin));
    return p;
  }
  throw InputError(fmt::format("{}: '{}' is not a humidity (allowed: {})", origin, humidity,
                               kAirPointForms));
}

psychro::MoistAir AirPoint::state(double pressure_kpa, std::string_view origin) const {
  try {
    return psychro::state_from(dry_bulb_c, humidity_kind, humidity_value, pressure_kpa);
  } catch (const InputError& e) {
    if (origin.empty()) throw;
    throw InputError(fmt::format("{}: {}", origin, e.what()));
  }
}

psychro::Properties AirPoint::properties(double pressure_kpa, std::string_view origin) const {
  const psychro::MoistAir s = state(pressure_kpa, origin);
  try {
    return psychro::properties(s);
  } catch (const InputError& e) {
    if (origin.empty()) throw;
    throw InputError(fmt::format("{}: {}", origin, e.what()));
  }
}

airside::AirState AirPoint::at(double pressure_kpa) const {
  const psychro::MoistAir s = state(pressure_kpa);
  return airside::air_state(s.dry_bulb_c, s.humidity_ratio);
}

highlimit::AirValues AirPoint::values(double pressure_kpa) const {
  return air_values(properties(pressure_kpa));
}

highlimit::AirValues air_values(const psychro::Properties& p) {
  return highlimit::air_values(p.dry_bulb_c, p.enthalpy_kj_per_kg, p.dew_point_c,
                               p.humidity_ratio);
}

}  // namespace limitline
