#include <limitline/model/air_point.hpp>

#include <limitline/error.hpp>
#include <limitline/model/plausible.hpp>
#include <limitline/text.hpp>

#include <fmt/format.h>

#include <cctype>

namespace limitline {
namespace {

using psychro::HumidityInput;
using units::Kind;

// Each humidity input: its kind, its name in messages, and its plausible band as outdoor and
// as return air.
struct InputInfo {
  HumidityInput input;
  Kind kind;
  std::string_view name;
  std::string_view outdoor_band, return_band;
};
constexpr InputInfo kInputs[] = {
    {HumidityInput::relative_humidity, Kind::fraction, "relative humidity", "outdoor.rh",
     "air_handler.return_air_rh"},
    {HumidityInput::wet_bulb, Kind::temperature, "wet-bulb", "outdoor.wet_bulb",
     "air_handler.return_air_wet_bulb"},
    {HumidityInput::dew_point, Kind::temperature, "dew point", "outdoor.dew_point",
     "air_handler.return_air_dew_point"},
    {HumidityInput::humidity_ratio, Kind::humidity_ratio, "humidity ratio",
     "outdoor.humidity_ratio", "air_handler.return_air_humidity_ratio"},
    {HumidityInput::enthalpy, Kind::enthalpy, "enthalpy", "outdoor.enthalpy",
     "air_handler.return_air_enthalpy"},
};
// The dry-bulb band of outdoor air and of return air.
constexpr std::string_view kDryBulbBand[] = {"outdoor.dry_bulb", "air_handler.return_air_temp"};

const InputInfo& input_info(HumidityInput input) {
  for (const auto& i : kInputs)
    if (i.input == input) return i;
  return kInputs[0];
}

// Prefix of each humidity form, lower case; longer prefixes first so "wb" is not read as "w"
// followed by "b...". The empty prefix is a relative humidity written without one.
constexpr std::pair<std::string_view, HumidityInput> kForms[] = {
    {"dp", HumidityInput::dew_point},         {"wb", HumidityInput::wet_bulb},
    {"rh", HumidityInput::relative_humidity}, {"w", HumidityInput::humidity_ratio},
    {"h", HumidityInput::enthalpy},           {"", HumidityInput::relative_humidity},
};

// How the parts of a point are read: plainly, or each weighed against its band.
struct PartReader {
  units::System bare;
  std::vector<std::string>* warnings = nullptr;  // null: no bands
  AirRole role = AirRole::outdoor;

  double operator()(Kind kind, std::string_view band, std::string_view text,
                    const std::string& origin) const {
    const plausible::Band* b = warnings ? plausible::find(band) : nullptr;
    if (b == nullptr) return units::parse(kind, text, bare, origin);
    return plausible::parse(*b, text, bare, {origin, plausible::on_command_line(bare)}, *warnings);
  }
};

AirPoint parse_point(std::string_view text, std::string_view origin, const PartReader& read) {
  const std::string_view t = text::trim(text);
  const std::size_t slash = t.find('/');
  if (slash == std::string_view::npos)
    throw InputError(
        fmt::format("{}: {} needs a dry-bulb and a humidity separated by '/' "
                    "(allowed: {})",
                    origin, echo(text), kAirPointForms));
  const bool ret = read.role == AirRole::return_air;
  AirPoint p;
  p.system = read.bare;
  p.dry_bulb_c = read(Kind::temperature, kDryBulbBand[ret ? 1 : 0], text::trim(t.substr(0, slash)),
                      fmt::format("{} dry-bulb", origin));
  const std::string_view humidity = text::trim(t.substr(slash + 1));
  if (humidity.empty())
    throw InputError(fmt::format("{}: {} has nothing after '/' (allowed: {})", origin, echo(text),
                                 kAirPointForms));
  for (const auto& [prefix, input] : kForms) {
    if (!text::istarts_with(humidity, prefix)) continue;
    // A prefix only counts when a number follows it ("hot" is not an enthalpy).
    const std::string_view rest = text::trim(humidity.substr(prefix.size()));
    if (!prefix.empty() && (rest.empty() || !(std::isdigit(static_cast<unsigned char>(rest[0])) ||
                                              rest[0] == '.' || rest[0] == '-' || rest[0] == '+')))
      continue;
    p.humidity_kind = input;
    const InputInfo& info = input_info(input);
    p.humidity_value = read(info.kind, ret ? info.return_band : info.outdoor_band, rest,
                            fmt::format("{} humidity", origin));
    return p;
  }
  throw InputError(fmt::format("{}: {} is not a humidity (allowed: {})", origin, echo(humidity),
                               kAirPointForms));
}

}  // namespace

units::Kind humidity_input_kind(HumidityInput input) { return input_info(input).kind; }

AirPoint parse_air_point(std::string_view text, units::System bare, std::string_view origin) {
  return parse_point(text, origin, PartReader{bare});
}

AirPoint parse_air_point(std::string_view text, units::System bare, std::string_view origin,
                         AirRole role, std::vector<std::string>& warnings) {
  return parse_point(text, origin, PartReader{bare, &warnings, role});
}

psychro::MoistAir AirPoint::state(double pressure_kpa, std::string_view origin) const {
  // The impossible states a user writes are named here in the system the point was written
  // in; psychro's own (SI) messages remain for what is left.
  const auto fail = [&](const std::string& message) {
    throw InputError(origin.empty() ? message : fmt::format("{}: {}", origin, message));
  };
  const auto show = [&](Kind k, double x) { return units::format_brief(k, system, x); };
  const auto check_temperature = [&](std::string_view what, double t) {
    if (!units::within(t, psychro::kMinTemperatureC, psychro::kMaxTemperatureC))
      fail(fmt::format("{} {} is outside the range the psychrometric model supports ({})", what,
                       show(Kind::temperature, t),
                       units::format_range(Kind::temperature, system, psychro::kMinTemperatureC,
                                           psychro::kMaxTemperatureC)));
  };
  check_temperature("dry-bulb", dry_bulb_c);
  const std::string_view name = input_info(humidity_kind).name;
  const double v = humidity_value;
  switch (humidity_kind) {
    case HumidityInput::relative_humidity:
      if (!units::within(v, 0.0, 1.0))
        fail(fmt::format("relative humidity {} is not allowed (0% to 100%)",
                         show(Kind::fraction, v)));
      break;
    case HumidityInput::wet_bulb:
    case HumidityInput::dew_point:
      check_temperature(name, v);
      if (v > dry_bulb_c)
        fail(fmt::format("{} {} is above the dry-bulb {}", name, show(Kind::temperature, v),
                         show(Kind::temperature, dry_bulb_c)));
      break;
    case HumidityInput::humidity_ratio:
      if (!(v >= 0.0)) fail(fmt::format("humidity ratio {:.6g} is not allowed (0 or more)", v));
      break;
    case HumidityInput::enthalpy:
      // Dry air at the dry-bulb has the least enthalpy a state can have (eq. 32 with W = 0).
      if (v < 1.006 * dry_bulb_c)
        fail(fmt::format("enthalpy {} is below that of dry air at {} ({})", show(Kind::enthalpy, v),
                         show(Kind::temperature, dry_bulb_c),
                         show(Kind::enthalpy, 1.006 * dry_bulb_c)));
      break;
  }
  try {
    if (psychro::saturation_pressure_kpa(dry_bulb_c) >= pressure_kpa)
      fail(
          fmt::format("dry-bulb {} is at or above the boiling point at {}; moist air cannot be "
                      "saturated there",
                      show(Kind::temperature, dry_bulb_c), show(Kind::pressure, pressure_kpa)));
    // Beyond saturation: a humidity ratio or an enthalpy too high for the dry-bulb.
    if (humidity_kind == HumidityInput::humidity_ratio ||
        humidity_kind == HumidityInput::enthalpy) {
      const bool h = humidity_kind == HumidityInput::enthalpy;
      const double w = h ? psychro::humidity_ratio_from_enthalpy(dry_bulb_c, v) : v;
      const double ws = psychro::saturation_humidity_ratio(dry_bulb_c, pressure_kpa);
      if (w > ws * (1.0 + 1e-6) + 1e-12)
        fail(fmt::format("{} {} is beyond saturation at {} and {} (at most {})", name,
                         h ? show(Kind::enthalpy, v) : fmt::format("{:.6g}", v),
                         show(Kind::temperature, dry_bulb_c), show(Kind::pressure, pressure_kpa),
                         h ? show(Kind::enthalpy, psychro::enthalpy_kj_per_kg(dry_bulb_c, ws))
                           : fmt::format("{:.6g}", ws)));
    }
    return psychro::state_from(dry_bulb_c, humidity_kind, humidity_value, pressure_kpa);
  } catch (const RangeError& e) {
    if (humidity_kind == HumidityInput::wet_bulb)
      fail(
          fmt::format("wet-bulb {} is too low for dry-bulb {} at {}: the air would need "
                      "negative humidity",
                      show(Kind::temperature, v), show(Kind::temperature, dry_bulb_c),
                      show(Kind::pressure, pressure_kpa)));
    fail(e.what());
  }
  return {};
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
  return highlimit::air_values(p.dry_bulb_c, p.enthalpy_kj_per_kg, p.dew_point_c, p.humidity_ratio);
}

}  // namespace limitline
