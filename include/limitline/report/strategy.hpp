#pragma once
// High-limit conditions in words, with their setpoints in display units.
#include <limitline/model/highlimit.hpp>
#include <limitline/model/units.hpp>

#include <string>

namespace limitline::report {

// The unit kind of a quantity's values and of its differences (offsets, deadbands).
units::Kind value_kind(highlimit::Quantity q);
units::Kind difference_kind(highlimit::Quantity q);

// A quantity's value or difference formatted as a specifier writes it ("75 °F", "28.0 Btu/lb").
std::string format_value(highlimit::Quantity q, double si, units::System s);
std::string format_difference(highlimit::Quantity q, double si, units::System s);

// "outdoor enthalpy above 28.0 Btu/lb (deadband 0.5 Btu/lb)",
// "outdoor dry-bulb above return-air dry-bulb − 2.0 °F".
std::string describe_condition(const highlimit::Condition& c, units::System s);
// "off when " + conditions joined by " or ", then in parentheses the settings taken from an
// energy code (describe_code_settings) when there are any.
std::string describe_strategy(const highlimit::Strategy& s, units::System units);
// "65.0 °F from ANSI/ASHRAE/IES Standard 90.1-2019 zone 4A, Table 6.5.1.1.3, from memory" for
// the settings whose source is the code ("return enthalpy" for a zero offset); empty when none
// is.
std::string describe_code_settings(const highlimit::Strategy& s, units::System units);

}  // namespace limitline::report
