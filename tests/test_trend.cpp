// Reading trend logs: time stamps, column names and units, weights and coverage, and the
// malformed logs that must be refused or handled and reported.
#include <limitline/error.hpp>
#include <limitline/io/trend.hpp>

#include <doctest/doctest.h>

#include <fmt/format.h>

#include <filesystem>
#include <fstream>
#include <limits>
#include <string>

using namespace limitline;
using trend::Channel;

namespace {

bool throws_with(const std::string& text, const std::string& needle,
                 const trend::ReadOptions& o = {}) {
  try {
    trend::parse_trend(text, "log.csv", o);
  } catch (const InputError& e) {
    INFO(e.what());
    const bool has = std::string(e.what()).find(needle) != std::string::npos;
    CHECK(has);
    return has;
  }
  FAIL("no error for: " << text);
  return false;
}

const std::string kHeader =
    "Timestamp,OAT (F),RA Temp (°F),MA Temp (°F),OA Damper Cmd (%),SF Status\n";

}  // namespace

TEST_CASE("time stamps: ISO 8601 and building-automation forms") {
  // 2026-05-04 00:00 UTC is 1777852800 s after 1970-01-01 (20577 days × 86400; days from
  // civil date, common practice).
  const std::int64_t t0 = trend::parse_timestamp("2026-05-04 00:00", "t");
  CHECK(t0 == 20577LL * 86400);
  CHECK(trend::parse_timestamp("2026-05-04T13:15:30", "t") == t0 + 13 * 3600 + 15 * 60 + 30);
  CHECK(trend::parse_timestamp("2026-05-04T13:15Z", "t") == t0 + 13 * 3600 + 15 * 60);
  CHECK(trend::parse_timestamp("2026-05-04T13:15-05:00", "t") == t0 + 18 * 3600 + 15 * 60);
  CHECK(trend::parse_timestamp("05/04/2026 01:15 PM", "t") == t0 + 13 * 3600 + 15 * 60);
  CHECK(trend::parse_timestamp("05/04/2026 12:05 AM", "t") == t0 + 5 * 60);
  CHECK(trend::parse_timestamp("5/4/2026 13:15:00", "t") == t0 + 13 * 3600 + 15 * 60);
  CHECK(trend::parse_timestamp("2026/05/04 13:15", "t") == t0 + 13 * 3600 + 15 * 60);
  CHECK(trend::format_timestamp(t0 + 13 * 3600 + 15 * 60) == "2026-05-04 13:15");
  // 2024 is a leap year (Gregorian rule).
  CHECK(trend::parse_timestamp("2024-03-01", "t") - trend::parse_timestamp("2024-02-28", "t") ==
        2 * 86400);
  for (const char* bad : {"2026-02-30 00:00", "13/01/2026 00:00", "2026-05-04 25:00", "yesterday",
                          "05/04/2026 13:00 PM", "2026-05-04 10:00 later", "2026-05-04T10:00+99:99",
                          "2026-05-04T10:00+15:00"})
    CHECK_THROWS_AS(trend::parse_timestamp(bad, "log.csv:3: time"), InputError);
}

TEST_CASE("columns found from common header names, units from the header") {
  const std::string text =
      "Site export, AHU-1\n"
      "Date,Time,OA Temp (°C),OA RH (%),Return Air Temp degC,RA RH %,Mixed Air Temp (°C),"
      "Supply Air Temp (°C),OA Damper Position (%),Supply Fan Status,Clg Valve (%)\n"
      "2026-05-04,10:00,10.0,50,22.0,45,19.6,13.0,20,On,0\n"
      "2026-05-04,10:15,10.5,50,22.0,45,19.7,13.0,20,1,35\n"
      "2026-05-04,10:30,11.0,50,22.0,45,,13.0,20,true,0\n";
  const auto log = trend::parse_trend(text, "log.csv", {});
  REQUIRE(log.size() == 3);
  for (Channel c : {Channel::outdoor_dry_bulb, Channel::outdoor_rh, Channel::return_dry_bulb,
                    Channel::return_rh, Channel::mixed_air, Channel::supply_air, Channel::damper,
                    Channel::fan, Channel::cooling})
    CHECK(log.has(c));
  CHECK(*log.sample(0)[Channel::outdoor_dry_bulb] == doctest::Approx(10.0));
  CHECK(*log.sample(0)[Channel::outdoor_rh] == doctest::Approx(0.5));
  CHECK(*log.sample(0)[Channel::damper] == doctest::Approx(0.2));
  CHECK(*log.sample(1)[Channel::cooling] == 1.0);  // a valve signal above zero is on
  CHECK(*log.sample(0)[Channel::cooling] == 0.0);
  CHECK_FALSE(log.sample(2)[Channel::mixed_air]);  // an empty cell is no reading, not zero
  CHECK(log.sample(2).line == 5);
}

TEST_CASE("°F read back to °C; bare temperatures take the --units system and say so") {
  const std::string text =
      "Timestamp,OAT,RAT,MAT\n2026-05-04 10:00,50,72,68\n2026-05-04 10:15,50,72,68\n";
  const auto log = trend::parse_trend(text, "log.csv", {});
  CHECK(*log.sample(0)[Channel::outdoor_dry_bulb] == doctest::Approx(10.0));
  CHECK(log.columns[0].note.find("°F") != std::string::npos);
  trend::ReadOptions si;
  si.bare = units::System::si;
  // 72 read as °C is not return air: refused, naming the column and its unit.
  throws_with(text, "is the column's unit right", si);
}

TEST_CASE("irregular intervals: weights capped at twice the median, gaps reported") {
  std::string text = kHeader;
  const char* times[] = {"10:00", "10:15", "10:31", "10:45", "11:00", "13:00", "13:14", "13:30"};
  for (const char* t : times) text += std::string("2026-05-04 ") + t + ",50,72,68,20,On\n";
  const auto log = trend::parse_trend(text, "log.csv", {});
  const auto& c = log.coverage;
  CHECK(c.median_interval_s == 900);  // intervals 15,16,14,15,120,14,16 min → median 15
  CHECK(c.max_gap_s == 1800);
  REQUIRE(c.gaps.size() == 1);
  CHECK(trend::format_timestamp(c.gaps[0].from_s) == "2026-05-04 11:00");
  CHECK(log.weight_s(4) == 1800);  // the 2-hour outage counts for 30 min only
  CHECK(log.weight_s(1) == 16 * 60);
  CHECK(log.weight_s(log.size() - 1) == 900);
  CHECK(c.covered_s == doctest::Approx((15 + 16 + 14 + 15 + 30 + 14 + 16 + 15) * 60.0));
  CHECK(c.span_s == doctest::Approx((210 + 15) * 60.0));
  trend::ReadOptions o;
  o.max_gap_s = 3 * 3600.0;
  CHECK(trend::parse_trend(text, "log.csv", o).coverage.gaps.empty());
}

TEST_CASE("malformed logs: unsorted, duplicate stamps, unit mix-ups, bad cells") {
  SUBCASE("times going back") {
    throws_with(
        kHeader + "2026-05-04 10:15,50,72,68,20,On\n2026-05-04 10:00,50,72,68,20,On\n",
        "log.csv:3: time 2026-05-04 10:00 is before the previous sample's 2026-05-04 10:15");
  }
  SUBCASE("the same stamp with different readings") {
    throws_with(kHeader + "2026-05-04 10:00,50,72,68,20,On\n2026-05-04 10:00,51,72,68,20,On\n",
                "log.csv:3: time 2026-05-04 10:00 repeats line 2 with different readings");
  }
  SUBCASE("exact repeats are dropped and counted") {
    const auto log = trend::parse_trend(kHeader +
                                            "2026-05-04 10:00,50,72,68,20,On\n"
                                            "05/04/2026 10:00,50,72,68,20,On\n"
                                            "2026-05-04 10:15,50,72,68,20,On\n",
                                        "log.csv", {});
    CHECK(log.size() == 2);
    CHECK(log.coverage.duplicate_rows == 1);
  }
  SUBCASE("a °C column labelled °F") {
    // 22 "°F" return air is −5.6 °C: not return air.
    throws_with("Timestamp,OAT (°F),RAT (°F)\n2026-05-04 10:00,10,22\n2026-05-04 10:15,11,22\n",
                "RAT (°F)");
  }
  SUBCASE("a °F column labelled °C") {
    throws_with("Timestamp,OAT (°C),RAT (°C)\n2026-05-04 10:00,50,72\n2026-05-04 10:15,50,72\n",
                "outside the plausible");
  }
  SUBCASE("a damper above 100 %") {
    throws_with(kHeader + "2026-05-04 10:00,50,72,68,120,On\n2026-05-04 10:15,50,72,68,20,On\n",
                "log.csv:2: damper '120'");
  }
  SUBCASE("a fan status that is no status") {
    throws_with(kHeader + "2026-05-04 10:00,50,72,68,20,maybe\n2026-05-04 10:15,50,72,68,20,On\n",
                "log.csv:2: fan 'maybe'");
  }
  SUBCASE("a number that is no number") {
    throws_with(kHeader + "2026-05-04 10:00,5O,72,68,20,On\n2026-05-04 10:15,50,72,68,20,On\n",
                "log.csv:2: outdoor-dry-bulb '5O'");
  }
  SUBCASE("no time column") {
    throws_with("OAT,RAT\n50,72\n", "no header line with a time column");
  }
  SUBCASE("two columns for one quantity") {
    throws_with("Timestamp,OAT,OA Temp\n2026-05-04 10:00,50,50\n",
                "both look like outdoor-dry-bulb");
  }
}

TEST_CASE("--column overrides the header and its unit") {
  const std::string text =
      "Timestamp,AHU1-T1,RAT (°F)\n2026-05-04 10:00,10,72\n2026-05-04 10:15,11,72\n";
  trend::ReadOptions o;
  o.columns.push_back(trend::parse_column_override("outdoor_dry_bulb=AHU1-T1:C", "--column"));
  const auto log = trend::parse_trend(text, "log.csv", o);
  CHECK(*log.sample(1)[Channel::outdoor_dry_bulb] == doctest::Approx(11.0));
  CHECK(log.columns[0].overridden);
  CHECK_THROWS_WITH_AS(trend::parse_column_override("wind=Speed", "--column"),
                       doctest::Contains("allowed: outdoor-dry-bulb"), InputError);
  CHECK_THROWS_WITH_AS(trend::parse_column_override("mixed-air=MAT:K", "--column"),
                       doctest::Contains("F, C, %, fraction"), InputError);
  o.columns = {trend::parse_column_override("mixed-air=MAT", "--column")};
  CHECK_THROWS_WITH_AS(trend::parse_trend(text, "log.csv", o), doctest::Contains("no column 'MAT'"),
                       InputError);
}

TEST_CASE("a row with an extra or a missing field is refused, naming file and line") {
  // An extra field shifts every later cell one column to the right: the damper would be read
  // from the fan's column. Refused, like the weather reader does.
  throws_with(kHeader + "2026-05-04 10:00,50,72,68,20,On\n2026-05-04 10:15,50,72,72,68,20,On\n",
              "log.csv:3: the row has 7 fields but the header (line 1) has 6");
  throws_with(kHeader + "2026-05-04 10:00,50,72,68,20,On\n2026-05-04 10:15,50,72,68,20\n",
              "log.csv:3: the row has 5 fields but the header (line 1) has 6");
  // Empty fields after the last column (a trailing delimiter) are no field.
  const auto log = trend::parse_trend(kHeader +
                                          "2026-05-04 10:00,50,72,68,20,On,\n"
                                          "2026-05-04 10:15,50,72,68,20,On,,\n",
                                      "log.csv", {});
  CHECK(log.size() == 2);
}

TEST_CASE("line endings LF, CR LF and CR alone, and a UTF-8 byte-order mark, read the same") {
  const std::string lf = "# export\n" + kHeader +
                         "2026-05-04 10:00,50,72,68,20,On\n\n"
                         "2026-05-04 10:15,51,72,68,20,Off\n2026-05-04 10:30,52,72,68,20,On";
  auto with = [&](const std::string& eol) {
    std::string out;
    for (char c : lf) out += c == '\n' ? eol : std::string(1, c);
    return out;
  };
  const auto ref = trend::parse_trend(lf, "log.csv", {});
  REQUIRE(ref.size() == 3);
  for (const std::string& text :
       {with("\r\n"), with("\r"), "\xEF\xBB\xBF" + lf, "\xEF\xBB\xBF" + with("\r")}) {
    const auto log = trend::parse_trend(text, "log.csv", {});
    REQUIRE(log.size() == 3);
    CHECK(log.line == ref.line);  // line numbers count every line ending
    CHECK(log.time_s == ref.time_s);
    CHECK(*log.value(Channel::outdoor_dry_bulb, 2) ==
          doctest::Approx(*ref.value(Channel::outdoor_dry_bulb, 2)));
    CHECK(*log.value(Channel::fan, 1) == 0.0);
  }
  // Errors name the right line whatever the ending.
  throws_with(with("\r") + "\r2026-05-04 10:45,5O,72,68,20,On\r",
              "log.csv:7: outdoor-dry-bulb '5O'");
}

TEST_CASE("a log read from a file in pieces is the one read from memory") {
  // The file reader hands the text over in 64 KiB pieces; a CR LF or a lone CR cut by the end
  // of a piece still ends one line. Invented rows (a test input).
  const std::size_t piece = 1 << 16;
  std::string body;
  for (int i = 0; body.size() < 3 * piece; ++i)
    body += fmt::format("2026-05-04 {:02}:{:02}:{:02},{},72,68,20,On\r\n", i / 3600 % 24,
                        i / 60 % 60, i % 60, 40 + i % 20);
  for (const bool lone_cr : {false, true}) {
    std::string text = kHeader + body;
    if (lone_cr)
      for (std::size_t at = text.find("\r\n"); at != std::string::npos; at = text.find("\r\n", at))
        text.erase(at + 1, 1);
    // Pad the first line so that a line ending falls across the first boundary: the CR as the
    // piece's last byte.
    const std::size_t cr = text.rfind('\r', piece - 1);
    text.insert(kHeader.size() - 1, std::string(piece - 1 - cr, ' '));
    REQUIRE(text[piece - 1] == '\r');
    const auto dir = std::filesystem::path(LIMITLINE_BINARY_DIR) / "test-scratch" / "trend";
    std::filesystem::create_directories(dir);
    const auto path = (dir / "pieces.csv").string();
    std::ofstream(path, std::ios::binary) << text;
    const auto from_file = trend::load_trend(path, {});
    const auto from_memory = trend::parse_trend(text, path, {});
    CHECK(from_file.size() == from_memory.size());
    CHECK(from_file.line == from_memory.line);
    CHECK(from_file.time_s == from_memory.time_s);
    CHECK(from_file.number[0] == from_memory.number[0]);
  }
}

TEST_CASE("offending values are echoed escaped and cut") {
  // A cell with a terminal escape and a newline-free 1,000-character value: the message stays
  // one readable line.
  throws_with(
      kHeader + "2026-05-04 10:00,\x1b[31m50,72,68,20,On\n2026-05-04 10:15,50,72,68,20,On\n",
      "'\\x1b[31m50'");
  throws_with(kHeader + "2026-05-04 10:00,50,72,68,20," + std::string(1000, 'x') + "\n",
              "(1000 characters)");
  throws_with(std::string("Timestamp,OAT\n") + "2026-05-04 10:00\x07,50\n",
              "'2026-05-04 10:00\\x07'");
}

TEST_CASE("--max-gap must be a finite time up to a year") {
  const std::string text =
      kHeader + "2026-05-04 10:00,50,72,68,20,On\n2026-05-04 10:15,50,72,68,20,On\n";
  for (double bad : {0.0, -60.0, 400 * 86400.0, std::numeric_limits<double>::infinity(),
                     std::numeric_limits<double>::quiet_NaN()}) {
    trend::ReadOptions o;
    o.max_gap_s = bad;
    throws_with(text, "--max-gap", o);
  }
}
