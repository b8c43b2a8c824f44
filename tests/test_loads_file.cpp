// The hourly loads file: reading its columns, units and time axis, matching it to a weather
// series by time stamp or by row, and every error path with its file, line and column. The
// loads in the inline files are invented inputs; where a value is checked it is the file's
// own number, or that number through a unit definition (1 W = 3.412141633 Btu/h, the
// international-table Btu of NIST SP 811 B.8, from memory; a ton is 12,000 Btu/h, common
// practice), or, for the real Greensboro TMY3 weather of tests/data, a formula of that file's
// own dry-bulb column.
#include <doctest/doctest.h>

#include "support/input_error.hpp"

#include <limitline/app/year_job.hpp>
#include <limitline/error.hpp>
#include <limitline/io/loads_file.hpp>
#include <limitline/io/weather.hpp>

#include <fmt/format.h>

#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

namespace loads = limitline::loads;
namespace wx = limitline::weather;
using limitline::InputError;
using limitline::UnitFile;

namespace {

constexpr double kKwPerKbtuh = 1.0 / 3.412141633;  // NIST SP 811, from memory

UnitFile::LoadsFile spec(const std::string& sensible = "Sensible (kW)",
                         const std::string& latent = "") {
  UnitFile::LoadsFile f;
  f.path = "loads.csv";
  f.origin = "unit.toml:11: loads.file";
  f.sensible_column = sensible;
  f.sensible_origin = "unit.toml:12: loads.sensible";
  f.latent_column = latent;
  if (!latent.empty()) f.latent_origin = "unit.toml:13: loads.latent";
  return f;
}

loads::LoadsTable read(const std::string& csv, const UnitFile::LoadsFile& s = spec()) {
  return loads::read_text(csv, "loads.csv", s);
}

using limitline::test::error_of;

bool starts(const std::string& s, const std::string& prefix) {
  INFO("'", s, "' should start with '", prefix, "'");
  return s.rfind(prefix, 0) == 0;
}
bool contains(const std::string& s, const std::string& part) {
  INFO("'", s, "' should contain '", part, "'");
  return s.find(part) != std::string::npos;
}

// A weather series of `days` days from 1 January, one interval every `step` minutes: only
// its time axis matters to the match.
wx::WeatherSeries weather_of(int days, int step = 60) {
  wx::WeatherSeries w;
  w.info.source = "weather.csv";
  w.info.time.step_min = step;
  for (int d = 0; d < days; ++d)
    for (int m = 0; m < 1440; m += step) {
      wx::WeatherHour h;
      h.month = 1;
      h.day = 1 + d;
      h.hour = m / 60;
      h.minute = m % 60;
      h.weight_h = step / 60.0;
      w.hours.push_back(h);
    }
  return w;
}

// `hours` hourly rows from 1 January 2019 00:00, sensible = 100 + n and latent = n/10 in row
// n, stamped at the interval's start (or end, `hour_ending`, 24:00 for midnight).
std::string hourly_csv(int hours, bool hour_ending = false,
                       const std::string& header = "Date,Time,Sensible (kW),Latent (kW)") {
  std::string out = header + "\n";
  for (int n = 0; n < hours; ++n) {
    int minute = n * 60 + (hour_ending ? 60 : 0);
    int day = 1 + minute / 1440;
    minute %= 1440;
    if (hour_ending && minute == 0) --day, minute = 1440;
    out += fmt::format("01/{:02}/2019,{:02}:{:02},{},{}\n", day, minute / 60, minute % 60, 100 + n,
                       n / 10.0);
  }
  return out;
}

std::string slurp(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

}  // namespace

TEST_CASE("columns, units and stamps: a title line above the header is skipped") {
  const std::string csv = "Zone loads, exported for the test\n" + hourly_csv(24);
  const loads::LoadsTable t = read(csv, spec("Sensible (kW)", "latent (KW)"));
  CHECK(t.header_line == 2);
  CHECK(t.timed);
  CHECK(t.time_columns == "'Date' + 'Time'");
  CHECK(t.step_min == 60);
  CHECK_FALSE(t.hour_ending);
  CHECK(t.sensible_header == "Sensible (kW)");
  CHECK(t.sensible_unit == "kW");           // from the header
  CHECK(t.latent_header == "Latent (kW)");  // the column named in any case
  REQUIRE(t.rows.size() == 24);
  CHECK(t.rows[0].line == 3);
  CHECK(t.rows[13].month == 1);
  CHECK(t.rows[13].day == 1);
  CHECK(t.rows[13].minute == 13 * 60);
  CHECK(t.rows[13].loads.sensible_kw == 113.0);
  CHECK(t.rows[13].loads.latent_kw == 1.3);
  CHECK(loads::describe(t) ==
        "loads.csv: 'Sensible (kW)' in kW sensible, 'Latent (kW)' in kW latent; 24 rows matched "
        "by time stamp ('Date' + 'Time'; 60-min step)");
  // Without a latent column the space has no latent gain.
  const loads::LoadsTable s = read(csv);
  CHECK(s.latent_header.empty());
  CHECK(s.rows[13].loads.latent_kw == 0.0);
}

TEST_CASE("units: the unit file's, the header's, kBtu/h and tons converted to kW") {
  const std::string csv =
      "Time stamp,Sensible (kBtu/h),Latent,Cooling (ton)\n"
      "2019-01-01 00:00,34.12141633,6.824283266,2\n";
  // 34.12141633 kBtu/h = 10 kW and 6.824283266 kBtu/h = 2 kW (1 W = 3.412141633 Btu/h).
  UnitFile::LoadsFile s = spec("Sensible (kBtu/h)", "Latent");
  s.latent_unit = "kBtu/h";
  loads::LoadsTable t = read(csv, s);
  CHECK(t.rows[0].loads.sensible_kw == doctest::Approx(10.0).epsilon(1e-12));
  CHECK(t.rows[0].loads.latent_kw == doctest::Approx(2.0).epsilon(1e-12));
  CHECK(t.sensible_unit == "kBtu/h");
  CHECK(t.latent_unit == "kBtu/h");
  // 2 tons = 24,000 Btu/h = 24/3.412141633 kW (common practice: 1 ton = 12,000 Btu/h); the
  // units table holds the ton to 10 digits.
  t = read(csv, spec("Cooling (ton)"));
  CHECK(t.rows[0].loads.sensible_kw == doctest::Approx(24.0 * kKwPerKbtuh).epsilon(1e-9));
  // The unit file's unit agrees with the header's: accepted; contradicts it: refused.
  s = spec("Sensible (kBtu/h)");
  s.sensible_unit = "kbtu/h";
  CHECK(read(csv, s).rows[0].loads.sensible_kw == doctest::Approx(10.0));
  s.sensible_unit = "kW";
  CHECK(error_of([&] { (void)read(csv, s); }) ==
        "unit.toml:12: loads.sensible.unit: 'kW' contradicts the unit 'kBtu/h' in the header of "
        "column 'Sensible (kBtu/h)' of loads.csv (line 1); give the column's own unit, or leave "
        "unit out to use the header's");
  // No unit anywhere: refused, saying how to give it.
  const std::string none = error_of([&] { (void)read(csv, spec("Sensible (kBtu/h)", "Latent")); });
  CHECK(none ==
        "unit.toml:13: loads.latent: column 'Latent' of loads.csv (line 1) gives no power unit in "
        "its header; give it in the unit file, unit = \"kW\" in loads.latent (allowed: kW, W, "
        "Btu/h, kBtu/h, ton)");
  // Brackets that hold no power unit: the unit file's unit is used; without one, refused.
  const std::string zone = "Time stamp,Sensible (zone 1)\n2019-01-01 00:00,5\n";
  s = spec("Sensible (zone 1)");
  CHECK(contains(error_of([&] { (void)read(zone, s); }),
                 "gives no power unit in its header "
                 "('zone 1' is not one)"));
  s.sensible_unit = "W";
  CHECK(read(zone, s).rows[0].loads.sensible_kw == doctest::Approx(0.005));
}

TEST_CASE("matched by time stamp: each weather interval gets the row of its own interval") {
  const wx::WeatherSeries w = weather_of(2);
  const loads::Matched m = loads::match(read(hourly_csv(48)), w);
  REQUIRE(m.hours.size() == 48);
  CHECK(m.warnings.empty());
  for (std::size_t i = 0; i < 48; ++i) CHECK(m.hours[i].sensible_kw == 100.0 + i);
  // Hour-ending stamps (01:00 .. 24:00) name the same intervals by their end.
  const loads::LoadsTable ending = read(hourly_csv(48, true));
  CHECK(ending.hour_ending);
  CHECK(ending.rows[0].minute == 0);  // "01:00" is the interval from 00:00
  CHECK(ending.rows[23].day == 1);    // "24:00" ends 1 January
  const loads::Matched e = loads::match(ending, w);
  for (std::size_t i = 0; i < 48; ++i) CHECK(e.hours[i].sensible_kw == 100.0 + i);
  // The months may come in any order (a typical year), each month in time order.
  wx::WeatherSeries jan_feb = w;
  for (std::size_t i = 24; i < 48; ++i) jan_feb.hours[i].month = 2, jan_feb.hours[i].day = 1;
  std::string reordered = "Month,Day,Hour,Sensible (kW)\n";
  for (int h = 1; h <= 24; ++h) reordered += fmt::format("2,1,{},{}\n", h, 200 + h);
  for (int h = 1; h <= 24; ++h) reordered += fmt::format("1,1,{},{}\n", h, 100 + h);
  const loads::Matched r = loads::match(read(reordered), jan_feb);
  CHECK(r.hours[0].sensible_kw == 101.0);
  CHECK(r.hours[24].sensible_kw == 201.0);
  // The weather's step may be finer: every 15-min interval takes its hour's row.
  const loads::Matched q = loads::match(read(hourly_csv(48)), weather_of(2, 15));
  REQUIRE(q.hours.size() == 192);
  CHECK(q.hours[0].sensible_kw == 100.0);
  CHECK(q.hours[3].sensible_kw == 100.0);
  CHECK(q.hours[4].sensible_kw == 101.0);
  CHECK(q.hours[191].sensible_kw == 147.0);
}

TEST_CASE("matched by time stamp against real typical-year weather (Greensboro TMY3)") {
  // The TMY3 file is hour-ending, each month from a different year (tests/data/SOURCES.md).
  // A loads file of month, day and hour-ending hour columns, with sensible = 10 + the file's
  // own dry-bulb of that row, must give each weather hour 10 + its dry-bulb.
  const std::string path = std::string(LIMITLINE_TEST_DATA_DIR) + "/greensboro-nc-tmy3.csv";
  const wx::WeatherSeries w = wx::read_file(path, {}, 101.325);
  std::istringstream in(slurp(path));
  std::string line;
  std::getline(in, line);  // station line
  std::getline(in, line);  // header
  std::string csv = "Month,Day,Hour,Sensible (kW)\n";
  while (std::getline(in, line)) {
    // "01/01/1988,01:00,10.0,..." → month, day, hour, and 10 + the dry-bulb written there.
    const double dry = std::stod(line.substr(17, line.find(',', 17) - 17));
    csv += fmt::format("{},{},{},{}\n", line.substr(0, 2), line.substr(3, 2), line.substr(11, 2),
                       10.0 + dry);
  }
  const loads::LoadsTable t = read(csv);
  CHECK(t.hour_ending);
  CHECK(t.rows.size() == 8760);
  const loads::Matched m = loads::match(t, w);
  REQUIRE(m.hours.size() == w.hours.size());
  for (std::size_t i = 0; i < w.hours.size(); ++i) {
    INFO("weather hour ", i);
    REQUIRE(m.hours[i].sensible_kw == doctest::Approx(10.0 + w.hours[i].dry_bulb_c));
  }
}

TEST_CASE("matched by row when the file has no time columns") {
  const std::string csv = "Hour of year,Sensible (kW)\n1,10\n2,11\n3,12\n";
  const loads::LoadsTable t = read(csv);
  CHECK_FALSE(t.timed);
  CHECK(loads::describe(t) ==
        "loads.csv: 'Sensible (kW)' in kW sensible, no latent column; 3 rows matched row by row "
        "(no time columns)");
  wx::WeatherSeries w = weather_of(1);
  w.hours.resize(3);
  const loads::Matched m = loads::match(t, w);
  REQUIRE(m.hours.size() == 3);
  CHECK(m.hours[2].sensible_kw == 12.0);
  // The counts must be equal.
  w.hours.resize(4);
  CHECK(error_of([&] { (void)loads::match(t, w); }) ==
        "loads.csv: 3 data rows (lines 2 to 4), but the weather weather.csv has 4; matched row "
        "by row (the file has no time columns), the counts must be equal");
  // A weather file that dropped rows no longer lines up row by row.
  w.hours.resize(3);
  w.info.months[0].skipped = 1;
  CHECK(contains(error_of([&] { (void)loads::match(t, w); }),
                 "the weather weather.csv dropped 1 bad row, so the two no longer line up"));
}

TEST_CASE("a mismatch of times is an error naming the first unmatched time") {
  const wx::WeatherSeries w = weather_of(2);
  // A missing row: the weather's interval without loads.
  std::string gap = hourly_csv(48);
  const std::string row5 = "01/01/2019,05:00,105,0.5\n";
  gap.erase(gap.find(row5), row5.size());
  CHECK(error_of([&] { (void)loads::match(read(gap), w); }) ==
        "loads.csv: no row for 01-01 05:00, the start of an interval of the weather weather.csv; "
        "the file's rows start their intervals at 01-01 00:00 (line 2) to 01-02 23:00 (line 48); "
        "allowed: one row for each weather interval, matched by month, day and time of day");
  // Hour-ending loads read as hour-beginning are an hour late: the messages say so.
  const std::string ending = hourly_csv(48, true);
  UnitFile::LoadsFile s = spec();
  s.time_convention = wx::TimeConvention::hour_beginning;
  CHECK(contains(error_of([&] { (void)read(ending, s); }),
                 "loads.csv:25: time 24:00 cannot start an interval"));
  // A row no weather interval uses: an error, or a warning when the weather lacks intervals.
  const std::string extra = hourly_csv(49);
  const std::string e = error_of([&] { (void)loads::match(read(extra), w); });
  CHECK(e ==
        "1 row of loads.csv (line 50, 01-03 00:00) matches no interval of the weather "
        "weather.csv; allowed: rows for the weather's intervals only (loads of the same year as "
        "the weather, a leap day only when both have one)");
  wx::WeatherSeries holed = w;
  holed.info.time.missing_steps = 1;
  const loads::Matched m = loads::match(read(extra), holed);
  REQUIRE(m.warnings.size() == 1);
  CHECK(m.warnings[0] ==
        "1 row of loads.csv (line 50, 01-03 00:00) matches no interval of the weather "
        "weather.csv, which lacks intervals (skipped bad rows or missing time steps); their loads "
        "are not used");
  // A loads step finer than the weather's would lose loads.
  std::string quarter = "Date,Time,Sensible (kW)\n";
  for (int k = 0; k < 8; ++k)
    quarter += fmt::format("01/01/2019,{:02}:{:02},{}\n", k / 4, k % 4 * 15, k);
  CHECK(error_of([&] { (void)loads::match(read(quarter), w); }) ==
        "loads.csv: time step 15 min, the weather weather.csv's 60 min; allowed: the weather's "
        "step or a whole multiple of it (each weather interval takes the loads row its start "
        "falls in)");
}

TEST_CASE("bad cells are errors naming the file, the line and the column") {
  const std::string head = "Date,Time,Sensible (kW),Latent (kW)\n01/01/2019,00:00,10,1\n";
  const UnitFile::LoadsFile both = spec("Sensible (kW)", "Latent (kW)");
  const auto row = [&](const std::string& cells) {
    return error_of([&] { (void)read(head + "01/01/2019,01:00," + cells + "\n", both); });
  };
  CHECK(row("abc,1") ==
        "loads.csv:3: column 'Sensible (kW)' value 'abc' is not a number; allowed: a number in kW "
        "(the sensible load of the interval)");
  CHECK(row(",1") ==
        "loads.csv:3: column 'Sensible (kW)' is empty; allowed: a number in kW (the sensible load "
        "of the interval)");
  CHECK(starts(row("NaN,1"),
               "loads.csv:3: column 'Sensible (kW)' value 'NaN' marks a missing "
               "value"));
  CHECK(starts(row("-9999,1"),
               "loads.csv:3: column 'Sensible (kW)' value '-9999' marks a "
               "missing value"));
  CHECK(starts(row("inf,1"), "loads.csv:3: column 'Sensible (kW)' value 'inf' is not a number"));
  CHECK(row("10,-0.5") ==
        "loads.csv:3: column 'Latent (kW)' value '-0.5' is negative; allowed: 0 or more (the "
        "space's moisture is added, never removed)");
  CHECK(starts(row("1e7,1"),
               "loads.csv:3: column 'Sensible (kW)' value '1e7' is 1e+07 kW, "
               "beyond any load of one air handler's space"));
  CHECK(row("10") ==
        "loads.csv:3: the row has 3 fields but the header (line 1) has 4; allowed: one value per "
        "header column");
  CHECK(starts(error_of([&] { (void)read(head + "13/45/2019,01:00,10,1\n", both); }),
               "loads.csv:3: column 'Date' value '13/45/2019' is not readable as a time"));
  // A negative sensible load is a space that loses heat: accepted.
  CHECK(read(head + "01/01/2019,01:00,-12.5,0\n", both).rows[1].loads.sensible_kw == -12.5);
  // Semicolons with decimal commas, quoted fields, CR LF line ends.
  const loads::LoadsTable t =
      read("\"Date\";\"Time\";\"Sensible (kW)\"\r\n01/01/2019;00:00;\"1,5\"\r\n");
  CHECK(t.rows[0].loads.sensible_kw == 1.5);
}

TEST_CASE("the header and the time axis: columns found, one row per interval, one step") {
  CHECK(error_of([&] { (void)read("Date,Time,Sens\n01/01/2019,00:00,1\n"); }) ==
        "unit.toml:12: loads.sensible: column 'Sensible (kW)' is not in loads.csv: no line of it "
        "names that column (line 1 has: 'Date', 'Time', 'Sens')");
  CHECK(error_of([&] { (void)read(hourly_csv(2), spec("Sensible (kW)", "Moisture")); }) ==
        "unit.toml:13: loads.latent: column 'Moisture' is not in the header of loads.csv (line 1: "
        "'Date', 'Time', 'Sensible (kW)', 'Latent (kW)')");
  CHECK(
      contains(error_of([&] { (void)read(hourly_csv(2), spec("Sensible (kW)", "sensible (kw)")); }),
               "is the sensible column too"));
  CHECK(error_of([&] { (void)read(" \n\n"); }) ==
        "loads.csv: the loads file is empty; allowed: a header line naming the columns and data "
        "rows");
  CHECK(error_of([&] { (void)read("Date,Time,Sensible (kW)\n\n"); }) ==
        "loads.csv:1: the header is followed by no data rows");
  const std::string head = "Date,Time,Sensible (kW)\n";
  CHECK(starts(error_of([&] { (void)read(head + "01/01/2019,01:00,1\n01/01/2019,01:00,2\n"); }),
               "loads.csv:3: time 2019-01-01 01:00 repeats the row at line 2"));
  CHECK(starts(error_of([&] { (void)read(head + "01/01/2019,02:00,1\n01/01/2019,01:00,2\n"); }),
               "loads.csv:3: time 2019-01-01 01:00 comes before the row at line 2"));
  // The same interval from two years (2019 and 2020) is two years of loads.
  CHECK(starts(error_of([&] {
                 (void)read(head + "01/01/2019,01:00,1\n02/01/2019,01:00,1\n01/01/2020,01:00,2\n");
               }),
               "loads.csv:4: the interval starting 01-01 01:00 is already the row at line 2"));
  CHECK(starts(error_of([&] { (void)read(head + "01/01/2019,00:00,1\n01/01/2019,00:07,2\n"); }),
               "loads.csv: time step 7 min; allowed: 60 min or a whole fraction of an hour"));
  CHECK(starts(error_of([&] {
                 (void)read(head + "01/01/2019,00:00,1\n01/01/2019,01:00,2\n01/01/2019,24:00,3\n");
               }),
               "loads.csv:2: time 00:00 in a file that also marks midnight as 24:00 (line 4)"));
  CHECK(starts(error_of([&] { (void)read(head + "01/01/2019,00:10,1\n01/01/2019,01:10,2\n"); }),
               "loads.csv:2: the interval starting 01-01 00:10 is off the file's 60-min grid"));
  // Hour-ending without 24:00 needs the unit file to say so: "01:00" then ends the first hour.
  UnitFile::LoadsFile s = spec();
  s.time_convention = wx::TimeConvention::hour_ending;
  const loads::LoadsTable t = read(head + "01/01/2019,01:00,1\n01/01/2019,02:00,2\n", s);
  CHECK(t.hour_ending);
  CHECK(t.rows[0].minute == 0);
  CHECK(t.rows[1].minute == 60);
  // A date alone is no time of day.
  CHECK(starts(error_of([&] { (void)read("Date,Sensible (kW)\n2019-01-01,1\n"); }),
               "loads.csv:2: column 'Date' value '2019-01-01' is not readable as a time"));
}

TEST_CASE("read_file names a file it cannot read") {
  CHECK(contains(error_of([] { (void)loads::read_file("/nonexistent/loads.csv", spec()); }),
                 "/nonexistent/loads.csv"));
  CHECK(contains(error_of([] { (void)loads::read_file(LIMITLINE_TEST_DATA_DIR, spec()); }),
                 "folder"));
}

TEST_CASE("the app layer reads the loads beside the unit file and matches them to each weather") {
  namespace fs = std::filesystem;
  const fs::path dir = fs::path(LIMITLINE_BINARY_DIR) / "test-loads-file";
  fs::create_directories(dir / "sub");
  const auto write = [&](const fs::path& p, const std::string& text) {
    std::ofstream(p, std::ios::binary) << text;
  };
  // Two days of weather, hour-beginning; the loads file hour-ending, in a folder beside.
  std::string weather = "Date,Time,Dry-bulb (C),Dew-point (C)\n";
  for (int n = 0; n < 48; ++n)
    weather += fmt::format("01/{:02}/2019,{:02}:00,{},5\n", 1 + n / 24, n % 24, 10 + n % 24);
  write(dir / "weather.csv", weather);
  write(dir / "other.csv", weather.substr(0, weather.find("01/02/2019")));  // one day
  write(dir / "sub" / "loads.csv", hourly_csv(48, true));
  write(dir / "unit.toml", R"toml([air_handler]
supply_airflow = "12000cfm"
supply_air_temp = "55F"
min_outdoor_air = "20%"
return_air_temp = "75F"
return_air_rh = "50%"
airflow_control = "variable"
[loads]
space_temp = "75F"
file = "sub/loads.csv"
sensible = { column = "Sensible (kW)" }
latent = { column = "Latent (kW)" }
[weather]
file = "weather.csv"
)toml");
  const limitline::YearInputs in =
      limitline::load_year_inputs({(dir / "unit.toml").string(), false}, {});
  REQUIRE(in.loads_table);
  CHECK(in.loads_label == (dir / "sub" / "loads.csv").string());
  REQUIRE(in.hourly_loads.size() == in.weather.hours.size());
  REQUIRE(in.hourly_loads.size() == 48);
  CHECK(in.hourly_loads[0].sensible_kw == 100.0);
  CHECK(in.hourly_loads[47].sensible_kw == 147.0);
  CHECK(in.hourly_loads[47].latent_kw == doctest::Approx(4.7));
  // Another weather file (a batch site): the same table, matched again; one day of weather
  // leaves the second day's loads unused, an error naming the first.
  CHECK(
      starts(error_of([&] { (void)limitline::with_weather(in, (dir / "other.csv").string(), {}); }),
             "24 rows of loads.csv (the first line 26, 01-02 00:00) match no interval of the "
             "weather other.csv"));
  const limitline::YearInputs again =
      limitline::with_weather(in, (dir / "weather.csv").string(), {});
  CHECK(again.loads_table == in.loads_table);
  CHECK(again.hourly_loads.size() == 48);
  // A base assembled without the table (as a caller may) reads it.
  limitline::YearInputs bare;
  bare.unit = in.unit;
  const limitline::YearInputs read_here =
      limitline::with_weather(bare, (dir / "weather.csv").string(), {});
  REQUIRE(read_here.loads_table);
  CHECK(read_here.hourly_loads[5].sensible_kw == 105.0);
  // Without a loads file nothing is read.
  std::string label;
  UnitFile plain = in.unit;
  plain.loads_file.reset();
  CHECK(limitline::read_unit_loads(plain, false, label) == nullptr);
  fs::remove_all(dir);
}
