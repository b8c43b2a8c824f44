#pragma once
// How the properties of a moist-air state are named and shown, in one table, so the text
// table, JSON keys and CSV columns of `state` cannot disagree.
#include <limitline/model/psychro.hpp>
#include <limitline/model/units.hpp>

#include <optional>
#include <span>
#include <string>
#include <string_view>

namespace limitline::report {

struct PropertyField {
  std::string_view label;     // "Wet-bulb"
  std::string_view key_stem;  // "wet_bulb": the key is stem + "_" + unit suffix when kind is set
  std::optional<units::Kind> kind;  // none: dimensionless, same in both systems
  int decimals_ip, decimals_si;     // for the human table
  double psychro::Properties::*member;
};

std::span<const PropertyField> property_fields();

// JSON/CSV key of a field in a unit system, e.g. "dry_bulb_f", "relative_humidity".
std::string property_key(const PropertyField& f, units::System system);
// The field's value in display units of `system` (dimensionless fields as they are).
double property_value(const PropertyField& f, const psychro::Properties& p, units::System system);
// Human text of the value with its unit ("75.0 °F", "50.0%", "0.00924 lb/lb").
std::string property_text(const PropertyField& f, const psychro::Properties& p,
                          units::System system);

}  // namespace limitline::report
