// The reports of `limitline code`: one zone's requirements, a unit's verdicts, the matrix of
// every edition and the list of editions, in text, Markdown and JSON.
#include <limitline/report/code.hpp>

#include <limitline/model/psychro.hpp>
#include <limitline/report/cautions.hpp>
#include <limitline/report/json.hpp>
#include <limitline/report/table.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <map>

namespace limitline::report {
namespace {

using codes::AllowedControl;
using codes::Verdict;
using units::Kind;
using units::System;

// The rendering each public function asks for.
enum class Format { text, json, md };

// --- Pieces shared by the outputs -----------------------------------------------------------

// Footnotes numbered in order of first use.
class Notes {
 public:
  std::string refs(const codes::Row& row) {
    std::string out;
    for (const auto& f : row.footnotes) {
      auto it = std::find(notes_.begin(), notes_.end(), f);
      if (it == notes_.end()) it = notes_.insert(notes_.end(), f);
      out += fmt::format("{}[{}]", out.empty() ? "" : " ", it - notes_.begin() + 1);
    }
    return out;
  }
  const std::vector<std::string>& all() const { return notes_; }

 private:
  std::vector<std::string> notes_;
};

std::string_view compare_name(System s) { return s == System::ip ? "IP" : "SI"; }

std::string cite(const codes::Row& r) {
  return r.table.empty() ? r.clause : fmt::format("{}, {}", r.clause, r.table);
}

std::string pressure_text(std::optional<double> p, System s) {
  if (!p) return "sea level (the table's figures as printed)";
  return fmt::format(
      "{} (standard elevation {})", units::format(Kind::pressure, s, *p, s == System::ip ? 2 : 1),
      units::format(Kind::length, s, psychro::elevation_from_standard_pressure_m(*p), 0));
}

// The settings of an allowed type, with the altitude footnote shown where it applied.
std::string settings_text(const AllowedControl& c, System s) {
  if (!c.row->modelled) return c.row->description + " (not modelled by limitline)";
  std::vector<std::string> parts;
  for (const auto& r : c.settings) {
    std::string t = codes::setting_text({r.quantity, r.reference, r.value}, s);
    if (r.site_adjusted)
      t += fmt::format(
          " [altitude footnote; table {}]",
          units::format(codes::setting_kind(r.quantity, r.reference), s, r.tabulated, 1));
    parts.push_back(t);
  }
  std::string out;
  for (const auto& p : parts) out += (out.empty() ? "" : " or ") + p;
  return out;
}

// Distinct provenance strings with the controls that carry them.
std::vector<std::pair<std::string, std::vector<std::string>>> provenance_of(
    const std::vector<const codes::Row*>& rows) {
  std::vector<std::pair<std::string, std::vector<std::string>>> out;
  for (const auto* r : rows) {
    auto it = std::find_if(out.begin(), out.end(),
                           [&](const auto& p) { return p.first == r->provenance; });
    if (it == out.end()) it = out.insert(out.end(), {r->provenance, {}});
    if (std::find(it->second.begin(), it->second.end(), r->control) == it->second.end())
      it->second.push_back(r->control);
  }
  return out;
}

std::string heading(Format f, const std::string& title) {
  return f == Format::md ? "## " + title + "\n\n" : title + "\n";
}

std::string render(Format f, const Table& t, std::size_t width = kTextWidth) {
  return f == Format::md ? t.markdown() : t.text(width);
}

// "label: value" lines of a header block.
std::string facts(Format f, const std::vector<std::pair<std::string, std::string>>& items) {
  std::string out;
  std::size_t width = 0;
  for (const auto& [k, v] : items) width = std::max(width, k.size());
  for (const auto& [k, v] : items)
    out += f == Format::md ? fmt::format("- **{}**: {}\n", k, markdown_escape(v))
                           : fmt::format("{:<{}}  {}\n", k, width, v);
  return out;
}

std::string notes_text(Format f, const Notes& notes, const std::vector<const codes::Row*>& rows,
                       const codes::Edition& e) {
  std::string out;
  if (!notes.all().empty()) {
    out += "\n" + heading(f, "Notes");
    for (std::size_t i = 0; i < notes.all().size(); ++i)
      out += f == Format::md ? fmt::format("{}. {}\n", i + 1, notes.all()[i])
                             : fmt::format("  [{}] {}\n", i + 1, notes.all()[i]);
  }
  out += "\n" + heading(f, "Provenance");
  const std::string bullet = f == Format::md ? "- " : "  ";
  const auto prov = provenance_of(rows);
  for (const auto& [text, controls] : prov) {
    std::string list;
    for (const auto& c : controls) list += (list.empty() ? "" : ", ") + c;
    out += prov.size() == 1 ? fmt::format("{}every row: {}\n", bullet, text)
                            : fmt::format("{}{}: {}\n", bullet, text, list);
  }
  out += fmt::format("{}edition record: {}\n", bullet, e.provenance);
  if (!e.si_note.empty()) out += fmt::format("{}note on SI figures: {}\n", bullet, e.si_note);
  for (const auto& s : e.sources) out += fmt::format("{}table: {}\n", bullet, s);
  return out;
}

std::string cautions(Format f) {
  return "\n" + (f == Format::md ? cautions_markdown(CautionTopic::code)
                                 : cautions_text(CautionTopic::code));
}

void json_cautions(Json& j) {
  j.key("cautions").begin_array();
  for (const auto& c : cautions(CautionTopic::code)) j.value(c);
  j.end_array();
}

void json_row_source(Json& j, const codes::Row& r) {
  j.field("clause", r.clause).field("table", r.table);
  j.key("footnotes").begin_array();
  for (const auto& f : r.footnotes) j.value(f);
  j.end_array();
  j.field("provenance", r.provenance).field("source", r.origin);
}

void json_allowed(Json& j, const AllowedControl& c, System s) {
  j.begin_object();
  j.field("control", c.row->control).field("modelled", c.row->modelled);
  j.field("economizer_off_when", settings_text(c, s));
  j.key("settings").begin_array();
  for (const auto& r : c.settings) {
    const Kind kind = codes::setting_kind(r.quantity, r.reference);
    const std::string key = codes::setting_key(r.quantity, r.reference, s);
    j.begin_object();
    j.field("quantity", highlimit::quantity_name(r.quantity));
    j.field("reference", highlimit::reference_name(r.reference));
    j.field(key, units::to_display(kind, s, r.value), 6);
    j.field("tabulated_" + key, units::to_display(kind, s, r.tabulated), 6);
    j.field("site_adjusted", r.site_adjusted);
    j.key("table_figures").begin_object();
    j.field(codes::setting_key(r.quantity, r.reference, System::ip), r.stored_ip, 6);
    j.field(codes::setting_key(r.quantity, r.reference, System::si), r.stored_si, 6);
    j.end_object();
    j.end_object();
  }
  j.end_array();
  if (!c.row->description.empty()) j.field("description", c.row->description);
  json_row_source(j, *c.row);
  j.end_object();
}

void json_integration(Json& j, const codes::Edition& e,
                      std::optional<airside::EconomizerType> mode) {
  j.key("integration").begin_object();
  j.field("required", e.integration.required).field("clause", e.integration.clause);
  j.field("requirement", e.integration.requirement).field("provenance", e.integration.provenance);
  if (mode) {
    j.field("economizer", airside::economizer_name(*mode));
    j.field("complies", codes::check_integration(e, *mode).complies);
  }
  j.end_object();
}

// Site pressure and the figures compared, common to the JSON of one zone and of a unit.
void json_site(Json& j, const codes::ZoneRequirements& req, System s) {
  j.key(fmt::format("site_pressure_{}", units::key_suffix(Kind::pressure, s)));
  if (req.pressure_kpa)
    j.value(units::to_display(Kind::pressure, s, *req.pressure_kpa), 6);
  else
    j.null();
  j.field("compare_in", units::system_name(req.compare_in));
}

// The integration check, the tables read, the cautions, and the closing brace.
std::string json_close(Json& j, const codes::Edition& e,
                       std::optional<airside::EconomizerType> mode) {
  json_integration(j, e, mode);
  j.key("tables").begin_array();
  for (const auto& src : e.sources) j.value(src);
  j.end_array();
  j.field("edition_provenance", e.provenance);
  json_cautions(j);
  j.end_object();
  return j.str();
}

std::string integration_text(Format f, const codes::Edition& e,
                             std::optional<airside::EconomizerType> mode, std::string_view whose) {
  const auto& rule = e.integration;
  std::string out = "\n" + heading(f, "Integrated economizer");
  const std::string bullet = f == Format::md ? "- " : "  ";
  out += fmt::format("{}{} ({}): {}\n", bullet, rule.required ? "required" : "not required",
                     rule.clause, rule.requirement);
  if (mode) {
    const bool ok = codes::check_integration(e, *mode).complies;
    out +=
        fmt::format("{}{} economizer: {} -> {}\n", bullet, whose, airside::economizer_name(*mode),
                    ok ? "complies"
                       : "does not comply (the economizer must keep running "
                         "together with mechanical cooling)");
  }
  return out;
}

// --- Economizer requirement and selectable setpoints ----------------------------------------

std::string table_cite(const std::string& clause, const std::string& table) {
  return table.empty() ? clause : fmt::format("{}, {}", clause, table);
}

// The requirement of the zone, and for a unit its capacity and the answer.
std::string requirement_text(Format f, const codes::ZoneRequirements& req, const CodeVerdicts* u,
                             System s) {
  const codes::NeedCheck zone_need = codes::economizer_need(req);
  const std::string bullet = f == Format::md ? "- " : "  ";
  const std::string sub = f == Format::md ? "  - " : "      - ";
  std::string out =
      "\n" + heading(f, u ? "Economizer requirement for this unit" : "Economizer requirement");
  if (!zone_need.table) {
    out += fmt::format("{}{}\n", bullet, codes::need_text(zone_need.need));
    return out;
  }
  const codes::EconomizerRequirement& t = *zone_need.table;
  out += fmt::format("{}{}: {}\n", bullet, req.zone, codes::threshold_text(zone_need, s));
  if (!zone_need.group->note.empty())
    out += fmt::format("{}note: {}\n", bullet, zone_need.group->note);
  out += fmt::format("{}the requirement ({}): {}\n", bullet, table_cite(t.clause, t.table),
                     t.requirement);
  if (u) {
    out += fmt::format("{}cooling capacity of the unit: {} ({}{})\n", bullet,
                       units::format(Kind::power, s, u->capacity_kw, 1),
                       u->capacity_estimated ? "" : "from ", u->capacity_basis);
    const std::string on = u->capacity_estimated ? "on its estimated capacity" : "on its capacity";
    std::string answer;
    switch (u->need.need) {
      case codes::Need::required:
        answer = fmt::format(
            "an air economizer is required for this unit, {}; a water economizer, which "
            "limitline does not model, may stand in",
            on);
        break;
      case codes::Need::below_threshold:
        answer = fmt::format(
            "no economizer is required for this unit, {}: it is below the "
            "threshold",
            on);
        break;
      case codes::Need::exempt_zone:
        answer = "no economizer is required for this unit: the zone is exempt";
        break;
      case codes::Need::no_table: answer = std::string(codes::need_text(u->need.need)); break;
    }
    out += fmt::format("{}-> {}\n", bullet, answer);
  }
  if (!t.exceptions.empty()) {
    out += fmt::format("{}exceptions limitline does not weigh (check them by hand):\n", bullet);
    for (const auto& e : t.exceptions) out += fmt::format("{}{}\n", sub, e);
  }
  out += fmt::format("{}provenance: {}\n", bullet, zone_need.group->provenance);
  return out;
}

std::string selectable_text(Format f, const codes::Edition& e, System compare_in, System s) {
  if (!e.selectable) return {};
  const codes::SelectableSetpoints& sel = *e.selectable;
  const std::string bullet = f == Format::md ? "- " : "  ";
  std::string list;
  for (const auto& a : sel.allowances)
    list += fmt::format("{}{} {}", list.empty() ? "" : ", ", highlimit::quantity_name(a.quantity),
                        units::format(highlimit::quantity_difference_kind(a.quantity), s,
                                      *sel.allowance(a.quantity, compare_in), 1));
  return "\n" + heading(f, "Selectable setpoints") +
         fmt::format(
             "{}{}: {}\n{}allowance: within {} of a listed fixed limit; a setting off "
             "the listed figure but within its allowance is judged "
             "complies-if-selectable\n{}provenance: {}\n",
             bullet, table_cite(sel.clause, sel.table), sel.note, bullet, list, bullet,
             sel.provenance);
}

// What the edition requires of economizer fault detection, and for a unit whether its
// capacity brings it under the clause.
std::string fault_detection_text(Format f, const codes::Edition& e, System compare_in,
                                 const CodeVerdicts* u, System s) {
  const std::string bullet = f == Format::md ? "- " : "  ";
  const std::string sub = f == Format::md ? "  - " : "      - ";
  std::string out = "\n" + heading(f, "Economizer fault detection");
  if (!e.fault_detection) {
    out += fmt::format(
        "{}{} has no economizer fault-detection clause in limitline's tables (from memory); "
        "a fault-detection system is still common practice\n",
        bullet, e.id);
    return out;
  }
  const codes::FaultDetection& d = *e.fault_detection;
  out += fmt::format("{}{} {}: {}\n", bullet, e.id, d.clause, d.applies_to);
  if (const auto kw = d.threshold_kw(compare_in))
    out += fmt::format("{}from a cooling capacity of {}\n", bullet,
                       units::format(Kind::power, s, *kw, 1));
  if (u) {
    const bool covered = d.covers_capacity(u->capacity_kw, compare_in);
    out += fmt::format(
        "{}-> {}\n", bullet,
        covered ? fmt::format("required for this unit if it is of the type the clause covers "
                              "(capacity {}{})",
                              units::format(Kind::power, s, u->capacity_kw, 1),
                              u->capacity_estimated ? ", estimated" : "")
                : fmt::format("not required for this unit: its capacity {} is below the "
                              "threshold",
                              units::format(Kind::power, s, u->capacity_kw, 1)));
  }
  out += fmt::format("{}sensors to install permanently:\n", bullet);
  for (const auto& x : d.sensors) out += fmt::format("{}{}\n", sub, x);
  if (const auto acc = d.sensor_accuracy_k(compare_in)) {
    out += fmt::format("{}temperature sensor accuracy: ±{}{}\n", bullet,
                       units::format(Kind::temperature_difference, s, *acc, 1),
                       d.accuracy_range.empty() ? "" : " over " + d.accuracy_range);
  }
  if (!d.status.empty()) {
    out += fmt::format("{}the unit controller shows:\n", bullet);
    for (const auto& x : d.status) out += fmt::format("{}{}\n", sub, x);
  }
  if (!d.testing.empty()) out += fmt::format("{}testing: {}\n", bullet, d.testing);
  out += fmt::format(
      "{}faults it must detect (the code's terms in quotes, limitline's name in "
      "brackets):\n",
      bullet);
  for (const auto& r : d.faults)
    out += fmt::format("{}\"{}\" [{}]\n", sub, r.code_term, codes::fault_name(r.fault));
  out += fmt::format("{}reporting: {}\n", bullet, d.reporting);
  out += fmt::format("{}provenance: {}\n", bullet, d.provenance);
  return out;
}

void json_fault_detection(Json& j, const codes::Edition& e, System compare_in,
                          const CodeVerdicts* u, System s) {
  j.key("fault_detection");
  if (!e.fault_detection) {
    j.null();
    return;
  }
  const codes::FaultDetection& d = *e.fault_detection;
  const std::string power_key = fmt::format("_{}", units::key_suffix(Kind::power, s));
  j.begin_object();
  j.field("clause", d.clause).field("applies_to", d.applies_to);
  j.key("capacity_threshold" + power_key);
  if (const auto kw = d.threshold_kw(compare_in))
    j.value(units::to_display(Kind::power, s, *kw), 3);
  else
    j.null();
  if (u) j.field("covers_unit_capacity", d.covers_capacity(u->capacity_kw, compare_in));
  j.key("sensors").begin_array();
  for (const auto& x : d.sensors) j.value(x);
  j.end_array();
  const std::string acc_key =
      fmt::format("sensor_accuracy_{}", units::key_suffix(Kind::temperature_difference, s));
  j.key(acc_key);
  if (const auto acc = d.sensor_accuracy_k(compare_in))
    j.value(units::to_display(Kind::temperature_difference, s, *acc), 3);
  else
    j.null();
  j.field("accuracy_range", d.accuracy_range);
  j.key("status").begin_array();
  for (const auto& x : d.status) j.value(x);
  j.end_array();
  j.key("faults").begin_array();
  for (const auto& r : d.faults)
    j.begin_object()
        .field("fault", codes::fault_name(r.fault))
        .field("code_term", r.code_term)
        .field("description", codes::fault_description(r.fault))
        .end_object();
  j.end_array();
  j.field("testing", d.testing).field("reporting", d.reporting).field("provenance", d.provenance);
  j.end_object();
}

void json_requirement(Json& j, const codes::ZoneRequirements& req, const CodeVerdicts* u,
                      System s) {
  const codes::NeedCheck zone_need = codes::economizer_need(req);
  const std::string power_key = fmt::format("_{}", units::key_suffix(Kind::power, s));
  j.key("economizer_requirement").begin_object();
  j.field("stated", zone_need.table != nullptr);
  if (zone_need.table) {
    const codes::EconomizerRequirement& t = *zone_need.table;
    const codes::RequirementGroup& g = *zone_need.group;
    j.field("required_in_zone", g.required);
    j.key("threshold" + power_key);
    if (g.required)
      j.value(units::to_display(Kind::power, s, zone_need.threshold_kw), 6);
    else
      j.null();
    j.key("at_threshold_required");
    if (g.required)
      j.value(g.inclusive);
    else
      j.null();
    j.field("summary", codes::threshold_text(zone_need, s));
    j.field("note", g.note).field("clause", t.clause).field("table", t.table);
    j.field("requirement", t.requirement);
    j.key("exceptions_not_modelled").begin_array();
    for (const auto& e : t.exceptions) j.value(e);
    j.end_array();
    j.field("provenance", g.provenance).field("source", g.origin);
  }
  if (u) {
    j.key("unit").begin_object();
    j.field("capacity" + power_key, units::to_display(Kind::power, s, u->capacity_kw), 6);
    j.field("capacity_estimated", u->capacity_estimated);
    j.field("capacity_basis", u->capacity_basis);
    j.key("required");
    if (u->need.need == codes::Need::no_table)
      j.null();
    else
      j.value(u->need.need == codes::Need::required);
    j.field("answer", codes::need_text(u->need.need));
    j.end_object();
  }
  j.end_object();
}

void json_selectable(Json& j, const codes::Edition& e, System compare_in, System s) {
  j.key("selectable_setpoints");
  if (!e.selectable) {
    j.null();
    return;
  }
  const codes::SelectableSetpoints& sel = *e.selectable;
  j.begin_object().field("note", sel.note).field("clause", sel.clause).field("table", sel.table);
  j.key("allowances").begin_array();
  for (const auto& a : sel.allowances) {
    const Kind kind = highlimit::quantity_difference_kind(a.quantity);
    j.begin_object().field("quantity", highlimit::quantity_name(a.quantity));
    j.field(fmt::format("allowance_{}", units::key_suffix(kind, s)),
            units::to_display(kind, s, *sel.allowance(a.quantity, compare_in)), 6);
    j.end_object();
  }
  j.end_array();
  j.field("provenance", sel.provenance).field("source", sel.origin).end_object();
}

// --- Listing one zone ----------------------------------------------------------------------

std::string zone_listing(const codes::ZoneRequirements& req, System s, Format f,
                         std::optional<airside::EconomizerType> mode,
                         std::size_t width = kTextWidth) {
  const codes::Edition& e = *req.edition;
  if (f == Format::json) {
    Json j;
    j.begin_object();
    j.field("edition", e.id).field("title", e.title).field("climate_zone", req.zone);
    json_site(j, req, s);
    j.key("allowed").begin_array();
    for (const auto& c : req.allowed) json_allowed(j, c, s);
    j.end_array();
    j.key("prohibited").begin_array();
    for (const auto* r : req.prohibited) {
      j.begin_object().field("control", r->control);
      json_row_source(j, *r);
      j.end_object();
    }
    j.end_array();
    json_requirement(j, req, nullptr, s);
    json_selectable(j, e, req.compare_in, s);
    json_fault_detection(j, e, req.compare_in, nullptr, s);
    return json_close(j, e, mode);
  }

  Notes notes;
  std::vector<const codes::Row*> rows;
  Table allowed({{"control", Align::left},
                 {"economizer off when", Align::left},
                 {"clause", Align::left},
                 {"notes", Align::left}});
  for (const auto& c : req.allowed) {
    allowed.add_row({c.row->control, settings_text(c, s), cite(*c.row), notes.refs(*c.row)});
    rows.push_back(c.row);
  }
  Table prohibited({{"control", Align::left}, {"clause", Align::left}, {"notes", Align::left}});
  for (const auto* r : req.prohibited) {
    prohibited.add_row({r->control, cite(*r), notes.refs(*r)});
    rows.push_back(r);
  }
  std::string out = f == Format::md
                        ? fmt::format("# Economizer high-limit: {}, zone {}\n\n", e.id, req.zone)
                        : "limitline code — economizer high-limit requirements\n\n";
  out += facts(f, {{"Energy code", fmt::format("{} ({})", e.id, e.title)},
                   {"Climate zone", req.zone},
                   {"Site", pressure_text(req.pressure_kpa, s)},
                   {"Compared in", fmt::format("{} figures{}", compare_name(req.compare_in),
                                               req.compare_in == e.governing_units
                                                   ? " (the edition's governing units)"
                                                   : "")}});
  out += "\n" + heading(f, "Allowed high-limit controls") + render(f, allowed, width);
  if (prohibited.rows())
    out += "\n" + heading(f, "Not allowed in this zone") + render(f, prohibited, width);
  out += requirement_text(f, req, nullptr, s);
  out += integration_text(f, e, mode, "the given");
  out += selectable_text(f, e, req.compare_in, s);
  out += fault_detection_text(f, e, req.compare_in, nullptr, s);
  out += notes_text(f, notes, rows, e);
  return out + cautions(f);
}

// --- Verdicts for a unit file --------------------------------------------------------------

// "the altitude footnote used 14.70 psia (from the unit's [site]); the weather file ... has a
// median station pressure of ...", or empty when there is nothing to compare.
std::string weather_pressure_text(const CodeVerdicts& u, System s) {
  if (!u.weather) return {};
  const WeatherPressure& w = *u.weather;
  if (!w.unread.empty()) return fmt::format("not compared: {}", w.unread);
  constexpr std::string_view kFrom[] = {"from the command line", "from the unit's [site]",
                                        "sea level: the unit gives no elevation"};
  return fmt::format(
      "the altitude footnote used {} ({}); the weather file {} has a median station "
      "pressure of {}",
      units::format(Kind::pressure, s, w.footnote_kpa, s == System::ip ? 2 : 1),
      kFrom[static_cast<std::size_t>(w.footnote_from)], w.label, pressure_text(w.median_kpa, s));
}

std::string instead_text(const codes::StrategyCheck& c, System s) {
  std::string out;
  for (const auto& alt : c.instead)
    out +=
        fmt::format("{}{}: {}", out.empty() ? "" : "; ", alt.row->control, settings_text(alt, s));
  return out;
}

std::string conditions_text(const highlimit::Strategy& st, System s) {
  std::string out;
  for (const auto& c : st.conditions)
    out += (out.empty() ? "" : " or ") + codes::setting_text({c.quantity, c.reference, c.limit}, s);
  return out.empty() ? "no conditions" : out;
}

// What the presets of a unit without [[strategy]] are set to: common practice, or the code's
// values where the [site]'s code gave them.
std::string defaulted_text(const CodeVerdicts& u) {
  std::string source;
  for (const auto& st : u.strategies)
    if (!st.code_source.empty()) source = st.code_source;
  if (source.empty())
    return "\nThe unit file has no [[strategy]]: every preset at its common-practice settings "
           "is judged.\n";
  return fmt::format(
      "\nThe unit file has no [[strategy]]: every preset is judged, at the settings of the "
      "[site]'s code where it allows the preset ({}), else at common-practice settings.\n",
      source);
}

std::string unit_report(const CodeVerdicts& u, System s, Format f, std::size_t width = kTextWidth) {
  const codes::ZoneRequirements& req = *u.req;
  const codes::Edition& e = *req.edition;
  if (f == Format::json) {
    Json j;
    j.begin_object();
    j.field("unit", u.unit_path).field("edition", e.id).field("edition_from", u.edition_from);
    j.field("climate_zone", req.zone).field("climate_zone_from", u.zone_from);
    json_site(j, req, s);
    if (const std::string w = weather_pressure_text(u, s); !w.empty())
      j.field("weather_pressure", w);
    j.field("strategies_defaulted", u.defaulted);
    j.key("strategies").begin_array();
    for (std::size_t i = 0; i < u.checks.size(); ++i) {
      const auto& c = u.checks[i];
      j.begin_object();
      j.field("name", u.strategies[i].name);
      j.field("verdict", codes::verdict_word(c.verdict));
      j.key("control");
      if (c.matched)
        j.value(c.matched->control);
      else
        j.null();
      j.field("conditions", conditions_text(u.strategies[i], s));
      j.key("settings_from_code");
      if (u.strategies[i].code_source.empty())
        j.null();
      else
        j.value(u.strategies[i].code_source);
      j.field("explanation", codes::verdict_text(c, req, s));
      j.key("deviations").begin_array();
      for (const auto& d : c.deviations) {
        const Kind kind = codes::setting_kind(d.quantity, d.reference);
        const Kind diff = highlimit::quantity_difference_kind(d.quantity);
        const std::string key = codes::setting_key(d.quantity, d.reference, s);
        j.begin_object();
        j.field("setting", key);
        j.field("actual", units::to_display(kind, s, d.actual), 6);
        j.field("required", units::to_display(kind, s, d.required), 6);
        j.field(fmt::format("difference_{}", units::key_suffix(diff, s)),
                units::to_display(diff, s, d.difference()), 6);
        j.field("direction", d.difference() > 0 ? "above" : "below");
        j.end_object();
      }
      j.end_array();
      if (c.row) {
        j.key("row").begin_object();
        json_row_source(j, *c.row);
        j.end_object();
      }
      j.key("use_instead").begin_array();
      for (const auto& alt : c.instead) json_allowed(j, alt, s);
      j.end_array();
      j.end_object();
    }
    j.end_array();
    json_requirement(j, req, &u, s);
    json_selectable(j, e, req.compare_in, s);
    json_fault_detection(j, e, req.compare_in, &u, s);
    return json_close(j, e, u.economizer);
  }

  Notes notes;
  std::vector<const codes::Row*> rows;
  Table t({{"strategy", Align::left},
           {"control type", Align::left},
           {"verdict", Align::left},
           {"clause", Align::left},
           {"notes", Align::left}});
  std::string detail;
  const std::string bullet = f == Format::md ? "- " : "  - ";
  const std::string indent = f == Format::md ? "  - " : "      ";
  for (std::size_t i = 0; i < u.checks.size(); ++i) {
    const auto& c = u.checks[i];
    const auto& st = u.strategies[i];
    t.add_row({st.name, c.matched ? c.matched->control : "-",
               std::string(codes::verdict_word(c.verdict)), c.row ? cite(*c.row) : "-",
               c.row ? notes.refs(*c.row) : ""});
    if (c.row) rows.push_back(c.row);
    detail += fmt::format("{}{}: {}: {}\n", bullet, st.name, codes::verdict_word(c.verdict),
                          codes::verdict_text(c, req, s));
    if (c.verdict == Verdict::not_evaluable)
      detail += fmt::format("{}conditions: {}\n", indent, conditions_text(st, s));
    if (!c.instead.empty())
      detail += fmt::format("{}use instead: {}\n", indent, instead_text(c, s));
  }
  std::string out = f == Format::md ? fmt::format("# Economizer high-limit compliance: {}\n\n",
                                                  markdown_escape(u.unit_path))
                                    : "limitline code — high-limit compliance of a unit\n\n";
  std::vector<std::pair<std::string, std::string>> items{
      {"Unit", u.unit_path},
      {"Energy code", fmt::format("{} ({}; from {})", e.id, e.title, u.edition_from)},
      {"Climate zone", fmt::format("{} (from {})", req.zone, u.zone_from)},
      {"Site", pressure_text(req.pressure_kpa, s)},
      {"Compared in", fmt::format("{} figures", compare_name(req.compare_in))}};
  if (const std::string w = weather_pressure_text(u, s); !w.empty())
    items.emplace_back("Weather pressure", w);
  out += facts(f, items);
  if (u.defaulted) out += defaulted_text(u);
  out += "\n" + heading(f, "Verdicts") + render(f, t, width);
  out += "\n" + heading(f, "Details") + detail;
  out += requirement_text(f, req, &u, s);
  out += integration_text(f, e, u.economizer, "the unit's");
  if (std::any_of(u.checks.begin(), u.checks.end(), [](const codes::StrategyCheck& c) {
        return c.verdict == Verdict::complies_if_selectable;
      }))
    out += selectable_text(f, e, req.compare_in, s);
  out += fault_detection_text(f, e, req.compare_in, &u, s);
  out += notes_text(f, notes, rows, e);
  return out + cautions(f);
}

// --- Matrix of every edition ----------------------------------------------------------------

// Compact cell: the settings that comply, in display units without labels.
std::string cell(const codes::Edition& e, const codes::ZoneRequirements* req,
                 const std::string& control, System s) {
  if (!req) return "·";
  if (!e.row(control, req->zone)) return "";
  for (const auto& c : req->allowed) {
    if (c.row->control != control) continue;
    if (!c.row->modelled) return "listed*";
    std::string out;
    for (const auto& r : c.settings) {
      const Kind kind = codes::setting_kind(r.quantity, r.reference);
      const double v = units::to_display(kind, s, r.value);
      std::string num = fmt::format("{:.1f}", v);
      if (num.ends_with(".0")) num.resize(num.size() - 2);
      if (num == "-0") num = "0";
      const char* abbr = r.quantity == highlimit::Quantity::dry_bulb   ? "DB"
                         : r.quantity == highlimit::Quantity::enthalpy ? "H"
                                                                       : "DP";
      std::string token = r.reference == highlimit::Reference::fixed
                              ? fmt::format("{}{}", abbr, num)
                          : num == "0" ? fmt::format("{}=RA", abbr)
                                       : fmt::format("{}=RA{}{}", abbr, v < 0 ? "" : "+", num);
      out += (out.empty() ? "" : " ") + token + (r.site_adjusted ? "^" : "");
    }
    return out;
  }
  return "—";
}

std::string matrix(const codes::CodeTables& tables, std::optional<double> p,
                   std::optional<System> compare_in, System s, Format f,
                   std::size_t width = kTextWidth) {
  struct Group {
    codes::ZoneSystem system;
    std::vector<const codes::Edition*> editions;
    std::vector<std::string> controls;
  };
  std::vector<Group> groups;
  for (const auto& e : tables.editions()) {
    auto g = std::find_if(groups.begin(), groups.end(),
                          [&](const Group& x) { return x.system == e.zone_system; });
    if (g == groups.end()) g = groups.insert(groups.end(), Group{e.zone_system, {}, {}});
    g->editions.push_back(&e);
    for (const auto& c : e.controls())
      if (std::find(g->controls.begin(), g->controls.end(), c) == g->controls.end())
        g->controls.push_back(c);
  }
  // Requirements of every (edition, zone) once.
  std::map<std::pair<const codes::Edition*, std::string>, codes::ZoneRequirements> reqs;
  for (const auto& e : tables.editions())
    for (const auto& z : e.zones)
      reqs.emplace(std::pair{&e, z}, codes::requirements(e, z, {p, compare_in}));
  auto find = [&](const codes::Edition* e, const std::string& z) -> const codes::ZoneRequirements* {
    auto it = reqs.find({e, z});
    return it == reqs.end() ? nullptr : &it->second;
  };

  if (f == Format::json) {
    Json j;
    j.begin_object();
    j.key(fmt::format("site_pressure_{}", units::key_suffix(Kind::pressure, s)));
    if (p)
      j.value(units::to_display(Kind::pressure, s, *p), 6);
    else
      j.null();
    j.key("groups").begin_array();
    for (const auto& g : groups) {
      j.begin_object().field("zone_system", codes::zone_system_name(g.system));
      j.key("editions").begin_array();
      for (const auto* e : g.editions) j.value(e->id);
      j.end_array();
      j.key("zones").begin_array();
      for (std::string_view z : codes::all_zones(g.system)) {
        j.begin_object().field("zone", z);
        j.key("controls").begin_array();
        for (const auto& control : g.controls) {
          j.begin_object().field("control", control);
          j.key("by_edition").begin_object();
          for (const auto* e : g.editions) {
            j.key(e->id);
            const auto* req = find(e, std::string(z));
            if (!req) {
              j.null();
              continue;
            }
            const auto it =
                std::find_if(req->allowed.begin(), req->allowed.end(),
                             [&](const AllowedControl& c) { return c.row->control == control; });
            if (it == req->allowed.end()) {
              const bool listed = e->row(control, std::string(z)) != nullptr;
              j.begin_object()
                  .field("permission", listed ? "prohibited" : "not-listed")
                  .end_object();
              continue;
            }
            j.begin_object().field("permission", "allowed").field("modelled", it->row->modelled);
            j.key("settings").begin_object();
            for (const auto& r : it->settings)
              j.field(codes::setting_key(r.quantity, r.reference, s),
                      units::to_display(codes::setting_kind(r.quantity, r.reference), s, r.value),
                      6);
            j.end_object();
            j.field("site_adjusted", std::any_of(it->settings.begin(), it->settings.end(),
                                                 [](const auto& r) { return r.site_adjusted; }));
            j.end_object();
          }
          j.end_object().end_object();
        }
        j.end_array().end_object();
      }
      j.end_array().end_object();
    }
    j.end_array();
    json_cautions(j);
    j.end_object();
    return j.str();
  }

  std::string out = f == Format::md ? "# Economizer high-limit: what each edition allows\n\n"
                                    : "limitline code — what each edition allows, zone by zone\n\n";
  const bool ip = s == System::ip;
  const std::string legend[] = {
      fmt::format("Cells: the settings that comply ({}).", ip ? "°F, Btu/lb" : "°C, kJ/kg"),
      "DB dry-bulb, H enthalpy, DP dew point; RA the return-air value; ^ the altitude footnote",
      "applied; listed* a type limitline does not model; — not allowed; · not a zone of the",
      "edition; blank: the edition has no row for the type.",
      fmt::format("Site: {}.", pressure_text(p, s))};
  for (const auto& line : legend) out += line + (f == Format::md ? "  \n" : "\n");
  for (const auto& g : groups) {
    std::vector<Column> cols = {{"zone", Align::left}, {"control", Align::left}};
    for (const auto* e : g.editions) cols.push_back({e->id, Align::left});
    Table t(cols);
    bool first = true;
    for (std::string_view zv : codes::all_zones(g.system)) {
      const std::string z(zv);
      if (std::none_of(g.editions.begin(), g.editions.end(),
                       [&](const codes::Edition* e) { return e->has_zone(z); }))
        continue;
      if (!first && f != Format::md) t.add_rule();
      first = false;
      for (std::size_t k = 0; k < g.controls.size(); ++k) {
        std::vector<std::string> r = {k == 0 || f == Format::md ? z : "", g.controls[k]};
        for (const auto* e : g.editions) r.push_back(cell(*e, find(e, z), g.controls[k], s));
        t.add_row(std::move(r));
      }
    }
    out += "\n" + heading(f, fmt::format("Zones: {}", codes::zone_system_name(g.system))) +
           render(f, t, width);
  }
  out += "\n" + heading(f, "Provenance");
  const std::string bullet = f == Format::md ? "- " : "  ";
  for (const auto& e : tables.editions())
    out += fmt::format("{}{}: {} ({})\n", bullet, e.id, e.provenance, e.sources.front());
  return out + cautions(f);
}

std::string editions_list(const codes::CodeTables& tables, Format f,
                          std::size_t width = kTextWidth) {
  if (f == Format::json) {
    Json j;
    j.begin_object().key("editions").begin_array();
    for (const auto& e : tables.editions()) {
      j.begin_object().field("id", e.id).field("title", e.title);
      j.field("zone_system", codes::zone_system_name(e.zone_system));
      j.key("zones").begin_array();
      for (const auto& z : e.zones) j.value(z);
      j.end_array();
      j.field("provenance", e.provenance);
      j.key("tables").begin_array();
      for (const auto& src : e.sources) j.value(src);
      j.end_array().end_object();
    }
    j.end_array();
    json_cautions(j);
    j.end_object();
    return j.str();
  }
  Table t({{"edition", Align::left},
           {"title", Align::left},
           {"zones", Align::left},
           {"tables", Align::left}});
  for (const auto& e : tables.editions()) {
    std::string src;
    for (const auto& s : e.sources) src += (src.empty() ? "" : " + ") + s;
    t.add_row({e.id, e.title,
               fmt::format("{} ({} to {})", e.zones.size(), e.zones.front(), e.zones.back()), src});
  }
  return heading(f, "Code editions loaded") + render(f, t, width) + cautions(f);
}

}  // namespace

std::string code_zone_text(const codes::ZoneRequirements& req, System s,
                           std::optional<airside::EconomizerType> economizer, std::size_t width) {
  return zone_listing(req, s, Format::text, economizer, width);
}
std::string code_zone_markdown(const codes::ZoneRequirements& req, System s,
                               std::optional<airside::EconomizerType> economizer) {
  return zone_listing(req, s, Format::md, economizer);
}
std::string code_zone_json(const codes::ZoneRequirements& req, System s,
                           std::optional<airside::EconomizerType> economizer) {
  return zone_listing(req, s, Format::json, economizer);
}

std::string code_unit_text(const CodeVerdicts& v, System s, std::size_t width) {
  return unit_report(v, s, Format::text, width);
}
std::string code_unit_markdown(const CodeVerdicts& v, System s) {
  return unit_report(v, s, Format::md);
}
std::string code_unit_json(const CodeVerdicts& v, System s) {
  return unit_report(v, s, Format::json);
}

std::string code_matrix_text(const codes::CodeTables& tables, std::optional<double> pressure_kpa,
                             std::optional<System> compare_in, System s, std::size_t width) {
  return matrix(tables, pressure_kpa, compare_in, s, Format::text, width);
}
std::string code_matrix_markdown(const codes::CodeTables& tables,
                                 std::optional<double> pressure_kpa,
                                 std::optional<System> compare_in, System s) {
  return matrix(tables, pressure_kpa, compare_in, s, Format::md);
}
std::string code_matrix_json(const codes::CodeTables& tables, std::optional<double> pressure_kpa,
                             std::optional<System> compare_in, System s) {
  return matrix(tables, pressure_kpa, compare_in, s, Format::json);
}

std::string code_editions_text(const codes::CodeTables& tables, std::size_t width) {
  return editions_list(tables, Format::text, width);
}
std::string code_editions_markdown(const codes::CodeTables& tables) {
  return editions_list(tables, Format::md);
}
std::string code_editions_json(const codes::CodeTables& tables) {
  return editions_list(tables, Format::json);
}

}  // namespace limitline::report
