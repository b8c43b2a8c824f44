#include <limitline/analysis/decision.hpp>
#include <limitline/app/survey.hpp>
#include <limitline/app/tune_job.hpp>
#include <limitline/error.hpp>
#include <limitline/io/csv.hpp>
#include <limitline/io/input_file.hpp>
#include <limitline/io/json_read.hpp>
#include <limitline/model/plausible.hpp>
#include <limitline/model/psychro.hpp>
#include <limitline/parallel.hpp>
#include <limitline/report/json.hpp>
#include <limitline/text.hpp>
#include <limitline/version.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <charconv>
#include <cstdint>
#include <filesystem>
#include <fstream>
#include <thread>

namespace limitline::survey {
namespace fs = std::filesystem;
namespace {

constexpr std::uintmax_t kMaxManifestBytes = 64u << 20;
constexpr std::size_t kMaxShards = 100000;
constexpr int kPartialFormat = 1;

// The manifest's columns and what each holds.
struct ManifestColumn {
  std::string_view name;
  std::string ManifestRow::*field;
};
constexpr ManifestColumn kColumns[] = {
    {"weather", &ManifestRow::weather},
    {"site", &ManifestRow::site},
    {"elevation", nullptr},
    {"energy_code", &ManifestRow::energy_code},
    {"climate_zone", &ManifestRow::climate_zone},
    {"unit", &ManifestRow::unit},
};

std::string column_key(std::string_view header) {
  std::string k;
  for (const char c : text::trim(header))
    k +=
        c == ' ' || c == '-' ? '_' : static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return k;
}

std::string allowed_columns() {
  std::string out;
  for (const auto& c : kColumns) out += (out.empty() ? "" : ", ") + std::string(c.name);
  return out;
}

// 64-bit FNV-1a: a fingerprint that tells two surveys apart, not a security measure.
struct Fingerprint {
  std::uint64_t h = 1469598103934665603ull;
  void add(std::string_view s) {
    for (const unsigned char c : s) h = (h ^ c) * 1099511628211ull;
    h = (h ^ 0xffu) * 1099511628211ull;  // a separator, so ("ab","c") differs from ("a","bc")
  }
  [[nodiscard]] std::string hex() const { return fmt::format("{:016x}", h); }
};

std::vector<std::string_view> manifest_lines(std::string_view text) {
  if (text.substr(0, 3) == "\xEF\xBB\xBF") text.remove_prefix(3);
  std::vector<std::string_view> lines;
  std::size_t i = 0;
  while (i <= text.size()) {
    std::size_t j = i;
    while (j < text.size() && text[j] != '\n' && text[j] != '\r') ++j;
    lines.push_back(text.substr(i, j - i));
    if (j < text.size() && text[j] == '\r' && j + 1 < text.size() && text[j + 1] == '\n') ++j;
    i = j + 1;
  }
  return lines;
}

Manifest read_folder(const std::string& path) {
  Manifest m;
  m.source = path;
  for (const std::string& f : batch_weather_files(path, "survey")) {
    ManifestRow r;
    r.index = m.rows.size();
    r.weather = f;
    r.weather_path = f;
    r.origin = f;
    m.bytes += fs::path(f).filename().string() + '\n';
    m.rows.push_back(std::move(r));
  }
  return m;
}

}  // namespace

Manifest read_manifest(const std::string& path, units::System bare) {
  std::error_code ec;
  if (fs::is_directory(path, ec)) return read_folder(path);
  Manifest m;
  m.source = path;
  m.bytes = read_input_file(path, "the survey manifest", kMaxManifestBytes);
  const fs::path folder = fs::path(path).parent_path();
  const auto lines = manifest_lines(m.bytes);
  std::vector<const ManifestColumn*> columns;
  int header_line = 0;
  char delimiter = ',';
  for (std::size_t n = 0; n < lines.size(); ++n) {
    const std::string_view l = lines[n];
    const int line = static_cast<int>(n + 1);
    if (text::trim(l).empty() || text::trim(l).front() == '#') continue;
    const std::string at = fmt::format("{}:{}", path, line);
    if (header_line == 0) {
      header_line = line;
      delimiter = csv::guess_delimiter(l);
      for (const std::string& h : csv::split_line(l, delimiter)) {
        const std::string key = column_key(h);
        const auto c = std::find_if(std::begin(kColumns), std::end(kColumns),
                                    [&](const ManifestColumn& x) { return x.name == key; });
        if (c == std::end(kColumns))
          throw InputError(fmt::format("{}: column {} is not a manifest column; allowed: {}", at,
                                       echo(h), allowed_columns()));
        if (std::find(columns.begin(), columns.end(), &*c) != columns.end())
          throw InputError(fmt::format("{}: column {} is given twice", at, echo(h)));
        columns.push_back(&*c);
      }
      if (std::none_of(columns.begin(), columns.end(),
                       [](const ManifestColumn* c) { return c->name == "weather"; }))
        throw InputError(fmt::format("{}: the header has no weather column; allowed: {}", at,
                                     allowed_columns()));
      continue;
    }
    std::vector<std::string> cells = csv::split_line(l, delimiter);
    while (cells.size() > columns.size() && text::trim(cells.back()).empty()) cells.pop_back();
    if (cells.size() != columns.size())
      throw InputError(fmt::format("{}: the row has {} fields but the header (line {}) has {}", at,
                                   cells.size(), header_line, columns.size()));
    ManifestRow r;
    r.index = m.rows.size();
    r.line = line;
    r.origin = at;
    for (std::size_t c = 0; c < columns.size(); ++c) {
      const std::string cell(text::trim(cells[c]));
      if (columns[c]->field) {
        r.*(columns[c]->field) = cell;
      } else if (!cell.empty()) {
        const plausible::Band* band = plausible::find("site.elevation");
        std::vector<std::string> warnings;
        const std::string origin = at + ": elevation";
        const double z =
            plausible::parse(*band, cell, bare, {origin, plausible::in_file(bare)}, warnings);
        if (z < psychro::kMinElevationM || z > psychro::kMaxElevationM)
          throw InputError(fmt::format("{}: {} is outside {} to {} m", origin, echo(cell),
                                       psychro::kMinElevationM, psychro::kMaxElevationM));
        r.elevation_m = z;
        r.warnings = std::move(warnings);
      }
    }
    if (r.weather.empty())
      throw InputError(fmt::format("{}: weather: empty; allowed: the path of a weather file", at));
    const auto resolve = [&](const std::string& p) {
      return fs::path(p).is_absolute() ? p : (folder / p).string();
    };
    r.weather_path = resolve(r.weather);
    if (!r.unit.empty()) r.unit_path = resolve(r.unit);
    m.rows.push_back(std::move(r));
  }
  if (header_line == 0)
    throw InputError(
        fmt::format("{}: the manifest is empty; allowed: a header line naming "
                    "the columns ({}) and one row per site",
                    path, allowed_columns()));
  if (m.rows.empty())
    throw InputError(fmt::format("{}:{}: the header is followed by no sites", path, header_line));
  return m;
}

Shard parse_shard(std::string_view text, std::string_view origin) {
  const auto bad = [&]() -> InputError {
    return InputError(fmt::format("{}: {} is not a shard; allowed: K/N with 1 <= K <= N <= {}",
                                  origin, echo(text), kMaxShards));
  };
  const std::size_t slash = text.find('/');
  if (slash == std::string_view::npos) throw bad();
  Shard s;
  const auto whole = [&](std::string_view t, std::size_t& v) {
    t = text::trim(t);
    const auto r = std::from_chars(t.data(), t.data() + t.size(), v);
    return !t.empty() && r.ec == std::errc() && r.ptr == t.data() + t.size();
  };
  if (!whole(text.substr(0, slash), s.index) || !whole(text.substr(slash + 1), s.count) ||
      s.index < 1 || s.count < s.index || s.count > kMaxShards)
    throw bad();
  return s;
}

// --- The survey -----------------------------------------------------------------------------

Survey::Survey(Manifest manifest, const std::string& unit_path, const WeatherOverrides& overrides,
               const SurveyOptions& options)
    : manifest_(std::move(manifest)), options_(options), overrides_(overrides) {
  // Read once: the fingerprint covers the bytes the unit was parsed from.
  const std::string unit_text = read_input_file(unit_path, "the unit file", kMaxUnitFileBytes);
  const UnitFile file = parse_unit_file(unit_text, unit_path);
  tables_ = std::make_unique<codes::CodeTables>(codes::CodeTables::load_installed());
  base_ = batch_base(file, unit_path, tables_.get());
  info_.manifest = manifest_.source;
  info_.unit = unit_path;
  info_.rows = manifest_.rows.size();
  info_.units = options.units;
  info_.tune = options.tune;
  info_.currency = file.plant ? file.plant->currency : std::string();
  info_.unit_warnings = file.warnings;
  info_.version = version();
  Fingerprint f;
  f.add(manifest_.bytes);
  f.add(unit_text);
  f.add(units::system_name(options.units));
  f.add(options.tune ? "tune" : "no-tune");
  info_.fingerprint = f.hex();
}

Survey::~Survey() = default;

namespace {

std::string condition_label(const highlimit::Condition& c) {
  return fmt::format("{} {}", highlimit::quantity_name(c.quantity),
                     c.reference == highlimit::Reference::fixed ? "limit" : "offset");
}

// The site's unit: the row's own file, else the template; then the manifest's [site] values.
YearInputs site_base(const YearInputs& tmpl, const ManifestRow& row,
                     const codes::CodeTables& tables) {
  YearInputs base = row.unit_path.empty()
                        ? tmpl
                        : batch_base(load_unit_file(row.unit_path), row.unit_path, &tables);
  Site& site = base.unit.site;
  const auto set = [&](std::string& value, std::string& origin, const std::string& from,
                       std::string_view column) {
    if (from.empty()) return;
    value = from;
    origin = fmt::format("{}: {}", row.origin, column);
  };
  site.name = row.site.empty() ? fs::path(row.weather).stem().string() : row.site;
  set(site.energy_code, site.energy_code_origin, row.energy_code, "energy_code");
  set(site.climate_zone, site.climate_zone_origin, row.climate_zone, "climate_zone");
  if (row.elevation_m) {
    site.elevation_m = row.elevation_m;
    site.pressure_kpa.reset();
    site.pressure_origin = fmt::format("{}: elevation", row.origin);
  }
  base.strategies = strategies_or_presets(base.unit, tables);
  return base;
}

}  // namespace

SiteRecord Survey::evaluate(const ManifestRow& row) const {
  SiteRecord r;
  r.row = row.index;
  r.line = row.line;
  r.weather = row.weather;
  r.site = row.site.empty() ? fs::path(row.weather).stem().string() : row.site;
  try {
    const YearInputs base = site_base(base_, row, *tables_);
    const Site& site = base.unit.site;
    r.zone = site.climate_zone;
    r.code = site.energy_code;
    if ((base.unit.plant ? base.unit.plant->currency : std::string()) != info_.currency)
      throw InputError(fmt::format(
          "{}: unit: {} ranks by {} but the survey's unit ranks by {}; allowed: one measure for "
          "every site",
          row.origin, echo(row.unit), base.unit.plant ? "cost" : "weighted energy",
          info_.currency.empty() ? "weighted energy" : "cost"));
    const YearInputs in = with_weather(base, row.weather_path, overrides_);
    r.warnings = row.warnings;
    // The template's own warnings are the survey's, said once; the rest are this site's.
    const std::size_t own = row.unit_path.empty() ? base_.unit.warnings.size() : 0;
    r.warnings.insert(r.warnings.end(), in.warnings.begin() + static_cast<std::ptrdiff_t>(own),
                      in.warnings.end());
    const annual::Prepared prepared = prepare_year(in);
    const annual::YearResult year = annual::evaluate(in.strategies, prepared);
    std::vector<std::string> words;
    if (!site.energy_code.empty() || !site.climate_zone.empty()) {
      if (site.energy_code.empty() || site.climate_zone.empty())
        throw InputError(
            fmt::format("{}: give both energy_code and climate_zone, or neither (here only {})",
                        row.origin, site.energy_code.empty() ? "climate_zone" : "energy_code"));
      std::optional<double> pressure;
      if (site.elevation_m || site.pressure_kpa) pressure = site.design_pressure_kpa();
      const codes::ZoneRequirements zone = codes::requirements(
          tables_->edition(site.energy_code, site.energy_code_origin), site.climate_zone,
          {pressure, std::nullopt}, site.climate_zone_origin);
      words = codes::compliance_words(zone, in.strategies);
      r.economizer = std::string(
          codes::need_text(codes::economizer_need(zone, cooling_capacity(in.unit).kw).need));
    }
    r.operating_hours = year.operating_hours;
    r.perfect_savings = year.perfect_changeover.savings_vs_no_economizer_kwh;
    std::optional<TuneResult> tuned;
    if (options_.tune) {
      TuneOptions t;
      t.units = options_.units;
      t.threads = 1;  // the sites are the parallel items
      t.cancel = options_.cancel;
      tuned = run_tune(in, prepared, t);
      if (tuned->partial) throw InputError("interrupted");
    }
    std::vector<decision::Candidate> candidates;
    for (const annual::StrategyResult& s : year.strategies) {
      StrategyFigures f;
      f.name = s.name;
      const auto at = std::find_if(in.strategies.begin(), in.strategies.end(),
                                   [&](const highlimit::Strategy& x) { return x.name == s.name; });
      const std::size_t k = static_cast<std::size_t>(at - in.strategies.begin());
      if (k < words.size()) f.compliance = words[k];
      f.shortfall = s.shortfall_vs_perfect_kwh;
      f.savings = s.savings_vs_no_economizer_kwh;
      f.harmful_hours = s.annual.harmful_hours;
      f.missed_hours = s.annual.missed_hours;
      if (tuned && k < tuned->strategies.size()) {
        const StrategyTuning& t = tuned->strategies[k];
        const tuning::Point& best = t.curve.best_point();
        for (std::size_t a = 0; a < t.curve.axes.size(); ++a) {
          const tuning::Axis& ax = t.curve.axes[a];
          f.best_setting.push_back(
              {condition_label(t.strategy.conditions[ax.condition]), ax.kind(), best.values[a]});
        }
        f.tuned_shortfall = best.shortfall_kwh;
        f.tuned_compliance = t.best_verdict;
      }
      candidates.push_back({f.name, f.shortfall, f.compliance});
      r.strategies.push_back(std::move(f));
    }
    const decision::Recommendation rec = decision::recommend(
        candidates, decision::tie_tolerance(r.perfect_savings, !info_.currency.empty()));
    r.tolerance = rec.tolerance;
    for (const std::size_t i : rec.best) r.best.push_back(candidates[i].name);
    for (const std::size_t i : rec.best_compliant) r.best_compliant.push_back(candidates[i].name);
    r.ok = true;
  } catch (const std::exception& e) {
    // A failing site keeps its error and never stops the others.
    SiteRecord failed;
    failed.row = r.row;
    failed.line = r.line;
    failed.site = r.site;
    failed.weather = r.weather;
    failed.zone = row.climate_zone.empty() ? base_.unit.site.climate_zone : row.climate_zone;
    failed.code = row.energy_code.empty() ? base_.unit.site.energy_code : row.energy_code;
    failed.error = e.what();
    r = std::move(failed);
  }
  return r;
}

bool Survey::run(const Shard& shard, const std::function<void(const SiteRecord&)>& emit) const {
  std::vector<const ManifestRow*> rows;
  for (const ManifestRow& r : manifest_.rows)
    if (shard.has(r.index)) rows.push_back(&r);
  const std::size_t threads =
      options_.threads ? options_.threads : std::max(1u, std::thread::hardware_concurrency());
  const std::size_t chunk =
      options_.chunk ? options_.chunk : std::max<std::size_t>(64, 8 * threads);
  std::vector<SiteRecord> done;
  for (std::size_t from = 0; from < rows.size(); from += chunk) {
    const std::size_t n = std::min(chunk, rows.size() - from);
    done.assign(n, SiteRecord{});
    const ParallelRun run{options_.threads, options_.cancel, nullptr};
    const std::vector<std::uint8_t> finished = parallel_for(n, run, [&]() -> ParallelWork {
      return [&](std::size_t i) { done[i] = evaluate(*rows[from + i]); };
    });
    for (std::size_t i = 0; i < n; ++i) {
      if (!finished[i]) return false;
      emit(done[i]);
    }
    if (options_.progress) options_.progress(from + n, rows.size());
    if (options_.cancel && options_.cancel->load()) return from + n == rows.size();
  }
  return true;
}

// --- Partial results ------------------------------------------------------------------------

namespace {

// Every double of a partial: 17 significant digits read back bit for bit.
constexpr int kExact = 17;

struct KindName {
  units::Kind kind;
  std::string_view name;
};
constexpr KindName kKindNames[] = {
    {units::Kind::temperature, "temperature"},
    {units::Kind::temperature_difference, "temperature-difference"},
    {units::Kind::enthalpy, "enthalpy"},
    {units::Kind::enthalpy_difference, "enthalpy-difference"},
    {units::Kind::humidity_ratio, "humidity-ratio"},
};

std::string_view kind_key(units::Kind k) {
  for (const auto& n : kKindNames)
    if (n.kind == k) return n.name;
  throw std::logic_error("survey: a setting of an unexpected kind");
}

std::vector<std::string> strings(const json::Object& o, std::string_view key,
                                 std::string_view where) {
  std::vector<std::string> out;
  for (const json::Value& v : json::member(o, key, where).array(where, key))
    out.push_back(v.string(where, key));
  return out;
}

std::string text_of(const json::Object& o, std::string_view key, std::string_view where) {
  return json::member(o, key, where).string(where, key);
}
double number_of(const json::Object& o, std::string_view key, std::string_view where) {
  return json::member(o, key, where).number(where, key);
}
std::size_t count_of(const json::Object& o, std::string_view key, std::string_view where) {
  const double v = number_of(o, key, where);
  if (v < 0 || v > 1e15 || v != static_cast<double>(static_cast<std::size_t>(v)))
    throw InputError(fmt::format("{}: {}: expected a whole number", where, key));
  return static_cast<std::size_t>(v);
}

json::Object line_object(std::string_view line, std::string_view where) {
  const json::Value v = json::parse(line, where);
  return v.object(where, "line");
}

}  // namespace

std::string header_line(const SurveyInfo& info, const Shard& shard) {
  report::Json j(0);
  j.begin_object();
  j.field("limitline_survey_partial", kPartialFormat);
  j.field("version", info.version);
  j.field("fingerprint", info.fingerprint);
  j.field("manifest", info.manifest);
  j.field("unit", info.unit);
  j.field("rows", info.rows);
  j.field("units", units::system_name(info.units));
  j.field("tune", info.tune);
  j.field("currency", info.currency);
  j.strings("unit_warnings", info.unit_warnings);
  j.field("shard", shard.index);
  j.field("shards", shard.count);
  j.end_object();
  return j.str();
}

std::string record_line(const SiteRecord& r) {
  report::Json j(0);
  j.begin_object();
  j.field("row", r.row);
  j.field("line", r.line);
  j.field("site", r.site);
  j.field("weather", r.weather);
  j.field("zone", r.zone);
  j.field("code", r.code);
  j.field("status", r.ok ? "ok" : "failed");
  if (!r.ok) {
    j.field("error", r.error);
  } else {
    j.strings("warnings", r.warnings);
    j.field("economizer", r.economizer);
    j.field("operating_hours", r.operating_hours, kExact);
    j.field("perfect_savings", r.perfect_savings, kExact);
    j.field("tolerance", r.tolerance, kExact);
    j.strings("best", r.best);
    j.strings("best_compliant", r.best_compliant);
    j.key("strategies").begin_array();
    for (const StrategyFigures& f : r.strategies) {
      j.begin_object();
      j.field("name", f.name);
      j.field("compliance", f.compliance);
      j.field("shortfall", f.shortfall, kExact);
      j.field("savings", f.savings, kExact);
      j.field("harmful_hours", f.harmful_hours, kExact);
      j.field("missed_hours", f.missed_hours, kExact);
      if (f.tuned_shortfall) {
        j.key("best_setting").begin_array();
        for (const Setting& s : f.best_setting) {
          j.begin_object();
          j.field("condition", s.condition);
          j.field("kind", kind_key(s.kind));
          j.field("value", s.value, kExact);
          j.end_object();
        }
        j.end_array();
        j.field("tuned_shortfall", *f.tuned_shortfall, kExact);
        j.field("tuned_compliance", f.tuned_compliance);
      }
      j.end_object();
    }
    j.end_array();
  }
  j.end_object();
  return j.str();
}

std::string end_line(std::size_t sites, bool complete) {
  report::Json j(0);
  j.begin_object();
  j.field("end", true);
  j.field("sites", sites);
  j.field("complete", complete);
  j.end_object();
  return j.str();
}

SurveyInfo parse_header(std::string_view line, std::string_view where, Shard& shard) {
  const json::Object o = line_object(line, where);
  if (!json::find(o, "limitline_survey_partial"))
    throw InputError(
        fmt::format("{}: not a partial survey result of limitline (its first line "
                    "has no limitline_survey_partial)",
                    where));
  if (number_of(o, "limitline_survey_partial", where) != kPartialFormat)
    throw InputError(fmt::format("{}: partial format {} is not the {} this limitline reads", where,
                                 number_of(o, "limitline_survey_partial", where), kPartialFormat));
  SurveyInfo s;
  s.version = text_of(o, "version", where);
  s.fingerprint = text_of(o, "fingerprint", where);
  s.manifest = text_of(o, "manifest", where);
  s.unit = text_of(o, "unit", where);
  s.rows = count_of(o, "rows", where);
  s.units = units::parse_system(text_of(o, "units", where), std::string(where) + ": units");
  s.tune = json::member(o, "tune", where).boolean(where, "tune");
  s.currency = text_of(o, "currency", where);
  s.unit_warnings = strings(o, "unit_warnings", where);
  shard.index = count_of(o, "shard", where);
  shard.count = count_of(o, "shards", where);
  if (shard.index < 1 || shard.index > shard.count || shard.count > kMaxShards)
    throw InputError(
        fmt::format("{}: shard {}/{} is not a shard", where, shard.index, shard.count));
  return s;
}

SiteRecord parse_record(std::string_view line, std::string_view where) {
  const json::Object o = line_object(line, where);
  SiteRecord r;
  r.row = count_of(o, "row", where);
  r.line = static_cast<int>(count_of(o, "line", where));
  r.site = text_of(o, "site", where);
  r.weather = text_of(o, "weather", where);
  r.zone = text_of(o, "zone", where);
  r.code = text_of(o, "code", where);
  const std::string status = text_of(o, "status", where);
  if (status != "ok" && status != "failed")
    throw InputError(fmt::format("{}: status: {} is not ok or failed", where, echo(status)));
  r.ok = status == "ok";
  if (!r.ok) {
    r.error = text_of(o, "error", where);
    return r;
  }
  r.warnings = strings(o, "warnings", where);
  r.economizer = text_of(o, "economizer", where);
  r.operating_hours = number_of(o, "operating_hours", where);
  r.perfect_savings = number_of(o, "perfect_savings", where);
  r.tolerance = number_of(o, "tolerance", where);
  r.best = strings(o, "best", where);
  r.best_compliant = strings(o, "best_compliant", where);
  for (const json::Value& v : json::member(o, "strategies", where).array(where, "strategies")) {
    const json::Object& s = v.object(where, "strategies");
    StrategyFigures f;
    f.name = text_of(s, "name", where);
    f.compliance = text_of(s, "compliance", where);
    f.shortfall = number_of(s, "shortfall", where);
    f.savings = number_of(s, "savings", where);
    f.harmful_hours = number_of(s, "harmful_hours", where);
    f.missed_hours = number_of(s, "missed_hours", where);
    if (json::find(s, "tuned_shortfall")) {
      for (const json::Value& b :
           json::member(s, "best_setting", where).array(where, "best_setting")) {
        const json::Object& bo = b.object(where, "best_setting");
        Setting st;
        st.condition = text_of(bo, "condition", where);
        const std::string kind = text_of(bo, "kind", where);
        const auto k = std::find_if(std::begin(kKindNames), std::end(kKindNames),
                                    [&](const KindName& n) { return n.name == kind; });
        if (k == std::end(kKindNames))
          throw InputError(fmt::format("{}: kind: {} is not a setting's kind", where, echo(kind)));
        st.kind = k->kind;
        st.value = number_of(bo, "value", where);
        f.best_setting.push_back(std::move(st));
      }
      f.tuned_shortfall = number_of(s, "tuned_shortfall", where);
      f.tuned_compliance = text_of(s, "tuned_compliance", where);
    }
    r.strategies.push_back(std::move(f));
  }
  return r;
}

// --- Merge ----------------------------------------------------------------------------------

namespace {

// One partial file read a line at a time.
class PartialReader {
 public:
  explicit PartialReader(std::string path) : path_(std::move(path)) {
    check_input_file(path_, "the partial survey result");
    in_.open(path_, std::ios::binary);
    if (!in_)
      throw InputError(fmt::format("{}: cannot open the partial survey result", echo(path_)));
    std::string line;
    if (!next(line))
      throw InputError(
          fmt::format("{}: the file is empty; allowed: a partial "
                      "survey result written by limitline survey "
                      "--shard",
                      path_));
    info_ = parse_header(line, where(), shard_);
  }

  [[nodiscard]] const SurveyInfo& info() const { return info_; }
  [[nodiscard]] const Shard& shard() const { return shard_; }
  [[nodiscard]] const std::string& path() const { return path_; }
  [[nodiscard]] std::string where() const { return fmt::format("{}:{}", path_, line_no_); }

  // The next record; false at the end line (checked against the records read).
  bool record(SiteRecord& r) {
    std::string line;
    if (!next(line))
      throw InputError(
          fmt::format("{}: the file ends without its end line: cut short, or the "
                      "shard is still running",
                      where()));
    const json::Object o = line_object(line, where());
    if (json::find(o, "end")) {
      if (!json::member(o, "complete", where()).boolean(where(), "complete"))
        throw InputError(
            fmt::format("{}: shard {}/{} was interrupted before its last site; run "
                        "it again",
                        where(), shard_.index, shard_.count));
      if (count_of(o, "sites", where()) != read_)
        throw InputError(fmt::format("{}: the end line counts {} sites but the file has {}",
                                     where(), count_of(o, "sites", where()), read_));
      return false;
    }
    r = parse_record(line, where());
    if (!shard_.has(r.row) || r.row >= info_.rows || (read_ > 0 && r.row <= last_row_))
      throw InputError(fmt::format("{}: row {} does not belong here (shard {}/{}, after row {})",
                                   where(), r.row, shard_.index, shard_.count, last_row_));
    last_row_ = r.row;
    ++read_;
    return true;
  }

 private:
  // A record is a few kilobytes; a longer line is no partial of ours, and is refused before
  // it can take the memory a merge promises not to.
  static constexpr std::size_t kMaxLine = 1u << 20;
  bool next(std::string& line) {
    line.clear();
    std::streambuf* sb = in_.rdbuf();
    for (;;) {
      const auto c = sb->sbumpc();
      if (c == std::char_traits<char>::eof()) {
        if (line.empty()) return false;
        break;
      }
      if (c == '\n') break;
      line.push_back(static_cast<char>(c));
      if (line.size() > kMaxLine)
        throw InputError(
            fmt::format("{}:{}: a line longer than {} bytes; allowed: the lines "
                        "limitline survey --shard writes",
                        path_, line_no_ + 1, kMaxLine));
    }
    ++line_no_;
    return true;
  }
  std::string path_;
  std::ifstream in_;
  int line_no_ = 0;
  SurveyInfo info_;
  Shard shard_;
  std::size_t read_ = 0, last_row_ = 0;
};

bool same_survey(const SurveyInfo& a, const SurveyInfo& b) {
  return a.version == b.version && a.fingerprint == b.fingerprint && a.manifest == b.manifest &&
         a.unit == b.unit && a.rows == b.rows && a.units == b.units && a.tune == b.tune &&
         a.currency == b.currency && a.unit_warnings == b.unit_warnings;
}

}  // namespace

SurveyInfo merge_partials(const std::vector<std::string>& files,
                          const std::function<void(const SiteRecord&)>& emit) {
  if (files.empty()) throw InputError("merge: no partial results given");
  std::vector<std::unique_ptr<PartialReader>> readers;
  for (const std::string& f : files) readers.push_back(std::make_unique<PartialReader>(f));
  const PartialReader& first = *readers.front();
  const std::size_t n = first.shard().count;
  std::vector<const PartialReader*> by_shard(n + 1, nullptr);
  for (const auto& r : readers) {
    if (!same_survey(r->info(), first.info()))
      throw InputError(
          fmt::format("{}: another survey than {} (manifest, unit, settings or "
                      "limitline version differ); allowed: the shards of one survey",
                      r->path(), first.path()));
    if (r->shard().count != n)
      throw InputError(
          fmt::format("{}: shard {}/{}, but {} is one of {}; allowed: the shards of "
                      "one split",
                      r->path(), r->shard().index, r->shard().count, first.path(), n));
    const PartialReader*& slot = by_shard[r->shard().index];
    if (slot)
      throw InputError(fmt::format("{}: shard {}/{} is also {}; allowed: each shard once",
                                   r->path(), r->shard().index, n, slot->path()));
    slot = r.get();
  }
  std::string missing;
  std::size_t missing_count = 0;
  for (std::size_t k = 1; k <= n; ++k)
    if (!by_shard[k] && missing_count++ < 10) missing += fmt::format(" {}/{}", k, n);
  if (missing_count)
    throw InputError(fmt::format("merge: {} of {} shards missing:{}{}", missing_count, n, missing,
                                 missing_count > 10 ? " ..." : ""));
  // Row i is shard (i mod N) + 1's: so the rows come round-robin, one reader after another.
  std::vector<SiteRecord> next(readers.size());
  std::vector<bool> has(readers.size());
  std::vector<std::size_t> reader_of(n + 1);
  for (std::size_t i = 0; i < readers.size(); ++i) {
    reader_of[readers[i]->shard().index] = i;
    has[i] = readers[i]->record(next[i]);
  }
  for (std::size_t row = 0; row < first.info().rows; ++row) {
    const std::size_t i = reader_of[row % n + 1];
    if (!has[i] || next[i].row != row)
      throw InputError(
          fmt::format("{}: row {} of the manifest is missing", readers[i]->where(), row));
    emit(next[i]);
    has[i] = readers[i]->record(next[i]);
  }
  for (std::size_t i = 0; i < readers.size(); ++i)
    if (has[i])
      throw InputError(fmt::format("{}: row {} is beyond the manifest's {} rows",
                                   readers[i]->where(), next[i].row, first.info().rows));
  return first.info();
}

}  // namespace limitline::survey
