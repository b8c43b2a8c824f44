// Hourly weather import: finding the header, the columns, their units and the time layout
// of a CSV file, then validating every row and resolving it to SI moist-air states.
#include <limitline/io/weather.hpp>

#include <limitline/io/input_file.hpp>

#include <limitline/io/csv.hpp>
#include <limitline/model/psychro.hpp>
#include <limitline/model/units.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <charconv>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <fstream>
#include <sstream>

namespace limitline::weather {
namespace {

using units::Kind;

constexpr std::size_t idx(Quantity q) { return static_cast<std::size_t>(q); }

// --- Tables -------------------------------------------------------------------------------

struct QuantityInfo {
  Quantity quantity;
  std::string_view key;
  std::string_view label;
  // Header names that mean this quantity, reduced to lower-case letters and digits.
  std::string_view aliases;
  bool has_unit;
  Kind kind;  // meaningful when has_unit
};

// "pressure" means station pressure here: sea-level pressure columns (SLP, MSLP) are left
// alone on purpose, since psychrometrics needs the pressure the air is actually at.
constexpr QuantityInfo kQuantities[] = {
    {Quantity::dry_bulb, "dry_bulb", "dry-bulb",
     "drybulb|drybulbtemperature|drybulbtemp|temperature|temp|t2m|airtemperature|airtemp|"
     "tdry|tdb|dbt|t|tair",
     true, Kind::temperature},
    {Quantity::dew_point, "dew_point", "dew point",
     "dewpoint|dewpointtemperature|dewpointtemp|dewpt|tdew|td|d2m|t2mdew", true, Kind::temperature},
    {Quantity::relative_humidity, "relative_humidity", "relative humidity",
     "relativehumidity|rh|rhum|relhum|rh2m", true, Kind::fraction},
    {Quantity::wet_bulb, "wet_bulb", "wet-bulb",
     "wetbulb|wetbulbtemperature|wetbulbtemp|twet|twb|t2mwet", true, Kind::temperature},
    {Quantity::humidity_ratio, "humidity_ratio", "humidity ratio", "humidityratio|mixingratio",
     true, Kind::humidity_ratio},
    {Quantity::pressure, "pressure", "pressure",
     "pressure|stationpressure|sp|surfacepressure|atmosphericpressure|barometricpressure|"
     "airpressure|ps|pres|stnpres|p",
     true, Kind::pressure},
    {Quantity::timestamp, "timestamp", "timestamp", "timestamp|datetime|dateandtime|datetimeutc",
     false, Kind::temperature},
    {Quantity::date, "date", "date", "date|localdate", false, Kind::temperature},
    {Quantity::time, "time", "time", "time|timeutc|localtime|clocktime|timeofday", false,
     Kind::temperature},
    {Quantity::year, "year", "year", "year|yr", false, Kind::temperature},
    {Quantity::month, "month", "month", "month|mo", false, Kind::temperature},
    {Quantity::day, "day", "day", "day|dy|dayofmonth", false, Kind::temperature},
    {Quantity::hour, "hour", "hour", "hour|hr|hourofday", false, Kind::temperature},
    {Quantity::minute, "minute", "minute", "minute|min", false, Kind::temperature},
};
static_assert(std::size(kQuantities) == kQuantityCount);

const QuantityInfo& info(Quantity q) { return kQuantities[idx(q)]; }

// Unit spellings found in weather headers. The conversion itself comes from the units layer
// (through `canonical`), so this table only knows how headers spell things.
struct HeaderUnit {
  Kind kind;
  std::string_view help;       // spelling shown in "allowed: ..."
  std::string_view label;      // display label
  std::string_view canonical;  // spelling units::parse knows; empty: a plain 0–1 fraction
  std::string_view spellings;  // normalised (lower case; no spaces, '_' or '.'), '|'-separated
  bool candidate;              // tried when a column without unit is inferred from its values
};

constexpr HeaderUnit kHeaderUnits[] = {
    {Kind::temperature, "C", "°C", "c",
     "c|°c|ºc|℃|degc|degreec|degreesc|celsius|degcelsius|degreecelsius|degreescelsius", true},
    {Kind::temperature, "F", "°F", "f",
     "f|°f|ºf|℉|degf|degreef|degreesf|fahrenheit|degfahrenheit|degreefahrenheit|"
     "degreesfahrenheit",
     true},
    {Kind::temperature, "K", "K", "k", "k|kelvin|degk", true},
    {Kind::pressure, "Pa", "Pa", "pa", "pa|pascal|pascals", true},
    {Kind::pressure, "hPa", "hPa", "hpa", "hpa", true},
    {Kind::pressure, "mbar", "mbar", "mbar", "mbar|mb|millibar|millibars", false},
    {Kind::pressure, "kPa", "kPa", "kpa", "kpa", true},
    {Kind::pressure, "bar", "bar", "bar", "bar", false},
    {Kind::pressure, "inHg", "inHg", "inhg", "inhg|inchhg|inchesofmercury|inchesmercury", true},
    {Kind::pressure, "psia", "psia", "psia", "psia|psi", true},
    {Kind::pressure, "atm", "atm", "atm", "atm", false},
    {Kind::fraction, "%", "%", "%", "%|percent|pct|%rh", true},
    {Kind::fraction, "fraction", "fraction (0–1)", "", "fraction|frac|0-1|0to1", true},
    {Kind::humidity_ratio, "kg/kg", "kg/kg", "kg/kg", "kg/kg|kgkg", true},
    {Kind::humidity_ratio, "g/kg", "g/kg", "g/kg", "g/kg|gkg", true},
    {Kind::humidity_ratio, "gr/lb", "gr/lb", "gr/lb", "gr/lb|grains/lb|grainsperlb", true},
    {Kind::humidity_ratio, "lb/lb", "lb/lb", "lb/lb", "lb/lb", false},
};

// Values a weather file can plausibly hold (SI), used to check rows and to infer a unit the
// header does not give. A unit is inferred only when exactly one candidate puts every value
// in [lo, hi] and the file's largest value in [max_lo, max_hi].
struct Plausible {
  Kind kind;
  std::string_view word;  // "a ... unit"
  double lo, hi, max_lo, max_hi;
  std::string_view why;
};
constexpr Plausible kPlausible[] = {
    // Air temperatures recorded on Earth span about −89 °C to 57 °C (from memory); the
    // warmest hour of any year at a site with an economizer is above 5 °C.
    {Kind::temperature, "temperature", -90.0, 60.0, 5.0, 60.0,
     "the range of air temperatures on Earth"},
    // Eq. 3 gives about 107 kPa at −500 m and 50 kPa at 5500 m; weather adds a few kPa.
    {Kind::pressure, "pressure", 48.0, 112.0, 48.0, 112.0,
     "station pressures from below sea level to about 5500 m"},
    {Kind::fraction, "relative-humidity", 0.0, 1.01, 0.3, 1.01, "relative humidity"},
    // A dew point of 35 °C, about the highest recorded (from memory), is 0.037 kg/kg at sea
    // level; a year whose most humid hour is below 0.002 kg/kg (−13 °C dew point) is not one.
    {Kind::humidity_ratio, "humidity-ratio", 0.0, 0.05, 0.002, 0.05, "outdoor humidity ratios"},
};

const Plausible& plausible(Kind k) {
  for (const Plausible& p : kPlausible)
    if (p.kind == k) return p;
  throw std::logic_error("weather: kind missing from the plausibility table");
}

// Values that weather files use to mark a missing reading (common practice: TMY and
// station exports use -9999 and 9999, NOAA ISD 99999, some loggers -9900).
constexpr double kSentinels[] = {-9999.0, -9900.0, 9999.0, 99999.0};
constexpr std::string_view kMissingWords[] = {"na", "n/a", "nan", "null"};

// Relative humidity a little over 100 % is sensor or rounding error, read as saturation.
constexpr double kRelativeHumidityTolerance = 0.01;
// A dew point or wet-bulb above the dry-bulb by up to 1 °F (the rounding of a file in whole
// °F) is read as saturation.
constexpr double kTemperatureToleranceK = 1.0 / 1.8;
// A humidity ratio up to 1 % above saturation is read as saturation (same tolerance as RH).
constexpr double kHumidityRatioTolerance = 0.01;

// Statistics of a column say something from a day of hourly values on.
constexpr int kMinStatisticRows = 24;
// More impossible rows than this share is a column in another unit, or not the quantity at
// all, rather than a few bad readings.
constexpr double kLabelImpossibleShare = 0.05;

// Where the median of a day or more of outdoor values lies, on any site (SI). The hottest
// places on Earth have monthly mean temperatures near 40 °C and the highest dew points are
// about 35 °C (both from memory); station pressures as in kPlausible.
struct MedianBand {
  Quantity quantity;
  double lo, hi;
  std::string_view what;
};
constexpr MedianBand kMedianBands[] = {
    {Quantity::dry_bulb, -60.0, 45.0, "the median outdoor air temperature of a day or more"},
    {Quantity::dew_point, -70.0, 35.0, "the median outdoor dew point of a day or more"},
    {Quantity::wet_bulb, -60.0, 35.0, "the median outdoor wet-bulb of a day or more"},
    {Quantity::relative_humidity, 0.02, 1.0,
     "the median outdoor relative humidity of a day or more"},
    {Quantity::humidity_ratio, 1e-5, 0.03, "the median outdoor humidity ratio of a day or more"},
    {Quantity::pressure, 48.0, 112.0, "the median station pressure"},
};

constexpr std::string_view kMonthNames[] = {"Jan", "Feb", "Mar", "Apr", "May", "Jun",
                                            "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"};
constexpr int kDaysInMonth[] = {31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31};

// --- Small text helpers --------------------------------------------------------------------

bool is_space(char c) { return c == ' ' || c == '\t' || c == '\r' || c == '\n'; }

std::string_view trim(std::string_view s) {
  while (!s.empty() && is_space(s.front())) s.remove_prefix(1);
  while (!s.empty() && is_space(s.back())) s.remove_suffix(1);
  return s;
}

char lower(char c) { return static_cast<char>(std::tolower(static_cast<unsigned char>(c))); }

bool iequals(std::string_view a, std::string_view b) {
  if (a.size() != b.size()) return false;
  for (std::size_t i = 0; i < a.size(); ++i)
    if (lower(a[i]) != lower(b[i])) return false;
  return true;
}

bool icontains(std::string_view s, std::string_view part) {
  if (part.size() > s.size()) return false;
  for (std::size_t i = 0; i + part.size() <= s.size(); ++i)
    if (iequals(s.substr(i, part.size()), part)) return true;
  return false;
}

// Lower-case ASCII letters and digits only: "Dry-bulb" and "dry_bulb" are the same name.
std::string name_key(std::string_view s) {
  std::string out;
  for (char c : s)
    if (std::isalnum(static_cast<unsigned char>(c))) out.push_back(lower(c));
  return out;
}

std::string unit_key(std::string_view s) {
  std::string out;
  for (char c : s)
    if (c != ' ' && c != '_' && c != '.' && c != '\t') out.push_back(lower(c));
  return out;
}

// True when `word` is one of the '|'-separated entries of `list`.
bool in_list(std::string_view list, std::string_view word) {
  while (!list.empty()) {
    const std::size_t bar = list.find('|');
    if (list.substr(0, bar) == word) return true;
    if (bar == std::string_view::npos) break;
    list.remove_prefix(bar + 1);
  }
  return false;
}

std::string quoted_list(const std::vector<std::string>& items) {
  std::string out;
  for (const std::string& s : items) {
    if (!out.empty()) out += ", ";
    out += echo(s);
  }
  return out;
}

// Splits `line` on `delim` into views of it, without copying: the reader's hot path. Quotes
// around a field are removed; a doubled quote inside stays doubled, which can only matter in
// a text field the reader never interprets. A field with text after its closing quote is
// kept whole, quotes included, so that it fails to read instead of losing the text.
void split_views(std::string_view line, char delim, std::vector<std::string_view>& out) {
  out.clear();
  const char* p = line.data();
  const char* const end = p + line.size();
  for (;;) {
    while (p < end && (*p == ' ' || *p == '\t') && *p != delim) ++p;
    if (p < end && *p == '"') {
      const char* const start = p;
      const char* q = p + 1;
      while (q < end && !(*q == '"' && !(q + 1 < end && q[1] == '"'))) q += *q == '"' ? 2 : 1;
      q = std::min(q, end);
      std::string_view field(p + 1, static_cast<std::size_t>(q - (p + 1)));
      p = q < end ? q + 1 : end;
      while (p < end && *p != delim && (*p == ' ' || *p == '\t')) ++p;
      if (p < end && *p != delim) {
        while (p < end && *p != delim) ++p;
        field = trim(std::string_view(start, static_cast<std::size_t>(p - start)));
      }
      out.push_back(field);
    } else {
      const char* q = p;
      while (q < end && *q != delim) ++q;
      const char* last = q;
      while (last > p && is_space(last[-1])) --last;
      out.emplace_back(p, static_cast<std::size_t>(last - p));
      p = q;
    }
    if (p >= end) break;
    ++p;
  }
}

// --- Units -------------------------------------------------------------------------------

struct Conversion {
  double scale = 1.0, offset = 0.0;  // si = value·scale + offset
  std::string_view label;
};

const HeaderUnit* find_unit(Kind kind, std::string_view text) {
  const std::string key = unit_key(text);
  if (key.empty()) return nullptr;
  for (const HeaderUnit& u : kHeaderUnits)
    if (u.kind == kind && in_list(u.spellings, key)) return &u;
  return nullptr;
}

bool is_any_unit(std::string_view text) {
  const std::string key = unit_key(text);
  for (const HeaderUnit& u : kHeaderUnits)
    if (in_list(u.spellings, key)) return true;
  return false;
}

Conversion conversion(const HeaderUnit& u) {
  if (u.canonical.empty()) return {1.0, 0.0, u.label};
  const auto at = [&](const char* number) {
    return units::parse(u.kind, std::string(number) + std::string(u.canonical), units::System::si,
                        "weather unit table");
  };
  const double zero = at("0");
  return {at("1") - zero, zero, u.label};
}

std::string allowed_units(Kind kind) {
  std::string out;
  for (const HeaderUnit& u : kHeaderUnits) {
    if (u.kind != kind) continue;
    if (!out.empty()) out += ", ";
    out += u.help;
  }
  return out;
}

std::string_view first_unit(Kind kind) {
  for (const HeaderUnit& u : kHeaderUnits)
    if (u.kind == kind) return u.help;
  return "";
}

std::string_view kind_word(Kind kind) { return plausible(kind).word; }

// --- Header fields -------------------------------------------------------------------------

struct HeaderField {
  std::string text;       // as written
  std::string name;       // name_key of the name part
  std::string unit_text;  // text in brackets or a trailing unit word; may be empty
};

HeaderField parse_header_field(std::string text) {
  HeaderField f;
  const std::string_view t = trim(text);
  const std::size_t open = t.find_first_of("([");
  if (open != std::string_view::npos) {
    const char close = t[open] == '(' ? ')' : ']';
    const std::size_t end = t.find(close, open + 1);
    f.name = name_key(t.substr(0, open));
    f.unit_text = std::string(trim(t.substr(
        open + 1, end == std::string_view::npos ? std::string_view::npos : end - open - 1)));
  } else {
    // "Temp C", "pressure_hPa": a last word that is a unit is the unit.
    const std::size_t cut = t.find_last_of(" _");
    if (cut != std::string_view::npos && cut + 1 < t.size() && is_any_unit(t.substr(cut + 1))) {
      f.name = name_key(t.substr(0, cut));
      f.unit_text = std::string(t.substr(cut + 1));
    } else {
      f.name = name_key(t);
    }
  }
  f.text = std::string(t);
  return f;
}

// Columns of one candidate header line, per quantity.
struct HeaderMatch {
  std::array<int, kQuantityCount> column;
  std::array<int, kQuantityCount> extra{};
  std::array<bool, kQuantityCount> by_override{};
  HeaderMatch() { column.fill(-1); }
  int operator[](Quantity q) const { return column[idx(q)]; }
  int count() const {
    return static_cast<int>(
        std::count_if(column.begin(), column.end(), [](int c) { return c >= 0; }));
  }
};

HeaderMatch match_header(const std::vector<HeaderField>& fields, const Mapping& mapping) {
  HeaderMatch m;
  std::vector<bool> claimed(fields.size(), false);
  for (const QuantityInfo& q : kQuantities) {
    const auto& name = mapping.column(q.quantity).column;
    if (!name) continue;
    for (std::size_t i = 0; i < fields.size(); ++i)
      if (iequals(fields[i].text, trim(*name))) {
        m.column[idx(q.quantity)] = static_cast<int>(i);
        m.by_override[idx(q.quantity)] = true;
        claimed[i] = true;
        break;
      }
  }
  for (const QuantityInfo& q : kQuantities) {
    if (mapping.column(q.quantity).column) continue;
    for (std::size_t i = 0; i < fields.size(); ++i) {
      if (claimed[i] || fields[i].name.empty() || !in_list(q.aliases, fields[i].name)) continue;
      if (m.column[idx(q.quantity)] < 0)
        m.column[idx(q.quantity)] = static_cast<int>(i);
      else
        ++m.extra[idx(q.quantity)];
    }
  }
  return m;
}

// Where a row's date and clock time come from.
struct TimeColumns {
  int stamp = -1;                                  // date and clock in one field
  int date = -1, year = -1, month = -1, day = -1;  // the date
  int clock = -1, hour = -1, minute = -1;          // the clock time
  bool ok() const {
    return stamp >= 0 || ((date >= 0 || (month >= 0 && day >= 0)) && (clock >= 0 || hour >= 0));
  }
};

TimeColumns resolve_time(const HeaderMatch& m) {
  TimeColumns t;
  if (m[Quantity::timestamp] >= 0) {
    t.stamp = m[Quantity::timestamp];
    return t;
  }
  const bool date_fields = m[Quantity::month] >= 0 && m[Quantity::day] >= 0;
  const bool has_date = m[Quantity::date] >= 0 || date_fields;
  const bool has_clock = m[Quantity::time] >= 0 || m[Quantity::hour] >= 0;
  if (has_date && has_clock) {
    if (m[Quantity::date] >= 0) {
      t.date = m[Quantity::date];
    } else {
      t.year = m[Quantity::year];
      t.month = m[Quantity::month];
      t.day = m[Quantity::day];
    }
    if (m[Quantity::time] >= 0) {
      t.clock = m[Quantity::time];
    } else {
      t.hour = m[Quantity::hour];
      t.minute = m[Quantity::minute];
    }
  } else if (m[Quantity::date] >= 0) {
    t.stamp = m[Quantity::date];  // a date column with no clock column holds both
  } else if (m[Quantity::time] >= 0 && !has_date) {
    t.stamp = m[Quantity::time];  // "time(UTC)": a time column with no date column holds both
  }
  return t;
}

// --- Time stamps ---------------------------------------------------------------------------

struct Stamp {
  int year = 0;  // 0: not given
  int month = 0, day = 0;
  int minute = 0;  // minute of the day, 0–1440 (1440 is 24:00)
};

struct Zone {
  Clock clock = Clock::local;
  int offset_min = 0;
};

enum class DateForm { iso, ymd_slash, mdy, dmy, dmy_dot, compact };
enum class ClockForm { hh_mm, hh_mm_ss, hhmm };

// Names of the forms, in enum order, for the mapping lines.
constexpr std::string_view kDateFormText[] = {"YYYY-MM-DD", "YYYY/MM/DD", "MM/DD/YYYY",
                                              "DD/MM/YYYY", "DD.MM.YYYY", "YYYYMMDD"};
constexpr std::string_view kClockFormText[] = {"HH:MM", "HH:MM:SS", "HHMM"};
std::string_view date_form_text(DateForm f) { return kDateFormText[static_cast<int>(f)]; }
std::string_view clock_form_text(ClockForm f) { return kClockFormText[static_cast<int>(f)]; }

bool is_leap(int year) { return (year % 4 == 0 && year % 100 != 0) || year % 400 == 0; }

int days_in_month(int month, int year) {
  // With no year given, Feb 29 is allowed: it can only come from a leap year.
  if (month == 2 && (year == 0 || is_leap(year))) return 29;
  return kDaysInMonth[month - 1];
}

bool valid_date(const Stamp& s) {
  return s.month >= 1 && s.month <= 12 && s.day >= 1 && s.day <= days_in_month(s.month, s.year);
}

// Whole non-negative number of 1 to `max_digits` digits.
bool read_uint(std::string_view s, int& v, std::size_t max_digits = 4) {
  if (s.empty() || s.size() > max_digits) return false;
  v = 0;
  for (char c : s) {
    if (c < '0' || c > '9') return false;
    v = v * 10 + (c - '0');
  }
  return true;
}

bool all_digits(std::string_view s) {
  return !s.empty() && std::all_of(s.begin(), s.end(), [](char c) { return c >= '0' && c <= '9'; });
}

// Up to three groups of digits with one kind of separator between them ("2019-07-01",
// "07/01/2019", "13:00:00", "20190701"), read in one pass: stamps are on every row.
struct DigitGroups {
  int value[3];
  int width[3];
  int count;
  char separator;
};

bool digit_groups(std::string_view s, DigitGroups& g) {
  g.count = 0;
  g.separator = 0;
  int v = 0, w = 0;
  for (const char c : s) {
    if (c >= '0' && c <= '9') {
      if (++w > 8) return false;
      v = v * 10 + (c - '0');
      continue;
    }
    if (w == 0 || g.count == 2 || (g.separator != 0 && c != g.separator)) return false;
    g.separator = c;
    g.value[g.count] = v;
    g.width[g.count++] = w;
    v = w = 0;
  }
  if (w == 0) return false;
  g.value[g.count] = v;
  g.width[g.count++] = w;
  return true;
}

bool parse_date(std::string_view s, bool day_first, Stamp& st, DateForm& form) {
  DigitGroups g;
  if (!digit_groups(s, g)) return false;
  if (g.count == 1) {
    if (g.width[0] != 8) return false;
    form = DateForm::compact;
    st.year = g.value[0] / 10000, st.month = g.value[0] / 100 % 100, st.day = g.value[0] % 100;
    return valid_date(st);
  }
  if (g.count != 3 || g.width[1] > 2) return false;
  const char sep = g.separator;
  if (g.width[0] == 4 && g.width[2] <= 2 && (sep == '-' || sep == '/')) {
    form = sep == '-' ? DateForm::iso : DateForm::ymd_slash;
    st.year = g.value[0], st.month = g.value[1], st.day = g.value[2];
  } else if (g.width[2] == 4 && g.width[0] <= 2 && (sep == '/' || sep == '.')) {
    form = sep == '.' ? DateForm::dmy_dot : (day_first ? DateForm::dmy : DateForm::mdy);
    const bool dmy = form != DateForm::mdy;
    st.year = g.value[2], st.month = dmy ? g.value[1] : g.value[0];
    st.day = dmy ? g.value[0] : g.value[1];
  } else {
    return false;
  }
  return valid_date(st);
}

// HH:MM, HH:MM:SS (seconds 00) or HHMM; 24:00 allowed (end of the day).
bool parse_clock(std::string_view s, int& minute_of_day, ClockForm& form) {
  // Fractional seconds, if any, must be zero too ("13:00:00.000").
  if (const std::size_t dot = s.find('.'); dot != std::string_view::npos) {
    const std::string_view frac = s.substr(dot + 1);
    if (!all_digits(frac) || frac.find_first_not_of('0') != std::string_view::npos) return false;
    s = s.substr(0, dot);
  }
  DigitGroups g;
  if (!digit_groups(s, g)) return false;
  int h = 0, m = 0;
  if (g.count == 1) {
    if (g.width[0] != 4) return false;
    form = ClockForm::hhmm;
    h = g.value[0] / 100, m = g.value[0] % 100;
  } else {
    if (g.separator != ':' || g.width[0] > 2 || g.width[1] != 2) return false;
    if (g.count == 3 && (g.width[2] != 2 || g.value[2] != 0)) return false;
    form = g.count == 3 ? ClockForm::hh_mm_ss : ClockForm::hh_mm;
    h = g.value[0], m = g.value[1];
  }
  if (h > 24 || m > 59 || (h == 24 && m != 0)) return false;
  minute_of_day = h * 60 + m;
  return true;
}

// Consecutive rows mostly share their date: the last one read is kept with its text.
struct DateCache {
  std::string_view text;
  Stamp stamp;
  DateForm form = DateForm::iso;
};

bool parse_date(std::string_view s, bool day_first, Stamp& st, DateForm& form, DateCache& c) {
  if (!c.text.empty() && s == c.text) {
    st.year = c.stamp.year, st.month = c.stamp.month, st.day = c.stamp.day;
    form = c.form;
    return true;
  }
  if (!parse_date(s, day_first, st, form)) return false;
  c = {s, st, form};
  return true;
}

struct StampForm {
  DateForm date;
  ClockForm clock;
  char separator;
};

// ISO 8601 ("2019-07-01T13:00", "2019-07-01 13:00:00Z", "...+01:00"), PVGIS
// ("20190701:1300") or a date and a time separated by a space.
bool parse_stamp(std::string_view s, bool day_first, Stamp& st, Zone& zone, StampForm& form,
                 DateCache& cache) {
  std::string_view date, rest;
  if (s.size() >= 13 && s[8] == ':' && all_digits(s.substr(0, 8))) {
    date = s.substr(0, 8);
    rest = s.substr(9);
    form.separator = ':';
  } else {
    const std::size_t sep = s.find_first_of("T ");
    if (sep == std::string_view::npos) return false;
    date = s.substr(0, sep);
    rest = trim(s.substr(sep + 1));
    form.separator = s[sep];
  }
  zone = {};
  if (!rest.empty() && (rest.back() == 'Z' || rest.back() == 'z')) {
    zone.clock = Clock::utc;
    rest.remove_suffix(1);
  } else if (const std::size_t sign =
                 rest.size() > 4 ? rest.find_first_of("+-", 4) : std::string_view::npos;
             sign != std::string_view::npos) {
    std::string_view off = rest.substr(sign + 1);
    int oh = 0, om = 0;
    if (off.size() == 5 && off[2] == ':') {
      if (!read_uint(off.substr(0, 2), oh) || !read_uint(off.substr(3, 2), om)) return false;
    } else if (off.size() == 4) {
      if (!read_uint(off.substr(0, 2), oh) || !read_uint(off.substr(2, 2), om)) return false;
    } else if (!read_uint(off, oh, 2)) {
      return false;
    }
    if (oh > 14 || om > 59) return false;
    zone.clock = Clock::offset;
    zone.offset_min = (rest[sign] == '-' ? -1 : 1) * (oh * 60 + om);
    rest = rest.substr(0, sign);
  }
  return parse_date(date, day_first, st, form.date, cache) &&
         parse_clock(trim(rest), st.minute, form.clock);
}

std::string stamp_text(const Stamp& s) {
  std::string out = s.year > 0 ? fmt::format("{:04}-{:02}-{:02}", s.year, s.month, s.day)
                               : fmt::format("{:02}-{:02}", s.month, s.day);
  out += fmt::format(" {:02}:{:02}", s.minute / 60, s.minute % 60);
  return out;
}

// --- Cells ---------------------------------------------------------------------------------

enum class Cell : unsigned char { ok, sentinel, empty, marker, not_number };

bool is_sentinel(double v) {
  for (double s : kSentinels)
    if (v == s) return true;
  return false;
}

// Decimal numbers as weather files write them ("-12.5", "99870.0"): the digits as an integer
// and one division by a power of ten. That is correctly rounded, as std::from_chars is, while
// both operands are exact doubles (at most 15 digits, so below 2^53; powers up to 1e15).
// Anything else (exponents, long numbers, words) is left to std::from_chars.
bool fast_decimal(std::string_view s, double& v) {
  constexpr double kPow10[] = {1e0, 1e1, 1e2,  1e3,  1e4,  1e5,  1e6,  1e7,
                               1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15};
  const char* p = s.data();
  const char* const e = p + s.size();
  const bool negative = p < e && *p == '-';
  if (negative) ++p;
  std::uint64_t mantissa = 0;
  int digits = 0, decimals = 0;
  bool point = false;
  for (; p < e; ++p) {
    const char c = *p;
    if (c >= '0' && c <= '9') {
      if (++digits > 15) return false;
      mantissa = mantissa * 10 + static_cast<std::uint64_t>(c - '0');
      decimals += point;
    } else if (c == '.' && !point) {
      point = true;
    } else {
      return false;
    }
  }
  if (digits == 0) return false;
  v = static_cast<double>(mantissa) / kPow10[decimals];
  if (negative) v = -v;
  return true;
}

Cell read_cell(std::string_view s, bool decimal_comma, double& v, bool& used_comma) {
  if (s.empty()) return Cell::empty;
  std::string_view n = s.front() == '+' ? s.substr(1) : s;
  char buf[64];
  if (decimal_comma && n.find(',') != std::string_view::npos && n.size() < sizeof buf &&
      n.find('.') == std::string_view::npos) {
    std::memcpy(buf, n.data(), n.size());
    std::replace(buf, buf + n.size(), ',', '.');
    n = std::string_view(buf, n.size());
    used_comma = true;
  }
  if (fast_decimal(n, v)) return is_sentinel(v) ? Cell::sentinel : Cell::ok;
  const auto r = std::from_chars(n.data(), n.data() + n.size(), v);
  if (r.ec == std::errc() && r.ptr == n.data() + n.size()) {
    if (std::isnan(v)) return Cell::marker;
    if (std::isinf(v)) return Cell::not_number;
    return is_sentinel(v) ? Cell::sentinel : Cell::ok;
  }
  for (std::string_view w : kMissingWords)
    if (iequals(s, w)) return Cell::marker;
  return Cell::not_number;
}

// --- The reader ----------------------------------------------------------------------------

// The three values each row contributes.
enum Slot : std::size_t { kDry = 0, kHumidity = 1, kPressure = 2 };

struct Row {
  int line;
  Stamp stamp;  // as written
  std::array<double, 3> raw{};
  std::array<Cell, 3> cell{};
  std::array<std::string_view, 3> text{};
  int month = 0, day = 0, hour = 0, minute = 0;  // of the interval's start, after the convention
  double position = 0.0;                         // time steps from the first row, gaps included
};

struct LineSpan {
  std::string_view text;
  int number;
};

std::vector<LineSpan> split_lines(std::string_view text) {
  std::vector<LineSpan> lines;
  lines.reserve(text.size() / 32 + 16);
  if (text.substr(0, 3) == "\xEF\xBB\xBF") text.remove_prefix(3);  // UTF-8 byte-order mark
  // Lines end in LF or CRLF, or in a lone CR in a file that has no LF (old Mac exports).
  const char eol =
      text.find('\n') == std::string_view::npos && text.find('\r') != std::string_view::npos
          ? '\r'
          : '\n';
  int number = 1;
  while (!text.empty()) {
    const std::size_t nl = text.find(eol);
    std::string_view line = text.substr(0, nl);
    if (!line.empty() && line.back() == '\r') line.remove_suffix(1);
    lines.push_back({line, number++});
    if (nl == std::string_view::npos) break;
    text.remove_prefix(nl + 1);
  }
  return lines;
}

bool blank(std::string_view s) {
  for (char c : s)
    if (!is_space(c)) return false;
  return true;
}

class Reader {
 public:
  Reader(std::string_view text, std::string_view source, const Mapping& mapping, double site)
      : lines_(split_lines(text)), mapping_(mapping), site_pressure_(site) {
    out_.info.source = std::string(source);
    out_.info.policy = mapping.on_bad_row;
    out_.info.site_pressure_kpa = site;
  }

  WeatherSeries run() {
    if (std::all_of(lines_.begin(), lines_.end(), [](const LineSpan& l) { return blank(l.text); }))
      throw InputError(
          fmt::format("{}: the weather file is empty; allowed: a header line and "
                      "data rows",
                      src()));
    find_header();
    choose_columns();
    read_rows();
    check_after_table();
    analyse_time();
    resolve_units();
    find_resolution();
    convert();
    return std::move(out_);
  }

 private:
  std::vector<LineSpan> lines_;
  const Mapping& mapping_;
  double site_pressure_;
  // The vapour pressure of saturated air at -100 °C, the driest state the model reaches.
  double min_vapor_pressure_kpa_ = psychro::saturation_pressure_kpa(-100.0);
  WeatherSeries out_;

  std::size_t header_index_ = 0;
  std::vector<HeaderField> header_;
  HeaderMatch match_;
  TimeColumns time_;
  char delim_ = ',';
  bool day_first_ = false;
  std::array<int, 3> slot_column_{-1, -1, -1};
  std::array<Quantity, 3> slot_quantity_{Quantity::dry_bulb, Quantity::dew_point,
                                         Quantity::pressure};
  std::array<Conversion, 3> conv_{};
  std::vector<Row> rows_;
  std::size_t table_end_ = 0;  // index of the first line after the table
  mutable DateCache date_cache_;

  const std::string& src() const { return out_.info.source; }

  [[noreturn]] void fail_at(int line, const std::string& what) const {
    throw InputError(fmt::format("{}:{}: {}", src(), line, what));
  }

  std::vector<std::string> header_texts() const {
    std::vector<std::string> t;
    for (const HeaderField& f : header_) t.push_back(f.text);
    return t;
  }

  // The first line naming a dry-bulb column and the time columns is the header.
  void find_header() {
    int best_line = 0, best_count = 0;
    std::string best_lacks;
    for (std::size_t i = 0; i < lines_.size(); ++i) {
      const std::string_view line = lines_[i].text;
      if (blank(line)) continue;
      const char delim = csv::guess_delimiter(line);
      std::vector<std::string> raw = csv::split_line(line, delim);
      if (raw.size() < 2) continue;
      std::vector<HeaderField> fields;
      fields.reserve(raw.size());
      for (std::string& r : raw) fields.push_back(parse_header_field(std::move(r)));
      HeaderMatch m = match_header(fields, mapping_);
      const TimeColumns t = resolve_time(m);
      const bool dry = m[Quantity::dry_bulb] >= 0;
      if (dry && t.ok()) {
        header_index_ = i;
        header_ = std::move(fields);
        match_ = m;
        time_ = t;
        delim_ = delim;
        return;
      }
      if (m.count() > best_count) {
        best_count = m.count();
        best_line = lines_[i].number;
        best_lacks = !dry && !t.ok() ? "neither a dry-bulb column nor time columns"
                     : !dry          ? "no dry-bulb column"
                                     : "no time columns";
      }
    }
    std::string closest = best_line > 0
                              ? fmt::format("; the closest, line {}, has {}", best_line, best_lacks)
                              : std::string();
    throw InputError(fmt::format(
        "{}: no header line found: no line names both a dry-bulb column (e.g. 'Dry-bulb', "
        "'Temperature', 'Temp', 'T2m') and time columns (a timestamp, a date and a time, or "
        "month, day and hour){}; name the columns in [weather], e.g. dry_bulb = {{ column = "
        "\"...\" }}",
        src(), closest));
  }

  ColumnUse use_of(Quantity q) const {
    ColumnUse u;
    u.quantity = q;
    u.index = match_[q];
    u.header = header_[static_cast<std::size_t>(u.index)].text;
    u.found = match_.by_override[idx(q)] ? ColumnFound::override : ColumnFound::header_name;
    u.other_matches = match_.extra[idx(q)];
    if (u.found == ColumnFound::override) u.unit_origin = mapping_.column(q).origin;
    return u;
  }

  void choose_columns() {
    WeatherInfo& inf = out_.info;
    const int header_line = lines_[header_index_].number;
    inf.header_line = header_line;
    inf.delimiter = delim_;

    // Every override must name a column of this header.
    for (const QuantityInfo& q : kQuantities) {
      const ColumnOverride& o = mapping_.column(q.quantity);
      if (o.column && match_[q.quantity] < 0)
        throw InputError(
            fmt::format("{}: column {} given for {} is not in the header of {} (line {}: {})",
                        o.origin.empty() ? std::string("the weather mapping") : o.origin, echo(*o.column),
                        q.label, src(), header_line, quoted_list(header_texts())));
      if (o.unit && !q.has_unit)
        throw InputError(fmt::format(
            "{}: unit {} given for the {} column; allowed: no unit (a "
            "time column has none)",
            o.origin.empty() ? std::string("the weather mapping") : o.origin, echo(*o.unit), q.label));
    }

    // Time columns, in the order they are read.
    const std::pair<int, Quantity> time_parts[] = {
        {time_.stamp, match_[Quantity::timestamp] == time_.stamp ? Quantity::timestamp
                      : match_[Quantity::date] == time_.stamp    ? Quantity::date
                                                                 : Quantity::time},
        {time_.date, Quantity::date},
        {time_.year, Quantity::year},
        {time_.month, Quantity::month},
        {time_.day, Quantity::day},
        {time_.clock, Quantity::time},
        {time_.hour, Quantity::hour},
        {time_.minute, Quantity::minute}};
    std::vector<std::string> names;
    for (const auto& [column, q] : time_parts) {
      if (column < 0) continue;
      ColumnUse u = use_of(q);
      names.push_back(echo(u.header));
      const std::string& h = u.header;
      if (icontains(h, "utc") || icontains(h, "gmt")) inf.time.clock = Clock::utc;
      if (icontains(h, "dd/mm")) day_first_ = true;
      inf.columns.push_back(std::move(u));
    }
    for (std::size_t i = 0; i < names.size(); ++i) inf.time.columns += (i ? " + " : "") + names[i];

    slot_column_[kDry] = match_[Quantity::dry_bulb];
    inf.columns.push_back(use_of(Quantity::dry_bulb));

    // Humidity: the preferred source, else the first present in the default order.
    constexpr std::pair<HumiditySource, Quantity> kHumidityOrder[] = {
        {HumiditySource::dew_point, Quantity::dew_point},
        {HumiditySource::humidity_ratio, Quantity::humidity_ratio},
        {HumiditySource::wet_bulb, Quantity::wet_bulb},
        {HumiditySource::relative_humidity, Quantity::relative_humidity}};
    std::optional<std::pair<HumiditySource, Quantity>> chosen;
    if (mapping_.humidity) {
      for (const auto& h : kHumidityOrder)
        if (h.first == *mapping_.humidity) chosen = h;
      if (match_[chosen->second] < 0)
        throw InputError(fmt::format(
            "{}:{}: humidity = \"{}\" was asked for, but the header has no {} column "
            "(columns: {}); name it in [weather], e.g. {} = {{ column = \"...\" }}",
            src(), header_line, humidity_source_name(chosen->first), info(chosen->second).label,
            quoted_list(header_texts()), info(chosen->second).key));
      inf.humidity_overridden = true;
    } else {
      // A humidity column named in the mapping is the one meant; else the default order.
      for (const auto& h : kHumidityOrder)
        if (!chosen && match_.by_override[idx(h.second)]) chosen = h;
      for (const auto& h : kHumidityOrder)
        if (!chosen && match_[h.second] >= 0) chosen = h;
      if (!chosen)
        throw InputError(fmt::format(
            "{}:{}: no humidity column: the header names none of dew point, humidity ratio, "
            "wet-bulb, relative humidity (columns: {}); name one in [weather], e.g. "
            "dew_point = {{ column = \"...\" }}",
            src(), header_line, quoted_list(header_texts())));
    }
    inf.humidity = chosen->first;
    slot_quantity_[kHumidity] = chosen->second;
    slot_column_[kHumidity] = match_[chosen->second];
    inf.columns.push_back(use_of(chosen->second));
    for (const auto& h : kHumidityOrder)
      if (h.second != chosen->second && match_[h.second] >= 0)
        inf.unused_humidity.push_back(use_of(h.second));

    if (match_[Quantity::pressure] >= 0) {
      inf.pressure_from_file = true;
      slot_column_[kPressure] = match_[Quantity::pressure];
      inf.columns.push_back(use_of(Quantity::pressure));
    } else {
      try {
        psychro::check_pressure(site_pressure_, "site pressure");
      } catch (const RangeError& e) {
        throw InputError(
            fmt::format("{}: the file has no pressure column and the {}", src(), e.what()));
      }
    }
  }

  // Reads the stamp of a data row; on failure returns the field at fault and what is allowed.
  struct StampFault {
    int column = -1;
    std::string_view allowed;
  };

  StampFault read_stamp(const std::vector<std::string_view>& f, Stamp& st, Zone& zone,
                        StampForm& form) const {
    const auto field = [&](int c) {
      return c < static_cast<int>(f.size()) ? f[static_cast<std::size_t>(c)] : std::string_view();
    };
    if (time_.stamp >= 0) {
      if (!parse_stamp(field(time_.stamp), day_first_, st, zone, form, date_cache_))
        return {time_.stamp,
                "a date and time such as 2019-07-01T13:00, 2019-07-01 13:00:00Z, "
                "07/01/2019 13:00 or 20190701:1300"};
      return {};
    }
    zone = {};
    if (time_.date >= 0) {
      if (!parse_date(field(time_.date), day_first_, st, form.date, date_cache_))
        return {time_.date,
                "a date as YYYY-MM-DD, YYYY/MM/DD, MM/DD/YYYY (DD/MM/YYYY when the header "
                "says so), DD.MM.YYYY or YYYYMMDD"};
    } else {
      st.year = 0;
      if (time_.year >= 0 && !read_uint(field(time_.year), st.year))
        return {time_.year, "a year such as 2019"};
      if (!read_uint(field(time_.month), st.month, 2) || st.month < 1 || st.month > 12)
        return {time_.month, "a month 1 to 12"};
      if (!read_uint(field(time_.day), st.day, 2) || !valid_date(st))
        return {time_.day, "a day of the month, 1 to its length"};
    }
    if (time_.clock >= 0) {
      if (!parse_clock(field(time_.clock), st.minute, form.clock))
        return {time_.clock, "a time of day as HH:MM, HH:MM:SS or HHMM, 00:00 to 24:00"};
    } else {
      int h = 0, m = 0;
      if (!read_uint(field(time_.hour), h, 2) || h > 24) return {time_.hour, "an hour 0 to 24"};
      if (time_.minute >= 0 &&
          (!read_uint(field(time_.minute), m, 2) || m > 59 || (h == 24 && m != 0)))
        return {time_.minute, "a minute 0 to 59 (0 with hour 24)"};
      st.minute = h * 60 + m;
    }
    return {};
  }

  std::string format_text(const StampForm& f, const Zone& z) const {
    std::string zone = z.clock == Clock::utc ? "Z" : z.clock == Clock::offset ? "±hh:mm" : "";
    if (time_.stamp >= 0)
      return fmt::format("{}{}{}{}", date_form_text(f.date),
                         f.separator == ' ' ? std::string(" ") : std::string(1, f.separator),
                         clock_form_text(f.clock), zone);
    const std::string date =
        time_.date >= 0 ? std::string(date_form_text(f.date))
                        : (time_.year >= 0 ? "year, month, day columns" : "month, day columns");
    const std::string clock = time_.clock >= 0
                                  ? std::string(clock_form_text(f.clock))
                                  : (time_.minute >= 0 ? "hour, minute columns" : "hour column");
    return date + " + " + clock;
  }

  void read_rows() {
    const std::size_t width = header_.size();
    std::vector<std::string_view> f;
    f.reserve(width + 4);
    rows_.reserve(lines_.size() - header_index_);
    const bool comma_decimal = delim_ != ',';
    bool used_comma = false;
    std::size_t i = header_index_ + 1;
    table_end_ = lines_.size();
    for (; i < lines_.size(); ++i) {
      const LineSpan& l = lines_[i];
      if (blank(l.text)) {
        if (rows_.empty()) continue;
        break;
      }
      split_views(l.text, delim_, f);
      if (f.size() == 1 && width > 1) break;  // a legend or note line ends the table
      std::size_t used = f.size();
      while (used > width && f[used - 1].empty()) --used;
      if (used != width)
        fail_at(l.number, fmt::format("the row has {} fields but the header (line {}) has {}; "
                                      "allowed: one value per header column",
                                      used, out_.info.header_line, width));
      Row r;
      r.line = l.number;
      Zone zone;
      StampForm form{};
      const StampFault fault = read_stamp(f, r.stamp, zone, form);
      if (fault.column >= 0)
        fail_at(l.number, fmt::format("column {} value {} is not readable as a time; "
                                      "allowed: {}",
                                      echo(header_[static_cast<std::size_t>(fault.column)].text),
                                      echo(f[static_cast<std::size_t>(fault.column)]), fault.allowed));
      if (rows_.empty()) {
        out_.info.time.format = format_text(form, zone);
        if (zone.clock != Clock::local) {
          out_.info.time.clock = zone.clock;
          out_.info.time.utc_offset_min = zone.offset_min;
        }
        out_.info.first_data_line = l.number;
      }
      for (std::size_t s = 0; s < 3; ++s) {
        if (slot_column_[s] < 0) continue;
        const std::string_view cell = f[static_cast<std::size_t>(slot_column_[s])];
        r.text[s] = cell;
        r.cell[s] = read_cell(cell, comma_decimal, r.raw[s], used_comma);
      }
      out_.info.last_data_line = l.number;
      rows_.push_back(r);
    }
    table_end_ = i;
    out_.info.decimal_comma = used_comma;
    out_.info.rows_read = static_cast<int>(rows_.size());
    if (rows_.empty()) fail_at(out_.info.header_line, "the header is followed by no data rows");
  }

  // Nothing after the end of the table may look like data: it would be lost silently.
  void check_after_table() const {
    std::vector<std::string_view> f;
    for (std::size_t i = table_end_; i < lines_.size(); ++i) {
      if (blank(lines_[i].text)) continue;
      split_views(lines_[i].text, delim_, f);
      if (f.size() < header_.size()) continue;
      Stamp st;
      Zone z;
      StampForm form{};
      if (read_stamp(f, st, z, form).column < 0)
        fail_at(lines_[i].number,
                fmt::format("this line looks like a data row, but the table ended at line {}; "
                            "allowed: data rows together, with no blank or note line between "
                            "them",
                            lines_[table_end_].number));
    }
  }

  void analyse_time() {
    TimeInfo& ti = out_.info.time;
    struct Block {
      int year, month, first_line, last_line;
    };
    std::vector<Block> blocks;
    int step = 0;
    const auto key = [](const Stamp& s) { return (s.day - 1) * 1440 + s.minute; };
    // Pass 1: order within each month, and the time step.
    for (std::size_t i = 0; i < rows_.size(); ++i) {
      const Row& r = rows_[i];
      if (i == 0 || r.stamp.year != rows_[i - 1].stamp.year ||
          r.stamp.month != rows_[i - 1].stamp.month) {
        for (const Block& b : blocks)
          if (b.year == r.stamp.year && b.month == r.stamp.month)
            fail_at(r.line, fmt::format("{}{} starts again here; it already ran from line {} "
                                        "to line {}; allowed: the rows of one month together",
                                        kMonthNames[r.stamp.month - 1],
                                        r.stamp.year > 0 ? fmt::format(" {}", r.stamp.year) : "",
                                        b.first_line, b.last_line));
        blocks.push_back({r.stamp.year, r.stamp.month, r.line, r.line});
        continue;
      }
      blocks.back().last_line = r.line;
      const Row& p = rows_[i - 1];
      const int diff = key(r.stamp) - key(p.stamp);
      if (diff <= 0)
        fail_at(r.line,
                fmt::format("time {} {} the row at line {}{}; allowed: rows within a month in "
                            "time order, each time once",
                            stamp_text(r.stamp), diff == 0 ? "repeats" : "comes before", p.line,
                            diff == 0 ? std::string() : " (" + stamp_text(p.stamp) + ")"));
      if (step == 0 || diff < step) step = diff;
    }
    if (step == 0) step = 60;
    if (60 % step != 0)
      throw InputError(
          fmt::format("{}: time step {} min; allowed: 60 min or a whole fraction "
                      "of an hour (1, 2, 3, 4, 5, 6, 10, 12, 15, 20 or 30 min)",
                      src(), step));
    ti.step_min = step;
    ti.weight_h = step / 60.0;

    // Pass 2: gaps, positions in time, and the convention of the stamps.
    bool has_24 = false;
    int first_24 = 0, first_00 = 0;
    for (const Row& r : rows_) {
      if (r.stamp.minute == 1440 && !has_24) has_24 = true, first_24 = r.line;
      if (r.stamp.minute == 0 && first_00 == 0) first_00 = r.line;
    }
    switch (mapping_.time_convention) {
      case TimeConvention::automatic:
        ti.hour_ending = has_24;
        if (has_24 && first_00 > 0)
          fail_at(first_00, fmt::format("time 00:00 in a file that also marks midnight as "
                                        "24:00 (line {}); allowed: one of the two",
                                        first_24));
        break;
      case TimeConvention::hour_beginning:
        if (has_24)
          fail_at(first_24,
                  "time 24:00 cannot start an interval (time_convention = "
                  "\"hour-beginning\"); allowed: 00:00 to 23:59");
        ti.convention_overridden = true;
        break;
      case TimeConvention::hour_ending:
        ti.hour_ending = true;
        ti.convention_overridden = true;
        break;
    }
    double position = 0.0;
    for (std::size_t i = 0; i < rows_.size(); ++i) {
      Row& r = rows_[i];
      if (i > 0) {
        const Row& p = rows_[i - 1];
        if (r.stamp.year == p.stamp.year && r.stamp.month == p.stamp.month) {
          const int diff = key(r.stamp) - key(p.stamp);
          if (diff % step != 0)
            fail_at(r.line, fmt::format("time {} is {} min after the row at line {}; allowed: "
                                        "whole multiples of the {}-min time step",
                                        stamp_text(r.stamp), diff, p.line, step));
          ti.missing_steps += diff / step - 1;
          position += diff / step;
        } else {
          position += 1.0;
        }
      }
      r.position = position;
      // The interval's start: hour-ending stamps move back one step, maybe to the day before.
      Stamp s = r.stamp;
      s.minute -= ti.hour_ending ? step : 0;
      if (s.minute < 0) {
        s.minute += 1440;
        if (--s.day < 1) {
          if (--s.month < 1) s.month = 12, s.year = s.year > 0 ? s.year - 1 : 0;
          s.day = days_in_month(s.month, s.year);
        }
      }
      r.month = s.month;
      r.day = s.day;
      r.hour = s.minute / 60;
      r.minute = s.minute % 60;
      if (r.month == 2 && r.day == 29) ++ti.leap_day_rows;
    }

    check_one_year();

    // Typical years: each month from a different year, so time jumps at month boundaries.
    for (std::size_t b = 0; b < blocks.size(); ++b) {
      if (blocks[b].year > 0)
        ti.month_year[static_cast<std::size_t>(blocks[b].month - 1)] = blocks[b].year;
      if (b == 0 || blocks[b].year == 0) continue;
      const Block& p = blocks[b - 1];
      const Block& c = blocks[b];
      const bool calendar_step = (c.year == p.year && c.month == p.month + 1) ||
                                 (c.year == p.year + 1 && p.month == 12 && c.month == 1);
      if (!calendar_step) ti.typical_year = true;
      if (c.year * 12 + c.month < p.year * 12 + p.month) ti.months_out_of_order = true;
    }
  }

  // A file holding the same hour of the calendar from two years is several years of weather;
  // summed as one it would multiply every annual figure. A typical year (each month from a
  // different year) holds each hour once and passes.
  void check_one_year() const {
    // Without a month whose rows come from two years no hour can repeat: the common case
    // (a calendar year, a typical year) needs no table.
    std::array<int, 13> year_of{};
    year_of.fill(-1);
    bool repeated = false;
    for (const Row& r : rows_) {
      int& y = year_of[static_cast<std::size_t>(r.stamp.month)];
      if (y < 0) y = r.stamp.year;
      repeated = repeated || y != r.stamp.year;
    }
    if (!repeated) return;
    const int step = out_.info.time.step_min;
    const auto slot = [&](const Row& r) {
      return static_cast<std::size_t>((((r.month - 1) * 31 + (r.day - 1)) * 1440 + r.hour * 60 +
                                       r.minute) /
                                      step);
    };
    std::vector<int> seen(static_cast<std::size_t>(12 * 31 * 1440 / step) + 1, -1);
    for (std::size_t i = 0; i < rows_.size(); ++i) {
      int& first = seen[slot(rows_[i])];
      if (first < 0) {
        first = static_cast<int>(i);
        continue;
      }
      const Row& a = rows_[static_cast<std::size_t>(first)];
      const Row& b = rows_[i];
      const auto date_key = [](const Stamp& st) { return (st.year * 12 + st.month) * 31 + st.day; };
      const Row* lo = &rows_.front();
      const Row* hi = lo;
      for (const Row& r : rows_) {
        if (date_key(r.stamp) < date_key(lo->stamp)) lo = &r;
        if (date_key(r.stamp) > date_key(hi->stamp)) hi = &r;
      }
      const long days = days_from_civil(hi->stamp) - days_from_civil(lo->stamp) + 1;
      const double years = days / 365.2425;
      const std::string span =
          std::fabs(years - std::round(years)) < 0.05 && std::round(years) >= 2
              ? fmt::format("{:.0f} years", std::round(years))
              : years < 1.5 ? fmt::format("more than one year ({} days)", days)
                            : fmt::format("{:.1f} years", years);
      const auto date_text = [](const Stamp& st) {
        return fmt::format("{:04}-{:02}-{:02}", st.year, st.month, st.day);
      };
      throw InputError(fmt::format(
          "{}: the file spans {} to {}, {}; evaluate one year at a time (line {} and line {} "
          "are both {:02}-{:02} {:02}:{:02}, of {} and {}); allowed: one year of rows, or a "
          "typical year whose months come from different years",
          src(), date_text(lo->stamp), date_text(hi->stamp), span, a.line, b.line, b.month, b.day,
          b.hour, b.minute, a.stamp.year, b.stamp.year));
    }
  }

  // Days since 1970-01-01 of a proleptic Gregorian date (H. Hinnant's civil-date algorithm).
  static long days_from_civil(const Stamp& st) {
    const long y = st.year - (st.month <= 2 ? 1 : 0);
    const long era = (y >= 0 ? y : y - 399) / 400;
    const long yoe = y - era * 400;
    const long mp = (st.month + 9) % 12;
    const long doy = (153 * mp + 2) / 5 + st.day - 1;
    const long doe = yoe * 365 + yoe / 4 - yoe / 100 + doy;
    return era * 146097 + doe - 719468;
  }

  // --- Units ---

  struct Legend {
    std::string_view name, unit;
    int line;
  };

  // "SP: Surface (air) pressure (Pa)": legend lines outside the table name a column and give
  // its unit in the last brackets.
  std::vector<Legend> legends() const {
    std::vector<Legend> out;
    const auto scan = [&](std::size_t from, std::size_t to) {
      for (std::size_t i = from; i < to && i < lines_.size(); ++i) {
        const std::string_view l = lines_[i].text;
        const std::size_t colon = l.find(':');
        const std::size_t open = l.rfind('('), close = l.rfind(')');
        if (colon == std::string_view::npos || open == std::string_view::npos ||
            close == std::string_view::npos || close < open || open < colon)
          continue;
        out.push_back({trim(l.substr(0, colon)), trim(l.substr(open + 1, close - open - 1)),
                       lines_[i].number});
      }
    };
    scan(0, header_index_);
    scan(table_end_, lines_.size());
    return out;
  }

  [[noreturn]] void unknown_unit(const ColumnUse& u, std::string_view unit,
                                 std::string_view from) const {
    const Kind kind = info(u.quantity).kind;
    throw InputError(fmt::format(
        "{}: column {} has unit {} ({}), which is not a {} unit (allowed: {}); set it in "
        "[weather], e.g. {} = {{ unit = \"{}\" }}",
        src(), echo(u.header), echo(unit), from, kind_word(kind), allowed_units(kind), info(u.quantity).key,
        first_unit(kind)));
  }

  Conversion infer_unit(ColumnUse& u, std::size_t slot) const {
    const Kind kind = info(u.quantity).kind;
    const Plausible& pl = plausible(kind);
    double lo = HUGE_VAL, hi = -HUGE_VAL;
    for (const Row& r : rows_)
      if (r.cell[slot] == Cell::ok) lo = std::min(lo, r.raw[slot]), hi = std::max(hi, r.raw[slot]);
    std::vector<const HeaderUnit*> fits;
    if (lo <= hi) {
      for (const HeaderUnit& h : kHeaderUnits) {
        if (h.kind != kind || !h.candidate) continue;
        const Conversion c = conversion(h);
        const double a = lo * c.scale + c.offset, b = hi * c.scale + c.offset;
        if (a >= pl.lo && b <= pl.hi && b >= pl.max_lo && b <= pl.max_hi) fits.push_back(&h);
      }
    }
    if (fits.size() == 1) {
      u.unit_found = UnitFound::inferred;
      u.unit_origin = fmt::format(
          "no unit in the header; values {:g} to {:g} are plausible "
          "only in {}",
          lo, hi, fits[0]->label);
      return conversion(*fits[0]);
    }
    std::string which;
    for (const HeaderUnit* h : fits) which += (which.empty() ? "" : ", ") + std::string(h->help);
    const std::string found =
        lo > hi        ? std::string("no readable values to infer one from")
        : fits.empty() ? fmt::format("its values ({:g} to {:g}) fit no {} unit ({})", lo, hi,
                                     kind_word(kind), pl.why)
                       : fmt::format("its values ({:g} to {:g}) fit {} alike", lo, hi, which);
    throw InputError(fmt::format(
        "{}:{}: column {} has no unit in the header and {}; allowed: a unit in the header or "
        "in [weather], e.g. {} = {{ unit = \"{}\" }} (units: {})",
        src(), out_.info.header_line, echo(u.header), found, info(u.quantity).key,
        fits.empty() ? first_unit(kind) : fits[0]->help, allowed_units(kind)));
  }

  void resolve_units() {
    std::vector<Legend> legend;
    bool legend_read = false;
    std::optional<Conversion> dry_conversion;
    for (ColumnUse& u : out_.info.columns) {
      if (!info(u.quantity).has_unit) continue;
      const Kind kind = info(u.quantity).kind;
      const std::size_t slot = u.quantity == Quantity::dry_bulb   ? kDry
                               : u.quantity == Quantity::pressure ? kPressure
                                                                  : kHumidity;
      const HeaderField& h = header_[static_cast<std::size_t>(u.index)];
      const ColumnOverride& o = mapping_.column(u.quantity);
      Conversion c;
      if (o.unit) {
        const HeaderUnit* hu = find_unit(kind, *o.unit);
        if (!hu)
          throw InputError(fmt::format("{}: unit {} given for {} is not a {} unit (allowed: {})",
                                       o.origin.empty() ? "the weather mapping" : o.origin, echo(*o.unit),
                                       info(u.quantity).label, kind_word(kind),
                                       allowed_units(kind)));
        c = conversion(*hu);
        u.unit_found = UnitFound::override;
        u.unit_origin = o.origin;
      } else if (!h.unit_text.empty()) {
        const HeaderUnit* hu = find_unit(kind, h.unit_text);
        if (!hu) unknown_unit(u, h.unit_text, fmt::format("header line {}", out_.info.header_line));
        c = conversion(*hu);
        u.unit_found = UnitFound::header;
      } else {
        if (!legend_read) legend = legends(), legend_read = true;
        const Legend* found = nullptr;
        for (const Legend& l : legend)
          if (iequals(l.name, h.text)) found = &l;
        if (found) {
          const HeaderUnit* hu = find_unit(kind, found->unit);
          if (!hu) unknown_unit(u, found->unit, fmt::format("legend line {}", found->line));
          c = conversion(*hu);
          u.unit_found = UnitFound::legend;
          u.unit_origin = fmt::format("line {}", found->line);
        } else if (kind == Kind::temperature && u.quantity != Quantity::dry_bulb &&
                   dry_conversion) {
          c = *dry_conversion;
          u.unit_found = UnitFound::same_as_dry_bulb;
        } else {
          c = infer_unit(u, slot);
        }
      }
      u.unit = std::string(c.label);
      conv_[slot] = c;
      if (u.quantity == Quantity::dry_bulb) dry_conversion = c;
    }
  }

  // --- Resolution: the step the values were written to ---

  // The step of a column's values in its own unit: the coarsest of 1, 0.5, 0.1, ... of which
  // every value is a whole multiple. Under a day of values says nothing (a few whole numbers
  // are whole by chance), so it is 0 then, as for values finer than a thousandth.
  double resolution_of(std::size_t slot) const {
    constexpr double kSteps[] = {1.0, 0.5, 0.1, 0.05, 0.01, 0.001};
    constexpr unsigned kAll = (1u << std::size(kSteps)) - 1;
    unsigned alive = kAll;
    int n = 0;
    for (const Row& r : rows_) {
      if (r.cell[slot] != Cell::ok) continue;
      ++n;
      for (std::size_t k = 0; k < std::size(kSteps); ++k) {
        if (!(alive >> k & 1u)) continue;
        const double q = r.raw[slot] / kSteps[k];
        if (std::fabs(q - std::round(q)) > 1e-6) alive &= ~(1u << k);
      }
      if (alive == 0) return 0.0;
    }
    if (n < kMinStatisticRows) return 0.0;
    for (std::size_t k = 0; k < std::size(kSteps); ++k)
      if (alive >> k & 1u) return kSteps[k];
    return 0.0;
  }

  // Written values are within half their step of the reading: a dew point above the dry-bulb
  // by up to half the step of each column (plus the fixed tolerance) is saturated air.
  void find_resolution() {
    WeatherInfo& inf = out_.info;
    double step_si[3] = {0.0, 0.0, 0.0};
    double coarsest = 0.0;
    for (ColumnUse& u : inf.columns) {
      if (!info(u.quantity).has_unit) continue;
      const std::size_t slot = slot_of(u.quantity);
      if (slot_column_[slot] != u.index) continue;
      u.resolution = resolution_of(slot);
      step_si[slot] = u.resolution * conv_[slot].scale;
    }
    inf.temperature_tolerance_k = kTemperatureToleranceK;
    inf.relative_humidity_tolerance = kRelativeHumidityTolerance;
    const Kind hk = info(slot_quantity_[kHumidity]).kind;
    const ColumnUse* dry = inf.find(Quantity::dry_bulb);
    const ColumnUse* hum = inf.find(slot_quantity_[kHumidity]);
    if (hk == Kind::temperature) {
      inf.temperature_tolerance_k += 0.5 * (step_si[kDry] + step_si[kHumidity]);
      coarsest = std::max(dry->resolution, hum->resolution);
    } else if (hk == Kind::fraction) {
      inf.relative_humidity_tolerance += 0.5 * step_si[kHumidity];
      coarsest = hum->resolution;
    }
    if (coarsest > 0.0 && hk != Kind::humidity_ratio)
      inf.rounding_words = fmt::format("{}-{}", step_word(coarsest),
                                       hk == Kind::temperature ? "degree" : "percent");
  }

  static std::size_t slot_of(Quantity q) {
    return q == Quantity::dry_bulb ? kDry : q == Quantity::pressure ? kPressure : kHumidity;
  }

  static std::string_view step_word(double step) {
    constexpr std::pair<double, std::string_view> kWords[] = {
        {1.0, "whole"}, {0.5, "half"}, {0.1, "tenth"}, {0.05, "twentieth"}, {0.01, "hundredth"},
        {0.001, "thousandth"}};
    for (const auto& [s, w] : kWords)
      if (s == step) return w;
    return "fine";
  }

  // --- Labels judged by the column's statistics ---

  struct Stats {
    int n = 0, impossible = 0;
    double median = 0.0, max = 0.0;
  };

  // The readable values of `slot` converted with `c` (the dry-bulb with `dry`): how many are
  // impossible for the quantity, their median and their largest.
  Stats stats_of(std::size_t slot, const Conversion& c, const Conversion& dry) const {
    const Kind kind = info(slot_quantity_[slot]).kind;
    const Plausible& pl = plausible(kind);
    const WeatherInfo& inf = out_.info;
    Stats st;
    std::vector<double> v;
    v.reserve(rows_.size());
    for (const Row& r : rows_) {
      if (r.cell[slot] != Cell::ok) continue;
      const double x = r.raw[slot] * c.scale + c.offset;
      bool bad = !(x >= pl.lo && x <= pl.hi);
      if (slot == kHumidity && kind == Kind::temperature && r.cell[kDry] == Cell::ok)
        bad = bad || x > r.raw[kDry] * dry.scale + dry.offset + inf.temperature_tolerance_k;
      if (slot == kHumidity && kind == Kind::fraction)
        bad = bad || x <= 0.0 || x > 1.0 + inf.relative_humidity_tolerance;
      st.impossible += bad;
      v.push_back(x);
    }
    st.n = static_cast<int>(v.size());
    if (v.empty()) return st;
    auto mid = v.begin() + static_cast<std::ptrdiff_t>(v.size() / 2);
    std::nth_element(v.begin(), mid, v.end());
    st.median = *mid;
    st.max = *std::max_element(v.begin(), v.end());
    return st;
  }

  static std::string si_text(Kind kind, double v) {
    switch (kind) {
      case Kind::temperature: return fmt::format("{:.1f} °C", v);
      case Kind::pressure: return fmt::format("{:.4g} kPa", v);
      case Kind::fraction: return fmt::format("{:.3g} %", v * 100.0);
      default: return fmt::format("{:.3g} kg/kg", v);
    }
  }

  bool whole_year() const {
    std::array<bool, 12> seen{};
    for (const Row& r : rows_) seen[static_cast<std::size_t>(r.month - 1)] = true;
    return std::all_of(seen.begin(), seen.end(), [](bool b) { return b; });
  }

  // Why the values of `slot`, read with `c`, cannot be the quantity in that unit; empty when
  // they can. `statistical` says whether the reason is the column as a whole (its median or
  // its year's highest value) rather than a share of impossible rows.
  std::string implausible(std::size_t slot, const Stats& st, bool& statistical) const {
    statistical = false;
    if (st.n < kMinStatisticRows) return "";
    const Quantity q = slot_quantity_[slot];
    const Kind kind = info(q).kind;
    std::vector<std::string> why;
    if (st.impossible > kLabelImpossibleShare * st.n)
      why.push_back(fmt::format("{} of {} rows ({:.1f} %) are impossible for a {}", st.impossible,
                                st.n, 100.0 * st.impossible / st.n, info(q).label));
    for (const MedianBand& b : kMedianBands)
      if (b.quantity == q && !(st.median >= b.lo && st.median <= b.hi)) {
        why.push_back(fmt::format("its median is {}, where {} lies between {} and {}",
                                  si_text(kind, st.median), b.what, si_text(kind, b.lo),
                                  si_text(kind, b.hi)));
        statistical = true;
      }
    const Plausible& pl = plausible(kind);
    // A dew point can stay low all year on a cold dry plateau; the dry-bulb and the RH
    // cannot stay below their floors through a whole year anywhere an economizer runs.
    if ((q == Quantity::dry_bulb || q == Quantity::relative_humidity) && whole_year() &&
        st.max < pl.max_lo) {
      why.push_back(fmt::format("its highest value of a whole year is {}, below the {} every "
                                "year reaches",
                                si_text(kind, st.max), si_text(kind, pl.max_lo)));
      statistical = true;
    }
    std::string out;
    for (const std::string& w : why) out += (out.empty() ? "" : ", and ") + w;
    return out;
  }

  struct Choice {
    std::size_t slot;
    const HeaderUnit* unit;  // nullptr: the unit as read
    Conversion conv;
  };

  // The units the column could be in: the one read first, then every other of its kind.
  std::vector<Choice> choices(std::size_t slot) const {
    std::vector<Choice> out{{slot, nullptr, conv_[slot]}};
    const Kind kind = info(slot_quantity_[slot]).kind;
    for (const HeaderUnit& h : kHeaderUnits) {
      if (h.kind != kind) continue;
      const Conversion c = conversion(h);
      if (c.scale == conv_[slot].scale && c.offset == conv_[slot].offset) continue;
      out.push_back({slot, &h, c});
    }
    return out;
  }

  std::string unit_source(const ColumnUse& u) const {
    switch (u.unit_found) {
      case UnitFound::header: return "from its header";
      case UnitFound::legend: return "from the legend, " + u.unit_origin;
      case UnitFound::override: return "set by " + u.unit_origin;
      case UnitFound::inferred: return "inferred from its values";
      case UnitFound::same_as_dry_bulb: return "taken from the dry-bulb";
      case UnitFound::none: break;
    }
    return "as read";
  }

  // A column whose values contradict its unit is refused with the evidence and the fix: the
  // remedy for a column in the wrong unit is its unit, never dropping the rows it makes bad.
  void check_labels() const {
    // The dry-bulb and the humidity are judged together (a dew point against the dry-bulb,
    // and a file in °F usually has both in °F); the pressure on its own.
    std::vector<std::vector<std::size_t>> groups{{kDry, kHumidity}};
    if (slot_column_[kPressure] >= 0) groups.push_back({kPressure});
    std::vector<std::string> found, mapping_fix, cli_fix;
    for (const auto& group : groups) {
      // Every combination of units of the group's columns, the ones as read first.
      std::vector<std::vector<Choice>> combos{{}};
      for (std::size_t slot : group) {
        std::vector<std::vector<Choice>> next;
        for (const auto& partial : combos)
          for (const Choice& c : choices(slot)) {
            next.push_back(partial);
            next.back().push_back(c);
          }
        combos = std::move(next);
      }
      const auto judge = [&](const std::vector<Choice>& combo, std::vector<std::string>& why,
                             bool& statistical, int& impossible) {
        const Conversion& dry = combo[0].slot == kDry ? combo[0].conv : conv_[kDry];
        why.clear();
        statistical = false;
        impossible = 0;
        for (const Choice& c : combo) {
          const Stats st = stats_of(c.slot, c.conv, dry);
          bool s = false;
          why.push_back(implausible(c.slot, st, s));
          statistical = statistical || s;
          impossible += st.impossible;
        }
      };
      std::vector<std::string> as_read;
      bool statistical = false;
      int impossible = 0;
      judge(combos[0], as_read, statistical, impossible);
      if (std::all_of(as_read.begin(), as_read.end(), [](const std::string& w) { return w.empty(); }))
        continue;
      // The plausible combination that changes fewest units, then leaves fewest impossible rows.
      const std::vector<Choice>* best = nullptr;
      int best_changes = 0, best_impossible = 0;
      for (std::size_t k = 1; k < combos.size(); ++k) {
        std::vector<std::string> why;
        bool s = false;
        int imp = 0;
        judge(combos[k], why, s, imp);
        if (!std::all_of(why.begin(), why.end(), [](const std::string& w) { return w.empty(); }))
          continue;
        const int changes = static_cast<int>(std::count_if(
            combos[k].begin(), combos[k].end(), [](const Choice& c) { return c.unit != nullptr; }));
        if (!best || changes < best_changes ||
            (changes == best_changes && imp < best_impossible))
          best = &combos[k], best_changes = changes, best_impossible = imp;
      }
      if (!best && !statistical) continue;  // a share of bad rows, but no unit explains it
      for (std::size_t i = 0; i < group.size(); ++i) {
        const std::size_t slot = group[i];
        const ColumnUse* u = out_.info.find(slot_quantity_[slot]);
        const bool changed = best && (*best)[i].unit != nullptr;
        if (as_read[i].empty() && !changed) continue;
        std::string text = fmt::format("column {} contradicts its unit {} ({}): {}", echo(u->header),
                                       u->unit, unit_source(*u),
                                       as_read[i].empty() ? "read with the other column's unit"
                                                          : as_read[i]);
        if (changed) {
          const HeaderUnit& h = *(*best)[i].unit;
          const Conversion& dry = (*best)[0].slot == kDry ? (*best)[0].conv : conv_[kDry];
          const Stats st = stats_of(slot, (*best)[i].conv, dry);
          text += fmt::format("; read in {} its values are plausible (median {})", h.label,
                              si_text(info(slot_quantity_[slot]).kind, st.median));
          const std::string_view key = info(slot_quantity_[slot]).key;
          mapping_fix.push_back(fmt::format("{} = {{ unit = \"{}\" }}", key, h.help));
          cli_fix.push_back(
              "--column " + echo(fmt::format("{}={}:{}", key, u->header, h.help)));
        } else if (!best) {
          text += fmt::format("; no unit reads it plausibly: check that it is the {} (name the "
                              "right column in [weather], e.g. {} = {{ column = \"...\" }})",
                              info(slot_quantity_[slot]).label, info(slot_quantity_[slot]).key);
        }
        found.push_back(std::move(text));
      }
    }
    if (found.empty()) return;
    std::string msg = src() + ": ";
    for (std::size_t i = 0; i < found.size(); ++i) msg += (i ? "; " : "") + found[i];
    if (!mapping_fix.empty()) {
      msg += "; fix: ";
      for (std::size_t i = 0; i < mapping_fix.size(); ++i)
        msg += (i ? " and " : "") + mapping_fix[i];
      msg += " in the unit file's [weather] table, or ";
      for (std::size_t i = 0; i < cli_fix.size(); ++i) msg += (i ? " " : "") + cli_fix[i];
    }
    throw InputError(msg);
  }

  // --- Rows to states ---

  struct State {
    double t, w, p;
  };

  enum class Saturation { none, tolerance, rounding };

  // The value of a slot in SI, or the reason it is not usable.
  bool value(const Row& r, std::size_t slot, double& v, std::string& why) const {
    const Conversion& c = conv_[slot];
    switch (r.cell[slot]) {
      case Cell::ok:
        v = r.raw[slot] * c.scale + c.offset;
        return true;
      case Cell::sentinel: {
        // 99999 Pa is a real pressure: a marker value that is plausible is a value.
        v = r.raw[slot] * c.scale + c.offset;
        const Plausible& pl = plausible(info(slot_quantity_[slot]).kind);
        if (v >= pl.lo && v <= pl.hi) return true;
        why = "is a missing-value marker; allowed: a measured value";
        return false;
      }
      case Cell::empty:
        why = "is empty (missing); allowed: a measured value";
        return false;
      case Cell::marker:
        why = "is a missing-value marker; allowed: a measured value";
        return false;
      case Cell::not_number:
        why = fmt::format("is not a number; allowed: a number in {}", c.label);
        return false;
    }
    return false;
  }

  // "(up to 0.56 K above is read as saturation)", with the rounding when it widens it.
  std::string saturation_words(double tolerance, double fixed, std::string_view unit,
                               double shown_scale) const {
    const std::string& words = out_.info.rounding_words;
    if (tolerance <= fixed + 1e-12 || words.empty())
      return fmt::format("up to {:.{}f} {} above is read as saturation", tolerance * shown_scale,
                         unit == "K" ? 2 : 0, unit);
    return fmt::format("up to {:.2f} {} above is read as saturation: {:.2f} {} plus the {} "
                       "rounding of the values",
                       tolerance * shown_scale, unit, fixed * shown_scale, unit, words);
  }

  // Resolves a row to a state; on a bad row returns the slot at fault and the reason.
  bool resolve(const Row& r, State& s, Saturation& sat, std::size_t& bad_slot,
               std::string& why) const {
    const WeatherInfo& inf = out_.info;
    sat = Saturation::none;
    bad_slot = kDry;
    if (!value(r, kDry, s.t, why)) return false;
    const Plausible& tp = plausible(Kind::temperature);
    if (s.t < tp.lo || s.t > tp.hi) {
      why = fmt::format("is {:.4g} °C; allowed {:g} °C to {:g} °C ({})", s.t, tp.lo, tp.hi, tp.why);
      return false;
    }
    if (slot_column_[kPressure] >= 0) {
      bad_slot = kPressure;
      if (!value(r, kPressure, s.p, why)) return false;
      const Plausible& pp = plausible(Kind::pressure);
      if (s.p < pp.lo || s.p > pp.hi) {
        why = fmt::format("is {:.5g} kPa; allowed {:g} kPa to {:g} kPa ({})", s.p, pp.lo, pp.hi,
                          pp.why);
        return false;
      }
    } else {
      s.p = site_pressure_;
    }
    bad_slot = kHumidity;
    double h = 0.0;
    if (!value(r, kHumidity, h, why)) return false;
    try {
      switch (inf.humidity) {
        case HumiditySource::dew_point:
        case HumiditySource::wet_bulb: {
          const bool dew = inf.humidity == HumiditySource::dew_point;
          const char* what = dew ? "dew point" : "wet-bulb";
          const double excess = h - s.t;
          if (excess > inf.temperature_tolerance_k) {
            why = fmt::format(
                "is a {} of {:.4g} °C, above the dry-bulb {:.4g} °C; allowed: up "
                "to the dry-bulb ({})",
                what, h, s.t,
                saturation_words(inf.temperature_tolerance_k, kTemperatureToleranceK, "K", 1.0));
            return false;
          }
          if (excess > 0.0) {
            h = s.t;
            sat = excess > kTemperatureToleranceK + 1e-9 ? Saturation::rounding
                                                         : Saturation::tolerance;
          }
          s.w = dew ? psychro::humidity_ratio_from_dew_point(h, s.p)
                    : psychro::humidity_ratio_from_wet_bulb(s.t, h, s.p);
          break;
        }
        case HumiditySource::relative_humidity: {
          const double tol = inf.relative_humidity_tolerance;
          if (h < 0.0 || h > 1.0 + tol) {
            why = fmt::format(
                "is {:.4g} % relative humidity; allowed 0 % to 100 % (up to {:.4g} % "
                "is read as 100 %{})",
                h * 100.0, 100.0 * (1.0 + tol),
                tol > kRelativeHumidityTolerance + 1e-12 && !inf.rounding_words.empty()
                    ? fmt::format(": 1 % plus the {} rounding of the values", inf.rounding_words)
                    : std::string());
            return false;
          }
          if (h > 1.0) {
            sat = h > 1.0 + kRelativeHumidityTolerance + 1e-9 ? Saturation::rounding
                                                               : Saturation::tolerance;
            h = 1.0;
          }
          s.w = psychro::humidity_ratio_from_relative_humidity(s.t, h, s.p);
          break;
        }
        case HumiditySource::humidity_ratio: {
          const double ws = psychro::saturation_humidity_ratio(s.t, s.p);
          if (h < 0.0 || h > ws * (1.0 + kHumidityRatioTolerance)) {
            why = fmt::format(
                "is {:.5g} kg/kg; allowed 0 to saturation, {:.5g} kg/kg at {:.4g} "
                "°C and {:.5g} kPa (up to 1 % above is read as saturation)",
                h, ws, s.t, s.p);
            return false;
          }
          if (h > ws) h = ws, sat = Saturation::tolerance;
          s.w = h;
          break;
        }
      }
    } catch (const RangeError& e) {
      why = fmt::format("is not a possible state: {}", e.what());
      return false;
    }
    // Perfectly dry air (RH 0 %, humidity ratio 0) is a failed sensor or a missing reading,
    // and has no dew point for the model to work with.
    if (!(psychro::vapor_pressure_from_humidity_ratio(s.w, s.p) >= min_vapor_pressure_kpa_)) {
      const std::string reading =
          inf.humidity == HumiditySource::relative_humidity ? fmt::format("{:.4g} % relative humidity", h * 100.0)
          : inf.humidity == HumiditySource::humidity_ratio  ? fmt::format("{:.5g} kg/kg", h)
                                                            : fmt::format("{:.4g} °C", h);
      why = fmt::format(
          "is {}, air drier than the psychrometric model reaches (a dew point below -100 °C); "
          "allowed: a humidity above 0 (0 is a failed sensor or a missing reading)",
          reading);
      return false;
    }
    return true;
  }

  std::string bad_row_text(const Row& r, std::size_t slot, const std::string& why) const {
    return fmt::format("column {} value {} {}",
                       echo(header_[static_cast<std::size_t>(slot_column_[slot])].text),
                       echo(r.text[slot]), why);
  }

  void convert() {
    check_labels();
    WeatherInfo& inf = out_.info;
    const std::size_t n = rows_.size();
    std::vector<State> states(n);
    std::vector<unsigned char> bad(n, 0);
    int good = 0, bad_count = 0;
    std::string first_bad;
    int first_bad_line = 0;
    for (std::size_t i = 0; i < n; ++i) {
      const Row& r = rows_[i];
      Saturation sat = Saturation::none;
      std::size_t slot = 0;
      std::string why;
      if (resolve(r, states[i], sat, slot, why)) {
        ++good;
        MonthCounts& mc = inf.months[static_cast<std::size_t>(r.month - 1)];
        if (sat != Saturation::none) ++mc.capped;
        if (sat == Saturation::rounding) ++mc.rounded;
        continue;
      }
      if (mapping_.on_bad_row == BadRowPolicy::error)
        fail_at(r.line, bad_row_text(r, slot, why) + " (or set on_bad_row to skip or fill)");
      if (bad_count++ == 0) first_bad = bad_row_text(r, slot, why), first_bad_line = r.line;
      bad[i] = 1;
      MonthCounts& mc = inf.months[static_cast<std::size_t>(r.month - 1)];
      ++(mapping_.on_bad_row == BadRowPolicy::skip ? mc.skipped : mc.filled);
    }
    if (good == 0)
      throw InputError(
          fmt::format("{}: none of the {} data rows (lines {} to {}) has usable "
                      "values; allowed: at least one",
                      src(), n, inf.first_data_line, inf.last_data_line));
    check_bad_share(bad_count, first_bad_line, first_bad);
    if (mapping_.on_bad_row == BadRowPolicy::fill) fill(states, bad);

    // Feb 29 shifts the later days of the year only when the file has it.
    const bool leap = inf.time.leap_day_rows > 0;
    int cumulative[13] = {0};
    for (int m = 1; m <= 12; ++m)
      cumulative[m] = cumulative[m - 1] + kDaysInMonth[m - 1] + (m == 2 && leap ? 1 : 0);
    out_.hours.reserve(n);
    for (std::size_t i = 0; i < n; ++i) {
      if (bad[i] && mapping_.on_bad_row == BadRowPolicy::skip) continue;
      const Row& r = rows_[i];
      WeatherHour h;
      h.month = r.month;
      h.day = r.day;
      h.hour = r.hour;
      h.minute = r.minute;
      h.day_of_year = cumulative[r.month - 1] + r.day - 1;
      h.weight_h = inf.time.weight_h;
      h.dry_bulb_c = states[i].t;
      h.humidity_ratio = states[i].w;
      h.pressure_kpa = states[i].p;
      ++inf.months[static_cast<std::size_t>(r.month - 1)].rows;
      out_.hours.push_back(h);
    }
    if (inf.pressure_from_file && !out_.hours.empty()) {
      std::vector<double> p;
      p.reserve(out_.hours.size());
      for (const WeatherHour& h : out_.hours) p.push_back(h.pressure_kpa);
      auto mid = p.begin() + static_cast<std::ptrdiff_t>(p.size() / 2);
      std::nth_element(p.begin(), mid, p.end());
      inf.median_pressure_kpa = *mid;
    }
  }

  // Dropping or inventing more than a small share of a year is no longer reading the file:
  // beyond the share the user has allowed, the read is refused with the first bad row.
  void check_bad_share(int bad_count, int first_line, const std::string& first) {
    WeatherInfo& inf = out_.info;
    const double share = mapping_.max_bad_share.value_or(kDefaultMaxBadShare);
    inf.max_bad_share = share;
    const int n = static_cast<int>(rows_.size());
    if (bad_count == 0 || bad_count <= share * n + 1e-9) return;
    const double pct = 100.0 * bad_count / n;
    const double needed = std::ceil(pct * 10.0 - 1e-9) / 10.0;
    const bool skip = mapping_.on_bad_row == BadRowPolicy::skip;
    throw InputError(fmt::format(
        "{}: {} of {} rows ({:.2g} %) have missing or impossible values and would be {}; "
        "allowed: at most {:g} % ({}); the first is line {}: {}; if these rows are truly "
        "missing readings, allow their share with max_bad_share = \"{:g}%\" in [weather] or "
        "--max-bad-share {:g}%",
        src(), bad_count, n, pct, skip ? "skipped" : "filled by interpolation", share * 100.0,
        mapping_.max_bad_share ? "max_bad_share, set by " + mapping_.max_bad_share_origin
                               : std::string("the default; max_bad_share raises it"),
        first_line, first, needed, needed));
  }

  // Linear interpolation in time between the nearest good rows; a run at either end of the
  // file takes the nearest good row.
  void fill(std::vector<State>& states, const std::vector<unsigned char>& bad) {
    const std::size_t n = rows_.size();
    std::size_t i = 0;
    while (i < n) {
      if (!bad[i]) {
        ++i;
        continue;
      }
      std::size_t j = i;
      while (j < n && bad[j]) ++j;
      out_.info.fill_longest_run = std::max(out_.info.fill_longest_run, static_cast<int>(j - i));
      const bool has_before = i > 0, has_after = j < n;
      for (std::size_t k = i; k < j; ++k) {
        if (!has_before) {
          states[k] = states[j];
        } else if (!has_after) {
          states[k] = states[i - 1];
        } else {
          const State& a = states[i - 1];
          const State& b = states[j];
          const double f = (rows_[k].position - rows_[i - 1].position) /
                           (rows_[j].position - rows_[i - 1].position);
          State s{a.t + f * (b.t - a.t), a.w + f * (b.w - a.w), a.p + f * (b.p - a.p)};
          // Saturation is convex in t, so the chord between two states can pass above it.
          s.w = std::min(s.w, psychro::saturation_humidity_ratio(s.t, s.p));
          states[k] = s;
        }
      }
      i = j;
    }
  }
};

template <typename Enum, std::size_t N>
Enum parse_name(const std::array<std::pair<Enum, std::string_view>, N>& names,
                std::string_view text, std::string_view origin, std::string_view what) {
  for (const auto& [value, name] : names)
    if (iequals(trim(text), name)) return value;
  std::string allowed;
  for (const auto& [value, name] : names)
    allowed += (allowed.empty() ? "" : ", ") + std::string(name);
  throw InputError(fmt::format("{}: {} is not {} (allowed: {})", origin, echo(text), what, allowed));
}

template <typename Enum, std::size_t N>
std::string_view name_of(const std::array<std::pair<Enum, std::string_view>, N>& names, Enum e) {
  for (const auto& [value, name] : names)
    if (value == e) return name;
  return "";
}

constexpr std::array<std::pair<HumiditySource, std::string_view>, 4> kHumidityNames{{
    {HumiditySource::dew_point, "dew-point"},
    {HumiditySource::humidity_ratio, "humidity-ratio"},
    {HumiditySource::wet_bulb, "wet-bulb"},
    {HumiditySource::relative_humidity, "relative-humidity"},
}};
constexpr std::array<std::pair<BadRowPolicy, std::string_view>, 3> kPolicyNames{{
    {BadRowPolicy::error, "error"},
    {BadRowPolicy::skip, "skip"},
    {BadRowPolicy::fill, "fill"},
}};
constexpr std::array<std::pair<TimeConvention, std::string_view>, 3> kConventionNames{{
    {TimeConvention::automatic, "automatic"},
    {TimeConvention::hour_beginning, "hour-beginning"},
    {TimeConvention::hour_ending, "hour-ending"},
}};

}  // namespace

// --- Names ---------------------------------------------------------------------------------

std::string_view quantity_key(Quantity q) { return info(q).key; }
std::string_view quantity_label(Quantity q) { return info(q).label; }
std::optional<Quantity> quantity_from_key(std::string_view key) {
  for (const QuantityInfo& q : kQuantities)
    if (q.key == key) return q.quantity;
  return std::nullopt;
}

std::string_view humidity_source_name(HumiditySource h) { return name_of(kHumidityNames, h); }
HumiditySource parse_humidity_source(std::string_view text, std::string_view origin) {
  return parse_name(kHumidityNames, text, origin, "a humidity source");
}
std::string_view bad_row_policy_name(BadRowPolicy p) { return name_of(kPolicyNames, p); }
BadRowPolicy parse_bad_row_policy(std::string_view text, std::string_view origin) {
  return parse_name(kPolicyNames, text, origin, "a bad-row policy");
}
std::string_view time_convention_name(TimeConvention c) { return name_of(kConventionNames, c); }
TimeConvention parse_time_convention(std::string_view text, std::string_view origin) {
  return parse_name(kConventionNames, text, origin, "a time convention");
}

double parse_max_bad_share(std::string_view text, std::string_view origin) {
  const double share = units::parse(Kind::fraction, text, units::System::si, origin);
  if (!(share >= 0.0 && share <= 1.0))
    throw InputError(fmt::format("{}: {} is not a share of rows; allowed: 0 % to 100 %", origin,
                                 echo(text)));
  return share;
}

bool accepts_unit(Quantity q, std::string_view unit) {
  return info(q).has_unit && find_unit(info(q).kind, unit) != nullptr;
}

// --- Reading -------------------------------------------------------------------------------

int WeatherInfo::skipped() const {
  int n = 0;
  for (const MonthCounts& m : months) n += m.skipped;
  return n;
}
int WeatherInfo::filled() const {
  int n = 0;
  for (const MonthCounts& m : months) n += m.filled;
  return n;
}
int WeatherInfo::capped() const {
  int n = 0;
  for (const MonthCounts& m : months) n += m.capped;
  return n;
}
int WeatherInfo::rounded() const {
  int n = 0;
  for (const MonthCounts& m : months) n += m.rounded;
  return n;
}
const ColumnUse* WeatherInfo::find(Quantity q) const {
  for (const ColumnUse& c : columns)
    if (c.quantity == q) return &c;
  return nullptr;
}

WeatherSeries read_text(std::string_view text, std::string_view source_name, const Mapping& mapping,
                        double site_pressure_kpa) {
  return Reader(text, source_name, mapping, site_pressure_kpa).run();
}

WeatherSeries read_file(const std::filesystem::path& path, const Mapping& mapping,
                        double site_pressure_kpa) {
  // Ten years of five-minute data is about 60 MB; a larger file is not one site's weather.
  constexpr std::uintmax_t kMaxWeatherBytes = std::uintmax_t{256} << 20;
  return read_text(read_input_file(path, "the weather file", kMaxWeatherBytes),
                   path.filename().string(), mapping, site_pressure_kpa);
}

// --- The [weather] table -------------------------------------------------------------------

Mapping read_mapping(const toml::table& table, std::string_view file_name) {
  Mapping m;
  const auto where = [&](const toml::source_region& r) {
    return fmt::format("{}:{}", file_name, r.begin.line);
  };
  const auto text_of = [&](const toml::node& node, const std::string& origin,
                           std::string_view key) -> std::string {
    if (const auto* s = node.as_string()) return s->get();
    throw InputError(fmt::format("{}: [weather] {} must be a string in quotes", origin, key));
  };
  for (auto&& [key, node] : table) {
    const std::string origin = where(key.source());
    const std::string_view k = key.str();
    if (k == "file") {
      m.file = text_of(node, origin, k);
    } else if (k == "humidity") {
      m.humidity = parse_humidity_source(text_of(node, origin, k), origin + ": [weather] humidity");
    } else if (k == "on_bad_row") {
      m.on_bad_row =
          parse_bad_row_policy(text_of(node, origin, k), origin + ": [weather] on_bad_row");
    } else if (k == "max_bad_share") {
      // "5%", or a bare number of percent as elsewhere in the unit file.
      const std::string text = node.is_number()
                                   ? fmt::format("{}%", node.value<double>().value_or(0.0))
                                   : text_of(node, origin, k);
      m.max_bad_share = parse_max_bad_share(text, origin + ": [weather] max_bad_share");
      m.max_bad_share_origin = origin;
    } else if (k == "time_convention") {
      m.time_convention =
          parse_time_convention(text_of(node, origin, k), origin + ": [weather] time_convention");
    } else if (const std::optional<Quantity> q = quantity_from_key(k)) {
      const toml::table* sub = node.as_table();
      const bool has_unit = info(*q).has_unit;
      if (!sub)
        throw InputError(
            fmt::format("{}: [weather] {} must be a table, e.g. {} = {{ column = "
                        "\"...\"{} }}",
                        origin, k, k, has_unit ? ", unit = \"...\"" : ""));
      ColumnOverride& o = m.column(*q);
      o.origin = origin;
      for (auto&& [sub_key, sub_node] : *sub) {
        const std::string sub_origin = where(sub_key.source());
        const std::string name = fmt::format("{}.{}", k, sub_key.str());
        if (sub_key.str() == "column") {
          o.column = text_of(sub_node, sub_origin, name);
        } else if (sub_key.str() == "unit" && has_unit) {
          const std::string unit = text_of(sub_node, sub_origin, name);
          if (!find_unit(info(*q).kind, unit))
            throw InputError(fmt::format("{}: [weather] {} {} is not a {} unit (allowed: {})",
                                         sub_origin, name, echo(unit), kind_word(info(*q).kind),
                                         allowed_units(info(*q).kind)));
          o.unit = unit;
        } else {
          throw InputError(
              fmt::format("{}: [weather] key {} is not known (allowed: {})", sub_origin, echo(name),
                          has_unit ? "column, unit" : "column; a time column has no unit"));
        }
      }
    } else {
      std::string allowed = "file, humidity, on_bad_row, max_bad_share, time_convention";
      for (const QuantityInfo& qi : kQuantities) allowed += ", " + std::string(qi.key);
      throw InputError(
          fmt::format("{}: [weather] key {} is not known (allowed: {})", origin, echo(k), allowed));
    }
  }
  return m;
}

// --- Description ---------------------------------------------------------------------------

namespace {

std::string found_text(const ColumnUse& c) {
  const std::string column =
      c.found == ColumnFound::override
          ? fmt::format("column set by {}", c.unit_origin.empty() ? "the mapping" : c.unit_origin)
          : std::string("found by header");
  std::string unit;
  switch (c.unit_found) {
    case UnitFound::none:
      break;
    case UnitFound::header:
      unit = c.found == ColumnFound::header_name ? "" : "unit from header";
      break;
    case UnitFound::legend:
      unit = "unit from legend " + c.unit_origin;
      break;
    case UnitFound::override:
      unit = "unit set by " + (c.unit_origin.empty() ? std::string("the mapping") : c.unit_origin);
      break;
    case UnitFound::inferred:
      unit = "unit inferred: " + c.unit_origin;
      break;
    case UnitFound::same_as_dry_bulb:
      unit = "no unit in the header: same as the dry-bulb";
      break;
  }
  std::string out = column;
  if (!unit.empty()) out += "; " + unit;
  if (c.other_matches > 0)
    out += fmt::format("; first of {} matching columns", c.other_matches + 1);
  return out;
}

std::string month_list(const std::array<MonthCounts, 12>& months, int MonthCounts::*field) {
  std::string out;
  for (std::size_t m = 0; m < 12; ++m)
    if (months[m].*field > 0)
      out += fmt::format("{}{} {}", out.empty() ? "" : ", ", kMonthNames[m], months[m].*field);
  return out;
}

}  // namespace

std::vector<std::string> describe(const WeatherInfo& inf) {
  std::vector<std::string> lines;
  int rows = 0;
  for (const MonthCounts& m : inf.months) rows += m.rows;
  const std::string delim = inf.delimiter == '\t' ? "tab" : fmt::format("'{}'", inf.delimiter);
  lines.push_back(
      fmt::format("weather: {}, {} rows (lines {} to {}; header on line {}; "
                  "delimiter {}{})",
                  inf.source, rows, inf.first_data_line, inf.last_data_line, inf.header_line, delim,
                  inf.decimal_comma ? ", decimal comma" : ""));

  const TimeInfo& t = inf.time;
  std::string clock = t.clock == Clock::utc ? "UTC clock (hours of the day are UTC)"
                      : t.clock == Clock::offset
                          ? fmt::format("clock at UTC{:+03}:{:02}, used as written",
                                        t.utc_offset_min / 60, std::abs(t.utc_offset_min) % 60)
                          : "local clock";
  std::string convention =
      t.hour_ending ? (t.convention_overridden
                           ? "hour-ending stamps (set by the mapping) read as hour-beginning hours"
                           : "hour-ending stamps (24:00 present) read as hour-beginning hours 0-23")
                    : "hour-beginning stamps";
  lines.push_back(fmt::format("time: {}, {}, {}; {}", t.columns, t.format, clock, convention));

  for (const ColumnUse& c : inf.columns) {
    switch (c.quantity) {
      case Quantity::dry_bulb:
        lines.push_back(
            fmt::format("dry-bulb: column {}, {} ({})", echo(c.header), c.unit, found_text(c)));
        break;
      case Quantity::pressure:
        lines.push_back(
            fmt::format("pressure: column {}, {} ({})", echo(c.header), c.unit, found_text(c)));
        break;
      case Quantity::dew_point:
      case Quantity::humidity_ratio:
      case Quantity::wet_bulb:
      case Quantity::relative_humidity: {
        std::string line = fmt::format("humidity: {}, column {}, {} ({}{})",
                                       quantity_label(c.quantity), echo(c.header), c.unit, found_text(c),
                                       inf.humidity_overridden ? "; chosen by the mapping" : "");
        if (!inf.unused_humidity.empty()) {
          line += "; not used:";
          for (std::size_t i = 0; i < inf.unused_humidity.size(); ++i)
            line += fmt::format("{} {}", i ? "," : "", echo(inf.unused_humidity[i].header));
        }
        lines.push_back(line);
        break;
      }
      default:
        break;
    }
  }
  if (!inf.pressure_from_file)
    lines.push_back(
        fmt::format("pressure: {:.2f} kPa at every hour from the site (the file has "
                    "no pressure column)",
                    inf.site_pressure_kpa));

  lines.push_back(fmt::format("time step: {} min, each row weighs {:g} h{}", t.step_min, t.weight_h,
                              t.missing_steps > 0
                                  ? fmt::format("; {} steps missing between rows", t.missing_steps)
                                  : std::string()));
  if (t.typical_year) {
    std::string years;
    for (std::size_t m = 0; m < 12; ++m)
      if (t.month_year[m] > 0)
        years += fmt::format("{}{} {}", years.empty() ? "" : ", ", kMonthNames[m], t.month_year[m]);
    lines.push_back(
        fmt::format("typical year: months from different years ({}){}; accepted", years,
                    t.months_out_of_order ? ", not in time order at month boundaries" : ""));
  }
  if (t.leap_day_rows > 0)
    lines.push_back(fmt::format("leap day: Feb 29 present ({} rows), kept", t.leap_day_rows));

  const std::string skipped = month_list(inf.months, &MonthCounts::skipped);
  const std::string filled = month_list(inf.months, &MonthCounts::filled);
  if (skipped.empty() && filled.empty())
    lines.push_back(
        fmt::format("bad rows: none (on_bad_row = {})", bad_row_policy_name(inf.policy)));
  if (!skipped.empty())
    lines.push_back(fmt::format("bad rows skipped: {} ({})", inf.skipped(), skipped));
  if (!filled.empty())
    lines.push_back(fmt::format("bad rows filled by interpolation: {} ({}; longest run {})",
                                inf.filled(), filled, inf.fill_longest_run));
  if (inf.capped() > inf.rounded()) {
    std::array<MonthCounts, 12> within = inf.months;
    for (MonthCounts& m : within) m.capped -= m.rounded;
    lines.push_back(fmt::format("read as saturation (within tolerance above it): {} ({})",
                                inf.capped() - inf.rounded(),
                                month_list(within, &MonthCounts::capped)));
  }
  if (inf.rounded() > 0) {
    const bool rh = inf.humidity == HumiditySource::relative_humidity;
    lines.push_back(fmt::format(
        "{} rows read as saturated: {} rounding ({}; {})", inf.rounded(), inf.rounding_words,
        rh ? fmt::format("relative humidity up to {:.4g} % read as 100 %",
                         100.0 * (1.0 + inf.relative_humidity_tolerance))
           : fmt::format("{} up to {:.2f} K above the dry-bulb read as equal to it",
                         quantity_label(inf.find(Quantity::dew_point) ? Quantity::dew_point
                                                                      : Quantity::wet_bulb),
                         inf.temperature_tolerance_k),
        month_list(inf.months, &MonthCounts::rounded)));
  }
  return lines;
}

}  // namespace limitline::weather
