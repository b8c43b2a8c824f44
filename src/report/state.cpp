#include <limitline/report/state.hpp>

#include <fmt/format.h>

namespace limitline::report {
namespace {

using units::Kind;
using P = psychro::Properties;

const PropertyField kFields[] = {
    {"Dry-bulb", "dry_bulb", Kind::temperature, 1, 2, &P::dry_bulb_c},
    {"Wet-bulb", "wet_bulb", Kind::temperature, 1, 2, &P::wet_bulb_c},
    {"Dew point", "dew_point", Kind::temperature, 1, 2, &P::dew_point_c},
    {"Relative humidity", "relative_humidity", std::nullopt, 4, 4, &P::relative_humidity},
    {"Humidity ratio", "humidity_ratio", std::nullopt, 5, 5, &P::humidity_ratio},
    {"Enthalpy", "enthalpy", Kind::enthalpy, 2, 2, &P::enthalpy_kj_per_kg},
    {"Specific volume", "specific_volume", Kind::specific_volume, 3, 4,
     &P::specific_volume_m3_per_kg},
    {"Density", "density", Kind::density, 4, 4, &P::density_kg_per_m3},
    {"Vapour pressure", "vapor_pressure", Kind::pressure, 4, 4, &P::vapor_pressure_kpa},
    {"Pressure", "pressure", Kind::pressure, 3, 3, &P::pressure_kpa},
    {"Saturation humidity ratio", "saturation_humidity_ratio", std::nullopt, 5, 5,
     &P::saturation_humidity_ratio},
    {"Degree of saturation", "degree_of_saturation", std::nullopt, 4, 4, &P::degree_of_saturation},
};

}  // namespace

std::span<const PropertyField> property_fields() { return kFields; }

std::string property_key(const PropertyField& f, units::System system) {
  if (!f.kind) return std::string(f.key_stem);
  return fmt::format("{}_{}", f.key_stem, units::key_suffix(*f.kind, system));
}

double property_value(const PropertyField& f, const psychro::Properties& p, units::System system) {
  const double si = p.*f.member;
  return f.kind ? units::to_display(*f.kind, system, si) : si;
}

std::string property_text(const PropertyField& f, const psychro::Properties& p,
                          units::System system) {
  const int decimals = system == units::System::ip ? f.decimals_ip : f.decimals_si;
  if (f.kind) return units::format(*f.kind, system, p.*f.member, decimals);
  if (f.member == &P::relative_humidity) return fmt::format("{:.1f}%", p.relative_humidity * 100);
  if (f.member == &P::humidity_ratio || f.member == &P::saturation_humidity_ratio)
    return fmt::format("{:.{}f} {}", p.*f.member, decimals,
                       system == units::System::ip ? "lb/lb" : "kg/kg");
  return fmt::format("{:.{}f}", p.*f.member, decimals);
}

}  // namespace limitline::report
