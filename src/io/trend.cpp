#include <limitline/io/trend.hpp>

#include <limitline/io/input_file.hpp>

#include <limitline/io/csv.hpp>
#include <limitline/error.hpp>
#include <limitline/io/unit_file.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <charconv>
#include <cmath>
#include <fstream>
#include <map>
#include <sstream>

namespace limitline::trend {
namespace {

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
  double lo, hi;          // every sample
  double median_lo, median_hi;  // the median of the column (indoor air is held near comfort)
};
constexpr Plausible kPlausible[kChannelCount] = {
    {-60, 60, -60, 60},  // outdoor dry-bulb
    {0, 0, 0, 0},        {-70, 40, -70, 40},  // outdoor dew point
    {0, 50, 10, 35},     // return
    {0, 0, 0, 0},        {-40, 35, -40, 35},  // return dew point
    {-40, 60, 0, 40},    // mixed air
    {0, 60, 5, 40},      // supply air
    {0, 0, 0, 0},        {0, 0, 0, 0},        {0, 0, 0, 0}};

std::string lower(std::string_view s) {
  std::string out(s);
  for (char& c : out) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return out;
}

std::vector<std::string> words(std::string_view header) {
  std::vector<std::string> out;
  std::string cur;
  for (char ch : lower(header)) {
    if (std::isalnum(static_cast<unsigned char>(ch))) cur += ch;
    else if (!cur.empty()) out.push_back(std::exchange(cur, {}));
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
    if (has_word(w, {"oa", "outdoor", "outside", "osa", "ambient"})) loc = 'o';
    else if (has_word(w, {"ra", "return"})) loc = 'r';
    else if (has_word(w, {"ma", "mixed", "mix"})) loc = 'm';
    else if (has_word(w, {"sa", "supply", "discharge", "da"})) loc = 's';
  }
  const bool damper = has_word(w, {"damper", "dmpr", "dpr"});
  if (damper) return Channel::damper;
  if (has_word(w, {"fan", "sf"}) && !has_word(w, {"speed", "vfd", "hz"})) return Channel::fan;
  if (has_word(w, {"cooling", "clg", "compressor", "comp", "dx", "cool"}))
    return Channel::cooling;
  if (!qty) {
    if (has_word(w, {"dew", "dewpoint", "dp"})) qty = 'd';
    else if (has_word(w, {"rh", "humidity", "hum"})) qty = 'h';
    else if (has_word(w, {"temp", "temperature", "t", "db", "drybulb", "dry"})) qty = 't';
    else if (loc == 'm' || loc == 's') qty = 't';  // "Mixed Air", "Supply Air"
  }
  switch (loc) {
    case 'o':
      return qty == 'h' ? Channel::outdoor_rh
             : qty == 'd' ? Channel::outdoor_dew_point
             : qty == 't' ? std::optional(Channel::outdoor_dry_bulb) : std::nullopt;
    case 'r':
      return qty == 'h' ? Channel::return_rh
             : qty == 'd' ? Channel::return_dew_point
             : qty == 't' ? std::optional(Channel::return_dry_bulb) : std::nullopt;
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

// The unit a header names: "°F", "degF", "(F)", "[°C]", "%". Empty when none.
std::string unit_from_header(std::string_view header) {
  const std::string h = lower(header);
  if (h.find("°f") != std::string::npos || h.find("degf") != std::string::npos ||
      h.find("deg f") != std::string::npos)
    return "F";
  if (h.find("°c") != std::string::npos || h.find("degc") != std::string::npos ||
      h.find("deg c") != std::string::npos)
    return "C";
  if (h.find('%') != std::string::npos || has_word(words(h), {"pct", "percent"})) return "%";
  const auto w = words(h);
  if (has_word(w, {"f"})) return "F";
  if (has_word(w, {"c"})) return "C";
  return {};
}

std::string normalise_unit(std::string_view u, std::string_view origin) {
  const std::string l = lower(u);
  if (l == "f" || l == "°f" || l == "degf") return "F";
  if (l == "c" || l == "°c" || l == "degc") return "C";
  if (l == "%" || l == "percent" || l == "pct") return "%";
  if (l == "fraction") return "fraction";
  throw InputError(fmt::format("{}: unit {} is not one of F, C, %, fraction", origin, echo(u)));
}

std::optional<bool> parse_status(std::string_view t) {
  const std::string l = lower(t);
  static constexpr std::string_view on[] = {"on", "1", "true", "run", "running", "yes", "active", "start", "occupied"};
  static constexpr std::string_view off[] = {"off", "0", "false", "stop", "stopped", "no", "inactive", "unoccupied"};
  for (auto s : on)
    if (l == s) return true;
  for (auto s : off)
    if (l == s) return false;
  return std::nullopt;
}

bool parse_double(std::string_view t, double& v) {
  if (!t.empty() && t.front() == '+') t.remove_prefix(1);
  const auto r = std::from_chars(t.data(), t.data() + t.size(), v);
  return r.ec == std::errc() && r.ptr == t.data() + t.size() && std::isfinite(v);
}

// Days from 1970-01-01 to a civil date (proleptic Gregorian).
std::int64_t days_from_civil(int y, int m, int d) {
  y -= m <= 2;
  const int era = (y >= 0 ? y : y - 399) / 400;
  const int yoe = y - era * 400;
  const int doy = (153 * (m + (m > 2 ? -3 : 9)) + 2) / 5 + d - 1;
  const int doe = yoe * 365 + yoe / 4 - yoe / 100 + doy;
  return static_cast<std::int64_t>(era) * 146097 + doe - 719468;
}

int days_in_month(int y, int m) {
  static constexpr int kDays[] = {31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31};
  const bool leap = (y % 4 == 0 && y % 100 != 0) || y % 400 == 0;
  return m == 2 && leap ? 29 : kDays[m - 1];
}

// Reads digits from `s` at `i`; false when there are none or more than `max`.
bool digits(std::string_view s, std::size_t& i, int max, int& out) {
  std::size_t n = 0;
  out = 0;
  while (i < s.size() && std::isdigit(static_cast<unsigned char>(s[i])) && n < static_cast<std::size_t>(max))
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

// The time stamp in `text`, or none when it is not one of the accepted forms.
std::optional<std::int64_t> read_timestamp(std::string_view text) {
  std::string_view s = text;
  while (!s.empty() && s.back() == ' ') s.remove_suffix(1);
  std::size_t i = 0;
  int a = 0, b = 0, c = 0, y, mo, d;
  if (!digits(s, i, 4, a)) return std::nullopt;
  const std::size_t first_len = i;
  if (i < s.size() && (s[i] == '-' || s[i] == '/') && first_len == 4) {
    const char sep = s[i++];
    if (!digits(s, i, 2, b) || !expect(s, i, sep) || !digits(s, i, 2, c)) return std::nullopt;
    y = a, mo = b, d = c;
  } else if (expect(s, i, '/')) {
    if (!digits(s, i, 2, b) || !expect(s, i, '/') || !digits(s, i, 4, c) || c < 1000) return std::nullopt;
    y = c, mo = a, d = b;
  } else {
    return std::nullopt;
  }
  if (mo < 1 || mo > 12 || d < 1 || d > days_in_month(y, mo)) return std::nullopt;
  int hh = 0, mm = 0, ss = 0;
  if (i < s.size()) {
    if (s[i] != 'T' && s[i] != ' ') return std::nullopt;
    while (i < s.size() && (s[i] == 'T' || s[i] == ' ')) ++i;
    if (!digits(s, i, 2, hh) || !expect(s, i, ':') || !digits(s, i, 2, mm)) return std::nullopt;
    if (expect(s, i, ':') && !digits(s, i, 2, ss)) return std::nullopt;
    if (expect(s, i, '.')) {
      int frac;
      if (!digits(s, i, 9, frac)) return std::nullopt;
    }
    while (i < s.size() && s[i] == ' ') ++i;
    std::int64_t offset_s = 0;
    const std::string rest = lower(s.substr(i));
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
    return days_from_civil(y, mo, d) * 86400 + hh * 3600 + mm * 60 + ss - offset_s;
  }
  return days_from_civil(y, mo, d) * 86400;
}

}  // namespace

std::int64_t parse_timestamp(std::string_view text, std::string_view origin) {
  if (const auto t = read_timestamp(text)) return *t;
  throw InputError(fmt::format(
      "{}: {} is not a time stamp (allowed: YYYY-MM-DD HH:MM[:SS], ISO 8601 with T and Z or "
      "±HH:MM up to ±14:00, MM/DD/YYYY HH:MM[:SS][ AM|PM], YYYY/MM/DD HH:MM[:SS])",
      origin, echo(text)));
}

std::string format_timestamp(std::int64_t t) {
  std::int64_t days = t >= 0 ? t / 86400 : (t - 86399) / 86400;
  const std::int64_t sec = t - days * 86400;
  // civil_from_days
  days += 719468;
  const std::int64_t era = (days >= 0 ? days : days - 146096) / 146097;
  const unsigned doe = static_cast<unsigned>(days - era * 146097);
  const unsigned yoe = (doe - doe / 1460 + doe / 36524 - doe / 146096) / 365;
  const std::int64_t y0 = static_cast<std::int64_t>(yoe) + era * 400;
  const unsigned doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
  const unsigned mp = (5 * doy + 2) / 153;
  const unsigned d = doy - (153 * mp + 2) / 5 + 1;
  const unsigned m = mp < 10 ? mp + 3 : mp - 9;
  const std::int64_t y = y0 + (m <= 2);
  return fmt::format("{:04}-{:02}-{:02} {:02}:{:02}", y, m, d, sec / 3600, sec % 3600 / 60);
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

// Cuts text arriving in pieces into lines ending in LF, CR LF or a lone CR, and drops a UTF-8
// byte-order mark at the very start. A line wholly inside a piece is passed as a view of it;
// only a line cut by the end of a piece is copied.
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
      const std::size_t end = piece.find_first_of("\r\n");
      if (end == std::string_view::npos) {
        partial_.append(piece);
        return;
      }
      const bool cr = piece[end] == '\r';
      if (partial_.empty()) {
        on_line(piece.substr(0, end));
      } else {
        partial_.append(piece.substr(0, end));
        on_line(std::string_view(partial_));
        partial_.clear();
      }
      piece.remove_prefix(end + 1);
      if (cr) {
        if (piece.empty()) after_cr_ = true;
        else if (piece.front() == '\n') piece.remove_prefix(1);
      }
    }
  }

  static constexpr std::string_view kBom = "\xEF\xBB\xBF";  // UTF-8 byte-order mark
  std::string partial_;
  std::string head_;  // the first bytes, until they are known not to be a mark
  bool at_start_ = true;
  bool after_cr_ = false;
};

// A year of one-minute samples of a dozen points is about 60 MB.
constexpr std::uintmax_t kMaxTrendLogBytes = std::uintmax_t{1} << 30;

bool blank(std::string_view s) {
  for (char c : s)
    if (!std::isspace(static_cast<unsigned char>(c))) return false;
  return true;
}

// Reads the log line by line: the header search, the column mapping, then each row checked
// and stored as it comes, so that nothing but the samples is kept.
class Reader {
 public:
  Reader(std::string_view name, const ReadOptions& options) : options_(options) {
    log_.path = std::string(name);
  }

  void line(std::string_view text) {
    ++number_;
    if (text.empty() || text[0] == '#' || (header_line_ > 0 && blank(text))) return;
    if (header_line_ == 0) find_header(text);
    else row(text);
  }

  TrendLog finish();

 private:
  std::string where() const { return fmt::format("{}:{}", log_.path, number_); }
  std::string where_header() const { return fmt::format("{}:{}", log_.path, header_line_); }
  void find_header(std::string_view text);
  void map_columns();
  void row(std::string_view text);
  double reading(std::size_t k, std::string_view t) const;

  const ReadOptions& options_;
  TrendLog log_;
  int number_ = 0;       // the line being read
  int header_line_ = 0;  // 0 until the header is found
  char delim_ = ',';
  std::vector<std::string> header_;
  int ts_col_ = -1, date_col_ = -1, time_col_ = -1;
  std::array<int, kChannelCount> col_{};
  std::array<std::string, kChannelCount> unit_;
  std::array<double, kChannelCount> last_{};  // the previous sample's readings (NaN: none)
};

void Reader::find_header(std::string_view text) {
  const char delim = csv::guess_delimiter(text);
  auto fields = csv::split_line(text, delim);
  bool time = false;
  for (const auto& h : fields) time = time || time_role(h) != TimeRole::none;
  if (!time) return;  // an export preamble
  header_line_ = number_;
  delim_ = delim;
  header_ = std::move(fields);
  map_columns();
}

void Reader::map_columns() {
  const auto& header = header_;
  for (std::size_t c = 0; c < header.size(); ++c) {
    switch (time_role(header[c])) {
      case TimeRole::timestamp: if (ts_col_ < 0) ts_col_ = static_cast<int>(c); break;
      case TimeRole::date: if (date_col_ < 0) date_col_ = static_cast<int>(c); break;
      case TimeRole::time: if (time_col_ < 0) time_col_ = static_cast<int>(c); break;
      default: break;
    }
  }
  if (ts_col_ < 0 && date_col_ >= 0 && time_col_ < 0) ts_col_ = date_col_, date_col_ = -1;
  if (ts_col_ < 0 && (date_col_ < 0 || time_col_ < 0))
    throw InputError(fmt::format("{}: a 'Time' column needs a 'Date' column beside it", where_header()));

  // Channel → column, overrides first.
  col_.fill(-1);
  std::array<bool, kChannelCount> overridden{};
  for (const auto& o : options_.columns) {
    int found = -1;
    for (std::size_t c = 0; c < header.size(); ++c)
      if (header[c] == o.header) found = static_cast<int>(c);
    if (found < 0)
      throw InputError(fmt::format("--column {}={}: the header ({}) has no column {}",
                                   channel_name(o.channel), echo(o.header), where_header(), echo(o.header)));
    const auto k = static_cast<std::size_t>(o.channel);
    col_[k] = found;
    unit_[k] = o.unit;
    overridden[k] = true;
  }
  for (std::size_t c = 0; c < header.size(); ++c) {
    if (static_cast<int>(c) == ts_col_ || static_cast<int>(c) == date_col_ || static_cast<int>(c) == time_col_)
      continue;
    if (std::find(col_.begin(), col_.end(), static_cast<int>(c)) != col_.end()) continue;
    const auto ch = channel_from_header(header[c]);
    if (!ch) continue;
    const auto k = static_cast<std::size_t>(*ch);
    if (overridden[k]) continue;
    if (col_[k] >= 0)
      throw InputError(fmt::format(
          "{}: columns {} and {} both look like {}; choose one with --column {}=HEADER",
          where_header(), echo(header[static_cast<std::size_t>(col_[k])]), echo(header[c]),
          channel_name(*ch), channel_name(*ch)));
    col_[k] = static_cast<int>(c);
  }
  bool any = false;
  for (int c : col_) any = any || c >= 0;
  if (!any)
    throw InputError(fmt::format("{}: no trend column recognised (e.g. 'OA Temp (°F)', 'RA RH "
                                 "(%)', 'MAT', 'OA Damper Cmd (%)', 'SF Status'); set them with "
                                 "--column QUANTITY=HEADER[:UNIT]",
                                 where_header()));

  // Units: override, else header, else the bare system (temperatures) or % (percent points).
  for (std::size_t k = 0; k < kChannelCount; ++k) {
    if (col_[k] < 0) continue;
    const auto ch = static_cast<Channel>(k);
    const std::string& h = header[static_cast<std::size_t>(col_[k])];
    ColumnUse use{ch, h, {}, overridden[k], {}};
    std::string u = unit_[k].empty() ? unit_from_header(h) : unit_[k];
    switch (channel_kind(ch)) {
      case Kind::temperature:
        if (u == "%" || u == "fraction")
          throw InputError(fmt::format("{}: column {} ({}) is a temperature; its unit must be F or C",
                                       where_header(), echo(h), channel_name(ch)));
        if (u.empty()) {
          u = options_.bare == units::System::ip ? "F" : "C";
          use.note = fmt::format("no unit in the header: read in °{} (--units)", u);
        }
        use.unit = u == "F" ? "°F" : "°C";
        break;
      case Kind::percent:
        if (u == "F" || u == "C")
          throw InputError(fmt::format("{}: column {} ({}) is a percentage, not a temperature",
                                       where_header(), echo(h), channel_name(ch)));
        use.unit = u.empty() ? "%" : u;
        if (u.empty()) use.note = "no unit in the header: read in %";
        break;
      case Kind::status: use.unit = "on/off"; break;
    }
    unit_[k] = u.empty() && channel_kind(ch) == Kind::percent ? "%" : u;
    log_.columns.push_back(use);
  }
  last_.fill(std::nan(""));
}

// The value of channel `k` in the cell `t` (not empty), in the log's storage units: °C,
// fractions, 1/0 for on/off.
double Reader::reading(std::size_t k, std::string_view t) const {
  const auto ch = static_cast<Channel>(k);
  const std::string& h = header_[static_cast<std::size_t>(col_[k])];
  double v;
  if (channel_kind(ch) == Kind::status) {
    if (auto st = parse_status(t)) return *st ? 1.0 : 0.0;
    if (parse_double(t, v) && v >= 0 && v <= 100 && ch == Channel::cooling)
      return v > 0 ? 1.0 : 0.0;  // a valve or compressor signal: on when above zero
    throw InputError(fmt::format("{}: {} {} in column {} is not a status (allowed: on/off, 1/0, "
                                 "true/false, run/stop{})",
                                 where(), channel_name(ch), echo(t), echo(h),
                                 ch == Channel::cooling ? ", or a signal 0–100 %" : ""));
  }
  if (!parse_double(t, v))
    throw InputError(fmt::format("{}: {} {} in column {} is not a number", where(),
                                 channel_name(ch), echo(t), echo(h)));
  if (channel_kind(ch) == Kind::percent) {
    const bool fraction = unit_[k] == "fraction";
    if (v < 0 || v > (fraction ? 1.0 : 100.0))
      throw InputError(fmt::format("{}: {} {} in column {} is outside 0–{}", where(),
                                   channel_name(ch), echo(t), echo(h),
                                   fraction ? "1 (fraction)" : "100 %"));
    return fraction ? v : v / 100.0;
  }
  const double c = unit_[k] == "F" ? units::celsius_from_fahrenheit(v) : v;
  const auto& p = kPlausible[k];
  if (c < p.lo || c > p.hi)
    throw InputError(fmt::format(
        "{}: {} {} in column {} read in °{} is {:.1f} °C, outside the plausible {:.0f} to "
        "{:.0f} °C; is the column's unit right? (set it with --column {}=HEADER:F or :C)",
        where(), channel_name(ch), echo(t), echo(h), unit_[k], c, p.lo, p.hi, channel_name(ch)));
  return c;
}

void Reader::row(std::string_view text) {
  const auto cells = csv::split_line(text, delim_);
  // An export may end every row with a delimiter: empty fields past the header's are no field.
  std::size_t used = cells.size();
  while (used > header_.size() && cells[used - 1].empty()) --used;
  if (used != header_.size())
    throw InputError(fmt::format("{}: the row has {} fields but the header (line {}) has {}; "
                                 "allowed: one value per header column",
                                 where(), used, header_line_, header_.size()));
  auto cell = [&](int c) -> std::string_view {
    return c >= 0 ? std::string_view(cells[static_cast<std::size_t>(c)]) : std::string_view();
  };
  const std::string joined = ts_col_ >= 0 ? std::string()
                                          : std::string(cell(date_col_)) + " " + std::string(cell(time_col_));
  const std::string_view stamp = ts_col_ >= 0 ? cell(ts_col_) : std::string_view(joined);
  const auto read = read_timestamp(stamp);
  const std::int64_t t = read ? *read : parse_timestamp(stamp, fmt::format("{}: time", where()));
  std::array<double, kChannelCount> v;
  v.fill(std::nan(""));
  for (std::size_t k = 0; k < kChannelCount; ++k)
    if (col_[k] >= 0 && !cell(col_[k]).empty()) v[k] = reading(k, cell(col_[k]));

  if (!log_.time_s.empty()) {
    const std::int64_t prev = log_.time_s.back();
    if (t < prev)
      throw InputError(fmt::format(
          "{}: time {} is before the previous sample's {} (line {}); sort the log by time",
          where(), format_timestamp(t), format_timestamp(prev), log_.line.back()));
    if (t == prev) {
      // A row's identity is its readings, not the spelling of its time cell.
      for (std::size_t k = 0; k < kChannelCount; ++k)
        if (!(v[k] == last_[k] || (std::isnan(v[k]) && std::isnan(last_[k]))))
          throw InputError(fmt::format("{}: time {} repeats line {} with different readings; "
                                       "remove one of them",
                                       where(), format_timestamp(t), log_.line.back()));
      ++log_.coverage.duplicate_rows;
      return;
    }
  }
  log_.time_s.push_back(t);
  log_.line.push_back(number_);
  for (std::size_t k = 0; k < kChannelCount; ++k) {
    if (col_[k] < 0) continue;
    if (channel_kind(static_cast<Channel>(k)) == Kind::status)
      log_.state[k].push_back(std::isnan(v[k]) ? std::int8_t{-1} : static_cast<std::int8_t>(v[k] > 0.5));
    else
      log_.number[k].push_back(v[k]);
  }
  last_ = v;
}

TrendLog Reader::finish() {
  const auto& name = log_.path;
  if (header_line_ == 0)
    throw InputError(fmt::format("{}: no header line with a time column (a header such as "
                                 "'Timestamp', 'Date/Time', or 'Date' and 'Time')", name));
  if (log_.time_s.empty()) throw InputError(fmt::format("{}: no samples after the header", where_header()));

  // Column medians: indoor air far from comfort means the unit is not the header's.
  std::vector<double> v;
  for (std::size_t k = 0; k < kChannelCount; ++k) {
    if (col_[k] < 0 || channel_kind(static_cast<Channel>(k)) != Kind::temperature) continue;
    v.clear();
    for (double x : log_.number[k])
      if (!std::isnan(x)) v.push_back(x);
    if (v.empty()) continue;
    std::nth_element(v.begin(), v.begin() + static_cast<long>(v.size() / 2), v.end());
    const double med = v[v.size() / 2];
    const auto& p = kPlausible[k];
    if (med < p.median_lo || med > p.median_hi)
      throw InputError(fmt::format(
          "{}: column {} ({}) read in °{} has a median of {:.1f} °C, outside the plausible "
          "{:.0f} to {:.0f} °C; is the column's unit right? (set it with --column {}=HEADER:F or :C)",
          where_header(), echo(header_[static_cast<std::size_t>(col_[k])]),
          channel_name(static_cast<Channel>(k)), unit_[k], med, p.median_lo, p.median_hi,
          channel_name(static_cast<Channel>(k))));
  }

  // Weights: the median interval, the cap, and the gaps beyond it.
  auto& cov = log_.coverage;
  const auto& t = log_.time_s;
  const std::size_t n = t.size();
  cov.rows = static_cast<int>(n);
  cov.first_s = t.front();
  cov.last_s = t.back();
  if (n < 2) throw InputError(fmt::format("{}: one sample only; an audit needs a series", name));
  v.resize(n - 1);
  for (std::size_t i = 1; i < n; ++i) v[i - 1] = static_cast<double>(t[i] - t[i - 1]);
  std::nth_element(v.begin(), v.begin() + static_cast<long>(v.size() / 2), v.end());
  cov.median_interval_s = v[v.size() / 2];
  std::vector<double>().swap(v);
  if (options_.max_gap_s && !(*options_.max_gap_s > 0 && *options_.max_gap_s <= kMaxGapLimitS))
    throw InputError(fmt::format("--max-gap: {} is outside the allowed more than 0 to {:.0f} min "
                                 "(a year)",
                                 std::isfinite(*options_.max_gap_s)
                                     ? fmt::format("{:.6g} min", *options_.max_gap_s / 60.0)
                                     : std::string("a time beyond any bound"),
                                 kMaxGapLimitS / 60.0));
  cov.max_gap_s = options_.max_gap_s ? *options_.max_gap_s : 2.0 * cov.median_interval_s;
  for (std::size_t i = 0; i < n; ++i) {
    if (i + 1 < n && static_cast<double>(t[i + 1] - t[i]) > cov.max_gap_s) cov.gaps.push_back({t[i], t[i + 1]});
    cov.covered_s += log_.weight_s(i);
  }
  cov.span_s = static_cast<double>(cov.last_s - cov.first_s) + log_.weight_s(n - 1);
  return std::move(log_);
}

}  // namespace

TrendLog parse_trend(std::string_view text, std::string_view name, const ReadOptions& options) {
  Reader reader(name, options);
  LineSplitter lines;
  const auto on_line = [&](std::string_view l) { reader.line(l); };
  lines.feed(text, on_line);
  lines.finish(on_line);
  return reader.finish();
}

TrendLog load_trend(const std::string& path, const ReadOptions& options) {
  Reader reader(path, options);
  LineSplitter lines;
  const auto on_line = [&](std::string_view l) { reader.line(l); };
  read_input_pieces(path, "the trend log", kMaxTrendLogBytes,
                    [&](std::string_view piece) { lines.feed(piece, on_line); });
  lines.finish(on_line);
  return reader.finish();
}

}  // namespace limitline::trend
