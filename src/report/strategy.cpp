#include <limitline/report/strategy.hpp>

#include <fmt/format.h>

#include <cmath>

namespace limitline::report {

using highlimit::Quantity;
using units::Kind;

units::Kind value_kind(Quantity q) { return highlimit::quantity_kind(q); }
units::Kind difference_kind(Quantity q) { return highlimit::quantity_difference_kind(q); }

namespace {
int decimals(Quantity q) {
  switch (q) {
    case Quantity::dry_bulb:
    case Quantity::dew_point: return 1;
    case Quantity::enthalpy: return 1;
    case Quantity::humidity_ratio: return 4;
  }
  return 1;
}
}  // namespace

std::string format_value(Quantity q, double si, units::System s) {
  return units::format(value_kind(q), s, si, decimals(q));
}

std::string format_difference(Quantity q, double si, units::System s) {
  return units::format(difference_kind(q), s, si, decimals(q));
}

std::string describe_condition(const highlimit::Condition& c, units::System s) {
  const std::string_view name = highlimit::quantity_name(c.quantity);
  std::string out;
  if (c.reference == highlimit::Reference::fixed) {
    out = fmt::format("outdoor {} above {}", name, format_value(c.quantity, c.limit, s));
  } else {
    out = fmt::format("outdoor {} above return-air {}", name, name);
    if (std::fabs(c.limit) > 1e-12)
      out += fmt::format(" {} {}", c.limit > 0 ? "+" : "-",
                         format_difference(c.quantity, std::fabs(c.limit), s));
  }
  if (c.deadband > 0.0)
    out += fmt::format(" (deadband {})", format_difference(c.quantity, c.deadband, s));
  return out;
}

std::string describe_strategy(const highlimit::Strategy& st, units::System s) {
  std::string out = "off when ";
  for (std::size_t i = 0; i < st.conditions.size(); ++i)
    out += (i ? " or " : "") + describe_condition(st.conditions[i], s);
  if (const std::string from = describe_code_settings(st, s); !from.empty())
    out += " (" + from + ")";
  return out;
}

std::string describe_code_settings(const highlimit::Strategy& st, units::System s) {
  std::string figures;
  for (std::size_t i = 0; i < st.conditions.size(); ++i) {
    if (st.source(i) != highlimit::SettingSource::code) continue;
    const highlimit::Condition& c = st.conditions[i];
    std::string figure;
    if (c.reference == highlimit::Reference::fixed)
      figure = format_value(c.quantity, c.limit, s);
    else if (std::fabs(c.limit) > 1e-12)
      figure = fmt::format("return {} {} {}", highlimit::quantity_name(c.quantity),
                           c.limit < 0 ? "-" : "+",
                           format_difference(c.quantity, std::fabs(c.limit), s));
    else
      figure = fmt::format("return {}", highlimit::quantity_name(c.quantity));
    figures += (figures.empty() ? "" : " and ") + figure;
  }
  if (figures.empty()) return {};
  return fmt::format("{} from {}", figures, st.code_source);
}

}  // namespace limitline::report
