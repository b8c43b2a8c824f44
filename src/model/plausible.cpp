// Plausible bands of air-handler quantities, and what a value outside one means.
#include <limitline/model/plausible.hpp>

#include <limitline/error.hpp>
#include <limitline/text.hpp>

#include <fmt/format.h>

namespace limitline::plausible {
namespace {

using units::Kind;

// Where the quantities of a working air handler lie (common practice): comfort return air,
// supply setpoints of cooling units, climates people build in, sites below 5,000 m, single
// air handlers from a small fan-coil to the largest built-up units, fan heat of a few kelvin,
// high-limit settings around the published code limits (90.1, IECC, Title 24: 65–75 °F,
// 22–28 Btu/lb, 55 °F dew point), sensors a few times their catalogue accuracy. The bands are
// deliberately wide: they catch numbers in the wrong unit system and slips of a digit, not
// unusual designs (those get a warning, never a refusal, when their unit is written).
constexpr Band kBands[] = {
    {"site.elevation", Kind::length, -500.0, 5000.0, "a site elevation"},
    // The standard pressure from about 5,500 m to −700 m (ASHRAE Fundamentals ch. 1 eq. 3).
    {"site.pressure", Kind::pressure, 50.0, 110.0, "a site pressure"},
    {"air_handler.supply_airflow", Kind::airflow, 0.05, 200.0, "the supply airflow of one unit"},
    {"air_handler.min_outdoor_airflow", Kind::airflow, 0.0, 200.0,
     "the outdoor airflow of one unit"},
    {"air_handler.supply_air_temp", Kind::temperature, 5.0, 25.0, "a supply-air setpoint"},
    // From a small packaged unit (about a ton) to the largest built-up air handlers.
    {"air_handler.design_cooling_capacity", Kind::power, 3.0, 3000.0,
     "the cooling capacity of one unit"},
    {"air_handler.fan_heat", Kind::temperature_difference, 0.0, 5.0, "a supply-fan heat rise"},
    // Above 80 % minimum outdoor air an economizer has almost nothing left to decide.
    {"air_handler.min_outdoor_air", Kind::fraction, 0.0, 0.8, "a ventilation minimum"},
    {"air_handler.max_outdoor_air", Kind::fraction, 0.3, 1.0, "an economizer damper limit"},
    {"air_handler.coil_leaving_rh_max", Kind::fraction, 0.8, 1.0,
     "a coil-leaving relative humidity"},
    {"air_handler.return_air_temp", Kind::temperature, 10.0, 40.0, "a return-air dry-bulb"},
    {"air_handler.return_air_rh", Kind::fraction, 0.05, 0.9, "a return-air relative humidity"},
    {"air_handler.return_air_dew_point", Kind::temperature, -10.0, 25.0, "a return-air dew point"},
    {"air_handler.return_air_wet_bulb", Kind::temperature, 0.0, 30.0, "a return-air wet-bulb"},
    {"air_handler.return_air_humidity_ratio", Kind::humidity_ratio, 0.001, 0.02,
     "a return-air humidity ratio"},
    {"air_handler.return_air_enthalpy", Kind::enthalpy, 15.0, 90.0, "a return-air enthalpy"},
    // Below 10 % a terminal cannot hold its airflow steady (common practice: VAV minimums of
    // 20–40 % of design).
    {"air_handler.min_airflow", Kind::fraction, 0.1, 1.0, "a variable-airflow minimum"},
    // Comfort cooling setpoints, and the rise of a return plenum with lights and a return fan.
    {"loads.space_temp", Kind::temperature, 18.0, 30.0, "a space cooling setpoint"},
    {"loads.return_air_rise", Kind::temperature_difference, 0.0, 3.0,
     "a return-air rise above the space"},
    // The loads one air handler (0.05–200 m³/s) can carry at a 10–12 K supply difference.
    {"loads.internal_sensible", Kind::power, 0.1, 3000.0, "the sensible gains of one unit's space"},
    {"loads.envelope_ua", Kind::conductance, 0.0, 300.0, "the envelope conductance of one space"},
    {"loads.latent", Kind::power, 0.0, 1500.0, "the latent gains of one unit's space"},
    {"outdoor.dry_bulb", Kind::temperature, -50.0, 55.0, "an outdoor dry-bulb"},
    {"outdoor.rh", Kind::fraction, 0.0, 1.0, "an outdoor relative humidity"},
    {"outdoor.dew_point", Kind::temperature, -60.0, 35.0, "an outdoor dew point"},
    {"outdoor.wet_bulb", Kind::temperature, -50.0, 36.0, "an outdoor wet-bulb"},
    {"outdoor.humidity_ratio", Kind::humidity_ratio, 0.0, 0.035, "an outdoor humidity ratio"},
    {"outdoor.enthalpy", Kind::enthalpy, -50.0, 130.0, "an outdoor enthalpy"},
    {"strategy.dry_bulb_limit", Kind::temperature, 10.0, 30.0, "a dry-bulb high-limit"},
    {"strategy.enthalpy_limit", Kind::enthalpy, 30.0, 75.0, "an enthalpy high-limit"},
    {"strategy.dew_point_limit", Kind::temperature, 0.0, 25.0, "a dew-point high-limit"},
    {"strategy.humidity_ratio_limit", Kind::humidity_ratio, 0.002, 0.02,
     "a humidity-ratio high-limit"},
    {"strategy.dry_bulb_offset", Kind::temperature_difference, -5.0, 5.0,
     "a dry-bulb offset from the return air"},
    {"strategy.enthalpy_offset", Kind::enthalpy_difference, -10.0, 10.0,
     "an enthalpy offset from the return air"},
    {"strategy.dew_point_offset", Kind::temperature_difference, -5.0, 5.0,
     "a dew-point offset from the return air"},
    {"strategy.humidity_ratio_offset", Kind::humidity_ratio, -0.005, 0.005,
     "a humidity-ratio offset from the return air"},
    {"strategy.dry_bulb_deadband", Kind::temperature_difference, 0.0, 5.0, "a dry-bulb deadband"},
    {"strategy.enthalpy_deadband", Kind::enthalpy_difference, 0.0, 10.0, "an enthalpy deadband"},
    {"strategy.dew_point_deadband", Kind::temperature_difference, 0.0, 5.0, "a dew-point deadband"},
    {"strategy.humidity_ratio_deadband", Kind::humidity_ratio, 0.0, 0.005,
     "a humidity-ratio deadband"},
    {"sensors.outdoor_dry_bulb", Kind::temperature_difference, 0.0, 3.0,
     "a dry-bulb sensor accuracy"},
    {"sensors.return_dry_bulb", Kind::temperature_difference, 0.0, 3.0,
     "a dry-bulb sensor accuracy"},
    {"sensors.outdoor_rh", Kind::fraction, 0.0, 0.15, "an RH sensor accuracy"},
    {"sensors.return_rh", Kind::fraction, 0.0, 0.15, "an RH sensor accuracy"},
    {"sensors.outdoor_dew_point", Kind::temperature_difference, 0.0, 5.0,
     "a dew-point sensor accuracy"},
    {"sensors.outdoor_enthalpy", Kind::enthalpy_difference, 0.0, 10.0,
     "an enthalpy sensor accuracy"},
    // The audit's sensors: duct and outdoor temperature sensors of ±0.1 to ±1 K, a few times
    // that installed; a discharge loop holds its setpoint within a few kelvin.
    {"audit.outdoor_accuracy", Kind::temperature_difference, 0.05, 2.0,
     "a temperature sensor accuracy"},
    {"audit.return_accuracy", Kind::temperature_difference, 0.05, 2.0,
     "a temperature sensor accuracy"},
    {"audit.mixed_accuracy", Kind::temperature_difference, 0.05, 2.0,
     "a temperature sensor accuracy"},
    {"audit.supply_accuracy", Kind::temperature_difference, 0.05, 2.0,
     "a temperature sensor accuracy"},
    {"audit.supply_tolerance", Kind::temperature_difference, 0.0, 3.0, "a supply-air tolerance"},
};

// Plain numbers of the plant (common practice): chillers and packaged units run at a COP of
// about 2 to 7 with their auxiliaries, boilers and furnaces at 80–98 %; energy prices lie
// between a cent and a unit of currency per kWh.
constexpr NumberBand kNumberBands[] = {
    // Trend logs sample every 1 to 60 minutes; a gap of hours stands for nothing measured.
    {"audit.max_gap_minutes", 1.0, 240.0, "a trend log's longest sample weight", ""},
    // A finding resting on more than a day or a hundred samples hides real faults.
    {"audit.min_hours", 0.0, 24.0, "a finding's minimum hours", ""},
    {"audit.min_samples", 0.0, 100.0, "a finding's minimum samples", ""},
    {"plant.cooling_cop", 1.5, 10.0, "a cooling COP", ""},
    // The same band as kW per ton: 3.516852842/10 to 3.516852842/1.5.
    {"plant.cooling_kw_per_ton", 0.35, 2.35, "a cooling plant's kW per ton", ""},
    {"plant.heating_efficiency", 0.5, 1.0, "a heating efficiency",
     "a heat pump's COP? (heating_price is then per kWh of electricity)"},
    {"plant.electricity_price", 0.01, 1.0, "a price per kWh", ""},
    {"plant.heating_price", 0.01, 1.0, "a price per kWh", ""},
};

units::System other(units::System s) {
  return s == units::System::ip ? units::System::si : units::System::ip;
}

bool inside(const Band& b, double v) { return units::within(v, b.lo, b.hi); }

}  // namespace

std::span<const Band> bands() { return kBands; }

std::string in_file(units::System bare) {
  return bare == units::System::ip ? "in an IP file" : "in an SI file";
}
std::string on_command_line(units::System bare) {
  return bare == units::System::ip ? "read in IP units" : "read in SI units";
}

const Band* find(std::string_view name) {
  for (const Band& b : kBands)
    if (b.name == name) return &b;
  return nullptr;
}

double parse(const Band& band, std::string_view text, units::System bare, const Source& source,
             std::vector<std::string>& warnings) {
  const double v = units::parse(band.kind, text, bare, source.origin);
  if (inside(band, v)) return v;
  // A band is a rule of thumb: its ends are shown to three digits in the file's system.
  const std::string range =
      fmt::format("outside the plausible range of {} ({} to {}, common practice)", band.what,
                  units::format_brief(band.kind, bare, band.lo, 3),
                  units::format_brief(band.kind, bare, band.hi, 3));
  const std::string_view written = text::trim_blanks(text);
  if (units::has_unit(written)) {
    warnings.push_back(
        fmt::format("{}: {} ({}) is {}; used as written: check the value and its "
                    "unit",
                    source.origin, echo(written), units::format_brief(band.kind, bare, v), range));
    return v;
  }
  // A bare number is a plain number (units::parse read all of it): shown as it is, unless long.
  const std::string number = written.size() <= 40 ? std::string(written) : echo(written);
  const std::string reading = fmt::format("{} {} is {}, {}", number, source.bare_reading,
                                          units::format_brief(band.kind, bare, v), range);
  // A percentage or a humidity ratio reads the same in both systems: no other reading.
  double alt = v;
  try {
    alt = units::parse(band.kind, written, other(bare), source.origin);
  } catch (const InputError&) {
    // Beyond any physical bound in the other system: no reading to offer.
  }
  if (alt != v && inside(band, alt))
    throw InputError(fmt::format("{}: {}; if you meant {} write \"{}{}\"", source.origin, reading,
                                 units::format_brief(band.kind, other(bare), alt), number,
                                 units::written_unit(band.kind, other(bare))));
  warnings.push_back(fmt::format("{}: {}; used as written", source.origin, reading));
  return v;
}

std::span<const NumberBand> number_bands() { return kNumberBands; }

const NumberBand* find_number(std::string_view name) {
  for (const NumberBand& b : kNumberBands)
    if (b.name == name) return &b;
  return nullptr;
}

void weigh(const NumberBand& band, double value, std::string_view origin,
           std::vector<std::string>& warnings) {
  if (units::within(value, band.lo, band.hi)) return;
  const bool above = value > band.hi;
  warnings.push_back(fmt::format(
      "{}: {:g} is outside the plausible range of {} ({:g} to {:g}, common practice); {}{}used "
      "as written",
      origin, value, band.what, band.lo, band.hi,
      above && !band.above_hint.empty() ? band.above_hint : "",
      above && !band.above_hint.empty() ? "; " : ""));
}

}  // namespace limitline::plausible
