// limitline audit: a trend log checked against the unit's high-limit and the model.
#include "common.hpp"

#include <limitline/analysis/audit.hpp>
#include <limitline/analysis/audit_faults.hpp>
#include <limitline/io/codes.hpp>
#include <limitline/report/audit.hpp>
#include <limitline/report/audit_record.hpp>
#include <limitline/report/strategy.hpp>
#include <limitline/io/trend.hpp>
#include <limitline/io/unit_file.hpp>
#include <limitline/text.hpp>

#include <fmt/format.h>

#include <cmath>
#include <tuple>

namespace limitline::cli {
namespace {

constexpr std::string_view kDetails =
    "Reads a trend log exported from the building automation system and checks, sample by\n"
    "sample, what the economizer did against what the unit file's high-limit strategy (the\n"
    "first one, or --strategy NAME; or the energy code's with --edition and --zone) says it\n"
    "should have done. Each sample counts for the time to the next one, capped at --max-gap\n"
    "(default twice the median interval). The outdoor-air fraction is measured from the\n"
    "outdoor, return and mixed-air temperatures where they are far enough apart for the\n"
    "sensors' accuracy, with its uncertainty.\n\n"
    "Columns are found from the header (e.g. 'OA Temp (°F)', 'OA RH (%)', 'RAT', 'MA Temp',\n"
    "'SA Temp', 'OA Damper Cmd (%)', 'SF Status', 'Clg Valve (%)'; a 'Timestamp' or 'Date' and\n"
    "'Time' column). Set any of them with --column QUANTITY=HEADER[:UNIT], QUANTITY one of\n"
    "outdoor-dry-bulb, outdoor-rh, outdoor-dew-point, return-dry-bulb, return-rh,\n"
    "return-dew-point, mixed-air, supply-air, damper, fan, cooling; UNIT F, C, % or fraction.\n"
    "The unit file's [audit] table can hold the same settings (columns, accuracies, max gap,\n"
    "the log's UTC offset, the significance minimums, the supply tolerance); an option\n"
    "overrides its key, so one unit file and one log reproduce a record.\n\n"
    "Examples:\n"
    "  limitline audit examples/audit-office.toml examples/trend-office.csv\n"
    "  limitline audit examples/audit-office.toml examples/trend-office.csv --edition "
    "ashrae-90.1-2019 --zone 4A --format md\n"
    "  limitline audit examples/audit-office.toml examples/trend-office.csv --column "
    "mixed-air=\"MA Temp (°F):F\" --max-gap 45";

highlimit::Strategy pick_strategy(const UnitFile& unit, const po::variables_map& vm,
                                  const codes::CodeTables* tables, std::string& source) {
  const bool code = vm.count("edition") || vm.count("zone");
  if (code) {
    const std::string edition =
        vm.count("edition") ? vm["edition"].as<std::string>() : unit.site.energy_code;
    const std::string zone =
        vm.count("zone") ? vm["zone"].as<std::string>() : unit.site.climate_zone;
    if (edition.empty()) throw UsageError("--zone needs --edition (or [site] energy_code)");
    if (zone.empty()) throw UsageError("--edition needs --zone (or [site] climate_zone)");
    const auto& ed =
        tables->edition(edition, vm.count("edition") ? "--edition" : "site.energy_code");
    codes::SiteConditions site;
    site.pressure_kpa = unit.site.design_pressure_kpa();
    const auto req =
        codes::requirements(ed, zone, site, vm.count("zone") ? "--zone" : "site.climate_zone");
    std::string names;
    for (const auto& a : req.allowed) {
      const auto s = a.strategy();
      if (!s) continue;
      names += (names.empty() ? "" : ", ") + a.row->control;
      if (vm.count("strategy") && text::normalise_name(a.row->control) !=
                                      text::normalise_name(vm["strategy"].as<std::string>()))
        continue;
      source = fmt::format("{} zone {}, {}", ed.id, req.zone, a.row->control);
      return *s;
    }
    throw InputError(
        vm.count("strategy")
            ? fmt::format(
                  "--strategy: '{}' is not a control type {} allows in zone {} (allowed: {})",
                  vm["strategy"].as<std::string>(), ed.id, req.zone, names)
            : fmt::format("--zone: {} allows no modelled control type in zone {}", ed.id,
                          req.zone));
  }
  const auto all = strategies_or_presets(unit);
  if (!vm.count("strategy")) {
    source = !unit.strategies_defaulted ? "first strategy of the unit file"
             : all.front().code_source.empty()
                 ? "no strategy in the unit file: first preset at common-practice settings"
                 : "no strategy in the unit file: first preset, with the settings of " +
                       all.front().code_source;
    return all.front();
  }
  const std::string want = text::normalise_name(vm["strategy"].as<std::string>());
  std::string names;
  for (const auto& s : all) {
    if (text::normalise_name(s.name) == want) {
      source = "--strategy";
      return s;
    }
    names += (names.empty() ? "'" : ", '") + s.name + "'";
  }
  throw InputError(fmt::format("--strategy: '{}' is not a strategy of {} (strategies: {})",
                               vm["strategy"].as<std::string>(), unit.path, names));
}

}  // namespace

int run_audit(const std::vector<std::string>& args) {
  po::options_description options("options");
  options.add_options()("unit", po::value<std::string>(), "unit file (TOML)")(
      "trend", po::value<std::string>(), "trend log (CSV)")(
      "strategy", po::value<std::string>(),
      "strategy of the unit file to audit against (default: the first)")(
      "edition", po::value<std::string>(),
      "audit against the energy code's required strategy: edition")(
      "zone", po::value<std::string>(),
      "climate zone for --edition (default: [site] climate_zone)")(
      "column", po::value<std::vector<std::string>>()->composing(),
      "trend column QUANTITY=HEADER[:UNIT] (repeatable)")(
      "max-gap", po::value<std::string>(),
      "longest time one sample stands for, minutes (default: twice the median interval)")(
      "outdoor-accuracy", po::value<std::string>(),
      "outdoor-air temperature sensor accuracy (default 0.9F / 0.5K)")(
      "return-accuracy", po::value<std::string>(),
      "return-air temperature sensor accuracy (default 0.9F / 0.5K)")(
      "mixed-accuracy", po::value<std::string>(),
      "mixed-air temperature sensor accuracy (default 0.9F / 0.5K)")(
      "supply-accuracy", po::value<std::string>(),
      "supply-air temperature sensor accuracy (default 0.9F / 0.5K)")(
      "supply-tolerance", po::value<std::string>(),
      "supply air may stray this far from its setpoint, beyond its sensor (default 1.8F / 1K)")(
      "min-samples", po::value<std::string>(),
      "a finding needs more samples than this (default 2)")(
      "min-hours", po::value<std::string>(), "a finding needs more hours than this (default 0.5)")(
      "utc-offset", po::value<std::string>(),
      "the log's clock, e.g. -05:00 (recorded in the report)")(
      "output,o", po::value<std::string>()->default_value("-"),
      "file to write, whole or not at all (default -: standard output)");
  add_common_options(options, "text, md, json, html (the record to sign)");
  po::positional_options_description pos;
  pos.add("unit", 1).add("trend", 1);
  po::variables_map vm;
  if (!parse_options(args, options, pos, "limitline audit UNIT.toml TREND.csv [options]", kDetails,
                     vm))
    return 0;
  const Common common = read_common(vm, {Format::text, Format::md, Format::json, Format::html});
  if (!vm.count("unit") || !vm.count("trend")) throw UsageError("give a unit file and a trend log");

  const UnitFile unit = load_unit_file(vm["unit"].as<std::string>());
  report_warnings(unit.warnings, common.strict);
  codes::check_site_code(unit.site.energy_code, unit.site.energy_code_origin,
                         unit.site.climate_zone, unit.site.climate_zone_origin);
  const units::System system = common.units.resolve(unit);
  const AuditSettings set = unit.audit.value_or(AuditSettings{});
  trend::ReadOptions read;
  read.bare = system;
  read.columns = set.columns;
  if (vm.count("column"))
    for (const auto& c : vm["column"].as<std::vector<std::string>>()) {
      const auto o = trend::parse_column_override(c, "--column");
      std::erase_if(read.columns,
                    [&](const trend::ColumnOverride& u) { return u.channel == o.channel; });
      read.columns.push_back(o);
    }
  read.max_gap_s = set.max_gap_s;
  if (vm.count("max-gap")) {
    const double minutes = units::parse_number(vm["max-gap"].as<std::string>(), "--max-gap");
    if (!(minutes > 0) || !(minutes * 60.0 <= trend::kMaxGapLimitS))
      throw InputError(fmt::format(
          "--max-gap: {} is not a number of minutes above 0 and at most {:.0f} (a year)",
          echo(vm["max-gap"].as<std::string>()), trend::kMaxGapLimitS / 60.0));
    read.max_gap_s = minutes * 60.0;
  }
  audit::Options opt;
  std::string source;
  // The code tables, read once when a code is named: for --edition's strategy and for the
  // fault-detection clause.
  std::optional<codes::CodeTables> tables;
  if (vm.count("edition") || vm.count("zone") || !unit.site.energy_code.empty())
    tables = codes::CodeTables::load_installed();
  opt.strategy = pick_strategy(unit, vm, tables ? &*tables : nullptr, source);
  opt.accuracy.outdoor_k = set.outdoor_accuracy_k.value_or(opt.accuracy.outdoor_k);
  opt.accuracy.return_k = set.return_accuracy_k.value_or(opt.accuracy.return_k);
  opt.accuracy.mixed_k = set.mixed_accuracy_k.value_or(opt.accuracy.mixed_k);
  opt.accuracy.supply_k = set.supply_accuracy_k.value_or(opt.accuracy.supply_k);
  opt.supply_tolerance_k = set.supply_tolerance_k.value_or(opt.supply_tolerance_k);
  opt.significance.min_samples = set.min_samples.value_or(opt.significance.min_samples);
  opt.significance.min_hours = set.min_hours.value_or(opt.significance.min_hours);
  for (auto [name, slot, lo_open, hi] :
       {std::tuple{"outdoor-accuracy", &opt.accuracy.outdoor_k, true, 5.0},
        std::tuple{"return-accuracy", &opt.accuracy.return_k, true, 5.0},
        std::tuple{"mixed-accuracy", &opt.accuracy.mixed_k, true, 5.0},
        std::tuple{"supply-accuracy", &opt.accuracy.supply_k, true, 5.0},
        std::tuple{"supply-tolerance", &opt.supply_tolerance_k, false, 10.0}}) {
    if (!vm.count(name)) continue;
    const double a = quantity(vm, name, units::Kind::temperature_difference, system);
    if (!(lo_open ? a > 0 : a >= 0) || a > hi)
      throw InputError(
          fmt::format("--{}: {} is outside the allowed range ({} 0 to {})", name,
                      echo(vm[name].as<std::string>()), lo_open ? "more than" : "from",
                      units::format(units::Kind::temperature_difference, system, hi, 1)));
    *slot = a;
  }
  if (vm.count("min-samples")) {
    const std::string t = vm["min-samples"].as<std::string>();
    const double n = units::parse_number(t, "--min-samples");
    if (!(n >= 0 && n <= 100000 && n == std::floor(n)))
      throw InputError(fmt::format(
          "--min-samples: {} is not a whole number of samples from 0 to 100000", echo(t)));
    opt.significance.min_samples = static_cast<int>(n);
  }
  if (vm.count("min-hours")) {
    const std::string t = vm["min-hours"].as<std::string>();
    const double h = units::parse_number(t, "--min-hours");
    if (!(h >= 0 && h <= 8784))
      throw InputError(fmt::format(
          "--min-hours: {} is outside the allowed range (hours from 0 to 8784)", echo(t)));
    opt.significance.min_hours = h;
  }
  std::optional<int> offset = set.utc_offset_min;
  if (vm.count("utc-offset"))
    offset = trend::parse_utc_offset(vm["utc-offset"].as<std::string>(), "--utc-offset");
  const trend::TrendLog log = trend::load_trend(vm["trend"].as<std::string>(), read);
  const audit::Result r = audit::run(unit, log, opt);

  report::AuditContext ctx;
  ctx.unit_path = unit.path;
  ctx.strategy_text = report::describe_strategy(opt.strategy, system);
  ctx.strategy_source = source;
  ctx.accuracy = opt.accuracy;
  ctx.units = system;
  ctx.significance = opt.significance;
  ctx.supply_tolerance_k = opt.supply_tolerance_k;
  ctx.log_clock = offset ? trend::format_utc_offset(*offset) : std::string();
  ctx.text_width = common.text_width();
  // The fault-detection clause of the code the audit is held against: --edition, else the
  // unit's [site].
  const std::string edition =
      vm.count("edition") ? vm["edition"].as<std::string>() : unit.site.energy_code;
  if (edition.empty()) {
    ctx.fault_code_note =
        "the unit file names no energy code: no fault-detection clause to compare the log with";
  } else {
    const auto& ed =
        tables->edition(edition, vm.count("edition") ? "--edition" : "site.energy_code");
    if (!ed.fault_detection) {
      ctx.fault_code_note = fmt::format(
          "{} has no economizer fault-detection clause in limitline's tables (from memory)", ed.id);
    } else {
      ctx.fault_code = fmt::format("{}, {}", ed.title, ed.fault_detection->clause);
      ctx.fault_evidence = audit::fault_evidence(*ed.fault_detection, log, r);
    }
  }
  const std::string output = vm["output"].as<std::string>();
  switch (common.format) {
    case Format::json: write_file(output, report::audit_json(r, log, ctx), "--output"); break;
    case Format::md: write_file(output, report::audit_markdown(r, log, ctx), "--output"); break;
    case Format::html:
      write_file(output,
                 report::audit_record_html(r, log, ctx, audit::timeline(unit, log, opt),
                                           "limitline " LIMITLINE_CLI_VERSION),
                 "--output");
      break;
    default:
      write_file(output, terminal_text(common, report::audit_text(r, log, ctx)), "--output");
      break;
  }
  return 0;
}

}  // namespace limitline::cli
