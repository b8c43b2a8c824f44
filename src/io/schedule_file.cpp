#include <limitline/io/schedule_file.hpp>

#include <limitline/calendar.hpp>
#include <limitline/error.hpp>
#include <limitline/text.hpp>
#include <limitline/io/detail/raw_table.hpp>

#include <fmt/format.h>
#include <toml++/toml.h>

#include <algorithm>
#include <charconv>

namespace limitline {
namespace {

constexpr std::array<std::string_view, 7> kDayKeys = {"mon", "tue", "wed", "thu",
                                                      "fri", "sat", "sun"};

int day_index(std::string_view key) {
  for (int i = 0; i < 7; ++i)
    if (kDayKeys[static_cast<std::size_t>(i)] == key) return i;
  return -1;
}

std::string where(std::string_view file, const toml::node& node, std::string_view key) {
  return fmt::format("{}:{}: [schedule] {}", file, node.source().begin.line, key);
}

int parse_clock(std::string_view s, const std::string& origin) {
  int h = -1, m = -1;
  const auto colon = s.find(':');
  bool ok = colon != std::string_view::npos;
  if (ok) {
    auto r1 = std::from_chars(s.data(), s.data() + colon, h);
    auto r2 = std::from_chars(s.data() + colon + 1, s.data() + s.size(), m);
    ok = r1.ec == std::errc() && r1.ptr == s.data() + colon && r2.ec == std::errc() &&
         r2.ptr == s.data() + s.size() && m >= 0 && m < 60 && h >= 0 &&
         (h < 24 || (h == 24 && m == 0));
  }
  if (!ok)
    throw InputError(
        fmt::format("{}: '{}' is not a time of day (HH:MM, 00:00 to 24:00)", origin, s));
  return h * 60 + m;
}

std::vector<Schedule::Period> parse_periods(std::string_view text, const std::string& origin) {
  std::vector<Schedule::Period> out;
  if (text::trim_spaces(text) == "off") return out;
  while (!text.empty()) {
    const auto comma = text.find(',');
    const std::string_view part = text::trim_spaces(text.substr(0, comma));
    text = comma == std::string_view::npos ? std::string_view{} : text.substr(comma + 1);
    const auto dash = part.find('-');
    if (dash == std::string_view::npos)
      throw InputError(fmt::format("{}: '{}' is not a period (HH:MM-HH:MM, or off)", origin, part));
    const int a = parse_clock(text::trim_spaces(part.substr(0, dash)), origin);
    const int b = parse_clock(text::trim_spaces(part.substr(dash + 1)), origin);
    if (b <= a)
      throw InputError(
          fmt::format("{}: period '{}' ends before it starts (periods may not "
                      "cross midnight; split them at 24:00)",
                      origin, part));
    out.push_back({a, b});
  }
  std::sort(out.begin(), out.end(), [](auto x, auto y) { return x.start_min < y.start_min; });
  for (std::size_t i = 1; i < out.size(); ++i)
    if (out[i].start_min < out[i - 1].end_min)
      throw InputError(fmt::format("{}: periods overlap", origin));
  return out;
}

}  // namespace

Schedule read_schedule(const RawTable& raw, std::string_view file) {
  const toml::table& table = detail::toml_table(raw);
  Schedule s;
  s.always = false;
  bool any_day = false, always_given = false;
  std::array<bool, 7> set{};
  for (const auto& [k, node] : table) {
    const std::string key(k.str());
    const std::string origin = where(file, node, key);
    if (key == "occupied") {
      const auto v = node.value<std::string>();
      if (!v || *v != "always")
        throw InputError(
            fmt::format("{}: must be \"always\" (or give weekly periods with day "
                        "keys such as mon-fri = \"06:00-19:00\")",
                        origin));
      always_given = true;
    } else if (key == "first_weekday") {
      const auto v = node.value<std::string>();
      int found = -1;
      for (int i = 0; v && i < 7; ++i) {
        std::string lower = std::string(weekday_name(i));
        lower[0] = static_cast<char>(lower[0] - 'A' + 'a');
        if (*v == lower || *v == kDayKeys[static_cast<std::size_t>(i)]) found = i;
      }
      if (found < 0)
        throw InputError(fmt::format("{}: must name a weekday (\"monday\" … \"sunday\")", origin));
      s.first_weekday = found;
    } else if (key == "holidays") {
      const toml::array* arr = node.as_array();
      if (!arr) throw InputError(fmt::format("{}: must be a list of \"MM-DD\" dates", origin));
      for (const auto& item : *arr) {
        const auto v = item.value<std::string>();
        int m = 0, d = 0;
        bool ok = v && v->size() == 5 && (*v)[2] == '-';
        if (ok) {
          ok = std::from_chars(v->data(), v->data() + 2, m).ec == std::errc() &&
               std::from_chars(v->data() + 3, v->data() + 5, d).ec == std::errc();
          ok = ok && calendar::is_date(m, d);  // a holiday has no year: 02-29 is allowed
        }
        if (!ok)
          throw InputError(fmt::format("{}: '{}' is not a date (\"MM-DD\", e.g. \"12-25\")", origin,
                                       v ? *v : std::string("?")));
        s.holidays.emplace_back(m, d);
      }
    } else {
      // Day keys: "mon", or a range "mon-fri".
      const auto dash = key.find('-');
      const int a = day_index(key.substr(0, dash));
      const int b = dash == std::string::npos ? a : day_index(key.substr(dash + 1));
      if (a < 0 || b < 0 || b < a)
        throw InputError(fmt::format(
            "{}: unknown key (allowed: occupied, first_weekday, holidays, and day keys mon … "
            "sun or ranges such as mon-fri)",
            origin));
      const auto v = node.value<std::string>();
      if (!v) throw InputError(fmt::format("{}: must be a string such as \"06:00-19:00\"", origin));
      const auto periods = parse_periods(*v, origin);
      for (int d = a; d <= b; ++d) {
        if (set[static_cast<std::size_t>(d)])
          throw InputError(
              fmt::format("{}: {} is already given by another key", origin, weekday_name(d)));
        set[static_cast<std::size_t>(d)] = true;
        s.week[static_cast<std::size_t>(d)] = periods;
      }
      any_day = true;
    }
  }
  if (always_given && (any_day || !s.holidays.empty()))
    throw InputError(
        fmt::format("{}: [schedule] occupied = \"always\" cannot be combined with "
                    "day periods or holidays",
                    file));
  if (!always_given && !any_day)
    throw InputError(
        fmt::format("{}: [schedule] gives no occupied periods (occupied = "
                    "\"always\", or day keys such as mon-fri = \"06:00-19:00\")",
                    file));
  s.always = always_given;
  return s;
}

}  // namespace limitline
