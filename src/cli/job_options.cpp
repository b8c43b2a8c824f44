// Options shared by the commands that read a unit file and its weather year.
#include "common.hpp"

#include <limitline/app/year_job.hpp>

#include <fmt/format.h>

namespace limitline::cli {

void add_job_options(po::options_description& options,
                     po::positional_options_description& positional) {
  options.add_options()("unit", po::value<std::string>(),
                        "unit file (TOML); omit to use an embedded demo")(
      "demo", po::value<std::string>(), "embedded demo: harbourside (default) or mesa-alta")(
      "weather", po::value<std::string>(),
      "weather CSV (instead of the unit file's [weather] file)")(
      "column", po::value<std::vector<std::string>>()->composing(),
      "weather column override QUANTITY=HEADER[:UNIT] (repeatable)")(
      "humidity", po::value<std::string>(),
      "humidity column to use: dew-point, humidity-ratio, wet-bulb or relative-humidity")(
      "on-bad-row", po::value<std::string>(),
      "missing or impossible weather rows: error (default), skip or fill")(
      "time-convention", po::value<std::string>(),
      "weather stamps: hour-beginning or hour-ending (default: found from the file)")(
      "max-bad-share", po::value<std::string>(),
      "largest share of weather rows --on-bad-row skip or fill may drop or fill (default 1%)");
  positional.add("unit", 1);
}

UnitSource job_source(const po::variables_map& vm) {
  if (vm.count("unit") && vm.count("demo"))
    throw UsageError("give a unit file or --demo, not both");
  if (vm.count("unit")) return {vm["unit"].as<std::string>(), false};
  return demo_unit(vm.count("demo") ? vm["demo"].as<std::string>() : "harbourside");
}

namespace {

// --column QUANTITY=HEADER[:UNIT]. A header may hold colons itself ("Time (HH:MM)"): only a
// last part the quantity accepts as a unit is one.
WeatherOverrides::Column column_option(const std::string& spec) {
  const std::string origin = fmt::format("--column {}", echo(spec));
  const auto eq = spec.find('=');
  if (eq == std::string::npos || eq == 0 || eq + 1 == spec.size())
    throw UsageError(
        fmt::format("{}: write QUANTITY=HEADER or QUANTITY=HEADER:UNIT, e.g. "
                    "dry_bulb=Temperature:C",
                    origin));
  const auto q = weather::quantity_from_key(spec.substr(0, eq));
  if (!q)
    throw UsageError(
        fmt::format("{}: {} is not a weather quantity (dry_bulb, dew_point, "
                    "relative_humidity, wet_bulb, humidity_ratio, pressure, "
                    "timestamp, date, time, year, month, day, hour, minute)",
                    origin, echo(spec.substr(0, eq))));
  WeatherOverrides::Column c{*q, spec.substr(eq + 1), std::nullopt, origin};
  const auto colon = c.header.rfind(':');
  if (colon != std::string::npos && colon > 0 &&
      weather::accepts_unit(*q, std::string_view(c.header).substr(colon + 1))) {
    c.unit = c.header.substr(colon + 1);
    c.header.resize(colon);
  }
  return c;
}

}  // namespace

WeatherOverrides weather_overrides(const po::variables_map& vm) {
  WeatherOverrides o;
  if (vm.count("weather")) o.file = vm["weather"].as<std::string>();
  if (vm.count("column"))
    for (const std::string& spec : vm["column"].as<std::vector<std::string>>())
      o.columns.push_back(column_option(spec));
  if (vm.count("humidity")) o.humidity = vm["humidity"].as<std::string>();
  if (vm.count("on-bad-row")) o.on_bad_row = vm["on-bad-row"].as<std::string>();
  if (vm.count("time-convention")) o.time_convention = vm["time-convention"].as<std::string>();
  if (vm.count("max-bad-share")) o.max_bad_share = vm["max-bad-share"].as<std::string>();
  return o;
}

std::vector<std::filesystem::path> job_input_files(const po::variables_map& vm,
                                                   const std::string& weather_label) {
  // An embedded unit or weather has a label that names no file; equivalent() skips it.
  std::vector<std::filesystem::path> files{weather_label};
  if (vm.count("unit")) files.emplace_back(vm["unit"].as<std::string>());
  if (vm.count("weather")) files.emplace_back(vm["weather"].as<std::string>());
  if (vm.count("code-table"))
    for (const auto& t : vm["code-table"].as<std::vector<std::string>>()) files.emplace_back(t);
  return files;
}

}  // namespace limitline::cli
