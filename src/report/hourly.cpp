#include <limitline/report/hourly.hpp>

#include <limitline/model/psychro.hpp>
#include <limitline/report/table.hpp>

#include <fmt/format.h>

#include <ostream>
#include <stdexcept>

namespace limitline::report {
namespace {

using units::Kind;

std::string key(std::string_view stem, Kind k, units::System s) {
  return fmt::format("{}_{}", stem, units::key_suffix(k, s));
}

void cell(std::string& line, double v, int precision = 6) {
  if (v == 0.0) v = 0.0;
  fmt::format_to(std::back_inserter(line), ",{:.{}g}", v, precision);
}

}  // namespace

void write_hourly_csv(std::ostream& out, std::span<const annual::OutdoorInterval> weather,
                      const annual::Prepared& prepared, const annual::YearResult& year,
                      units::System s) {
  std::vector<const annual::StrategyResult*> rows;
  for (const auto& r : year.strategies) rows.push_back(&r);
  rows.push_back(&year.perfect_changeover);
  rows.push_back(&year.optimal_damper);
  rows.push_back(&year.no_economizer);
  for (const auto* r : rows)
    if (r->enabled_by_interval.size() != prepared.intervals.size())
      throw std::logic_error("write_hourly_csv: decisions were not kept");

  const std::string eu = s == units::System::ip ? "kbtu" : "kwh";
  const double per_kwh = s == units::System::ip ? 3.412141633 : 1.0;
  std::string line =
      "month,day,hour,minute,fan_on_hours," + key("outdoor_dry_bulb", Kind::temperature, s) +
      ",outdoor_humidity_ratio," + key("outdoor_enthalpy", Kind::enthalpy, s) + "," +
      key("outdoor_dew_point", Kind::temperature, s) + "," + key("pressure", Kind::pressure, s) +
      "," + key("return_dry_bulb", Kind::temperature, s) + "," +
      key("return_enthalpy", Kind::enthalpy, s) + ",return_humidity_ratio," +
      key("supply_airflow", Kind::airflow, s) + "," + key("supply_temp", Kind::temperature, s) +
      ",min_oa_pct," + key("zone_heating", Kind::energy, s) + ",cooling_needed";
  for (const auto* r : rows) {
    const std::string n = r->name;
    line += fmt::format(
        ",{0}:enabled,{0}:oa_pct,{0}:cooling_{1},{0}:heating_{1},{0}:return_humidity_ratio,"
        "{0}:verdict",
        csv_field(n), eu);
  }
  line += '\n';

  std::size_t next = 0;  // next prepared interval
  for (std::size_t i = 0; i < weather.size(); ++i) {
    const auto& w = weather[i];
    fmt::format_to(std::back_inserter(line), "{},{},{},{}", w.month, w.day, w.start_min / 60,
                   w.start_min % 60);
    const bool on = next < prepared.intervals.size() && prepared.intervals[next].source_index == i;
    if (!on) {
      line += ",0";
      cell(line, units::to_display(Kind::temperature, s, w.dry_bulb_c));
      cell(line, w.humidity_ratio);
      cell(line, units::to_display(Kind::enthalpy, s,
                                   psychro::enthalpy_kj_per_kg(w.dry_bulb_c, w.humidity_ratio)));
      line += ",";  // dew point is computed for fan-on intervals only
      cell(line, units::to_display(Kind::pressure, s, w.pressure_kpa));
      line += ",,,,,,,,";
      for (std::size_t k = 0; k < rows.size(); ++k) line += ",,,,,,";
      line += '\n';
    } else {
      const auto& iv = prepared.intervals[next];
      cell(line, iv.hours);
      cell(line, units::to_display(Kind::temperature, s, w.dry_bulb_c));
      cell(line, w.humidity_ratio);
      cell(line, units::to_display(Kind::enthalpy, s, iv.outdoor[highlimit::Quantity::enthalpy]));
      if (prepared.has_dew_point)
        cell(line,
             units::to_display(Kind::temperature, s, iv.outdoor[highlimit::Quantity::dew_point]));
      else
        line += ",";
      cell(line, units::to_display(Kind::pressure, s, w.pressure_kpa));
      cell(line, units::to_display(Kind::temperature, s, iv.ret[highlimit::Quantity::dry_bulb]));
      cell(line, units::to_display(Kind::enthalpy, s, iv.ret[highlimit::Quantity::enthalpy]));
      cell(line, iv.ret[highlimit::Quantity::humidity_ratio]);
      cell(line, units::to_display(Kind::airflow, s, iv.airflow_m3_per_s));
      cell(line, units::to_display(Kind::temperature, s, iv.supply_temp_c));
      cell(line, iv.min_oa_fraction * 100.0, 5);
      cell(line, iv.zone_heating_kwh * per_kwh);
      line += iv.cooling_needed ? ",1" : ",0";
      for (const auto* r : rows) {
        const bool en = r->enabled_by_interval[next] != 0;
        const annual::Outcome& o = r->kind == annual::Kind::optimal_damper ? iv.optimal
                                   : en                                    ? iv.enabled
                                                                           : iv.disabled;
        line += en ? ",1" : ",0";
        cell(line, o.oa_fraction * 100.0, 5);
        cell(line, o.cooling_kwh * per_kwh);
        cell(line, o.heating_kwh * per_kwh);
        cell(line, o.return_humidity_ratio);
        const char* verdict = "right";
        if (r->kind == annual::Kind::optimal_damper)
          verdict = "modulating";
        else if (!iv.cooling_needed)
          verdict = "no-cooling-needed";
        else if (en && iv.enabling_hurts())
          verdict = "harmful";
        else if (!en && iv.enabling_pays())
          verdict = "missed";
        line += ",";
        line += verdict;
      }
      line += '\n';
      ++next;
    }
    if (line.size() > (1u << 16)) {
      out.write(line.data(), static_cast<std::streamsize>(line.size()));
      line.clear();
      if (!out) return;  // a full disk: the caller reports it from the stream
    }
  }
  out.write(line.data(), static_cast<std::streamsize>(line.size()));
}

}  // namespace limitline::report
