#include <limitline/app/tune_job.hpp>

#include <limitline/error.hpp>
#include <limitline/io/codes.hpp>
#include <limitline/parallel.hpp>

#include <fmt/format.h>

#include <algorithm>

namespace limitline {
namespace {

// The values a strategy's swept conditions have (one per axis).
std::vector<double> values_of(const highlimit::Strategy& s, std::span<const tuning::Axis> axes) {
  std::vector<double> v;
  for (const auto& a : axes) v.push_back(s.conditions.at(a.condition).limit);
  return v;
}

}  // namespace

TuneResult run_tune(const YearInputs& in, const annual::Prepared& p, const TuneOptions& o) {
  TuneResult result;
  const tuning::Baseline base = tuning::baseline_of(p);
  result.perfect_savings = base.none_kwh - base.perfect_kwh;

  // The zone's requirements, when the site (or the options) name an edition and a zone; the
  // same selection and errors as the compliance column of `year`.
  const Site& site = in.unit.site;
  const std::string edition = o.code.edition ? *o.code.edition : site.energy_code;
  const std::string zone_name = o.code.zone ? *o.code.zone : site.climate_zone;
  std::optional<codes::CodeTables> tables;
  std::optional<codes::ZoneRequirements> zone;
  if (!edition.empty() || !zone_name.empty()) {
    report::YearContext probe;
    add_compliance(probe, in, o.code);  // checks both are given and known, with their origins
    std::vector<std::filesystem::path> extra(o.code.extra_tables.begin(),
                                             o.code.extra_tables.end());
    tables = codes::CodeTables::load_installed(extra);
    const codes::Edition& e = tables->edition(edition);
    codes::SiteConditions at;
    at.pressure_kpa = site.design_pressure_kpa();
    zone = codes::requirements(e, zone_name, at);
    result.code_label = probe.code_label;
  }

  for (const highlimit::Strategy& s : in.strategies) {
    StrategyTuning t;
    t.strategy = s;
    std::vector<tuning::Axis> axes = tuning::default_axes(s, o.units);
    std::vector<tuning::Extra> extras;
    if (!in.unit.strategies_defaulted)
      extras.push_back({std::string(kUnitSetting), values_of(s, axes)});
    if (!s.preset.empty())
      extras.push_back(
          {std::string(kDefaultSetting),
           values_of(highlimit::make_preset(s.preset, highlimit::preset_defaults()), axes)});
    const codes::AllowedControl* allowed = nullptr;
    const codes::Row* prohibited = nullptr;
    if (zone && !s.preset.empty()) {
      for (const auto& a : zone->allowed)
        if (a.row->control == s.preset) allowed = &a;
      for (const codes::Row* r : zone->prohibited)
        if (r->control == s.preset) prohibited = r;
      if (allowed && allowed->settings.size() == s.conditions.size()) {
        std::vector<double> v;
        for (const auto& a : axes) v.push_back(allowed->settings.at(a.condition).value);
        t.code_extra = extras.size();
        extras.push_back({std::string(kCodeSetting), std::move(v)});
      }
    }
    auto curve = tuning::tune(s, std::move(axes), extras, base, o.threads, o.cancel);
    if (!curve) {
      result.partial = true;
      break;
    }
    t.curve = std::move(*curve);

    if (zone) {
      auto verdict = [&](const tuning::Point& pt) {
        const highlimit::Strategy at = tuning::at_setting(s, t.curve.axes, pt.values);
        return std::string(codes::verdict_word(codes::check_strategy(*zone, at).verdict));
      };
      t.best_verdict = verdict(t.curve.best_point());
      for (const auto& e : t.curve.extras) t.extra_verdicts.push_back(verdict(e));
      const std::string where = fmt::format("{}, zone {}", zone->edition->title, zone->zone);
      t.code_allows = allowed != nullptr;
      if (allowed)
        t.code_note = fmt::format(
            "{} sets this control at {}: any other setting is set-wrong (tables from memory; "
            "verify against the adopted edition)",
            where, codes::control_text(*allowed, o.units));
      else if (prohibited)
        t.code_note =
            fmt::format("{} does not allow this control ({})", where,
                        prohibited->clause.empty() ? prohibited->provenance : prohibited->clause);
      else
        t.code_note = fmt::format("{} has no row for this control: not evaluable", where);
    }
    result.strategies.push_back(std::move(t));
  }
  return result;
}

std::vector<TuneSite> run_tune_batch(const YearInputs& base, const std::string& dir,
                                     const WeatherOverrides& overrides, const TuneOptions& options,
                                     unsigned threads) {
  const std::vector<std::string> files = batch_weather_files(dir);
  std::vector<TuneSite> sites(files.size());
  TuneOptions one = options;
  one.threads = 1;  // the sites are the parallel items
  const ParallelRun run{threads, options.cancel, nullptr};
  (void)parallel_for(files.size(), run, [&]() -> ParallelWork {
    return [&](std::size_t i) {
      TuneSite& s = sites[i];
      s.weather_path = files[i];
      s.run = true;
      try {
        const YearInputs in = with_weather(base, files[i], overrides);
        const annual::Prepared p = prepare_year(in);
        s.result = run_tune(in, p, one);
        s.perfect_savings = s.result.perfect_savings;
        s.ok = !s.result.partial;
        if (!s.ok) s.error = "interrupted";
      } catch (const std::exception& e) {
        s.error = e.what();  // a failing site never stops the others
      }
    };
  });
  for (std::size_t i = 0; i < files.size(); ++i) sites[i].weather_path = files[i];
  return sites;
}

}  // namespace limitline
