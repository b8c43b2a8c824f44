#pragma once
// The part-load air handler (docs/model.md §Part load): the space the unit serves, how its
// airflow and supply temperature follow the hour, and the return air the space makes of the
// supply air. SI throughout; powers in kW, mass flows in kg of dry air per second.
//
// Without a space (no [loads] table) the unit keeps the design model: design airflow every
// occupied hour and the design return air. The airflow control, its basis, the supply-air
// reset and a fixed ventilation airflow apply in either model.
#include <limitline/model/airside.hpp>
#include <limitline/names.hpp>

#include <optional>
#include <span>
#include <string_view>

namespace limitline::part_load {

enum class AirflowControl { constant, variable };
// "constant", "variable".
[[nodiscard]] std::span<const Named<AirflowControl>> airflow_control_names();
[[nodiscard]] std::string_view airflow_control_name(AirflowControl c);

// The density a volume airflow is turned into mass at: standard air, or the air at the
// hour's pressure.
enum class AirflowBasis { standard, actual };
// "standard", "actual".
[[nodiscard]] std::span<const Named<AirflowBasis>> airflow_basis_names();
[[nodiscard]] std::string_view airflow_basis_name(AirflowBasis b);

// Standard air (common practice: 1.204 kg/m³ = 0.0752 lb/ft³, dry air at 20 °C and
// 101.325 kPa) held at the same temperature and taken to pressure p: ρ = 1.204·p/101.325
// (ideal gas, ASHRAE Fundamentals ch. 1 eq. 28 at constant temperature).
[[nodiscard]] double air_density_kg_per_m3(AirflowBasis basis, double pressure_kpa);

// Supply-air temperature reset on the outdoor dry-bulb: supply_at_low at or below
// outdoor_low, supply_at_high at or above outdoor_high, a straight line between (common
// practice: warmer supply air in cold weather).
struct SupplyAirReset {
  double outdoor_low_c = 10.0;
  double supply_at_low_c = 15.6;
  double outdoor_high_c = 18.3;
  double supply_at_high_c = 12.8;
  [[nodiscard]] double supply_temp_c(double outdoor_c) const;
};

// How the unit's airflow and supply temperature follow the hour (part-load keys of
// [air_handler]).
struct Control {
  AirflowControl airflow = AirflowControl::constant;
  double min_airflow_fraction = 0.3;  // variable control: the floor, a share of design airflow
  AirflowBasis basis = AirflowBasis::standard;
  std::optional<SupplyAirReset> reset;
  // A fixed ventilation airflow (m³/s at the airflow basis): its outdoor-air fraction rises as
  // the supply airflow falls. Absent: the ventilation minimum is a fixed fraction.
  std::optional<double> min_outdoor_airflow_m3_per_s;
};

// Occupied space loads of one hour.
struct SpaceLoads {
  double sensible_kw = 0.0;  // into the space; negative when the space loses heat
  double latent_kw = 0.0;    // moisture added to the space, as its latent heat
};

// Space loads in coefficient form: q_s = internal + UA·(t_out − t_space), q_l = latent.
struct LoadCoefficients {
  double internal_sensible_kw = 0.0;
  double envelope_ua_kw_per_k = 0.0;
  double latent_kw = 0.0;
  [[nodiscard]] SpaceLoads at(double outdoor_c, double space_c) const {
    return {internal_sensible_kw + envelope_ua_kw_per_k * (outdoor_c - space_c), latent_kw};
  }
};

// The space the unit serves ([loads]).
struct Space {
  double space_temp_c = 23.9;      // cooling setpoint, held every occupied hour
  double return_air_rise_k = 0.0;  // return plenum and return-fan rise above the space
  // The loads as coefficients; absent when they come hour by hour from a file.
  std::optional<LoadCoefficients> coefficients;
  [[nodiscard]] double return_temp_c() const { return space_temp_c + return_air_rise_k; }
};

// Throws InputError naming the field when the settings contradict each other or the unit
// (a floor outside (0, 100 %], a reset that is not a line, a space below the supply air).
void validate(const Control& control, const airside::AirHandler& design);
void validate(const Space& space, const airside::AirHandler& design, const Control& control);

// Vapour enthalpy at the return temperature, h_g = 2501 + 1.86·t (kJ/kg, ASHRAE Fundamentals
// ch. 1 eq. 30's vapour term): the heat that carries each kg of space moisture in the return
// air, so q_l = ṁ·(W_r − W_s)·h_g closes the space's energy balance exactly.
[[nodiscard]] constexpr double vapor_enthalpy_kj_per_kg(double t_c) { return 2501.0 + 1.86 * t_c; }

// The steady return humidity ratio when the unit runs at outdoor fraction x (docs/model.md
// §Return air). `moisture` is the space's pick-up W_r − W_s = q_l/(ṁ·h_g). With a coil that
// dehumidifies, W_r = min(W_o + moisture/x, W_cap + moisture); without, W_r = W_o +
// moisture/x. Both follow from W_s = x·W_o + (1 − x)·W_r (mixing) and W_r = W_s + moisture.
// With x = 0 and no dehumidification the space has no steady humidity: `fallback` is used.
[[nodiscard]] double return_humidity_ratio(double w_outdoor, double moisture, double x,
                                           bool coil_dehumidifies, double w_cap, double fallback);

}  // namespace limitline::part_load
