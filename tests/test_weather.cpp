// Weather import: the two real open data sets of tests/data (sources in tests/data/SOURCES.md),
// checked row by row against their own text, and every layout, override and error path on
// small inline files. Inline files are layouts, not check values: where a number is checked it
// comes from a unit definition (NIST SP 811 conversion factors, from memory), from psychrolib
// 1.1.1 (npm, the version pinned in tests/crosscheck), or from the data set's own columns.
#include <doctest/doctest.h>

#include "support/derived_weather.hpp"
#include "support/input_error.hpp"

#include <limitline/model/psychro.hpp>
#include <limitline/io/weather.hpp>
#include <limitline/io/detail/raw_table.hpp>

#include <fmt/format.h>

#include <cmath>
#include <fstream>
#include <functional>
#include <sstream>
#include <string>
#include <vector>

namespace wx = limitline::weather;
namespace psy = limitline::psychro;
using limitline::InputError;

namespace {

const std::string kData = LIMITLINE_TEST_DATA_DIR;
const std::string kGreensboro = kData + "/greensboro-nc-tmy3.csv";
const std::string kPvgis = kData + "/pvgis-tmy-45n-8e.csv";

std::string slurp(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

std::vector<std::string> lines_of(const std::string& text) {
  std::vector<std::string> out;
  std::istringstream in(text);
  for (std::string l; std::getline(in, l);) out.push_back(l);
  return out;
}

// Plain comma split, independent of the reader's splitter.
std::vector<std::string> fields_of(const std::string& line) {
  std::vector<std::string> out(1);
  for (char c : line) {
    if (c == ',')
      out.emplace_back();
    else
      out.back() += c;
  }
  return out;
}

wx::WeatherSeries read(const std::string& csv, const wx::Mapping& m = {}, double site = 101.325) {
  return wx::read_text(csv, "t.csv", m, site);
}

// A bad-row policy for the small files below, where one bad row is a large share of the file:
// the share the policy may drop or fill is raised explicitly (the 1 % default has its own
// tests).
wx::Mapping policy(wx::BadRowPolicy p, double max_bad_share = 1.0) {
  wx::Mapping m;
  m.on_bad_row = p;
  m.max_bad_share = max_bad_share;
  m.max_bad_share_origin = "test";
  return m;
}

using limitline::test::error_of;

std::string read_error(const std::string& csv, const wx::Mapping& m = {}, double site = 101.325) {
  return error_of([&] { read(csv, m, site); });
}

bool has_line(const std::vector<std::string>& lines, const std::string& line) {
  for (const std::string& l : lines)
    if (l == line) return true;
  return false;
}

double rh_of(const wx::WeatherHour& h) {
  return psy::relative_humidity_from_humidity_ratio(h.dry_bulb_c, h.humidity_ratio, h.pressure_kpa);
}

constexpr const char* kMonths[] = {"Jan", "Feb", "Mar", "Apr", "May", "Jun",
                                   "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"};
constexpr int kDays[] = {31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31};

}  // namespace

// --- Real data: Greensboro TMY3 (NREL NSRDB TMY3 station 723170, via pvlib sample data) ----

TEST_CASE("Greensboro TMY3: layout, columns and units found") {
  const wx::WeatherSeries s = wx::read_file(kGreensboro, {}, 101.325);
  const wx::WeatherInfo& i = s.info;
  CHECK(s.hours.size() == 8760);  // TMY3: 8760 hourly rows (tests/data/SOURCES.md)
  CHECK(i.rows_read == 8760);
  CHECK(i.header_line == 2);  // the station line comes first
  CHECK(i.first_data_line == 3);
  CHECK(i.last_data_line == 8762);
  CHECK(i.delimiter == ',');
  REQUIRE(i.find(wx::Quantity::date));
  CHECK(i.find(wx::Quantity::date)->header == "Date (MM/DD/YYYY)");
  CHECK(i.find(wx::Quantity::time)->header == "Time (HH:MM)");
  CHECK(i.time.format == "MM/DD/YYYY + HH:MM");
  const wx::ColumnUse* dry = i.find(wx::Quantity::dry_bulb);
  REQUIRE(dry);
  CHECK(dry->header == "Dry-bulb (C)");
  CHECK(dry->unit == "°C");
  CHECK(dry->unit_found == wx::UnitFound::header);
  CHECK(dry->found == wx::ColumnFound::header_name);
  // Dew point is preferred over the RH column that is also present.
  CHECK(i.humidity == wx::HumiditySource::dew_point);
  CHECK(i.find(wx::Quantity::dew_point)->header == "Dew-point (C)");
  REQUIRE(i.unused_humidity.size() == 1);
  CHECK(i.unused_humidity[0].header == "RHum (%)");
  CHECK(i.pressure_from_file);
  CHECK(i.find(wx::Quantity::pressure)->header == "Pressure (mbar)");
  CHECK(i.find(wx::Quantity::pressure)->unit == "mbar");
  // Hour-ending 01:00..24:00 (SOURCES.md), read as hour-beginning.
  CHECK(i.time.hour_ending);
  CHECK(i.time.clock == wx::Clock::local);
  CHECK(i.time.step_min == 60);
  CHECK(i.time.weight_h == 1.0);
  CHECK(i.time.missing_steps == 0);
  // Each month from a different year, so not monotonic at month boundaries (SOURCES.md).
  CHECK(i.time.typical_year);
  CHECK(i.time.months_out_of_order);
  CHECK(i.time.leap_day_rows == 0);
  CHECK(i.skipped() + i.filled() + i.capped() == 0);
  for (int m = 0; m < 12; ++m) CHECK(i.months[m].rows == kDays[m] * 24);

  const std::vector<std::string> d = wx::describe(i);
  CHECK(d[0] ==
        "weather: greensboro-nc-tmy3.csv, 8760 rows (lines 3 to 8762; header on line "
        "2; delimiter ',')");
  CHECK(d[1] ==
        "time: 'Date (MM/DD/YYYY)' + 'Time (HH:MM)', MM/DD/YYYY + HH:MM, local clock; "
        "hour-ending stamps (24:00 present) read as hour-beginning hours 0-23");
  CHECK(has_line(d, "dry-bulb: column 'Dry-bulb (C)', °C (found by header)"));
  CHECK(has_line(d,
                 "humidity: dew point, column 'Dew-point (C)', °C (found by header); not "
                 "used: 'RHum (%)'"));
  CHECK(has_line(d, "pressure: column 'Pressure (mbar)', mbar (found by header)"));
  CHECK(has_line(d, "time step: 60 min, each row weighs 1 h"));
  CHECK(has_line(d, "bad rows: none (on_bad_row = error)"));
}

TEST_CASE("Greensboro TMY3: every row against the file text") {
  const std::string text = slurp(kGreensboro);
  const wx::WeatherSeries s = wx::read_text(text, "greensboro", {}, 101.325);
  const std::vector<std::string> lines = lines_of(text);
  REQUIRE(lines.size() == 8762);
  REQUIRE(s.hours.size() == 8760);
  double worst_dew = 0, weight = 0;
  int above_zero = 0, rh_disagree = 0;
  std::vector<int> month_year(13, 0);
  for (std::size_t r = 0; r < 8760; ++r) {
    const std::vector<std::string> f = fields_of(lines[r + 2]);
    const wx::WeatherHour& h = s.hours[r];
    const int month = std::stoi(f[0].substr(0, 2)), day = std::stoi(f[0].substr(3, 2));
    const int hh = std::stoi(f[1].substr(0, 2));
    month_year[month] = std::stoi(f[0].substr(6, 4));
    // Hour-ending HH:00 is the hour that began at HH-1.
    CHECK(h.month == month);
    CHECK(h.day == day);
    CHECK(h.hour == hh - 1);
    CHECK(h.weight_h == 1.0);
    CHECK(h.dry_bulb_c == doctest::Approx(std::stod(f[2])).epsilon(1e-12));
    CHECK(h.pressure_kpa == doctest::Approx(std::stod(f[5]) / 10.0).epsilon(1e-12));
    // The dew point comes back from the humidity ratio.
    const double dew = psy::dew_point_from_humidity_ratio_c(h.humidity_ratio, h.pressure_kpa);
    worst_dew = std::max(worst_dew, std::fabs(dew - std::stod(f[3])));
    // The data set's own RH column agrees with the state resolved from its dew point, where
    // the dew point is at or above 0 °C. (Below it the producer's RH fits a dew point over
    // water better than one over ice, which is what our psychrometrics reads below 0 °C.)
    // A few dozen hours of the data set disagree with their own dew point by more than
    // rounding: they are counted, not hidden.
    if (std::stod(f[3]) >= 0.0) {
      ++above_zero;
      if (std::fabs(rh_of(h) * 100.0 - std::stod(f[4])) > 1.5) ++rh_disagree;
    }
    weight += h.weight_h;
  }
  CHECK(worst_dew < 1e-6);
  CHECK(above_zero > 6000);
  CHECK(rh_disagree < above_zero / 100);  // under 1 % of those hours
  CHECK(weight == 8760.0);
  // The year each month comes from, as the file's dates say.
  for (int m = 1; m <= 12; ++m) CHECK(s.info.time.month_year[m - 1] == month_year[m]);
  CHECK(month_year[1] == 1988);  // 01/01/1988 on line 3
  CHECK(month_year[2] == 1996);  // 02/01/1996 after 01/31/1988 24:00

  // First and last rows by their text: line 3 "01/01/1988,01:00,10.0,6.1,77,993" and line 8762
  // "12/31/1980,24:00,2.2,0.6,89,980".
  CHECK(s.hours.front().day_of_year == 0);
  CHECK(s.hours.front().dry_bulb_c == 10.0);
  CHECK(s.hours.front().pressure_kpa == doctest::Approx(99.3));
  // psychrolib 1.1.1 GetHumRatioFromTDewPoint(6.1, 99300) = 0.005954840237
  CHECK(s.hours.front().humidity_ratio == doctest::Approx(0.005954840237).epsilon(1e-6));
  CHECK(s.hours.back().month == 12);
  CHECK(s.hours.back().day == 31);
  CHECK(s.hours.back().hour == 23);
  CHECK(s.hours.back().day_of_year == 364);
  CHECK(s.hours.back().dry_bulb_c == 2.2);
  CHECK(s.hours.back().pressure_kpa == doctest::Approx(98.0));
}

TEST_CASE("Greensboro TMY3: humidity source overridden to relative humidity") {
  wx::Mapping m;
  m.humidity = wx::HumiditySource::relative_humidity;
  const wx::WeatherSeries s = wx::read_file(kGreensboro, m, 101.325);
  CHECK(s.info.humidity == wx::HumiditySource::relative_humidity);
  CHECK(s.info.humidity_overridden);
  CHECK(s.info.find(wx::Quantity::relative_humidity)->header == "RHum (%)");
  CHECK(s.info.find(wx::Quantity::relative_humidity)->unit == "%");
  // Line 3: 10.0 °C, 77 %, 993 mbar; psychrolib 1.1.1 GetHumRatioFromRelHum(10, 0.77, 99300)
  // = 0.005979232151.
  CHECK(s.hours[0].humidity_ratio == doctest::Approx(0.005979232151).epsilon(1e-6));
  CHECK(has_line(wx::describe(s.info),
                 "humidity: relative humidity, column 'RHum (%)', % (found by header; chosen "
                 "by the mapping); not used: 'Dew-point (C)'"));
}

// --- Real data: PVGIS TMY (© European Union, via pvlib test data) ------------------------

TEST_CASE("PVGIS TMY: metadata lines, UTC stamps, legend units, every row") {
  const std::string text = slurp(kPvgis);
  const wx::WeatherSeries s = wx::read_text(text, "pvgis-tmy-45n-8e.csv", {}, 101.325);
  const wx::WeatherInfo& i = s.info;
  CHECK(s.hours.size() == 8760);
  CHECK(i.header_line == 18);  // after 4 metadata lines and the month/year table
  CHECK(i.first_data_line == 19);
  CHECK(i.last_data_line == 8778);  // legend lines follow after a blank line
  CHECK(i.find(wx::Quantity::time)->header == "time(UTC)");
  CHECK(i.time.format == "YYYYMMDD:HHMM");
  CHECK(i.time.clock == wx::Clock::utc);
  CHECK_FALSE(i.time.hour_ending);
  const wx::ColumnUse* t2m = i.find(wx::Quantity::dry_bulb);
  REQUIRE(t2m);
  CHECK(t2m->header == "T2m");
  CHECK(t2m->unit == "°C");  // legend: "T2m: 2-m air temperature (degree Celsius)"
  CHECK(t2m->unit_found == wx::UnitFound::legend);
  CHECK(i.humidity == wx::HumiditySource::relative_humidity);
  CHECK(i.find(wx::Quantity::relative_humidity)->header == "RH");
  CHECK(i.find(wx::Quantity::relative_humidity)->unit == "%");  // "RH: relative humidity (%)"
  CHECK(i.find(wx::Quantity::pressure)->header == "SP");
  CHECK(i.find(wx::Quantity::pressure)->unit == "Pa");  // "SP: Surface (air) pressure (Pa)"
  CHECK(i.time.typical_year);
  CHECK(i.time.months_out_of_order);

  const std::vector<std::string> lines = lines_of(text);
  // The file's own month/year table (lines 6 to 17) against the years the reader found.
  CHECK(lines[4] == "month,year");
  for (int m = 1; m <= 12; ++m) {
    const std::vector<std::string> f = fields_of(lines[4 + m]);
    CHECK(std::stoi(f[0]) == m);
    CHECK(i.time.month_year[m - 1] == std::stoi(f[1]));
  }
  double worst_rh = 0;
  for (std::size_t r = 0; r < 8760; ++r) {
    const std::vector<std::string> f = fields_of(lines[r + 18]);
    const wx::WeatherHour& h = s.hours[r];
    CHECK(h.month == std::stoi(f[0].substr(4, 2)));
    CHECK(h.day == std::stoi(f[0].substr(6, 2)));
    CHECK(h.hour == std::stoi(f[0].substr(9, 2)));
    CHECK(h.dry_bulb_c == doctest::Approx(std::stod(f[1])).epsilon(1e-12));
    CHECK(h.pressure_kpa == doctest::Approx(std::stod(f[9]) / 1000.0).epsilon(1e-12));
    worst_rh = std::max(worst_rh, std::fabs(rh_of(h) - std::stod(f[2]) / 100.0));
  }
  CHECK(worst_rh < 1e-9);
  // Line 19 "20180101:0000,2.04,94.38,...,99870.0": psychrolib 1.1.1
  // GetHumRatioFromRelHum(2.04, 0.9438, 99870) = 0.004189192172.
  CHECK(s.hours[0].humidity_ratio == doctest::Approx(0.004189192172).epsilon(1e-6));

  const std::vector<std::string> d = wx::describe(i);
  CHECK(d[1] ==
        "time: 'time(UTC)', YYYYMMDD:HHMM, UTC clock (hours of the day are UTC); "
        "hour-beginning stamps");
  CHECK(has_line(d, "dry-bulb: column 'T2m', °C (found by header; unit from legend line 8780)"));
  CHECK(has_line(d, "pressure: column 'SP', Pa (found by header; unit from legend line 8788)"));
  CHECK(has_line(d,
                 "typical year: months from different years (Jan 2018, Feb 2007, Mar 2009, "
                 "Apr 2013, May 2008, Jun 2006, Jul 2011, Aug 2010, Sep 2020, Oct 2006, Nov "
                 "2007, Dec 2016), not in time order at month boundaries; accepted"));
}

TEST_CASE("read_file and read_text: missing, folder and empty inputs") {
  CHECK(error_of([] { wx::read_file(kData, {}, 101.325); }) ==
        kData + ": the weather file is a folder; allowed: a file");
  CHECK(read_error("") == "t.csv: the weather file is empty; allowed: a header line and data rows");
  CHECK(read_error("\n \r\n") ==
        "t.csv: the weather file is empty; allowed: a header line and data rows");
  const std::string msg = error_of([] { wx::read_file(kData + "/no-such-file.csv", {}, 101.325); });
  CHECK(msg == kData +
                   "/no-such-file.csv: cannot open the weather file (No such file or "
                   "directory)");
}

// --- Layouts ------------------------------------------------------------------------------

namespace {
// Two hours in July, ISO stamps: the base of most inline files below.
const std::string kHeader = "Timestamp,Temp (C),Dew Point (C),Pressure (kPa)\n";
}  // namespace

TEST_CASE("layout: semicolon delimiter, quoted fields, decimal comma, station line") {
  const std::string csv =
      "\"Station; north yard\";\"elev. 120 m\"\n"
      "\"Date\";\"Time\";\"Temp (°C)\";\"RH (%)\";\"Pressure (hPa)\"\n"
      "\"2019-07-01\";\"13:00\";\"21,5\";\"55\";\"1013,2\"\n"
      "\"2019-07-01\";\"14:00\";\"22,0\";\"50\";\"1013,0\"\n";
  const wx::WeatherSeries s = read(csv);
  CHECK(s.info.delimiter == ';');
  CHECK(s.info.decimal_comma);
  CHECK(s.info.header_line == 2);
  REQUIRE(s.hours.size() == 2);
  CHECK(s.hours[0].dry_bulb_c == 21.5);
  CHECK(s.hours[0].pressure_kpa == doctest::Approx(101.32));  // 1 hPa = 0.1 kPa (SI prefix)
  CHECK(s.hours[0].hour == 13);
  CHECK(s.hours[0].month == 7);
  CHECK(s.hours[0].day_of_year == 181);  // 1 July, non-leap
  CHECK(s.info.find(wx::Quantity::dry_bulb)->unit == "°C");
  CHECK(wx::describe(s.info)[0] ==
        "weather: t.csv, 2 rows (lines 3 to 4; header on line 2; delimiter ';', decimal comma)");
}

TEST_CASE("layout: comma file with quoted fields holding commas") {
  const std::string csv =
      "\"Site, somewhere\",12\n"
      "Timestamp,\"Temp, dry-bulb (C)\",Dry bulb (C),Dew Point (C)\n"
      "2019-07-01T13:00,\"x, y\",\"21.5\",\"10.0\"\n";
  const wx::WeatherSeries s = read(csv);
  CHECK(s.info.find(wx::Quantity::dry_bulb)->header == "Dry bulb (C)");
  CHECK(s.hours.at(0).dry_bulb_c == 21.5);
  // No pressure column: the site pressure is used and said.
  CHECK_FALSE(s.info.pressure_from_file);
  CHECK(s.hours[0].pressure_kpa == 101.325);  // the site pressure passed in
  CHECK(has_line(wx::describe(read(csv, {}, 95.0).info),
                 "pressure: 95.00 kPa at every hour from the site (the file has no pressure "
                 "column)"));
}

TEST_CASE("layout: ISO stamps with seconds, Z and offsets") {
  const std::string z =
      kHeader + "2019-07-01T13:00:00Z,20,10,101.3\n2019-07-01T14:00:00Z,21,10,101.3\n";
  const wx::WeatherSeries a = read(z);
  CHECK(a.info.time.clock == wx::Clock::utc);
  CHECK(a.info.time.format == "YYYY-MM-DDTHH:MM:SSZ");
  CHECK(a.hours[1].hour == 14);
  const std::string off =
      kHeader + "2019-07-01 13:00+02:00,20,10,101.3\n2019-07-01 14:00+02:00,21,10,101.3\n";
  const wx::WeatherSeries b = read(off);
  CHECK(b.info.time.clock == wx::Clock::offset);
  CHECK(b.info.time.utc_offset_min == 120);
  CHECK(b.hours[0].hour == 13);  // the written clock is used
  CHECK(wx::describe(b.info)[1] ==
        "time: 'Timestamp', YYYY-MM-DD HH:MM±hh:mm, clock at UTC+02:00, "
        "used as written; hour-beginning stamps");
  const std::string neg = kHeader + "2019-07-01T13:00:00.000-0530,20,10,101.3\n";
  CHECK(read(neg).info.time.utc_offset_min == -330);
}

TEST_CASE("layout: year/month/day/hour columns, hour-ending 1..24") {
  const std::string csv =
      "Year,Month,Day,Hour,Minute,Dry Bulb (F),Dew Point\n"
      "2019,1,1,23,0,50,40\n"
      "2019,1,1,24,0,50,40\n"
      "2019,1,2,1,0,50,40\n";
  const wx::WeatherSeries s = read(csv);
  CHECK(s.info.time.hour_ending);
  CHECK(s.info.time.format == "year, month, day columns + hour, minute columns");
  CHECK(s.hours[0].hour == 22);
  CHECK(s.hours[1].hour == 23);
  CHECK(s.hours[1].day == 1);
  CHECK(s.hours[2].hour == 0);
  CHECK(s.hours[2].day == 2);
  // The dew point column has no unit: it takes the dry-bulb's.
  const wx::ColumnUse* dew = s.info.find(wx::Quantity::dew_point);
  CHECK(dew->unit == "°F");
  CHECK(dew->unit_found == wx::UnitFound::same_as_dry_bulb);
  // 50 °F = 10 °C exactly (°C = (°F − 32)/1.8, by definition).
  CHECK(s.hours[0].dry_bulb_c == doctest::Approx(10.0).epsilon(1e-12));
  // 40 °F = 4.444 °C dew point: the state gives it back.
  CHECK(psy::dew_point_from_humidity_ratio_c(s.hours[0].humidity_ratio, s.hours[0].pressure_kpa) ==
        doctest::Approx((40.0 - 32.0) / 1.8).epsilon(1e-9));
}

TEST_CASE("layout: month, day and hour without a year; date column plus hour column") {
  const std::string a = "Mo,Dy,Hr,Temp (C),RH (%)\n7,1,0,20,50\n7,1,1,21,50\n";
  const wx::WeatherSeries s = read(a);
  CHECK(s.hours.size() == 2);
  CHECK_FALSE(s.info.time.typical_year);
  CHECK(s.info.time.month_year[6] == 0);
  const std::string b = "Date,Hour,Temp (C),RH (%)\n01.07.2019,0,20,50\n01.07.2019,1,21,50\n";
  const wx::WeatherSeries t = read(b);
  CHECK(t.info.time.format == "DD.MM.YYYY + hour column");
  CHECK(t.hours[1].month == 7);
  CHECK(t.hours[1].day == 1);
  CHECK(t.hours[1].hour == 1);
}

TEST_CASE("layout: day-first dates when the header says so") {
  const std::string csv = "Date (DD/MM/YYYY),Time,Temp (C),RH (%)\n02/07/2019,00:00,20,50\n";
  const wx::WeatherSeries s = read(csv);
  CHECK(s.hours[0].month == 7);
  CHECK(s.hours[0].day == 2);
  CHECK(s.info.time.format == "DD/MM/YYYY + HH:MM");
}

TEST_CASE("layout: sub-hourly data is weighted by its time step") {
  std::string csv = kHeader;
  for (int m = 0; m < 120; m += 15)
    csv += fmt::format("2019-07-01T{:02}:{:02},20,10,101.3\n", m / 60, m % 60);
  const wx::WeatherSeries s = read(csv);
  REQUIRE(s.hours.size() == 8);
  CHECK(s.info.time.step_min == 15);
  double total = 0;
  for (const wx::WeatherHour& h : s.hours) {
    CHECK(h.weight_h == 0.25);
    total += h.weight_h;
  }
  CHECK(total == 2.0);
  CHECK(s.hours[3].hour == 0);
  CHECK(s.hours[3].minute == 45);
  CHECK(s.hours[4].hour == 1);
  CHECK(s.hours[4].minute == 0);
  CHECK(has_line(wx::describe(s.info), "time step: 15 min, each row weighs 0.25 h"));

  // Hour-ending half-hours: 23:30 and 24:00 both belong to the hour that began at 23:00.
  const std::string ending =
      "Date,Time,Temp (C),RH (%)\n07/01/2019,23:30,20,50\n07/01/2019,24:00,20,50\n"
      "07/02/2019,00:30,20,50\n";
  const wx::WeatherSeries e = read(ending);
  CHECK(e.info.time.hour_ending);
  CHECK(e.hours[0].hour == 23);
  CHECK(e.hours[0].minute == 0);
  CHECK(e.hours[1].hour == 23);
  CHECK(e.hours[1].minute == 30);
  CHECK(e.hours[1].day == 1);
  CHECK(e.hours[2].hour == 0);
  CHECK(e.hours[2].day == 2);
  CHECK(e.hours[0].weight_h == 0.5);
}

TEST_CASE("layout: gaps are counted as missing steps") {
  const std::string csv = kHeader +
                          "2019-07-01T00:00,20,10,101.3\n2019-07-01T03:00,20,10,101.3\n"
                          "2019-07-01T04:00,20,10,101.3\n";
  const wx::WeatherSeries s = read(csv);
  CHECK(s.info.time.step_min == 60);
  CHECK(s.info.time.missing_steps == 2);
  CHECK(has_line(wx::describe(s.info),
                 "time step: 60 min, each row weighs 1 h; 2 steps missing "
                 "between rows"));
}

TEST_CASE("layout: leap day kept, later days shifted") {
  const std::string leap = kHeader +
                           "2020-02-28T23:00,5,0,101.3\n2020-02-29T00:00,5,0,101.3\n"
                           "2020-03-01T00:00,5,0,101.3\n";
  const wx::WeatherSeries s = read(leap);
  CHECK(s.info.time.leap_day_rows == 1);
  CHECK(s.hours[1].month == 2);
  CHECK(s.hours[1].day == 29);
  CHECK(s.hours[1].day_of_year == 59);
  CHECK(s.hours[2].day_of_year == 60);
  CHECK(has_line(wx::describe(s.info), "leap day: Feb 29 present (1 rows), kept"));
  const std::string plain = kHeader + "2019-02-28T23:00,5,0,101.3\n2019-03-01T00:00,5,0,101.3\n";
  CHECK(read(plain).hours[1].day_of_year == 59);
  // Feb 29 of a year that has none is not a date.
  CHECK(read_error(kHeader + "2019-02-29T00:00,5,0,101.3\n") ==
        "t.csv:2: column 'Timestamp' value '2019-02-29T00:00' is not readable as a time; "
        "allowed: a date and time such as 2019-07-01T13:00, 2019-07-01 13:00:00Z, 07/01/2019 "
        "13:00 or 20190701:1300");
}

TEST_CASE("layout: typical year in calendar order is not flagged; a calendar run is plain") {
  const std::string calendar = kHeader + "2019-12-31T23:00,5,0,101.3\n2020-01-01T00:00,5,0,101.3\n";
  const wx::WeatherSeries s = read(calendar);
  CHECK_FALSE(s.info.time.typical_year);
  CHECK_FALSE(s.info.time.months_out_of_order);
  const std::string spliced = kHeader + "2001-01-31T23:00,5,0,101.3\n1995-02-01T00:00,5,0,101.3\n";
  const wx::WeatherSeries t = read(spliced);
  CHECK(t.info.time.typical_year);
  CHECK(t.info.time.months_out_of_order);
}

TEST_CASE("time convention override: hour-ending stamps without 24:00") {
  const std::string csv = kHeader + "2019-07-01T23:00,20,10,101.3\n2019-07-02T00:00,20,10,101.3\n";
  wx::Mapping m;
  m.time_convention = wx::TimeConvention::hour_ending;
  const wx::WeatherSeries s = read(csv, m);
  CHECK(s.info.time.hour_ending);
  CHECK(s.info.time.convention_overridden);
  CHECK(s.hours[1].day == 1);
  CHECK(s.hours[1].hour == 23);
  // Midnight of 1 January closes 31 December.
  const std::string jan = kHeader + "2019-01-01T00:00,2,0,101.3\n";
  const wx::WeatherSeries j = read(jan, m);
  CHECK(j.hours[0].month == 12);
  CHECK(j.hours[0].day == 31);
  CHECK(j.hours[0].day_of_year == 364);
}

// --- Units --------------------------------------------------------------------------------

TEST_CASE("units: °F, K, inHg and psia headers convert to SI") {
  // Conversion factors (NIST SP 811, appendix B, from memory): 1 inHg (32 °F) = 3.38638 kPa;
  // 1 psi = 6.894757 kPa; K = °C + 273.15 and °F = 1.8·°C + 32 by definition.
  const std::string f =
      "Timestamp,DryBulb [°F],Dewpoint [degF],Station Pressure (inHg)\n"
      "2019-07-01T13:00,68,50,29.92\n";
  const wx::WeatherSeries a = read(f);
  CHECK(a.hours[0].dry_bulb_c == doctest::Approx(20.0).epsilon(1e-12));
  CHECK(a.hours[0].pressure_kpa == doctest::Approx(29.92 * 3.38638).epsilon(1e-5));
  CHECK(a.info.find(wx::Quantity::pressure)->unit == "inHg");
  CHECK(a.info.find(wx::Quantity::dew_point)->unit == "°F");
  const std::string k = "Timestamp,T (K),Tdew (K),P psia\n2019-07-01T13:00,293.15,283.15,14.696\n";
  const wx::WeatherSeries b = read(k);
  CHECK(b.hours[0].dry_bulb_c == doctest::Approx(20.0).epsilon(1e-12));
  CHECK(b.hours[0].pressure_kpa == doctest::Approx(14.696 * 6.894757).epsilon(1e-6));
  CHECK(b.info.find(wx::Quantity::pressure)->unit == "psia");
  CHECK(b.info.find(wx::Quantity::dry_bulb)->unit == "K");
  // psychrolib 1.1.1 GetHumRatioFromTDewPoint(15, 101325) = 0.010647455294 (15 °C = 59 °F).
  const std::string w =
      "Timestamp,Temp (F),Dew Point (F),Pressure (Pa)\n2019-07-01T13:00,77,59,101325\n";
  CHECK(read(w).hours[0].humidity_ratio == doctest::Approx(0.010647455294).epsilon(1e-6));
}

TEST_CASE("units: wet-bulb and humidity-ratio columns") {
  // psychrolib 1.1.1 GetHumRatioFromTWetBulb(30, 20, 101325) = 0.010516728279.
  const std::string wb = "Timestamp,Temp (C),Wet Bulb (C)\n2019-07-01T13:00,30,20\n";
  const wx::WeatherSeries a = read(wb);
  CHECK(a.info.humidity == wx::HumiditySource::wet_bulb);
  CHECK(a.hours[0].humidity_ratio == doctest::Approx(0.010516728279).epsilon(1e-6));
  // g/kg: 1 g/kg = 0.001 kg/kg (SI prefix).
  const std::string hr =
      "Timestamp,Temp (C),Humidity Ratio (g/kg),RH (%)\n2019-07-01T13:00,25,9.5,60\n";
  const wx::WeatherSeries b = read(hr);
  CHECK(b.info.humidity == wx::HumiditySource::humidity_ratio);
  CHECK(b.hours[0].humidity_ratio == doctest::Approx(0.0095).epsilon(1e-12));
  // 7000 grains to the pound (definition of the grain).
  const std::string gr = "Timestamp,Temp (C),Mixing Ratio (gr/lb)\n2019-07-01T13:00,25,70\n";
  CHECK(read(gr).hours[0].humidity_ratio == doctest::Approx(0.01).epsilon(1e-12));
}

TEST_CASE("units: a pressure without unit is inferred only when unambiguous") {
  const auto file = [](const std::string& p1, const std::string& p2) {
    return "Timestamp,Temp (C),RH (%),Pressure\n2019-07-01T13:00,20,50," + p1 +
           "\n2019-07-01T14:00,20,50," + p2 + "\n";
  };
  const wx::WeatherSeries pa = read(file("101325", "99870"));
  const wx::ColumnUse* p = pa.info.find(wx::Quantity::pressure);
  CHECK(p->unit == "Pa");
  CHECK(p->unit_found == wx::UnitFound::inferred);
  CHECK(pa.hours[0].pressure_kpa == doctest::Approx(101.325));
  CHECK(has_line(wx::describe(pa.info),
                 "pressure: column 'Pressure', Pa (found by header; unit inferred: no unit in "
                 "the header; values 99870 to 101325 are plausible only in Pa)"));
  CHECK(read(file("1013.2", "998")).info.find(wx::Quantity::pressure)->unit == "hPa");
  CHECK(read(file("101.3", "99.8")).info.find(wx::Quantity::pressure)->unit == "kPa");
  CHECK(read(file("29.92", "29.5")).info.find(wx::Quantity::pressure)->unit == "inHg");
  // 14.7 psia at sea level and 14.7 inHg (about 50 kPa, near 5500 m) both fit.
  CHECK(read_error(file("14.7", "14.6")) ==
        "t.csv:1: column 'Pressure' has no unit in the header and its values (14.6 to 14.7) "
        "fit inHg, psia alike; allowed: a unit in the header or in [weather], e.g. pressure = "
        "{ unit = \"inHg\" } (units: Pa, hPa, mbar, kPa, bar, inHg, psia, atm)");
  CHECK(read_error(file("3", "4")) ==
        "t.csv:1: column 'Pressure' has no unit in the header and its values (3 to 4) fit no "
        "pressure unit (station pressures from below sea level to about 5500 m); allowed: a "
        "unit in the header or in [weather], e.g. pressure = { unit = \"Pa\" } (units: Pa, "
        "hPa, mbar, kPa, bar, inHg, psia, atm)");
  CHECK(read_error(file("", "NA"), policy(wx::BadRowPolicy::skip)) ==
        "t.csv:1: column 'Pressure' has no unit in the header and no readable values to infer "
        "one from; allowed: a unit in the header or in [weather], e.g. pressure = { unit = "
        "\"Pa\" } (units: Pa, hPa, mbar, kPa, bar, inHg, psia, atm)");
}

TEST_CASE("units: temperature and RH without unit") {
  const auto file = [](const std::string& t1, const std::string& t2, const std::string& rh) {
    return "Timestamp,Temperature,RH\n2019-07-01T13:00," + t1 + "," + rh + "\n2019-07-01T14:00," +
           t2 + "," + rh + "\n";
  };
  const wx::WeatherSeries f = read(file("68", "95", "40"));
  CHECK(f.info.find(wx::Quantity::dry_bulb)->unit == "°F");  // 95 °C is no air temperature
  CHECK(f.info.find(wx::Quantity::relative_humidity)->unit == "%");
  CHECK(f.hours[1].dry_bulb_c == doctest::Approx(35.0).epsilon(1e-12));
  const wx::WeatherSeries c = read(file("20", "31", "0.6"));
  CHECK(c.info.find(wx::Quantity::dry_bulb)->unit == "°C");
  CHECK(c.info.find(wx::Quantity::relative_humidity)->unit == "fraction (0–1)");
  CHECK(rh_of(c.hours[0]) == doctest::Approx(0.6).epsilon(1e-9));
  CHECK(read_error(file("41", "50", "40")) ==
        "t.csv:1: column 'Temperature' has no unit in the header and its values (41 to 50) fit "
        "C, F alike; allowed: a unit in the header or in [weather], e.g. dry_bulb = { unit = "
        "\"C\" } (units: C, F, K)");
  // An override settles it.
  wx::Mapping m;
  m.column(wx::Quantity::dry_bulb).unit = "F";
  m.column(wx::Quantity::dry_bulb).origin = "unit.toml:4";
  const wx::WeatherSeries o = read(file("41", "50", "40"), m);
  CHECK(o.hours[0].dry_bulb_c == doctest::Approx(5.0).epsilon(1e-12));
  CHECK(has_line(wx::describe(o.info),
                 "dry-bulb: column 'Temperature', °F (found by header; unit set by unit.toml:4)"));
}

TEST_CASE("units: unknown units are errors naming the column") {
  CHECK(read_error("Timestamp,Temp (R),RH (%)\n2019-07-01T13:00,500,50\n") ==
        "t.csv: column 'Temp (R)' has unit 'R' (header line 1), which is not a temperature "
        "unit (allowed: C, F, K); set it in [weather], e.g. dry_bulb = { unit = \"C\" }");
  CHECK(read_error("Timestamp,Temp (C),RH (%),Pressure [Torr]\n2019-07-01T13:00,20,50,760\n") ==
        "t.csv: column 'Pressure [Torr]' has unit 'Torr' (header line 1), which is not a "
        "pressure unit (allowed: Pa, hPa, mbar, kPa, bar, inHg, psia, atm); set it in "
        "[weather], e.g. pressure = { unit = \"Pa\" }");
  CHECK(read_error("Timestamp,T2m,RH (%)\n2019-07-01T13:00,20,50\n\nT2m: temperature (deg "
                   "Rankine)\n") ==
        "t.csv: column 'T2m' has unit 'deg Rankine' (legend line 4), which is not a "
        "temperature unit (allowed: C, F, K); set it in [weather], e.g. dry_bulb = { unit = "
        "\"C\" }");
  wx::Mapping m;
  m.column(wx::Quantity::pressure).unit = "furlongs";
  m.column(wx::Quantity::pressure).origin = "--column";
  CHECK(read_error(kHeader + "2019-07-01T13:00,20,10,101.3\n", m) ==
        "--column: unit 'furlongs' given for pressure is not a pressure unit (allowed: Pa, "
        "hPa, mbar, kPa, bar, inHg, psia, atm)");
}

// --- Columns and overrides ----------------------------------------------------------------

TEST_CASE("columns: overrides by header text") {
  const std::string csv =
      "When,Outdoor (C),Moisture (C),Baro (mbar)\n2019-07-01T13:00,20,10,1000\n";
  wx::Mapping m;
  m.column(wx::Quantity::timestamp).column = "when";
  m.column(wx::Quantity::dry_bulb).column = "Outdoor (C)";
  m.column(wx::Quantity::dew_point).column = "Moisture (C)";
  m.column(wx::Quantity::pressure).column = "Baro (mbar)";
  m.column(wx::Quantity::pressure).origin = "unit.toml:9";
  const wx::WeatherSeries s = read(csv, m);
  CHECK(s.hours[0].dry_bulb_c == 20.0);
  CHECK(s.hours[0].pressure_kpa == doctest::Approx(100.0));
  CHECK(s.info.find(wx::Quantity::dry_bulb)->found == wx::ColumnFound::override);
  CHECK(has_line(wx::describe(s.info),
                 "pressure: column 'Baro (mbar)', mbar (column set by unit.toml:9; unit from "
                 "header)"));
  // An override naming a column the header lacks.
  m.column(wx::Quantity::pressure).column = "Barometer";
  CHECK(read_error(csv, m) ==
        "unit.toml:9: column 'Barometer' given for pressure is not in the header of t.csv "
        "(line 1: 'When', 'Outdoor (C)', 'Moisture (C)', 'Baro (mbar)')");
}

TEST_CASE("columns: a humidity column named in the mapping is the one used") {
  // Greensboro has dew point and RH; naming the RH column chooses it over the dew point.
  wx::Mapping m;
  m.column(wx::Quantity::relative_humidity).column = "RHum (%)";
  const wx::WeatherSeries s = wx::read_file(kGreensboro, m, 101.325);
  CHECK(s.info.humidity == wx::HumiditySource::relative_humidity);
  CHECK(s.info.unused_humidity.at(0).header == "Dew-point (C)");
  // A unit on a time column is refused.
  wx::Mapping t;
  t.column(wx::Quantity::timestamp).unit = "C";
  t.column(wx::Quantity::timestamp).origin = "--column";
  CHECK(read_error(kHeader + "2019-07-01T13:00,20,10,101.3\n", t) ==
        "--column: unit 'C' given for the timestamp column; allowed: no unit (a time column has "
        "none)");
}

TEST_CASE("columns: missing columns") {
  CHECK(read_error("Timestamp,Temp (C),Wind (m/s)\n2019-07-01T13:00,20,3\n") ==
        "t.csv:1: no humidity column: the header names none of dew point, humidity ratio, "
        "wet-bulb, relative humidity (columns: 'Timestamp', 'Temp (C)', 'Wind (m/s)'); name "
        "one in [weather], e.g. dew_point = { column = \"...\" }");
  CHECK(read_error("station 12\nTimestamp,Wind (m/s),RH (%)\n2019-07-01T13:00,3,50\n") ==
        "t.csv: no header line found: no line names both a dry-bulb column (e.g. 'Dry-bulb', "
        "'Temperature', 'Temp', 'T2m') and time columns (a timestamp, a date and a time, or "
        "month, day and hour); the closest, line 2, has no dry-bulb column; name the columns "
        "in [weather], e.g. dry_bulb = { column = \"...\" }");
  CHECK(read_error("Temp (C),RH (%)\n20,50\n") ==
        "t.csv: no header line found: no line names both a dry-bulb column (e.g. 'Dry-bulb', "
        "'Temperature', 'Temp', 'T2m') and time columns (a timestamp, a date and a time, or "
        "month, day and hour); the closest, line 1, has no time columns; name the columns in "
        "[weather], e.g. dry_bulb = { column = \"...\" }");
  wx::Mapping m;
  m.humidity = wx::HumiditySource::wet_bulb;
  CHECK(read_error(kHeader + "2019-07-01T13:00,20,10,101.3\n", m) ==
        "t.csv:1: humidity = \"wet-bulb\" was asked for, but the header has no wet-bulb column "
        "(columns: 'Timestamp', 'Temp (C)', 'Dew Point (C)', 'Pressure (kPa)'); name it in "
        "[weather], e.g. wet_bulb = { column = \"...\" }");
  CHECK(read_error("Timestamp,Temp (C),RH (%)\n2019-07-01T13:00,20,50\n", {}, 5.0) ==
        "t.csv: the file has no pressure column and the site pressure 5 kPa is outside the "
        "range the psychrometric model supports (10 kPa to 200 kPa)");
}

TEST_CASE("columns: a second matching column is noted, the first is used") {
  const std::string csv = "Timestamp,Temp (C),Temperature (C),RH (%)\n2019-07-01T13:00,20,25,50\n";
  const wx::WeatherSeries s = read(csv);
  CHECK(s.hours[0].dry_bulb_c == 20.0);
  CHECK(s.info.find(wx::Quantity::dry_bulb)->other_matches == 1);
  CHECK(has_line(wx::describe(s.info),
                 "dry-bulb: column 'Temp (C)', °C (found by header; first of 2 matching columns)"));
}

// --- Bad rows -----------------------------------------------------------------------------

namespace {
std::string one_row(const std::string& header, const std::string& row) {
  return header + "2019-07-01T12:00,20,10,101.3\n" + row + "\n2019-07-01T14:00,20,10,101.3\n";
}
}  // namespace

// One bad value per row: what the file holds, and the message it must give.
struct BadCase {
  std::string csv;
  std::string message;
};

TEST_CASE("bad rows: each kind is an error naming file, line, column and value") {
  const std::string h = kHeader;
  const std::string rh = "Timestamp,Temp (C),RH (%)\n";
  const std::string wb = "Timestamp,Temp (C),Wet Bulb (C)\n";
  // psychrolib 1.1.1 GetSatHumRatio(20, 101325) = 0.014695 appears in the last two.
  const std::string w = "Timestamp,Temp (C),Humidity Ratio (kg/kg)\n";
  const BadCase cases[] = {
      {one_row(h, "2019-07-01T13:00,-9999,10,101.3"),
       "t.csv:3: column 'Temp (C)' value '-9999' is a missing-value marker; allowed: a "
       "measured value (or set on_bad_row to skip or fill)"},
      {one_row(h, "2019-07-01T13:00,20,-9900,101.3"),
       "t.csv:3: column 'Dew Point (C)' value '-9900' is a missing-value marker; allowed: a "
       "measured value (or set on_bad_row to skip or fill)"},
      {one_row(h, "2019-07-01T13:00,9999,10,101.3"),
       "t.csv:3: column 'Temp (C)' value '9999' is a missing-value marker; allowed: a "
       "measured value (or set on_bad_row to skip or fill)"},
      {one_row(h, "2019-07-01T13:00,20,10,99999"),
       "t.csv:3: column 'Pressure (kPa)' value '99999' is a missing-value marker; allowed: a "
       "measured value (or set on_bad_row to skip or fill)"},
      {one_row(h, "2019-07-01T13:00,,10,101.3"),
       "t.csv:3: column 'Temp (C)' value '' is empty (missing); allowed: a measured value (or "
       "set on_bad_row to skip or fill)"},
      {one_row(h, "2019-07-01T13:00,NA,10,101.3"),
       "t.csv:3: column 'Temp (C)' value 'NA' is a missing-value marker; allowed: a measured "
       "value (or set on_bad_row to skip or fill)"},
      {one_row(h, "2019-07-01T13:00,warm,10,101.3"),
       "t.csv:3: column 'Temp (C)' value 'warm' is not a number; allowed: a number in °C (or "
       "set on_bad_row to skip or fill)"},
      {one_row(h, "2019-07-01T13:00,75,10,101.3"),
       "t.csv:3: column 'Temp (C)' value '75' is 75 °C; allowed -90 °C to 60 °C (the range "
       "of air temperatures on Earth) (or set on_bad_row to skip or fill)"},
      {one_row(h, "2019-07-01T13:00,20,10,30"),
       "t.csv:3: column 'Pressure (kPa)' value '30' is 30 kPa; allowed 48 kPa to 112 kPa "
       "(station pressures from below sea level to about 5500 m) (or set on_bad_row to skip "
       "or fill)"},
      {one_row(h, "2019-07-01T13:00,20,23.5,101.3"),
       "t.csv:3: column 'Dew Point (C)' value '23.5' is a dew point of 23.5 °C, above the "
       "dry-bulb 20 °C; allowed: up to the dry-bulb (up to 0.56 K above is read as "
       "saturation) (or set on_bad_row to skip or fill)"},
      {one_row(h, "2019-07-01T13:00,20,-120,101.3"),
       "t.csv:3: column 'Dew Point (C)' value '-120' is not a possible state: dry-bulb -120 "
       "°C is outside the range the psychrometric model supports (-100 °C to 200 °C) (or set "
       "on_bad_row to skip or fill)"},
      {rh + "2019-07-01T13:00,20,130\n",
       "t.csv:2: column 'RH (%)' value '130' is 130 % relative humidity; allowed 0 % to 100 % "
       "(up to 101 % is read as 100 %) (or set on_bad_row to skip or fill)"},
      {rh + "2019-07-01T13:00,20,-3\n",
       "t.csv:2: column 'RH (%)' value '-3' is -3 % relative humidity; allowed 0 % to 100 % "
       "(up to 101 % is read as 100 %) (or set on_bad_row to skip or fill)"},
      {wb + "2019-07-01T13:00,20,22\n",
       "t.csv:2: column 'Wet Bulb (C)' value '22' is a wet-bulb of 22 °C, above the dry-bulb "
       "20 °C; allowed: up to the dry-bulb (up to 0.56 K above is read as saturation) (or set "
       "on_bad_row to skip or fill)"},
      {wb + "2019-07-01T13:00,40,5\n",
       "t.csv:2: column 'Wet Bulb (C)' value '5' is not a possible state: wet-bulb 5 °C is "
       "too low for dry-bulb 40 °C at 101.325 kPa: the air would need negative humidity (or "
       "set on_bad_row to skip or fill)"},
      {w + "2019-07-01T13:00,20,0.016\n",
       "t.csv:2: column 'Humidity Ratio (kg/kg)' value '0.016' is 0.016 kg/kg; allowed 0 to "
       "saturation, 0.014695 kg/kg at 20 °C and 101.33 kPa (up to 1 % above is read as "
       "saturation) (or set on_bad_row to skip or fill)"},
      {w + "2019-07-01T13:00,20,-0.001\n",
       "t.csv:2: column 'Humidity Ratio (kg/kg)' value '-0.001' is -0.001 kg/kg; allowed 0 to "
       "saturation, 0.014695 kg/kg at 20 °C and 101.33 kPa (up to 1 % above is read as "
       "saturation) (or set on_bad_row to skip or fill)"},
  };
  for (const BadCase& c : cases) {
    CAPTURE(c.csv);
    CHECK(read_error(c.csv) == c.message);
  }
}

TEST_CASE("bad rows: within tolerance they are read as saturation and counted") {
  const wx::WeatherSeries rh = read("Timestamp,Temp (C),RH (%)\n2019-07-01T13:00,20,100.6\n");
  CHECK(rh_of(rh.hours[0]) == doctest::Approx(1.0).epsilon(1e-9));
  CHECK(rh.info.months[6].capped == 1);
  CHECK(rh.info.capped() == 1);
  CHECK(
      has_line(wx::describe(rh.info), "read as saturation (within tolerance above it): 1 (Jul 1)"));
  const wx::WeatherSeries dew = read(kHeader + "2019-07-01T13:00,20,20.3,101.3\n");
  CHECK(psy::dew_point_from_humidity_ratio_c(dew.hours[0].humidity_ratio, 101.3) ==
        doctest::Approx(20.0).epsilon(1e-9));
  CHECK(dew.info.months[6].capped == 1);
  // psychrolib 1.1.1 GetSatHumRatio(20, 101325) = 0.014695; 0.0148 is within 1 %.
  const wx::WeatherSeries w =
      read("Timestamp,Temp (C),Humidity Ratio (kg/kg)\n2019-07-01T13:00,20,0.0148\n");
  CHECK(w.hours[0].humidity_ratio == doctest::Approx(0.014695).epsilon(1e-4));
  CHECK(w.info.capped() == 1);
  // A marker value that is a plausible reading is a reading: 99999 Pa is 99.999 kPa.
  const wx::WeatherSeries pa =
      read("Timestamp,Temp (C),RH (%),SP (Pa)\n2019-07-01T13:00,20,50,99999\n");
  CHECK(pa.hours[0].pressure_kpa == doctest::Approx(99.999));
}

namespace {
// Six hours in January and six in February; bad rows on 1 Jan 02:00 (marker), 1 Feb 03:00
// (empty) and 1 Feb 04:00 (RH 130 %).
std::string two_months() {
  std::string csv = "Timestamp,Temp (C),RH (%),Pressure (kPa)\n";
  for (int month : {1, 2})
    for (int h = 0; h < 6; ++h) {
      std::string t = fmt::format("{}", 2 * h), rh = "50";
      if (month == 1 && h == 2) t = "-9999";
      if (month == 2 && h == 3) t = "";
      if (month == 2 && h == 4) rh = "130";
      csv += fmt::format("2019-{:02}-01T{:02}:00,{},{},{}\n", month, h, t, rh, 100 + h);
    }
  return csv;
}
}  // namespace

TEST_CASE("bad rows: skip drops them and counts them by month") {
  const wx::WeatherSeries s = read(two_months(), policy(wx::BadRowPolicy::skip));
  CHECK(s.hours.size() == 9);
  CHECK(s.info.rows_read == 12);
  CHECK(s.info.months[0].skipped == 1);
  CHECK(s.info.months[1].skipped == 2);
  CHECK(s.info.months[0].rows == 5);
  CHECK(s.info.months[1].rows == 4);
  CHECK(s.info.skipped() == 3);
  CHECK(s.hours[2].hour == 3);  // 02:00 is gone
  CHECK(has_line(wx::describe(s.info), "bad rows skipped: 3 (Jan 1, Feb 2)"));
}

TEST_CASE("bad rows: fill interpolates between good neighbours in time, counted by month") {
  const wx::WeatherSeries s = read(two_months(), policy(wx::BadRowPolicy::fill));
  REQUIRE(s.hours.size() == 12);
  CHECK(s.info.filled() == 3);
  CHECK(s.info.months[0].filled == 1);
  CHECK(s.info.months[1].filled == 2);
  CHECK(s.info.fill_longest_run == 2);
  // 1 Jan 02:00 between 01:00 (2 °C, 101 kPa) and 03:00 (6 °C, 103 kPa).
  CHECK(s.hours[2].dry_bulb_c == doctest::Approx(4.0));
  CHECK(s.hours[2].pressure_kpa == doctest::Approx(102.0));
  CHECK(s.hours[2].humidity_ratio ==
        doctest::Approx((s.hours[1].humidity_ratio + s.hours[3].humidity_ratio) / 2));
  // 1 Feb 03:00 and 04:00 between 02:00 (4 °C) and 05:00 (10 °C): thirds.
  CHECK(s.hours[9].dry_bulb_c == doctest::Approx(6.0));
  CHECK(s.hours[10].dry_bulb_c == doctest::Approx(8.0));
  CHECK(has_line(wx::describe(s.info),
                 "bad rows filled by interpolation: 3 (Jan 1, Feb 2; longest run 2)"));
}

TEST_CASE("bad rows: a run at the end takes the nearest good row; all bad is an error") {
  const std::string csv = kHeader + "2019-07-01T12:00,20,10,101.3\n2019-07-01T13:00,NA,10,101.3\n";
  const wx::WeatherSeries s = read(csv, policy(wx::BadRowPolicy::fill));
  CHECK(s.hours[1].dry_bulb_c == 20.0);
  const std::string bad = kHeader + "2019-07-01T12:00,NA,10,101.3\n2019-07-01T13:00,NA,10,101.3\n";
  CHECK(read_error(bad, policy(wx::BadRowPolicy::skip)) ==
        "t.csv: none of the 2 data rows (lines 2 to 3) has usable values; allowed: at least one");
}

// --- Time errors and table structure -------------------------------------------------------

TEST_CASE("time: duplicate and unsorted stamps within a month") {
  CHECK(read_error(kHeader + "2019-07-01T13:00,20,10,101.3\n2019-07-01T13:00,21,10,101.3\n") ==
        "t.csv:3: time 2019-07-01 13:00 repeats the row at line 2; allowed: rows within a month "
        "in time order, each time once");
  CHECK(read_error(kHeader + "2019-07-01T14:00,20,10,101.3\n2019-07-01T13:00,21,10,101.3\n") ==
        "t.csv:3: time 2019-07-01 13:00 comes before the row at line 2 (2019-07-01 14:00); "
        "allowed: rows within a month in time order, each time once");
  CHECK(read_error(kHeader + "2019-07-01T13:00,20,10,101.3\n2019-08-01T13:00,20,10,101.3\n"
                             "2019-07-02T13:00,20,10,101.3\n") ==
        "t.csv:4: Jul 2019 starts again here; it already ran from line 2 to line 2; allowed: "
        "the rows of one month together");
}

TEST_CASE("time: step, convention and readability errors") {
  CHECK(read_error(kHeader + "2019-07-01T13:00,20,10,101.3\n2019-07-01T13:07,20,10,101.3\n") ==
        "t.csv: time step 7 min; allowed: 60 min or a whole fraction of an hour (1, 2, 3, 4, 5, "
        "6, 10, 12, 15, 20 or 30 min)");
  // Three-hourly data cannot be weighted as hours of a schedule.
  CHECK(read_error(kHeader + "2019-07-01T00:00,20,10,101.3\n2019-07-01T03:00,20,10,101.3\n") ==
        "t.csv: time step 180 min; allowed: 60 min or a whole fraction of an hour (1, 2, 3, 4, "
        "5, 6, 10, 12, 15, 20 or 30 min)");
  CHECK(read_error(kHeader + "2019-07-01T13:00,20,10,101.3\n2019-07-01T13:30,20,10,101.3\n"
                             "2019-07-01T14:15,20,10,101.3\n") ==
        "t.csv:4: time 2019-07-01 14:15 is 45 min after the row at line 3; allowed: whole "
        "multiples of the 30-min time step");
  const std::string dt = "Date,Time,Temp (C),RH (%)\n";
  CHECK(
      read_error(dt + "07/01/2019,00:00,20,50\n07/01/2019,01:00,20,50\n07/01/2019,24:00,20,50\n") ==
      "t.csv:2: time 00:00 in a file that also marks midnight as 24:00 (line 4); allowed: "
      "one of the two");
  // 24:00 and the next day's 00:00 are the same instant.
  CHECK(read_error(dt + "07/01/2019,24:00,20,50\n07/02/2019,00:00,20,50\n") ==
        "t.csv:3: time 2019-07-02 00:00 repeats the row at line 2; allowed: rows within a month "
        "in time order, each time once");
  wx::Mapping begin;
  begin.time_convention = wx::TimeConvention::hour_beginning;
  CHECK(read_error(dt + "07/01/2019,23:00,20,50\n07/01/2019,24:00,20,50\n", begin) ==
        "t.csv:3: time 24:00 cannot start an interval (time_convention = \"hour-beginning\"); "
        "allowed: 00:00 to 23:59");
  CHECK(read_error(dt + "13/01/2019,01:00,20,50\n") ==
        "t.csv:2: column 'Date' value '13/01/2019' is not readable as a time; allowed: a date "
        "as YYYY-MM-DD, YYYY/MM/DD, MM/DD/YYYY (DD/MM/YYYY when the header says so), "
        "DD.MM.YYYY or YYYYMMDD");
  CHECK(read_error(dt + "01/13/2019,25:00,20,50\n") ==
        "t.csv:2: column 'Time' value '25:00' is not readable as a time; allowed: a time of day "
        "as HH:MM, HH:MM:SS or HHMM, 00:00 to 24:00");
  CHECK(read_error(dt + "01/13/2019,13:00:30,20,50\n") ==
        "t.csv:2: column 'Time' value '13:00:30' is not readable as a time; allowed: a time of "
        "day as HH:MM, HH:MM:SS or HHMM, 00:00 to 24:00");
  const std::string ymd = "Year,Month,Day,Hour,Minute,Temp (C),RH (%)\n";
  CHECK(read_error(ymd + "19x,7,1,0,0,20,50\n") ==
        "t.csv:2: column 'Year' value '19x' is not readable as a time; allowed: a year such as "
        "2019");
  CHECK(read_error(ymd + "2019,13,1,0,0,20,50\n") ==
        "t.csv:2: column 'Month' value '13' is not readable as a time; allowed: a month 1 to 12");
  CHECK(read_error(ymd + "2019,6,31,0,0,20,50\n") ==
        "t.csv:2: column 'Day' value '31' is not readable as a time; allowed: a day of the "
        "month, 1 to its length");
  CHECK(read_error(ymd + "2019,6,30,25,0,20,50\n") ==
        "t.csv:2: column 'Hour' value '25' is not readable as a time; allowed: an hour 0 to 24");
  CHECK(read_error(ymd + "2019,6,30,24,30,20,50\n") ==
        "t.csv:2: column 'Minute' value '30' is not readable as a time; allowed: a minute 0 to "
        "59 (0 with hour 24)");
}

TEST_CASE("table: field counts, empty tables, data after the end") {
  CHECK(read_error(kHeader + "2019-07-01T13:00,20,10\n") ==
        "t.csv:2: the row has 3 fields but the header (line 1) has 4; allowed: one value per "
        "header column");
  CHECK(read_error(kHeader + "2019-07-01T13:00,20,10,101.3,7\n") ==
        "t.csv:2: the row has 5 fields but the header (line 1) has 4; allowed: one value per "
        "header column");
  // Trailing empty fields are a common export artefact and are ignored.
  CHECK(read(kHeader + "2019-07-01T13:00,20,10,101.3,,\n").hours.size() == 1);
  CHECK(read_error(kHeader + "\n\n") == "t.csv:1: the header is followed by no data rows");
  CHECK(read_error(kHeader + "2019-07-01T13:00,20,10,101.3\n\n2019-07-01T14:00,20,10,101.3\n") ==
        "t.csv:4: this line looks like a data row, but the table ended at line 3; allowed: "
        "data rows together, with no blank or note line between them");
  CHECK(read_error(kHeader +
                   "2019-07-01T13:00,20,10,101.3\n# note\n2019-07-01T14:00,20,10,101.3\n") ==
        "t.csv:4: this line looks like a data row, but the table ended at line 3; allowed: "
        "data rows together, with no blank or note line between them");
  // Notes after the data that do not look like rows are fine.
  const wx::WeatherSeries s =
      read(kHeader + "2019-07-01T13:00,20,10,101.3\n\nSource: somewhere, 2019\nTemp: air\n");
  CHECK(s.hours.size() == 1);
  // A UTF-8 byte-order mark and CRLF line ends.
  CHECK(read("\xEF\xBB\xBF"
             "Timestamp,Temp (C),RH (%)\r\n2019-07-01T13:00,20,50\r\n")
            .hours.size() == 1);
}

// --- The [weather] table ------------------------------------------------------------------

namespace {
wx::Mapping mapping_of(const std::string& toml_text) {
  toml::table t = toml::parse(std::string_view(toml_text), std::string_view("unit.toml"));
  return wx::read_mapping(limitline::detail::make_raw_table(std::move(*t["weather"].as_table())),
                          "unit.toml");
}
std::string mapping_error(const std::string& toml_text) {
  return error_of([&] { mapping_of(toml_text); });
}
}  // namespace

TEST_CASE("[weather]: every key read") {
  const wx::Mapping m = mapping_of(
      "[weather]\n"
      "file = \"site-hourly.csv\"\n"
      "dry_bulb = { column = \"Temperature\", unit = \"C\" }\n"
      "dew_point = { column = \"Dew Point\", unit = \"degF\" }\n"
      "pressure = { column = \"Pressure\", unit = \"mbar\" }\n"
      "date = { column = \"Day\" }\n"
      "humidity = \"relative-humidity\"\n"
      "on_bad_row = \"fill\"\n"
      "time_convention = \"hour-ending\"\n");
  CHECK(m.file == "site-hourly.csv");
  CHECK(m.column(wx::Quantity::dry_bulb).column == "Temperature");
  CHECK(m.column(wx::Quantity::dry_bulb).unit == "C");
  CHECK(m.column(wx::Quantity::dry_bulb).origin == "unit.toml:3");
  CHECK(m.column(wx::Quantity::dew_point).unit == "degF");
  CHECK(m.column(wx::Quantity::pressure).origin == "unit.toml:5");
  CHECK(m.column(wx::Quantity::date).column == "Day");
  CHECK_FALSE(m.column(wx::Quantity::wet_bulb).column);
  CHECK(m.humidity == wx::HumiditySource::relative_humidity);
  CHECK(m.on_bad_row == wx::BadRowPolicy::fill);
  CHECK(m.time_convention == wx::TimeConvention::hour_ending);
}

TEST_CASE("[weather]: errors name file, line and key") {
  CHECK(mapping_error("[weather]\nfile = \"a.csv\"\ndry_bulbs = { column = \"T\" }\n") ==
        "unit.toml:3: [weather] key 'dry_bulbs' is not known (allowed: file, humidity, "
        "on_bad_row, max_bad_share, time_convention, dry_bulb, dew_point, relative_humidity, "
        "wet_bulb, "
        "humidity_ratio, pressure, timestamp, date, time, year, month, day, hour, minute)");
  CHECK(mapping_error("[weather]\n[weather.dry_bulb]\ncolumn = \"T\"\nunits = \"C\"\n") ==
        "unit.toml:4: [weather] key 'dry_bulb.units' is not known (allowed: column, unit)");
  CHECK(mapping_error("[weather]\ndate = { column = \"D\", unit = \"C\" }\n") ==
        "unit.toml:2: [weather] key 'date.unit' is not known (allowed: column; a time column "
        "has no unit)");
  CHECK(mapping_error("[weather]\ndry_bulb = \"Temperature\"\n") ==
        "unit.toml:2: [weather] dry_bulb must be a table, e.g. dry_bulb = { column = \"...\", "
        "unit = \"...\" }");
  CHECK(mapping_error("[weather]\nfile = 3\n") ==
        "unit.toml:2: [weather] file must be a string in quotes");
  CHECK(mapping_error("[weather]\npressure = { column = 7 }\n") ==
        "unit.toml:2: [weather] pressure.column must be a string in quotes");
  CHECK(mapping_error("[weather]\npressure = { unit = \"Torr\" }\n") ==
        "unit.toml:2: [weather] pressure.unit 'Torr' is not a pressure unit (allowed: Pa, hPa, "
        "mbar, kPa, bar, inHg, psia, atm)");
  CHECK(mapping_error("[weather]\nhumidity = \"enthalpy\"\n") ==
        "unit.toml:2: [weather] humidity: 'enthalpy' is not a humidity source (allowed: "
        "dew-point, humidity-ratio, wet-bulb, relative-humidity)");
  CHECK(mapping_error("[weather]\non_bad_row = \"ignore\"\n") ==
        "unit.toml:2: [weather] on_bad_row: 'ignore' is not a bad-row policy (allowed: error, "
        "skip, fill)");
  CHECK(mapping_error("[weather]\ntime_convention = \"ending\"\n") ==
        "unit.toml:2: [weather] time_convention: 'ending' is not a time convention (allowed: "
        "automatic, hour-beginning, hour-ending)");
}

TEST_CASE("names: keys, labels and policies round-trip") {
  for (std::size_t q = 0; q < wx::kQuantityCount; ++q) {
    const auto quantity = static_cast<wx::Quantity>(q);
    CHECK(wx::quantity_from_key(wx::quantity_key(quantity)) == quantity);
    CHECK_FALSE(wx::quantity_label(quantity).empty());
  }
  CHECK_FALSE(wx::quantity_from_key("enthalpy"));
  for (auto p : {wx::BadRowPolicy::error, wx::BadRowPolicy::skip, wx::BadRowPolicy::fill})
    CHECK(wx::parse_bad_row_policy(wx::bad_row_policy_name(p), "--on-bad-row") == p);
  CHECK(wx::parse_humidity_source(" Wet-Bulb ", "--humidity") == wx::HumiditySource::wet_bulb);
  CHECK(error_of([] { wx::parse_bad_row_policy("drop", "--on-bad-row"); }) ==
        "--on-bad-row: 'drop' is not a bad-row policy (allowed: error, skip, fill)");
}

// --- Derived versions of the real files ---------------------------------------------------
// Each is produced here from tests/data/greensboro-nc-tmy3.csv or pvgis-tmy-45n-8e.csv (see
// SOURCES.md); the checks compare the reader against a plain loop over the same text.

namespace {

// Greensboro with `edit(fields)` applied to every data row (lines 3 to 8762).
std::string greensboro_with(const std::function<void(std::vector<std::string>&)>& edit,
                            const std::string& header = "") {
  return limitline::test::edited_csv(kGreensboro, 2, edit, header);
}

std::string number(double v, int decimals) { return fmt::format("{:.{}f}", v, decimals); }

// The dry-bulb and dew point in °F (°F = 1.8·°C + 32, by definition), the header left at (C).
std::string greensboro_fahrenheit_under_celsius() {
  return greensboro_with([](std::vector<std::string>& f) {
    f[2] = number(std::stod(f[2]) * 1.8 + 32.0, 1);
    f[3] = number(std::stod(f[3]) * 1.8 + 32.0, 1);
  });
}

// Whole-degree Greensboro: the dry-bulb cut to whole °C (as a logger that drops the decimals
// does), the dew point rounded to the nearest whole °C. Saturated hours whose tenths are
// .5 or more come out with the dew point 1 K above the dry-bulb.
std::string greensboro_whole_degrees() {
  return greensboro_with([](std::vector<std::string>& f) {
    f[2] = number(std::floor(std::stod(f[2])), 0);
    f[3] = number(std::round(std::stod(f[3])), 0);
  });
}

std::string with_line_ends(const std::string& text, const std::string& eol) {
  std::string out;
  for (char c : text) out += c == '\n' ? eol : std::string(1, c);
  return out;
}

bool mentions_skip(const std::string& message) {
  return message.find("skip") != std::string::npos || message.find("fill") != std::string::npos;
}

}  // namespace

TEST_CASE("labels: a °F dry-bulb and dew point under (C) headers are refused with the fix") {
  const std::string text = greensboro_fahrenheit_under_celsius();
  for (wx::BadRowPolicy p :
       {wx::BadRowPolicy::error, wx::BadRowPolicy::skip, wx::BadRowPolicy::fill}) {
    CAPTURE(wx::bad_row_policy_name(p));
    const std::string msg =
        error_of([&] { wx::read_text(text, "g.csv", policy(p, 0.01), 101.325); });
    CHECK(msg.rfind("g.csv: column 'Dry-bulb (C)' contradicts its unit °C (from its header)", 0) ==
          0);
    // Greensboro's median dry-bulb near 15 °C is near 60 °F: far above any outdoor median.
    CHECK(msg.find("its median is 60.1 °C") != std::string::npos);
    CHECK(msg.find("read in °F its values are plausible") != std::string::npos);
    CHECK(msg.find("column 'Dew-point (C)' contradicts its unit °C") != std::string::npos);
    CHECK(msg.find("dry_bulb = { unit = \"F\" } and dew_point = { unit = \"F\" }") !=
          std::string::npos);
    CHECK(msg.find("--column 'dry_bulb=Dry-bulb (C):F' --column 'dew_point=Dew-point (C):F'") !=
          std::string::npos);
    CHECK_FALSE(mentions_skip(msg));
  }
  // The fix it names reads the file, and gives back the data set's own °C values.
  wx::Mapping fixed;
  fixed.column(wx::Quantity::dry_bulb).unit = "F";
  fixed.column(wx::Quantity::dew_point).unit = "F";
  const wx::WeatherSeries s = wx::read_text(text, "g.csv", fixed, 101.325);
  const wx::WeatherSeries original = wx::read_file(kGreensboro, {}, 101.325);
  REQUIRE(s.hours.size() == original.hours.size());
  // Within the 0.05 °F the tenths of °F were rounded to.
  for (std::size_t i = 0; i < s.hours.size(); i += 97)
    CHECK(std::fabs(s.hours[i].dry_bulb_c - original.hours[i].dry_bulb_c) <= 0.05 / 1.8 + 1e-9);
}

TEST_CASE("labels: °C values under (F), kPa on an mbar column and RH as a fraction") {
  // °C under (F): every value is plausible as °F, but a whole year whose warmest hour is
  // 35.6 °F (2 °C) is no year of outdoor air.
  const std::string c_as_f = greensboro_with([](std::vector<std::string>&) {},
                                             "Date (MM/DD/YYYY),Time (HH:MM),Dry-bulb (F),"
                                             "Dew-point (F),RHum (%),Pressure (mbar)");
  const std::string a = error_of([&] { wx::read_text(c_as_f, "g.csv", {}, 101.325); });
  CHECK(a.find("column 'Dry-bulb (F)' contradicts its unit °F") != std::string::npos);
  CHECK(a.find("its highest value of a whole year is 2.0 °C") != std::string::npos);
  CHECK(a.find("dry_bulb = { unit = \"C\" }") != std::string::npos);
  CHECK_FALSE(mentions_skip(a));
  // 993 (mbar) read as kPa: every row impossible; hPa (= mbar) reads them.
  const std::string kpa = greensboro_with([](std::vector<std::string>&) {},
                                          "Date (MM/DD/YYYY),Time (HH:MM),Dry-bulb (C),"
                                          "Dew-point (C),RHum (%),Pressure (kPa)");
  const std::string b = error_of([&] { wx::read_text(kpa, "g.csv", {}, 101.325); });
  CHECK(b.find("column 'Pressure (kPa)' contradicts its unit kPa") != std::string::npos);
  CHECK(b.find("8760 of 8760 rows (100.0 %) are impossible for a pressure") != std::string::npos);
  CHECK(b.find("pressure = { unit = \"hPa\" }") != std::string::npos);
  // PVGIS RH (legend: %) written as a 0–1 fraction: a median below 1 % RH.
  std::vector<std::string> lines = lines_of(slurp(kPvgis));
  std::string frac;
  for (std::size_t i = 0; i < lines.size(); ++i) {
    if (i >= 18 && i < 18 + 8760) {
      std::vector<std::string> f = fields_of(lines[i]);
      f[2] = number(std::stod(f[2]) / 100.0, 4);
      lines[i].clear();
      for (std::size_t k = 0; k < f.size(); ++k) lines[i] += (k ? "," : "") + f[k];
    }
    frac += lines[i] + "\n";
  }
  const std::string c = error_of([&] { wx::read_text(frac, "p.csv", {}, 101.325); });
  CHECK(c.find("column 'RH' contradicts its unit % (from the legend, line 8781)") !=
        std::string::npos);
  CHECK(c.find("relative_humidity = { unit = \"fraction\" }") != std::string::npos);
}

TEST_CASE("labels: a few bad rows are bad rows, not a wrong unit") {
  // 20 hours of Greensboro at 75 "°C" (0.23 %): the column is °C; the rows are the fault.
  int n = 0;
  const std::string text = greensboro_with([&](std::vector<std::string>& f) {
    if (n++ % 438 == 5) f[2] = "75.0";
  });
  const std::string msg = error_of([&] { wx::read_text(text, "g.csv", {}, 101.325); });
  CHECK(msg.rfind("g.csv:8: column 'Dry-bulb (C)' value '75.0' is 75 °C", 0) == 0);
  CHECK(msg.find("contradicts") == std::string::npos);
  const wx::WeatherSeries s =
      wx::read_text(text, "g.csv", policy(wx::BadRowPolicy::skip, 0.01), 101.325);
  CHECK(s.info.skipped() == 20);
  CHECK(s.hours.size() == 8740);
}

TEST_CASE("bad-row share: skip and fill refuse beyond 1 % unless it is raised") {
  // Blank dry-bulbs on `blank` rows spread over the year.
  const auto blanked = [](int blank) {
    int row = 0;
    return greensboro_with([&](std::vector<std::string>& f) {
      if (row++ % 80 == 3 && blank-- > 0) f[2] = "";
    });
  };
  // 88 of 8760 rows is 1.005 %: just over the default.
  const std::string over = blanked(88);
  for (wx::BadRowPolicy p : {wx::BadRowPolicy::skip, wx::BadRowPolicy::fill}) {
    wx::Mapping m;
    m.on_bad_row = p;
    const std::string msg = error_of([&] { wx::read_text(over, "g.csv", m, 101.325); });
    CHECK(msg.rfind("g.csv: 88 of 8760 rows (1 %) have missing or impossible values", 0) == 0);
    CHECK(msg.find("allowed: at most 1 % (the default; max_bad_share raises it)") !=
          std::string::npos);
    CHECK(msg.find("the first is line 6: column 'Dry-bulb (C)' value '' is empty") !=
          std::string::npos);
    CHECK(msg.find("max_bad_share = \"1.1%\" in [weather] or --max-bad-share 1.1%") !=
          std::string::npos);
    m.max_bad_share = 0.02;
    const wx::WeatherSeries s = wx::read_text(over, "g.csv", m, 101.325);
    CHECK(s.info.skipped() + s.info.filled() == 88);
    CHECK(s.info.max_bad_share == 0.02);
  }
  // 87 rows (0.99 %) are within the default.
  wx::Mapping skip;
  skip.on_bad_row = wx::BadRowPolicy::skip;
  CHECK(wx::read_text(blanked(87), "g.csv", skip, 101.325).hours.size() == 8760 - 87);
}

TEST_CASE("[weather] max_bad_share: a percentage from 0 % to 100 %") {
  CHECK(mapping_of("[weather]\nmax_bad_share = \"5%\"\n").max_bad_share == doctest::Approx(0.05));
  CHECK(mapping_of("[weather]\nmax_bad_share = 2\n").max_bad_share == doctest::Approx(0.02));
  CHECK(mapping_of("[weather]\nmax_bad_share = \"5%\"\n").max_bad_share_origin == "unit.toml:2");
  CHECK(mapping_error("[weather]\nmax_bad_share = \"150%\"\n") ==
        "unit.toml:2: [weather] max_bad_share: '150%' is not a share of rows; allowed: 0 % to "
        "100 %");
  CHECK(mapping_error("[weather]\nmax_bad_share = \"0.05\"\n").find("ambiguous") !=
        std::string::npos);
  CHECK(wx::parse_max_bad_share("0%", "--max-bad-share") == 0.0);
  CHECK(wx::parse_max_bad_share("100%", "--max-bad-share") == 1.0);
}

TEST_CASE("resolution: each column's step is found from its values") {
  const wx::WeatherSeries g = wx::read_file(kGreensboro, {}, 101.325);
  // Greensboro writes temperatures in tenths of °C, RH in whole %, pressure in whole mbar
  // (the file's own text, e.g. line 3 "01/01/1988,01:00,10.0,6.1,77,993").
  CHECK(g.info.find(wx::Quantity::dry_bulb)->resolution == 0.1);
  CHECK(g.info.find(wx::Quantity::dew_point)->resolution == 0.1);
  CHECK(g.info.find(wx::Quantity::pressure)->resolution == 1.0);
  // Tolerance: 1 °F (0.556 K) plus half a tenth for each column.
  CHECK(g.info.temperature_tolerance_k == doctest::Approx(1.0 / 1.8 + 0.1));
  wx::Mapping rh;
  rh.humidity = wx::HumiditySource::relative_humidity;
  const wx::WeatherSeries r = wx::read_file(kGreensboro, rh, 101.325);
  CHECK(r.info.find(wx::Quantity::relative_humidity)->resolution == 1.0);
  CHECK(r.info.relative_humidity_tolerance == doctest::Approx(0.015));  // 1 % + half of 1 %
  // PVGIS: T2m and RH in hundredths (line 19 "20180101:0000,2.04,94.38,...,99870.0").
  const wx::WeatherSeries p = wx::read_file(kPvgis, {}, 101.325);
  CHECK(p.info.find(wx::Quantity::dry_bulb)->resolution == 0.01);
  CHECK(p.info.find(wx::Quantity::relative_humidity)->resolution == 0.01);
  // Under a day of values nothing is concluded.
  CHECK(read(kHeader + "2019-07-01T13:00,20,10,101.3\n").info.columns.back().resolution == 0.0);
}

TEST_CASE("resolution: whole-degree Greensboro reads, its saturated rows counted") {
  const std::string text = greensboro_whole_degrees();
  // Rows written with the dew point above the dry-bulb, and by how much, counted here.
  const std::vector<std::string> lines = lines_of(text);
  int above = 0;
  double worst = 0.0;
  for (std::size_t i = 2; i < lines.size(); ++i) {
    const std::vector<std::string> f = fields_of(lines[i]);
    const double excess = std::stod(f[3]) - std::stod(f[2]);
    if (excess > 0) ++above, worst = std::max(worst, excess);
  }
  REQUIRE(above > 50);
  CHECK(worst == 1.0);
  const wx::WeatherSeries s = wx::read_text(text, "whole.csv", {}, 101.325);
  CHECK(s.hours.size() == 8760);
  CHECK(s.info.find(wx::Quantity::dry_bulb)->resolution == 1.0);
  CHECK(s.info.find(wx::Quantity::dew_point)->resolution == 1.0);
  CHECK(s.info.temperature_tolerance_k == doctest::Approx(1.0 / 1.8 + 1.0));
  CHECK(s.info.rounding_words == "whole-degree");
  CHECK(s.info.rounded() == above);
  CHECK(s.info.capped() == above);
  // Those hours are saturated: dew point equal to the dry-bulb.
  for (const wx::WeatherHour& h : s.hours)
    CHECK(psy::dew_point_from_humidity_ratio_c(h.humidity_ratio, h.pressure_kpa) <=
          h.dry_bulb_c + 1e-6);
  bool said = false;
  for (const std::string& l : wx::describe(s.info))
    said =
        said || l.rfind(fmt::format("{} rows read as saturated: whole-degree rounding (dew "
                                    "point up to 1.56 K above the dry-bulb read as equal to it; ",
                                    above),
                        0) == 0;
  CHECK(said);

  // A dew point far above the dry-bulb stays an error, the tolerance stated.
  std::string far = text;
  const std::string row3 = lines[2];  // "01/01/1988,01:00,10,6,77,993"
  REQUIRE(row3 == "01/01/1988,01:00,10,6,77,993");
  far.replace(far.find(row3), row3.size(), "01/01/1988,01:00,10,12,77,993");
  CHECK(error_of([&] { wx::read_text(far, "whole.csv", {}, 101.325); }) ==
        "whole.csv:3: column 'Dew-point (C)' value '12' is a dew point of 12 °C, above the "
        "dry-bulb 10 °C; allowed: up to the dry-bulb (up to 1.56 K above is read as "
        "saturation: 0.56 K plus the whole-degree rounding of the values) (or set on_bad_row "
        "to skip or fill)");
}

TEST_CASE("humidity: RH 0 % is a bad row with file, line and column; skip and fill apply") {
  const std::string csv =
      "Timestamp,Temp (C),RH (%)\n2019-07-01T12:00,20,50\n"
      "2019-07-01T13:00,20,0\n2019-07-01T14:00,20,60\n";
  CHECK(read_error(csv) ==
        "t.csv:3: column 'RH (%)' value '0' is 0 % relative humidity, air drier than the "
        "psychrometric model reaches (a dew point below -100 °C); allowed: a humidity above 0 "
        "(0 is a failed sensor or a missing reading) (or set on_bad_row to skip or fill)");
  const wx::WeatherSeries s = read(csv, policy(wx::BadRowPolicy::skip));
  CHECK(s.hours.size() == 2);
  CHECK(s.info.skipped() == 1);
  const wx::WeatherSeries f = read(csv, policy(wx::BadRowPolicy::fill));
  CHECK(f.info.filled() == 1);
  CHECK(rh_of(f.hours[1]) == doctest::Approx(0.55).epsilon(1e-3));  // halfway at 20 °C
  // A humidity ratio of 0 the same way.
  CHECK(read_error("Timestamp,Temp (C),Humidity Ratio (kg/kg)\n2019-07-01T13:00,20,0\n")
            .find("t.csv:2: column 'Humidity Ratio (kg/kg)' value '0' is 0 kg/kg, air drier") == 0);
}

TEST_CASE("one year: a file spanning several years is refused with its span") {
  std::string ten = "Timestamp,Temp (C),RH (%)\n";
  for (int y = 2001; y <= 2010; ++y)
    for (int m = 1; m <= 12; ++m)
      for (int d = 1; d <= kDays[m - 1] + (m == 2 && y % 4 == 0 ? 1 : 0); ++d)
        for (int h = 0; h < 24; ++h)
          ten += fmt::format("{}-{:02}-{:02}T{:02}:00,15,50\n", y, m, d, h);
  CHECK(read_error(ten) ==
        "t.csv: the file spans 2001-01-01 to 2010-12-31, 10 years; evaluate one year at a time "
        "(line 2 and line 8762 are both 01-01 00:00, of 2001 and 2002); allowed: one year of "
        "rows, or a typical year whose months come from different years");
  // Thirteen months: the first January's hours come back a year later.
  const std::string thirteen = kHeader +
                               "2019-01-15T00:00,5,0,101.3\n2019-06-01T00:00,5,0,101.3\n"
                               "2020-01-15T00:00,5,0,101.3\n";
  CHECK(read_error(thirteen).rfind("t.csv: the file spans 2019-01-15 to 2020-01-15, more than "
                                   "one year (366 days)",
                                   0) == 0);
  // A calendar year stamped hour-ending, its last row 00:00 of the next 1 January, is one.
  std::string year = kHeader;
  for (int m = 1; m <= 12; ++m)
    for (int d = 1; d <= kDays[m - 1]; ++d)
      for (int h = (m == 1 && d == 1) ? 1 : 0; h < 24; ++h)
        year += fmt::format("2019-{:02}-{:02}T{:02}:00,5,0,101.3\n", m, d, h);
  year += "2020-01-01T00:00,5,0,101.3\n";
  wx::Mapping ending;
  ending.time_convention = wx::TimeConvention::hour_ending;
  CHECK(read(year, ending).hours.size() == 8760);
  CHECK(read(year).hours.size() == 8760);
}

TEST_CASE("line ends: CR only, CRLF and a byte-order mark read as LF does") {
  const std::string lf = slurp(kGreensboro);
  const wx::WeatherSeries a = wx::read_text(lf, "g.csv", {}, 101.325);
  for (const std::string& variant : {with_line_ends(lf, "\r"), with_line_ends(lf, "\r\n"),
                                     "\xEF\xBB\xBF" + with_line_ends(lf, "\r")}) {
    const wx::WeatherSeries b = wx::read_text(variant, "g.csv", {}, 101.325);
    REQUIRE(b.hours.size() == a.hours.size());
    CHECK(b.info.header_line == 2);
    CHECK(b.info.last_data_line == 8762);
    CHECK(b.hours.back().dry_bulb_c == a.hours.back().dry_bulb_c);
    CHECK(b.hours[4000].humidity_ratio == a.hours[4000].humidity_ratio);
  }
  // Line numbers in messages count CR-only lines.
  CHECK(
      read_error("Timestamp,Temp (C),RH (%)\r2019-07-01T13:00,20,50\r2019-07-01T14:00,20,130\r") ==
      "t.csv:3: column 'RH (%)' value '130' is 130 % relative humidity; allowed 0 % to 100 % "
      "(up to 101 % is read as 100 %) (or set on_bad_row to skip or fill)");
}

TEST_CASE("messages: echoed values have control characters escaped and long ones cut") {
  wx::Mapping m;
  m.column(wx::Quantity::pressure).column = "Baro\x1b[31m";
  m.column(wx::Quantity::pressure).origin = "--column";
  const std::string msg = read_error(kHeader + "2019-07-01T13:00,20,10,101.3\n", m);
  CHECK(msg.rfind("--column: column 'Baro\\x1b[31m' given for pressure", 0) == 0);
  CHECK(msg.find('\x1b') == std::string::npos);
  const std::string long_value(500, '7');
  const std::string cell = read_error(kHeader + "2019-07-01T13:00," + long_value + "x,10,101.3\n");
  CHECK(cell.find("(501 characters)") != std::string::npos);
  CHECK(cell.size() < 300);
}

TEST_CASE("accepts_unit: the unit spellings of each quantity, none for time columns") {
  CHECK(wx::accepts_unit(wx::Quantity::dry_bulb, "F"));
  CHECK(wx::accepts_unit(wx::Quantity::dry_bulb, "degC"));
  CHECK(wx::accepts_unit(wx::Quantity::pressure, "mbar"));
  CHECK_FALSE(wx::accepts_unit(wx::Quantity::pressure, "F"));
  CHECK_FALSE(wx::accepts_unit(wx::Quantity::time, "MM)"));
  CHECK_FALSE(wx::accepts_unit(wx::Quantity::dry_bulb, "MM)"));
}
