// Trend-log import: the shared series stages (io/timeseries) for lines, header units, dates
// and numbers; what is here is the trend's own: point names to channels, the clock forms of
// building-automation exports, and the checks of an irregular series.
#include <limitline/io/trend.hpp>

#include <limitline/io/csv.hpp>
#include <limitline/io/input_file.hpp>
#include <limitline/io/timeseries.hpp>
#include <limitline/io/unit_file.hpp>
#include <limitline/error.hpp>
#include <limitline/text.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <cmath>

namespace limitline::trend {
namespace {

namespace ts = timeseries;

constexpr std::string_view kChannelNames[kChannelCount] = {
    "outdoor-dry-bulb", "outdoor-rh", "outdoor-dew-point", "return-dry-bulb", "return-rh",
    "return-dew-point", "mixed-air",  "supply-air",        "damper",          "fan",
    "cooling"};

enum class Kind { temperature, percent, status };
Kind channel_kind(Channel c) {
  switch (c) {
    case Channel::outdoor_rh:
    case Channel::return_rh:
    case Channel::damper: return Kind::percent;
    case Channel::fan:
    case Channel::cooling: return Kind::status;
    default: return Kind::temperature;
  }
}

// Plausible range of each temperature channel, °C: beyond it the reading is not air at that
// point (or the column's unit is not the one its header names). Common practice.
struct Plausible {
  double lo, hi;                // every sample
  double median_lo, median_hi;  // the median of the column (indoor air is held near comfort)
};
constexpr Plausible kPlausible[kChannelCount] = {
    {-60, 60, -60, 60},                      // outdoor dry-bulb
    {0, 0, 0, 0},       {-70, 40, -70, 40},  // outdoor dew point
    {0, 50, 10, 35},                         // return
    {0, 0, 0, 0},       {-40, 35, -40, 35},  // return dew point
    {-40, 60, 0, 40},                        // mixed air
    {0, 60, 5, 40},                          // supply air
    {0, 0, 0, 0},       {0, 0, 0, 0},       {0, 0, 0, 0}};

using text::to_lower;

std::vector<std::string> words(std::string_view header) {
  std::vector<std::string> out;
  std::string cur;
  for (char ch : to_lower(header)) {
    if (std::isalnum(static_cast<unsigned char>(ch)))
      cur += ch;
    else if (!cur.empty())
      out.push_back(std::exchange(cur, {}));
  }
  if (!cur.empty()) out.push_back(cur);
  return out;
}

bool has_word(const std::vector<std::string>& w, std::initializer_list<std::string_view> any) {
  for (const auto& x : w)
    for (auto a : any)
      if (x == a) return true;
  return false;
}

// Header words naming a location and a quantity; abbreviations common in building-automation
// point names (OAT, RAT, MAT, SAT, OA-RH, ...).
struct Abbrev {
  std::string_view word;
  char location;  // o r m s
  char quantity;  // t h d (temperature, RH, dew point)
};
constexpr Abbrev kAbbrevs[] = {
    {"oat", 'o', 't'},  {"osat", 'o', 't'}, {"oadb", 'o', 't'}, {"oarh", 'o', 'h'},
    {"oah", 'o', 'h'},  {"oadp", 'o', 'd'}, {"rat", 'r', 't'},  {"radb", 'r', 't'},
    {"rarh", 'r', 'h'}, {"rah", 'r', 'h'},  {"radp", 'r', 'd'}, {"mat", 'm', 't'},
    {"sat", 's', 't'},  {"dat", 's', 't'},
};

std::optional<Channel> channel_from_header(std::string_view header) {
  const auto w = words(header);
  char loc = 0, qty = 0;
  for (const auto& x : w)
    for (const auto& a : kAbbrevs)
      if (x == a.word) loc = a.location, qty = a.quantity;
  if (!loc) {
    if (has_word(w, {"oa", "outdoor", "outside", "osa", "ambient"}))
      loc = 'o';
    else if (has_word(w, {"ra", "return"}))
      loc = 'r';
    else if (has_word(w, {"ma", "mixed", "mix"}))
      loc = 'm';
    else if (has_word(w, {"sa", "supply", "discharge", "da"}))
      loc = 's';
  }
  const bool damper = has_word(w, {"damper", "dmpr", "dpr"});
  if (damper) return Channel::damper;
  if (has_word(w, {"fan", "sf"}) && !has_word(w, {"speed", "vfd", "hz"})) return Channel::fan;
  if (has_word(w, {"cooling", "clg", "compressor", "comp", "dx", "cool"})) return Channel::cooling;
  if (!qty) {
    if (has_word(w, {"dew", "dewpoint", "dp"}))
      qty = 'd';
    else if (has_word(w, {"rh", "humidity", "hum"}))
      qty = 'h';
    else if (has_word(w, {"temp", "temperature", "t", "db", "drybulb", "dry"}))
      qty = 't';
    else if (loc == 'm' || loc == 's')
      qty = 't';  // "Mixed Air", "Supply Air"
  }
  switch (loc) {
    case 'o':
      return qty == 'h'   ? Channel::outdoor_rh
             : qty == 'd' ? Channel::outdoor_dew_point
             : qty == 't' ? std::optional(Channel::outdoor_dry_bulb)
                          : std::nullopt;
    case 'r':
      return qty == 'h'   ? Channel::return_rh
             : qty == 'd' ? Channel::return_dew_point
             : qty == 't' ? std::optional(Channel::return_dry_bulb)
                          : std::nullopt;
    case 'm': return qty == 't' ? std::optional(Channel::mixed_air) : std::nullopt;
    case 's': return qty == 't' ? std::optional(Channel::supply_air) : std::nullopt;
    default: return std::nullopt;
  }
}

enum class TimeRole { none, timestamp, date, time };
TimeRole time_role(std::string_view header) {
  const auto w = words(header);
  if (has_word(w, {"timestamp", "datetime"}) || (has_word(w, {"date"}) && has_word(w, {"time"})))
    return TimeRole::timestamp;
  if (has_word(w, {"date", "day"})) return TimeRole::date;
  if (has_word(w, {"time"})) return TimeRole::time;
  return TimeRole::none;
}

// The trend's units as the shared spellings name them: temperatures in F or C, percentages
// in % or as a fraction. Empty for any other unit, or none.
std::string trend_unit(std::string_view text) {
  constexpr std::string_view kAccepted[] = {"F", "C", "%", "fraction"};
  for (const units::Kind kind : {units::Kind::temperature, units::Kind::fraction})
    if (const ts::UnitSpelling* u = ts::find_unit(kind, text))
      if (std::find(std::begin(kAccepted), std::end(kAccepted), u->help) != std::end(kAccepted))
        return std::string(u->help);
  return {};
}

// The unit a header names ("OAT (°F)", "[°C]", "RA Temp degC", "OA RH %"), as the shared
// header-unit parser reads it. Empty when none.
std::string unit_from_header(std::string_view header) {
  return trend_unit(ts::parse_header_field(header).unit_text);
}

std::string normalise_unit(std::string_view u, std::string_view origin) {
  std::string unit = trend_unit(u);
  if (unit.empty())
    throw InputError(fmt::format("{}: unit {} is not one of F, C, %, fraction", origin, echo(u)));
  return unit;
}

std::optional<bool> parse_status(std::string_view t) {
  const std::string l = to_lower(t);
  static constexpr std::string_view on[] = {"on",  "1",      "true",  "run",     "running",
                                            "yes", "active", "start", "occupied"};
  static constexpr std::string_view off[] = {"off",     "0",  "false",    "stop",
                                             "stopped", "no", "inactive", "unoccupied"};
  for (auto s : on)
    if (l == s) return true;
  for (auto s : off)
    if (l == s) return false;
  return std::nullopt;
}

// Reads digits from `s` at `i`; false when there are none or more than `max`.
bool digits(std::string_view s, std::size_t& i, int max, int& out) {
  std::size_t n = 0;
  out = 0;
  while (i < s.size() && std::isdigit(static_cast<unsigned char>(s[i])) &&
         n < static_cast<std::size_t>(max))
    out = out * 10 + (s[i++] - '0'), ++n;
  return n > 0;
}

bool expect(std::string_view s, std::size_t& i, char c) {
  if (i < s.size() && s[i] == c) return ++i, true;
  return false;
}

}  // namespace

std::string_view channel_name(Channel c) { return kChannelNames[static_cast<std::size_t>(c)]; }

std::optional<Channel> channel_from_name(std::string_view name) {
  const std::string n = normalise_name(name);
  for (std::size_t i = 0; i < kChannelCount; ++i)
    if (kChannelNames[i] == n) return static_cast<Channel>(i);
  return std::nullopt;
}

ColumnOverride parse_column_override(std::string_view text, std::string_view origin) {
  const auto eq = text.find('=');
  auto allowed = [] {
    std::string s;
    for (auto n : kChannelNames) s += (s.empty() ? "" : ", ") + std::string(n);
    return s;
  };
  if (eq == std::string_view::npos || eq == 0 || eq + 1 == text.size())
    throw InputError(fmt::format("{}: {} is not QUANTITY=HEADER[:UNIT] (quantities: {})", origin,
                                 echo(text), allowed()));
  const auto ch = channel_from_name(text.substr(0, eq));
  if (!ch)
    throw InputError(fmt::format("{}: {} is not a trend quantity (allowed: {})", origin,
                                 echo(text.substr(0, eq)), allowed()));
  std::string_view rest = text.substr(eq + 1);
  ColumnOverride o{*ch, std::string(rest), {}};
  const auto colon = rest.rfind(':');
  if (colon != std::string_view::npos) {
    o.header = std::string(rest.substr(0, colon));
    o.unit = normalise_unit(rest.substr(colon + 1), origin);
  }
  if (o.header.empty()) throw InputError(fmt::format("{}: {} names no header", origin, echo(text)));
  return o;
}

namespace {

// The clock time after a stamp's date, from `s[i]` on: HH:MM[:SS[.frac]], then AM/PM, Z or an
// offset ±HH[[:]MM]. Seconds of the day, less the offset; none when it is not one of these.
std::optional<std::int64_t> read_clock(std::string_view s, std::size_t i) {
  int hh = 0, mm = 0, ss = 0;
  if (!digits(s, i, 2, hh) || !expect(s, i, ':') || !digits(s, i, 2, mm)) return std::nullopt;
  if (expect(s, i, ':') && !digits(s, i, 2, ss)) return std::nullopt;
  if (expect(s, i, '.')) {
    int frac;
    if (!digits(s, i, 9, frac)) return std::nullopt;
  }
  while (i < s.size() && s[i] == ' ') ++i;
  std::int64_t offset_s = 0;
  const std::string rest = to_lower(s.substr(i));
  if (rest == "am" || rest == "pm") {
    if (hh < 1 || hh > 12) return std::nullopt;
    hh = hh % 12 + (rest == "pm" ? 12 : 0);
    i = s.size();
  } else if (rest == "z") {
    i = s.size();
  } else if (!rest.empty() && (rest[0] == '+' || rest[0] == '-')) {
    const int sign = rest[0] == '-' ? -1 : 1;
    ++i;
    int oh, om = 0;
    if (!digits(s, i, 2, oh)) return std::nullopt;
    if (expect(s, i, ':') || (i < s.size() && std::isdigit(static_cast<unsigned char>(s[i]))))
      if (!digits(s, i, 2, om)) return std::nullopt;
    // Civil time zones lie within UTC−12 to UTC+14.
    if (oh * 60 + om > 14 * 60 || om > 59) return std::nullopt;
    offset_s = sign * (oh * 3600 + om * 60);
  }
  if (i != s.size() || hh > 23 || mm > 59 || ss > 59) return std::nullopt;
  return hh * 3600 + mm * 60 + ss - offset_s;
}

// The time stamp in `text`, or none when it is not one of the accepted forms. The date is
// read by the shared stamp stage, in the forms building-automation exports write: ISO
// 8601, YYYY/MM/DD and MM/DD/YYYY.
std::optional<std::int64_t> read_timestamp(std::string_view text) {
  std::string_view s = text;
  while (!s.empty() && s.back() == ' ') s.remove_suffix(1);
  const std::size_t end = s.find_first_of("T ");
  ts::Stamp date;
  ts::DateForm form{};
  if (!ts::parse_date(s.substr(0, end), false, date, form)) return std::nullopt;
  if (form != ts::DateForm::iso && form != ts::DateForm::ymd_slash && form != ts::DateForm::mdy)
    return std::nullopt;
  if (form == ts::DateForm::mdy && date.year < 1000) return std::nullopt;
  const std::int64_t day_s = ts::days_from_civil(date.year, date.month, date.day) * 86400;
  if (end == std::string_view::npos) return day_s;
  std::size_t i = end;
  while (i < s.size() && (s[i] == 'T' || s[i] == ' ')) ++i;
  const std::optional<std::int64_t> clock = read_clock(s, i);
  if (!clock) return std::nullopt;
  return day_s + *clock;
}

}  // namespace

int parse_utc_offset(std::string_view text, std::string_view origin) {
  std::string_view t = text::trim(text);
  if (t.size() >= 3 && text::to_lower(t.substr(0, 3)) == "utc") t.remove_prefix(3);
  if (t.empty() || t == "Z" || t == "z") return 0;
  int hh = -1, mm = 0;
  const bool sign = t[0] == '+' || t[0] == '-';
  std::string_view d = sign ? t.substr(1) : std::string_view();
  auto digits = [](std::string_view x) {
    return !x.empty() &&
           std::all_of(x.begin(), x.end(), [](char ch) { return ch >= '0' && ch <= '9'; });
  };
  std::string compact;
  for (char ch : d)
    if (ch != ':') compact += ch;
  const bool colon_ok = d.find(':') == std::string_view::npos || (d.size() == 5 && d[2] == ':');
  if (sign && colon_ok && digits(compact) && (compact.size() == 2 || compact.size() == 4)) {
    hh = (compact[0] - '0') * 10 + (compact[1] - '0');
    if (compact.size() == 4) mm = (compact[2] - '0') * 10 + (compact[3] - '0');
  }
  const int minutes = (t[0] == '-' ? -1 : 1) * (hh * 60 + mm);
  if (hh < 0 || mm >= 60 || minutes < -12 * 60 || minutes > 14 * 60)
    throw InputError(fmt::format(
        "{}: {} is not an offset from UTC (allowed: UTC, Z, ±HH:MM, ±HHMM or ±HH from −12:00 "
        "to +14:00, e.g. -05:00)",
        origin, echo(text)));
  return minutes;
}

std::string format_utc_offset(int minutes) {
  if (minutes == 0) return "UTC";
  const int a = std::abs(minutes);
  return fmt::format("UTC{}{:02}:{:02}", minutes < 0 ? "−" : "+", a / 60, a % 60);
}

std::int64_t parse_timestamp(std::string_view text, std::string_view origin) {
  if (const auto t = read_timestamp(text)) return *t;
  throw InputError(fmt::format(
      "{}: {} is not a time stamp (allowed: YYYY-MM-DD HH:MM[:SS], ISO 8601 with T and Z or "
      "±HH:MM up to ±14:00, MM/DD/YYYY HH:MM[:SS][ AM|PM], YYYY/MM/DD HH:MM[:SS])",
      origin, echo(text)));
}

std::string format_timestamp(std::int64_t t) {
  const std::int64_t days = t >= 0 ? t / 86400 : (t - 86399) / 86400;
  const std::int64_t sec = t - days * 86400;
  const ts::CivilDate d = ts::civil_from_days(days);
  return fmt::format("{:04}-{:02}-{:02} {:02}:{:02}", d.year, d.month, d.day, sec / 3600,
                     sec % 3600 / 60);
}

bool TrendLog::has(Channel c) const {
  for (const auto& u : columns)
    if (u.channel == c) return true;
  return false;
}

std::optional<double> TrendLog::value(Channel c, std::size_t i) const {
  const auto k = static_cast<std::size_t>(c);
  if (!state[k].empty()) {
    if (state[k][i] < 0) return std::nullopt;
    return static_cast<double>(state[k][i]);
  }
  if (number[k].empty() || std::isnan(number[k][i])) return std::nullopt;
  return number[k][i];
}

Sample TrendLog::sample(std::size_t i) const {
  Sample s{time_s[i], line[i], {}};
  for (std::size_t k = 0; k < kChannelCount; ++k) s.value[k] = value(static_cast<Channel>(k), i);
  return s;
}

double TrendLog::weight_s(std::size_t i) const {
  const double w = i + 1 < time_s.size() ? static_cast<double>(time_s[i + 1] - time_s[i])
                                         : coverage.median_interval_s;
  return std::min(w, coverage.max_gap_s);
}

namespace {

// A year of one-minute samples of a dozen points is about 60 MB.
constexpr std::uintmax_t kMaxTrendLogBytes = std::uintmax_t{1} << 30;

// A line of the log, for messages: formatted only when one is thrown.
struct Where {
  std::string_view name;
  int line;
  std::string str() const { return fmt::format("{}:{}", name, line); }
};

// --- The header and the columns ------------------------------------------------------------

// How the log is laid out: where the time is, the column and unit of each channel, and how
// each was read (for the report).
struct Layout {
  int header_line = 0;
  char delimiter = ',';
  std::vector<std::string> header;                  // the fields as split
  std::array<int, 3> time_role_column{-1, -1, -1};  // first timestamp, date and time column
  ts::TimeColumns time;
  std::array<int, kChannelCount> column{};      // -1: the log has none
  std::array<std::string, kChannelCount> unit;  // "F", "C", "%", "fraction"; "" for on/off
  std::vector<ColumnUse> uses;
};

// Channel → column, overrides first.
void map_channels(Layout& l, const ReadOptions& options, const std::string& where_header) {
  const auto& header = l.header;
  l.column.fill(-1);
  std::array<bool, kChannelCount> overridden{};
  for (const auto& o : options.columns) {
    int found = -1;
    for (std::size_t c = 0; c < header.size(); ++c)
      if (header[c] == o.header) found = static_cast<int>(c);
    if (found < 0)
      throw InputError(fmt::format("--column {}={}: the header ({}) has no column {}",
                                   channel_name(o.channel), echo(o.header), where_header,
                                   echo(o.header)));
    const auto k = static_cast<std::size_t>(o.channel);
    l.column[k] = found;
    l.unit[k] = o.unit;
    overridden[k] = true;
  }
  for (std::size_t c = 0; c < header.size(); ++c) {
    const int ci = static_cast<int>(c);
    if (std::find(l.time_role_column.begin(), l.time_role_column.end(), ci) !=
        l.time_role_column.end())
      continue;
    if (std::find(l.column.begin(), l.column.end(), ci) != l.column.end()) continue;
    const auto ch = channel_from_header(header[c]);
    if (!ch) continue;
    const auto k = static_cast<std::size_t>(*ch);
    if (overridden[k]) continue;
    if (l.column[k] >= 0)
      throw InputError(
          fmt::format("{}: columns {} and {} both look like {}; choose one with --column {}=HEADER",
                      where_header, echo(header[static_cast<std::size_t>(l.column[k])]),
                      echo(header[c]), channel_name(*ch), channel_name(*ch)));
    l.column[k] = ci;
  }
  if (std::all_of(l.column.begin(), l.column.end(), [](int c) { return c < 0; }))
    throw InputError(
        fmt::format("{}: no trend column recognised (e.g. 'OA Temp (°F)', 'RA RH "
                    "(%)', 'MAT', 'OA Damper Cmd (%)', 'SF Status'); set them with "
                    "--column QUANTITY=HEADER[:UNIT]",
                    where_header));
  for (std::size_t k = 0; k < kChannelCount; ++k)
    if (l.column[k] >= 0)
      l.uses.push_back({static_cast<Channel>(k),
                        header[static_cast<std::size_t>(l.column[k])],
                        {},
                        overridden[k],
                        {}});
}

// Units: override, else header, else the bare system (temperatures) or % (percent points).
void choose_units(Layout& l, const ReadOptions& options, const std::string& where_header) {
  for (ColumnUse& use : l.uses) {
    const Channel ch = use.channel;
    const auto k = static_cast<std::size_t>(ch);
    const std::string& h = use.header;
    std::string u = l.unit[k].empty() ? unit_from_header(h) : l.unit[k];
    switch (channel_kind(ch)) {
      case Kind::temperature:
        if (u == "%" || u == "fraction")
          throw InputError(
              fmt::format("{}: column {} ({}) is a temperature; its unit must be F or C",
                          where_header, echo(h), channel_name(ch)));
        if (u.empty()) {
          u.assign(1, options.bare == units::System::ip ? 'F' : 'C');
          use.note = fmt::format("no unit in the header: read in °{} (--units)", u);
        }
        use.unit = u == "F" ? "°F" : "°C";
        break;
      case Kind::percent:
        if (u == "F" || u == "C")
          throw InputError(fmt::format("{}: column {} ({}) is a percentage, not a temperature",
                                       where_header, echo(h), channel_name(ch)));
        use.unit = u.empty() ? "%" : u;
        if (u.empty()) use.note = "no unit in the header: read in %";
        break;
      case Kind::status: use.unit = "on/off"; break;
    }
    l.unit[k] = u.empty() && channel_kind(ch) == Kind::percent ? "%" : u;
  }
}

// The layout of a header line; none for a line without a time column (an export preamble).
std::optional<Layout> read_header(std::string_view text, Where at, const ReadOptions& options) {
  Layout l;
  l.delimiter = csv::guess_delimiter(text);
  l.header = csv::split_line(text, l.delimiter);
  std::array<int, ts::kTimeRoleCount> roles;
  roles.fill(-1);
  for (std::size_t c = 0; c < l.header.size(); ++c) {
    const TimeRole role = time_role(l.header[c]);
    if (role == TimeRole::none) continue;
    int& first =
        roles[static_cast<std::size_t>(role == TimeRole::timestamp ? ts::TimeRole::timestamp
                                       : role == TimeRole::date    ? ts::TimeRole::date
                                                                   : ts::TimeRole::time)];
    if (first < 0) first = static_cast<int>(c);
  }
  std::copy_n(roles.begin(), 3, l.time_role_column.begin());
  if (std::all_of(l.time_role_column.begin(), l.time_role_column.end(),
                  [](int c) { return c < 0; }))
    return std::nullopt;
  l.header_line = at.line;
  const std::string where_header = at.str();
  // A date alone holds the whole stamp; a time alone does not.
  if (l.time_role_column[0] < 0 && l.time_role_column[1] < 0)
    throw InputError(
        fmt::format("{}: a 'Time' column needs a 'Date' column beside it", where_header));
  l.time = ts::resolve_time(roles);
  map_channels(l, options, where_header);
  choose_units(l, options, where_header);
  return l;
}

// --- One row: its time and its readings ----------------------------------------------------

// The value of channel `k` in the cell `t` (not empty), in the log's storage units: °C,
// fractions, 1/0 for on/off.
double reading(const Layout& l, std::size_t k, std::string_view t, Where at) {
  const auto ch = static_cast<Channel>(k);
  const std::string& h = l.header[static_cast<std::size_t>(l.column[k])];
  double v;
  if (channel_kind(ch) == Kind::status) {
    if (auto st = parse_status(t)) return *st ? 1.0 : 0.0;
    if (ts::read_number(t, v) && v >= 0 && v <= 100 && ch == Channel::cooling)
      return v > 0 ? 1.0 : 0.0;  // a valve or compressor signal: on when above zero
    throw InputError(
        fmt::format("{}: {} {} in column {} is not a status (allowed: on/off, 1/0, "
                    "true/false, run/stop{})",
                    at.str(), channel_name(ch), echo(t), echo(h),
                    ch == Channel::cooling ? ", or a signal 0–100 %" : ""));
  }
  if (!ts::read_number(t, v))
    throw InputError(fmt::format("{}: {} {} in column {} is not a number", at.str(),
                                 channel_name(ch), echo(t), echo(h)));
  if (channel_kind(ch) == Kind::percent) {
    const bool fraction = l.unit[k] == "fraction";
    if (v < 0 || v > (fraction ? 1.0 : 100.0))
      throw InputError(fmt::format("{}: {} {} in column {} is outside 0–{}", at.str(),
                                   channel_name(ch), echo(t), echo(h),
                                   fraction ? "1 (fraction)" : "100 %"));
    return fraction ? v : v / 100.0;
  }
  const double c = l.unit[k] == "F" ? units::celsius_from_fahrenheit(v) : v;
  const auto& p = kPlausible[k];
  if (c < p.lo || c > p.hi)
    throw InputError(fmt::format(
        "{}: {} {} in column {} read in °{} is {:.1f} °C, outside the plausible {:.0f} to "
        "{:.0f} °C; is the column's unit right? (set it with --column {}=HEADER:F or :C)",
        at.str(), channel_name(ch), echo(t), echo(h), l.unit[k], c, p.lo, p.hi, channel_name(ch)));
  return c;
}

struct RowReading {
  std::int64_t time_s = 0;
  std::array<double, kChannelCount> value;  // NaN: no reading
};

RowReading read_row(const Layout& l, std::string_view text, Where at) {
  const auto cells = csv::split_line(text, l.delimiter);
  // An export may end every row with a delimiter: empty fields past the header's are no field.
  std::size_t used = cells.size();
  while (used > l.header.size() && cells[used - 1].empty()) --used;
  if (used != l.header.size())
    throw InputError(
        fmt::format("{}: the row has {} fields but the header (line {}) has {}; "
                    "allowed: one value per header column",
                    at.str(), used, l.header_line, l.header.size()));
  auto cell = [&](int c) -> std::string_view {
    return c >= 0 ? std::string_view(cells[static_cast<std::size_t>(c)]) : std::string_view();
  };
  const std::string joined =
      l.time.stamp >= 0 ? std::string()
                        : std::string(cell(l.time.date)) + " " + std::string(cell(l.time.clock));
  const std::string_view stamp = l.time.stamp >= 0 ? cell(l.time.stamp) : std::string_view(joined);
  RowReading r;
  const auto read = read_timestamp(stamp);
  r.time_s = read ? *read : parse_timestamp(stamp, fmt::format("{}: time", at.str()));
  r.value.fill(std::nan(""));
  for (std::size_t k = 0; k < kChannelCount; ++k)
    if (l.column[k] >= 0 && !cell(l.column[k]).empty())
      r.value[k] = reading(l, k, cell(l.column[k]), at);
  return r;
}

// --- The series ----------------------------------------------------------------------------

// Appends a row to the log: in time order; an exact repeat of the previous sample is dropped
// and counted, a stamp repeated with other readings refused.
void append(TrendLog& log, const Layout& l, const RowReading& r, Where at) {
  if (!log.time_s.empty()) {
    const std::int64_t prev = log.time_s.back();
    if (r.time_s < prev)
      throw InputError(fmt::format(
          "{}: time {} is before the previous sample's {} (line {}); sort the log by time",
          at.str(), format_timestamp(r.time_s), format_timestamp(prev), log.line.back()));
    if (r.time_s == prev) {
      // A row's identity is its readings, not the spelling of its time cell.
      const std::size_t last = log.size() - 1;
      for (std::size_t k = 0; k < kChannelCount; ++k) {
        const std::optional<double> before = log.value(static_cast<Channel>(k), last);
        if (!(before ? r.value[k] == *before : std::isnan(r.value[k])))
          throw InputError(
              fmt::format("{}: time {} repeats line {} with different readings; "
                          "remove one of them",
                          at.str(), format_timestamp(r.time_s), log.line.back()));
      }
      ++log.coverage.duplicate_rows;
      return;
    }
  }
  log.time_s.push_back(r.time_s);
  log.line.push_back(at.line);
  for (std::size_t k = 0; k < kChannelCount; ++k) {
    if (l.column[k] < 0) continue;
    const double v = r.value[k];
    if (channel_kind(static_cast<Channel>(k)) == Kind::status)
      log.state[k].push_back(std::isnan(v) ? std::int8_t{-1} : static_cast<std::int8_t>(v > 0.5));
    else
      log.number[k].push_back(v);
  }
}

// Column medians: indoor air far from comfort means the unit is not the header's.
void check_medians(const TrendLog& log, const Layout& l, const std::string& where_header) {
  std::vector<double> v;
  for (std::size_t k = 0; k < kChannelCount; ++k) {
    if (l.column[k] < 0 || channel_kind(static_cast<Channel>(k)) != Kind::temperature) continue;
    v.clear();
    for (double x : log.number[k])
      if (!std::isnan(x)) v.push_back(x);
    if (v.empty()) continue;
    const double med = ts::median(v);
    const auto& p = kPlausible[k];
    if (med < p.median_lo || med > p.median_hi)
      throw InputError(fmt::format(
          "{}: column {} ({}) read in °{} has a median of {:.1f} °C, outside the plausible "
          "{:.0f} to {:.0f} °C; is the column's unit right? (set it with --column {}=HEADER:F or "
          ":C)",
          where_header, echo(l.header[static_cast<std::size_t>(l.column[k])]),
          channel_name(static_cast<Channel>(k)), l.unit[k], med, p.median_lo, p.median_hi,
          channel_name(static_cast<Channel>(k))));
  }
}

// Weights: the median interval, the cap, and the gaps beyond it.
void measure_coverage(TrendLog& log, const ReadOptions& options) {
  auto& cov = log.coverage;
  const auto& t = log.time_s;
  const std::size_t n = t.size();
  cov.rows = static_cast<int>(n);
  cov.first_s = t.front();
  cov.last_s = t.back();
  if (n < 2)
    throw InputError(fmt::format("{}: one sample only; an audit needs a series", log.path));
  {
    std::vector<double> dt(n - 1);
    for (std::size_t i = 1; i < n; ++i) dt[i - 1] = static_cast<double>(t[i] - t[i - 1]);
    cov.median_interval_s = ts::median(dt);
  }
  if (options.max_gap_s && !(*options.max_gap_s > 0 && *options.max_gap_s <= kMaxGapLimitS))
    throw InputError(fmt::format(
        "--max-gap: {} is outside the allowed more than 0 to {:.0f} min "
        "(a year)",
        std::isfinite(*options.max_gap_s) ? fmt::format("{:.6g} min", *options.max_gap_s / 60.0)
                                          : std::string("a time beyond any bound"),
        kMaxGapLimitS / 60.0));
  cov.max_gap_s = options.max_gap_s ? *options.max_gap_s : 2.0 * cov.median_interval_s;
  for (std::size_t i = 0; i < n; ++i) {
    if (i + 1 < n && static_cast<double>(t[i + 1] - t[i]) > cov.max_gap_s)
      cov.gaps.push_back({t[i], t[i + 1]});
    cov.covered_s += log.weight_s(i);
  }
  cov.span_s = static_cast<double>(cov.last_s - cov.first_s) + log.weight_s(n - 1);
}

// The stages fed line by line, so that nothing but the samples is kept: the header search,
// then each row read and appended as it comes; the whole series checked at the end.
class Reader {
 public:
  Reader(std::string_view name, const ReadOptions& options) : options_(options) {
    log_.path = std::string(name);
  }

  void line(std::string_view text) {
    ++number_;
    if (text.empty() || text[0] == '#' || (layout_ && ts::blank(text))) return;
    const Where at{log_.path, number_};
    if (!layout_) {
      layout_ = read_header(text, at, options_);
      if (layout_) log_.columns = layout_->uses;
      return;
    }
    append(log_, *layout_, read_row(*layout_, text, at), at);
  }

  TrendLog finish() {
    if (!layout_)
      throw InputError(
          fmt::format("{}: no header line with a time column (a header such as "
                      "'Timestamp', 'Date/Time', or 'Date' and 'Time')",
                      log_.path));
    const std::string where_header = Where{log_.path, layout_->header_line}.str();
    if (log_.time_s.empty())
      throw InputError(fmt::format("{}: no samples after the header", where_header));
    check_medians(log_, *layout_, where_header);
    measure_coverage(log_, options_);
    return std::move(log_);
  }

 private:
  const ReadOptions& options_;
  TrendLog log_;
  int number_ = 0;                // the line being read
  std::optional<Layout> layout_;  // once the header is found
};

template <class Feed>
TrendLog read(std::string_view name, const ReadOptions& options, Feed&& feed) {
  Reader reader(name, options);
  ts::LineSplitter lines;
  const auto on_line = [&](std::string_view l) { reader.line(l); };
  feed([&](std::string_view piece) { lines.feed(piece, on_line); });
  lines.finish(on_line);
  return reader.finish();
}

}  // namespace

TrendLog parse_trend(std::string_view text, std::string_view name, const ReadOptions& options) {
  return read(name, options, [&](const auto& piece) { piece(text); });
}

TrendLog load_trend(const std::string& path, const ReadOptions& options) {
  return read(path, options, [&](const auto& piece) {
    read_input_pieces(path, "the trend log", kMaxTrendLogBytes, piece);
  });
}

}  // namespace limitline::trend
