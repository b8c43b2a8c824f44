// Weather import: the two real open data sets of tests/data (sources in tests/data/SOURCES.md),
// checked row by row against their own text, and every layout, override and error path on
// small inline files. Inline files are layouts, not check values: where a number is checked it
// comes from a unit definition (NIST SP 811 conversion factors, from memory), from psychrolib
// 1.1.1 (npm, the version pinned in tests/crosscheck), or from the data set's own columns.
#include <doctest/doctest.h>

#include <limitline/psychro.hpp>
#include <limitline/weather.hpp>

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

wx::Mapping policy(wx::BadRowPolicy p) {
  wx::Mapping m;
  m.on_bad_row = p;
  return m;
}

// The message of the InputError `f` throws ("" when it throws none).
std::string error_of(const std::function<void()>& f) {
  try {
    f();
  } catch (const InputError& e) {
    return e.what();
  }
  return "";
}

std::string read_error(const std::string& csv, const wx::Mapping& m = {}, double site = 101.325) {
  return error_of([&] { read(csv, m, site); });
}

bool has_line(const std::vector<std::string>& lines, const std::string& line) {
  for (const std::string& l : lines)
    if (l == line) return true;
  return false;
}

double rh_of(const wx::WeatherHour& h) {
  return psy::relative_humidity_from_humidity_ratio(h.dry_bulb_c, h.humidity_ratio,
                                                    h.pressure_kpa);
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
  CHECK(d[0] == "weather: greensboro-nc-tmy3.csv, 8760 rows (lines 3 to 8762; header on line "
                "2; delimiter ',')");
  CHECK(d[1] == "time: 'Date (MM/DD/YYYY)' + 'Time (HH:MM)', MM/DD/YYYY + HH:MM, local clock; "
                "hour-ending stamps (24:00 present) read as hour-beginning hours 0-23");
  CHECK(has_line(d, "dry-bulb: column 'Dry-bulb (C)', °C (found by header)"));
  CHECK(has_line(d, "humidity: dew point, column 'Dew-point (C)', °C (found by header); not "
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
  CHECK(d[1] == "time: 'time(UTC)', YYYYMMDD:HHMM, UTC clock (hours of the day are UTC); "
                "hour-beginning stamps");
  CHECK(has_line(d, "dry-bulb: column 'T2m', °C (found by header; unit from legend line 8780)"));
  CHECK(has_line(d, "pressure: column 'SP', Pa (found by header; unit from legend line 8788)"));
  CHECK(has_line(d, "typical year: months from different years (Jan 2018, Feb 2007, Mar 2009, "
                    "Apr 2013, May 2008, Jun 2006, Jul 2011, Aug 2010, Sep 2020, Oct 2006, Nov "
                    "2007, Dec 2016), not in time order at month boundaries; accepted"));
}

TEST_CASE("read_file: a missing file is an InputError naming it") {
  const std::string msg = error_of([] { wx::read_file(kData + "/no-such-file.csv", {}, 101.325); });
  CHECK(msg == kData + "/no-such-file.csv: cannot open the weather file (No such file or "
                       "directory)");
}
