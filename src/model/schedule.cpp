#include <limitline/model/schedule.hpp>

#include <fmt/format.h>

#include <algorithm>

namespace limitline {
namespace {

constexpr std::array<std::string_view, 7> kDayNames = {
    "Monday", "Tuesday", "Wednesday", "Thursday", "Friday", "Saturday", "Sunday"};

std::string clock(int minutes) { return fmt::format("{:02}:{:02}", minutes / 60, minutes % 60); }

}  // namespace

std::string_view weekday_name(int weekday) {
  return kDayNames[static_cast<std::size_t>(((weekday % 7) + 7) % 7)];
}

double Schedule::occupied_share(int day_of_year, int month, int day, int start_min,
                                int length_min) const {
  if (always) return 1.0;
  if (length_min <= 0) return 0.0;
  for (auto [m, d] : holidays)
    if (m == month && d == day) return 0.0;
  const int end = start_min + length_min;
  int covered = 0;
  for (const Period& p : week[static_cast<std::size_t>(weekday(day_of_year))])
    covered += std::max(0, std::min(end, p.end_min) - std::max(start_min, p.start_min));
  return static_cast<double>(covered) / length_min;
}

double Schedule::weekly_hours() const {
  if (always) return 168.0;
  int minutes = 0;
  for (const auto& day : week)
    for (const Period& p : day) minutes += p.end_min - p.start_min;
  return minutes / 60.0;
}

std::string Schedule::describe() const {
  if (always) return "always occupied (fan on every hour)";
  std::string out;
  // Group consecutive days with identical periods: "Mon-Fri 06:00-19:00".
  auto periods_text = [](const std::vector<Period>& ps) {
    if (ps.empty()) return std::string("off");
    std::string s;
    for (const Period& p : ps)
      s += (s.empty() ? "" : ", ") + clock(p.start_min) + "-" + clock(p.end_min);
    return s;
  };
  for (std::size_t i = 0; i < 7;) {
    std::size_t j = i;
    while (j + 1 < 7 && periods_text(week[j + 1]) == periods_text(week[i])) ++j;
    const std::string days =
        i == j ? std::string(kDayNames[i].substr(0, 3))
               : fmt::format("{}-{}", kDayNames[i].substr(0, 3), kDayNames[j].substr(0, 3));
    out += (out.empty() ? "" : "; ") + days + " " + periods_text(week[i]);
    i = j + 1;
  }
  out += fmt::format(" ({:.0f} h a week", weekly_hours());
  if (!holidays.empty()) out += fmt::format(", {} holidays off", holidays.size());
  out += fmt::format("; 1 January taken as a {})", weekday_name(first_weekday));
  return out;
}

}  // namespace limitline
