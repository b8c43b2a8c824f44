// Hourly weather import: finding the header, the columns, their units and the time layout
// of a CSV file, then validating every row and resolving it to SI moist-air states. The
// shared stages (lines, header fields and units, stamps, cells) are io/timeseries; what is
// here is the weather's own: which names mean which quantity, the time rules of a regular
// series, the units judged by the columns' statistics and the psychrometrics of each row.
#include <limitline/io/weather.hpp>

#include <limitline/calendar.hpp>
#include <limitline/io/input_file.hpp>
#include <limitline/io/timeseries.hpp>
#include <limitline/memo.hpp>
#include <limitline/names.hpp>
#include <limitline/text.hpp>
#include <limitline/io/detail/raw_table.hpp>
#include <limitline/model/psychro.hpp>
#include <limitline/model/units.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <cstdint>

namespace limitline::weather {
namespace {

namespace ts = timeseries;
using ts::Cell;
using ts::Conversion;
using ts::HeaderField;
using ts::Stamp;
using ts::StampForm;
using ts::StampReader;
using ts::TimeColumns;
using ts::UnitSpelling;
using ts::Zone;
using units::Kind;

constexpr std::size_t idx(Quantity q) { return static_cast<std::size_t>(q); }
constexpr std::string_view time_aliases(ts::TimeRole r) {
  return ts::kTimeRoleAliases[static_cast<std::size_t>(r)];
}

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
    {Quantity::timestamp, "timestamp", "timestamp", time_aliases(ts::TimeRole::timestamp), false,
     Kind::temperature},
    {Quantity::date, "date", "date", time_aliases(ts::TimeRole::date), false, Kind::temperature},
    {Quantity::time, "time", "time", time_aliases(ts::TimeRole::time), false, Kind::temperature},
    {Quantity::year, "year", "year", time_aliases(ts::TimeRole::year), false, Kind::temperature},
    {Quantity::month, "month", "month", time_aliases(ts::TimeRole::month), false,
     Kind::temperature},
    {Quantity::day, "day", "day", time_aliases(ts::TimeRole::day), false, Kind::temperature},
    {Quantity::hour, "hour", "hour", time_aliases(ts::TimeRole::hour), false, Kind::temperature},
    {Quantity::minute, "minute", "minute", time_aliases(ts::TimeRole::minute), false,
     Kind::temperature},
};
static_assert(std::size(kQuantities) == kQuantityCount);

const QuantityInfo& info(Quantity q) { return kQuantities[idx(q)]; }

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

// --- Small text helpers --------------------------------------------------------------------

std::string quoted_list(const std::vector<std::string>& items) {
  std::string out;
  for (const std::string& s : items) {
    if (!out.empty()) out += ", ";
    out += echo(s);
  }
  return out;
}

std::string_view kind_word(Kind kind) { return plausible(kind).word; }

[[noreturn]] void fail_at(std::string_view source, int line, const std::string& what) {
  throw InputError(fmt::format("{}:{}: {}", source, line, what));
}

std::string origin_or_mapping(const ColumnOverride& o) {
  return o.origin.empty() ? std::string("the weather mapping") : o.origin;
}

// What every stage of one read knows: the file's name and how the user asked it to be read.
struct Context {
  std::string_view source;
  const Mapping& mapping;
  double site_pressure_kpa;
};

// --- Stage 2: the header and the columns ---------------------------------------------------

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
  static_assert(kQuantityCount - static_cast<std::size_t>(Quantity::timestamp) ==
                ts::kTimeRoleCount);
  std::array<int, ts::kTimeRoleCount> time_roles() const {
    // The time quantities follow the value quantities, in TimeRole order.
    std::array<int, ts::kTimeRoleCount> roles;
    std::copy_n(column.begin() + idx(Quantity::timestamp), roles.size(), roles.begin());
    return roles;
  }
};

HeaderMatch match_header(const std::vector<HeaderField>& fields, const Mapping& mapping) {
  HeaderMatch m;
  std::vector<bool> claimed(fields.size(), false);
  for (const QuantityInfo& q : kQuantities) {
    const auto& name = mapping.column(q.quantity).column;
    if (!name) continue;
    for (std::size_t i = 0; i < fields.size(); ++i)
      if (text::iequals(fields[i].text, text::trim(*name))) {
        m.column[idx(q.quantity)] = static_cast<int>(i);
        m.by_override[idx(q.quantity)] = true;
        claimed[i] = true;
        break;
      }
  }
  for (const QuantityInfo& q : kQuantities) {
    if (mapping.column(q.quantity).column) continue;
    for (std::size_t i = 0; i < fields.size(); ++i) {
      if (claimed[i] || fields[i].name.empty() || !ts::in_list(q.aliases, fields[i].name)) continue;
      if (m.column[idx(q.quantity)] < 0)
        m.column[idx(q.quantity)] = static_cast<int>(i);
      else
        ++m.extra[idx(q.quantity)];
    }
  }
  return m;
}

struct Header {
  std::size_t index = 0;  // into the lines
  int line = 0;
  char delimiter = ',';
  std::vector<HeaderField> fields;
  HeaderMatch match;
  TimeColumns time;

  std::vector<std::string> texts() const {
    std::vector<std::string> t;
    for (const HeaderField& f : fields) t.push_back(f.text);
    return t;
  }
  const std::string& text(int column) const {
    return fields[static_cast<std::size_t>(column)].text;
  }
};

// The first line naming a dry-bulb column and the time columns is the header.
Header find_header(const Context& cx, const std::vector<ts::Line>& lines) {
  int best_line = 0, best_count = 0;
  std::string best_lacks;
  for (std::size_t i = 0; i < lines.size(); ++i) {
    const std::string_view line = lines[i].text;
    if (ts::blank(line)) continue;
    ts::HeaderLine h = ts::read_header_line(line);
    if (h.fields.size() < 2) continue;
    const HeaderMatch m = match_header(h.fields, cx.mapping);
    const TimeColumns t = ts::resolve_time(m.time_roles());
    const bool dry = m[Quantity::dry_bulb] >= 0;
    if (dry && t.ok()) return {i, lines[i].number, h.delimiter, std::move(h.fields), m, t};
    if (m.count() > best_count) {
      best_count = m.count();
      best_line = lines[i].number;
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
      cx.source, closest));
}

// The three values each row contributes.
enum Slot : std::size_t { kDry = 0, kHumidity = 1, kPressure = 2 };

std::size_t slot_of(Quantity q) {
  return q == Quantity::dry_bulb ? kDry : q == Quantity::pressure ? kPressure : kHumidity;
}

// The columns chosen for the series: where each slot's value is, and the description of
// every column used (for WeatherInfo).
struct Layout {
  std::array<int, 3> slot_column{-1, -1, -1};
  std::array<Quantity, 3> slot_quantity{Quantity::dry_bulb, Quantity::dew_point,
                                        Quantity::pressure};
  std::array<std::string, 3> slot_header;  // header text of each slot's column
  bool day_first = false;                  // the header says DD/MM
  std::vector<ColumnUse> columns;          // time columns first, then the value columns used
  std::vector<ColumnUse> unused_humidity;  // humidity columns present but not chosen
  HumiditySource humidity = HumiditySource::dew_point;
  bool humidity_overridden = false;
  bool pressure_from_file = false;
  std::string time_columns;  // "'Date' + 'Time'"
  Clock header_clock = Clock::local;

  Quantity humidity_quantity() const { return slot_quantity[kHumidity]; }
  bool has_pressure() const { return slot_column[kPressure] >= 0; }
};

ColumnUse use_of(const Context& cx, const Header& h, Quantity q) {
  ColumnUse u;
  u.quantity = q;
  u.index = h.match[q];
  u.header = h.text(u.index);
  u.found = h.match.by_override[idx(q)] ? ColumnFound::override : ColumnFound::header_name;
  u.other_matches = h.match.extra[idx(q)];
  if (u.found == ColumnFound::override) u.unit_origin = cx.mapping.column(q).origin;
  return u;
}

// Every override must name a column of this header, and only value columns take a unit.
void check_overrides(const Context& cx, const Header& h) {
  for (const QuantityInfo& q : kQuantities) {
    const ColumnOverride& o = cx.mapping.column(q.quantity);
    if (o.column && h.match[q.quantity] < 0)
      throw InputError(
          fmt::format("{}: column {} given for {} is not in the header of {} (line {}: {})",
                      origin_or_mapping(o), echo(*o.column), q.label, cx.source, h.line,
                      quoted_list(h.texts())));
    if (o.unit && !q.has_unit)
      throw InputError(
          fmt::format("{}: unit {} given for the {} column; allowed: no unit (a "
                      "time column has none)",
                      origin_or_mapping(o), echo(*o.unit), q.label));
  }
}

// Time columns, in the order they are read.
void choose_time_columns(const Context& cx, const Header& h, Layout& out) {
  const TimeColumns& t = h.time;
  const std::pair<int, Quantity> time_parts[] = {
      {t.stamp, h.match[Quantity::timestamp] == t.stamp ? Quantity::timestamp
                : h.match[Quantity::date] == t.stamp    ? Quantity::date
                                                        : Quantity::time},
      {t.date, Quantity::date},
      {t.year, Quantity::year},
      {t.month, Quantity::month},
      {t.day, Quantity::day},
      {t.clock, Quantity::time},
      {t.hour, Quantity::hour},
      {t.minute, Quantity::minute}};
  std::vector<std::string> names;
  for (const auto& [column, q] : time_parts) {
    if (column < 0) continue;
    ColumnUse u = use_of(cx, h, q);
    names.push_back(echo(u.header));
    const std::string& text = u.header;
    if (text::icontains(text, "utc") || text::icontains(text, "gmt")) out.header_clock = Clock::utc;
    if (text::icontains(text, "dd/mm")) out.day_first = true;
    out.columns.push_back(std::move(u));
  }
  for (std::size_t i = 0; i < names.size(); ++i) out.time_columns += (i ? " + " : "") + names[i];
}

// Humidity: the preferred source, else the first present in the default order.
void choose_humidity(const Context& cx, const Header& h, Layout& out) {
  constexpr std::pair<HumiditySource, Quantity> kHumidityOrder[] = {
      {HumiditySource::dew_point, Quantity::dew_point},
      {HumiditySource::humidity_ratio, Quantity::humidity_ratio},
      {HumiditySource::wet_bulb, Quantity::wet_bulb},
      {HumiditySource::relative_humidity, Quantity::relative_humidity}};
  const HeaderMatch& m = h.match;
  std::optional<std::pair<HumiditySource, Quantity>> chosen;
  if (cx.mapping.humidity) {
    for (const auto& o : kHumidityOrder)
      if (o.first == *cx.mapping.humidity) chosen = o;
    if (m[chosen->second] < 0)
      throw InputError(fmt::format(
          "{}:{}: humidity = \"{}\" was asked for, but the header has no {} column "
          "(columns: {}); name it in [weather], e.g. {} = {{ column = \"...\" }}",
          cx.source, h.line, humidity_source_name(chosen->first), info(chosen->second).label,
          quoted_list(h.texts()), info(chosen->second).key));
    out.humidity_overridden = true;
  } else {
    // A humidity column named in the mapping is the one meant; else the default order.
    for (const auto& o : kHumidityOrder)
      if (!chosen && m.by_override[idx(o.second)]) chosen = o;
    for (const auto& o : kHumidityOrder)
      if (!chosen && m[o.second] >= 0) chosen = o;
    if (!chosen)
      throw InputError(fmt::format(
          "{}:{}: no humidity column: the header names none of dew point, humidity ratio, "
          "wet-bulb, relative humidity (columns: {}); name one in [weather], e.g. "
          "dew_point = {{ column = \"...\" }}",
          cx.source, h.line, quoted_list(h.texts())));
  }
  out.humidity = chosen->first;
  out.slot_quantity[kHumidity] = chosen->second;
  out.slot_column[kHumidity] = m[chosen->second];
  out.slot_header[kHumidity] = h.text(m[chosen->second]);
  out.columns.push_back(use_of(cx, h, chosen->second));
  for (const auto& o : kHumidityOrder)
    if (o.second != chosen->second && m[o.second] >= 0)
      out.unused_humidity.push_back(use_of(cx, h, o.second));
}

Layout choose_columns(const Context& cx, const Header& h) {
  check_overrides(cx, h);
  Layout out;
  choose_time_columns(cx, h, out);
  out.slot_column[kDry] = h.match[Quantity::dry_bulb];
  out.slot_header[kDry] = h.text(out.slot_column[kDry]);
  out.columns.push_back(use_of(cx, h, Quantity::dry_bulb));
  choose_humidity(cx, h, out);
  if (h.match[Quantity::pressure] >= 0) {
    out.pressure_from_file = true;
    out.slot_column[kPressure] = h.match[Quantity::pressure];
    out.slot_header[kPressure] = h.text(out.slot_column[kPressure]);
    out.columns.push_back(use_of(cx, h, Quantity::pressure));
  } else {
    try {
      psychro::check_pressure(cx.site_pressure_kpa, "site pressure");
    } catch (const RangeError& e) {
      throw InputError(
          fmt::format("{}: the file has no pressure column and the {}", cx.source, e.what()));
    }
  }
  return out;
}

// --- Written steps: what each cell's digits say about its resolution (stage 4b) -----------

// The steps a column's values may have been written to, coarsest first: 1/kStepDivisor[k].
constexpr double kSteps[] = {1.0, 0.5, 0.1, 0.05, 0.01, 0.001};
constexpr int kStepDivisor[] = {1, 2, 10, 20, 100, 1000};
constexpr std::uint8_t kAllSteps = (1u << std::size(kSteps)) - 1;

// The steps `v` is a whole multiple of (bit k: kSteps[k]), within 1e-6 of a multiple.
std::uint8_t steps_by_division(double v) {
  std::uint8_t m = 0;
  for (std::size_t k = 0; k < std::size(kSteps); ++k) {
    const double q = v / kSteps[k];
    if (!(std::fabs(q - std::round(q)) > 1e-6)) m |= static_cast<std::uint8_t>(1u << k);
  }
  return m;
}

// steps_by_division() of M / 10^d for d ≤ 3 from the digits alone: M/10^d is a multiple of
// 1/c when M·c is one of 10^d, which only the last d digits r = M mod 10^d decide. The table
// holds the steps of each (d, r), at offset (10^d − 1)/9.
constexpr std::array<std::uint8_t, 1111> kStepsByDigits = [] {
  std::array<std::uint8_t, 1111> t{};
  int offset = 0;
  for (int pow = 1; pow <= 1000; offset += pow, pow *= 10)
    for (int r = 0; r < pow; ++r)
      for (std::size_t k = 0; k < std::size(kSteps); ++k)
        if (r * kStepDivisor[k] % pow == 0)
          t[static_cast<std::size_t>(offset + r)] |= static_cast<std::uint8_t>(1u << k);
  return t;
}();
constexpr std::uint8_t kStepsUnknown = 0x80;

// The steps of a cell from the digits it was written with. Both ways agree while d ≤ 3 and
// the quotient v/step stays below 1e9: a quotient that is whole in decimal is then within
// 4e-7 of a whole number in floating point (three roundings of 2^-53 each), and one that is
// not is at least 10^-d = 1e-3 from one. Anything else is left to the division.
std::uint8_t steps_of(const ts::Decimal& digits) {
  constexpr std::uint64_t kMaxMantissa[] = {1'000'000, 10'000'000, 100'000'000, 1'000'000'000};
  const int d = digits.decimals;
  if (d < 0 || d > 3 || digits.mantissa > kMaxMantissa[d]) return kStepsUnknown;
  const std::uint64_t m = digits.mantissa;
  switch (d) {
    case 0: return kStepsByDigits[0];
    case 1: return kStepsByDigits[1 + m % 10];
    case 2: return kStepsByDigits[11 + m % 100];
    default: return kStepsByDigits[111 + m % 1000];
  }
}

// --- Stage 3a: the rows and their stamps ---------------------------------------------------

// Where a row sits in time once the stamp convention is applied.
struct Interval {
  int month = 0, day = 0, hour = 0, minute = 0;  // of the interval's start
  double position = 0.0;                         // time steps from the first row, gaps included
};

struct Row {
  int line;
  Stamp stamp;  // as written
  std::array<double, 3> raw{};
  std::array<Cell, 3> cell{};
  std::array<std::uint8_t, 3> steps{};  // steps_of() the digits of each cell
  std::array<std::string_view, 3> text{};
  Interval at{};  // set by the time axis
};

struct Table {
  std::vector<Row> rows;
  std::size_t end = 0;  // index of the first line after the table
  int first_data_line = 0, last_data_line = 0;
  bool decimal_comma = false;
  std::string format;  // of the first row's stamp
  Zone zone;           // of the first row's stamp
};

Table read_rows(const Context& cx, const std::vector<ts::Line>& lines, const Header& h,
                const Layout& layout) {
  Table out;
  const std::size_t width = h.fields.size();
  std::vector<std::string_view> f;
  f.reserve(width + 4);
  out.rows.reserve(lines.size() - h.index);
  StampReader stamps(h.time, layout.day_first);
  const bool comma_decimal = h.delimiter != ',';
  std::size_t i = h.index + 1;
  for (; i < lines.size(); ++i) {
    const ts::Line& l = lines[i];
    if (ts::blank(l.text)) {
      if (out.rows.empty()) continue;
      break;
    }
    ts::split_fields(l.text, h.delimiter, f);
    if (f.size() == 1 && width > 1) break;  // a legend or note line ends the table
    std::size_t used = f.size();
    while (used > width && f[used - 1].empty()) --used;
    if (used != width)
      fail_at(cx.source, l.number,
              fmt::format("the row has {} fields but the header (line {}) has {}; "
                          "allowed: one value per header column",
                          used, h.line, width));
    Row r;
    r.line = l.number;
    Zone zone;
    StampForm form{};
    const ts::StampFault fault = stamps.read(f, r.stamp, zone, form);
    if (fault.column >= 0)
      fail_at(cx.source, l.number,
              fmt::format("column {} value {} is not readable as a time; allowed: {}",
                          echo(h.text(fault.column)),
                          echo(f[static_cast<std::size_t>(fault.column)]), fault.allowed));
    if (out.rows.empty()) {
      out.format = stamps.format_text(form, zone);
      out.zone = zone;
      out.first_data_line = l.number;
    }
    for (std::size_t s = 0; s < 3; ++s) {
      if (layout.slot_column[s] < 0) continue;
      const std::string_view cell = f[static_cast<std::size_t>(layout.slot_column[s])];
      r.text[s] = cell;
      ts::Decimal digits;
      r.cell[s] = ts::read_cell(cell, comma_decimal, r.raw[s], out.decimal_comma, digits);
      r.steps[s] = steps_of(digits);
    }
    out.last_data_line = l.number;
    out.rows.push_back(r);
  }
  out.end = i;
  if (out.rows.empty()) fail_at(cx.source, h.line, "the header is followed by no data rows");
  return out;
}

// Nothing after the end of the table may look like data: it would be lost silently.
void check_after_table(const Context& cx, const std::vector<ts::Line>& lines, const Header& h,
                       const Layout& layout, const Table& table) {
  std::vector<std::string_view> f;
  StampReader stamps(h.time, layout.day_first);
  for (std::size_t i = table.end; i < lines.size(); ++i) {
    if (ts::blank(lines[i].text)) continue;
    ts::split_fields(lines[i].text, h.delimiter, f);
    if (f.size() < h.fields.size()) continue;
    Stamp st;
    Zone z;
    StampForm form{};
    if (stamps.read(f, st, z, form).column < 0)
      fail_at(cx.source, lines[i].number,
              fmt::format("this line looks like a data row, but the table ended at line {}; "
                          "allowed: data rows together, with no blank or note line between "
                          "them",
                          lines[table.end].number));
  }
}

// --- Stage 3b: the time axis ---------------------------------------------------------------

struct TimeAxis {
  TimeInfo info;
  std::vector<Row> rows;  // each placed in time
};

// Minutes from the start of the stamp's month: rows within a month compare by it.
int month_minute(const Stamp& s) { return (s.day - 1) * 1440 + s.minute; }

struct MonthBlock {
  int year, month, first_line, last_line;
};

// Pass 1: the rows of each month together and in order; the time step is the smallest
// difference between consecutive rows of a month.
int find_step(const Context& cx, const std::vector<Row>& rows, std::vector<MonthBlock>& blocks) {
  int step = 0;
  for (std::size_t i = 0; i < rows.size(); ++i) {
    const Row& r = rows[i];
    if (i == 0 || r.stamp.year != rows[i - 1].stamp.year ||
        r.stamp.month != rows[i - 1].stamp.month) {
      for (const MonthBlock& b : blocks)
        if (b.year == r.stamp.year && b.month == r.stamp.month)
          fail_at(cx.source, r.line,
                  fmt::format("{}{} starts again here; it already ran from line {} "
                              "to line {}; allowed: the rows of one month together",
                              kMonthNames[r.stamp.month - 1],
                              r.stamp.year > 0 ? fmt::format(" {}", r.stamp.year) : "",
                              b.first_line, b.last_line));
      blocks.push_back({r.stamp.year, r.stamp.month, r.line, r.line});
      continue;
    }
    blocks.back().last_line = r.line;
    const Row& p = rows[i - 1];
    const int diff = month_minute(r.stamp) - month_minute(p.stamp);
    if (diff <= 0)
      fail_at(cx.source, r.line,
              fmt::format("time {} {} the row at line {}{}; allowed: rows within a month in "
                          "time order, each time once",
                          ts::stamp_text(r.stamp), diff == 0 ? "repeats" : "comes before", p.line,
                          diff == 0 ? std::string() : " (" + ts::stamp_text(p.stamp) + ")"));
    if (step == 0 || diff < step) step = diff;
  }
  if (step == 0) step = 60;
  if (60 % step != 0)
    throw InputError(
        fmt::format("{}: time step {} min; allowed: 60 min or a whole fraction "
                    "of an hour (1, 2, 3, 4, 5, 6, 10, 12, 15, 20 or 30 min)",
                    cx.source, step));
  return step;
}

// Whether the stamps mark interval ends: 24:00 present, or the mapping says so.
void apply_convention(const Context& cx, const std::vector<Row>& rows, TimeInfo& ti) {
  bool has_24 = false;
  int first_24 = 0, first_00 = 0;
  for (const Row& r : rows) {
    if (r.stamp.minute == 1440 && !has_24) has_24 = true, first_24 = r.line;
    if (r.stamp.minute == 0 && first_00 == 0) first_00 = r.line;
  }
  switch (cx.mapping.time_convention) {
    case TimeConvention::automatic:
      ti.hour_ending = has_24;
      if (has_24 && first_00 > 0)
        fail_at(cx.source, first_00,
                fmt::format("time 00:00 in a file that also marks midnight as "
                            "24:00 (line {}); allowed: one of the two",
                            first_24));
      break;
    case TimeConvention::hour_beginning:
      if (has_24)
        fail_at(cx.source, first_24,
                "time 24:00 cannot start an interval (time_convention = "
                "\"hour-beginning\"); allowed: 00:00 to 23:59");
      ti.convention_overridden = true;
      break;
    case TimeConvention::hour_ending:
      ti.hour_ending = true;
      ti.convention_overridden = true;
      break;
  }
}

// Pass 2: gaps, positions in time, and each row's interval start.
void place_rows(const Context& cx, std::vector<Row>& rows, TimeInfo& ti) {
  const int step = ti.step_min;
  double position = 0.0;
  for (std::size_t i = 0; i < rows.size(); ++i) {
    Row& r = rows[i];
    if (i > 0) {
      const Row& p = rows[i - 1];
      if (r.stamp.year == p.stamp.year && r.stamp.month == p.stamp.month) {
        const int diff = month_minute(r.stamp) - month_minute(p.stamp);
        if (diff % step != 0)
          fail_at(cx.source, r.line,
                  fmt::format("time {} is {} min after the row at line {}; allowed: "
                              "whole multiples of the {}-min time step",
                              ts::stamp_text(r.stamp), diff, p.line, step));
        ti.missing_steps += diff / step - 1;
        position += diff / step;
      } else {
        position += 1.0;
      }
    }
    Interval& iv = r.at;
    iv.position = position;
    // The interval's start: hour-ending stamps move back one step, maybe to the day before.
    const Stamp s = ti.hour_ending ? ts::minutes_earlier(r.stamp, step) : r.stamp;
    iv.month = s.month;
    iv.day = s.day;
    iv.hour = s.minute / 60;
    iv.minute = s.minute % 60;
    if (iv.month == 2 && iv.day == 29) ++ti.leap_day_rows;
  }
}

// A file holding the same hour of the calendar from two years is several years of weather;
// summed as one it would multiply every annual figure. A typical year (each month from a
// different year) holds each hour once and passes.
void check_one_year(const Context& cx, const std::vector<Row>& rows, int step) {
  // Without a month whose rows come from two years no hour can repeat: the common case
  // (a calendar year, a typical year) needs no table.
  std::array<int, 13> year_of{};
  year_of.fill(-1);
  bool repeated = false;
  for (const Row& r : rows) {
    int& y = year_of[static_cast<std::size_t>(r.stamp.month)];
    if (y < 0) y = r.stamp.year;
    repeated = repeated || y != r.stamp.year;
  }
  if (!repeated) return;
  const auto slot = [&](const Interval& r) {
    return static_cast<std::size_t>(
        (((r.month - 1) * 31 + (r.day - 1)) * 1440 + r.hour * 60 + r.minute) / step);
  };
  std::vector<int> seen(static_cast<std::size_t>(12 * 31 * 1440 / step) + 1, -1);
  for (std::size_t i = 0; i < rows.size(); ++i) {
    int& first = seen[slot(rows[i].at)];
    if (first < 0) {
      first = static_cast<int>(i);
      continue;
    }
    const Row& a = rows[static_cast<std::size_t>(first)];
    const Row& b = rows[i];
    const Interval& bi = b.at;
    const auto date_key = [](const Stamp& st) { return (st.year * 12 + st.month) * 31 + st.day; };
    const Row* lo = &rows.front();
    const Row* hi = lo;
    for (const Row& r : rows) {
      if (date_key(r.stamp) < date_key(lo->stamp)) lo = &r;
      if (date_key(r.stamp) > date_key(hi->stamp)) hi = &r;
    }
    const auto days_of = [](const Stamp& st) {
      return ts::days_from_civil(st.year, st.month, st.day);
    };
    const long days = static_cast<long>(days_of(hi->stamp) - days_of(lo->stamp) + 1);
    const double years = days / 365.2425;
    const std::string span = std::fabs(years - std::round(years)) < 0.05 && std::round(years) >= 2
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
        cx.source, date_text(lo->stamp), date_text(hi->stamp), span, a.line, b.line, bi.month,
        bi.day, bi.hour, bi.minute, a.stamp.year, b.stamp.year));
  }
}

// Typical years: each month from a different year, so time jumps at month boundaries.
void note_typical_year(const std::vector<MonthBlock>& blocks, TimeInfo& ti) {
  for (std::size_t b = 0; b < blocks.size(); ++b) {
    if (blocks[b].year > 0)
      ti.month_year[static_cast<std::size_t>(blocks[b].month - 1)] = blocks[b].year;
    if (b == 0 || blocks[b].year == 0) continue;
    const MonthBlock& p = blocks[b - 1];
    const MonthBlock& c = blocks[b];
    const bool calendar_step = (c.year == p.year && c.month == p.month + 1) ||
                               (c.year == p.year + 1 && p.month == 12 && c.month == 1);
    if (!calendar_step) ti.typical_year = true;
    if (c.year * 12 + c.month < p.year * 12 + p.month) ti.months_out_of_order = true;
  }
}

TimeAxis analyse_time(const Context& cx, std::vector<Row> rows, TimeInfo ti) {
  std::vector<MonthBlock> blocks;
  ti.step_min = find_step(cx, rows, blocks);
  ti.weight_h = ti.step_min / 60.0;
  apply_convention(cx, rows, ti);
  place_rows(cx, rows, ti);
  check_one_year(cx, rows, ti.step_min);
  note_typical_year(blocks, ti);
  return {std::move(ti), std::move(rows)};
}

// --- Stage 4: units ------------------------------------------------------------------------

struct Legend {
  std::string_view name, unit;
  int line;
};

// "SP: Surface (air) pressure (Pa)": legend lines outside the table name a column and give
// its unit in the last brackets.
std::vector<Legend> legends(const std::vector<ts::Line>& lines, std::size_t header_index,
                            std::size_t table_end) {
  std::vector<Legend> out;
  const auto scan = [&](std::size_t from, std::size_t to) {
    for (std::size_t i = from; i < to && i < lines.size(); ++i) {
      const std::string_view l = lines[i].text;
      const std::size_t colon = l.find(':');
      const std::size_t open = l.rfind('('), close = l.rfind(')');
      if (colon == std::string_view::npos || open == std::string_view::npos ||
          close == std::string_view::npos || close < open || open < colon)
        continue;
      out.push_back({text::trim(l.substr(0, colon)),
                     text::trim(l.substr(open + 1, close - open - 1)), lines[i].number});
    }
  };
  scan(0, header_index);
  scan(table_end, lines.size());
  return out;
}

[[noreturn]] void unknown_unit(const Context& cx, const ColumnUse& u, std::string_view unit,
                               std::string_view from) {
  const Kind kind = info(u.quantity).kind;
  throw InputError(
      fmt::format("{}: column {} has unit {} ({}), which is not a {} unit (allowed: {}); set it in "
                  "[weather], e.g. {} = {{ unit = \"{}\" }}",
                  cx.source, echo(u.header), echo(unit), from, kind_word(kind),
                  ts::allowed_units(kind), info(u.quantity).key, ts::first_unit(kind)));
}

// The unit of a column without one in its header or the mapping: the only candidate that
// makes every value plausible.
Conversion infer_unit(const Context& cx, int header_line, const std::vector<Row>& rows,
                      std::size_t slot, ColumnUse& u) {
  const Kind kind = info(u.quantity).kind;
  const Plausible& pl = plausible(kind);
  double lo = HUGE_VAL, hi = -HUGE_VAL;
  for (const Row& r : rows)
    if (r.cell[slot] == Cell::ok) lo = std::min(lo, r.raw[slot]), hi = std::max(hi, r.raw[slot]);
  std::vector<const UnitSpelling*> fits;
  if (lo <= hi) {
    for (const UnitSpelling& h : ts::unit_spellings()) {
      if (h.kind != kind || !h.candidate) continue;
      const Conversion c = ts::conversion(h);
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
    return ts::conversion(*fits[0]);
  }
  std::string which;
  for (const UnitSpelling* h : fits) which += (which.empty() ? "" : ", ") + std::string(h->help);
  const std::string found =
      lo > hi        ? std::string("no readable values to infer one from")
      : fits.empty() ? fmt::format("its values ({:g} to {:g}) fit no {} unit ({})", lo, hi,
                                   kind_word(kind), pl.why)
                     : fmt::format("its values ({:g} to {:g}) fit {} alike", lo, hi, which);
  throw InputError(fmt::format(
      "{}:{}: column {} has no unit in the header and {}; allowed: a unit in the header or "
      "in [weather], e.g. {} = {{ unit = \"{}\" }} (units: {})",
      cx.source, header_line, echo(u.header), found, info(u.quantity).key,
      fits.empty() ? ts::first_unit(kind) : fits[0]->help, ts::allowed_units(kind)));
}

// The unit of each value column: the mapping's, else the header's, else a legend line's,
// else (a dew point or wet-bulb) the dry-bulb's, else inferred from the values. Sets each
// column's unit description; returns the conversions by slot.
std::array<Conversion, 3> resolve_units(const Context& cx, const std::vector<ts::Line>& lines,
                                        const Header& h, const std::vector<Row>& rows,
                                        std::size_t table_end, std::vector<ColumnUse>& columns) {
  std::array<Conversion, 3> conv{};
  std::vector<Legend> legend;
  bool legend_read = false;
  std::optional<Conversion> dry_conversion;
  for (ColumnUse& u : columns) {
    if (!info(u.quantity).has_unit) continue;
    const Kind kind = info(u.quantity).kind;
    const std::size_t slot = slot_of(u.quantity);
    const HeaderField& field = h.fields[static_cast<std::size_t>(u.index)];
    const ColumnOverride& o = cx.mapping.column(u.quantity);
    Conversion c;
    if (o.unit) {
      const UnitSpelling* hu = ts::find_unit(kind, *o.unit);
      if (!hu)
        throw InputError(fmt::format("{}: unit {} given for {} is not a {} unit (allowed: {})",
                                     origin_or_mapping(o), echo(*o.unit), info(u.quantity).label,
                                     kind_word(kind), ts::allowed_units(kind)));
      c = ts::conversion(*hu);
      u.unit_found = UnitFound::override;
      u.unit_origin = o.origin;
    } else if (!field.unit_text.empty()) {
      const UnitSpelling* hu = ts::find_unit(kind, field.unit_text);
      if (!hu) unknown_unit(cx, u, field.unit_text, fmt::format("header line {}", h.line));
      c = ts::conversion(*hu);
      u.unit_found = UnitFound::header;
    } else {
      if (!legend_read) legend = legends(lines, h.index, table_end), legend_read = true;
      const Legend* found = nullptr;
      for (const Legend& l : legend)
        if (text::iequals(l.name, field.text)) found = &l;
      if (found) {
        const UnitSpelling* hu = ts::find_unit(kind, found->unit);
        if (!hu) unknown_unit(cx, u, found->unit, fmt::format("legend line {}", found->line));
        c = ts::conversion(*hu);
        u.unit_found = UnitFound::legend;
        u.unit_origin = fmt::format("line {}", found->line);
      } else if (kind == Kind::temperature && u.quantity != Quantity::dry_bulb && dry_conversion) {
        c = *dry_conversion;
        u.unit_found = UnitFound::same_as_dry_bulb;
      } else {
        c = infer_unit(cx, h.line, rows, slot, u);
      }
    }
    u.unit = std::string(c.label);
    conv[slot] = c;
    if (u.quantity == Quantity::dry_bulb) dry_conversion = c;
  }
  return conv;
}

// --- Stage 4b: resolution, the step the values were written to ------------------------------

// The step of a column's values in its own unit: the coarsest of 1, 0.5, 0.1, ... of which
// every value is a whole multiple. Under a day of values says nothing (a few whole numbers
// are whole by chance), so it is 0 then, as for values finer than a thousandth.
double resolution_of(const std::vector<Row>& rows, std::size_t slot) {
  unsigned alive = kAllSteps;
  int n = 0;
  for (const Row& r : rows) {
    if (r.cell[slot] != Cell::ok) continue;
    ++n;
    const std::uint8_t steps = r.steps[slot];
    alive &= steps == kStepsUnknown ? steps_by_division(r.raw[slot]) : steps;
    if (alive == 0) return 0.0;
  }
  if (n < kMinStatisticRows) return 0.0;
  for (std::size_t k = 0; k < std::size(kSteps); ++k)
    if (alive >> k & 1u) return kSteps[k];
  return 0.0;
}

std::string_view step_word(double step) {
  constexpr std::pair<double, std::string_view> kWords[] = {
      {1.0, "whole"},      {0.5, "half"},       {0.1, "tenth"},
      {0.05, "twentieth"}, {0.01, "hundredth"}, {0.001, "thousandth"}};
  for (const auto& [s, w] : kWords)
    if (s == step) return w;
  return "fine";
}

// Written values are within half their step of the reading: a dew point above the dry-bulb
// by up to half the step of each column (plus the fixed tolerance) is saturated air. Sets
// each value column's resolution and the tolerances of `inf`.
void find_resolution(const std::vector<Row>& rows, const Layout& layout,
                     const std::array<Conversion, 3>& conv, WeatherInfo& inf) {
  double step_si[3] = {0.0, 0.0, 0.0};
  double coarsest = 0.0;
  for (ColumnUse& u : inf.columns) {
    if (!info(u.quantity).has_unit) continue;
    const std::size_t slot = slot_of(u.quantity);
    if (layout.slot_column[slot] != u.index) continue;
    u.resolution = resolution_of(rows, slot);
    step_si[slot] = u.resolution * conv[slot].scale;
  }
  inf.temperature_tolerance_k = kTemperatureToleranceK;
  inf.relative_humidity_tolerance = kRelativeHumidityTolerance;
  const Kind hk = info(layout.humidity_quantity()).kind;
  const ColumnUse* dry = inf.find(Quantity::dry_bulb);
  const ColumnUse* hum = inf.find(layout.humidity_quantity());
  if (hk == Kind::temperature) {
    inf.temperature_tolerance_k += 0.5 * (step_si[kDry] + step_si[kHumidity]);
    coarsest = std::max(dry->resolution, hum->resolution);
  } else if (hk == Kind::fraction) {
    inf.relative_humidity_tolerance += 0.5 * step_si[kHumidity];
    coarsest = hum->resolution;
  }
  if (coarsest > 0.0 && hk != Kind::humidity_ratio)
    inf.rounding_words =
        fmt::format("{}-{}", step_word(coarsest), hk == Kind::temperature ? "degree" : "percent");
}

// --- Stage 4c: labels judged by the columns' statistics ------------------------------------

// What the label check reads: the rows, the columns as chosen and the units as read.
struct LabelInputs {
  const std::vector<Row>& rows;
  const Layout& layout;
  const std::array<Conversion, 3>& conv;
  const WeatherInfo& info;
};

// The band of a quantity's median, if it has one (each has at most one).
const MedianBand* median_band(Quantity q) {
  for (const MedianBand& b : kMedianBands)
    if (b.quantity == q) return &b;
  return nullptr;
}
constexpr bool one_band_each() {
  for (std::size_t i = 0; i < std::size(kMedianBands); ++i)
    for (std::size_t j = i + 1; j < std::size(kMedianBands); ++j)
      if (kMedianBands[i].quantity == kMedianBands[j].quantity) return false;
  return true;
}
static_assert(one_band_each());

struct Stats {
  int n = 0, impossible = 0;
  double max = 0.0;
  // Values below and above the quantity's median band. The upper median (index n/2 of the
  // sorted values) is at least lo when at most n/2 values are below lo, and at most hi when
  // at most n − 1 − n/2 are above hi: the band test needs no sort, only a message the median.
  int below_band = 0, above_band = 0;
  [[nodiscard]] bool median_in_band() const {
    return below_band <= n / 2 && above_band <= n - 1 - n / 2;
  }
};

// The readable values of `slot` converted with `c` (the dry-bulb with `dry`): how many are
// impossible for the quantity, how many lie outside its median band, and their largest.
Stats stats_of(const LabelInputs& in, std::size_t slot, const Conversion& c,
               const Conversion& dry) {
  const Quantity q = in.layout.slot_quantity[slot];
  const Kind kind = info(q).kind;
  const Plausible& pl = plausible(kind);
  const MedianBand* band = median_band(q);
  const double band_lo = band ? band->lo : -HUGE_VAL, band_hi = band ? band->hi : HUGE_VAL;
  Stats st;
  for (const Row& r : in.rows) {
    if (r.cell[slot] != Cell::ok) continue;
    const double x = r.raw[slot] * c.scale + c.offset;
    bool bad = !(x >= pl.lo && x <= pl.hi);
    if (slot == kHumidity && kind == Kind::temperature && r.cell[kDry] == Cell::ok)
      bad = bad || x > r.raw[kDry] * dry.scale + dry.offset + in.info.temperature_tolerance_k;
    if (slot == kHumidity && kind == Kind::fraction)
      bad = bad || x <= 0.0 || x > 1.0 + in.info.relative_humidity_tolerance;
    st.impossible += bad;
    st.below_band += x < band_lo;
    st.above_band += x > band_hi;
    if (st.n++ == 0 || x > st.max) st.max = x;
  }
  return st;
}

// The upper median of the readable values of `slot` converted with `c`, for a message.
double median_of(const LabelInputs& in, std::size_t slot, const Conversion& c) {
  std::vector<double> v;
  v.reserve(in.rows.size());
  for (const Row& r : in.rows)
    if (r.cell[slot] == Cell::ok) v.push_back(r.raw[slot] * c.scale + c.offset);
  return ts::median(v);
}

std::string si_text(Kind kind, double v) {
  switch (kind) {
    case Kind::temperature: return fmt::format("{:.1f} °C", v);
    case Kind::pressure: return fmt::format("{:.4g} kPa", v);
    case Kind::fraction: return fmt::format("{:.3g} %", v * 100.0);
    default: return fmt::format("{:.3g} kg/kg", v);
  }
}

bool whole_year(const std::vector<Row>& rows) {
  std::array<bool, 12> seen{};
  for (const Row& r : rows) seen[static_cast<std::size_t>(r.at.month - 1)] = true;
  return std::all_of(seen.begin(), seen.end(), [](bool b) { return b; });
}

// Why the values of `slot`, read with a unit, cannot be the quantity in that unit; empty when
// they can. `statistical` says whether the reason is the column as a whole (its median or
// its year's highest value) rather than a share of impossible rows.
std::string implausible(const LabelInputs& in, std::size_t slot, const Conversion& c,
                        const Stats& st, bool& statistical) {
  statistical = false;
  if (st.n < kMinStatisticRows) return "";
  const Quantity q = in.layout.slot_quantity[slot];
  const Kind kind = info(q).kind;
  std::vector<std::string> why;
  if (st.impossible > kLabelImpossibleShare * st.n)
    why.push_back(fmt::format("{} of {} rows ({:.1f} %) are impossible for a {}", st.impossible,
                              st.n, 100.0 * st.impossible / st.n, info(q).label));
  if (const MedianBand* b = median_band(q); b && !st.median_in_band()) {
    why.push_back(fmt::format("its median is {}, where {} lies between {} and {}",
                              si_text(kind, median_of(in, slot, c)), b->what, si_text(kind, b->lo),
                              si_text(kind, b->hi)));
    statistical = true;
  }
  const Plausible& pl = plausible(kind);
  // A dew point can stay low all year on a cold dry plateau; the dry-bulb and the RH
  // cannot stay below their floors through a whole year anywhere an economizer runs.
  if ((q == Quantity::dry_bulb || q == Quantity::relative_humidity) && whole_year(in.rows) &&
      st.max < pl.max_lo) {
    why.push_back(
        fmt::format("its highest value of a whole year is {}, below the {} every "
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
  const UnitSpelling* unit;  // nullptr: the unit as read
  Conversion conv;
};

// The units the column could be in: the one read first, then every other of its kind.
std::vector<Choice> choices(const LabelInputs& in, std::size_t slot) {
  std::vector<Choice> out{{slot, nullptr, in.conv[slot]}};
  const Kind kind = info(in.layout.slot_quantity[slot]).kind;
  for (const UnitSpelling& h : ts::unit_spellings()) {
    if (h.kind != kind) continue;
    const Conversion c = ts::conversion(h);
    if (c.scale == in.conv[slot].scale && c.offset == in.conv[slot].offset) continue;
    out.push_back({slot, &h, c});
  }
  return out;
}

std::string unit_source(const ColumnUse& u) {
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

// Every combination of units of a group's columns, the ones as read first.
std::vector<std::vector<Choice>> combinations(const LabelInputs& in,
                                              const std::vector<std::size_t>& group) {
  std::vector<std::vector<Choice>> combos{{}};
  for (std::size_t slot : group) {
    std::vector<std::vector<Choice>> next;
    for (const auto& partial : combos)
      for (const Choice& c : choices(in, slot)) {
        next.push_back(partial);
        next.back().push_back(c);
      }
    combos = std::move(next);
  }
  return combos;
}

// The verdict on one combination of units: why each column is implausible in it (empty:
// plausible), whether any reason is statistical, and the impossible rows it leaves.
struct Judgement {
  std::vector<std::string> why;
  bool statistical = false;
  int impossible = 0;
  bool plausible() const {
    return std::all_of(why.begin(), why.end(), [](const std::string& w) { return w.empty(); });
  }
};

const Conversion& dry_of(const LabelInputs& in, const std::vector<Choice>& combo) {
  return combo[0].slot == kDry ? combo[0].conv : in.conv[kDry];
}

Judgement judge(const LabelInputs& in, const std::vector<Choice>& combo) {
  Judgement j;
  const Conversion& dry = dry_of(in, combo);
  for (const Choice& c : combo) {
    const Stats st = stats_of(in, c.slot, c.conv, dry);
    bool s = false;
    j.why.push_back(implausible(in, c.slot, c.conv, st, s));
    j.statistical = j.statistical || s;
    j.impossible += st.impossible;
  }
  return j;
}

// What the label check found, and the fixes it proposes.
struct LabelFindings {
  std::vector<std::string> found, mapping_fix, cli_fix;
};

// Judges one group of columns: when the units as read are implausible, the plausible
// combination that changes fewest units (then leaves fewest impossible rows) is the fix.
void check_group(const LabelInputs& in, const std::vector<std::size_t>& group, LabelFindings& out) {
  const std::vector<std::vector<Choice>> combos = combinations(in, group);
  const Judgement as_read = judge(in, combos[0]);
  if (as_read.plausible()) return;
  const std::vector<Choice>* best = nullptr;
  int best_changes = 0, best_impossible = 0;
  for (std::size_t k = 1; k < combos.size(); ++k) {
    const Judgement j = judge(in, combos[k]);
    if (!j.plausible()) continue;
    const int changes = static_cast<int>(std::count_if(
        combos[k].begin(), combos[k].end(), [](const Choice& c) { return c.unit != nullptr; }));
    if (!best || changes < best_changes ||
        (changes == best_changes && j.impossible < best_impossible))
      best = &combos[k], best_changes = changes, best_impossible = j.impossible;
  }
  if (!best && !as_read.statistical) return;  // a share of bad rows, but no unit explains it
  for (std::size_t i = 0; i < group.size(); ++i) {
    const std::size_t slot = group[i];
    const Quantity q = in.layout.slot_quantity[slot];
    const ColumnUse* u = in.info.find(q);
    const bool changed = best && (*best)[i].unit != nullptr;
    if (as_read.why[i].empty() && !changed) continue;
    std::string text = fmt::format(
        "column {} contradicts its unit {} ({}): {}", echo(u->header), u->unit, unit_source(*u),
        as_read.why[i].empty() ? "read with the other column's unit" : as_read.why[i]);
    if (changed) {
      const UnitSpelling& h = *(*best)[i].unit;
      text += fmt::format("; read in {} its values are plausible (median {})", h.label,
                          si_text(info(q).kind, median_of(in, slot, (*best)[i].conv)));
      const std::string_view key = info(q).key;
      out.mapping_fix.push_back(fmt::format("{} = {{ unit = \"{}\" }}", key, h.help));
      out.cli_fix.push_back("--column " + echo(fmt::format("{}={}:{}", key, u->header, h.help)));
    } else if (!best) {
      text += fmt::format(
          "; no unit reads it plausibly: check that it is the {} (name the "
          "right column in [weather], e.g. {} = {{ column = \"...\" }})",
          info(q).label, info(q).key);
    }
    out.found.push_back(std::move(text));
  }
}

// A column whose values contradict its unit is refused with the evidence and the fix: the
// remedy for a column in the wrong unit is its unit, never dropping the rows it makes bad.
void check_labels(const Context& cx, const LabelInputs& in) {
  // The dry-bulb and the humidity are judged together (a dew point against the dry-bulb,
  // and a file in °F usually has both in °F); the pressure on its own.
  std::vector<std::vector<std::size_t>> groups{{kDry, kHumidity}};
  if (in.layout.has_pressure()) groups.push_back({kPressure});
  LabelFindings f;
  for (const auto& group : groups) check_group(in, group, f);
  if (f.found.empty()) return;
  std::string msg = std::string(cx.source) + ": ";
  for (std::size_t i = 0; i < f.found.size(); ++i) msg += (i ? "; " : "") + f.found[i];
  if (!f.mapping_fix.empty()) {
    msg += "; fix: ";
    for (std::size_t i = 0; i < f.mapping_fix.size(); ++i)
      msg += (i ? " and " : "") + f.mapping_fix[i];
    msg += " in the unit file's [weather] table, or ";
    for (std::size_t i = 0; i < f.cli_fix.size(); ++i) msg += (i ? " " : "") + f.cli_fix[i];
  }
  throw InputError(msg);
}

// --- Stage 5: rows to states, and the series -----------------------------------------------

struct State {
  double t, w, p;
};

enum class Saturation { none, tolerance, rounding };

// Turns one row into a moist-air state with the units, tolerances and humidity source found
// by the stages before.
class Resolver {
 public:
  Resolver(const Context& cx, const Layout& layout, const std::array<Conversion, 3>& conv,
           const WeatherInfo& inf)
      : conv_(conv),
        quantity_(layout.slot_quantity),
        file_pressure_(layout.has_pressure()),
        site_pressure_(cx.site_pressure_kpa),
        inf_(inf) {}

  // Resolves a row to a state; on a bad row returns the slot at fault and the reason.
  bool resolve(const Row& r, State& s, Saturation& sat, std::size_t& bad_slot,
               std::string& why) const;

 private:
  bool value(const Row& r, std::size_t slot, double& v, std::string& why) const;
  bool humidity(double h, State& s, Saturation& sat, std::string& why) const;
  std::string saturation_words(double tolerance, double fixed, std::string_view unit,
                               double shown_scale) const;

  std::array<Conversion, 3> conv_;
  std::array<Quantity, 3> quantity_;
  bool file_pressure_;
  double site_pressure_;
  const WeatherInfo& inf_;
  // Saturation pressures by temperature: a year written to a tenth of a degree holds a few
  // hundred distinct values.
  mutable Memo<double, 10> saturation_;
  double saturation_kpa(double t_c) const {
    return saturation_.get(t_c, [&] { return psychro::saturation_pressure_kpa(t_c); });
  }
  // The vapour pressure of saturated air at -100 °C, the driest state the model reaches.
  double min_vapor_pressure_kpa_ = psychro::saturation_pressure_kpa(-100.0);
};

// The value of a slot in SI, or the reason it is not usable.
bool Resolver::value(const Row& r, std::size_t slot, double& v, std::string& why) const {
  const Conversion& c = conv_[slot];
  switch (r.cell[slot]) {
    case Cell::ok: v = r.raw[slot] * c.scale + c.offset; return true;
    case Cell::sentinel: {
      // 99999 Pa is a real pressure: a marker value that is plausible is a value.
      v = r.raw[slot] * c.scale + c.offset;
      const Plausible& pl = plausible(info(quantity_[slot]).kind);
      if (v >= pl.lo && v <= pl.hi) return true;
      why = "is a missing-value marker; allowed: a measured value";
      return false;
    }
    case Cell::empty: why = "is empty (missing); allowed: a measured value"; return false;
    case Cell::marker: why = "is a missing-value marker; allowed: a measured value"; return false;
    case Cell::not_number:
      why = fmt::format("is not a number; allowed: a number in {}", c.label);
      return false;
  }
  return false;
}

// "(up to 0.56 K above is read as saturation)", with the rounding when it widens it.
std::string Resolver::saturation_words(double tolerance, double fixed, std::string_view unit,
                                       double shown_scale) const {
  const std::string& words = inf_.rounding_words;
  if (tolerance <= fixed + 1e-12 || words.empty())
    return fmt::format("up to {:.{}f} {} above is read as saturation", tolerance * shown_scale,
                       unit == "K" ? 2 : 0, unit);
  return fmt::format(
      "up to {:.2f} {} above is read as saturation: {:.2f} {} plus the {} "
      "rounding of the values",
      tolerance * shown_scale, unit, fixed * shown_scale, unit, words);
}

// The humidity ratio of `s` from the humidity reading `h` (SI) of the file's source.
bool Resolver::humidity(double h, State& s, Saturation& sat, std::string& why) const {
  switch (inf_.humidity) {
    case HumiditySource::dew_point:
    case HumiditySource::wet_bulb: {
      const bool dew = inf_.humidity == HumiditySource::dew_point;
      const char* what = dew ? "dew point" : "wet-bulb";
      const double excess = h - s.t;
      if (excess > inf_.temperature_tolerance_k) {
        why = fmt::format(
            "is a {} of {:.4g} °C, above the dry-bulb {:.4g} °C; allowed: up "
            "to the dry-bulb ({})",
            what, h, s.t,
            saturation_words(inf_.temperature_tolerance_k, kTemperatureToleranceK, "K", 1.0));
        return false;
      }
      if (excess > 0.0) {
        h = s.t;
        sat = excess > kTemperatureToleranceK + 1e-9 ? Saturation::rounding : Saturation::tolerance;
      }
      // psychro::humidity_ratio_from_dew_point, with the saturation pressure remembered.
      s.w = dew ? psychro::humidity_ratio_from_vapor_pressure(saturation_kpa(h), s.p)
                : psychro::humidity_ratio_from_wet_bulb(s.t, h, s.p);
      return true;
    }
    case HumiditySource::relative_humidity: {
      const double tol = inf_.relative_humidity_tolerance;
      if (h < 0.0 || h > 1.0 + tol) {
        why = fmt::format(
            "is {:.4g} % relative humidity; allowed 0 % to 100 % (up to {:.4g} % "
            "is read as 100 %{})",
            h * 100.0, 100.0 * (1.0 + tol),
            tol > kRelativeHumidityTolerance + 1e-12 && !inf_.rounding_words.empty()
                ? fmt::format(": 1 % plus the {} rounding of the values", inf_.rounding_words)
                : std::string());
        return false;
      }
      if (h > 1.0) {
        sat = h > 1.0 + kRelativeHumidityTolerance + 1e-9 ? Saturation::rounding
                                                          : Saturation::tolerance;
        h = 1.0;
      }
      // psychro::humidity_ratio_from_relative_humidity (h is within 0–1 here, as it
      // requires), with the saturation pressure remembered.
      s.w = psychro::humidity_ratio_from_vapor_pressure(h * saturation_kpa(s.t), s.p);
      return true;
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
      return true;
    }
  }
  return false;
}

bool Resolver::resolve(const Row& r, State& s, Saturation& sat, std::size_t& bad_slot,
                       std::string& why) const {
  sat = Saturation::none;
  bad_slot = kDry;
  if (!value(r, kDry, s.t, why)) return false;
  const Plausible& tp = plausible(Kind::temperature);
  if (s.t < tp.lo || s.t > tp.hi) {
    why = fmt::format("is {:.4g} °C; allowed {:g} °C to {:g} °C ({})", s.t, tp.lo, tp.hi, tp.why);
    return false;
  }
  if (file_pressure_) {
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
    if (!humidity(h, s, sat, why)) return false;
  } catch (const RangeError& e) {
    why = fmt::format("is not a possible state: {}", e.what());
    return false;
  }
  // Perfectly dry air (RH 0 %, humidity ratio 0) is a failed sensor or a missing reading,
  // and has no dew point for the model to work with.
  if (!(psychro::vapor_pressure_from_humidity_ratio(s.w, s.p) >= min_vapor_pressure_kpa_)) {
    const std::string reading = inf_.humidity == HumiditySource::relative_humidity
                                    ? fmt::format("{:.4g} % relative humidity", h * 100.0)
                                : inf_.humidity == HumiditySource::humidity_ratio
                                    ? fmt::format("{:.5g} kg/kg", h)
                                    : fmt::format("{:.4g} °C", h);
    why = fmt::format(
        "is {}, air drier than the psychrometric model reaches (a dew point below -100 °C); "
        "allowed: a humidity above 0 (0 is a failed sensor or a missing reading)",
        reading);
    return false;
  }
  return true;
}

// Dropping or inventing more than a small share of a year is no longer reading the file:
// beyond the share the user has allowed, the read is refused with the first bad row.
void check_bad_share(const Context& cx, int rows, int bad_count, int first_line,
                     const std::string& first) {
  const Mapping& mapping = cx.mapping;
  const double share = mapping.max_bad_share.value_or(kDefaultMaxBadShare);
  if (bad_count == 0 || bad_count <= share * rows + 1e-9) return;
  const double pct = 100.0 * bad_count / rows;
  const double needed = std::ceil(pct * 10.0 - 1e-9) / 10.0;
  const bool skip = mapping.on_bad_row == BadRowPolicy::skip;
  throw InputError(fmt::format(
      "{}: {} of {} rows ({:.2g} %) have missing or impossible values and would be {}; "
      "allowed: at most {:g} % ({}); the first is line {}: {}; if these rows are truly "
      "missing readings, allow their share with max_bad_share = \"{:g}%\" in [weather] or "
      "--max-bad-share {:g}%",
      cx.source, bad_count, rows, pct, skip ? "skipped" : "filled by interpolation", share * 100.0,
      mapping.max_bad_share ? "max_bad_share, set by " + mapping.max_bad_share_origin
                            : std::string("the default; max_bad_share raises it"),
      first_line, first, needed, needed));
}

// Linear interpolation in time between the nearest good rows; a run at either end of the
// file takes the nearest good row. Returns the longest run filled.
int fill(const std::vector<Row>& rows, std::vector<State>& states,
         const std::vector<unsigned char>& bad) {
  const std::size_t n = states.size();
  int longest = 0;
  std::size_t i = 0;
  while (i < n) {
    if (!bad[i]) {
      ++i;
      continue;
    }
    std::size_t j = i;
    while (j < n && bad[j]) ++j;
    longest = std::max(longest, static_cast<int>(j - i));
    const bool has_before = i > 0, has_after = j < n;
    for (std::size_t k = i; k < j; ++k) {
      if (!has_before) {
        states[k] = states[j];
      } else if (!has_after) {
        states[k] = states[i - 1];
      } else {
        const State& a = states[i - 1];
        const State& b = states[j];
        const double f = (rows[k].at.position - rows[i - 1].at.position) /
                         (rows[j].at.position - rows[i - 1].at.position);
        State s{a.t + f * (b.t - a.t), a.w + f * (b.w - a.w), a.p + f * (b.p - a.p)};
        // Saturation is convex in t, so the chord between two states can pass above it.
        s.w = std::min(s.w, psychro::saturation_humidity_ratio(s.t, s.p));
        states[k] = s;
      }
    }
    i = j;
  }
  return longest;
}

// The series: every row resolved to a state (bad rows refused, skipped or filled by the
// policy), counted by month, with its day of the year.
std::vector<WeatherHour> convert(const Context& cx, const std::vector<Row>& rows,
                                 const Layout& layout, const std::array<Conversion, 3>& conv,
                                 WeatherInfo& inf) {
  const Resolver resolver(cx, layout, conv, inf);
  const BadRowPolicy policy = cx.mapping.on_bad_row;
  const std::size_t n = rows.size();
  std::vector<State> states(n);
  std::vector<unsigned char> bad(n, 0);
  int good = 0, bad_count = 0;
  std::string first_bad;
  int first_bad_line = 0;
  for (std::size_t i = 0; i < n; ++i) {
    const Row& r = rows[i];
    Saturation sat = Saturation::none;
    std::size_t slot = 0;
    std::string why;
    MonthCounts& mc = inf.months[static_cast<std::size_t>(r.at.month - 1)];
    if (resolver.resolve(r, states[i], sat, slot, why)) {
      ++good;
      if (sat != Saturation::none) ++mc.capped;
      if (sat == Saturation::rounding) ++mc.rounded;
      continue;
    }
    const std::string text = fmt::format("column {} value {} {}", echo(layout.slot_header[slot]),
                                         echo(r.text[slot]), why);
    if (policy == BadRowPolicy::error)
      fail_at(cx.source, r.line, text + " (or set on_bad_row to skip or fill)");
    if (bad_count++ == 0) first_bad = text, first_bad_line = r.line;
    bad[i] = 1;
    ++(policy == BadRowPolicy::skip ? mc.skipped : mc.filled);
  }
  if (good == 0)
    throw InputError(
        fmt::format("{}: none of the {} data rows (lines {} to {}) has usable "
                    "values; allowed: at least one",
                    cx.source, n, inf.first_data_line, inf.last_data_line));
  inf.max_bad_share = cx.mapping.max_bad_share.value_or(kDefaultMaxBadShare);
  check_bad_share(cx, static_cast<int>(n), bad_count, first_bad_line, first_bad);
  if (policy == BadRowPolicy::fill) inf.fill_longest_run = fill(rows, states, bad);

  // Feb 29 shifts the later days of the year only when the file has it: the months are
  // counted as those of a leap year (2000) or of a common one (2001).
  const std::chrono::year calendar_year{inf.time.leap_day_rows > 0 ? 2000 : 2001};
  int cumulative[13] = {0};
  for (unsigned m = 1; m <= 12; ++m)
    cumulative[m] =
        cumulative[m - 1] + calendar::days_in_month(calendar_year, std::chrono::month{m});
  std::vector<WeatherHour> hours;
  hours.reserve(n);
  for (std::size_t i = 0; i < n; ++i) {
    if (bad[i] && policy == BadRowPolicy::skip) continue;
    const Interval& r = rows[i].at;
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
    hours.push_back(h);
  }
  if (inf.pressure_from_file && !hours.empty()) {
    std::vector<double> p;
    p.reserve(hours.size());
    for (const WeatherHour& h : hours) p.push_back(h.pressure_kpa);
    inf.median_pressure_kpa = ts::median(p);
  }
  return hours;
}

// The stages in order: lines → header and columns → rows and their time axis → units →
// labels checked → states.
WeatherSeries read(const Context& cx, std::string_view text) {
  const std::vector<ts::Line> lines = ts::split_lines(text);
  if (std::all_of(lines.begin(), lines.end(), [](const ts::Line& l) { return ts::blank(l.text); }))
    throw InputError(
        fmt::format("{}: the weather file is empty; allowed: a header line and "
                    "data rows",
                    cx.source));
  const Header header = find_header(cx, lines);
  Layout layout = choose_columns(cx, header);
  Table table = read_rows(cx, lines, header, layout);
  check_after_table(cx, lines, header, layout, table);

  WeatherSeries out;
  WeatherInfo& inf = out.info;
  inf.source = std::string(cx.source);
  inf.policy = cx.mapping.on_bad_row;
  inf.site_pressure_kpa = cx.site_pressure_kpa;
  inf.header_line = header.line;
  inf.delimiter = header.delimiter;
  inf.first_data_line = table.first_data_line;
  inf.last_data_line = table.last_data_line;
  inf.rows_read = static_cast<int>(table.rows.size());
  inf.decimal_comma = table.decimal_comma;
  inf.humidity = layout.humidity;
  inf.humidity_overridden = layout.humidity_overridden;
  inf.pressure_from_file = layout.pressure_from_file;
  inf.unused_humidity = layout.unused_humidity;

  TimeInfo time;
  time.columns = layout.time_columns;
  time.clock = layout.header_clock;
  time.format = table.format;
  if (table.zone.clock != Clock::local) {
    time.clock = table.zone.clock;
    time.utc_offset_min = table.zone.offset_min;
  }
  TimeAxis axis = analyse_time(cx, std::move(table.rows), std::move(time));
  inf.time = std::move(axis.info);
  const std::vector<Row>& rows = axis.rows;

  const std::array<Conversion, 3> conv =
      resolve_units(cx, lines, header, rows, table.end, layout.columns);
  inf.columns = layout.columns;
  find_resolution(rows, layout, conv, inf);
  check_labels(cx, {rows, layout, conv, inf});
  out.hours = convert(cx, rows, layout, conv, inf);
  return out;
}

// The value `text` names in `names` (any case, spaces around allowed); else an InputError
// naming `origin` and listing the names.
template <class Table>
auto parse_name(const Table& names, std::string_view text, std::string_view origin,
                std::string_view what) {
  for (const auto& n : names)
    if (text::iequals(text::trim(text), n.name)) return n.value;
  throw InputError(
      fmt::format("{}: {} is not {} (allowed: {})", origin, echo(text), what, names_in(names)));
}

constexpr Named<HumiditySource> kHumidityNames[] = {
    {"dew-point", HumiditySource::dew_point},
    {"humidity-ratio", HumiditySource::humidity_ratio},
    {"wet-bulb", HumiditySource::wet_bulb},
    {"relative-humidity", HumiditySource::relative_humidity},
};
constexpr Named<BadRowPolicy> kPolicyNames[] = {
    {"error", BadRowPolicy::error},
    {"skip", BadRowPolicy::skip},
    {"fill", BadRowPolicy::fill},
};
constexpr Named<TimeConvention> kConventionNames[] = {
    {"automatic", TimeConvention::automatic},
    {"hour-beginning", TimeConvention::hour_beginning},
    {"hour-ending", TimeConvention::hour_ending},
};

// Totals of one count over the months.
int total(const std::array<MonthCounts, 12>& months, int MonthCounts::*count) {
  int n = 0;
  for (const MonthCounts& m : months) n += m.*count;
  return n;
}

}  // namespace

// --- Names ---------------------------------------------------------------------------------

std::string_view quantity_key(Quantity q) { return info(q).key; }
std::string_view quantity_label(Quantity q) { return info(q).label; }
std::optional<Quantity> quantity_from_key(std::string_view key) {
  for (const QuantityInfo& q : kQuantities)
    if (q.key == key) return q.quantity;
  return std::nullopt;
}

std::string_view humidity_source_name(HumiditySource h) { return name_in(kHumidityNames, h); }
HumiditySource parse_humidity_source(std::string_view text, std::string_view origin) {
  return parse_name(kHumidityNames, text, origin, "a humidity source");
}
std::string_view bad_row_policy_name(BadRowPolicy p) { return name_in(kPolicyNames, p); }
BadRowPolicy parse_bad_row_policy(std::string_view text, std::string_view origin) {
  return parse_name(kPolicyNames, text, origin, "a bad-row policy");
}
std::string_view time_convention_name(TimeConvention c) { return name_in(kConventionNames, c); }
TimeConvention parse_time_convention(std::string_view text, std::string_view origin) {
  return parse_name(kConventionNames, text, origin, "a time convention");
}

double parse_max_bad_share(std::string_view text, std::string_view origin) {
  const double share = units::parse(Kind::fraction, text, units::System::si, origin);
  if (!(share >= 0.0 && share <= 1.0))
    throw InputError(
        fmt::format("{}: {} is not a share of rows; allowed: 0 % to 100 %", origin, echo(text)));
  return share;
}

bool accepts_unit(Quantity q, std::string_view unit) {
  return info(q).has_unit && ts::find_unit(info(q).kind, unit) != nullptr;
}

// --- Reading -------------------------------------------------------------------------------

int WeatherInfo::skipped() const { return total(months, &MonthCounts::skipped); }
int WeatherInfo::filled() const { return total(months, &MonthCounts::filled); }
int WeatherInfo::capped() const { return total(months, &MonthCounts::capped); }
int WeatherInfo::rounded() const { return total(months, &MonthCounts::rounded); }
const ColumnUse* WeatherInfo::find(Quantity q) const {
  for (const ColumnUse& c : columns)
    if (c.quantity == q) return &c;
  return nullptr;
}

WeatherSeries read_text(std::string_view text, std::string_view source_name, const Mapping& mapping,
                        double site_pressure_kpa) {
  return read({source_name, mapping, site_pressure_kpa}, text);
}

WeatherSeries read_file(const std::filesystem::path& path, const Mapping& mapping,
                        double site_pressure_kpa) {
  // Ten years of five-minute data is about 60 MB; a larger file is not one site's weather.
  constexpr std::uintmax_t kMaxWeatherBytes = std::uintmax_t{256} << 20;
  return read_text(read_input_file(path, "the weather file", kMaxWeatherBytes),
                   path.filename().string(), mapping, site_pressure_kpa);
}

// --- The [weather] table -------------------------------------------------------------------

Mapping read_mapping(const RawTable& raw, std::string_view file_name) {
  const toml::table& table = detail::toml_table(raw);
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
          if (!ts::find_unit(info(*q).kind, unit))
            throw InputError(fmt::format("{}: [weather] {} {} is not a {} unit (allowed: {})",
                                         sub_origin, name, echo(unit), kind_word(info(*q).kind),
                                         ts::allowed_units(info(*q).kind)));
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
    case UnitFound::none: break;
    case UnitFound::header:
      unit = c.found == ColumnFound::header_name ? "" : "unit from header";
      break;
    case UnitFound::legend: unit = "unit from legend " + c.unit_origin; break;
    case UnitFound::override:
      unit = "unit set by " + (c.unit_origin.empty() ? std::string("the mapping") : c.unit_origin);
      break;
    case UnitFound::inferred: unit = "unit inferred: " + c.unit_origin; break;
    case UnitFound::same_as_dry_bulb: unit = "no unit in the header: same as the dry-bulb"; break;
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
        std::string line = fmt::format(
            "humidity: {}, column {}, {} ({}{})", quantity_label(c.quantity), echo(c.header),
            c.unit, found_text(c), inf.humidity_overridden ? "; chosen by the mapping" : "");
        if (!inf.unused_humidity.empty()) {
          line += "; not used:";
          for (std::size_t i = 0; i < inf.unused_humidity.size(); ++i)
            line += fmt::format("{} {}", i ? "," : "", echo(inf.unused_humidity[i].header));
        }
        lines.push_back(line);
        break;
      }
      default: break;
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
