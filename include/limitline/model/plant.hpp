#pragma once
// The plant that makes the coil energy: how much electricity a kWh of coil cooling takes, how
// much fuel a kWh of heating, and what each costs ([plant]). With a plant the references and
// the ranking choose by cost; without, by the weighted coil energy.
#include <limitline/model/airside.hpp>

#include <string>

namespace limitline {

struct Plant {
  double cooling_cop = 3.5;         // kWh of coil cooling per kWh of electricity
  double heating_efficiency = 0.9;  // kWh of heating per kWh of fuel
  double electricity_price = 0.12;  // currency per kWh of electricity
  double heating_price = 0.04;      // currency per kWh of heating fuel
  std::string currency = "USD";

  // kW/ton → COP: a ton is 3.516852842 kW of cooling (ASHRAE Fundamentals ch. 38, 12,000
  // Btu/h).
  [[nodiscard]] static double cop_from_kw_per_ton(double kw_per_ton) {
    return 3.516852842 / kw_per_ton;
  }
  [[nodiscard]] double cooling_electric_kwh(double coil_cooling_kwh) const {
    return coil_cooling_kwh / cooling_cop;
  }
  [[nodiscard]] double heating_fuel_kwh(double heating_kwh) const {
    return heating_kwh / heating_efficiency;
  }
  // Currency per kWh of coil cooling and of heating: the weights that make E a cost.
  [[nodiscard]] airside::EnergyWeights cost_weights() const {
    return {electricity_price / cooling_cop, heating_price / heating_efficiency};
  }
};

// Throws InputError naming the field when a figure is outside its range (COP in (0, 20],
// heating efficiency in (0, 6] (a heat pump's COP fits), prices ≥ 0 and not both 0, a
// currency of 1 to 8 letters).
void validate(const Plant& plant);

}  // namespace limitline
