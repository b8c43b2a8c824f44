// Gregorian dates: month lengths, leap years and dates written without a year. The rule
// checked is the Gregorian calendar's as ISO 8601-1:2019 §4.3 adopts it (every fourth year a
// leap year, except centuries not divisible by 400; from memory), and the month lengths are
// those of the same calendar.
#include <doctest/doctest.h>

#include <limitline/calendar.hpp>

#include <chrono>

namespace calendar = limitline::calendar;
using namespace std::chrono;

TEST_CASE("months have their Gregorian lengths") {
  constexpr int kLengths[] = {31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31};
  for (unsigned m = 1; m <= 12; ++m) {
    INFO("month ", m);
    CHECK(calendar::days_in_month(year{2023}, month{m}) == kLengths[m - 1]);
    CHECK(calendar::max_days_in_month(month{m}) == (m == 2 ? 29 : kLengths[m - 1]));
  }
}

TEST_CASE("February has 29 days in leap years only") {
  CHECK(calendar::days_in_month(year{2024}, February) == 29);  // divisible by 4
  CHECK(calendar::days_in_month(year{1900}, February) == 28);  // a century not by 400
  CHECK(calendar::days_in_month(year{2000}, February) == 29);  // divisible by 400
  CHECK(calendar::days_in_month(year{2100}, February) == 28);
  static_assert(calendar::days_in_month(year{1996}, February) == 29);
}

TEST_CASE("a date without a year may be February 29") {
  CHECK(calendar::is_date(2, 29));
  CHECK_FALSE(calendar::is_date(2, 30));
  CHECK(calendar::is_date(12, 31));
  CHECK_FALSE(calendar::is_date(4, 31));
  SUBCASE("numbers out of range are no date, whatever their low bits") {
    CHECK_FALSE(calendar::is_date(0, 1));
    CHECK_FALSE(calendar::is_date(13, 1));
    CHECK_FALSE(calendar::is_date(257, 1));  // 257 would be month 1 in an unsigned char
    CHECK_FALSE(calendar::is_date(1, 0));
    CHECK_FALSE(calendar::is_date(-1, 1));
  }
}

TEST_CASE("a date with a year follows that year's February") {
  CHECK(calendar::is_date(2024, 2, 29));
  CHECK_FALSE(calendar::is_date(2023, 2, 29));
  CHECK_FALSE(calendar::is_date(1900, 2, 29));
  CHECK(calendar::is_date(2000, 2, 29));
  CHECK(calendar::is_date(0, 2, 29));  // year 0 (1 BC) is a leap year of the proleptic calendar
  CHECK_FALSE(calendar::is_date(2023, 6, 31));
  CHECK_FALSE(calendar::is_date(65537, 1, 1));  // beyond std::chrono::year, not wrapped to 1
}
