#pragma once
// Trend logs exported from a building automation system: time-stamped samples of the
// economizer's points (outdoor, return, mixed and supply air, damper, fan, cooling).
//
// Trend logs are irregular: samples come at uneven intervals, with gaps when the controller
// was offline. Each sample stands for the time until the next one, capped at a maximum gap so
// an outage is not filled with the last reading; what the cap drops is reported as coverage.
// Reading is strict where a mistake would mislead an audit: times that go backwards, one stamp
// with two different readings, a row whose field count is not the header's, and temperatures
// that cannot be in the unit their header names are one-line InputErrors naming file and line.
// Exact repeated rows are dropped and counted. Lines may end in LF, CR LF or CR alone; a UTF-8
// byte-order mark is skipped.
#include <limitline/model/units.hpp>

#include <array>
#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace limitline::trend {

// The points a trend log can carry. Temperatures °C, relative humidity and damper as
// fractions 0–1, fan and cooling 1 (on) or 0 (off); a cooling signal in % is read as on when
// above zero.
enum class Channel : std::uint8_t {
  outdoor_dry_bulb,
  outdoor_rh,
  outdoor_dew_point,
  return_dry_bulb,
  return_rh,
  return_dew_point,
  mixed_air,
  supply_air,
  damper,
  fan,
  cooling,
};
inline constexpr std::size_t kChannelCount = 11;

// "outdoor-dry-bulb", "damper", ... (the QUANTITY of --column).
std::string_view channel_name(Channel c);
std::optional<Channel> channel_from_name(std::string_view name);

// --column QUANTITY=HEADER[:UNIT]: the column of a channel, and the unit its values are in
// ("F", "C", "%", "fraction"; empty: from the header, else the bare system).
struct ColumnOverride {
  Channel channel;
  std::string header;
  std::string unit;
};
// InputError naming `origin` and the allowed quantities when the text is malformed.
ColumnOverride parse_column_override(std::string_view text, std::string_view origin);

// The longest time one sample may stand for (--max-gap): beyond a year a gap means nothing.
inline constexpr double kMaxGapLimitS = 366.0 * 86400.0;

struct ReadOptions {
  std::vector<ColumnOverride> columns;
  units::System bare = units::System::ip;  // unit of temperature columns with no unit in the header
  std::optional<double> max_gap_s;         // default: twice the median interval
};

// One sample; a channel without a value in that row (empty cell or no column) is nullopt.
struct Sample {
  std::int64_t time_s;  // seconds since 1970-01-01 00:00 in the log's own clock
  int line;             // line of the file
  std::array<std::optional<double>, kChannelCount> value;
  const std::optional<double>& operator[](Channel c) const {
    return value[static_cast<std::size_t>(c)];
  }
};

// How a column was read, for the report's mapping section.
struct ColumnUse {
  Channel channel;
  std::string header;
  std::string unit;  // "°F", "°C", "%", "fraction", "on/off"
  bool overridden;   // set by --column
  std::string note;  // how the unit was decided, when not written in the header
};

struct Gap {
  std::int64_t from_s, to_s;  // the samples either side
};

struct Coverage {
  std::int64_t first_s = 0, last_s = 0;  // first and last stamp
  double median_interval_s = 0;
  double max_gap_s = 0;    // cap on a sample's weight
  double span_s = 0;       // last − first + the last sample's weight
  double covered_s = 0;    // Σ weights
  std::vector<Gap> gaps;   // intervals longer than max_gap_s
  int duplicate_rows = 0;  // exact repeats dropped
  int rows = 0;            // samples kept
};

// The samples are held column by column, 8 bytes a reading and 1 byte an on/off state, so that
// a long log takes about the size of its text in memory.
struct TrendLog {
  std::string path;
  std::vector<ColumnUse> columns;
  Coverage coverage;
  std::vector<std::int64_t> time_s;  // one per sample, in time order
  std::vector<int> line;             // the line of each sample in the file
  // Temperatures (°C) and fractions, NaN where the cell was empty; empty for a channel the
  // log has no column for, and for the on/off channels.
  std::array<std::vector<double>, kChannelCount> number;
  // Fan and cooling: 1 on, 0 off, −1 where the cell was empty.
  std::array<std::vector<std::int8_t>, kChannelCount> state;

  std::size_t size() const { return time_s.size(); }
  bool has(Channel c) const;
  // The reading of `c` in sample `i`; none for an empty cell or a channel without a column.
  std::optional<double> value(Channel c, std::size_t i) const;
  Sample sample(std::size_t i) const;
  // The time sample `i` stands for: to the next sample (the last: the median interval),
  // capped at coverage.max_gap_s.
  double weight_s(std::size_t i) const;
};

// Reads a trend log from text; `name` is the file name used in messages. Throws InputError.
TrendLog parse_trend(std::string_view text, std::string_view name, const ReadOptions& options);
// The same from a file, read in pieces: the text is never held whole.
TrendLog load_trend(const std::string& path, const ReadOptions& options);

// Time stamps the reader accepts: ISO 8601 "YYYY-MM-DD[T| ]HH:MM[:SS][Z|±HH:MM]" (an offset is
// applied, so a log that mixes offsets stays in order) and the building-automation forms
// "MM/DD/YYYY HH:MM[:SS][ AM|PM]" and "YYYY/MM/DD HH:MM[:SS]". InputError naming `origin`.
std::int64_t parse_timestamp(std::string_view text, std::string_view origin);
// "YYYY-MM-DD HH:MM".
std::string format_timestamp(std::int64_t time_s);

// The offset of a log's clock from UTC, minutes: "UTC", "Z", "±HH:MM", "±HHMM", "±HH" or
// "UTC±HH:MM", within −12:00 to +14:00 (the offsets in use). InputError naming `origin`.
int parse_utc_offset(std::string_view text, std::string_view origin);
// "UTC", "UTC+05:30", "UTC−05:00".
std::string format_utc_offset(int minutes);

}  // namespace limitline::trend
