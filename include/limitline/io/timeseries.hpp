#pragma once
// One reader of time series held as delimited text, in stages that are functions over values:
//
//   lines → header and layout → time axis → columns with units → series
//
// The weather reader (regular hourly or sub-hourly outdoor air, io/weather) and the trend
// reader (irregular building-automation logs, io/trend) are both built from these stages and
// add only what is their own: which header names mean which quantity, the time rules of
// their series and the physics of their values. Each stage takes and returns plain values,
// so that it can be used, and tested, alone.
#include <limitline/model/units.hpp>

#include <algorithm>
#include <array>
#include <cstddef>
#include <cstdint>
#include <span>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace limitline::timeseries {

// --- 1. Lines ------------------------------------------------------------------------------

struct Line {
  std::string_view text;  // without its line ending
  int number = 0;         // 1-based line of the file
};

// The length of the line at the start of `text` and of the ending after it (0 when the text
// ends first). LF and CR LF end a line; a lone CR ends one only when `lone_cr_ends_line`.
struct LineCut {
  std::size_t length = 0;
  std::size_t ending = 0;
};
[[nodiscard]] LineCut cut_line(std::string_view text, bool lone_cr_ends_line);

// A whole text as lines, without copying. A UTF-8 byte-order mark at the start is dropped.
// Lines end in LF or CR LF, or in a lone CR in a text that has no LF at all (old Mac
// exports); a stray CR inside a text that has LFs stays in its line (a trailing one is
// dropped).
[[nodiscard]] std::vector<Line> split_lines(std::string_view text);

// The same cut for text arriving in pieces (a file read a block at a time), line by line to
// `on_line(std::string_view)`. The whole text is unknown in advance, so a lone CR always ends
// a line. A line wholly inside a piece is passed as a view of it; only a line cut by the end
// of a piece is copied.
class LineSplitter {
 public:
  template <class OnLine>
  void feed(std::string_view piece, OnLine&& on_line) {
    if (at_start_) {
      // The mark may itself arrive cut between pieces.
      const std::size_t take = std::min(piece.size(), kBom.size() - head_.size());
      head_.append(piece.substr(0, take));
      piece.remove_prefix(take);
      if (head_.size() < kBom.size() && kBom.starts_with(head_)) return;
      at_start_ = false;
      const std::string head = std::exchange(head_, {});
      if (head != kBom) split(head, on_line);
    }
    split(piece, on_line);
  }
  template <class OnLine>
  void finish(OnLine&& on_line) {
    if (at_start_) split(std::exchange(head_, {}), on_line);  // shorter than a mark
    at_start_ = false;
    if (!partial_.empty()) on_line(std::string_view(partial_));
    partial_.clear();
  }

 private:
  template <class OnLine>
  void split(std::string_view piece, OnLine& on_line) {
    if (after_cr_ && !piece.empty()) {
      if (piece.front() == '\n') piece.remove_prefix(1);
      after_cr_ = false;
    }
    while (!piece.empty()) {
      const LineCut cut = cut_line(piece, true);
      if (cut.ending == 0) {
        partial_.append(piece);
        return;
      }
      if (partial_.empty()) {
        on_line(piece.substr(0, cut.length));
      } else {
        partial_.append(piece.substr(0, cut.length));
        on_line(std::string_view(partial_));
        partial_.clear();
      }
      // A CR at the very end of a piece may be the first half of a CR LF.
      after_cr_ = cut.ending == 1 && piece[cut.length] == '\r' && cut.length + 1 == piece.size();
      piece.remove_prefix(cut.length + cut.ending);
    }
  }

  static constexpr std::string_view kBom = "\xEF\xBB\xBF";  // UTF-8 byte-order mark
  std::string partial_;
  std::string head_;  // the first bytes, until they are known not to be a mark
  bool at_start_ = true;
  bool after_cr_ = false;
};

// True when the line holds nothing but white space (text::is_space).
[[nodiscard]] bool blank(std::string_view s);

// --- 2. Header and layout ------------------------------------------------------------------

// Lower-case ASCII letters and digits only: "Dry-bulb" and "dry_bulb" are the same name.
[[nodiscard]] std::string name_key(std::string_view s);
// True when `word` is one of the '|'-separated entries of `list` ("drybulb|temp|t2m").
[[nodiscard]] bool in_list(std::string_view list, std::string_view word);

// One field of a header line. The unit is the text in the first brackets ("Dry-bulb (C)",
// "T [°F]") or a last word, after a space or '_', that is a unit spelling ("Temp C",
// "pressure_hPa"): the one place a header's unit is read.
struct HeaderField {
  std::string text;       // as written, trimmed
  std::string name;       // name_key of the name part
  std::string unit_text;  // the unit as written; empty when the header gives none
};
[[nodiscard]] HeaderField parse_header_field(std::string_view text);

// A candidate header line: its delimiter (',', ';' or tab, the most used outside quotes) and
// its fields.
struct HeaderLine {
  char delimiter = ',';
  std::vector<HeaderField> fields;
};
[[nodiscard]] HeaderLine read_header_line(std::string_view line);

// Splits a data row on `delimiter` into views of it, without copying: the readers' hot path.
// Quotes around a field are removed; a doubled quote inside stays doubled, which can only
// matter in a text field the readers never interpret. A field with text after its closing
// quote is kept whole, quotes included, so that it fails to read instead of losing the text.
void split_fields(std::string_view line, char delimiter, std::vector<std::string_view>& out);

// The part of the time a column holds.
enum class TimeRole { timestamp, date, time, year, month, day, hour, minute };
inline constexpr std::size_t kTimeRoleCount = 8;

// Header names (name_key form) that mean each role, '|'-separated, in TimeRole order.
inline constexpr std::array<std::string_view, kTimeRoleCount> kTimeRoleAliases = {
    "timestamp|datetime|dateandtime|datetimeutc",
    "date|localdate",
    "time|timeutc|localtime|clocktime|timeofday",
    "year|yr",
    "month|mo",
    "day|dy|dayofmonth",
    "hour|hr|hourofday",
    "minute|min",
};

// Where a row's date and clock time come from (-1: no such column).
struct TimeColumns {
  int stamp = -1;                                  // date and clock in one field
  int date = -1, year = -1, month = -1, day = -1;  // the date
  int clock = -1, hour = -1, minute = -1;          // the clock time
  [[nodiscard]] bool ok() const {
    return stamp >= 0 || ((date >= 0 || (month >= 0 && day >= 0)) && (clock >= 0 || hour >= 0));
  }
};

// The time columns of a header whose first column of each role is `column[role]` (-1: none).
// A timestamp column wins; else a date (or month and day) with a clock time (or hour); a
// date column with no clock column holds both, and so does a time column with no date.
[[nodiscard]] TimeColumns resolve_time(const std::array<int, kTimeRoleCount>& column);

// --- 3. Time axis --------------------------------------------------------------------------

// Month lengths and date checks are limitline/calendar.hpp's. A stamp written without its
// year has year 0 here, a leap year of the proleptic calendar, so Feb 29 is allowed (it can
// only come from a leap year).

// Days from 1970-01-01 to a date of the proleptic Gregorian calendar.
[[nodiscard]] std::int64_t days_from_civil(int year, int month, int day);
struct CivilDate {
  int year, month, day;
};
[[nodiscard]] CivilDate civil_from_days(std::int64_t days);

// A time stamp as written: the date, and the minute of the day.
struct Stamp {
  int year = 0;  // 0: not given
  int month = 0, day = 0;
  int minute = 0;  // minute of the day, 0–1440 (1440 is 24:00)
};
[[nodiscard]] bool valid_date(const Stamp& s);
// "2019-07-01 13:00", or "07-01 13:00" without a year.
[[nodiscard]] std::string stamp_text(const Stamp& s);

enum class Clock { local, utc, offset };  // how stamps are marked
struct Zone {
  Clock clock = Clock::local;
  int offset_min = 0;
};

enum class DateForm { iso, ymd_slash, mdy, dmy, dmy_dot, compact };
enum class ClockForm { hh_mm, hh_mm_ss, hhmm };
[[nodiscard]] std::string_view date_form_text(DateForm f);    // "YYYY-MM-DD", ...
[[nodiscard]] std::string_view clock_form_text(ClockForm f);  // "HH:MM", ...
struct StampForm {
  DateForm date = DateForm::iso;
  ClockForm clock = ClockForm::hh_mm;
  char separator = ' ';  // between date and clock
};

// Whole non-negative number of 1 to `max_digits` digits.
[[nodiscard]] bool read_uint(std::string_view s, int& v, std::size_t max_digits = 4);

// A date as YYYY-MM-DD, YYYY/MM/DD, MM/DD/YYYY (DD/MM/YYYY when `day_first`), DD.MM.YYYY or
// YYYYMMDD; one or two digits for month and day. Sets the date of `st`.
[[nodiscard]] bool parse_date(std::string_view s, bool day_first, Stamp& st, DateForm& form);
// HH:MM, HH:MM:SS (seconds 00) or HHMM, 00:00 to 24:00 (the end of the day).
[[nodiscard]] bool parse_clock(std::string_view s, int& minute_of_day, ClockForm& form);

// Consecutive rows mostly share their date: the last one read is kept with its text.
struct DateCache {
  std::string_view text;
  Stamp stamp;
  DateForm form = DateForm::iso;
};
[[nodiscard]] bool parse_date(std::string_view s, bool day_first, Stamp& st, DateForm& form,
                              DateCache& cache);
// ISO 8601 ("2019-07-01T13:00", "2019-07-01 13:00:00Z", "...+01:00"), PVGIS
// ("20190701:1300") or a date and a time separated by a space.
[[nodiscard]] bool parse_stamp(std::string_view s, bool day_first, Stamp& st, Zone& zone,
                               StampForm& form, DateCache& cache);

// The stamp `minutes` (at most a day) earlier: the start of the interval a stamp ends, which
// may lie in the day, month or year before. Year 0 (not given) stays 0.
[[nodiscard]] Stamp minutes_earlier(Stamp s, int minutes);

// Reads the stamp of a data row from the time columns of its header. On failure it names the
// column at fault and what that column may hold.
struct StampFault {
  int column = -1;  // -1: the stamp was read
  std::string_view allowed;
};
class StampReader {
 public:
  StampReader(const TimeColumns& time, bool day_first) : time_(time), day_first_(day_first) {}
  StampFault read(const std::vector<std::string_view>& fields, Stamp& st, Zone& zone,
                  StampForm& form);
  // "MM/DD/YYYY HH:MM", "YYYYMMDD:HHMM", "month, day columns + hour column", ...
  [[nodiscard]] std::string format_text(const StampForm& f, const Zone& z) const;

 private:
  TimeColumns time_;
  bool day_first_;
  DateCache cache_;
};

// --- 4. Columns with units -----------------------------------------------------------------

// How a unit is spelt in headers and settings. The conversion itself comes from the units
// layer (through `canonical`), so this table only knows the spellings.
struct UnitSpelling {
  units::Kind kind;
  std::string_view help;       // spelling shown in "allowed: ..."
  std::string_view label;      // display label
  std::string_view canonical;  // spelling units::parse knows; empty: a plain 0–1 fraction
  std::string_view spellings;  // normalised (lower case; no spaces, '_' or '.'), '|'-separated
  bool candidate;              // tried when a column without unit is inferred from its values
};
[[nodiscard]] std::span<const UnitSpelling> unit_spellings();
// The unit of `kind` spelt `text` ("degF", "°C", "mbar", "%"), if any.
[[nodiscard]] const UnitSpelling* find_unit(units::Kind kind, std::string_view text);
[[nodiscard]] bool is_any_unit(std::string_view text);
[[nodiscard]] std::string allowed_units(units::Kind kind);    // "C, F, K"
[[nodiscard]] std::string_view first_unit(units::Kind kind);  // "C"

struct Conversion {
  double scale = 1.0, offset = 0.0;  // si = value·scale + offset
  std::string_view label;
};
[[nodiscard]] Conversion conversion(const UnitSpelling& u);

// What a cell holds.
enum class Cell : unsigned char { ok, sentinel, empty, marker, not_number };
// Reads a number as series files write it: a leading '+' is allowed, a decimal comma when
// `decimal_comma` (then `used_comma` is set), NA/N/A/NaN/null are missing-value markers, and
// -9999, -9900, 9999, 99999 are sentinels (common practice in TMY, station and NOAA ISD
// exports).
[[nodiscard]] Cell read_cell(std::string_view s, bool decimal_comma, double& v, bool& used_comma);
// The digits of a plain decimal cell as written: v = ±mantissa / 10^decimals exactly before
// rounding to a double. `decimals` is -1 when the cell was not read as one (an exponent, more
// than 15 digits, a word), and then nothing is known without the double.
struct Decimal {
  std::uint64_t mantissa = 0;
  int decimals = -1;
};
[[nodiscard]] Cell read_cell(std::string_view s, bool decimal_comma, double& v, bool& used_comma,
                             Decimal& digits);
// A finite number ("-12.5", "+3", "1e3"), as read_cell reads it; false for anything else.
[[nodiscard]] bool read_number(std::string_view s, double& v);

// --- 5. Series -----------------------------------------------------------------------------

// The upper median of `values` (reordered); the values must not be empty.
[[nodiscard]] double median(std::vector<double>& values);

}  // namespace limitline::timeseries
