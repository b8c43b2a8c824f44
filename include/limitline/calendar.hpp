#pragma once
// Dates of the Gregorian calendar, through the std::chrono calendar types, for every reader
// that checks a date written as numbers. Each takes ints as parsed and range-checks them
// before they reach a chrono type (whose constructors keep only the low bits of a value).
#include <chrono>

namespace limitline::calendar {

// The days of month `m` in year `y`: 28 to 31.
[[nodiscard]] constexpr int days_in_month(std::chrono::year y, std::chrono::month m) {
  return static_cast<int>(static_cast<unsigned>(
      std::chrono::year_month_day_last{y, std::chrono::month_day_last{m}}.day()));
}

// The most days month `m` has in any year (29 for February): for dates written without a
// year, such as a holiday "02-29" or a typical-year file's stamps.
[[nodiscard]] constexpr int max_days_in_month(std::chrono::month m) {
  return days_in_month(std::chrono::year{2000}, m);  // a leap year
}

// True when month/day is a date of some year (February 29 included).
[[nodiscard]] constexpr bool is_date(int month, int day) {
  return month >= 1 && month <= 12 && day >= 1 &&
         day <= max_days_in_month(std::chrono::month{static_cast<unsigned>(month)});
}

// True when year-month-day is a date of the proleptic Gregorian calendar (year 0 is 1 BC, a
// leap year), for any year std::chrono::year holds (-32767 to 32767).
[[nodiscard]] constexpr bool is_date(int year, int month, int day) {
  return year >= static_cast<int>(std::chrono::year::min()) &&
         year <= static_cast<int>(std::chrono::year::max()) && month >= 1 && month <= 12 &&
         day >= 1 &&
         day <= days_in_month(std::chrono::year{year},
                              std::chrono::month{static_cast<unsigned>(month)});
}

}  // namespace limitline::calendar
