#include <limitline/app/year_job.hpp>

#include <limitline/io/codes.hpp>
#include <limitline/io/embedded.hpp>
#include <limitline/io/input_file.hpp>
#include <limitline/error.hpp>
#include <limitline/model/psychro.hpp>
#include <limitline/parallel.hpp>
#include <limitline/report/strategy.hpp>
#include <limitline/text.hpp>

#include <fmt/format.h>

#include <cmath>
#include <filesystem>

namespace limitline {
namespace {

namespace fs = std::filesystem;

struct Demo {
  std::string_view name;
  std::string_view unit_file;
};
constexpr Demo kDemos[] = {
    {"harbourside", "demo-harbourside.toml"},
    {"mesa-alta", "demo-mesa-alta.toml"},
};

// The unit file's [weather] table, then the command line's overrides. An embedded demo unit's
// table describes its own demo climate: a file the user names is read by its own header.
weather::Mapping mapping_for(const UnitFile& unit, bool unit_table, const WeatherOverrides& o) {
  weather::Mapping m;
  if (unit.weather && unit_table) m = weather::read_mapping(*unit.weather, unit.path);
  for (const WeatherOverrides::Column& spec : o.columns) {
    weather::ColumnOverride& c = m.column(spec.quantity);
    c.column = spec.header;
    c.unit = spec.unit;
    c.origin = spec.origin;
  }
  if (o.humidity) m.humidity = weather::parse_humidity_source(*o.humidity, "--humidity");
  if (o.on_bad_row) m.on_bad_row = weather::parse_bad_row_policy(*o.on_bad_row, "--on-bad-row");
  if (o.time_convention)
    m.time_convention = weather::parse_time_convention(*o.time_convention, "--time-convention");
  if (o.max_bad_share) {
    m.max_bad_share = weather::parse_max_bad_share(*o.max_bad_share, "--max-bad-share");
    m.max_bad_share_origin = "--max-bad-share";
  }
  return m;
}

weather::WeatherSeries read_weather(const UnitFile& unit, bool embedded_unit,
                                    const weather::Mapping& m,
                                    const std::optional<std::string>& cli_file,
                                    std::string& label) {
  const double site_p = unit.site.design_pressure_kpa();
  if (cli_file) {
    label = *cli_file;
    return weather::read_file(*cli_file, m, site_p);
  }
  if (!m.file)
    throw InputError(
        fmt::format("{}: no weather file: give --weather FILE, or file = \"...\" in "
                    "the unit file's [weather] table",
                    unit.path));
  if (embedded_unit) {
    const auto text = embedded::find(*m.file);
    if (!text)
      throw InputError(
          fmt::format("embedded demo weather '{}' is missing from this build", *m.file));
    label = fmt::format("{} (embedded invented demo climate)", *m.file);
    return weather::read_text(*text, *m.file, m, site_p);
  }
  const fs::path p = path_beside(unit.path, *m.file);
  label = p.string();
  return weather::read_file(p, m, site_p);
}

// The loads of each weather interval, from the unit's loads file as read once.
void match_loads(YearInputs& in) {
  if (!in.loads_table) return;
  loads::Matched m = loads::match(*in.loads_table, in.weather);
  in.hourly_loads = std::move(m.hours);
  in.warnings.insert(in.warnings.end(), m.warnings.begin(), m.warnings.end());
}

}  // namespace

std::shared_ptr<const loads::LoadsTable> read_unit_loads(const UnitFile& unit, bool embedded_unit,
                                                         std::string& label) {
  if (!unit.loads_file) return nullptr;
  const UnitFile::LoadsFile& f = *unit.loads_file;
  if (embedded_unit) {
    const auto text = embedded::find(f.path);
    if (!text)
      throw InputError(fmt::format("{}: embedded demo loads {} are missing from this build",
                                   f.origin, echo(f.path)));
    label = fmt::format("{} (embedded invented demo loads)", f.path);
    return std::make_shared<const loads::LoadsTable>(loads::read_text(*text, f.path, f));
  }
  const fs::path p = path_beside(unit.path, f.path);
  label = p.string();
  return std::make_shared<const loads::LoadsTable>(loads::read_file(p, f));
}

std::vector<std::string> demo_names() {
  std::vector<std::string> out;
  for (const auto& d : kDemos) out.emplace_back(d.name);
  return out;
}

UnitSource demo_unit(std::string_view name) {
  for (const auto& d : kDemos)
    if (d.name == name) return {std::string(d.unit_file), true};
  std::string allowed;
  for (const auto& d : kDemos) allowed += (allowed.empty() ? "" : ", ") + std::string(d.name);
  throw InputError(fmt::format("--demo: '{}' is not a demo (allowed: {})", name, allowed));
}

YearInputs load_year_inputs(const UnitSource& source, const WeatherOverrides& overrides) {
  YearInputs in;
  if (source.embedded) {
    const auto text = embedded::find(source.path);
    if (!text)
      throw InputError(
          fmt::format("embedded demo unit '{}' is missing from this build", source.path));
    in.unit = parse_unit_file(*text, source.path);
    in.unit_label = fmt::format("{} (embedded invented demo unit)", source.path);
  } else {
    in.unit = load_unit_file(source.path);
    in.unit_label = source.path;
  }
  const weather::Mapping m = mapping_for(in.unit, !(source.embedded && overrides.file), overrides);
  in.weather = read_weather(in.unit, source.embedded, m, overrides.file, in.weather_label);
  if (in.unit.schedule) in.schedule = read_schedule(*in.unit.schedule, in.unit.path);
  in.strategies = strategies_or_presets(in.unit);
  in.warnings = in.unit.warnings;
  if (auto w = site_pressure_warning(in.unit, in.weather.info)) in.warnings.push_back(*w);
  in.loads_table = read_unit_loads(in.unit, source.embedded, in.loads_label);
  match_loads(in);
  return in;
}

YearInputs load_year_inputs(const TextSources& src) {
  YearInputs in;
  in.unit = parse_unit_file(src.unit_text, src.unit_name);
  in.unit_label = src.unit_name;
  if (in.unit.loads_file)
    throw InputError(fmt::format(
        "{}: the study page reads no file a unit file names; give the loads in the [loads] "
        "table itself, or run limitline year on the files",
        in.unit.loads_file->origin));
  const weather::Mapping m = mapping_for(in.unit, !src.weather_by_header, {});
  in.weather =
      weather::read_text(src.weather_text, src.weather_name, m, in.unit.site.design_pressure_kpa());
  in.weather_label = src.weather_name;
  if (in.unit.schedule) in.schedule = read_schedule(*in.unit.schedule, in.unit.path);
  in.strategies = strategies_or_presets(in.unit);
  in.warnings = in.unit.warnings;
  if (auto w = site_pressure_warning(in.unit, in.weather.info)) in.warnings.push_back(*w);
  return in;
}

YearInputs with_weather(const YearInputs& base, const std::string& weather_path,
                        const WeatherOverrides& overrides) {
  YearInputs in;
  in.unit = base.unit;
  in.unit_label = base.unit_label;
  in.schedule = base.schedule;
  in.strategies = base.strategies;
  in.warnings = base.unit.warnings;
  WeatherOverrides o = overrides;
  o.file = weather_path;
  in.weather =
      read_weather(in.unit, false, mapping_for(in.unit, true, o), o.file, in.weather_label);
  if (auto w = site_pressure_warning(in.unit, in.weather.info)) in.warnings.push_back(*w);
  // The loads file is read once for all sites, unless the caller assembled `base` without it.
  in.loads_table = base.loads_table;
  in.loads_label = base.loads_label;
  if (!in.loads_table) in.loads_table = read_unit_loads(in.unit, false, in.loads_label);
  match_loads(in);
  return in;
}

std::optional<std::string> site_pressure_warning(const UnitFile& unit,
                                                 const weather::WeatherInfo& w) {
  const Site& site = unit.site;
  if (!w.median_pressure_kpa || !(site.elevation_m || site.pressure_kpa)) return std::nullopt;
  const double p_site = site.design_pressure_kpa(), p_file = *w.median_pressure_kpa;
  if (std::fabs(p_file - p_site) <= kSitePressureToleranceKpa) return std::nullopt;
  // In the unit file's own system: the warning is about what that file says.
  const units::System sys = unit.units;
  const auto pressure = [&](double kpa) {
    return units::format(units::Kind::pressure, sys, kpa, sys == units::System::ip ? 2 : 1);
  };
  const auto length = [&](double m) { return units::format(units::Kind::length, sys, m, 0); };
  const std::string given = site.elevation_m
                                ? fmt::format("elevation {} gives a standard pressure of {}",
                                              length(*site.elevation_m), pressure(p_site))
                                : fmt::format("pressure {}", pressure(p_site));
  double z = 0.0;
  try {
    z = psychro::elevation_from_standard_pressure_m(p_file);
  } catch (const InputError&) {
  }
  return fmt::format(
      "{}: {}, but the weather file {} has a median station pressure of {} (the standard "
      "pressure at about {}); they differ by {}, more than the {} (about {}) tolerance: "
      "check the site's elevation and that the weather is this site's (each hour is computed "
      "at the file's pressure)",
      site.pressure_origin, given, w.source, pressure(p_file), length(z),
      units::format(units::Kind::pressure, sys, std::fabs(p_file - p_site),
                    sys == units::System::ip ? 2 : 1),
      units::format(units::Kind::pressure, sys, kSitePressureToleranceKpa,
                    sys == units::System::ip ? 2 : 0),
      length(200.0));
}

weather::WeatherSeries read_unit_weather(const UnitFile& unit, std::string& label) {
  return read_weather(unit, false, mapping_for(unit, true, {}), std::nullopt, label);
}

YearInputs batch_base(const UnitFile& unit, std::string label, const codes::CodeTables* tables) {
  YearInputs base;
  base.unit = unit;
  base.unit_label = std::move(label);
  if (unit.schedule) base.schedule = read_schedule(*unit.schedule, unit.path);
  base.strategies = tables ? strategies_or_presets(unit, *tables) : strategies_or_presets(unit);
  // Read once, matched to each site's weather.
  base.loads_table = read_unit_loads(unit, false, base.loads_label);
  return base;
}

std::vector<annual::OutdoorInterval> outdoor_intervals(const weather::WeatherSeries& w) {
  std::vector<annual::OutdoorInterval> out;
  out.reserve(w.hours.size());
  for (const auto& h : w.hours)
    out.push_back({h.month, h.day, h.day_of_year, h.hour * 60 + h.minute, h.weight_h, h.dry_bulb_c,
                   h.humidity_ratio, h.pressure_kpa});
  return out;
}

annual::Prepared prepare_year(const YearInputs& in, bool compute_dew_point, bool priced) {
  const auto intervals = outdoor_intervals(in.weather);
  annual::PrepareOptions opt;
  // With a plant the references and the ranking choose by cost (docs/model.md §Plant).
  opt.weights = in.unit.plant && priced ? in.unit.plant->cost_weights() : in.unit.weights;
  opt.compute_dew_point = compute_dew_point;
  opt.control = in.unit.control;
  opt.space = in.unit.space;
  opt.hourly_loads = in.hourly_loads;
  return annual::prepare(in.unit.air_handler, in.unit.return_air, intervals, in.schedule, opt);
}

report::YearContext year_context(const YearInputs& in, units::System s) {
  report::YearContext c;
  c.units = s;
  c.title = in.unit.site.name.empty() ? in.unit.path : in.unit.site.name;
  c.unit_source = in.unit_label;
  const Site& site = in.unit.site;
  std::string basis;
  if (site.pressure_kpa)
    basis = "site pressure as given";
  else if (site.elevation_m)
    basis = fmt::format("standard pressure at {}",
                        units::format(units::Kind::length, s, *site.elevation_m, 0));
  else
    basis = "sea-level standard pressure (no elevation given)";
  c.site = fmt::format(
      "{}{}design pressure {} ({}){}", site.name, site.name.empty() ? "" : "; ",
      units::format(units::Kind::pressure, s, site.design_pressure_kpa(), 3), basis,
      in.weather.info.pressure_from_file ? "; hourly pressure from the weather file" : "");
  c.weather_source = in.weather_label;
  c.weather_notes = weather::describe(in.weather.info);
  c.schedule = in.schedule.describe();
  c.warnings = in.warnings;
  c.model = report::describe_model(
      in.unit.control, in.unit.space,
      in.loads_table ? fmt::format("{}: {}", in.loads_label, loads::describe(*in.loads_table)) : "",
      s);
  c.plant = in.unit.plant;
  for (const auto& st : in.strategies)
    c.strategy_descriptions[st.name] = report::describe_strategy(st, s);
  return c;
}

}  // namespace limitline

#include <algorithm>
#include <atomic>

namespace limitline {

std::vector<std::string> batch_weather_files(const std::string& dir, std::string_view option) {
  std::error_code ec;
  if (!fs::is_directory(dir, ec))
    throw InputError(fmt::format("{}: {} is not a folder", option, echo(dir)));
  std::vector<std::string> files;
  fs::directory_iterator it(dir, ec);
  // Every entry named *.csv is a site, whatever it is: the weather reader names what is
  // wrong with a folder, a device or a dangling link, so none is skipped without a word.
  for (; !ec && it != fs::directory_iterator(); it.increment(ec)) {
    if (text::iequals(it->path().extension().string(), ".csv"))
      files.push_back(it->path().string());
  }
  if (ec) throw InputError(fmt::format("{}: cannot list {}: {}", option, echo(dir), ec.message()));
  std::sort(files.begin(), files.end());
  if (files.empty()) throw InputError(fmt::format("{}: no .csv files in {}", option, echo(dir)));
  return files;
}

std::vector<BatchSite> run_year_batch(const YearInputs& base, const std::string& dir,
                                      const WeatherOverrides& overrides, unsigned threads,
                                      void (*progress)(std::size_t, std::size_t),
                                      const std::atomic<bool>* cancel) {
  const std::vector<std::string> files = batch_weather_files(dir);
  std::vector<BatchSite> sites(files.size());
  for (std::size_t i = 0; i < files.size(); ++i) sites[i].weather_path = files[i];
  const ParallelRun run{threads, cancel, progress};
  (void)parallel_for(files.size(), run, [&]() -> ParallelWork {
    return [&](std::size_t i) {
      BatchSite& s = sites[i];
      s.run = true;
      try {
        const YearInputs in = with_weather(base, files[i], overrides);
        const annual::Prepared p = prepare_year(in);
        s.result = annual::evaluate(in.strategies, p);
        s.operating_hours = p.operating_hours;
        s.ok = true;
      } catch (const std::exception& e) {
        // Any failure stays with its site, never stopping the others.
        s.error = e.what();
      }
    };
  });
  return sites;
}

}  // namespace limitline

namespace limitline {

void add_compliance(report::YearContext& c, const YearInputs& in, const CodeSelection& code) {
  const Site& site = in.unit.site;
  const std::string edition = code.edition ? *code.edition : site.energy_code;
  const std::string zone = code.zone ? *code.zone : site.climate_zone;
  if (edition.empty() && zone.empty()) return;
  if (edition.empty())
    throw InputError(
        fmt::format("{}: climate_zone is given but no energy_code (set [site] "
                    "energy_code or --edition)",
                    code.zone ? std::string("--zone") : site.climate_zone_origin));
  if (zone.empty())
    throw InputError(
        fmt::format("{}: energy_code is given but no climate_zone (set [site] "
                    "climate_zone or --zone)",
                    code.edition ? std::string("--edition") : site.energy_code_origin));
  std::vector<std::filesystem::path> extra(code.extra_tables.begin(), code.extra_tables.end());
  const codes::CodeTables tables = codes::CodeTables::load_installed(extra);
  // Errors name where each value came from: the option, or the [site] key's FILE:LINE.
  const std::string edition_origin = code.edition ? "--edition" : site.energy_code_origin;
  const std::string zone_origin = code.zone ? "--zone" : site.climate_zone_origin;
  const auto words = codes::compliance_words(tables, edition, zone, site.design_pressure_kpa(),
                                             in.strategies, edition_origin, zone_origin);
  for (std::size_t i = 0; i < in.strategies.size() && i < words.size(); ++i)
    c.compliance[in.strategies[i].name] = words[i];
  const codes::Edition& e = tables.edition(edition, edition_origin);
  c.code_name = fmt::format("{}, climate zone {}", e.title, zone);
  c.code_label = fmt::format(
      "{}, climate zone {} (tables from memory; verify against the "
      "adopted edition — see limitline code)",
      e.title, zone);
}

}  // namespace limitline
