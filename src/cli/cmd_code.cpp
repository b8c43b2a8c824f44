// limitline code: what an energy code allows for the high-limit, and verdicts for a unit.
#include "common.hpp"

#include <limitline/io/codes.hpp>
#include <limitline/model/psychro.hpp>
#include <limitline/report/cautions.hpp>
#include <limitline/report/json.hpp>
#include <limitline/report/table.hpp>
#include <limitline/io/unit_file.hpp>
#include <limitline/app/year_job.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <filesystem>
#include <map>

namespace limitline::cli {
namespace {

using codes::AllowedControl;
using codes::Verdict;
using units::Kind;
using units::System;

std::string details() {
  return fmt::format(
      "Lists what an energy code allows for the economizer high-limit in a climate zone, or\n"
      "judges the strategies of a unit file against it.\n\n"
      "  limitline code --edition ashrae-90.1-2019 --zone 4A\n"
      "      the allowed high-limit control types in the zone with their required settings,\n"
      "      clause, footnotes and provenance; the prohibited types; the integrated-\n"
      "      economizer requirement (checked when --economizer is given).\n"
      "  limitline code UNIT.toml\n"
      "      a verdict for every [[strategy]] of the unit file (every preset at its default\n"
      "      settings when it has none), edition and zone from its [site] energy_code and\n"
      "      climate_zone (--edition and --zone override them):\n"
      "        complies       an allowed type, set as the table requires\n"
      "        not-allowed    the type is prohibited, or not listed, in this zone\n"
      "        set-wrong      an allowed type with a setting off by more than the tolerance\n"
      "                       (says by how much and which way)\n"
      "        not-evaluable  the conditions are equivalent to no control type\n"
      "      with the compliant settings to use instead, and the unit's economizer against\n"
      "      the integrated-economizer requirement.\n"
      "  limitline code --all-editions    one matrix, zone x edition, of what is allowed\n"
      "  limitline code --list-editions   the loaded editions and the files they came from\n\n"
      "Editions: ashrae-90.1-2010, -2013, -2016, -2019, -2022; iecc-2015, -2018, -2021,\n"
      "-2024; title24-2013, -2016, -2019, -2022; and any added with --code-table.\n"
      "Zones: ASHRAE 169 (0A and 0B where the edition has them, 1A ... 6B, 7, 8) or\n"
      "California climate zones (12 or CZ12).\n\n"
      "Site: --elevation or --pressure, else the unit file's site, else sea level. A fixed\n"
      "enthalpy limit follows the altitude footnote (the enthalpy at the footnote's state,\n"
      "75 °F and 50 % RH, at the site pressure) once that differs from its sea-level value by\n"
      "more than {} Btu/lb.\n\n"
      "Tolerances: a setting complies within {} °F and {} Btu/lb of the table's IP figures,\n"
      "or {} K and {} kJ/kg of its SI figures (--compare-in si; the default is the edition's\n"
      "governing units, IP for every shipped edition). --units only changes the display.\n\n"
      "Tables: data/codes/*.toml, found through $LIMITLINE_DATA_DIR/codes, the installed data\n"
      "folder, or the source tree. --code-table FILE (repeatable, applied in order) adds an\n"
      "edition or an [amendment] whose rows replace the edition's rows zone by zone: a\n"
      "jurisdiction's local amendments. The format is described in the README section 'Energy-code tables'.\n"
      "Every value in the shipped tables is recalled from memory: verify it against the\n"
      "adopted edition.\n\n"
      "Examples:\n"
      "  limitline code --edition ashrae-90.1-2019 --zone 4A\n"
      "  limitline code --edition title24-2022 --zone 12 --elevation 4500ft --format md\n"
      "  limitline code unit.toml --code-table city-amendments.toml\n"
      "  limitline code --all-editions --units si --format json",
      codes::kAltitudeFootnoteThresholdBtuPerLb, codes::kTemperatureToleranceF,
      codes::kEnthalpyToleranceBtuPerLb, codes::kTemperatureToleranceK,
      codes::kEnthalpyToleranceKjPerKg);
}


airside::EconomizerType parse_economizer(const std::string& text) {
  if (const auto e = airside::economizer_from_name(text)) return *e;
  throw UsageError(fmt::format("--economizer: '{}' is not {}", text,
                               names_in(airside::economizer_names(), " or ")));
}

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
  return fmt::format("{} (standard elevation {})",
                     units::format(Kind::pressure, s, *p, s == System::ip ? 2 : 1),
                     units::format(Kind::length, s, psychro::elevation_from_standard_pressure_m(*p), 0));
}

// The settings of an allowed type, with the altitude footnote shown where it applied.
std::string settings_text(const AllowedControl& c, System s) {
  if (!c.row->modelled) return c.row->description + " (not modelled by limitline)";
  std::vector<std::string> parts;
  for (const auto& r : c.settings) {
    std::string t = codes::setting_text({r.quantity, r.reference, r.value}, s);
    if (r.site_adjusted)
      t += fmt::format(" [altitude footnote; table {}]",
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
    auto it = std::find_if(out.begin(), out.end(), [&](const auto& p) { return p.first == r->provenance; });
    if (it == out.end()) it = out.insert(out.end(), {r->provenance, {}});
    if (std::find(it->second.begin(), it->second.end(), r->control) == it->second.end())
      it->second.push_back(r->control);
  }
  return out;
}

std::string heading(Format f, const std::string& title) {
  return f == Format::md ? "## " + title + "\n\n" : title + "\n";
}

std::string render(Format f, const report::Table& t) {
  return f == Format::md ? t.markdown() : t.text();
}

// "label: value" lines of a header block.
std::string facts(Format f, const std::vector<std::pair<std::string, std::string>>& items) {
  std::string out;
  std::size_t width = 0;
  for (const auto& [k, v] : items) width = std::max(width, k.size());
  for (const auto& [k, v] : items)
    out += f == Format::md ? fmt::format("- **{}**: {}\n", k, report::markdown_escape(v))
                           : fmt::format("{:<{}}  {}\n", k, width, v);
  return out;
}

std::string notes_text(Format f, const Notes& notes,
                       const std::vector<const codes::Row*>& rows, const codes::Edition& e) {
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
  return "\n" + (f == Format::md ? report::cautions_markdown(report::CautionTopic::code)
                                 : report::cautions_text(report::CautionTopic::code));
}

void json_cautions(report::Json& j) {
  j.key("cautions").begin_array();
  for (const auto& c : report::cautions(report::CautionTopic::code)) j.value(c);
  j.end_array();
}

void json_row_source(report::Json& j, const codes::Row& r) {
  j.field("clause", r.clause).field("table", r.table);
  j.key("footnotes").begin_array();
  for (const auto& f : r.footnotes) j.value(f);
  j.end_array();
  j.field("provenance", r.provenance).field("source", r.origin);
}

void json_allowed(report::Json& j, const AllowedControl& c, System s) {
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

void json_integration(report::Json& j, const codes::Edition& e,
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
void json_site(report::Json& j, const codes::ZoneRequirements& req, System s) {
  j.key(fmt::format("site_pressure_{}", units::key_suffix(Kind::pressure, s)));
  if (req.pressure_kpa) j.value(units::to_display(Kind::pressure, s, *req.pressure_kpa), 6);
  else j.null();
  j.field("compare_in", units::system_name(req.compare_in));
}

// The integration check, the tables read, the cautions, and the closing brace.
std::string json_close(report::Json& j, const codes::Edition& e,
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
                             std::optional<airside::EconomizerType> mode,
                             std::string_view whose) {
  const auto& rule = e.integration;
  std::string out = "\n" + heading(f, "Integrated economizer");
  const std::string bullet = f == Format::md ? "- " : "  ";
  out += fmt::format("{}{} ({}): {}\n", bullet, rule.required ? "required" : "not required",
                     rule.clause, rule.requirement);
  if (mode) {
    const bool ok = codes::check_integration(e, *mode).complies;
    out += fmt::format("{}{} economizer: {} -> {}\n", bullet, whose, airside::economizer_name(*mode),
                       ok ? "complies" : "does not comply (the economizer must keep running "
                                         "together with mechanical cooling)");
  }
  return out;
}

// --- Listing one zone ----------------------------------------------------------------------

std::string zone_listing(const codes::ZoneRequirements& req, System s, Format f,
                         std::optional<airside::EconomizerType> mode) {
  const codes::Edition& e = *req.edition;
  if (f == Format::json) {
    report::Json j;
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
    return json_close(j, e, mode);
  }

  Notes notes;
  std::vector<const codes::Row*> rows;
  report::Table allowed({{"control", report::Align::left},
                         {"economizer off when", report::Align::left},
                         {"clause", report::Align::left},
                         {"notes", report::Align::left}});
  for (const auto& c : req.allowed) {
    allowed.add_row({c.row->control, settings_text(c, s), cite(*c.row), notes.refs(*c.row)});
    rows.push_back(c.row);
  }
  report::Table prohibited({{"control", report::Align::left},
                            {"clause", report::Align::left},
                            {"notes", report::Align::left}});
  for (const auto* r : req.prohibited) {
    prohibited.add_row({r->control, cite(*r), notes.refs(*r)});
    rows.push_back(r);
  }
  std::string out = f == Format::md ? fmt::format("# Economizer high-limit: {}, zone {}\n\n", e.id, req.zone)
                                    : "limitline code — economizer high-limit requirements\n\n";
  out += facts(f, {{"Energy code", fmt::format("{} ({})", e.id, e.title)},
                   {"Climate zone", req.zone},
                   {"Site", pressure_text(req.pressure_kpa, s)},
                   {"Compared in", fmt::format("{} figures{}", compare_name(req.compare_in),
                                               req.compare_in == e.governing_units
                                                   ? " (the edition's governing units)" : "")}});
  out += "\n" + heading(f, "Allowed high-limit controls") + render(f, allowed);
  if (prohibited.rows())
    out += "\n" + heading(f, "Not allowed in this zone") + render(f, prohibited);
  out += integration_text(f, e, mode, "the given");
  out += notes_text(f, notes, rows, e);
  return out + cautions(f);
}

// --- Verdicts for a unit file --------------------------------------------------------------

struct UnitVerdicts {
  std::string unit_path;
  const codes::ZoneRequirements* req;
  std::vector<highlimit::Strategy> strategies;
  std::vector<codes::StrategyCheck> checks;
  bool defaulted;
  airside::EconomizerType economizer;
  std::string edition_from, zone_from;
  std::string weather_pressure;  // the unit's weather file's pressure beside the footnote's
};

std::string instead_text(const codes::StrategyCheck& c, System s) {
  std::string out;
  for (const auto& alt : c.instead)
    out += fmt::format("{}{}: {}", out.empty() ? "" : "; ", alt.row->control, settings_text(alt, s));
  return out;
}

std::string conditions_text(const highlimit::Strategy& st, System s) {
  std::string out;
  for (const auto& c : st.conditions)
    out += (out.empty() ? "" : " or ") +
           codes::setting_text({c.quantity, c.reference, c.limit}, s);
  return out.empty() ? "no conditions" : out;
}

std::string unit_report(const UnitVerdicts& u, System s, Format f) {
  const codes::ZoneRequirements& req = *u.req;
  const codes::Edition& e = *req.edition;
  if (f == Format::json) {
    report::Json j;
    j.begin_object();
    j.field("unit", u.unit_path).field("edition", e.id).field("edition_from", u.edition_from);
    j.field("climate_zone", req.zone).field("climate_zone_from", u.zone_from);
    json_site(j, req, s);
    if (!u.weather_pressure.empty()) j.field("weather_pressure", u.weather_pressure);
    j.field("strategies_defaulted", u.defaulted);
    j.key("strategies").begin_array();
    for (std::size_t i = 0; i < u.checks.size(); ++i) {
      const auto& c = u.checks[i];
      j.begin_object();
      j.field("name", u.strategies[i].name);
      j.field("verdict", codes::verdict_word(c.verdict));
      j.key("control");
      if (c.matched) j.value(c.matched->control);
      else j.null();
      j.field("conditions", conditions_text(u.strategies[i], s));
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
    return json_close(j, e, u.economizer);
  }

  Notes notes;
  std::vector<const codes::Row*> rows;
  report::Table t({{"strategy", report::Align::left},
                   {"control type", report::Align::left},
                   {"verdict", report::Align::left},
                   {"clause", report::Align::left},
                   {"notes", report::Align::left}});
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
  std::string out = f == Format::md ? fmt::format("# Economizer high-limit compliance: {}\n\n", report::markdown_escape(u.unit_path))
                                    : "limitline code — high-limit compliance of a unit\n\n";
  std::vector<std::pair<std::string, std::string>> items{
      {"Unit", u.unit_path},
      {"Energy code", fmt::format("{} ({}; from {})", e.id, e.title, u.edition_from)},
      {"Climate zone", fmt::format("{} (from {})", req.zone, u.zone_from)},
      {"Site", pressure_text(req.pressure_kpa, s)},
      {"Compared in", fmt::format("{} figures", compare_name(req.compare_in))}};
  if (!u.weather_pressure.empty()) items.emplace_back("Weather pressure", u.weather_pressure);
  out += facts(f, items);
  if (u.defaulted)
    out += "\nThe unit file has no [[strategy]]: every preset at its common-practice settings "
           "is judged.\n";
  out += "\n" + heading(f, "Verdicts") + render(f, t);
  out += "\n" + heading(f, "Details") + detail;
  out += integration_text(f, e, u.economizer, "the unit's");
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
                   std::optional<System> compare_in, System s, Format f) {
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
    for (const auto& z : e.zones) reqs.emplace(std::pair{&e, z}, codes::requirements(e, z, {p, compare_in}));
  auto find = [&](const codes::Edition* e, const std::string& z) -> const codes::ZoneRequirements* {
    auto it = reqs.find({e, z});
    return it == reqs.end() ? nullptr : &it->second;
  };

  if (f == Format::json) {
    report::Json j;
    j.begin_object();
    j.key(fmt::format("site_pressure_{}", units::key_suffix(Kind::pressure, s)));
    if (p) j.value(units::to_display(Kind::pressure, s, *p), 6);
    else j.null();
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
            const auto it = std::find_if(req->allowed.begin(), req->allowed.end(),
                                         [&](const AllowedControl& c) { return c.row->control == control; });
            if (it == req->allowed.end()) {
              const bool listed = e->row(control, std::string(z)) != nullptr;
              j.begin_object().field("permission", listed ? "prohibited" : "not-listed").end_object();
              continue;
            }
            j.begin_object().field("permission", "allowed").field("modelled", it->row->modelled);
            j.key("settings").begin_object();
            for (const auto& r : it->settings)
              j.field(codes::setting_key(r.quantity, r.reference, s),
                      units::to_display(codes::setting_kind(r.quantity, r.reference), s, r.value), 6);
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
    std::vector<report::Column> cols = {{"zone", report::Align::left},
                                        {"control", report::Align::left}};
    for (const auto* e : g.editions) cols.push_back({e->id, report::Align::left});
    report::Table t(cols);
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
    out += "\n" + heading(f, fmt::format("Zones: {}", codes::zone_system_name(g.system))) + render(f, t);
  }
  out += "\n" + heading(f, "Provenance");
  const std::string bullet = f == Format::md ? "- " : "  ";
  for (const auto& e : tables.editions())
    out += fmt::format("{}{}: {} ({})\n", bullet, e.id, e.provenance, e.sources.front());
  return out + cautions(f);
}

std::string editions_list(const codes::CodeTables& tables, Format f) {
  if (f == Format::json) {
    report::Json j;
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
  report::Table t({{"edition", report::Align::left}, {"title", report::Align::left},
                   {"zones", report::Align::left}, {"tables", report::Align::left}});
  for (const auto& e : tables.editions()) {
    std::string src;
    for (const auto& s : e.sources) src += (src.empty() ? "" : " + ") + s;
    t.add_row({e.id, e.title,
               fmt::format("{} ({} to {})", e.zones.size(), e.zones.front(), e.zones.back()), src});
  }
  return heading(f, "Code editions loaded") + render(f, t) + cautions(f);
}

}  // namespace

int run_code(const std::vector<std::string>& args) {
  const std::string economizer_help =
      names_in(airside::economizer_names(), " or ") + ": checked against the edition";
  po::options_description options("options");
  options.add_options()
      ("unit", po::value<std::string>(), "unit file (TOML) whose strategies are judged")
      ("edition", po::value<std::string>(), "code edition, e.g. ashrae-90.1-2019, iecc-2021, title24-2022")
      ("zone", po::value<std::string>(), "climate zone, e.g. 4A, 7, CZ12")
      ("elevation", po::value<std::string>(), "site elevation for the standard pressure (6000ft, 1830m)")
      ("pressure", po::value<std::string>(), "site pressure (11.8psia, 81.2kPa)")
      ("economizer", po::value<std::string>(), economizer_help.c_str())
      ("all-editions", po::bool_switch(), "matrix, zone x edition, of what is allowed")
      ("list-editions", po::bool_switch(), "list the loaded editions and their files")
      ("code-table", po::value<std::vector<std::string>>()->composing(),
       "extra code table or amendment (TOML), repeatable")
      ("compare-in", po::value<std::string>(), "which table figures verdicts compare with: ip or si (default: the edition's governing units)");
  add_common_options(options, "text, json, md");
  po::positional_options_description positional;
  positional.add("unit", 1);
  po::variables_map vm;
  if (!parse_options(args, options, positional,
                     "limitline code (--edition ID --zone ZONE | UNIT.toml | --all-editions | "
                     "--list-editions) [options]",
                     details(), vm))
    return 0;
  const Common common = read_common(vm, {Format::text, Format::json, Format::md});
  const bool all = vm["all-editions"].as<bool>(), list = vm["list-editions"].as<bool>();
  const bool unit = vm.count("unit") > 0;
  if (static_cast<int>(all) + static_cast<int>(list) + static_cast<int>(unit) > 1)
    throw UsageError("give one of a unit file, --all-editions or --list-editions");
  if ((all || list) && (vm.count("edition") || vm.count("zone")))
    throw UsageError("--all-editions and --list-editions cover every edition and zone; drop "
                     "--edition and --zone");
  if (!unit && !all && !list && !(vm.count("edition") && vm.count("zone")))
    throw UsageError("give --edition and --zone, a unit file, --all-editions or --list-editions");
  std::optional<System> compare_in;
  if (vm.count("compare-in"))
    compare_in = system_option(vm["compare-in"].as<std::string>(), "--compare-in");
  std::optional<airside::EconomizerType> economizer;
  if (vm.count("economizer")) economizer = parse_economizer(vm["economizer"].as<std::string>());

  std::vector<std::filesystem::path> extra;
  if (vm.count("code-table"))
    for (const auto& f : vm["code-table"].as<std::vector<std::string>>()) extra.emplace_back(f);
  const codes::CodeTables tables = codes::CodeTables::load_installed(extra);
  // The unit file, when given, is read first: its units set the display and the reading of
  // bare numbers such as --elevation 1500 unless --units is given.
  std::optional<UnitFile> unit_file;
  std::vector<std::string> warnings;
  if (unit) {
    unit_file = load_unit_file(vm["unit"].as<std::string>());
    warnings = unit_file->warnings;
  }
  const System s = unit_file ? common.units.resolve(*unit_file) : common.units.resolve();
  std::optional<double> pressure = site_pressure_option(vm, s, warnings);
  report_warnings(warnings, common.strict);

  if (list) {
    write_out(editions_list(tables, common.format));
    return 0;
  }
  if (all) {
    write_out(matrix(tables, pressure, compare_in, s, common.format));
    return 0;
  }
  if (!unit) {
    const auto& e = tables.edition(vm["edition"].as<std::string>(), "--edition");
    const auto req = codes::requirements(e, vm["zone"].as<std::string>(), {pressure, compare_in}, "--zone");
    write_out(zone_listing(req, s, common.format, economizer));
    return 0;
  }

  const UnitFile& file = *unit_file;
  UnitVerdicts u;
  u.unit_path = file.path;
  std::string edition_id = file.site.energy_code, zone = file.site.climate_zone;
  std::string edition_origin = file.site.energy_code_origin, zone_origin = file.site.climate_zone_origin;
  if (vm.count("edition")) edition_id = vm["edition"].as<std::string>(), edition_origin = "--edition";
  if (vm.count("zone")) zone = vm["zone"].as<std::string>(), zone_origin = "--zone";
  if (edition_id.empty())
    throw InputError(fmt::format("{}: [site] has no energy_code; add one (e.g. energy_code = "
                                 "\"ashrae-90.1-2019\") or give --edition", file.path));
  if (zone.empty())
    throw InputError(fmt::format("{}: [site] has no climate_zone; add one (e.g. climate_zone = "
                                 "\"4A\") or give --zone", file.path));
  u.edition_from = edition_origin;
  u.zone_from = zone_origin;
  if (!pressure && (file.site.pressure_kpa || file.site.elevation_m))
    pressure = file.site.design_pressure_kpa();
  // The unit's own weather file, when it has a pressure column: say which pressure the
  // altitude footnote used beside the file's, and warn when they disagree.
  if (file.weather && file.weather->contains("file")) {
    std::string label;
    weather::WeatherSeries w;
    try {
      w = read_unit_weather(file, label);
    } catch (const InputError& error) {
      // The verdicts need no weather: a file that cannot be read is said, not fatal.
      u.weather_pressure = fmt::format("not compared: {}", error.what());
    }
    if (w.info.median_pressure_kpa) {
      u.weather_pressure = fmt::format(
          "the altitude footnote used {} ({}); the weather file {} has a median station "
          "pressure of {}",
          units::format(Kind::pressure, s, pressure.value_or(psychro::kStandardPressureKpa), s == System::ip ? 2 : 1),
          vm.count("elevation") || vm.count("pressure") ? "from the command line"
          : pressure ? "from the unit's [site]"
                     : "sea level: the unit gives no elevation",
          label, pressure_text(*w.info.median_pressure_kpa, s));
      std::vector<std::string> warnings;
      if (auto warning = site_pressure_warning(file, w.info)) warnings.push_back(*warning);
      report_warnings(warnings, common.strict);
    }
  }
  const auto& e = tables.edition(edition_id, edition_origin);
  const auto req = codes::requirements(e, zone, {pressure, compare_in}, zone_origin);
  u.req = &req;
  u.strategies = strategies_or_presets(file);
  u.defaulted = file.strategies_defaulted;
  u.economizer = economizer.value_or(file.air_handler.economizer);
  for (const auto& st : u.strategies) u.checks.push_back(codes::check_strategy(req, st));
  write_out(unit_report(u, s, common.format));
  return 0;
}

}  // namespace limitline::cli
