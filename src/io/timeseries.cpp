// The stages shared by the weather and trend readers: lines, header fields and their units,
// time columns and stamps, cells. See io/timeseries.hpp.
#include <limitline/io/timeseries.hpp>

#include <limitline/calendar.hpp>
#include <limitline/io/csv.hpp>
#include <limitline/text.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <bit>
#include <cctype>
#include <charconv>
#include <chrono>
#include <cmath>
#include <cstring>

namespace limitline::timeseries {
namespace {

using units::Kind;

using text::is_space;
using text::to_lower;

// A unit spelling reduced for lookup: lower case, without spaces, '_', '.' or tabs.
std::string unit_key(std::string_view s) {
  std::string out;
  for (char c : s)
    if (c != ' ' && c != '_' && c != '.' && c != '\t') out.push_back(to_lower(c));
  return out;
}

constexpr UnitSpelling kUnits[] = {
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

// Values that series files use to mark a missing reading (common practice: TMY and station
// exports use -9999 and 9999, NOAA ISD 99999, some loggers -9900).
constexpr double kSentinels[] = {-9999.0, -9900.0, 9999.0, 99999.0};
constexpr std::string_view kMissingWords[] = {"na", "n/a", "nan", "null"};

bool is_sentinel(double v) {
  for (double s : kSentinels)
    if (v == s) return true;
  return false;
}

// Decimal numbers as series files write them ("-12.5", "99870.0"): the digits as an integer
// and one division by a power of ten. That is correctly rounded, as std::from_chars is, while
// both operands are exact doubles (at most 15 digits, so below 2^53; powers up to 1e15).
// Anything else (exponents, long numbers, words) is left to std::from_chars. The digits read
// are kept in `digits` for callers that judge the written resolution without rounding.
bool fast_decimal(std::string_view s, double& v, Decimal& digits) {
  static constexpr double kPow10[] = {1e0, 1e1, 1e2,  1e3,  1e4,  1e5,  1e6,  1e7,
                                      1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15};
  const char* p = s.data();
  const char* const e = p + s.size();
  const bool negative = p < e && *p == '-';
  if (negative) ++p;
  // Integer part, then fraction: two tight loops. More than 15 digits is refused once at
  // the end (the unsigned mantissa may have wrapped by then; it is not used).
  std::uint64_t mantissa = 0;
  const char* const int_start = p;
  while (p < e && static_cast<unsigned char>(*p - '0') < 10) {
    mantissa = mantissa * 10 + static_cast<std::uint64_t>(*p - '0');
    ++p;
  }
  std::ptrdiff_t decimals = 0;
  std::ptrdiff_t count = p - int_start;
  if (p < e && *p == '.') {
    const char* const frac_start = ++p;
    while (p < e && static_cast<unsigned char>(*p - '0') < 10) {
      mantissa = mantissa * 10 + static_cast<std::uint64_t>(*p - '0');
      ++p;
    }
    decimals = p - frac_start;
    count += decimals;
  }
  if (p != e || count == 0 || count > 15) return false;
  // Below 10^15, so the signed conversion (one instruction) is exact.
  v = static_cast<double>(static_cast<std::int64_t>(mantissa)) / kPow10[decimals];
  if (negative) v = -v;
  digits = {mantissa, static_cast<int>(decimals)};
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

constexpr std::string_view kDateFormText[] = {"YYYY-MM-DD", "YYYY/MM/DD", "MM/DD/YYYY",
                                              "DD/MM/YYYY", "DD.MM.YYYY", "YYYYMMDD"};
constexpr std::string_view kClockFormText[] = {"HH:MM", "HH:MM:SS", "HHMM"};

}  // namespace

// --- 1. Lines ------------------------------------------------------------------------------

LineCut cut_line(std::string_view text, bool lone_cr_ends_line) {
  if (lone_cr_ends_line) {
    const std::size_t end = text.find_first_of("\r\n");
    if (end == std::string_view::npos) return {text.size(), 0};
    const bool crlf = text[end] == '\r' && end + 1 < text.size() && text[end + 1] == '\n';
    return {end, crlf ? std::size_t{2} : std::size_t{1}};
  }
  const std::size_t nl = text.find('\n');
  const std::size_t end = nl == std::string_view::npos ? text.size() : nl;
  const std::size_t length = end > 0 && text[end - 1] == '\r' ? end - 1 : end;
  return {length, nl == std::string_view::npos ? std::size_t{0} : end + 1 - length};
}

std::vector<Line> split_lines(std::string_view text) {
  std::vector<Line> lines;
  lines.reserve(text.size() / 32 + 16);
  if (text.substr(0, 3) == "\xEF\xBB\xBF") text.remove_prefix(3);  // UTF-8 byte-order mark
  const bool lone_cr_ends_line =
      text.find('\n') == std::string_view::npos && text.find('\r') != std::string_view::npos;
  int number = 1;
  while (!text.empty()) {
    const LineCut cut = cut_line(text, lone_cr_ends_line);
    lines.push_back({text.substr(0, cut.length), number++});
    if (cut.ending == 0) break;
    text.remove_prefix(cut.length + cut.ending);
  }
  return lines;
}

bool blank(std::string_view s) {
  for (char c : s)
    if (!is_space(c)) return false;
  return true;
}

// --- 2. Header and layout ------------------------------------------------------------------

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

std::string name_key(std::string_view s) {
  std::string out;
  for (char c : s)
    if (std::isalnum(static_cast<unsigned char>(c))) out.push_back(to_lower(c));
  return out;
}

HeaderField parse_header_field(std::string_view text) {
  HeaderField f;
  const std::string_view t = text::trim(text);
  const std::size_t open = t.find_first_of("([");
  if (open != std::string_view::npos) {
    const char close = t[open] == '(' ? ')' : ']';
    const std::size_t end = t.find(close, open + 1);
    f.name = name_key(t.substr(0, open));
    f.unit_text = std::string(text::trim(t.substr(
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

HeaderLine read_header_line(std::string_view line) {
  HeaderLine h;
  h.delimiter = csv::guess_delimiter(line);
  std::vector<std::string> raw = csv::split_line(line, h.delimiter);
  h.fields.reserve(raw.size());
  for (const std::string& r : raw) h.fields.push_back(parse_header_field(r));
  return h;
}

namespace {

// The general split: quotes, text after a closing quote, blanks before a field.
void split_quoted(std::string_view line, char delim, std::vector<std::string_view>& out) {
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
        field = text::trim(std::string_view(start, static_cast<std::size_t>(p - start)));
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

// A field of a line without quotes: the text between two delimiters, blanks (' ', tab)
// before it and white space after it dropped, exactly as split_quoted cuts it.
inline void push_plain(const char* p, const char* q, std::vector<std::string_view>& out) {
  while (p < q && (*p == ' ' || *p == '\t')) ++p;
  while (q > p && is_space(q[-1])) --q;
  out.emplace_back(p, static_cast<std::size_t>(q - p));
}

// The top bit of each byte of `word` that equals the byte repeated in `pattern`, exactly
// (no borrow from one byte into the next, unlike the shorter zero-byte test).
inline std::uint64_t bytes_equal(std::uint64_t word, std::uint64_t pattern) {
  constexpr std::uint64_t kLow7 = 0x7F7F7F7F7F7F7F7FULL;
  const std::uint64_t x = word ^ pattern;
  return ~(((x & kLow7) + kLow7) | x | kLow7);
}

// Most data rows hold no quote: their delimiters are found eight bytes at a time. Returns
// false, with `out` partly filled, at the first quote, which needs the general split.
bool split_plain(std::string_view line, char delim, std::vector<std::string_view>& out) {
  constexpr std::uint64_t kOnes = 0x0101010101010101ULL;
  const std::uint64_t delims = kOnes * static_cast<unsigned char>(delim);
  const std::uint64_t quotes = kOnes * static_cast<unsigned char>('"');
  const char* const begin = line.data();
  const char* const end = begin + line.size();
  const char* field = begin;
  const char* p = begin;
  for (; end - p >= 8; p += 8) {
    std::uint64_t word;
    std::memcpy(&word, p, 8);
    if (bytes_equal(word, quotes) != 0) return false;
    for (std::uint64_t hits = bytes_equal(word, delims); hits != 0; hits &= hits - 1) {
      const char* const at = p + std::countr_zero(hits) / 8;
      push_plain(field, at, out);
      field = at + 1;
    }
  }
  for (; p < end; ++p) {
    if (*p == '"') return false;
    if (*p == delim) {
      push_plain(field, p, out);
      field = p + 1;
    }
  }
  push_plain(field, end, out);
  return true;
}

}  // namespace

void split_fields(std::string_view line, char delim, std::vector<std::string_view>& out) {
  out.clear();
  // The word-at-a-time scan reads bytes in memory order from the low end of the word.
  if constexpr (std::endian::native == std::endian::little) {
    if (split_plain(line, delim, out)) return;
    out.clear();
  }
  split_quoted(line, delim, out);
}

TimeColumns resolve_time(const std::array<int, kTimeRoleCount>& column) {
  const auto at = [&](TimeRole r) { return column[static_cast<std::size_t>(r)]; };
  TimeColumns t;
  if (at(TimeRole::timestamp) >= 0) {
    t.stamp = at(TimeRole::timestamp);
    return t;
  }
  const bool date_fields = at(TimeRole::month) >= 0 && at(TimeRole::day) >= 0;
  const bool has_date = at(TimeRole::date) >= 0 || date_fields;
  const bool has_clock = at(TimeRole::time) >= 0 || at(TimeRole::hour) >= 0;
  if (has_date && has_clock) {
    if (at(TimeRole::date) >= 0) {
      t.date = at(TimeRole::date);
    } else {
      t.year = at(TimeRole::year);
      t.month = at(TimeRole::month);
      t.day = at(TimeRole::day);
    }
    if (at(TimeRole::time) >= 0) {
      t.clock = at(TimeRole::time);
    } else {
      t.hour = at(TimeRole::hour);
      t.minute = at(TimeRole::minute);
    }
  } else if (at(TimeRole::date) >= 0) {
    t.stamp = at(TimeRole::date);  // a date column with no clock column holds both
  } else if (at(TimeRole::time) >= 0 && !has_date) {
    t.stamp = at(TimeRole::time);  // "time(UTC)": a time column with no date column holds both
  }
  return t;
}

// --- 3. Time axis --------------------------------------------------------------------------

std::int64_t days_from_civil(int year, int month, int day) {
  using namespace std::chrono;
  const sys_days d{std::chrono::year{year} / static_cast<unsigned>(month) /
                   static_cast<unsigned>(day)};
  return d.time_since_epoch().count();
}

CivilDate civil_from_days(std::int64_t days) {
  using namespace std::chrono;
  const year_month_day d{sys_days{std::chrono::days{days}}};
  return {static_cast<int>(d.year()), static_cast<int>(static_cast<unsigned>(d.month())),
          static_cast<int>(static_cast<unsigned>(d.day()))};
}

bool valid_date(const Stamp& s) { return calendar::is_date(s.year, s.month, s.day); }

std::string stamp_text(const Stamp& s) {
  std::string out = s.year > 0 ? fmt::format("{:04}-{:02}-{:02}", s.year, s.month, s.day)
                               : fmt::format("{:02}-{:02}", s.month, s.day);
  out += fmt::format(" {:02}:{:02}", s.minute / 60, s.minute % 60);
  return out;
}

std::string_view date_form_text(DateForm f) { return kDateFormText[static_cast<int>(f)]; }
std::string_view clock_form_text(ClockForm f) { return kClockFormText[static_cast<int>(f)]; }

bool read_uint(std::string_view s, int& v, std::size_t max_digits) {
  if (s.empty() || s.size() > max_digits) return false;
  v = 0;
  for (char c : s) {
    if (c < '0' || c > '9') return false;
    v = v * 10 + (c - '0');
  }
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

bool parse_clock(std::string_view s, int& minute_of_day, ClockForm& form) {
  // Fractional seconds, if any, must be zero too ("13:00:00.000").
  // A short field: a plain scan, not a library call.
  if (const auto dot = std::find(s.begin(), s.end(), '.'); dot != s.end()) {
    const std::string_view frac(dot + 1, s.end());
    if (!all_digits(frac) || frac.find_first_not_of('0') != std::string_view::npos) return false;
    s = std::string_view(s.begin(), dot);
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
    rest = text::trim(s.substr(sep + 1));
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
         parse_clock(text::trim(rest), st.minute, form.clock);
}

Stamp minutes_earlier(Stamp s, int minutes) {
  s.minute -= minutes;
  if (s.minute >= 0) return s;
  s.minute += 1440;
  if (--s.day < 1) {
    if (--s.month < 1) s.month = 12, s.year = s.year > 0 ? s.year - 1 : 0;
    // Year 0 (a stamp without its year) is a leap year of the proleptic calendar.
    s.day = calendar::days_in_month(std::chrono::year{s.year},
                                    std::chrono::month{static_cast<unsigned>(s.month)});
  }
  return s;
}

StampFault StampReader::read(const std::vector<std::string_view>& f, Stamp& st, Zone& zone,
                             StampForm& form) {
  const auto field = [&](int c) {
    return c < static_cast<int>(f.size()) ? f[static_cast<std::size_t>(c)] : std::string_view();
  };
  if (time_.stamp >= 0) {
    if (!parse_stamp(field(time_.stamp), day_first_, st, zone, form, cache_))
      return {time_.stamp,
              "a date and time such as 2019-07-01T13:00, 2019-07-01 13:00:00Z, "
              "07/01/2019 13:00 or 20190701:1300"};
    return {};
  }
  zone = {};
  if (time_.date >= 0) {
    if (!parse_date(field(time_.date), day_first_, st, form.date, cache_))
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

std::string StampReader::format_text(const StampForm& f, const Zone& z) const {
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

// --- 4. Columns with units -----------------------------------------------------------------

std::span<const UnitSpelling> unit_spellings() { return kUnits; }

const UnitSpelling* find_unit(Kind kind, std::string_view text) {
  const std::string key = unit_key(text);
  if (key.empty()) return nullptr;
  for (const UnitSpelling& u : kUnits)
    if (u.kind == kind && in_list(u.spellings, key)) return &u;
  return nullptr;
}

bool is_any_unit(std::string_view text) {
  const std::string key = unit_key(text);
  for (const UnitSpelling& u : kUnits)
    if (in_list(u.spellings, key)) return true;
  return false;
}

std::string allowed_units(Kind kind) {
  std::string out;
  for (const UnitSpelling& u : kUnits) {
    if (u.kind != kind) continue;
    if (!out.empty()) out += ", ";
    out += u.help;
  }
  return out;
}

std::string_view first_unit(Kind kind) {
  for (const UnitSpelling& u : kUnits)
    if (u.kind == kind) return u.help;
  return "";
}

Conversion conversion(const UnitSpelling& u) {
  if (u.canonical.empty()) return {1.0, 0.0, u.label};
  const auto at = [&](const char* number) {
    return units::parse(u.kind, std::string(number) + std::string(u.canonical), units::System::si,
                        "unit spelling table");
  };
  const double zero = at("0");
  return {at("1") - zero, zero, u.label};
}

Cell read_cell(std::string_view s, bool decimal_comma, double& v, bool& used_comma,
               Decimal& digits) {
  digits = {};
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
  if (fast_decimal(n, v, digits)) return is_sentinel(v) ? Cell::sentinel : Cell::ok;
  const auto r = std::from_chars(n.data(), n.data() + n.size(), v);
  if (r.ec == std::errc() && r.ptr == n.data() + n.size()) {
    if (std::isnan(v)) return Cell::marker;
    if (std::isinf(v)) return Cell::not_number;
    return is_sentinel(v) ? Cell::sentinel : Cell::ok;
  }
  for (std::string_view w : kMissingWords)
    if (text::iequals(s, w)) return Cell::marker;
  return Cell::not_number;
}

Cell read_cell(std::string_view s, bool decimal_comma, double& v, bool& used_comma) {
  Decimal digits;
  return read_cell(s, decimal_comma, v, used_comma, digits);
}

bool read_number(std::string_view s, double& v) {
  if (!s.empty() && s.front() == '+') s.remove_prefix(1);
  Decimal digits;
  if (fast_decimal(s, v, digits)) return true;
  const auto r = std::from_chars(s.data(), s.data() + s.size(), v);
  return r.ec == std::errc() && r.ptr == s.data() + s.size() && std::isfinite(v);
}

// --- 5. Series -----------------------------------------------------------------------------

double median(std::vector<double>& values) {
  const auto mid = values.begin() + static_cast<std::ptrdiff_t>(values.size() / 2);
  std::nth_element(values.begin(), mid, values.end());
  return *mid;
}

}  // namespace limitline::timeseries
