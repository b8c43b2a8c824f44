#include <limitline/analysis/annual.hpp>

#include <limitline/error.hpp>

#include <fmt/format.h>

#include <algorithm>

namespace limitline::annual {
namespace {

Outcome outcome(const airside::Operation& op, double kg_dry_air, const airside::EnergyWeights& w) {
  // kJ/kg × kg = kJ; kWh = kJ / 3600.
  const double k = kg_dry_air / 3600.0;
  Outcome o;
  o.oa_fraction = op.oa_fraction;
  o.economizing = op.economizing;
  o.mechanical_cooling = op.mechanical_cooling;
  o.cooling_kwh = op.loads.cooling_kj_per_kg * k;
  o.sensible_kwh = op.loads.sensible_kj_per_kg * k;
  o.latent_kwh = op.loads.latent_kj_per_kg * k;
  o.heating_kwh = op.loads.heating_kj_per_kg * k;
  o.energy_kwh = w.cooling * o.cooling_kwh + w.heating * o.heating_kwh;
  return o;
}

// Adds one interval's chosen operation to the totals of its month.
inline void accumulate(Totals& t, const PreparedInterval& iv, const Outcome& o, bool enabled) {
  const double h = iv.hours;
  t.hours_operating += h;
  if (iv.cooling_needed) t.hours_cooling_needed += h;
  if (enabled) t.hours_enabled += h;
  if (o.economizing) {
    t.hours_economizing += h;
    if (o.mechanical_cooling)
      t.hours_integrated += h;
    else
      t.hours_free_cooling += h;
  }
  t.cooling_kwh += o.cooling_kwh;
  t.sensible_kwh += o.sensible_kwh;
  t.latent_kwh += o.latent_kwh;
  t.heating_kwh += o.heating_kwh;
  t.energy_kwh += o.energy_kwh;
}

// Harmful and missed decisions of a changeover (enabled or not) against the perfect one.
inline void score(Totals& t, const PreparedInterval& iv, bool enabled) {
  if (enabled && iv.cooling_needed && iv.enabling_hurts()) {
    t.harmful_hours += iv.hours;
    t.harmful_kwh += iv.enabled.energy_kwh - iv.disabled.energy_kwh;
  } else if (!enabled && iv.enabling_pays()) {
    t.missed_hours += iv.hours;
    t.missed_kwh += iv.disabled.energy_kwh - iv.enabled.energy_kwh;
  }
}

void finish(StrategyResult& r) {
  r.annual = Totals{};
  for (const Totals& m : r.monthly) r.annual.add(m);
}

}  // namespace

void Totals::add(const Totals& o) {
  hours_operating += o.hours_operating;
  hours_cooling_needed += o.hours_cooling_needed;
  hours_enabled += o.hours_enabled;
  hours_economizing += o.hours_economizing;
  hours_free_cooling += o.hours_free_cooling;
  hours_integrated += o.hours_integrated;
  cooling_kwh += o.cooling_kwh;
  sensible_kwh += o.sensible_kwh;
  latent_kwh += o.latent_kwh;
  heating_kwh += o.heating_kwh;
  energy_kwh += o.energy_kwh;
  harmful_hours += o.harmful_hours;
  harmful_kwh += o.harmful_kwh;
  missed_hours += o.missed_hours;
  missed_kwh += o.missed_kwh;
}

std::string_view reference_name(Kind k) {
  switch (k) {
    case Kind::no_economizer: return "no-economizer";
    case Kind::perfect_changeover: return "perfect-changeover";
    case Kind::optimal_damper: return "optimal-damper";
    case Kind::strategy: break;
  }
  return "strategy";
}

Prepared prepare(const airside::AirHandler& unit, const AirPoint& ret_spec,
                 std::span<const OutdoorInterval> weather, const Schedule& schedule,
                 const PrepareOptions& opt) {
  airside::validate(unit);
  Prepared p;
  p.has_dew_point = opt.compute_dew_point;
  p.intervals.reserve(weather.size());
  const double mass_flow = unit.dry_air_mass_flow_kg_per_s();
  // Saturation pressures that do not change through the year, computed once.
  const double pws_return = psychro::saturation_pressure_kpa(ret_spec.dry_bulb_c);
  const double pws_return_dew = ret_spec.humidity_kind == psychro::HumidityInput::dew_point
                                    ? psychro::saturation_pressure_kpa(ret_spec.humidity_value)
                                    : 0.0;
  const double pws_coil = psychro::saturation_pressure_kpa(unit.coil_leaving_temp_c());
  double last_pressure = -1.0;
  airside::HourAir air{};
  highlimit::AirValues ret_values{};

  for (std::size_t i = 0; i < weather.size(); ++i) {
    const OutdoorInterval& w = weather[i];
    p.total_hours += w.hours;
    // The interval in whole minutes, held to a year before the cast: the schedule repeats
    // within it, and no interval length can make the conversion to int undefined.
    constexpr double kYearMinutes = 366.0 * 24.0 * 60.0;
    const double share = schedule.occupied_share(
        w.day_of_year, w.month, w.day, w.start_min,
        static_cast<int>(w.hours > 0.0 ? std::min(w.hours * 60.0 + 0.5, kYearMinutes) : 0.0));
    if (share <= 0.0) continue;
    const double hours = share * w.hours;
    p.operating_hours += hours;
    p.operating_hours_by_month[static_cast<std::size_t>(w.month - 1)] += hours;

    // Return air and coil limit at this interval's pressure (recomputed only when it changes).
    if (w.pressure_kpa != last_pressure) {
      last_pressure = w.pressure_kpa;
      const double pr = w.pressure_kpa;
      double w_ret = 0.0;
      switch (ret_spec.humidity_kind) {
        case psychro::HumidityInput::relative_humidity:
          w_ret =
              psychro::humidity_ratio_from_vapor_pressure(ret_spec.humidity_value * pws_return, pr);
          break;
        case psychro::HumidityInput::dew_point:
          w_ret = psychro::humidity_ratio_from_vapor_pressure(pws_return_dew, pr);
          break;
        case psychro::HumidityInput::humidity_ratio: w_ret = ret_spec.humidity_value; break;
        case psychro::HumidityInput::wet_bulb:
          w_ret = psychro::humidity_ratio_from_wet_bulb(ret_spec.dry_bulb_c,
                                                        ret_spec.humidity_value, pr);
          break;
        case psychro::HumidityInput::enthalpy:
          w_ret =
              psychro::humidity_ratio_from_enthalpy(ret_spec.dry_bulb_c, ret_spec.humidity_value);
          break;
      }
      psychro::check_humidity_ratio(w_ret, ret_spec.dry_bulb_c, pr, "return-air humidity ratio");
      air.ret = airside::air_state(ret_spec.dry_bulb_c, w_ret);
      air.coil = {unit.coil_leaving_temp_c(), psychro::humidity_ratio_from_vapor_pressure(
                                                  unit.coil_leaving_rh_max * pws_coil, pr)};
      ret_values = highlimit::air_values(
          air.ret.dry_bulb_c, air.ret.enthalpy_kj_per_kg,
          opt.compute_dew_point ? psychro::dew_point_from_humidity_ratio_c(w_ret, pr) : 0.0, w_ret);
    }
    air.outdoor = airside::air_state(w.dry_bulb_c, w.humidity_ratio);

    PreparedInterval iv{};
    iv.source_index = static_cast<std::uint32_t>(i);
    iv.month = static_cast<std::uint8_t>(w.month);
    iv.hours = hours;
    iv.pressure_kpa = w.pressure_kpa;
    const double kg = mass_flow * hours * 3600.0;
    iv.tolerance_kwh = airside::kDecisionToleranceKjPerKg * kg / 3600.0;
    const airside::HourChoice choice = airside::choose(unit, air, opt.weights);
    iv.cooling_needed = choice.cooling_needed;
    iv.disabled = outcome(choice.disabled, kg, opt.weights);
    iv.enabled = outcome(choice.enabled, kg, opt.weights);
    iv.optimal = outcome(airside::optimal_damper(unit, air, opt.weights), kg, opt.weights);
    iv.outdoor = highlimit::air_values(
        w.dry_bulb_c, air.outdoor.enthalpy_kj_per_kg,
        opt.compute_dew_point
            ? psychro::dew_point_from_humidity_ratio_c(w.humidity_ratio, w.pressure_kpa)
            : 0.0,
        w.humidity_ratio);
    iv.ret = ret_values;
    p.intervals.push_back(iv);
  }
  return p;
}

StrategyResult run(const highlimit::Strategy& strategy, const Prepared& p, const RunOptions& opt) {
  if (!p.has_dew_point && strategy.needs(highlimit::Quantity::dew_point))
    throw std::logic_error("annual::run: dew points were not prepared for a dew-point strategy");
  StrategyResult r;
  r.name = strategy.name;
  r.kind = Kind::strategy;
  if (opt.keep_decisions) r.enabled_by_interval.resize(p.intervals.size());
  highlimit::StrategyState state(strategy);
  for (std::size_t i = 0; i < p.intervals.size(); ++i) {
    const PreparedInterval& iv = p.intervals[i];
    const bool enabled = highlimit::permits(strategy, iv.outdoor, iv.ret, state);
    Totals& t = r.monthly[iv.month - 1u];
    accumulate(t, iv, enabled ? iv.enabled : iv.disabled, enabled);
    score(t, iv, enabled);
    if (opt.keep_decisions) r.enabled_by_interval[i] = enabled;
  }
  finish(r);
  return r;
}

StrategyResult run_reference(Kind reference, const Prepared& p, const RunOptions& opt) {
  StrategyResult r;
  r.name = std::string(reference_name(reference));
  r.kind = reference;
  if (opt.keep_decisions) r.enabled_by_interval.resize(p.intervals.size());
  for (std::size_t i = 0; i < p.intervals.size(); ++i) {
    const PreparedInterval& iv = p.intervals[i];
    Totals& t = r.monthly[iv.month - 1u];
    bool enabled = false;
    switch (reference) {
      case Kind::no_economizer:
        accumulate(t, iv, iv.disabled, false);
        score(t, iv, false);
        break;
      case Kind::perfect_changeover:
        enabled = iv.enabling_pays();
        accumulate(t, iv, enabled ? iv.enabled : iv.disabled, enabled);
        break;
      case Kind::optimal_damper:
        // Not a changeover: "enabled" means the damper is above the minimum; no scoring.
        enabled = iv.optimal.economizing;
        accumulate(t, iv, iv.optimal, enabled);
        break;
      case Kind::strategy: throw std::logic_error("annual::run_reference: not a reference");
    }
    if (opt.keep_decisions) r.enabled_by_interval[i] = enabled;
  }
  finish(r);
  return r;
}

YearResult evaluate(std::span<const highlimit::Strategy> strategies, const Prepared& p,
                    const RunOptions& opt) {
  YearResult y;
  y.total_hours = p.total_hours;
  y.operating_hours = p.operating_hours;
  y.no_economizer = run_reference(Kind::no_economizer, p, opt);
  y.perfect_changeover = run_reference(Kind::perfect_changeover, p, opt);
  y.optimal_damper = run_reference(Kind::optimal_damper, p, opt);
  const double e_none = y.no_economizer.annual.energy_kwh;
  const double e_perfect = y.perfect_changeover.annual.energy_kwh;
  auto settle = [&](StrategyResult& r) {
    r.savings_vs_no_economizer_kwh = e_none - r.annual.energy_kwh;
    r.shortfall_vs_perfect_kwh = r.annual.energy_kwh - e_perfect;
  };
  settle(y.no_economizer);
  settle(y.perfect_changeover);
  settle(y.optimal_damper);
  y.strategies.reserve(strategies.size());
  for (const auto& s : strategies) {
    y.strategies.push_back(run(s, p, opt));
    settle(y.strategies.back());
  }
  // Rank by shortfall; equal shortfalls keep the unit file's order.
  std::stable_sort(y.strategies.begin(), y.strategies.end(), [](const auto& a, const auto& b) {
    return a.shortfall_vs_perfect_kwh < b.shortfall_vs_perfect_kwh;
  });
  return y;
}

}  // namespace limitline::annual
