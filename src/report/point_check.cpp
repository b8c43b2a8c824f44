// The point-check report: what every strategy of a unit decides at one outdoor (and return)
// condition and what that costs against the perfect changeover, in text, Markdown and JSON.
#include <limitline/report/point_check.hpp>

#include <limitline/report/cautions.hpp>
#include <limitline/report/json.hpp>
#include <limitline/report/state.hpp>
#include <limitline/report/table.hpp>

#include <fmt/format.h>

#include <cmath>

namespace limitline::report {
namespace {

using highlimit::ConditionStatus;
using highlimit::Reference;
using units::Kind;

int decimals(Kind k, units::System s) {
  const bool ip = s == units::System::ip;
  switch (k) {
    case Kind::temperature:
    case Kind::temperature_difference:
    case Kind::fraction:
    case Kind::power: return 1;
    case Kind::enthalpy:
    case Kind::enthalpy_difference:
    case Kind::energy: return 2;
    case Kind::humidity_ratio: return 5;
    case Kind::pressure: return ip ? 3 : 2;
    case Kind::airflow: return ip ? 0 : 3;
    case Kind::length: return 0;
    default: return 3;
  }
}

// Display and JSON keys in one unit system.
struct View {
  units::System system;

  std::string q(Kind k, double si) const {
    return units::format(k, system, si, decimals(k, system));
  }
  // The number alone, for table columns whose title carries the unit.
  std::string n(Kind k, double si) const {
    const int d = decimals(k, system);
    double x = units::to_display(k, system, si);
    if (std::fabs(x) < 0.5 * std::pow(10.0, -d)) x = 0.0;
    return fmt::format("{:.{}f}", x, d);
  }
  std::string title(std::string_view name, Kind k) const {
    return fmt::format("{} ({})", name, units::unit_label(k, system));
  }
  double v(Kind k, double si) const { return units::to_display(k, system, si); }
  std::string key(std::string_view stem, Kind k) const {
    return fmt::format("{}_{}", stem, units::key_suffix(k, system));
  }
  // Loads per mass of dry air are enthalpy differences, keyed like enthalpies ("_btu_per_lb").
  std::string per_mass_key(std::string_view stem) const { return key(stem, Kind::enthalpy); }
  std::string per_mass_label() const {
    return system == units::System::ip ? "per lb dry air" : "per kg dry air";
  }
};

std::string_view status_name(ConditionStatus s) {
  switch (s) {
    case ConditionStatus::clear: return "clear";
    case ConditionStatus::tripped: return "tripped";
    case ConditionStatus::held: return "held";
  }
  return "clear";
}

std::string describe(const highlimit::Condition& c, const View& view) {
  const Kind value = highlimit::quantity_kind(c.quantity);
  const Kind diff = highlimit::quantity_difference_kind(c.quantity);
  std::string out =
      c.reference == Reference::fixed
          ? fmt::format("{} above {}", highlimit::quantity_name(c.quantity), view.q(value, c.limit))
          : fmt::format("{} above return {}{}", highlimit::quantity_name(c.quantity),
                        c.limit < 0 ? "- " : "+ ", view.q(diff, std::fabs(c.limit)));
  if (c.deadband > 0) out += fmt::format(" (deadband {})", view.q(diff, c.deadband));
  return out;
}

std::string why(const StrategyOutcome& o, const View& view) {
  if (o.decision.enabled) return "all conditions clear";
  const auto i = static_cast<std::size_t>(o.decision.deciding_condition);
  const highlimit::Condition& c = o.strategy.conditions[i];
  const highlimit::ConditionResult& r = o.decision.results[i];
  return fmt::format("{} over limit by {}", highlimit::quantity_name(c.quantity),
                     view.q(highlimit::quantity_difference_kind(c.quantity), r.excess));
}

// --- text and Markdown ---------------------------------------------------------------

std::string summary_lines(const PointCheckContext& in, const PointCheck& pc, const View& view,
                          bool markdown) {
  const UnitFile& u = *in.unit;
  const airside::AirHandler& a = u.air_handler;
  std::string pressure = fmt::format("{}", view.q(Kind::pressure, pc.pressure_kpa));
  if (u.site.pressure_kpa)
    pressure += " (site pressure)";
  else if (u.site.elevation_m)
    pressure +=
        fmt::format(" (standard pressure at {})", view.q(Kind::length, *u.site.elevation_m));
  else
    pressure += " (sea level: the unit file gives no elevation or pressure)";
  std::string min_oa = view.q(Kind::fraction, a.min_oa_fraction);
  if (u.min_outdoor_airflow_m3_per_s)
    min_oa += fmt::format(" ({})", view.q(Kind::airflow, *u.min_outdoor_airflow_m3_per_s));
  const std::vector<std::pair<std::string, std::string>> lines = {
      {"Unit", u.site.name.empty() ? u.path : fmt::format("{} ({})", u.site.name, u.path)},
      {"Pressure", pressure},
      {"Air handler",
       fmt::format("{} supply at {}; fan heat {}, {}; outdoor air {} to {}; {} economizer",
                   view.q(Kind::airflow, a.supply_airflow_m3_per_s),
                   view.q(Kind::temperature, a.supply_air_temp_c),
                   view.q(Kind::temperature_difference, a.fan_heat_k),
                   airside::fan_position_name(a.fan_position), min_oa,
                   view.q(Kind::fraction, a.max_oa_fraction),
                   airside::economizer_name(a.economizer))},
      {"Targets", fmt::format("mixed air {}; coil leaving {} at most {} RH",
                              view.q(Kind::temperature, pc.mixed_air_target_c),
                              view.q(Kind::temperature, a.coil_leaving_temp_c()),
                              view.q(Kind::fraction, a.coil_leaving_rh_max))},
  };
  std::string out;
  std::vector<std::pair<std::string, std::string>> all = lines;
  // The point is checked at the design state whatever the annual model: say so when the
  // unit's annual figures come from a part-load model, so the two are not confused.
  if (u.space || u.control.reset)
    all.emplace_back("Basis",
                     "the design point (design airflow, supply setpoint and return air); the "
                     "annual commands price each hour with the unit's part-load model");
  for (const auto& [k, v] : all)
    out += markdown ? fmt::format("- **{}:** {}\n", k, markdown_escape(v))
                    : fmt::format("{:<12} {}\n", k, v);
  for (const std::string& w : in.warnings)
    out += markdown ? fmt::format("- **Warning:** {}\n", markdown_escape(w))
                    : fmt::format("{:<12} {}\n", "Warning", w);
  return out;
}

Table air_table(const PointCheckContext& in, const PointCheck& pc, const View& view) {
  Table t({{"air", Align::left},
           {"from", Align::left},
           {"dry-bulb"},
           {"wet-bulb"},
           {"dew point"},
           {"RH"},
           {"humidity ratio"},
           {"enthalpy"}});
  auto row = [&](std::string name, const std::string& from, const psychro::Properties& p) {
    t.add_row({std::move(name), from, view.q(Kind::temperature, p.dry_bulb_c),
               view.q(Kind::temperature, p.wet_bulb_c), view.q(Kind::temperature, p.dew_point_c),
               view.q(Kind::fraction, p.relative_humidity),
               view.q(Kind::humidity_ratio, p.humidity_ratio),
               view.q(Kind::enthalpy, p.enthalpy_kj_per_kg)});
  };
  row("outdoor", in.outdoor_source, pc.outdoor);
  row("return", in.return_source, pc.ret);
  return t;
}

std::string hand_calculation(const UnitFile& u, const PointCheck& pc, const View& view) {
  const airside::MixedAirEstimate& e = pc.estimate;
  const airside::AirHandler& a = u.air_handler;
  const std::string target = view.q(Kind::temperature, pc.mixed_air_target_c);
  std::string out;
  switch (pc.reach) {
    case TargetReach::same_dry_bulb:
      out += fmt::format(
          "Mixed air of {} is not reachable: outdoor and return air are at the "
          "same dry-bulb, so no outdoor-air fraction changes the mixed air.\n",
          target);
      break;
    case TargetReach::beyond_outdoor_air:
      out += fmt::format(
          "Mixed air of {} is not reachable: would need {} outdoor air (all "
          "outdoor air, 100%, gives {}).\n",
          target, view.q(Kind::fraction, e.fraction_needed),
          view.q(Kind::temperature, pc.outdoor.dry_bulb_c));
      break;
    case TargetReach::beyond_return_air:
      out += fmt::format(
          "Mixed air of {} is not reachable: it lies beyond the return air {} "
          "on the side away from the outdoor air {}, so outdoor air only moves "
          "the mixed air away from it.\n",
          target, view.q(Kind::temperature, pc.ret.dry_bulb_c),
          view.q(Kind::temperature, pc.outdoor.dry_bulb_c));
      break;
    case TargetReach::reachable: {
      const std::string where =
          e.within_limits ? fmt::format("within the damper range {} to {}",
                                        view.q(Kind::fraction, a.min_oa_fraction),
                                        view.q(Kind::fraction, a.max_oa_fraction))
          : e.fraction_needed < a.min_oa_fraction
              ? fmt::format("below the {} minimum", view.q(Kind::fraction, a.min_oa_fraction))
              : fmt::format("above the {} maximum", view.q(Kind::fraction, a.max_oa_fraction));
      out += fmt::format("Outdoor air needed for {} mixed air: {}, {}.\n", target,
                         view.q(Kind::fraction, e.fraction_needed), where);
      break;
    }
  }
  const std::string at = fmt::format("At {} outdoor air the mixed air is {}",
                                     view.q(Kind::fraction, e.fraction_applied),
                                     view.q(Kind::temperature, e.mixed.dry_bulb_c));
  switch (e.makeup) {
    case airside::Makeup::none: out += at + ": on target, no make-up.\n"; break;
    case airside::Makeup::heating:
      out += fmt::format("{}: heating makes up {} ({}, {}).\n", at,
                         view.q(Kind::temperature_difference, e.makeup_k),
                         view.q(Kind::enthalpy_difference, pc.estimate_loads.heating_kj_per_kg),
                         view.q(Kind::power, pc.kw(pc.estimate_loads.heating_kj_per_kg)));
      break;
    case airside::Makeup::cooling:
      out += fmt::format("{}: cooling makes up {} ({}, {}).\n", at,
                         view.q(Kind::temperature_difference, e.makeup_k),
                         view.q(Kind::enthalpy_difference, pc.estimate_loads.cooling_kj_per_kg),
                         view.q(Kind::power, pc.kw(pc.estimate_loads.cooling_kj_per_kg)));
      break;
  }
  return out;
}

Table operations_table(const UnitFile& u, const PointCheck& pc, const View& view) {
  Table t({{"operation", Align::left},
           {"basis", Align::left},
           {"outdoor air"},
           {"mixed air"},
           {"coil cooling"},
           {"sensible"},
           {"latent"},
           {"heating"},
           {"weighted energy"}});
  const std::string airflow =
      fmt::format("at {}", view.q(Kind::airflow, u.air_handler.supply_airflow_m3_per_s));
  auto add = [&](const std::string& name, const airside::Operation& op) {
    const airside::CoilLoads& l = op.loads;
    t.add_row({name, view.per_mass_label(), view.q(Kind::fraction, op.oa_fraction),
               view.q(Kind::temperature, op.mixed.dry_bulb_c),
               view.q(Kind::enthalpy_difference, l.cooling_kj_per_kg),
               view.q(Kind::enthalpy_difference, l.sensible_kj_per_kg),
               view.q(Kind::enthalpy_difference, l.latent_kj_per_kg),
               view.q(Kind::enthalpy_difference, l.heating_kj_per_kg),
               view.q(Kind::enthalpy_difference, op.weighted_kj_per_kg)});
    t.add_row({"", airflow, "", "", view.q(Kind::power, pc.kw(l.cooling_kj_per_kg)),
               view.q(Kind::power, pc.kw(l.sensible_kj_per_kg)),
               view.q(Kind::power, pc.kw(l.latent_kj_per_kg)),
               view.q(Kind::power, pc.kw(l.heating_kj_per_kg)),
               view.q(Kind::power, pc.kw(op.weighted_kj_per_kg))});
  };
  add("economizer disabled", pc.choice.disabled);
  add("economizer enabled", pc.choice.enabled);
  add("optimal damper", pc.optimal);
  return t;
}

std::string per_hour_note(const View& view) {
  return fmt::format(
      "Loads at the supply airflow; \"above ideal\" is the weighted energy per "
      "hour beyond the perfect changeover ({} per hour).\n",
      units::unit_label(Kind::energy, view.system));
}

std::string changeover_line(const PointCheck& pc, const View& view) {
  if (!pc.choice.cooling_needed)
    return "Perfect changeover: no cooling is needed at the minimum outdoor air, so the "
           "high-limit decision changes nothing.\n";
  const double diff = pc.choice.disabled.weighted_kj_per_kg - pc.choice.enabled.weighted_kj_per_kg;
  const std::string per_hour = view.q(Kind::energy, pc.kw(std::fabs(diff)));
  if (pc.choice.enabling_pays(kVerdictToleranceKjPerKg))
    return fmt::format("Perfect changeover: enable; it saves {} per hour over disabling.\n",
                       per_hour);
  if (pc.choice.enabling_hurts(kVerdictToleranceKjPerKg))
    return fmt::format("Perfect changeover: disable; enabling would cost {} more per hour.\n",
                       per_hour);
  return "Perfect changeover: either; enabled and disabled cost the same this hour.\n";
}

Table strategy_table(const PointCheck& pc, const View& view) {
  Table t({{"strategy", Align::left},
           {"economizer", Align::left},
           {"why", Align::left},
           {view.title("OA", Kind::fraction)},
           {view.title("mixed", Kind::temperature)},
           {view.title("cooling", Kind::power)},
           {"sensible"},
           {"latent"},
           {"heating"},
           {"verdict", Align::left},
           {view.title("above ideal", Kind::energy)}});
  for (const StrategyOutcome& o : pc.outcomes) {
    const airside::CoilLoads& l = o.operation.loads;
    t.add_row({o.strategy.name, o.decision.enabled ? "enabled" : "disabled", why(o, view),
               view.n(Kind::fraction, o.operation.oa_fraction),
               view.n(Kind::temperature, o.operation.mixed.dry_bulb_c),
               view.n(Kind::power, pc.kw(l.cooling_kj_per_kg)),
               view.n(Kind::power, pc.kw(l.sensible_kj_per_kg)),
               view.n(Kind::power, pc.kw(l.latent_kj_per_kg)),
               view.n(Kind::power, pc.kw(l.heating_kj_per_kg)),
               std::string(verdict_name(o.verdict)),
               view.n(Kind::energy, pc.kw(o.excess_kj_per_kg))});
  }
  return t;
}

Table condition_table(const PointCheck& pc, const View& view) {
  Table t({{"strategy", Align::left},
           {"condition: off when outdoor", Align::left},
           {"outdoor"},
           {"limit"},
           {"excess"},
           {"status", Align::left}});
  for (const StrategyOutcome& o : pc.outcomes) {
    for (std::size_t i = 0; i < o.strategy.conditions.size(); ++i) {
      const highlimit::Condition& c = o.strategy.conditions[i];
      const highlimit::ConditionResult& r = o.decision.results[i];
      const Kind value = highlimit::quantity_kind(c.quantity);
      std::string status(status_name(r.status));
      if (static_cast<int>(i) == o.decision.deciding_condition) status += " (decides)";
      t.add_row({i == 0 ? o.strategy.name : "", describe(c, view), view.q(value, r.outdoor),
                 view.q(value, r.limit),
                 view.q(highlimit::quantity_difference_kind(c.quantity), r.excess), status});
    }
  }
  return t;
}

std::string text_report(const PointCheckContext& in, const PointCheck& pc, const View& view,
                        bool md) {
  auto table = [md, &in](const Table& t) { return md ? t.markdown() : t.text(in.text_width); };
  auto heading = [md](std::string_view h) {
    return md ? fmt::format("\n## {}\n\n", h) : fmt::format("\n{}\n", h);
  };
  std::string out = md ? "# Economizer high-limit check\n\n" : "";
  out += summary_lines(in, pc, view, md);
  out += heading("Air the decisions are made on");
  out += table(air_table(in, pc, view));
  out += heading("Hand calculation");
  out += hand_calculation(*in.unit, pc, view);
  out += heading("Economizer disabled and enabled");
  out += table(operations_table(*in.unit, pc, view));
  out += (md ? "\n" : "") + changeover_line(pc, view);
  out += heading(in.unit->strategies_defaulted
                     ? "Strategies (every preset at its defaults, the [site] code's where it "
                       "gives them: the unit file gives none)"
                     : "Strategies");
  out += table(strategy_table(pc, view));
  out += (md ? "\n" : "") + per_hour_note(view);
  out += heading("Conditions");
  out += table(condition_table(pc, view));
  out += "\n";
  out += md ? cautions_markdown(CautionTopic::design) : cautions_text(CautionTopic::design);
  return out;
}

// --- JSON ----------------------------------------------------------------------------

void json_state(Json& j, const airside::AirState& s, const View& view) {
  j.begin_object();
  j.field(view.key("dry_bulb", Kind::temperature), view.v(Kind::temperature, s.dry_bulb_c));
  j.field(view.key("humidity_ratio", Kind::humidity_ratio), s.humidity_ratio);
  j.field(view.key("enthalpy", Kind::enthalpy), view.v(Kind::enthalpy, s.enthalpy_kj_per_kg));
  j.end_object();
}

void json_load(Json& j, const PointCheck& pc, std::string_view stem, double kj_per_kg,
               const View& view) {
  j.field(view.per_mass_key(stem), view.v(Kind::enthalpy_difference, kj_per_kg));
  j.field(view.key(stem, Kind::power), view.v(Kind::power, pc.kw(kj_per_kg)));
}

void json_loads(Json& j, const PointCheck& pc, const airside::CoilLoads& l, const View& view) {
  json_load(j, pc, "cooling", l.cooling_kj_per_kg, view);
  json_load(j, pc, "sensible_cooling", l.sensible_kj_per_kg, view);
  json_load(j, pc, "latent_cooling", l.latent_kj_per_kg, view);
  json_load(j, pc, "heating", l.heating_kj_per_kg, view);
}

void json_operation(Json& j, const PointCheck& pc, const airside::Operation& op, const View& view) {
  j.begin_object();
  j.field(view.key("outdoor_air", Kind::fraction), view.v(Kind::fraction, op.oa_fraction));
  j.field("economizing", op.economizing);
  j.field("mechanical_cooling", op.mechanical_cooling);
  j.key("mixed_air");
  json_state(j, op.mixed, view);
  j.key("coil_entering");
  json_state(j, op.loads.entering, view);
  j.key("coil_leaving");
  json_state(j, op.loads.leaving, view);
  json_loads(j, pc, op.loads, view);
  json_load(j, pc, "weighted_energy", op.weighted_kj_per_kg, view);
  j.end_object();
}

void json_properties(Json& j, const psychro::Properties& p, const std::string& from,
                     const View& view) {
  j.begin_object();
  j.field("from", from);
  for (const auto& f : property_fields())
    j.field(property_key(f, view.system), property_value(f, p, view.system));
  j.end_object();
}

std::string json_report(const PointCheckContext& in, const PointCheck& pc, const View& view) {
  const UnitFile& u = *in.unit;
  const airside::AirHandler& a = u.air_handler;
  Json j;
  j.begin_object();
  j.field("unit_file", u.path);
  j.field("site_name", u.site.name);
  j.field("units", units::system_name(view.system));
  j.key("warnings").begin_array();
  for (const std::string& w : in.warnings) j.value(w);
  j.end_array();
  j.field(view.key("pressure", Kind::pressure), view.v(Kind::pressure, pc.pressure_kpa));
  j.key("air_handler").begin_object();
  j.field(view.key("supply_airflow", Kind::airflow),
          view.v(Kind::airflow, a.supply_airflow_m3_per_s));
  j.field("dry_air_mass_flow_kg_per_s", pc.dry_air_kg_per_s);
  j.field(view.key("supply_air_temp", Kind::temperature),
          view.v(Kind::temperature, a.supply_air_temp_c));
  j.field(view.key("fan_heat", Kind::temperature_difference),
          view.v(Kind::temperature_difference, a.fan_heat_k));
  j.field("fan_position", airside::fan_position_name(a.fan_position));
  j.field(view.key("min_outdoor_air", Kind::fraction), view.v(Kind::fraction, a.min_oa_fraction));
  j.field(view.key("max_outdoor_air", Kind::fraction), view.v(Kind::fraction, a.max_oa_fraction));
  j.field("economizer", airside::economizer_name(a.economizer));
  j.field(view.key("mixed_air_target", Kind::temperature),
          view.v(Kind::temperature, pc.mixed_air_target_c));
  j.field(view.key("coil_leaving", Kind::temperature),
          view.v(Kind::temperature, a.coil_leaving_temp_c()));
  j.field(view.key("coil_leaving_rh_max", Kind::fraction),
          view.v(Kind::fraction, a.coil_leaving_rh_max));
  j.end_object();
  j.key("outdoor");
  json_properties(j, pc.outdoor, in.outdoor_source, view);
  j.key("return");
  json_properties(j, pc.ret, in.return_source, view);

  const airside::MixedAirEstimate& e = pc.estimate;
  j.key("hand_calculation").begin_object();
  // The fraction the target needs is given whenever one exists, even outside 0–100 %, with
  // target_reachable saying whether any damper position gives it.
  j.field("target_reachable", pc.reach == TargetReach::reachable);
  j.field("reach", target_reach_key(pc.reach));
  j.key(view.key("outdoor_air_needed", Kind::fraction));
  if (e.target_reachable)
    j.value(view.v(Kind::fraction, e.fraction_needed));
  else
    j.null();
  j.field("within_limits", e.within_limits);
  j.field(view.key("outdoor_air_applied", Kind::fraction),
          view.v(Kind::fraction, e.fraction_applied));
  j.key("mixed_air");
  json_state(j, e.mixed, view);
  j.field("makeup", e.makeup == airside::Makeup::none      ? "none"
                    : e.makeup == airside::Makeup::heating ? "heating"
                                                           : "cooling");
  j.field(view.key("makeup", Kind::temperature_difference),
          view.v(Kind::temperature_difference, e.makeup_k));
  json_loads(j, pc, pc.estimate_loads, view);
  j.end_object();

  j.field("cooling_needed", pc.choice.cooling_needed);
  j.key("economizer_disabled");
  json_operation(j, pc, pc.choice.disabled, view);
  j.key("economizer_enabled");
  json_operation(j, pc, pc.choice.enabled, view);
  j.key("optimal_damper");
  json_operation(j, pc, pc.optimal, view);
  j.key("perfect_changeover").begin_object();
  j.field("enables", pc.changeover_enables);
  json_load(j, pc, "weighted_energy", pc.changeover_kj_per_kg, view);
  j.end_object();
  j.field(view.per_mass_key("verdict_tolerance"),
          view.v(Kind::enthalpy_difference, kVerdictToleranceKjPerKg));
  j.field("strategies_defaulted", u.strategies_defaulted);

  j.key("strategies").begin_array();
  for (const StrategyOutcome& o : pc.outcomes) {
    j.begin_object();
    j.field("name", o.strategy.name);
    j.field("preset", o.strategy.preset);
    j.field("economizer_enabled", o.decision.enabled);
    j.key("deciding_condition");
    if (o.decision.deciding_condition >= 0)
      j.value(o.decision.deciding_condition);
    else
      j.null();
    j.key("conditions").begin_array();
    for (std::size_t i = 0; i < o.strategy.conditions.size(); ++i) {
      const highlimit::Condition& c = o.strategy.conditions[i];
      const highlimit::ConditionResult& r = o.decision.results[i];
      const Kind value = highlimit::quantity_kind(c.quantity);
      const Kind diff = highlimit::quantity_difference_kind(c.quantity);
      j.begin_object();
      j.field("quantity", highlimit::quantity_name(c.quantity));
      j.field("reference", highlimit::reference_name(c.reference));
      if (c.reference == Reference::fixed)
        j.field(view.key("limit_setting", value), view.v(value, c.limit));
      else
        j.field(view.key("offset", diff), view.v(diff, c.limit));
      j.field(view.key("deadband", diff), view.v(diff, c.deadband));
      j.field(view.key("outdoor", value), view.v(value, r.outdoor));
      j.field(view.key("limit", value), view.v(value, r.limit));
      j.field(view.key("excess", diff), view.v(diff, r.excess));
      j.field("status", status_name(r.status));
      j.end_object();
    }
    j.end_array();
    j.key("operation");
    json_operation(j, pc, o.operation, view);
    j.field("verdict", verdict_key(o.verdict));
    j.field(view.per_mass_key("excess_energy"),
            view.v(Kind::enthalpy_difference, o.excess_kj_per_kg));
    j.field(view.key("excess_energy_per_hour", Kind::energy),
            view.v(Kind::energy, pc.kw(o.excess_kj_per_kg)));
    j.end_object();
  }
  j.end_array();
  j.key("cautions").begin_array();
  for (const std::string& c : cautions(CautionTopic::design)) j.value(c);
  j.end_array();
  j.end_object();
  return j.str();
}

}  // namespace

std::string point_check_text(const PointCheck& pc, const PointCheckContext& c) {
  return text_report(c, pc, View{c.units}, false);
}

std::string point_check_markdown(const PointCheck& pc, const PointCheckContext& c) {
  return text_report(c, pc, View{c.units}, true);
}

std::string point_check_json(const PointCheck& pc, const PointCheckContext& c) {
  return json_report(c, pc, View{c.units});
}

}  // namespace limitline::report
