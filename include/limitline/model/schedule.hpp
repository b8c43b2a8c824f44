#pragma once
// When the supply fan runs: always, or weekly occupied periods with holidays.
//
// Typical-year weather has no real calendar, so weekdays follow a stated weekday for 1 January
// (Monday unless the unit file says otherwise) and the report says so.
#include <array>
#include <string>
#include <string_view>
#include <vector>

namespace limitline {

struct Schedule {
  struct Period {
    int start_min;  // minutes after midnight, inclusive
    int end_min;    // exclusive; 1440 for midnight at the end of the day
  };
  bool always = true;
  std::array<std::vector<Period>, 7> week;    // Monday = 0 … Sunday = 6
  std::vector<std::pair<int, int>> holidays;  // (month, day), fan off all day
  int first_weekday = 0;                      // weekday of 1 January, Monday = 0

  // Weekday of a 0-based day of the year.
  [[nodiscard]] int weekday(int day_of_year) const { return (first_weekday + day_of_year) % 7; }
  // Share of [start_min, start_min + length_min) of that day during which the fan runs, 0–1.
  [[nodiscard]] double occupied_share(int day_of_year, int month, int day, int start_min,
                                      int length_min) const;
  // Occupied hours in a week (for the report).
  [[nodiscard]] double weekly_hours() const;
  // One line for the report: "always occupied" or "Mon–Fri 06:00–19:00, Sat 08:00–13:00; …".
  [[nodiscard]] std::string describe() const;
};

[[nodiscard]] std::string_view weekday_name(int weekday);  // "Monday"

}  // namespace limitline
