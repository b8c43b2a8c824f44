#include <limitline/report/sensors.hpp>

#include <limitline/report/cautions.hpp>
#include <limitline/report/json.hpp>
#include <limitline/report/table.hpp>

#include <fmt/format.h>

#include <cmath>

namespace limitline::report {
namespace {

using sensors::HumidityKind;
using sensors::Sensor;

std::string fixed(double v, int decimals) {
  if (std::fabs(v) < 0.5 * std::pow(10.0, -decimals)) v = 0.0;  // no "-0"
  return fmt::format("{:.{}f}", v, decimals);
}
std::string energy(double kwh, units::System s) { return fixed(energy_display(kwh, s), 0); }
std::string hours(double h) { return fixed(h, 0); }
std::string percent(double share) { return fmt::format("{:.0f}%", 100.0 * share); }

int decimals(units::Kind k) { return k == units::Kind::enthalpy_difference ? 2 : 1; }

// The kind the outdoor humidity sensor of a result is.
HumidityKind kind_of(const sensors::SensorSet& s) { return s.outdoor_humidity; }

std::string accuracy_key(Sensor x, HumidityKind k, units::System s) {
  return fmt::format("{}_{}", sensors::sensor_key(x, k),
                     units::key_suffix(sensors::bias_kind(x, k), s));
}

void json_energy(Json& j, std::string_view stem, double kwh, units::System s) {
  j.field(fmt::format("{}_kwh", stem), kwh, 8);
  if (s == units::System::ip) j.field(fmt::format("{}_kbtu", stem), energy_display(kwh, s), 8);
}

// --- Text sections --------------------------------------------------------------------------

std::vector<std::string> header(const SensorsReport& r) {
  const YearContext& c = *r.context;
  const sensors::StudyResult& st = *r.study;
  std::vector<std::string> out = context_lines(c);
  out.push_back(fmt::format("Readings per trial: {} fan-on intervals", st.readings_per_trial));

  const sensors::SensorSet& set = st.sensors;
  out.push_back(set.from_file
                    ? "Sensors (the unit file's [sensors] table; keys it omits take the typical "
                      "commercial figure):"
                    : "Sensors (typical commercial figures: the unit file has no [sensors] "
                      "table):");
  for (Sensor x : sensors::kSensors) {
    const bool typical = !set.from_file || !set.given[static_cast<std::size_t>(x)];
    out.push_back(fmt::format("  {:<18} {}{}", sensors::sensor_label(x, kind_of(set)),
                              format_accuracy(x, kind_of(set), at(set.accuracy, x), c.units),
                              typical && set.from_file ? "  (typical)" : ""));
  }
  out.push_back(set.distribution == sensors::BiasDistribution::uniform
                    ? "  Each trial draws one persistent bias per sensor, uniform within ± its "
                      "accuracy."
                    : "  Each trial draws one persistent bias per sensor, normal with its "
                      "accuracy as the standard deviation.");
  out.push_back(
      "  Decisions use the readings (humidity ratio, enthalpy and dew point derived from the "
      "biased dry-bulb and humidity readings at the true pressure); energy is always that of "
      "the true air.");
  out.push_back(fmt::format("Trials: {} requested, {} finished (seed {})", st.trials_requested,
                            st.trials_completed(), st.seed));
  return out;
}

using StatsMember = sensors::Stats sensors::StrategySummary::*;

Table stats_table(const sensors::StudyResult& st, StatsMember member,
                  double exact_of(const sensors::TrialOutcome&), bool is_energy, units::System s,
                  bool with_error) {
  std::vector<Column> cols = {{"#", Align::right},
                              {"strategy", Align::left},
                              {"exact sensors", Align::right},
                              {"mean", Align::right}};
  if (with_error) cols.push_back({"± s.e.", Align::right});
  for (const char* t : {"P10", "P50", "P90", "worst"}) cols.push_back({t, Align::right});
  Table t(cols);
  auto show = [&](double v) { return is_energy ? energy(v, s) : hours(v); };
  int rank = 0;
  for (const auto& x : st.ranked) {
    const sensors::Stats& v = x.*member;
    std::vector<std::string> row = {std::to_string(++rank), x.name, show(exact_of(x.exact)),
                                    show(v.mean)};
    if (with_error) row.push_back(show(v.std_error));
    for (double q : {v.p10, v.p50, v.p90, v.worst}) row.push_back(show(q));
    t.add_row(std::move(row));
  }
  return t;
}

double exact_shortfall(const sensors::TrialOutcome& o) { return o.shortfall_kwh; }
double exact_harmful(const sensors::TrialOutcome& o) { return o.harmful_hours; }
double exact_missed(const sensors::TrialOutcome& o) { return o.missed_hours; }

Table beats_table(const sensors::StudyResult& st) {
  std::vector<Column> cols = {{"#", Align::right}, {"strategy", Align::left}};
  for (std::size_t i = 0; i < st.ranked.size(); ++i)
    cols.push_back({std::to_string(i + 1), Align::right});
  Table t(cols);
  for (std::size_t a = 0; a < st.ranked.size(); ++a) {
    std::vector<std::string> row = {std::to_string(a + 1), st.ranked[a].name};
    for (std::size_t b = 0; b < st.ranked.size(); ++b)
      row.push_back(a == b ? "-" : percent(st.beats[st.ranked[a].index][st.ranked[b].index]));
    t.add_row(std::move(row));
  }
  return t;
}

std::string clamp_line(const SensorsReport& r) {
  const sensors::StudyResult& st = *r.study;
  if (!r.uses_humidity) return "Humidity readings: no strategy reads a humidity sensor.\n";
  std::uint64_t outdoor = 0, ret = 0;
  for (const auto& c : st.trial_clamps) outdoor += c.outdoor, ret += c.ret;
  const double n =
      static_cast<double>(st.readings_per_trial) * static_cast<double>(st.trials_completed());
  auto share = [&](std::uint64_t k) {
    return n > 0 ? fmt::format("{:.2f}%", 100.0 * static_cast<double>(k) / n) : "-";
  };
  std::string what;
  switch (kind_of(st.sensors)) {
    case HumidityKind::relative_humidity: what = "outdoor RH readings held to 0–100%"; break;
    case HumidityKind::dew_point:
      what = "outdoor dew-point readings held to the dry-bulb reading";
      break;
    case HumidityKind::enthalpy:
      what = "outdoor humidity ratios (from the enthalpy reading) held to 0–saturation";
      break;
  }
  return fmt::format(
      "Clamped readings: {} in {} of the trial-intervals; return RH readings held "
      "to 0–100% in {}.\n",
      what, share(outdoor), share(ret));
}

std::string accuracy_pair(const sensors::BreakEvenResult& be, double scale, units::System s) {
  const HumidityKind k = kind_of(be.base);
  return fmt::format(
      "{} {}, {} {}", sensors::sensor_label(Sensor::outdoor_humidity, k),
      format_accuracy(Sensor::outdoor_humidity, k, be.accuracy(Sensor::outdoor_humidity, scale), s),
      sensors::sensor_label(Sensor::return_rh, k),
      format_accuracy(Sensor::return_rh, k, be.accuracy(Sensor::return_rh, scale), s));
}

std::string break_even_text(const sensors::BreakEvenResult& be, units::System s,
                            std::size_t width) {
  if (be.pairs.empty())
    return "\nBreak-even humidity-sensor accuracy: no pair to compare; it needs a strategy that "
           "reads a humidity sensor and one that reads dry-bulb only.\n";
  std::string out = fmt::format(
      "\nBreak-even humidity-sensor accuracy: the outdoor humidity and return RH accuracies, "
      "scaled together from {} (dry-bulb sensors as above), at which the humidity-based "
      "strategy stops beating the dry-bulb-only one in mean shortfall; {} trials, searched up "
      "to {}:\n\n",
      accuracy_pair(be, 1.0, s), be.trials, accuracy_pair(be, be.max_scale, s));
  const std::string eu(energy_unit(s));
  Table t({{"uses humidity", Align::left},
           {"dry-bulb only", Align::left},
           {"beats it while within", Align::left},
           {"its shortfall with exact humidity sensors " + eu, Align::right},
           {"dry-bulb-only shortfall " + eu, Align::right}});
  for (const auto& p : be.pairs) {
    std::string verdict;
    switch (p.verdict) {
      case sensors::Verdict::crosses: verdict = accuracy_pair(be, p.scale, s); break;
      case sensors::Verdict::always: verdict = "always (every accuracy searched)"; break;
      case sensors::Verdict::never: verdict = "never (not even with exact humidity sensors)"; break;
      case sensors::Verdict::not_run: verdict = "not computed (interrupted)"; break;
    }
    const bool ran = p.verdict != sensors::Verdict::not_run;
    t.add_row({p.humid_name, p.dry_name, verdict, ran ? energy(p.humid_mean_at_zero_kwh, s) : "-",
               ran ? energy(p.dry_mean_kwh, s) : "-"});
  }
  return out + t.text(width);
}

std::string turn_text(const sensors::SweepResult& sw, const sensors::SweepTurn& t, units::System s,
                      std::string_view holds, std::string_view never) {
  const auto& spec = sw.spec;
  auto b = [&](double v) { return format_bias(spec.sensor, spec.outdoor_kind, v, s); };
  if (t.at_reference) return fmt::format("{} already at {}", holds, b(spec.biases[sw.reference]));
  if (!t.below && !t.above) return std::string(never);
  std::string where;
  if (t.below) where = fmt::format("at {}", b(*t.below));
  if (t.below && t.above) where += " and ";
  if (t.above) where += fmt::format("at {}", b(*t.above));
  return fmt::format("{} {}", holds, where);
}

std::string sweep_text(const sensors::SweepResult& sw, HumidityKind study_kind, units::System s,
                       std::size_t width) {
  const auto& spec = sw.spec;
  const std::string label(sensors::sensor_label(spec.sensor, spec.outdoor_kind));
  std::string out = fmt::format(
      "\nBias sweep: the {} sensor reads truth + bias, every other sensor reads the truth. "
      "Shortfall against the perfect changeover ({}):\n",
      label, energy_unit(s));
  if (spec.outdoor_kind != study_kind)
    out += fmt::format(
        "(The unit's outdoor humidity sensor is {}; this sweep uses an {} sensor "
        "in its place.)\n",
        sensors::sensor_label(Sensor::outdoor_humidity, study_kind), label);
  out += "\n";
  std::vector<Column> cols = {{"#", Align::right}, {"strategy", Align::left}};
  for (double v : spec.biases)
    cols.push_back({format_bias(spec.sensor, spec.outdoor_kind, v, s), Align::right});
  Table t(cols);
  for (std::size_t k = 0; k < sw.names.size(); ++k) {
    std::vector<std::string> row = {std::to_string(k + 1), sw.names[k]};
    for (std::size_t i = 0; i < spec.biases.size(); ++i)
      row.push_back(sw.completed[i] ? energy(sw.outcomes[i][k].shortfall_kwh, s) : "-");
    t.add_row(std::move(row));
  }
  t.add_rule();
  std::vector<std::string> best = {"", "best (#)"};
  for (std::size_t i = 0; i < spec.biases.size(); ++i)
    best.push_back(sw.completed[i] ? std::to_string(sw.best[i] + 1) : "-");
  t.add_row(std::move(best));
  out += t.text(width);
  if (sw.partial) out += "  (interrupted: '-' marks biases that did not run)\n";

  const bool any_dry =
      std::any_of(sw.best_dry_bulb_only_kwh.begin(), sw.best_dry_bulb_only_kwh.end(),
                  [](const auto& v) { return v.has_value(); });
  out += "\nWhere each strategy stops paying back, moving away from " +
         format_bias(spec.sensor, spec.outdoor_kind, spec.biases[sw.reference], s) + ":\n";
  for (std::size_t k = 0; k < sw.names.size(); ++k) {
    std::string line = fmt::format("  {} {}: ", k + 1, sw.names[k]);
    if (sw.humidity_based[k])
      line += any_dry ? turn_text(sw, sw.falls_behind[k], s,
                                  "falls behind the best dry-bulb-only strategy",
                                  "stays ahead of every dry-bulb-only strategy over the sweep")
                      : "no dry-bulb-only strategy to compare with";
    else
      line += "reads no humidity sensor";
    line += "; " + turn_text(sw, sw.stops_saving[k], s, "costs more than no economizer",
                             "saves energy against no economizer over the whole sweep");
    out += line + ".\n";
  }
  return out;
}

// --- JSON sections --------------------------------------------------------------------------

void json_stats(Json& j, std::string_view key, const sensors::Stats& v, double exact,
                bool is_energy, units::System s) {
  auto one = [&](std::string_view k, double scale) {
    j.key(k).begin_object();
    j.field("exact_sensors", exact * scale, 8);
    j.field("mean", v.mean * scale, 8);
    j.field("std_error", v.std_error * scale, 8);
    j.field("p10", v.p10 * scale, 8);
    j.field("p50", v.p50 * scale, 8);
    j.field("p90", v.p90 * scale, 8);
    j.field("worst", v.worst * scale, 8);
    j.end_object();
  };
  if (!is_energy) return one(key, 1.0);
  one(fmt::format("{}_kwh", key), 1.0);
  if (s == units::System::ip) one(fmt::format("{}_kbtu", key), energy_display(1.0, s));
}

void json_accuracies(Json& j, const sensors::BreakEvenResult& be, double scale, units::System s) {
  const HumidityKind k = kind_of(be.base);
  for (Sensor x : {Sensor::outdoor_humidity, Sensor::return_rh})
    j.field(accuracy_key(x, k, s),
            units::to_display(sensors::bias_kind(x, k), s, be.accuracy(x, scale)), 8);
}

void json_break_even(Json& j, const sensors::BreakEvenResult& be, units::System s) {
  j.key("break_even").begin_object();
  j.field("trials", be.trials);
  j.field("partial", be.partial);
  j.key("base_accuracy").begin_object();
  json_accuracies(j, be, 1.0, s);
  j.end_object();
  j.key("searched_up_to").begin_object();
  json_accuracies(j, be, be.max_scale, s);
  j.end_object();
  j.key("pairs").begin_array();
  for (const auto& p : be.pairs) {
    j.begin_object();
    j.field("humidity_strategy", p.humid_name);
    j.field("dry_bulb_strategy", p.dry_name);
    j.field("verdict", std::string(sensors::verdict_name(p.verdict)));
    if (p.verdict == sensors::Verdict::crosses) {
      j.field("scale", p.scale, 8);
      j.key("break_even_accuracy").begin_object();
      json_accuracies(j, be, p.scale, s);
      j.end_object();
    } else {
      j.key("scale").null();
      j.key("break_even_accuracy").null();
    }
    if (p.verdict != sensors::Verdict::not_run) {
      json_energy(j, "humidity_strategy_shortfall_exact_humidity", p.humid_mean_at_zero_kwh, s);
      json_energy(j, "humidity_strategy_shortfall_at_search_limit", p.humid_mean_at_max_kwh, s);
      json_energy(j, "dry_bulb_strategy_shortfall", p.dry_mean_kwh, s);
    }
    j.end_object();
  }
  j.end_array();
  j.end_object();
}

void json_turn(Json& j, std::string_view key, const sensors::SweepResult& sw,
               const sensors::SweepTurn& t, units::System s) {
  const units::Kind k = sensors::bias_kind(sw.spec.sensor, sw.spec.outdoor_kind);
  j.key(key).begin_object();
  j.field("at_reference", t.at_reference);
  for (auto [name, v] : {std::pair{"below", t.below}, std::pair{"above", t.above}}) {
    j.key(name);
    if (v)
      j.value(units::to_display(k, s, *v), 8);
    else
      j.null();
  }
  j.end_object();
}

void json_sweep(Json& j, const sensors::SweepResult& sw, units::System s) {
  const auto& spec = sw.spec;
  const units::Kind k = sensors::bias_kind(spec.sensor, spec.outdoor_kind);
  j.key("sweep").begin_object();
  j.field("sensor", std::string(sensors::sensor_key(spec.sensor, spec.outdoor_kind)));
  j.field("partial", sw.partial);
  j.key(fmt::format("bias_{}", units::key_suffix(k, s))).begin_array();
  for (double v : spec.biases) j.value(units::to_display(k, s, v), 8);
  j.end_array();
  j.key("best").begin_array();
  for (std::size_t i = 0; i < spec.biases.size(); ++i)
    if (sw.completed[i])
      j.value(sw.names[sw.best[i]]);
    else
      j.null();
  j.end_array();
  j.key("strategies").begin_object();
  for (std::size_t n = 0; n < sw.names.size(); ++n) {
    j.key(sw.names[n]).begin_object();
    auto series = [&](std::string_view key, auto value) {
      j.key(key).begin_array();
      for (std::size_t i = 0; i < spec.biases.size(); ++i)
        if (sw.completed[i])
          j.value(value(sw.outcomes[i][n]), 8);
        else
          j.null();
      j.end_array();
    };
    series("shortfall_kwh", [](const sensors::TrialOutcome& o) { return o.shortfall_kwh; });
    if (s == units::System::ip)
      series("shortfall_kbtu",
             [&](const sensors::TrialOutcome& o) { return energy_display(o.shortfall_kwh, s); });
    series("harmful_hours", [](const sensors::TrialOutcome& o) { return o.harmful_hours; });
    series("missed_hours", [](const sensors::TrialOutcome& o) { return o.missed_hours; });
    j.field("uses_humidity", sw.humidity_based[n] != 0);
    if (sw.humidity_based[n]) json_turn(j, "falls_behind_dry_bulb_only", sw, sw.falls_behind[n], s);
    json_turn(j, "costs_more_than_no_economizer", sw, sw.stops_saving[n], s);
    j.end_object();
  }
  j.end_object();
  j.end_object();
}

}  // namespace

std::string format_accuracy(Sensor x, HumidityKind k, double si, units::System u) {
  const units::Kind kind = sensors::bias_kind(x, k);
  return "±" + units::format(kind, u, si, decimals(kind));
}

std::string format_bias(Sensor x, HumidityKind k, double si, units::System u) {
  const units::Kind kind = sensors::bias_kind(x, k);
  const int d = decimals(kind);
  const bool positive = units::to_display(kind, u, si) >= 0.5 * std::pow(10.0, -d);
  return (positive ? "+" : "") + units::format(kind, u, si, d);
}

std::string sensors_text(const SensorsReport& r) {
  const sensors::StudyResult& st = *r.study;
  const units::System s = r.context->units;
  std::string out = fmt::format("limitline sensors — {}\n\n", r.context->title);
  for (const auto& l : header(r)) out += l + "\n";
  if (!r.interrupted_note.empty()) out += "\n*** " + r.interrupted_note + " ***\n";
  if (st.trials_completed() == 0) {
    out += "\nNo trial finished: there is nothing to report.\n";
    return out + "\n" + cautions_text(CautionTopic::design);
  }
  const std::string eu(energy_unit(s));
  out += fmt::format(
      "\nAnnual shortfall against the perfect changeover ({}; weighted coil cooling + heating; "
      "ranked by the mean over the trials):\n\n",
      eu);
  out += stats_table(st, &sensors::StrategySummary::shortfall_kwh, exact_shortfall, true, s, true)
             .text(r.context->text_width);
  out += "\nHarmful hours (economizing when it costs more than not), over the trials:\n\n";
  out += stats_table(st, &sensors::StrategySummary::harmful_hours, exact_harmful, false, s, false)
             .text(r.context->text_width);
  out += "\nMissed hours (not economizing when it would save), over the trials:\n\n";
  out += stats_table(st, &sensors::StrategySummary::missed_hours, exact_missed, false, s, false)
             .text(r.context->text_width);
  out +=
      "\nShare of trials in which the row strategy has the smaller shortfall than the column "
      "strategy (same biases):\n\n";
  out += beats_table(st).text(r.context->text_width);
  if (!r.context->strategy_descriptions.empty()) {
    out += "\nStrategies:\n";
    for (const auto& x : st.ranked)
      if (const auto it = r.context->strategy_descriptions.find(x.name);
          it != r.context->strategy_descriptions.end())
        out += fmt::format("  {}: {}\n", x.name, it->second);
  }
  out += "\n" + clamp_line(r);
  if (r.break_even) out += break_even_text(*r.break_even, s, r.context->text_width);
  if (r.sweep) out += sweep_text(*r.sweep, kind_of(st.sensors), s, r.context->text_width);
  return out + "\n" + cautions_text(CautionTopic::design);
}

std::string sensors_json(const SensorsReport& r) {
  const sensors::StudyResult& st = *r.study;
  const YearContext& c = *r.context;
  const units::System s = c.units;
  const HumidityKind k = kind_of(st.sensors);
  Json j;
  j.begin_object();
  json_context(j, c);
  j.field("readings_per_trial", static_cast<long long>(st.readings_per_trial));

  j.key("sensors").begin_object();
  j.field("source", st.sensors.from_file ? "unit file" : "typical commercial figures");
  j.field("distribution", std::string(sensors::distribution_name(st.sensors.distribution)));
  j.field("outdoor_humidity_kind", std::string(sensors::humidity_kind_name(k)));
  j.key("accuracy").begin_object();
  for (Sensor x : sensors::kSensors)
    j.field(accuracy_key(x, k, s),
            units::to_display(sensors::bias_kind(x, k), s, at(st.sensors.accuracy, x)), 8);
  j.end_object();
  j.end_object();

  j.field("seed", static_cast<long long>(st.seed));
  j.field("trials_requested", st.trials_requested);
  j.field("trials_completed", st.trials_completed());
  j.field("partial", st.partial);
  j.key("ranking").begin_array();
  for (const auto& x : st.ranked) j.value(x.name);
  j.end_array();
  j.key("strategies").begin_array();
  int rank = 0;
  for (const auto& x : st.ranked) {
    j.begin_object();
    j.field("rank", ++rank);
    j.field("name", x.name);
    if (const auto it = c.strategy_descriptions.find(x.name); it != c.strategy_descriptions.end())
      j.field("description", it->second);
    json_stats(j, "shortfall", x.shortfall_kwh, x.exact.shortfall_kwh, true, s);
    json_stats(j, "harmful_hours", x.harmful_hours, x.exact.harmful_hours, false, s);
    json_stats(j, "missed_hours", x.missed_hours, x.exact.missed_hours, false, s);
    j.key("beats").begin_object();
    for (const auto& y : st.ranked)
      if (y.index != x.index) j.field(y.name, st.beats[x.index][y.index], 6);
    j.end_object();
    j.end_object();
  }
  j.end_array();

  std::uint64_t outdoor = 0, ret = 0;
  for (const auto& cl : st.trial_clamps) outdoor += cl.outdoor, ret += cl.ret;
  j.key("clamped_readings").begin_object();
  j.field("humidity_read", r.uses_humidity);
  j.field("outdoor_humidity", static_cast<long long>(outdoor));
  j.field("return_rh", static_cast<long long>(ret));
  j.field("trial_intervals", static_cast<long long>(st.readings_per_trial * st.trials_completed()));
  j.end_object();
  if (r.break_even) json_break_even(j, *r.break_even, s);
  if (r.sweep) json_sweep(j, *r.sweep, s);
  if (!r.interrupted_note.empty()) j.field("interrupted", r.interrupted_note);
  j.key("cautions").begin_array();
  for (const auto& line : cautions(CautionTopic::design)) j.value(line);
  j.end_array();
  j.end_object();
  return j.str();
}

void write_trials_csv(std::ostream& out, const sensors::StudyResult& st, units::System s) {
  const HumidityKind k = kind_of(st.sensors);
  std::vector<std::string> header = {"trial"};
  for (Sensor x : sensors::kSensors)
    header.push_back(fmt::format("{}_bias_{}", sensors::sensor_key(x, k),
                                 units::key_suffix(sensors::bias_kind(x, k), s)));
  for (const char* name :
       {"outdoor_humidity_clamped", "return_rh_clamped", "strategy", "shortfall_kwh"})
    header.emplace_back(name);
  if (s == units::System::ip) header.emplace_back("shortfall_kbtu");
  for (const char* name : {"harmful_hours", "harmful_kwh", "missed_hours", "missed_kwh",
                           "enabled_hours", "energy_kwh"})
    header.emplace_back(name);
  // Rows are written as they are made: a long study never holds its CSV in memory.
  auto line = [&](const std::vector<std::string>& cells) {
    for (std::size_t i = 0; i < cells.size(); ++i) out << (i ? "," : "") << csv_field(cells[i]);
    out << '\n';
  };
  line(header);
  auto g = [](double v) { return fmt::format("{:.8g}", v == 0.0 ? 0.0 : v); };
  std::vector<std::string> row;
  for (std::size_t n = 0; n < st.trials_completed(); ++n) {
    for (std::size_t a = 0; a < st.names.size(); ++a) {
      row.clear();
      row.push_back(std::to_string(st.trial[n]));
      for (Sensor x : sensors::kSensors)
        row.push_back(g(units::to_display(sensors::bias_kind(x, k), s, at(st.trial_biases[n], x))));
      row.push_back(std::to_string(st.trial_clamps[n].outdoor));
      row.push_back(std::to_string(st.trial_clamps[n].ret));
      row.push_back(st.names[a]);
      const sensors::TrialOutcome& o = st.outcome(n, a);
      row.push_back(g(o.shortfall_kwh));
      if (s == units::System::ip) row.push_back(g(energy_display(o.shortfall_kwh, s)));
      for (double v : {o.harmful_hours, o.harmful_kwh, o.missed_hours, o.missed_kwh,
                       o.enabled_hours, o.energy_kwh})
        row.push_back(g(v));
      line(row);
    }
  }
}

}  // namespace limitline::report
