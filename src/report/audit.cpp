#include <limitline/report/audit.hpp>

#include <limitline/report/cautions.hpp>
#include <limitline/report/json.hpp>
#include <limitline/report/strategy.hpp>
#include <limitline/report/table.hpp>
#include <limitline/report/year.hpp>

#include <fmt/format.h>

#include <cmath>

namespace limitline::report {
namespace {

using audit::FindingKind;

// The kind of a finding's "worst by" figure.
std::string worst_text(const audit::Finding& f, const audit::Result& r, units::System s) {
  switch (f.kind) {
    case FindingKind::mixed_air_out_of_range:
    case FindingKind::cooling_with_free_air:
    case FindingKind::supply_off_setpoint:
    case FindingKind::fan_heat_mismatch:
      return units::format(units::Kind::temperature_difference, s, f.worst_excess, 1);
    case FindingKind::high_limit_elsewhere:
      for (const auto& sp : r.switch_points)
        if (sp.differs) return format_difference(sp.quantity, f.worst_excess, s);
      return "-";
    default: return fmt::format("{:.0f} % points", f.worst_excess * 100.0);
  }
}

std::string energy_cell(const audit::Finding& f, units::System s) {
  if (!f.energy_kwh) return "not estimated";
  return fmt::format("{:+.0f}", energy_display(*f.energy_kwh, s));
}

std::string hours(double h) { return fmt::format("{:.1f}", h); }

std::string percent(double x) { return fmt::format("{:.1f} %", x * 100.0); }

std::string condition_label(const audit::SwitchPoint& sp) {
  return fmt::format("{} {}{}", sp.condition + 1, highlimit::quantity_name(sp.quantity),
                     sp.reference == highlimit::Reference::return_air ? " − return" : "");
}

std::string value_text(const audit::SwitchPoint& sp, double v, units::System s) {
  return sp.reference == highlimit::Reference::return_air ? format_difference(sp.quantity, v, s)
                                                          : format_value(sp.quantity, v, s);
}

std::string clock_text(const AuditContext& ctx) {
  return ctx.log_clock.empty()
             ? std::string("not stated; stamps are used as logged")
             : fmt::format(
                   "{} as stated; stamps are used as logged (the audit aligns with no "
                   "weather), a stamp written with its own offset is read as UTC",
                   ctx.log_clock);
}

std::vector<std::string> coverage_lines(const audit::Result& r, const trend::TrendLog& log,
                                        const AuditContext& ctx) {
  const auto& c = log.coverage;
  std::vector<std::string> out;
  out.push_back(fmt::format("log: {} ({} samples, {} to {})", log.path, c.rows,
                            trend::format_timestamp(c.first_s), trend::format_timestamp(c.last_s)));
  out.push_back("log clock: " + clock_text(ctx));
  out.push_back(fmt::format("median interval {:.1f} min; a sample counts for at most {:.1f} min",
                            c.median_interval_s / 60.0, c.max_gap_s / 60.0));
  out.push_back(
      fmt::format("covered {:.1f} h of a {:.1f} h span ({}); {} gap(s) longer than the cap",
                  c.covered_s / 3600.0, c.span_s / 3600.0,
                  percent(c.span_s > 0 ? c.covered_s / c.span_s : 0.0), c.gaps.size()));
  if (c.duplicate_rows > 0)
    out.push_back(fmt::format("{} exact duplicate row(s) dropped", c.duplicate_rows));
  out.push_back(
      fmt::format("fan on {:.1f} h ({} samples); outdoor-air fraction measurable in {} of them",
                  r.operating_hours, r.operating_intervals, r.fraction_intervals));
  return out;
}

std::vector<std::string> gap_lines(const trend::TrendLog& log) {
  std::vector<std::string> out;
  const auto& g = log.coverage.gaps;
  const std::size_t shown = std::min<std::size_t>(g.size(), 10);
  for (std::size_t i = 0; i < shown; ++i)
    out.push_back(fmt::format("{} to {} ({:.1f} h)", trend::format_timestamp(g[i].from_s),
                              trend::format_timestamp(g[i].to_s),
                              (g[i].to_s - g[i].from_s) / 3600.0));
  if (g.size() > shown) out.push_back(fmt::format("and {} more", g.size() - shown));
  return out;
}

Table mapping_table(const trend::TrendLog& log) {
  Table t({{"quantity", Align::left},
           {"column", Align::left},
           {"unit", Align::left},
           {"how", Align::left}});
  for (const auto& u : log.columns)
    t.add_row({std::string(trend::channel_name(u.channel)), u.header, u.unit,
               u.overridden ? "set by the user" : (u.note.empty() ? "from the header" : u.note)});
  return t;
}

Table findings_table(const audit::Result& r, units::System s) {
  Table t({{"finding", Align::left},
           {"hours", Align::right},
           {"of fan-on", Align::right},
           {"first", Align::left},
           {"worst", Align::left},
           {"worst by", Align::right},
           {"energy " + std::string(energy_unit(s)), Align::right}});
  for (const auto& f : r.findings)
    t.add_row({std::string(audit::finding_title(f.kind)), hours(f.hours),
               percent(f.share_of_operating), trend::format_timestamp(f.first_s),
               trend::format_timestamp(f.worst_s), worst_text(f, r, s), energy_cell(f, s)});
  return t;
}

Table switch_table(const audit::Result& r, units::System s) {
  Table t({{"condition", Align::left},
           {"configured", Align::right},
           {"deadband", Align::right},
           {"open up to", Align::right},
           {"closed from", Align::right},
           {"estimate", Align::right},
           {"uncertainty", Align::right},
           {"samples open/closed", Align::right},
           {"verdict", Align::left}});
  for (const auto& sp : r.switch_points)
    t.add_row({condition_label(sp), value_text(sp, sp.configured, s),
               format_difference(sp.quantity, sp.deadband, s), value_text(sp, sp.highest_open, s),
               value_text(sp, sp.lowest_closed, s), value_text(sp, sp.estimate, s),
               "±" + format_difference(sp.quantity, sp.tolerance, s),
               fmt::format("{}/{}", sp.open_samples, sp.closed_samples),
               sp.differs ? "differs from the configured limit"
                          : "consistent with the configured limit"});
  return t;
}

std::vector<std::string> rule_lines(const AuditContext& c) {
  std::vector<std::string> out;
  const auto& a = c.accuracy;
  const auto dt = [&](double k) {
    return units::format(units::Kind::temperature_difference, c.units, k, 2);
  };
  out.push_back(fmt::format(
      "sensor accuracy (one standard uncertainty): outdoor {}, return {}, mixed {}, supply {}",
      dt(a.outdoor_k), dt(a.return_k), dt(a.mixed_k), dt(a.supply_k)));
  out.push_back(fmt::format(
      "significance: a finding needs more than {} sample(s) and more than {:.2f} h; the damper "
      "is judged against the high-limit only where every condition's value is farther than "
      "{:.0f} × the root-sum-square of its sensors' accuracies from both edges of its band, so "
      "a sample at the limit is no finding; a switching point differs only beyond the same "
      "uncertainty and the deadband",
      c.significance.min_samples, c.significance.min_hours, audit::kCoverageFactor));
  out.push_back(
      fmt::format("supply-air tolerance {} (plus 3σ_supply) around the unit's supply setpoint "
                  "(air_handler.supply_air_temp; a reset schedule is not followed)",
                  dt(c.supply_tolerance_k)));
  out.push_back(fmt::format(
      "measured fraction x = (t_mix − t_ret)/(t_out − t_ret), used where |t_out − t_ret| ≥ {:.0f} "
      "× "
      "√(σ_out² + σ_ret² + σ_mix²) = {}; σ_x² = (σ_mix² + x²σ_out² + (1 − x)²σ_ret²)/(t_out − "
      "t_ret)²",
      audit::kFractionGateFactor,
      units::format(
          units::Kind::temperature_difference, c.units,
          audit::kFractionGateFactor * std::sqrt(a.outdoor_k * a.outdoor_k +
                                                 a.return_k * a.return_k + a.mixed_k * a.mixed_k),
          2)));
  for (std::size_t k = 0; k < audit::kFindingKindCount; ++k) {
    const auto kind = static_cast<FindingKind>(k);
    out.push_back(fmt::format("{}: {}", audit::finding_key(kind), audit::finding_rule(kind)));
  }
  out.push_back(
      "energy: the model's weighted coil energy at the observed fraction minus that of "
      "the expected operation, at the unit's supply airflow, for each interval (positive: what the "
      "log shows cost more than what the strategy expects)");
  return out;
}

// What the code's fault-detection clause requires and which of it this log can show.
std::vector<std::string> fault_lines(const AuditContext& c) {
  std::vector<std::string> out;
  if (c.fault_code.empty()) {
    out.push_back(c.fault_code_note);
    return out;
  }
  out.push_back(
      fmt::format("required by {} (recalled from memory; the adopted edition governs); "
                  "the code's terms in quotes:",
                  c.fault_code));
  for (const auto& e : c.fault_evidence) {
    std::string line = fmt::format("\"{}\" [{}]: ", e.code_term, codes::fault_name(e.fault));
    const auto titles = [](const std::vector<audit::FindingKind>& ks) {
      std::string t;
      for (auto k : ks) t += (t.empty() ? "" : "; ") + std::string(audit::finding_title(k));
      return t;
    };
    if (e.can_show()) {
      line += "this log can show it (" + titles(e.judged) + ")";
      line += e.found.empty() ? "; not found in this log" : "; found: " + titles(e.found);
    } else {
      std::string needs;
      for (auto k : e.not_judged) needs += (needs.empty() ? "" : "; or ") + audit::needs_text(k);
      line += "this log cannot show it; it needs " + needs +
              " (check it by a functional test or the controller's own fault report)";
    }
    out.push_back(line);
  }
  return out;
}

}  // namespace

std::string audit_text(const audit::Result& r, const trend::TrendLog& log, const AuditContext& c) {
  std::string out = fmt::format("limitline audit — {} against {}\n\n", log.path, c.unit_path);
  out +=
      fmt::format("strategy: {} ({}), {}\n", r.strategy_name, c.strategy_source, c.strategy_text);
  for (const auto& l : coverage_lines(r, log, c)) out += l + "\n";
  if (const auto g = gap_lines(log); !g.empty()) {
    out += "gaps:\n";
    for (const auto& l : g) out += "  " + l + "\n";
  }
  out += "\nColumns used:\n" + mapping_table(log).text(c.text_width);
  if (r.findings.empty())
    out += "\nFindings: none; the log agrees with the strategy and the model.\n";
  else
    out += "\nFindings:\n" + findings_table(r, c.units).text(c.text_width);
  if (!r.switch_points.empty())
    out += "\nSwitching points seen in the log:\n" + switch_table(r, c.units).text(c.text_width);
  out += "\nFault detection the code requires:\n";
  for (const auto& l : fault_lines(c)) out += "  - " + l + "\n";
  out += "\nRules:\n";
  for (const auto& l : rule_lines(c)) out += "  - " + l + "\n";
  if (!r.notes.empty()) {
    out += "\nNotes:\n";
    for (const auto& n : r.notes) out += "  - " + n + "\n";
  }
  out += "\n" + cautions_text(CautionTopic::audit);
  return out;
}

std::string audit_markdown(const audit::Result& r, const trend::TrendLog& log,
                           const AuditContext& c) {
  // Names and lines from the user's files are escaped, so none reads as markup.
  const auto md = markdown_escape;
  std::string out = fmt::format("# Economizer trend audit: {}\n\n", md(log.path));
  out += fmt::format("Unit file {}; strategy **{}** ({}): {}.\n\n", md(c.unit_path),
                     md(r.strategy_name), md(c.strategy_source), md(c.strategy_text));
  out += "## Coverage\n\n";
  for (const auto& l : coverage_lines(r, log, c)) out += "- " + md(l) + "\n";
  for (const auto& l : gap_lines(log)) out += "- gap: " + md(l) + "\n";
  out += "\n## Columns used\n\n" + mapping_table(log).markdown();
  out += "\n## Findings\n\n";
  out += r.findings.empty() ? std::string("None: the log agrees with the strategy and the model.\n")
                            : findings_table(r, c.units).markdown();
  if (!r.switch_points.empty())
    out += "\n## Switching points seen in the log\n\n" + switch_table(r, c.units).markdown();
  out += "\n## Fault detection the code requires\n\n";
  for (const auto& l : fault_lines(c)) out += "- " + md(l) + "\n";
  out += "\n## Rules\n\n";
  for (const auto& l : rule_lines(c)) out += "- " + md(l) + "\n";
  if (!r.notes.empty()) {
    out += "\n## Notes\n\n";
    for (const auto& n : r.notes) out += "- " + md(n) + "\n";
  }
  out += "\n## Cautions\n\n" + cautions_markdown(CautionTopic::audit);
  return out;
}

std::string audit_json(const audit::Result& r, const trend::TrendLog& log, const AuditContext& c) {
  const auto s = c.units;
  const std::string eu = s == units::System::ip ? "energy_kbtu" : "energy_kwh";
  Json j;
  j.begin_object();
  j.field("unit_file", c.unit_path).field("trend_log", log.path);
  j.field("units", units::system_name(s)).field("log_clock", c.log_clock);
  j.key("strategy")
      .begin_object()
      .field("name", r.strategy_name)
      .field("source", c.strategy_source)
      .field("text", c.strategy_text)
      .end_object();
  const auto& cov = log.coverage;
  j.key("coverage")
      .begin_object()
      .field("first", trend::format_timestamp(cov.first_s))
      .field("last", trend::format_timestamp(cov.last_s))
      .field("samples", cov.rows)
      .field("duplicate_rows_dropped", cov.duplicate_rows)
      .field("median_interval_min", cov.median_interval_s / 60.0, 6)
      .field("max_gap_min", cov.max_gap_s / 60.0, 6)
      .field("span_h", cov.span_s / 3600.0, 6)
      .field("covered_h", cov.covered_s / 3600.0, 6)
      .field("fan_on_h", r.operating_hours, 6)
      .field("fan_on_samples", r.operating_intervals)
      .field("fraction_samples", r.fraction_intervals);
  j.key("gaps").begin_array();
  for (const auto& g : cov.gaps)
    j.begin_object()
        .field("from", trend::format_timestamp(g.from_s))
        .field("to", trend::format_timestamp(g.to_s))
        .end_object();
  j.end_array().end_object();
  j.key("columns").begin_array();
  for (const auto& u : log.columns)
    j.begin_object()
        .field("quantity", trend::channel_name(u.channel))
        .field("header", u.header)
        .field("unit", u.unit)
        .field("overridden", u.overridden)
        .field("note", u.note)
        .end_object();
  j.end_array();
  j.key("findings").begin_array();
  for (const auto& f : r.findings) {
    j.begin_object()
        .field("kind", audit::finding_key(f.kind))
        .field("title", audit::finding_title(f.kind))
        .field("intervals", f.intervals)
        .field("hours", f.hours, 6)
        .field("share_of_fan_on", f.share_of_operating, 6)
        .field("first", trend::format_timestamp(f.first_s))
        .field("first_line", f.first_line)
        .field("last", trend::format_timestamp(f.last_s))
        .field("worst", trend::format_timestamp(f.worst_s))
        .field("worst_line", f.worst_line)
        .field("worst_by", worst_text(f, r, s));
    j.key(eu);
    if (f.energy_kwh)
      j.value(energy_display(*f.energy_kwh, s), 6);
    else
      j.null();
    j.end_object();
  }
  j.end_array();
  j.key("switching_points").begin_array();
  for (const auto& sp : r.switch_points) {
    j.begin_object()
        .field("condition", sp.condition + 1)
        .field("quantity", highlimit::quantity_name(sp.quantity))
        .field("reference", highlimit::reference_name(sp.reference));
    // Numbers with the unit in the key (docs/model.md §Units and datums): values of the
    // quantity for a fixed limit, differences for an offset from the return air.
    const units::Kind kind = sp.reference == highlimit::Reference::return_air
                                 ? difference_kind(sp.quantity)
                                 : value_kind(sp.quantity);
    const std::string suffix(units::key_suffix(kind, s));
    for (auto [name, v] :
         {std::pair{"configured", sp.configured}, std::pair{"estimate", sp.estimate},
          std::pair{"open_up_to", sp.highest_open}, std::pair{"closed_from", sp.lowest_closed}})
      j.field(std::string(name) + "_" + suffix, units::to_display(kind, s, v), 6);
    const std::string dsuffix(units::key_suffix(difference_kind(sp.quantity), s));
    j.field("deadband_" + dsuffix, units::to_display(difference_kind(sp.quantity), s, sp.deadband),
            6)
        .field("uncertainty_" + dsuffix,
               units::to_display(difference_kind(sp.quantity), s, sp.tolerance), 6)
        .field("open_samples", sp.open_samples)
        .field("closed_samples", sp.closed_samples)
        .field("differs", sp.differs)
        .field("verdict", sp.differs ? "differs from the configured limit"
                                     : "consistent with the configured limit")
        .end_object();
  }
  j.end_array();
  j.key("fault_detection");
  if (c.fault_code.empty()) {
    j.null();
  } else {
    j.begin_object().field("required_by", c.fault_code).key("faults").begin_array();
    for (const auto& e : c.fault_evidence) {
      j.begin_object()
          .field("fault", codes::fault_name(e.fault))
          .field("code_term", e.code_term)
          .field("log_can_show", e.can_show());
      for (const auto& [key, kinds] :
           {std::pair{"judged_by", &e.judged}, std::pair{"cannot_judge", &e.not_judged},
            std::pair{"found", &e.found}}) {
        j.key(key).begin_array();
        for (auto k : *kinds) j.value(audit::finding_key(k));
        j.end_array();
      }
      j.end_object();
    }
    j.end_array().end_object();
  }
  j.key("rules").begin_array();
  for (const auto& l : rule_lines(c)) j.value(l);
  j.end_array();
  j.key("notes").begin_array();
  for (const auto& n : r.notes) j.value(n);
  j.end_array();
  j.key("cautions").begin_array();
  for (const auto& n : cautions(CautionTopic::audit)) j.value(n);
  j.end_array();
  j.end_object();
  return j.str();
}

}  // namespace limitline::report
