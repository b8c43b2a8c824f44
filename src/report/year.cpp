#include <limitline/report/year.hpp>

#include <limitline/report/cautions.hpp>
#include <limitline/report/json.hpp>
#include <limitline/report/table.hpp>

#include <fmt/format.h>

#include <cmath>

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
    {"energy", &annual::Totals::energy_kwh, true},
    {"harmful_hours", &annual::Totals::harmful_hours, false},
    {"harmful", &annual::Totals::harmful_kwh, true},
    {"missed_hours", &annual::Totals::missed_hours, false},
    {"missed", &annual::Totals::missed_kwh, true},
};

void json_energy(Json& j, std::string_view stem, double kwh, units::System s) {
  j.field(fmt::format("{}_kwh", stem), kwh, 8);
  if (s == units::System::ip) {
    j.field(fmt::format("{}_kbtu", stem), kwh * kKbtuPerKwh, 8);
    if (stem == "cooling") j.field("cooling_ton_hours", kwh * kTonHoursPerKwh, 8);
  }
}

void json_totals(Json& j, const annual::Totals& t, units::System s) {
  for (const auto& f : kTotalsFields) {
    if (f.is_energy)
      json_energy(j, f.key, t.*f.member, s);
    else
      j.field(f.key, t.*f.member, 8);
  }
}

std::vector<const annual::StrategyResult*> all_rows(const annual::YearResult& y) {
  std::vector<const annual::StrategyResult*> rows;
  for (const auto& s : y.strategies) rows.push_back(&s);
  rows.push_back(&y.perfect_changeover);
  rows.push_back(&y.optimal_damper);
  rows.push_back(&y.no_economizer);
  return rows;
}

Table ranked_table(const annual::YearResult& y, const YearContext& c) {
  const auto s = c.units;
  const std::string eu(energy_unit(s));
  const std::string cu = s == units::System::ip ? "ton-h" : "kWh";
  std::vector<Column> cols = {
      {"#", Align::right},
      {"strategy", Align::left},
      {"shortfall " + eu, Align::right},
      {"harmful h", Align::right},
      {"harmful " + eu, Align::right},
      {"missed h", Align::right},
      {"missed " + eu, Align::right},
      {"economizing h", Align::right},
      {"free-cooling h", Align::right},
      {"cooling " + cu, Align::right},
      {"heating " + eu, Align::right},
      {"savings " + eu, Align::right},
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
    std::vector<std::string> row = {
        r->kind == annual::Kind::strategy ? std::to_string(++rank) : "ref",
        r->name,
        energy(r->shortfall_vs_perfect_kwh, s),
        r->kind == annual::Kind::strategy || r->kind == annual::Kind::no_economizer
            ? num(a.harmful_hours)
            : "-",
        r->kind == annual::Kind::strategy || r->kind == annual::Kind::no_economizer
            ? energy(a.harmful_kwh, s)
            : "-",
        r->kind == annual::Kind::strategy || r->kind == annual::Kind::no_economizer
            ? num(a.missed_hours)
            : "-",
        r->kind == annual::Kind::strategy || r->kind == annual::Kind::no_economizer
            ? energy(a.missed_kwh, s)
            : "-",
        num(a.hours_economizing),
        num(a.hours_free_cooling),
        num(cooling),
        energy(a.heating_kwh, s),
        energy(r->savings_vs_no_economizer_kwh, s),
    };
    if (with_code) {
      const auto it = c.compliance.find(r->name);
      row.push_back(it == c.compliance.end() ? "" : it->second);
    }
    t.add_row(std::move(row));
  }
  return t;
}

Table monthly_table(const annual::YearResult& y, double annual::Totals::*member, bool energy_kind,
                    units::System s) {
  std::vector<Column> cols = {{"strategy", Align::left}};
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

// The findings in sentences: the best strategy and what each wrong decision costs.
std::vector<std::string> findings(const annual::YearResult& y, const YearContext& c) {
  std::vector<std::string> out;
  const std::string eu(energy_unit(c.units));
  const double possible = y.perfect_changeover.savings_vs_no_economizer_kwh;
  if (const auto* best = y.best()) {
    std::string line = fmt::format(
        "Best high-limit for this climate and unit: {} — {} {} short of the perfect changeover",
        best->name, energy(best->shortfall_vs_perfect_kwh, c.units), eu);
    if (possible > 1e-9)
      line += fmt::format(" ({:.0f}% of the savings a perfect changeover would get)",
                          100.0 * best->savings_vs_no_economizer_kwh / possible);
    out.push_back(line + ".");
  }
  for (const auto& r : y.strategies) {
    out.push_back(fmt::format(
        "{}: {} harmful hours (economizing when it should not) cost {} {}; {} missed hours "
        "(not economizing when it should) cost {} {}.",
        r.name, num(r.annual.harmful_hours), energy(r.annual.harmful_kwh, c.units), eu,
        num(r.annual.missed_hours), energy(r.annual.missed_kwh, c.units), eu));
  }
  if (y.optimal_damper.shortfall_vs_perfect_kwh < -1e-9)
    out.push_back(
        fmt::format("An ideally modulated damper would save a further {} {} beyond any changeover.",
                    energy(-y.optimal_damper.shortfall_vs_perfect_kwh, c.units), eu));
  return out;
}

std::vector<std::string> header_lines(const annual::YearResult& y, const YearContext& c) {
  std::vector<std::string> out = context_lines(c);
  out.push_back(fmt::format("Fan-on hours: {} of {} in the weather year", num(y.operating_hours),
                            num(y.total_hours)));
  if (!c.code_label.empty()) out.push_back(fmt::format("Energy code: {}", c.code_label));
  return out;
}

}  // namespace

void json_context(Json& j, const YearContext& c) {
  j.field("title", c.title);
  j.field("unit_file", c.unit_source);
  j.field("site", c.site);
  j.field("weather", c.weather_source);
  j.key("weather_notes").begin_array();
  for (const auto& n : c.weather_notes) j.value(n);
  j.end_array();
  j.field("schedule", c.schedule);
  j.field("units", std::string(units::system_name(c.units)));
  j.key("warnings").begin_array();
  for (const auto& w : c.warnings) j.value(w);
  j.end_array();
}

std::vector<std::string> context_lines(const YearContext& c) {
  std::vector<std::string> out;
  out.push_back(fmt::format("Unit: {}", c.unit_source));
  if (!c.site.empty()) out.push_back(fmt::format("Site: {}", c.site));
  out.push_back(fmt::format("Weather: {}", c.weather_source));
  for (const auto& n : c.weather_notes) out.push_back("  " + n);
  out.push_back(fmt::format("Schedule: {}", c.schedule));
  for (const auto& w : c.warnings) out.push_back("Warning: " + w);
  return out;
}

double energy_display(double kwh, units::System s) {
  return s == units::System::ip ? kwh * kKbtuPerKwh : kwh;
}
std::string_view energy_unit(units::System s) { return s == units::System::ip ? "kBtu" : "kWh"; }

std::string year_text(const annual::YearResult& y, const YearContext& c) {
  std::string out = fmt::format("limitline year — {}\n\n", c.title);
  for (const auto& l : header_lines(y, c)) out += l + "\n";
  out += fmt::format(
      "\nStrategies ranked by energy shortfall against the perfect changeover (weighted coil "
      "cooling + heating, {}):\n\n",
      energy_unit(c.units));
  out += ranked_table(y, c).text();
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
  out += monthly_table(y, &annual::Totals::hours_economizing, false, c.units).text();
  out += "\nHarmful hours by month:\n\n";
  out += monthly_table(y, &annual::Totals::harmful_hours, false, c.units).text();
  out += "\nMissed hours by month:\n\n";
  out += monthly_table(y, &annual::Totals::missed_hours, false, c.units).text();
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
                     energy_unit(c.units));
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
  std::vector<Column> cols = {{"strategy", Align::left}, {"kind", Align::left}};
  std::vector<std::string> keys;
  for (const auto& f : kTotalsFields) {
    if (!f.is_energy) {
      keys.emplace_back(f.key);
      continue;
    }
    keys.push_back(fmt::format("{}_kwh", f.key));
    if (c.units == units::System::ip) {
      keys.push_back(fmt::format("{}_kbtu", f.key));
      if (f.key == "cooling") keys.emplace_back("cooling_ton_hours");
    }
  }
  for (const char* k : {"savings_vs_no_economizer", "shortfall_vs_perfect"}) {
    keys.push_back(fmt::format("{}_kwh", k));
    if (c.units == units::System::ip) keys.push_back(fmt::format("{}_kbtu", k));
  }
  for (const auto& k : keys) cols.push_back({k, Align::right});
  Table t(cols);
  for (const auto* r : all_rows(y)) {
    std::vector<std::string> row = {r->name,
                                    r->kind == annual::Kind::strategy ? "strategy" : "reference"};
    auto put = [&](double v) { row.push_back(fmt::format("{:.8g}", v == 0.0 ? 0.0 : v)); };
    for (const auto& f : kTotalsFields) {
      const double v = r->annual.*f.member;
      put(v);
      if (f.is_energy && c.units == units::System::ip) {
        put(v * kKbtuPerKwh);
        if (f.key == "cooling") put(v * kTonHoursPerKwh);
      }
    }
    for (double v : {r->savings_vs_no_economizer_kwh, r->shortfall_vs_perfect_kwh}) {
      put(v);
      if (c.units == units::System::ip) put(v * kKbtuPerKwh);
    }
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
  if (!c.code_label.empty()) j.field("energy_code", c.code_label);
  j.key("ranking").begin_array();
  for (const auto& r : y.strategies) j.value(r.name);
  j.end_array();
  if (const auto* b = y.best())
    j.field("best", b->name);
  else
    j.key("best").null();
  j.key("results").begin_object();
  for (const auto* r : all_rows(y)) {
    j.key(r->name).begin_object();
    j.field("kind", r->kind == annual::Kind::strategy ? "strategy" : "reference");
    if (const auto it = c.strategy_descriptions.find(r->name); it != c.strategy_descriptions.end())
      j.field("description", it->second);
    if (const auto it = c.compliance.find(r->name); it != c.compliance.end())
      j.field("compliance", it->second);
    json_totals(j, r->annual, c.units);
    json_energy(j, "savings_vs_no_economizer", r->savings_vs_no_economizer_kwh, c.units);
    json_energy(j, "shortfall_vs_perfect", r->shortfall_vs_perfect_kwh, c.units);
    j.key("monthly").begin_array();
    for (std::size_t m = 0; m < 12; ++m) {
      j.begin_object();
      j.field("month", static_cast<int>(m + 1));
      json_totals(j, r->monthly[m], c.units);
      j.end_object();
    }
    j.end_array();
    j.end_object();
  }
  j.end_object();
  j.key("cautions").begin_array();
  for (const auto& s : cautions(CautionTopic::design)) j.value(s);
  j.end_array();
  j.end_object();
  return j.str();
}

}  // namespace limitline::report
