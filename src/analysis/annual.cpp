#include <limitline/analysis/annual.hpp>

#include <limitline/error.hpp>
#include <limitline/memo.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

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
  t.zone_heating_kwh += iv.zone_heating_kwh;
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
  zone_heating_kwh += o.zone_heating_kwh;
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

namespace {

// The design return air at pressure p (the unit file's return_air_* keys).
double design_return_humidity_ratio(const AirPoint& spec, double pws_return, double pws_dew,
                                    double p) {
  switch (spec.humidity_kind) {
    case psychro::HumidityInput::relative_humidity:
      return psychro::humidity_ratio_from_vapor_pressure(spec.humidity_value * pws_return, p);
    case psychro::HumidityInput::dew_point:
      return psychro::humidity_ratio_from_vapor_pressure(pws_dew, p);
    case psychro::HumidityInput::humidity_ratio: return spec.humidity_value;
    case psychro::HumidityInput::wet_bulb:
      return psychro::humidity_ratio_from_wet_bulb(spec.dry_bulb_c, spec.humidity_value, p);
    case psychro::HumidityInput::enthalpy:
      return psychro::humidity_ratio_from_enthalpy(spec.dry_bulb_c, spec.humidity_value);
  }
  return spec.humidity_value;
}

// Humid heat of the supply air, kJ/(kg dry air·K): dry air plus its vapour (eq. 32).
double humid_heat(double w) { return 1.006 + 1.86 * w; }

// The part of an hour that the space sets: airflow, ventilation fraction, return air and zone
// heating (docs/model.md §Part load).
struct SpaceHour {
  double mass_flow;  // kg/s dry air
  double zone_heating_kw;
  bool beyond_design;
  bool at_floor;
};

// Dry-air mass flow at which the no-economizer operation meets q_s with the hour's supply
// air, held to [floor, design]. The supply humidity enters through its humid heat, and it
// depends on the airflow (the space's moisture pick-up is q_l/ṁ): a fixed point that settles
// in two or three steps.
SpaceHour solve_space_hour(airside::AirHandler& u, airside::HourAir& air,
                           const part_load::Control& control, const part_load::Space& space,
                           const part_load::SpaceLoads& loads, double design_flow, double rho,
                           double fallback_w) {
  const double dt = space.space_temp_c - u.supply_air_temp_c;  // > 0 (validated)
  const double floor = control.airflow == part_load::AirflowControl::variable
                           ? design_flow * control.min_airflow_fraction
                           : design_flow;
  const double h_g = part_load::vapor_enthalpy_kj_per_kg(space.return_temp_c());
  const double x_max = u.max_oa_fraction;
  auto set_flow = [&](double m) {
    if (control.min_outdoor_airflow_m3_per_s)
      u.min_oa_fraction = std::min(*control.min_outdoor_airflow_m3_per_s * rho / m, x_max);
    air.space =
        airside::SpaceReturn{space.return_temp_c(), loads.latent_kw / (m * h_g), fallback_w};
    air.ret = airside::steady_return_air(u, air, u.min_oa_fraction);
  };
  auto supply_w = [&]() {
    const airside::AirState mixed = airside::mix(air.outdoor, air.ret, u.min_oa_fraction);
    return airside::coil_loads(u, air.coil, mixed).leaving.humidity_ratio;
  };
  auto wanted = [&](double cp) {
    return std::clamp(loads.sensible_kw / (cp * dt), floor, design_flow);
  };

  double m = wanted(humid_heat(air.coil.leaving_humidity_ratio_cap));
  set_flow(m);
  double cp = humid_heat(supply_w());
  if (floor < design_flow) {
    for (int i = 0; i < 6; ++i) {
      const double next = wanted(cp);
      if (std::fabs(next - m) <= 1e-12 * design_flow) break;
      m = next;
      set_flow(m);
      cp = humid_heat(supply_w());
    }
  }
  SpaceHour h{};
  h.mass_flow = m;
  const double carried = m * cp * dt;  // kW the supply air takes from the space at setpoint
  h.zone_heating_kw = std::max(0.0, carried - loads.sensible_kw);
  h.beyond_design = loads.sensible_kw > carried * (1.0 + 1e-9);
  h.at_floor = floor < design_flow && m <= floor * (1.0 + 1e-12);
  return h;
}

Outcome priced(const airside::Operation& op, double kg, const airside::EnergyWeights& w,
               double zone_heating_kwh) {
  Outcome o = outcome(op, kg, w);
  o.energy_kwh += w.heating * zone_heating_kwh;
  o.return_humidity_ratio = op.ret.humidity_ratio;
  o.supply_humidity_ratio = op.loads.leaving.humidity_ratio;
  return o;
}

}  // namespace

Prepared prepare(const airside::AirHandler& unit, const AirPoint& ret_spec,
                 std::span<const OutdoorInterval> weather, const Schedule& schedule,
                 const PrepareOptions& opt) {
  airside::validate(unit);
  const part_load::Control& control = opt.control;
  part_load::validate(control, unit);
  const part_load::Space* space = opt.space ? &*opt.space : nullptr;
  if (space) {
    part_load::validate(*space, unit, control);
    if (!space->coefficients && opt.hourly_loads.size() != weather.size())
      throw std::logic_error("annual::prepare: hourly loads do not match the weather");
  } else if (control.airflow == part_load::AirflowControl::variable) {
    throw InputError(
        "air_handler.airflow_control: variable airflow follows the space load; give [loads]");
  }
  Prepared p;
  p.has_dew_point = opt.compute_dew_point;
  p.intervals.reserve(weather.size());
  p.model.part_load = space != nullptr;
  p.model.hourly_loads = space != nullptr && !space->coefficients;
  p.model.airflow = control.airflow;
  p.model.supply_reset = control.reset.has_value();
  const double max_weight = std::max(opt.weights.cooling, opt.weights.heating);
  // Saturation pressures that do not change through the year, computed once.
  const double pws_return = psychro::saturation_pressure_kpa(ret_spec.dry_bulb_c);
  const double pws_return_dew = ret_spec.humidity_kind == psychro::HumidityInput::dew_point
                                    ? psychro::saturation_pressure_kpa(ret_spec.humidity_value)
                                    : 0.0;
  double last_pressure = -1.0, last_coil_t = NAN, pws_coil = 0.0, w_design_ret = 0.0;
  airside::HourAir air{};
  highlimit::AirValues ret_values{};
  airside::AirHandler u = unit;
  // The design return air depends on the pressure alone, and a year holds a few hundred
  // distinct pressures; the outdoor dew point on the humidity ratio and the pressure, which
  // repeat in files that give the dew point to a tenth of a degree. Each costs an exp or a log.
  struct DesignReturn {
    double w;
    airside::AirState air;
    highlimit::AirValues values;
  };
  Memo<DesignReturn, 9> design_return;
  Memo<double, 11> outdoor_dew_point;

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

    // The hour's supply air, and the coil limit at its leaving temperature and pressure
    // (recomputed only when either changes).
    u.supply_air_temp_c =
        control.reset ? control.reset->supply_temp_c(w.dry_bulb_c) : unit.supply_air_temp_c;
    u.min_oa_fraction = unit.min_oa_fraction;
    const double t_cl = u.coil_leaving_temp_c();
    const bool pressure_changed = w.pressure_kpa != last_pressure;
    if (t_cl != last_coil_t) {
      last_coil_t = t_cl;
      pws_coil = psychro::saturation_pressure_kpa(t_cl);
    }
    if (pressure_changed || air.coil.leaving_temp_c != t_cl)
      air.coil = {t_cl, psychro::humidity_ratio_from_vapor_pressure(
                            unit.coil_leaving_rh_max * pws_coil, w.pressure_kpa)};
    if (pressure_changed) {
      last_pressure = w.pressure_kpa;
      const DesignReturn& d = design_return.get(w.pressure_kpa, [&] {
        DesignReturn r{};
        r.w = design_return_humidity_ratio(ret_spec, pws_return, pws_return_dew, w.pressure_kpa);
        psychro::check_humidity_ratio(r.w, ret_spec.dry_bulb_c, w.pressure_kpa,
                                      "return-air humidity ratio");
        if (!space) {
          r.air = airside::air_state(ret_spec.dry_bulb_c, r.w);
          r.values = highlimit::air_values(
              r.air.dry_bulb_c, r.air.enthalpy_kj_per_kg,
              opt.compute_dew_point ? psychro::dew_point_from_humidity_ratio_c(r.w, w.pressure_kpa)
                                    : 0.0,
              r.w);
        }
        return r;
      });
      w_design_ret = d.w;
      if (!space) {
        air.ret = d.air;
        ret_values = d.values;
      }
    }
    air.outdoor = airside::air_state(w.dry_bulb_c, w.humidity_ratio);

    const double rho = part_load::air_density_kg_per_m3(control.basis, w.pressure_kpa);
    const double design_flow = unit.supply_airflow_m3_per_s * rho;
    double mass_flow = design_flow;
    // Built in place: the interval is a few hundred bytes, too many to copy every hour.
    PreparedInterval& iv = p.intervals.emplace_back();
    if (space) {
      const part_load::SpaceLoads loads =
          space->coefficients ? space->coefficients->at(w.dry_bulb_c, space->space_temp_c)
                              : opt.hourly_loads[i];
      const SpaceHour sh =
          solve_space_hour(u, air, control, *space, loads, design_flow, rho, w_design_ret);
      mass_flow = sh.mass_flow;
      air.light_load = airside::LightLoad{loads.sensible_kw, design_flow, space->space_temp_c};
      iv.zone_heating_kwh = sh.zone_heating_kw * hours;
      iv.sensible_kwh = loads.sensible_kw * hours;
      iv.latent_kwh = loads.latent_kw * hours;
      if (sh.beyond_design) p.model.hours_beyond_design += hours;
      if (sh.at_floor) p.model.min_airflow_hours += hours;
      ret_values = highlimit::air_values(
          air.ret.dry_bulb_c, air.ret.enthalpy_kj_per_kg,
          opt.compute_dew_point
              ? psychro::dew_point_from_humidity_ratio_c(air.ret.humidity_ratio, w.pressure_kpa)
              : 0.0,
          air.ret.humidity_ratio);
    } else if (control.min_outdoor_airflow_m3_per_s) {
      u.min_oa_fraction =
          std::min(*control.min_outdoor_airflow_m3_per_s * rho / mass_flow, u.max_oa_fraction);
    }
    if (control.min_outdoor_airflow_m3_per_s &&
        *control.min_outdoor_airflow_m3_per_s * rho / mass_flow > u.max_oa_fraction * (1 + 1e-12))
      p.model.hours_ventilation_held += hours;

    iv.source_index = static_cast<std::uint32_t>(i);
    iv.month = static_cast<std::uint8_t>(w.month);
    iv.hours = hours;
    iv.pressure_kpa = w.pressure_kpa;
    iv.supply_temp_c = u.supply_air_temp_c;
    iv.mass_flow_kg_per_s = mass_flow;
    iv.airflow_m3_per_s = mass_flow / rho;
    iv.min_oa_fraction = u.min_oa_fraction;
    const double kg = mass_flow * hours * 3600.0;
    iv.tolerance_kwh = airside::kDecisionToleranceKjPerKg * kg / 3600.0 * max_weight;
    const airside::HourChoice choice = airside::choose(u, air, opt.weights);
    iv.cooling_needed = choice.cooling_needed;
    iv.disabled = priced(choice.disabled, kg, opt.weights, iv.zone_heating_kwh);
    iv.enabled = priced(choice.enabled, kg, opt.weights, iv.zone_heating_kwh);
    iv.optimal =
        priced(airside::optimal_damper(u, air, opt.weights), kg, opt.weights, iv.zone_heating_kwh);
    iv.outdoor = highlimit::air_values(
        w.dry_bulb_c, air.outdoor.enthalpy_kj_per_kg,
        opt.compute_dew_point
            ? outdoor_dew_point.get(w.humidity_ratio, w.pressure_kpa,
                                    [&] {
                                      return psychro::dew_point_from_humidity_ratio_c(
                                          w.humidity_ratio, w.pressure_kpa);
                                    })
            : 0.0,
        w.humidity_ratio);
    iv.ret = ret_values;
    p.model.space_sensible_kwh += iv.sensible_kwh;
    p.model.space_latent_kwh += iv.latent_kwh;
    p.model.zone_heating_kwh += iv.zone_heating_kwh;
  }
  return p;
}

namespace {

// One interval of one strategy: its decision (updating the deadband state) and the totals of
// the interval's month. Returns whether it enabled.
inline bool step(const highlimit::Strategy& strategy, highlimit::StrategyState& state,
                 const PreparedInterval& iv, StrategyResult& r) {
  const bool enabled = highlimit::permits(strategy, iv.outdoor, iv.ret, state);
  Totals& t = r.monthly[iv.month - 1u];
  accumulate(t, iv, enabled ? iv.enabled : iv.disabled, enabled);
  score(t, iv, enabled);
  return enabled;
}

// One interval of a reference. Returns whether it enabled.
inline bool step(Kind reference, const PreparedInterval& iv, StrategyResult& r) {
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
  return enabled;
}

void check_dew_points(const highlimit::Strategy& strategy, const Prepared& p) {
  if (!p.has_dew_point && strategy.needs(highlimit::Quantity::dew_point))
    throw std::logic_error("annual::run: dew points were not prepared for a dew-point strategy");
}

StrategyResult start(std::string name, Kind kind, const Prepared& p, const RunOptions& opt) {
  StrategyResult r;
  r.name = std::move(name);
  r.kind = kind;
  if (opt.keep_decisions) r.enabled_by_interval.resize(p.intervals.size());
  return r;
}

}  // namespace

StrategyResult run(const highlimit::Strategy& strategy, const Prepared& p, const RunOptions& opt) {
  check_dew_points(strategy, p);
  StrategyResult r = start(strategy.name, Kind::strategy, p, opt);
  highlimit::StrategyState state(strategy);
  for (std::size_t i = 0; i < p.intervals.size(); ++i) {
    const bool enabled = step(strategy, state, p.intervals[i], r);
    if (opt.keep_decisions) r.enabled_by_interval[i] = enabled;
  }
  finish(r);
  return r;
}

StrategyResult run_reference(Kind reference, const Prepared& p, const RunOptions& opt) {
  StrategyResult r = start(std::string(reference_name(reference)), reference, p, opt);
  for (std::size_t i = 0; i < p.intervals.size(); ++i) {
    const bool enabled = step(reference, p.intervals[i], r);
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
  y.model = p.model;
  for (const auto& s : strategies) check_dew_points(s, p);
  // One pass over the year for the references and every strategy together: each interval is
  // read from memory once rather than once per strategy. Each result's totals still add the
  // intervals in the same order as run() and run_reference(), so the sums are the same.
  y.no_economizer =
      start(std::string(reference_name(Kind::no_economizer)), Kind::no_economizer, p, opt);
  y.perfect_changeover = start(std::string(reference_name(Kind::perfect_changeover)),
                               Kind::perfect_changeover, p, opt);
  y.optimal_damper =
      start(std::string(reference_name(Kind::optimal_damper)), Kind::optimal_damper, p, opt);
  y.strategies.reserve(strategies.size());
  std::vector<highlimit::StrategyState> states;
  states.reserve(strategies.size());
  for (const auto& s : strategies) {
    y.strategies.push_back(start(s.name, Kind::strategy, p, opt));
    states.emplace_back(s);
  }
  StrategyResult* const refs[] = {&y.no_economizer, &y.perfect_changeover, &y.optimal_damper};
  for (std::size_t i = 0; i < p.intervals.size(); ++i) {
    const PreparedInterval& iv = p.intervals[i];
    for (StrategyResult* r : refs) {
      const bool enabled = step(r->kind, iv, *r);
      if (opt.keep_decisions) r->enabled_by_interval[i] = enabled;
    }
    for (std::size_t k = 0; k < strategies.size(); ++k) {
      const bool enabled = step(strategies[k], states[k], iv, y.strategies[k]);
      if (opt.keep_decisions) y.strategies[k].enabled_by_interval[i] = enabled;
    }
  }
  for (StrategyResult* r : refs) finish(*r);
  for (StrategyResult& r : y.strategies) finish(r);
  const double e_none = y.no_economizer.annual.energy_kwh;
  const double e_perfect = y.perfect_changeover.annual.energy_kwh;
  auto settle = [&](StrategyResult& r) {
    r.savings_vs_no_economizer_kwh = e_none - r.annual.energy_kwh;
    r.shortfall_vs_perfect_kwh = r.annual.energy_kwh - e_perfect;
  };
  settle(y.no_economizer);
  settle(y.perfect_changeover);
  settle(y.optimal_damper);
  for (StrategyResult& r : y.strategies) settle(r);
  // Rank by shortfall; equal shortfalls keep the unit file's order.
  std::stable_sort(y.strategies.begin(), y.strategies.end(), [](const auto& a, const auto& b) {
    return a.shortfall_vs_perfect_kwh < b.shortfall_vs_perfect_kwh;
  });
  return y;
}

}  // namespace limitline::annual
