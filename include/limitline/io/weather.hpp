#pragma once
// Hourly (or sub-hourly) outdoor weather: reading a CSV series of outdoor-air states in any
// common layout, validating it, and saying exactly how it was read.
//
// The series is SI (°C, kg/kg, kPa). Each row's humidity is resolved to a humidity ratio at
// that row's own pressure (the file's hourly pressure when it has one, else the site
// pressure the caller passes), so later layers never see the file's units or humidity kind.
#include <limitline/error.hpp>
#include <limitline/io/timeseries.hpp>

#include <limitline/io/raw_table.hpp>

#include <array>
#include <filesystem>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace limitline::weather {

// One row of the series. `hour` is the hour-beginning index of the row's interval (a file
// stamped hour-ending, 01:00..24:00, is converted); `day_of_year` is 0-based and counts
// Feb 29 only when the file has one.
struct WeatherHour {
  int month = 1;   // 1–12
  int day = 1;     // 1–31
  int hour = 0;    // 0–23
  int minute = 0;  // 0–59: start of a sub-hourly interval within its hour
  int day_of_year = 0;
  double weight_h = 1.0;  // length of the row's interval, hours (1 for hourly data)
  double dry_bulb_c = 0.0;
  double humidity_ratio = 0.0;  // kg water / kg dry air
  double pressure_kpa = 0.0;
};

// Columns the reader can find. The first six carry a value; the rest place a row in time.
enum class Quantity {
  dry_bulb,
  dew_point,
  relative_humidity,
  wet_bulb,
  humidity_ratio,
  pressure,
  timestamp,  // date and clock time in one field (ISO 8601, YYYYMMDD:HHMM, ...)
  date,
  time,  // clock time of day
  year,
  month,
  day,
  hour,
  minute,
};
inline constexpr std::size_t kQuantityCount = 14;

// Key in the [weather] table ("dry_bulb") and name in messages ("dry-bulb").
std::string_view quantity_key(Quantity q);
std::string_view quantity_label(Quantity q);
// The quantity with [weather] key `key`, if any.
std::optional<Quantity> quantity_from_key(std::string_view key);

// The humidity columns in the default order of preference.
enum class HumiditySource { dew_point, humidity_ratio, wet_bulb, relative_humidity };
std::string_view humidity_source_name(HumiditySource h);  // "dew-point", ...
// "dew-point" | "humidity-ratio" | "wet-bulb" | "relative-humidity"; else InputError naming
// `origin`.
HumiditySource parse_humidity_source(std::string_view text, std::string_view origin);

// What to do with a row whose value is missing or physically impossible.
enum class BadRowPolicy {
  error,  // stop with a message naming file, line, column and value (the default)
  skip,   // drop the row, counted by month
  fill,   // replace the row by linear interpolation between its good neighbours in time
};
std::string_view bad_row_policy_name(BadRowPolicy p);
BadRowPolicy parse_bad_row_policy(std::string_view text, std::string_view origin);

// The share of a file's rows that `skip` or `fill` may drop or replace before the read is
// refused: beyond it the column is more likely wrong than its readings missing.
inline constexpr double kDefaultMaxBadShare = 0.01;
// "5%" (a percentage, 0 % to 100 %) as a fraction; else InputError naming `origin`.
double parse_max_bad_share(std::string_view text, std::string_view origin);

// True when `unit` is a spelling the reader accepts for the column of `q` ("F" for a
// dry-bulb, "mbar" for a pressure); time columns accept none.
bool accepts_unit(Quantity q, std::string_view unit);

// Whether a time stamp marks the start or the end of its interval. `automatic` reads a file
// with 24:00 stamps as hour-ending and any other file as hour-beginning.
enum class TimeConvention { automatic, hour_beginning, hour_ending };
std::string_view time_convention_name(TimeConvention c);
TimeConvention parse_time_convention(std::string_view text, std::string_view origin);

// --- How to read a file: everything the reader would otherwise find by itself ------------

struct ColumnOverride {
  std::optional<std::string> column;  // header text of the column (case-insensitive)
  std::optional<std::string> unit;    // e.g. "C", "degF", "mbar", "Pa", "%", "g/kg"
  std::string origin;                 // where it was set ("unit.toml:12"), for messages
};

struct Mapping {
  std::optional<std::string> file;  // weather file named by the unit file, as written
  std::array<ColumnOverride, kQuantityCount> columns{};
  std::optional<HumiditySource> humidity;  // preferred humidity column
  BadRowPolicy on_bad_row = BadRowPolicy::error;
  TimeConvention time_convention = TimeConvention::automatic;
  std::optional<double> max_bad_share;  // 0–1; kDefaultMaxBadShare when not given
  std::string max_bad_share_origin;     // "unit.toml:14" or "--max-bad-share"

  ColumnOverride& column(Quantity q) { return columns[static_cast<std::size_t>(q)]; }
  const ColumnOverride& column(Quantity q) const { return columns[static_cast<std::size_t>(q)]; }
};

// Reads the unit file's [weather] table: file = "...", <quantity> = { column = "...",
// unit = "..." } for each Quantity key (time columns take only `column`), humidity = "...",
// on_bad_row = "...", time_convention = "hour-beginning" | "hour-ending",
// max_bad_share = "5%". Unknown keys,
// wrong types and unknown units are InputErrors naming `file_name`, the line and the key.
Mapping read_mapping(const RawTable& weather_table, std::string_view file_name);

// --- What was read, and how --------------------------------------------------------------

enum class ColumnFound { header_name, override };
enum class UnitFound {
  none,              // a time column
  header,            // from the header text, e.g. "Dry-bulb (C)"
  legend,            // from a legend line outside the table, e.g. "SP: ... (Pa)"
  override,          // from the mapping
  inferred,          // from the values: the only unit that gives plausible values
  same_as_dry_bulb,  // a dew point or wet-bulb without a unit of its own
};

struct ColumnUse {
  Quantity quantity;
  std::string header;  // the column's header text as written
  int index = 0;       // 0-based field index
  std::string unit;    // display label ("°C", "mbar"); empty for time columns
  ColumnFound found = ColumnFound::header_name;
  UnitFound unit_found = UnitFound::none;
  std::string unit_origin;  // "line 8784" for a legend, the override's origin, or the reason
  int other_matches = 0;    // further columns whose header also matched this quantity
  // Step of the written values in the column's own unit (1: whole degrees or percent, 0.1:
  // tenths); 0 when finer than a thousandth or when the file has under a day of values.
  double resolution = 0.0;
};

// Rows per calendar month (index 0 = January).
struct MonthCounts {
  int rows = 0;     // rows in the series
  int skipped = 0;  // bad rows dropped
  int filled = 0;   // bad rows replaced by interpolation
  int capped = 0;   // rows slightly beyond saturation (within tolerance) brought to it
  int rounded = 0;  // of those, rows beyond it by more than the fixed tolerance, within the
                    // rounding of the columns' resolution
};

// How the stamps are marked (local, utc, offset); they are used as written.
using Clock = timeseries::Clock;

struct TimeInfo {
  std::string columns;  // "'Date (MM/DD/YYYY)' + 'Time (HH:MM)'"
  std::string format;   // "MM/DD/YYYY HH:MM", "YYYYMMDD:HHMM", "ISO 8601", ...
  Clock clock = Clock::local;
  int utc_offset_min = 0;    // of the first row, when clock == offset
  bool hour_ending = false;  // stamps mark interval ends; converted to hour-beginning
  bool convention_overridden = false;
  int step_min = 60;  // time step
  double weight_h = 1.0;
  int missing_steps = 0;             // steps absent between consecutive rows of a month
  bool typical_year = false;         // months come from different years
  bool months_out_of_order = false;  // stamps go back in time at a month boundary
  std::array<int, 12> month_year{};  // year each month comes from (0: not given / absent)
  int leap_day_rows = 0;             // rows dated Feb 29 (kept)
};

struct WeatherInfo {
  std::string source;  // file name or the name given to an in-memory text
  int header_line = 0;
  int first_data_line = 0, last_data_line = 0;
  int rows_read = 0;  // data rows in the file, bad ones included
  char delimiter = ',';
  bool decimal_comma = false;
  std::vector<ColumnUse> columns;          // time columns first, then the value columns used
  std::vector<ColumnUse> unused_humidity;  // humidity columns present but not chosen
  HumiditySource humidity = HumiditySource::dew_point;
  bool humidity_overridden = false;
  bool pressure_from_file = false;
  double site_pressure_kpa = 0.0;             // used for every row when !pressure_from_file
  std::optional<double> median_pressure_kpa;  // of the rows read, when pressure_from_file
  TimeInfo time;
  BadRowPolicy policy = BadRowPolicy::error;
  double max_bad_share = kDefaultMaxBadShare;
  std::array<MonthCounts, 12> months{};
  // A dew point or wet-bulb (or an RH) above saturation by up to this much is read as
  // saturation: the fixed tolerance plus half the resolution of each column involved.
  double temperature_tolerance_k = 0.0;
  double relative_humidity_tolerance = 0.0;  // fraction above 1
  std::string rounding_words;  // "whole-degree", "tenth-percent"; empty without rounding
  int fill_longest_run = 0;    // most consecutive rows filled

  int skipped() const;
  int filled() const;
  int capped() const;
  int rounded() const;
  const ColumnUse* find(Quantity q) const;
};

struct WeatherSeries {
  WeatherInfo info;
  std::vector<WeatherHour> hours;  // in file order (the order of the year)
};

// Reads a weather CSV held in memory; `source_name` names it in messages. The site pressure
// (kPa, e.g. psychro::standard_pressure_kpa(elevation)) is used when the file has no
// pressure column. Throws InputError for anything it cannot read without guessing.
WeatherSeries read_text(std::string_view text, std::string_view source_name, const Mapping& mapping,
                        double site_pressure_kpa);
WeatherSeries read_file(const std::filesystem::path& path, const Mapping& mapping,
                        double site_pressure_kpa);

// A few human lines saying how the file was read, for the top of a report, e.g.
// "dry-bulb: column 'Dry-bulb (C)', °C (found by header)".
std::vector<std::string> describe(const WeatherInfo& info);

}  // namespace limitline::weather
