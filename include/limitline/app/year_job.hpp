#pragma once
// Everything `limitline year` (and the report, chart and sensor commands) needs, assembled
// from a unit file: its weather series read with the unit's mapping, its schedule, its
// strategies, the prepared year and the context lines of the report.
#include <limitline/analysis/annual.hpp>
#include <limitline/report/year.hpp>
#include <limitline/io/loads_file.hpp>
#include <limitline/io/schedule_file.hpp>
#include <limitline/io/unit_file.hpp>
#include <limitline/io/weather.hpp>

#include <atomic>
#include <memory>
#include <optional>
#include <string>
#include <vector>

namespace limitline {

// Where the unit file came from: a path, or the name of an embedded demo unit.
struct UnitSource {
  std::string path;  // file path, or the embedded name
  bool embedded = false;
};

// Demo names and their embedded unit files ("harbourside" → "demo-harbourside.toml").
std::vector<std::string> demo_names();
UnitSource demo_unit(std::string_view demo_name);  // InputError for an unknown name

// Overrides from the command line, applied on top of the unit file's [weather] table.
struct WeatherOverrides {
  std::optional<std::string> file;  // --weather
  // Column choices (the command line's --column QUANTITY=HEADER[:UNIT]), each with the
  // origin its messages name.
  struct Column {
    weather::Quantity quantity;
    std::string header;
    std::optional<std::string> unit;
    std::string origin;
  };
  std::vector<Column> columns;
  std::optional<std::string> humidity;         // --humidity
  std::optional<std::string> on_bad_row;       // --on-bad-row
  std::optional<std::string> time_convention;  // --time-convention
  std::optional<std::string> max_bad_share;    // --max-bad-share, e.g. "5%"
};

// How far the weather file's median station pressure may lie from the unit's site pressure
// before it is a warning: 2 kPa, about 200 m of elevation near sea level (eq. 3).
inline constexpr double kSitePressureToleranceKpa = 2.0;

// "FILE:LINE: site.elevation: ..." when the unit gives an elevation or pressure, the weather
// file has a pressure column, and the file's median differs from the site's by more than the
// tolerance; nothing otherwise.
std::optional<std::string> site_pressure_warning(const UnitFile& unit,
                                                 const weather::WeatherInfo& weather);

// The weather file the unit file itself names, read with its [weather] table; `label` is set
// to the path read. InputError when it names none or it cannot be read.
weather::WeatherSeries read_unit_weather(const UnitFile& unit, std::string& label);

struct YearInputs {
  UnitFile unit;
  std::string unit_label;  // the path, or "embedded demo unit NAME"
  weather::WeatherSeries weather;
  std::string weather_label;
  Schedule schedule;
  std::vector<highlimit::Strategy> strategies;
  // The unit file's warnings, then the weather's and the site's, then the loads file's (see
  // UnitFile::warnings).
  std::vector<std::string> warnings;
  // [loads] file = ...: the file as read (once, shared by the sites of a batch run), the path
  // it was read from, and its loads matched to `weather`, one per weather.hours entry. All
  // empty without a loads file.
  std::shared_ptr<const loads::LoadsTable> loads_table;
  std::string loads_label;
  std::vector<part_load::SpaceLoads> hourly_loads;
};

// The unit's hourly loads file, read (from the embedded demo data for an embedded unit), its
// path in `label`; nullptr when the unit names none. InputError when it cannot be read.
std::shared_ptr<const loads::LoadsTable> read_unit_loads(const UnitFile& unit, bool embedded_unit,
                                                         std::string& label);

// Loads the unit file (or embedded demo), reads its weather, schedule, strategies and hourly
// loads (matched to the weather). `weather_file` replaces the weather file named by the unit
// (used by batch runs).
YearInputs load_year_inputs(const UnitSource& source, const WeatherOverrides& overrides);
// A unit file and its weather given as text (the study page's uploads): nothing is read from
// disk. Errors name `unit_name` and `weather_name` where the command names the paths. The
// unit's [weather] columns apply unless `weather_by_header` (as for a demo unit with a file
// of the user's, which `year --demo NAME --weather FILE` reads by its own header); its
// `file` key is not read. A [loads] file is refused: a request never names a file on disk.
struct TextSources {
  std::string_view unit_text;
  std::string unit_name = "uploaded unit file";
  std::string_view weather_text;
  std::string weather_name = "uploaded weather file";
  bool weather_by_header = false;
};
YearInputs load_year_inputs(const TextSources& sources);
// The same unit with another weather file (batch mode): reuses the parsed unit and its loads
// file as read (read here when `base` has none), matched to the new weather.
YearInputs with_weather(const YearInputs& base, const std::string& weather_path,
                        const WeatherOverrides& overrides);

// The unit of a batch or survey (every site evaluated with it): its schedule, strategies and
// loads file read once, no weather yet. `label` names it in the reports. With `tables`, the
// code tables already loaded are used instead of reading them again.
YearInputs batch_base(const UnitFile& unit, std::string label,
                      const codes::CodeTables* tables = nullptr);

// The weather series as the annual engine's intervals.
std::vector<annual::OutdoorInterval> outdoor_intervals(const weather::WeatherSeries& w);

// With `priced` and a [plant], the hours are weighed by cost (the references and the ranking
// choose by cost); otherwise by the [energy] weights.
annual::Prepared prepare_year(const YearInputs& in, bool compute_dew_point = true,
                              bool priced = true);

// The report's header lines and strategy descriptions.
report::YearContext year_context(const YearInputs& in, units::System units);

// Which energy-code edition and climate zone to judge the strategies against: the unit
// file's [site] energy_code and climate_zone, unless given here; extra code-table files as
// with `limitline code --code-table`.
struct CodeSelection {
  std::optional<std::string> edition;
  std::optional<std::string> zone;
  std::vector<std::string> extra_tables;
};

// Adds the compliance column (one word per strategy) and the code line to the report context
// when an edition and a zone are known; does nothing when neither is. One without the other
// is an InputError naming the missing key.
void add_compliance(report::YearContext& context, const YearInputs& in, const CodeSelection& code);

}  // namespace limitline

namespace limitline {

// Every *.csv entry of `dir`, sorted by name: the sites of a batch run. InputError when `dir`
// is no folder, cannot be listed or holds none.
std::vector<std::string> batch_weather_files(const std::string& dir,
                                             std::string_view option = "--batch");

// One site of a batch run: its result, or the one-line error that stopped it.
struct BatchSite {
  std::string weather_path;
  bool run = false;  // false: the batch was cancelled before this site started
  bool ok = false;
  std::string error;
  double operating_hours = 0;
  annual::YearResult result;
};

// Every *.csv entry of `dir` (sorted by name) evaluated with the unit of `base`, on `threads`
// threads (0: all cores). Results are in file order whatever the thread count. An entry that
// is no readable weather file (a folder named x.csv, a dangling link) is a failing site with
// its reason. `progress` is called with (done, total) as sites finish, on the calling thread.
// When `*cancel` turns true no further site starts; the sites under way finish.
std::vector<BatchSite> run_year_batch(const YearInputs& base, const std::string& dir,
                                      const WeatherOverrides& overrides, unsigned threads,
                                      void (*progress)(std::size_t, std::size_t) = nullptr,
                                      const std::atomic<bool>* cancel = nullptr);

}  // namespace limitline
