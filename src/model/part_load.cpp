#include <limitline/model/part_load.hpp>

#include <limitline/error.hpp>
#include <limitline/model/psychro.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

namespace limitline::part_load {
namespace {

constexpr Named<AirflowControl> kControlNames[] = {
    {"constant", AirflowControl::constant},
    {"variable", AirflowControl::variable},
};
constexpr Named<AirflowBasis> kBasisNames[] = {
    {"standard", AirflowBasis::standard},
    {"actual", AirflowBasis::actual},
};

[[noreturn]] void fail(std::string_view field, std::string_view message) {
  throw InputError(fmt::format("{}: {}", field, message));
}

}  // namespace

std::span<const Named<AirflowControl>> airflow_control_names() { return kControlNames; }
std::string_view airflow_control_name(AirflowControl c) { return name_in(kControlNames, c); }
std::span<const Named<AirflowBasis>> airflow_basis_names() { return kBasisNames; }
std::string_view airflow_basis_name(AirflowBasis b) { return name_in(kBasisNames, b); }

double air_density_kg_per_m3(AirflowBasis basis, double pressure_kpa) {
  if (basis == AirflowBasis::standard) return airside::kStandardAirDensityKgPerM3;
  return airside::kStandardAirDensityKgPerM3 * pressure_kpa / psychro::kStandardPressureKpa;
}

double SupplyAirReset::supply_temp_c(double t_out) const {
  if (t_out <= outdoor_low_c) return supply_at_low_c;
  if (t_out >= outdoor_high_c) return supply_at_high_c;
  const double f = (t_out - outdoor_low_c) / (outdoor_high_c - outdoor_low_c);
  return supply_at_low_c + f * (supply_at_high_c - supply_at_low_c);
}

void validate(const Control& c, const airside::AirHandler& design) {
  if (!(c.min_airflow_fraction > 0.0 && c.min_airflow_fraction <= 1.0))
    fail("air_handler.min_airflow", fmt::format("{:.4g}% is not allowed (above 0%, up to 100%)",
                                                c.min_airflow_fraction * 100));
  if (c.reset) {
    const SupplyAirReset& r = *c.reset;
    if (!(r.outdoor_high_c > r.outdoor_low_c))
      fail("air_handler.supply_air_reset",
           fmt::format("outdoor_high {:.4g} °C must be above outdoor_low {:.4g} °C",
                       r.outdoor_high_c, r.outdoor_low_c));
    for (double t : {r.supply_at_low_c, r.supply_at_high_c})
      if (!(t >= -40.0 && t <= 60.0))
        fail("air_handler.supply_air_reset",
             fmt::format("a supply temperature of {:.4g} °C is not allowed (-40 °C to 60 °C)", t));
  }
  if (c.min_outdoor_airflow_m3_per_s &&
      !(*c.min_outdoor_airflow_m3_per_s >= 0.0 &&
        *c.min_outdoor_airflow_m3_per_s <= design.supply_airflow_m3_per_s * (1.0 + 1e-12)))
    fail("air_handler.min_outdoor_airflow",
         fmt::format("{:.6g} m³/s is not allowed (0 up to supply_airflow {:.6g} m³/s)",
                     *c.min_outdoor_airflow_m3_per_s, design.supply_airflow_m3_per_s));
}

void validate(const Space& s, const airside::AirHandler& design, const Control& c) {
  if (!(s.space_temp_c >= 5.0 && s.space_temp_c <= 45.0))
    fail("loads.space_temp",
         fmt::format("{:.4g} °C is not allowed (5 °C to 45 °C)", s.space_temp_c));
  if (!(s.return_air_rise_k >= 0.0 && s.return_air_rise_k <= 10.0))
    fail("loads.return_air_rise",
         fmt::format("{:.4g} K is not allowed (0 K to 10 K)", s.return_air_rise_k));
  // The supply air must be able to cool the space at every hour's supply temperature.
  double warmest = design.supply_air_temp_c;
  if (c.reset) warmest = std::max(c.reset->supply_at_low_c, c.reset->supply_at_high_c);
  if (!(warmest < s.space_temp_c))
    fail("loads.space_temp",
         fmt::format("{:.4g} °C is not above the warmest supply air {:.4g} °C; the supply air "
                     "could not carry the space's heat",
                     s.space_temp_c, warmest));
  if (s.coefficients) {
    const LoadCoefficients& k = *s.coefficients;
    if (!(std::isfinite(k.internal_sensible_kw) && std::fabs(k.internal_sensible_kw) <= 1e5))
      fail("loads.internal_sensible", "must be a finite power within ±100,000 kW");
    if (!(k.envelope_ua_kw_per_k >= 0.0 && k.envelope_ua_kw_per_k <= 1e4))
      fail("loads.envelope_ua", "must be 0 to 10,000 kW/K");
    if (!(k.latent_kw >= 0.0 && k.latent_kw <= 1e5))
      fail("loads.latent", "must be 0 to 100,000 kW (moisture is added, not removed)");
  }
}

double return_humidity_ratio(double w_o, double moisture, double x, bool dehumidifies, double w_cap,
                             double fallback) {
  // Space moisture leaves only with the outdoor air (x) or as condensate on the coil.
  const double through_outdoor =
      x > 0.0 ? w_o + moisture / x : (moisture > 0.0 ? INFINITY : fallback);
  if (dehumidifies) return std::min(through_outdoor, w_cap + moisture);
  return std::isfinite(through_outdoor) ? through_outdoor : fallback;
}

}  // namespace limitline::part_load
