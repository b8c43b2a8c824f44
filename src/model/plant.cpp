#include <limitline/model/plant.hpp>

#include <limitline/error.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <cmath>

namespace limitline {

void validate(const Plant& p) {
  auto fail = [](std::string_view field, double v, std::string_view allowed) {
    throw InputError(fmt::format("plant.{} = {:.6g} is not allowed ({})", field, v, allowed));
  };
  if (!(p.cooling_cop > 0.0 && p.cooling_cop <= 20.0))
    fail("cooling_cop", p.cooling_cop, "above 0, up to 20");
  if (!(p.heating_efficiency > 0.0 && p.heating_efficiency <= 6.0))
    fail("heating_efficiency", p.heating_efficiency, "above 0, up to 6");
  if (!(p.electricity_price >= 0.0 && p.electricity_price <= 100.0))
    fail("electricity_price", p.electricity_price, "0 to 100 per kWh");
  if (!(p.heating_price >= 0.0 && p.heating_price <= 100.0))
    fail("heating_price", p.heating_price, "0 to 100 per kWh");
  if (p.electricity_price == 0.0 && p.heating_price == 0.0)
    throw InputError("plant: electricity_price and heating_price are both 0: nothing would cost");
  const bool letters = !p.currency.empty() && p.currency.size() <= 8 &&
                       std::all_of(p.currency.begin(), p.currency.end(),
                                   [](unsigned char c) { return std::isalpha(c) != 0; });
  if (!letters)
    throw InputError(fmt::format("plant.currency = {} is not allowed (1 to 8 letters, e.g. USD)",
                                 echo(p.currency)));
}

}  // namespace limitline
