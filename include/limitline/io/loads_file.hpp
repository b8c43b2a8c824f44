#pragma once
// Hourly space loads exported by a load-calculation or simulation program ([loads] file =
// ...): a CSV with a sensible and an optional latent column, read once and matched to each
// weather series the unit is evaluated with.
//
// Reading is strict: a column the unit file names that the header lacks, a cell that is not
// a number (text, blank, NaN, a missing-value marker), a negative latent load, two rows for
// one interval, or a row count or time that does not line up with the weather is a one-line
// InputError naming the file, the line and the column.
#include <limitline/io/unit_file.hpp>
#include <limitline/io/weather.hpp>
#include <limitline/model/part_load.hpp>

#include <filesystem>
#include <string>
#include <string_view>
#include <vector>

namespace limitline::loads {

// One data row: the interval it covers and its loads (kW).
struct Row {
  int line = 0;
  // Start of the interval, after the time convention (0 when the file has no time columns):
  // month 1–12, day of the month, minute of the day.
  int month = 0, day = 0, minute = 0;
  part_load::SpaceLoads loads;
};

struct LoadsTable {
  std::string source;  // the file's name in messages
  int header_line = 0;
  // True when the file has time columns: its rows are matched to the weather by time, else
  // row by row.
  bool timed = false;
  std::string time_columns;  // "'Date' + 'Time'"; empty when not timed
  int step_min = 60;         // of a timed file
  bool hour_ending = false;  // stamps mark interval ends (moved to the start in each Row)
  std::string sensible_header, latent_header;  // latent_header empty: no latent column
  std::string sensible_unit, latent_unit;      // as used, e.g. "kW", "kBtu/h"
  std::vector<Row> rows;                       // in file order
};

// Reads the loads of `spec` (the unit file's [loads] table) from a CSV held in memory;
// `source` names it in messages.
[[nodiscard]] LoadsTable read_text(std::string_view text, std::string_view source,
                                   const UnitFile::LoadsFile& spec);
// The same from a file, refused by what it is or its size before it is read (input_file.hpp).
[[nodiscard]] LoadsTable read_file(const std::filesystem::path& path,
                                   const UnitFile::LoadsFile& spec);

struct Matched {
  std::vector<part_load::SpaceLoads> hours;  // one per weather.hours entry, in its order
  // Rows no weather interval uses, when the weather itself lacks intervals (one line).
  std::vector<std::string> warnings;
};
// The loads of each weather interval. By time: the row whose interval holds the weather
// interval's start, by month, day and time of day (a typical year's months come from
// different years); the loads file's step must be the weather's or a whole multiple of it.
// By row (no time columns): row n for weather row n, the counts equal. A weather interval
// without a row, or a row without a weather interval (unless the weather lacks intervals),
// is an InputError naming the first.
[[nodiscard]] Matched match(const LoadsTable& table, const weather::WeatherSeries& weather);

// One line saying how the file was read and matched, for a report's context block:
// "'Sensible (kW)' in kW sensible, 'Latent' in kBtu/h latent; 8760 rows matched by time
// stamp (60-min step, hour-ending)".
[[nodiscard]] std::string describe(const LoadsTable& table);

}  // namespace limitline::loads
