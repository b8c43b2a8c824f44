#include <limitline/report/year.hpp>

#include <limitline/analysis/decision.hpp>
#include <limitline/report/cautions.hpp>
#include <limitline/report/json.hpp>
#include <limitline/report/table.hpp>

#include <fmt/format.h>

#include <cmath>
#include <initializer_list>
#include <utility>

namespace limitline::report {
namespace {

constexpr double kKbtuPerKwh = 3.412141633;
constexpr double kTonHoursPerKwh = 1.0 / 3.516852842;
constexpr std::string_view kMonths[] = {"Jan", "Feb", "Mar", "Apr", "May", "Jun",
                                        "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"};

std::string num(double v, int decimals = 0) {
  if (std::fabs(v) < 0.5 * std::pow(10.0, -decimals)) v = 0.0;
  return fmt::format("{:.{}f}", v, decimals);
}

std::string energy(double kwh, units::System s) { return num(energy_display(kwh, s)); }

// The quantities of a Totals row, with their JSON keys: hours, then energy (kWh, plus kBtu
// and ton-hours in IP).
struct TotalsField {
  std::string_view key;
  double annual::Totals::*member;
  bool is_energy;
  bool is_score = false;  // in the ranking's measure: energy, or cost with a plant
};
constexpr TotalsField kTotalsFields[] = {
    {"hours_operating", &annual::Totals::hours_operating, false},
    {"hours_cooling_needed", &annual::Totals::hours_cooling_needed, false},
    {"hours_enabled", &annual::Totals::hours_enabled, false},
    {"hours_economizing", &annual::Totals::hours_economizing, false},
    {"hours_free_cooling", &annual::Totals::hours_free_cooling, false},
    {"hours_integrated", &annual::Totals::hours_integrated, false},
    {"cooling", &annual::Totals::cooling_kwh, true},
    {"sensible", &annual::Totals::sensible_kwh, true},
    {"latent", &annual::Totals::latent_kwh, true},
    {"heating", &annual::Totals::heating_kwh, true},
    {"zone_heating", &annual::Totals::zone_heating_kwh, true},
    {"energy", &annual::Totals::energy_kwh, true, true},
    {"harmful_hours", &annual::Totals::harmful_hours, false},
    {"harmful", &annual::Totals::harmful_kwh, true, true},
    {"missed_hours", &annual::Totals::missed_hours, false},
    {"missed", &annual::Totals::missed_kwh, true, true},
};

// The fields of one Totals row: hours, energies (kWh, and kBtu and ton-hours in IP), the
// ranking's figures in its measure, and with a plant the electricity and fuel behind them.
std::vector<std::pair<std::string, double>> totals_fields(const annual::Totals& t,
                                                          const YearContext& c) {
  std::vector<std::pair<std::string, double>> out;
  const Measure m(c);
  for (const auto& f : kTotalsFields) {
    const double v = t.*f.member;
    if (f.is_score && m.is_cost()) {
      for (auto& kv : m.fields(f.key, v)) out.push_back(std::move(kv));
    } else if (f.is_energy) {
      out.emplace_back(fmt::format("{}_kwh", f.key), v);
      if (c.units == units::System::ip) {
        out.emplace_back(fmt::format("{}_kbtu", f.key), v * kKbtuPerKwh);
        if (f.key == "cooling") out.emplace_back("cooling_ton_hours", v * kTonHoursPerKwh);
      }
    } else {
      out.emplace_back(std::string(f.key), v);
    }
  }
  if (c.plant) {
    out.emplace_back("cooling_electric_kwh", c.plant->cooling_electric_kwh(t.cooling_kwh));
    out.emplace_back("heating_fuel_kwh",
                     c.plant->heating_fuel_kwh(t.heating_kwh + t.zone_heating_kwh));
  }
  return out;
}

void json_totals(Json& j, const annual::Totals& t, const YearContext& c) {
  for (const auto& [k, v] : totals_fields(t, c)) j.field(k, v, 8);
}

void json_score(Json& j, std::string_view stem, double v, const YearContext& c) {
  for (const auto& [k, x] : Measure(c).fields(stem, v)) j.field(k, x, 8);
}

std::vector<const annual::StrategyResult*> all_rows(const annual::YearResult& y) {
  std::vector<const annual::StrategyResult*> rows;
  for (const auto& s : y.strategies) rows.push_back(&s);
  rows.push_back(&y.perfect_changeover);
  rows.push_back(&y.optimal_damper);
  rows.push_back(&y.no_economizer);
  return rows;
}

}  // namespace

Table ranked_table(const annual::YearResult& y, const YearContext& c) {
  const auto s = c.units;
  const Measure m(c);
  const std::string mu = m.unit();
  const std::string eu(energy_unit(s));
  const std::string cu = s == units::System::ip ? "ton-h" : "kWh";
  std::vector<Column> cols = {
      {"#", Align::right, true},
      {"strategy", Align::left, true},
      {"shortfall " + mu, Align::right},
      {"harmful h", Align::right},
      {"harmful " + mu, Align::right, false, 1},
      {"missed h", Align::right},
      {"missed " + mu, Align::right, false, 1},
      {"economizing h", Align::right, false, 1},
      {"free-cooling h", Align::right, false, 1},
      {"cooling " + cu, Align::right, false, 1},
      {"heating " + eu, Align::right, false, 1},
      {"savings " + mu, Align::right},
  };
  const bool with_code = !c.compliance.empty();
  if (with_code) cols.push_back({"code", Align::left});
  Table t(cols);
  int rank = 0;
  for (const auto* r : all_rows(y)) {
    if (r->kind != annual::Kind::strategy && rank >= 0) {
      t.add_rule();
      rank = -1;
    }
    const auto& a = r->annual;
    const double cooling = s == units::System::ip ? a.cooling_kwh * kTonHoursPerKwh : a.cooling_kwh;
    const bool scored = r->kind == annual::Kind::strategy || r->kind == annual::Kind::no_economizer;
    std::vector<std::string> row = {
        r->kind == annual::Kind::strategy ? std::to_string(++rank) : "ref",
        r->name,
        m.format(r->shortfall_vs_perfect_kwh),
        scored ? num(a.harmful_hours) : "-",
        scored ? m.format(a.harmful_kwh) : "-",
        scored ? num(a.missed_hours) : "-",
        scored ? m.format(a.missed_kwh) : "-",
        num(a.hours_economizing),
        num(a.hours_free_cooling),
        num(cooling),
        energy(a.heating_kwh, s),
        m.format(r->savings_vs_no_economizer_kwh),
    };
    if (with_code) {
      const auto it = c.compliance.find(r->name);
      row.push_back(it == c.compliance.end() ? "" : it->second);
    }
    t.add_row(std::move(row));
  }
  return t;
}

namespace {

Table monthly_table(const annual::YearResult& y, double annual::Totals::*member, bool energy_kind,
                    units::System s) {
  std::vector<Column> cols = {{"strategy", Align::left, true}};
  for (auto m : kMonths) cols.push_back({std::string(m), Align::right});
  cols.push_back({"year", Align::right});
  Table t(cols);
  for (const auto* r : all_rows(y)) {
    std::vector<std::string> row = {r->name};
    for (const auto& m : r->monthly)
      row.push_back(energy_kind ? energy(m.*member, s) : num(m.*member));
    row.push_back(energy_kind ? energy(r->annual.*member, s) : num(r->annual.*member));
    t.add_row(std::move(row));
  }
  return t;
}

// The candidates of the recommendation: the ranked strategies with their code words.
std::vector<decision::Candidate> candidates(const annual::YearResult& y, const YearContext& c) {
  std::vector<decision::Candidate> out;
  for (const auto& r : y.strategies) {
    const auto it = c.compliance.find(r.name);
    out.push_back({r.name, r.shortfall_vs_perfect_kwh,
                   it == c.compliance.end() ? std::string() : it->second});
  }
  return out;
}

std::string names_of(const std::vector<decision::Candidate>& c, std::span<const std::size_t> idx) {
  std::string out;
  for (std::size_t k = 0; k < idx.size(); ++k)
    out += (k == 0 ? "" : k + 1 == idx.size() ? " and " : ", ") + c[idx[k]].name;
  return out;
}

// Why the code turns a strategy down, from its compliance word.
std::string refusal(std::string_view word) {
  if (word == "not-allowed") return "the code does not allow this control type in this zone";
  if (word == "set-wrong") return "its setting is not the value the code requires in this zone";
  if (word == "not-evaluable") return "the code tables cannot judge it";
  return std::string(word);
}

}  // namespace

std::vector<std::string> recommendation_lines(const annual::YearResult& y, const YearContext& c) {
  std::vector<std::string> out;
  const Measure m(c);
  const std::string eu = m.unit();
  const double possible = y.perfect_changeover.savings_vs_no_economizer_kwh;
  const auto cands = candidates(y, c);
  const decision::Recommendation rec =
      decision::recommend(cands, decision::tie_tolerance(possible, m.is_cost()));
  if (rec.best.empty()) return out;
  const std::string tol = fmt::format(
      "{} {}: 0.5% of the perfect changeover's savings, at least {}", m.format(rec.tolerance), eu,
      m.is_cost() ? fmt::format("0.01 {}", eu) : fmt::format("1 {}", energy_unit(c.units)));
  auto share = [&](const annual::StrategyResult& r) {
    return possible > 1e-9
               ? fmt::format(" ({} of the savings a perfect changeover would get)",
                             decision::share_text(r.savings_vs_no_economizer_kwh / possible))
               : std::string();
  };
  auto pick = [&](std::string_view lead, const std::vector<std::size_t>& group) {
    const auto& r = y.strategies[group.front()];
    std::string line = fmt::format("{}: {} — {} {} short of the perfect changeover{}", lead, r.name,
                                   m.format(r.shortfall_vs_perfect_kwh), eu, share(r));
    if (group.size() > 1)
      line += fmt::format("; tied with {} (within {})",
                          names_of(cands, std::span(group).subspan(1)), tol);
    return line + ".";
  };
  if (rec.all_tied) {
    out.push_back(fmt::format(
        "Every strategy evaluated gives the same result within {}: the high-limit never acts "
        "where it matters for this climate and unit, so choose it on sensors, cost and the "
        "code.",
        tol));
    return out;
  }
  if (!rec.code_known) {
    out.push_back(pick("Best high-limit for this climate and unit", rec.best));
    return out;
  }
  if (!rec.best_compliant.empty())
    out.push_back(pick(fmt::format("Recommended, the best the code allows ({})", c.code_name),
                       rec.best_compliant));
  // Strategies as good as the recommendation that the code turns down, named so the
  // recommendation is not read as the best outright.
  if (!rec.best_compliant.empty() && !rec.best_not_allowed()) {
    std::string refused;
    for (std::size_t i : rec.best)
      if (cands[i].compliance != "complies")
        refused += fmt::format("{}{} ({})", refused.empty() ? "" : ", ", cands[i].name,
                               cands[i].compliance);
    if (!refused.empty())
      out.push_back(fmt::format("Tied with it but turned down by the code: {}.", refused));
  } else
    out.push_back(
        "None of the strategies evaluated complies with the code: `limitline code` with the "
        "unit file lists the settings it requires.");
  if (rec.best_not_allowed()) {
    const auto& r = y.strategies[rec.best.front()];
    out.push_back(fmt::format("The best overall, {} ({} {} short), is {}: {}.", r.name,
                              m.format(r.shortfall_vs_perfect_kwh), eu,
                              cands[rec.best.front()].compliance,
                              refusal(cands[rec.best.front()].compliance)));
  }
  return out;
}

namespace {

// The findings in sentences: the recommendation and what each wrong decision costs.
std::vector<std::string> findings(const annual::YearResult& y, const YearContext& c) {
  const Measure m(c);
  const std::string eu = m.unit();
  std::vector<std::string> out = recommendation_lines(y, c);
  for (const auto& r : y.strategies) {
    out.push_back(fmt::format(
        "{}: {} harmful hours (economizing when it should not) cost {} {}; {} missed hours "
        "(not economizing when it should) cost {} {}.",
        r.name, num(r.annual.harmful_hours), m.format(r.annual.harmful_kwh), eu,
        num(r.annual.missed_hours), m.format(r.annual.missed_kwh), eu));
  }
  if (y.optimal_damper.shortfall_vs_perfect_kwh < -1e-9)
    out.push_back(
        fmt::format("An ideally modulated damper would save a further {} {} beyond any changeover.",
                    m.format(-y.optimal_damper.shortfall_vs_perfect_kwh), eu));
  return out;
}

// What the model did beyond the description: hours it could not hold, and the caution of the
// design model.
std::vector<std::string> model_notes(const annual::ModelSummary& m, const YearContext& c) {
  std::vector<std::string> out;
  if (m.part_load) {
    const std::string eu(energy_unit(c.units));
    out.push_back(fmt::format(
        "  space loads over the fan-on hours: sensible {} {}, latent {} {}; zone heating {} {}",
        energy(m.space_sensible_kwh, c.units), eu, energy(m.space_latent_kwh, c.units), eu,
        energy(m.zone_heating_kwh, c.units), eu));
    if (m.hours_beyond_design > 0.0)
      out.push_back(fmt::format(
          "  in {} h the space sensible load was more than the design airflow carries at the "
          "supply temperature: the space ran warm, and those hours are priced at design "
          "airflow",
          num(m.hours_beyond_design)));
    if (m.min_airflow_hours > 0.0)
      out.push_back(
          fmt::format("  variable airflow at its floor in {} h", num(m.min_airflow_hours)));
  } else {
    out.push_back(
        "  Caution: without [loads] the unit runs at design airflow with the design return air "
        "every fan-on hour; absolute savings are an upper bound of a unit at design load, and "
        "only the ranking carries over to part load");
  }
  if (m.hours_ventilation_held > 0.0)
    out.push_back(fmt::format(
        "  in {} h the fixed outdoor airflow was more than max_outdoor_air of the supply "
        "airflow: the damper limit held it",
        num(m.hours_ventilation_held)));
  return out;
}

std::vector<std::string> header_lines(const annual::YearResult& y, const YearContext& c) {
  std::vector<std::string> out = context_lines(c);
  out.push_back(fmt::format("Fan-on hours: {} of {} in the weather year", num(y.operating_hours),
                            num(y.total_hours)));
  for (const auto& l : model_notes(y.model, c)) out.push_back(l);
  if (!c.code_label.empty()) out.push_back(fmt::format("Energy code: {}", c.code_label));
  return out;
}

}  // namespace

void json_context(Json& j, const YearContext& c) {
  j.field("title", c.title);
  j.field("unit_file", c.unit_source);
  j.field("site", c.site);
  j.field("weather", c.weather_source);
  j.strings("weather_notes", c.weather_notes);
  j.field("schedule", c.schedule);
  j.field("units", std::string(units::system_name(c.units)));
  j.field("air_handler_model", c.model);
  j.strings("warnings", c.warnings);
}

std::vector<std::string> context_lines(const YearContext& c) {
  std::vector<std::string> out;
  out.push_back(fmt::format("Unit: {}", c.unit_source));
  if (!c.site.empty()) out.push_back(fmt::format("Site: {}", c.site));
  out.push_back(fmt::format("Weather: {}", c.weather_source));
  for (const auto& n : c.weather_notes) out.push_back("  " + n);
  out.push_back(fmt::format("Schedule: {}", c.schedule));
  if (!c.model.empty()) out.push_back(fmt::format("Air handler: {}", c.model));
  for (const auto& w : c.warnings) out.push_back("Warning: " + w);
  return out;
}

double energy_display(double kwh, units::System s) {
  return s == units::System::ip ? kwh * kKbtuPerKwh : kwh;
}
std::string_view energy_unit(units::System s) { return s == units::System::ip ? "kBtu" : "kWh"; }

double Measure::display(double v) const { return is_cost() ? v : energy_display(v, s_); }
std::string Measure::format(double v) const { return num(display(v), is_cost() ? 2 : 0); }
std::string Measure::unit() const { return is_cost() ? currency_ : std::string(energy_unit(s_)); }
std::string Measure::basis() const {
  return is_cost()
             ? fmt::format("cost of electricity for cooling and fuel for heating, {}", currency_)
             : fmt::format("weighted coil cooling + heating, {}", energy_unit(s_));
}
std::vector<std::pair<std::string, double>> Measure::fields(std::string_view stem, double v) const {
  if (is_cost())
    return {{stem == "energy" ? std::string("cost") : fmt::format("{}_cost", stem), v}};
  std::vector<std::pair<std::string, double>> out = {{fmt::format("{}_kwh", stem), v}};
  if (s_ == units::System::ip) out.emplace_back(fmt::format("{}_kbtu", stem), v * kKbtuPerKwh);
  return out;
}

std::string describe_model(const part_load::Control& control,
                           const std::optional<part_load::Space>& space,
                           std::string_view loads_source, units::System s) {
  using units::Kind;
  auto t = [&](double c) { return units::format(Kind::temperature, s, c, 0); };
  std::string out;
  if (space) {
    out = "part load: ";
    if (control.airflow == part_load::AirflowControl::variable)
      out += fmt::format("variable airflow (floor {}) following the space sensible load",
                         units::format(Kind::fraction, s, control.min_airflow_fraction, 0));
    else
      out += "constant airflow with zone heating where the supply air over-cools the space";
    out += fmt::format(
        "; space {}, return air {} above it, its humidity from the space's latent "
        "balance; loads ",
        t(space->space_temp_c),
        units::format(Kind::temperature_difference, s, space->return_air_rise_k, 1));
    if (space->coefficients) {
      const auto& k = *space->coefficients;
      const bool ip = s == units::System::ip;
      out += fmt::format("{} internal sensible + {} per {} outdoor above the space, {} latent",
                         units::format(Kind::power, s, k.internal_sensible_kw, 0),
                         units::format(Kind::power, s,
                                       k.envelope_ua_kw_per_k * (ip ? 1.0 / 1.8 : 1.0), ip ? 2 : 1),
                         ip ? "°F" : "K", units::format(Kind::power, s, k.latent_kw, 0));
    } else {
      out += fmt::format("hour by hour from {}", loads_source);
    }
  } else {
    out = "design load: design airflow and the design return air every fan-on hour";
  }
  if (control.reset)
    out += fmt::format("; supply air reset from {} at {} outdoor to {} at {}",
                       t(control.reset->supply_at_low_c), t(control.reset->outdoor_low_c),
                       t(control.reset->supply_at_high_c), t(control.reset->outdoor_high_c));
  if (control.min_outdoor_airflow_m3_per_s)
    out += fmt::format("; ventilation a fixed {} of outdoor air",
                       units::format(Kind::airflow, s, *control.min_outdoor_airflow_m3_per_s,
                                     s == units::System::ip ? 0 : 2));
  if (control.basis == part_load::AirflowBasis::actual)
    out += "; airflow at the site's air density";
  return out;
}

std::string year_text(const annual::YearResult& y, const YearContext& c) {
  std::string out = fmt::format("limitline year — {}\n\n", c.title);
  for (const auto& l : header_lines(y, c)) out += l + "\n";
  out += fmt::format("\nStrategies ranked by shortfall against the perfect changeover ({}):\n\n",
                     Measure(c).basis());
  out += ranked_table(y, c).text(c.text_width);
  if (!c.strategy_descriptions.empty()) {
    out += "\nStrategies:\n";
    for (const auto& r : y.strategies) {
      const auto it = c.strategy_descriptions.find(r.name);
      if (it != c.strategy_descriptions.end()) out += fmt::format("  {}: {}\n", r.name, it->second);
    }
  }
  out += "\nFindings:\n";
  for (const auto& f : findings(y, c)) out += "  - " + f + "\n";
  out += "\nEconomizing hours by month:\n\n";
  out += monthly_table(y, &annual::Totals::hours_economizing, false, c.units).text(c.text_width);
  out += "\nHarmful hours by month:\n\n";
  out += monthly_table(y, &annual::Totals::harmful_hours, false, c.units).text(c.text_width);
  out += "\nMissed hours by month:\n\n";
  out += monthly_table(y, &annual::Totals::missed_hours, false, c.units).text(c.text_width);
  out += "\n" + cautions_text(CautionTopic::design);
  return out;
}

std::string year_markdown(const annual::YearResult& y, const YearContext& c) {
  // Every line below carries names from the user's files: escaped, so none reads as markup.
  std::string out =
      fmt::format("# Annual economizer high-limit evaluation — {}\n\n", markdown_escape(c.title));
  for (const auto& l : header_lines(y, c))
    out +=
        (l.starts_with("  ") ? "  - " + markdown_escape(l.substr(2)) : "- " + markdown_escape(l)) +
        "\n";
  out += fmt::format("\n## Strategies ranked by shortfall against the perfect changeover ({})\n\n",
                     markdown_escape(Measure(c).basis()));
  out += ranked_table(y, c).markdown();
  out += "\n## Findings\n\n";
  for (const auto& f : findings(y, c)) out += "- " + markdown_escape(f) + "\n";
  out += "\n## Economizing hours by month\n\n";
  out += monthly_table(y, &annual::Totals::hours_economizing, false, c.units).markdown();
  out += "\n## Harmful hours by month\n\n";
  out += monthly_table(y, &annual::Totals::harmful_hours, false, c.units).markdown();
  out += "\n## Missed hours by month\n\n";
  out += monthly_table(y, &annual::Totals::missed_hours, false, c.units).markdown();
  out += "\n" + cautions_markdown(CautionTopic::design);
  return out;
}

std::string year_csv(const annual::YearResult& y, const YearContext& c) {
  // One row per strategy and reference; the columns are the JSON result's fields, in order.
  auto fields = [&](const annual::StrategyResult& r) {
    auto f = totals_fields(r.annual, c);
    const Measure m(c);
    for (auto& kv : m.fields("savings_vs_no_economizer", r.savings_vs_no_economizer_kwh))
      f.push_back(std::move(kv));
    for (auto& kv : m.fields("shortfall_vs_perfect", r.shortfall_vs_perfect_kwh))
      f.push_back(std::move(kv));
    return f;
  };
  const auto rows = all_rows(y);
  std::vector<Column> cols = {{"strategy", Align::left}, {"kind", Align::left}};
  for (const auto& [k, v] : fields(*rows.front())) cols.push_back({k, Align::right});
  Table t(cols);
  for (const auto* r : rows) {
    std::vector<std::string> row = {r->name,
                                    r->kind == annual::Kind::strategy ? "strategy" : "reference"};
    for (const auto& [k, v] : fields(*r)) row.push_back(fmt::format("{:.8g}", v == 0.0 ? 0.0 : v));
    t.add_row(std::move(row));
  }
  return t.csv();
}

std::string year_json(const annual::YearResult& y, const YearContext& c) {
  Json j;
  j.begin_object();
  json_context(j, c);
  j.field("total_hours", y.total_hours, 8);
  j.field("operating_hours", y.operating_hours, 8);
  j.key("model").begin_object();
  j.field("description", c.model);
  j.field("part_load", y.model.part_load);
  j.field("hourly_loads", y.model.hourly_loads);
  j.field("airflow_control", std::string(part_load::airflow_control_name(y.model.airflow)));
  j.field("hours_beyond_design", y.model.hours_beyond_design, 8);
  j.field("hours_at_min_airflow", y.model.min_airflow_hours, 8);
  j.field("hours_ventilation_held", y.model.hours_ventilation_held, 8);
  for (const auto& [k, v] : std::initializer_list<std::pair<const char*, double>>{
           {"space_sensible", y.model.space_sensible_kwh},
           {"space_latent", y.model.space_latent_kwh},
           {"zone_heating", y.model.zone_heating_kwh}}) {
    j.field(fmt::format("{}_kwh", k), v, 8);
    if (c.units == units::System::ip) j.field(fmt::format("{}_kbtu", k), v * kKbtuPerKwh, 8);
  }
  j.end_object();
  j.field("ranking_basis", Measure(c).is_cost() ? "cost" : "weighted-energy");
  if (c.plant) j.field("currency", c.plant->currency);
  if (!c.code_label.empty()) j.field("energy_code", c.code_label);
  j.key("ranking").begin_array();
  for (const auto& r : y.strategies) j.value(r.name);
  j.end_array();
  if (const auto* b = y.best())
    j.field("best", b->name);
  else
    j.key("best").null();
  {
    const Measure m(c);
    const auto cands = candidates(y, c);
    const auto rec = decision::recommend(
        cands,
        decision::tie_tolerance(y.perfect_changeover.savings_vs_no_economizer_kwh, m.is_cost()));
    auto names = [&](const std::vector<std::size_t>& g) {
      j.begin_array();
      for (std::size_t i : g) j.value(cands[i].name);
      j.end_array();
    };
    j.key("recommendation").begin_object();
    for (const auto& [k, v] : m.fields("tie_tolerance", rec.tolerance)) j.field(k, v, 8);
    j.field("all_tied", rec.all_tied);
    j.key("best_group");
    names(rec.best);
    j.field("code_known", rec.code_known);
    if (rec.best_compliant.empty())
      j.key("best_compliant").null();
    else
      j.field("best_compliant", cands[rec.best_compliant.front()].name);
    j.key("best_compliant_group");
    names(rec.best_compliant);
    j.field("best_not_allowed", rec.best_not_allowed());
    j.strings("lines", recommendation_lines(y, c));
    j.end_object();
  }
  j.key("results").begin_object();
  for (const auto* r : all_rows(y)) {
    j.key(r->name).begin_object();
    j.field("kind", r->kind == annual::Kind::strategy ? "strategy" : "reference");
    if (const auto it = c.strategy_descriptions.find(r->name); it != c.strategy_descriptions.end())
      j.field("description", it->second);
    if (const auto it = c.compliance.find(r->name); it != c.compliance.end())
      j.field("compliance", it->second);
    json_totals(j, r->annual, c);
    json_score(j, "savings_vs_no_economizer", r->savings_vs_no_economizer_kwh, c);
    json_score(j, "shortfall_vs_perfect", r->shortfall_vs_perfect_kwh, c);
    j.key("monthly").begin_array();
    for (std::size_t m = 0; m < 12; ++m) {
      j.begin_object();
      j.field("month", static_cast<int>(m + 1));
      json_totals(j, r->monthly[m], c);
      j.end_object();
    }
    j.end_array();
    j.end_object();
  }
  j.end_object();
  j.strings("cautions", cautions(CautionTopic::design));
  j.end_object();
  return j.str();
}

}  // namespace limitline::report
