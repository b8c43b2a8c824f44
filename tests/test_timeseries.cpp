// The shared stages of the series readers (io/timeseries), one behaviour each, each stage on
// its own: lines → header and layout → time axis → columns with units → series. The weather
// and trend suites test the readers built from them.
#include <limitline/io/timeseries.hpp>

#include <doctest/doctest.h>

#include <algorithm>
#include <array>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

namespace ts = limitline::timeseries;

namespace {

std::string slurp(const std::string& name) {
  std::ifstream in(std::string(LIMITLINE_TEST_DATA_DIR) + "/" + name, std::ios::binary);
  REQUIRE(in);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

std::vector<std::string> texts(const std::vector<ts::Line>& lines) {
  std::vector<std::string> out;
  for (const ts::Line& l : lines) out.emplace_back(l.text);
  return out;
}

// The lines of `text` fed to a LineSplitter in two pieces cut at `at`.
std::vector<std::string> streamed(std::string_view text, std::size_t at) {
  std::vector<std::string> out;
  ts::LineSplitter splitter;
  const auto on_line = [&](std::string_view l) { out.emplace_back(l); };
  splitter.feed(text.substr(0, at), on_line);
  splitter.feed(text.substr(at), on_line);
  splitter.finish(on_line);
  return out;
}

}  // namespace

// --- 1. Lines ------------------------------------------------------------------------------

TEST_CASE("lines: LF, CR LF and a lone CR end lines, a byte-order mark is dropped") {
  using V = std::vector<std::string>;
  CHECK(texts(ts::split_lines("a\nb\n")) == V{"a", "b"});
  CHECK(texts(ts::split_lines("a\r\nb\r\n")) == V{"a", "b"});
  CHECK(texts(ts::split_lines("a\rb\r")) == V{"a", "b"});  // a text without LF: old Mac exports
  CHECK(texts(ts::split_lines("\xEF\xBB\xBF"
                              "a\nb")) == V{"a", "b"});
  // In a text that has LFs a stray CR inside a line is text, not a line end.
  CHECK(texts(ts::split_lines("a\rx\nb\n")) == V{"a\rx", "b"});
  CHECK(texts(ts::split_lines("a\n\nb")) == V{"a", "", "b"});

  const std::vector<ts::Line> lines = ts::split_lines("x\ny\n");
  CHECK(lines[0].number == 1);
  CHECK(lines[1].number == 2);

  // The Greensboro TMY3 file: the station line, the header and 8760 rows (tests/data/SOURCES.md).
  CHECK(ts::split_lines(slurp("greensboro-nc-tmy3.csv")).size() == 8762);
}

TEST_CASE("lines: text arriving in pieces is cut as the whole text, wherever a piece ends") {
  using V = std::vector<std::string>;
  // Every cut position, through a byte-order mark and between the CR and LF of a line end.
  const std::string text =
      "\xEF\xBB\xBF"
      "head\r\nrow 1\rrow 2\nlast";
  const V whole{"head", "row 1", "row 2", "last"};
  for (std::size_t at = 0; at <= text.size(); ++at) {
    INFO("cut at " << at);
    CHECK(streamed(text, at) == whole);
  }
  CHECK(streamed("\xEF\xBB", 1) == V{"\xEF\xBB"});  // shorter than a mark: kept as text
}

// --- 2. Header and layout ------------------------------------------------------------------

TEST_CASE("header fields: a name, and the unit in brackets or as a last word") {
  // The header line of the Greensboro TMY3 file (tests/data, line 2).
  const ts::HeaderLine tmy3 = ts::read_header_line(
      "Date (MM/DD/YYYY),Time (HH:MM),Dry-bulb (C),Dew-point (C),RHum (%),Pressure (mbar)");
  CHECK(tmy3.delimiter == ',');
  REQUIRE(tmy3.fields.size() == 6);
  CHECK(tmy3.fields[2].text == "Dry-bulb (C)");
  CHECK(tmy3.fields[2].name == "drybulb");
  CHECK(tmy3.fields[2].unit_text == "C");
  CHECK(tmy3.fields[5].unit_text == "mbar");

  CHECK(ts::parse_header_field("Temp C").unit_text == "C");
  CHECK(ts::parse_header_field("Temp C").name == "temp");
  CHECK(ts::parse_header_field("pressure_hPa").unit_text == "hPa");
  CHECK(ts::parse_header_field("T [°F]").unit_text == "°F");
  // A last word that is no unit stays in the name.
  CHECK(ts::parse_header_field("Supply Fan Status").unit_text.empty());
  CHECK(ts::parse_header_field("Supply Fan Status").name == "supplyfanstatus");

  CHECK(ts::read_header_line("time;T2m;RH").delimiter == ';');
  CHECK(ts::read_header_line("time\tT2m\tRH").delimiter == '\t');
}

TEST_CASE("data fields: split in place, quotes removed, surrounding spaces trimmed") {
  std::vector<std::string_view> f;
  ts::split_fields(R"(a, "b, c" ,d,)", ',', f);
  CHECK(f == std::vector<std::string_view>{"a", "b, c", "d", ""});
  // Text after a closing quote keeps the field whole, so that it fails to read as a number.
  ts::split_fields(R"("1"2,3)", ',', f);
  CHECK(f == std::vector<std::string_view>{R"("1"2)", "3"});
}

TEST_CASE("time columns: a timestamp, a date and a clock, or month, day and hour") {
  using R = ts::TimeRole;
  const auto roles = [](std::initializer_list<std::pair<R, int>> given) {
    std::array<int, ts::kTimeRoleCount> r;
    r.fill(-1);
    for (const auto& [role, column] : given) r[static_cast<std::size_t>(role)] = column;
    return r;
  };
  const ts::TimeColumns stamp = ts::resolve_time(roles({{R::timestamp, 0}, {R::date, 1}}));
  CHECK(stamp.stamp == 0);
  CHECK(stamp.date < 0);

  const ts::TimeColumns split = ts::resolve_time(roles({{R::date, 0}, {R::time, 1}}));
  CHECK(split.date == 0);
  CHECK(split.clock == 1);

  const ts::TimeColumns fields =
      ts::resolve_time(roles({{R::year, 0}, {R::month, 1}, {R::day, 2}, {R::hour, 3}}));
  CHECK(fields.ok());
  CHECK(fields.month == 1);
  CHECK(fields.hour == 3);

  // A date with no clock, or a clock with no date ("time(UTC)" in PVGIS files), holds both.
  CHECK(ts::resolve_time(roles({{R::date, 4}})).stamp == 4);
  CHECK(ts::resolve_time(roles({{R::time, 0}})).stamp == 0);
  CHECK_FALSE(ts::resolve_time(roles({{R::month, 0}, {R::hour, 1}})).ok());
}

// --- 3. Time axis --------------------------------------------------------------------------

TEST_CASE("calendar: the dates a stamp may name, and days since 1970-01-01") {
  // Gregorian calendar rule (ISO 8601): a leap year is divisible by 4, except centuries not
  // divisible by 400.
  CHECK(ts::valid_date({2024, 2, 29, 0}));
  CHECK_FALSE(ts::valid_date({1900, 2, 29, 0}));
  CHECK(ts::valid_date({2000, 2, 29, 0}));
  CHECK_FALSE(ts::valid_date({2019, 4, 31, 0}));
  CHECK_FALSE(ts::valid_date({2019, 13, 1, 0}));
  CHECK(ts::valid_date({0, 2, 29, 0}));  // a date written without its year
  // `date -u -d 2019-07-01 +%s` (GNU coreutils) prints 1561939200 = 18078 days × 86400 s;
  // for 2000-03-01, 951868800 = 11017 days.
  CHECK(ts::days_from_civil(2019, 7, 1) == 18078);
  CHECK(ts::days_from_civil(2000, 3, 1) == 11017);
  const ts::CivilDate back = ts::civil_from_days(18078);
  CHECK(back.year == 2019);
  CHECK(back.month == 7);
  CHECK(back.day == 1);
}

TEST_CASE("stamps: the date and clock forms of weather files, read once and cached") {
  ts::Stamp st;
  ts::Zone zone;
  ts::StampForm form;
  ts::DateCache cache;
  // The first row of the PVGIS file (tests/data/pvgis-tmy-45n-8e.csv): YYYYMMDD:HHMM, UTC.
  REQUIRE(ts::parse_stamp("20180101:0000", false, st, zone, form, cache));
  CHECK(ts::stamp_text(st) == "2018-01-01 00:00");
  CHECK(form.date == ts::DateForm::compact);
  CHECK(form.separator == ':');

  REQUIRE(ts::parse_stamp("2019-07-01T13:00+01:00", false, st, zone, form, cache));
  CHECK(zone.clock == ts::Clock::offset);
  CHECK(zone.offset_min == 60);
  REQUIRE(ts::parse_stamp("2019-07-01 13:00:00Z", false, st, zone, form, cache));
  CHECK(zone.clock == ts::Clock::utc);
  CHECK(st.minute == 13 * 60);

  // The first row of the Greensboro TMY3 file: MM/DD/YYYY and an hour-ending HH:MM.
  REQUIRE(ts::parse_date("01/01/1988", false, st, form.date));
  CHECK(form.date == ts::DateForm::mdy);
  CHECK(st.month == 1);
  REQUIRE(ts::parse_date("13/01/1988", true, st, form.date));  // DD/MM when the header says so
  CHECK(st.month == 1);
  CHECK(st.day == 13);
  CHECK_FALSE(ts::parse_date("02/30/2019", false, st, form.date));

  int minute = 0;
  ts::ClockForm clock;
  CHECK(ts::parse_clock("24:00", minute, clock));
  CHECK(minute == 1440);
  CHECK_FALSE(ts::parse_clock("24:01", minute, clock));
  CHECK_FALSE(ts::parse_clock("13:00:30", minute, clock));  // hourly rows start on the minute
  CHECK(ts::parse_clock("1300", minute, clock));
  CHECK(clock == ts::ClockForm::hhmm);

  // The cache answers for the same date text without reading it again.
  ts::DateCache c;
  ts::DateForm f;
  REQUIRE(ts::parse_date("2019-07-01", false, st, f, c));
  CHECK(c.text == "2019-07-01");
  ts::Stamp again;
  REQUIRE(ts::parse_date("2019-07-01", false, again, f, c));
  CHECK(again.day == 1);
}

TEST_CASE("interval starts: an hour-ending stamp moved back a step, across days and years") {
  const auto earlier = [](ts::Stamp s, int minutes) {
    return ts::stamp_text(ts::minutes_earlier(s, minutes));
  };
  CHECK(earlier({2019, 7, 1, 13 * 60}, 60) == "2019-07-01 12:00");
  CHECK(earlier({2019, 7, 1, 1440}, 60) == "2019-07-01 23:00");  // 24:00 ends its own day
  CHECK(earlier({2019, 7, 1, 0}, 15) == "2019-06-30 23:45");
  CHECK(earlier({2019, 1, 1, 0}, 60) == "2018-12-31 23:00");
  // The day before 1 March is 29 February in a leap year only (Gregorian rule, ISO 8601); a
  // stamp without its year may name 29 February.
  CHECK(earlier({2020, 3, 1, 0}, 60) == "2020-02-29 23:00");
  CHECK(earlier({2019, 3, 1, 0}, 60) == "2019-02-28 23:00");
  CHECK(earlier({0, 3, 1, 0}, 60) == "02-29 23:00");
  CHECK(earlier({0, 1, 1, 0}, 60) == "12-31 23:00");
}

TEST_CASE("stamp reader: the time columns of a row, or the column at fault and what it holds") {
  std::array<int, ts::kTimeRoleCount> roles;
  roles.fill(-1);
  roles[static_cast<std::size_t>(ts::TimeRole::month)] = 0;
  roles[static_cast<std::size_t>(ts::TimeRole::day)] = 1;
  roles[static_cast<std::size_t>(ts::TimeRole::hour)] = 2;
  ts::StampReader reader(ts::resolve_time(roles), false);
  ts::Stamp st;
  ts::Zone zone;
  ts::StampForm form;
  std::vector<std::string_view> fields = {"2", "29", "24", "7.5"};
  CHECK(reader.read(fields, st, zone, form).column < 0);
  CHECK(ts::stamp_text(st) == "02-29 24:00");
  CHECK(reader.format_text(form, zone) == "month, day columns + hour column");
  fields = {"2", "30", "1"};
  const ts::StampFault fault = reader.read(fields, st, zone, form);
  CHECK(fault.column == 1);
  CHECK(fault.allowed == "a day of the month, 1 to its length");
  // The names of time columns are shared by the readers.
  CHECK(ts::in_list(ts::kTimeRoleAliases[static_cast<std::size_t>(ts::TimeRole::timestamp)],
                    ts::name_key("Date/Time")));
  CHECK(ts::in_list(ts::kTimeRoleAliases[static_cast<std::size_t>(ts::TimeRole::hour)],
                    ts::name_key("HR")));
}

// --- 4. Columns with units -----------------------------------------------------------------

TEST_CASE("units: header spellings, and conversions to SI from the units layer") {
  using limitline::units::Kind;
  const ts::UnitSpelling* f = ts::find_unit(Kind::temperature, "degF");
  REQUIRE(f != nullptr);
  CHECK(f->help == "F");
  CHECK(ts::find_unit(Kind::temperature, "°C")->help == "C");
  CHECK(ts::find_unit(Kind::pressure, "mb")->help == "mbar");
  CHECK(ts::find_unit(Kind::pressure, "degF") == nullptr);  // a unit of another kind
  CHECK(ts::is_any_unit("Pa"));
  CHECK_FALSE(ts::is_any_unit("Status"));
  CHECK(ts::allowed_units(Kind::temperature) == "C, F, K");

  // °C = (°F − 32) × 5/9 and 1 mbar = 100 Pa (NIST SP 811, appendix B, from memory).
  const ts::Conversion cf = ts::conversion(*f);
  CHECK(50.0 * cf.scale + cf.offset == doctest::Approx(10.0));
  const ts::Conversion mbar = ts::conversion(*ts::find_unit(Kind::pressure, "mbar"));
  CHECK(1013.25 * mbar.scale + mbar.offset == doctest::Approx(101.325));
}

TEST_CASE("cells: numbers, missing-value markers and sentinels") {
  double v = 0.0;
  bool comma = false;
  CHECK(ts::read_cell("-12.5", false, v, comma) == ts::Cell::ok);
  CHECK(v == -12.5);
  CHECK(ts::read_cell("+3", false, v, comma) == ts::Cell::ok);
  CHECK(v == 3.0);
  CHECK(ts::read_cell("", false, v, comma) == ts::Cell::empty);
  CHECK(ts::read_cell("N/A", false, v, comma) == ts::Cell::marker);
  CHECK(ts::read_cell("-9999", false, v, comma) == ts::Cell::sentinel);
  CHECK(ts::read_cell("abc", false, v, comma) == ts::Cell::not_number);
  CHECK(ts::read_cell("inf", false, v, comma) == ts::Cell::not_number);
  CHECK_FALSE(comma);
  CHECK(ts::read_cell("12,5", true, v, comma) == ts::Cell::ok);  // a ';'-delimited file
  CHECK(v == 12.5);
  CHECK(comma);

  CHECK(ts::read_number("1e3", v));
  CHECK(v == 1000.0);
  CHECK_FALSE(ts::read_number("nan", v));
  CHECK_FALSE(ts::read_number("12 C", v));
  // The shortcut for plain decimals gives the same double as std::from_chars.
  for (const char* s : {"0.1", "-17.3", "99870.0", "1013.25", "0.0123456789"}) {
    INFO(s);
    REQUIRE(ts::read_number(s, v));
    CHECK(v == std::stod(s));
  }
}

// --- 5. Series -----------------------------------------------------------------------------

TEST_CASE("series: the median of a column is its upper middle value") {
  std::vector<double> odd{5.0, 1.0, 3.0};
  CHECK(ts::median(odd) == 3.0);
  std::vector<double> even{4.0, 1.0, 3.0, 2.0};
  CHECK(ts::median(even) == 3.0);

  // The dry-bulb column of the Greensboro file, against a full sort of the same values.
  const std::string text = slurp("greensboro-nc-tmy3.csv");  // the lines are views of it
  std::vector<double> dry;
  for (const ts::Line& l : ts::split_lines(text)) {
    std::vector<std::string_view> f;
    ts::split_fields(l.text, ',', f);
    double v = 0.0;
    if (l.number > 2 && f.size() == 6 && ts::read_number(f[2], v)) dry.push_back(v);
  }
  REQUIRE(dry.size() == 8760);
  std::vector<double> sorted = dry;
  std::sort(sorted.begin(), sorted.end());
  CHECK(ts::median(dry) == sorted[sorted.size() / 2]);
}
