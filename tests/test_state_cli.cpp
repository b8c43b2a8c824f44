// `limitline state` end to end: text, JSON and CSV for one state, batch mode on CSV files,
// bad input and exit codes. run_cli() also fails any output that contains NaN or inf.
// Check values: the ASHRAE Handbook—Fundamentals (2017, SI) ch. 1 worked example at 40 °C /
// 20 °C wet-bulb, 75 °F / 50 % ≈ 28.1 Btu/lb at sea level and the ASHRAE 90.1 Table
// 6.5.1.1.3 footnote value of about 30.7 Btu/lb at about 6000 ft (all from memory; see
// test_psychro.cpp). The batch files are invented inputs of the test.
#include "support/cli.hpp"

#include <cmath>
#include <fstream>
#include <map>
#include <regex>
#include <set>

using limitline::test::contains;
using limitline::test::run_cli;
using limitline::test::scratch_dir;

namespace {

const std::vector<std::string> kSiKeys = {"dry_bulb_c",
                                          "wet_bulb_c",
                                          "dew_point_c",
                                          "relative_humidity",
                                          "humidity_ratio",
                                          "enthalpy_kj_per_kg",
                                          "specific_volume_m3_per_kg",
                                          "density_kg_per_m3",
                                          "vapor_pressure_kpa",
                                          "pressure_kpa",
                                          "saturation_humidity_ratio",
                                          "degree_of_saturation"};
const std::vector<std::string> kIpKeys = {"dry_bulb_f",
                                          "wet_bulb_f",
                                          "dew_point_f",
                                          "relative_humidity",
                                          "humidity_ratio",
                                          "enthalpy_btu_per_lb",
                                          "specific_volume_ft3_per_lb",
                                          "density_lb_per_ft3",
                                          "vapor_pressure_psia",
                                          "pressure_psia",
                                          "saturation_humidity_ratio",
                                          "degree_of_saturation"};

// The flat JSON object `state --format json` prints: every key with its number, in order.
std::vector<std::pair<std::string, double>> json_numbers(const std::string& text) {
  static const std::regex member(R"re("([a-z0-9_]+)"\s*:\s*(-?[0-9][0-9.eE+-]*))re");
  std::vector<std::pair<std::string, double>> out;
  for (auto it = std::sregex_iterator(text.begin(), text.end(), member);
       it != std::sregex_iterator(); ++it)
    out.emplace_back((*it)[1], std::stod((*it)[2]));
  return out;
}

std::vector<std::string> split(const std::string& s, char sep) {
  std::vector<std::string> parts;
  std::string part;
  std::istringstream in(s);
  while (std::getline(in, part, sep)) parts.push_back(part);
  return parts;
}

std::vector<std::string> lines(const std::string& s) { return split(s, '\n'); }

std::string number(double v) {
  std::ostringstream s;
  s.precision(12);
  s << v;
  return s.str();
}

std::string write_file(const std::string& name, const std::string& text) {
  const auto p = scratch_dir("state_cli") / name;
  std::ofstream(p, std::ios::binary) << text;
  return p.string();
}

limitline::test::CliRun state(std::vector<std::string> args) {
  args.insert(args.begin(), "state");
  return run_cli(args, "state_cli");
}

// A failed run: the exit code, nothing on stdout, one line on stderr.
void check_one_line_error(const limitline::test::CliRun& r, int rc) {
  INFO("stderr: ", r.err);
  CHECK(r.rc == rc);
  CHECK(r.out.empty());
  REQUIRE(!r.err.empty());
  CHECK(r.err.back() == '\n');
  CHECK(r.err.find('\n') == r.err.size() - 1);
}

// A batch stopped by a bad row: the header and every good row before it on stdout, then the
// one-line error with exit 2.
void check_rows_then_error(const limitline::test::CliRun& r, std::size_t good_rows) {
  INFO("stderr: ", r.err);
  CHECK(r.rc == 2);
  const auto out = lines(r.out);
  REQUIRE(out.size() == good_rows + 1);
  CHECK(out[0] ==
        "dry_bulb_f,wet_bulb_f,dew_point_f,relative_humidity,humidity_ratio,enthalpy_btu_per_lb,"
        "specific_volume_ft3_per_lb,density_lb_per_ft3,vapor_pressure_psia,pressure_psia,"
        "saturation_humidity_ratio,degree_of_saturation");
  CHECK(r.out.back() == '\n');
  REQUIRE(!r.err.empty());
  CHECK(r.err.find('\n') == r.err.size() - 1);
}

}  // namespace

TEST_CASE("text output lists every property with its unit") {
  const auto r = state({"--dry-bulb", "75F", "--rh", "50%"});
  REQUIRE(r.rc == 0);
  CHECK(r.err.empty());
  for (const char* label :
       {"Dry-bulb", "Wet-bulb", "Dew point", "Relative humidity", "Humidity ratio", "Enthalpy",
        "Specific volume", "Density", "Vapour pressure", "Pressure", "Saturation humidity ratio",
        "Degree of saturation"})
    CHECK_MESSAGE(contains(r.out, label), label);
  CHECK(contains(r.out, "75.0 °F"));
  CHECK(contains(r.out, "50.0%"));
  CHECK(contains(r.out, "28.1"));  // Btu/lb at sea level (see the top of this file)
  CHECK(contains(r.out, "Btu/lb"));
  CHECK(contains(r.out, "14.696 psia"));
  const auto si = state({"--dry-bulb", "24C", "--rh", "50%", "--units", "si"});
  REQUIRE(si.rc == 0);
  CHECK(contains(si.out, "24.00 °C"));
  CHECK(contains(si.out, "kJ/kg"));
  CHECK(contains(si.out, "101.325 kPa"));
}

TEST_CASE("JSON carries every documented key, for si and for ip") {
  for (const auto& [units, keys] :
       {std::pair{std::string("si"), kSiKeys}, std::pair{std::string("ip"), kIpKeys}}) {
    const auto r =
        state({"--dry-bulb", "75F", "--rh", "50%", "--units", units, "--format", "json"});
    INFO(units, ": ", r.out);
    REQUIRE(r.rc == 0);
    const auto members = json_numbers(r.out);
    std::vector<std::string> got;
    for (const auto& m : members) got.push_back(m.first);
    CHECK(got == keys);
    for (const auto& m : members) CHECK(std::isfinite(m.second));
    CHECK(r.out.front() == '{');
  }
}

TEST_CASE("JSON values: the handbook example and the 90.1 enthalpy facts") {
  {
    // ASHRAE HoF ch. 1 example: 40 °C, 20 °C wet-bulb, 101.325 kPa (from memory).
    const auto r = state({"--dry-bulb", "40C", "--wet-bulb", "20C", "--pressure", "101.325kPa",
                          "--units", "si", "--format", "json"});
    REQUIRE(r.rc == 0);
    std::map<std::string, double> v;
    for (const auto& [k, x] : json_numbers(r.out)) v[k] = x;
    CHECK(std::fabs(v["humidity_ratio"] - 0.00640) <= 0.000005);
    CHECK(std::fabs(v["enthalpy_kj_per_kg"] - 56.7) <= 0.05);
    CHECK(std::fabs(v["dew_point_c"] - 7.4) <= 0.05);
    CHECK(std::fabs(v["relative_humidity"] - 0.14) <= 0.005);
    CHECK(std::fabs(v["specific_volume_m3_per_kg"] - 0.896) <= 0.0005);
    CHECK(std::fabs(v["wet_bulb_c"] - 20.0) <= 1e-5);
    CHECK(v["pressure_kpa"] == 101.325);
  }
  for (const auto& [elevation, h] : {std::pair{"0ft", 28.1}, std::pair{"6000ft", 30.7}}) {
    // 75 °F / 50 %: 28.1 Btu/lb at sea level (psychrometric chart), about 30.7 Btu/lb at about
    // 6000 ft (ASHRAE 90.1 Table 6.5.1.1.3 footnote); both from memory.
    const auto r =
        state({"--dry-bulb", "75", "--rh", "50", "--elevation", elevation, "--format", "json"});
    REQUIRE(r.rc == 0);
    std::map<std::string, double> v;
    for (const auto& [k, x] : json_numbers(r.out)) v[k] = x;
    INFO(elevation);
    CHECK(std::fabs(v["enthalpy_btu_per_lb"] - h) <= 0.05);
    CHECK(v["dry_bulb_f"] == 75.0);
    CHECK(v["relative_humidity"] == 0.5);
  }
}

TEST_CASE("CSV: the JSON keys as header, one row, the same numbers") {
  const std::vector<std::string> args = {"--dry-bulb", "80F", "--dew-point", "60F"};
  auto with = [&](std::vector<std::string> extra) {
    auto a = args;
    a.insert(a.end(), extra.begin(), extra.end());
    return state(a);
  };
  const auto csv = with({"--format", "csv"});
  const auto json = with({"--format", "json"});
  REQUIRE(csv.rc == 0);
  REQUIRE(json.rc == 0);
  const auto rows = lines(csv.out);
  REQUIRE(rows.size() == 2);
  CHECK(split(rows[0], ',') == kIpKeys);
  const auto cells = split(rows[1], ',');
  const auto members = json_numbers(json.out);
  REQUIRE(cells.size() == members.size());
  for (std::size_t i = 0; i < cells.size(); ++i) {
    INFO(members[i].first);
    const double a = std::stod(cells[i]), b = members[i].second;
    CHECK(std::fabs(a - b) <= 1e-7 * std::fabs(b));  // CSV prints 8 digits, JSON 10
  }
}

TEST_CASE("every humidity input gives the same state") {
  std::map<std::string, double> ref;
  const auto base =
      state({"--dry-bulb", "24C", "--rh", "45%", "--units", "si", "--format", "json"});
  REQUIRE(base.rc == 0);
  for (const auto& [k, x] : json_numbers(base.out)) ref[k] = x;
  const std::pair<const char*, std::string> inputs[] = {
      {"--wet-bulb", number(ref["wet_bulb_c"]) + "C"},
      {"--dew-point", number(ref["dew_point_c"]) + "C"},
      {"--humidity-ratio", number(ref["humidity_ratio"])},
      {"--enthalpy", number(ref["enthalpy_kj_per_kg"]) + "kJ/kg"}};
  for (const auto& [option, value] : inputs) {
    const auto r = state({"--dry-bulb", "24C", option, value, "--units", "si", "--format", "json"});
    INFO(option, " ", value, "\n", r.err);
    REQUIRE(r.rc == 0);
    std::map<std::string, double> v;
    for (const auto& [k, x] : json_numbers(r.out)) v[k] = x;
    // JSON keeps 10 significant digits: the state agrees to that rounding.
    CHECK(std::fabs(v["relative_humidity"] - 0.45) <= 1e-8);
    CHECK(std::fabs(v["humidity_ratio"] - ref["humidity_ratio"]) <= 1e-10);
  }
}

TEST_CASE("batch mode: one output row per input row, JSON keys as columns") {
  const auto file = write_file("points.csv",
                               "dry_bulb,rh\n"
                               "75,50\n"
                               "80F,40%\n"
                               "\n"  // blank lines are skipped
                               "24C,55\n"
                               "-10,80\r\n");  // a Windows line end
  const auto r = state({"--batch", file});
  INFO(r.err);
  REQUIRE(r.rc == 0);
  CHECK(r.err.empty());
  const auto rows = lines(r.out);
  REQUIRE(rows.size() == 5);
  CHECK(split(rows[0], ',') == kIpKeys);
  for (std::size_t i = 1; i < rows.size(); ++i) CHECK(split(rows[i], ',').size() == 12);
  CHECK(split(rows[3], ',')[0] == "75.2");  // 24 °C in °F
  // The first row is what `state --format csv` prints for the same point.
  const auto one = state({"--dry-bulb", "75F", "--rh", "50%", "--format", "csv"});
  REQUIRE(one.rc == 0);
  CHECK(lines(one.out)[1] == rows[1]);
}

TEST_CASE("batch mode in si with wet-bulb and elevation columns, semicolon separated") {
  const auto file = write_file("si.csv",
                               "dry_bulb;wet_bulb;elevation\n"
                               "40;20;0\n"
                               "24;17;1500m\n");
  const auto r = state({"--batch", file, "--units", "si"});
  INFO(r.err);
  REQUIRE(r.rc == 0);
  const auto rows = lines(r.out);
  REQUIRE(rows.size() == 3);
  CHECK(split(rows[0], ',') == kSiKeys);
  const auto first = split(rows[1], ',');
  // The handbook example again (W = 0.00640, h = 56.7; from memory).
  CHECK(std::fabs(std::stod(first[4]) - 0.00640) <= 0.000005);
  CHECK(std::fabs(std::stod(first[5]) - 56.7) <= 0.05);
  // 1500 m: 84.556 kPa (ASHRAE HoF ch. 1 Table 1, from memory).
  CHECK(std::fabs(std::stod(split(rows[2], ',')[9]) - 84.556) <= 0.001);
}

TEST_CASE("batch errors name the file and line; exit code 2") {
  SUBCASE("impossible state in a row") {
    const auto file = write_file("rh.csv", "dry_bulb,rh\n75,50\n80,120\n");
    const auto r = state({"--batch", file});
    check_rows_then_error(r, 1);
    CHECK(contains(r.err, file + ":3"));
    CHECK(contains(r.err, "120 %"));
    CHECK(contains(r.err, "0 % to 100 %"));
  }
  SUBCASE("a cell that is not a number") {
    const auto file = write_file("cell.csv", "dry_bulb,rh\n75,50\n80,humid\n");
    const auto r = state({"--batch", file});
    check_rows_then_error(r, 1);
    CHECK(contains(r.err, file + ":3 column rh"));
    CHECK(contains(r.err, "'humid'"));
  }
  SUBCASE("dew point above dry-bulb") {
    const auto file = write_file("dew.csv", "dry_bulb,dew_point\n70,50\n60,65\n");
    const auto r = state({"--batch", file});
    check_rows_then_error(r, 1);
    CHECK(contains(r.err, file + ":3"));
    CHECK(contains(r.err, "above dry-bulb"));
  }
  SUBCASE("a row with the wrong number of fields") {
    const auto file = write_file("fields.csv", "dry_bulb,rh\n75,50,1\n");
    const auto r = state({"--batch", file});
    check_rows_then_error(r, 0);
    CHECK(contains(r.err, file + ":2"));
    CHECK(contains(r.err, "3 fields"));
  }
  SUBCASE("unknown and duplicate columns") {
    const auto unknown = state({"--batch", write_file("unknown.csv", "dry_bulb,humidity\n")});
    check_one_line_error(unknown, 2);
    CHECK(contains(unknown.err, "'humidity'"));
    CHECK(contains(unknown.err, "allowed:"));
    const auto two = state({"--batch", write_file("two.csv", "dry_bulb,rh,wet_bulb\n")});
    check_one_line_error(two, 2);
    CHECK(contains(two.err, "both give humidity"));
    const auto none = state({"--batch", write_file("none.csv", "dry_bulb\n75\n")});
    check_one_line_error(none, 2);
    CHECK(contains(none.err, "no humidity column"));
  }
  SUBCASE("a file that does not exist, or is empty") {
    const auto missing = state({"--batch", "no-such-file.csv"});
    check_one_line_error(missing, 2);
    CHECK(contains(missing.err, "no-such-file.csv"));
    const auto empty = state({"--batch", write_file("empty.csv", "")});
    check_one_line_error(empty, 2);
    CHECK(contains(empty.err, "no header"));
  }
  SUBCASE("batch with state options or a non-CSV format is a usage error") {
    const auto file = write_file("ok.csv", "dry_bulb,rh\n75,50\n");
    check_one_line_error(state({"--batch", file, "--dry-bulb", "75F"}), 1);
    check_one_line_error(state({"--batch", file, "--format", "json"}), 1);
  }
}

TEST_CASE("bad input: usage errors exit 1, impossible values exit 2, one line each") {
  SUBCASE("two humidity inputs") {
    const auto r = state({"--dry-bulb", "75F", "--rh", "50%", "--wet-bulb", "60F"});
    check_one_line_error(r, 1);
    CHECK(contains(r.err, "--rh"));
    CHECK(contains(r.err, "--wet-bulb"));
  }
  SUBCASE("no humidity input, no dry-bulb, unknown option, unknown unit system") {
    check_one_line_error(state({"--dry-bulb", "75F"}), 1);
    check_one_line_error(state({"--rh", "50%"}), 1);
    check_one_line_error(state({"--dry-bulb", "75F", "--rh", "50%", "--colour"}), 1);
    check_one_line_error(state({"--dry-bulb", "75F", "--rh", "50%", "--units", "metric"}), 1);
    check_one_line_error(
        state({"--dry-bulb", "75F", "--rh", "50%", "--pressure", "14.7psia", "--elevation", "0ft"}),
        1);
  }
  SUBCASE("RH 120 %") {
    const auto r = state({"--dry-bulb", "75F", "--rh", "120%"});
    check_one_line_error(r, 2);
    CHECK(contains(r.err, "--rh 120%"));
    CHECK(contains(r.err, "0 % to 100 %"));
  }
  SUBCASE("dew point or wet-bulb above the dry-bulb, negative humidity ratio") {
    const auto dew = state({"--dry-bulb", "70F", "--dew-point", "72F"});
    check_one_line_error(dew, 2);
    CHECK(contains(dew.err, "--dew-point 72F"));
    CHECK(contains(dew.err, "above dry-bulb"));
    const auto wet = state({"--dry-bulb", "70F", "--wet-bulb", "71F"});
    check_one_line_error(wet, 2);
    CHECK(contains(wet.err, "above dry-bulb"));
    const auto w = state({"--dry-bulb", "70F", "--humidity-ratio=-0.001"});
    check_one_line_error(w, 2);
    CHECK(contains(w.err, "-0.001"));
    CHECK(contains(w.err, "0 or more"));
  }
  SUBCASE("values the model does not cover name the option and the range") {
    const auto hot = state({"--dry-bulb", "250C", "--rh", "10%"});
    check_one_line_error(hot, 2);
    CHECK(contains(hot.err, "-100 °C to 200 °C"));
    const auto p = state({"--dry-bulb", "75F", "--rh", "50%", "--pressure", "5kPa"});
    check_one_line_error(p, 2);
    CHECK(contains(p.err, "--pressure"));
    CHECK(contains(p.err, "10 kPa to 200 kPa"));
    const auto z = state({"--dry-bulb", "75F", "--rh", "50%", "--elevation", "20000m"});
    check_one_line_error(z, 2);
    CHECK(contains(z.err, "--elevation 20000m"));
    CHECK(contains(z.err, "-500 m to 11000 m"));
    const auto h = state({"--dry-bulb", "75F", "--enthalpy", "10btu/lb"});
    check_one_line_error(h, 2);
    CHECK(contains(h.err, "below that of dry air"));
    const auto dry = state({"--dry-bulb", "75F", "--rh", "0%"});
    check_one_line_error(dry, 2);
    CHECK(contains(dry.err, "dry air"));
  }
  SUBCASE("text that is no quantity") {
    const auto unit = state({"--dry-bulb", "75X", "--rh", "50%"});
    check_one_line_error(unit, 2);
    CHECK(contains(unit.err, "--dry-bulb"));
    CHECK(contains(unit.err, "allowed:"));
    const auto ambiguous = state({"--dry-bulb", "75F", "--rh", "0.5"});
    check_one_line_error(ambiguous, 2);
    CHECK(contains(ambiguous.err, "ambiguous"));
  }
}

TEST_CASE("help exits 0 and shows the options") {
  const auto r = state({"--help"});
  CHECK(r.rc == 0);
  for (const char* o :
       {"--dry-bulb", "--rh", "--wet-bulb", "--dew-point", "--humidity-ratio", "--enthalpy",
        "--elevation", "--pressure", "--batch", "--units", "--format"})
    CHECK_MESSAGE(contains(r.out, o), o);
}

TEST_CASE("batch mode keeps every good row before a bad one: 4,999 rows, then the error") {
  std::string text = "dry_bulb,rh\n";
  for (int i = 0; i < 4999; ++i) text += std::to_string(60 + i % 30) + ",50\n";
  text += "80,150\n75,50\n";
  const auto file = write_file("late-bad.csv", text);
  const auto r = state({"--batch", file});
  check_rows_then_error(r, 4999);
  CHECK(contains(r.err, file + ":5001"));
}

TEST_CASE(
    "batch mode reads a UTF-8 byte-order mark and CR-only line endings like the other readers") {
  const auto plain = state({"--batch", write_file("plain.csv", "dry_bulb,rh\n75,50\n60,80\n")});
  REQUIRE(plain.rc == 0);
  const auto bom = state({"--batch", write_file("bom.csv",
                                                "\xEF\xBB\xBF"
                                                "dry_bulb,rh\n75,50\n60,80\n")});
  CHECK(bom.rc == 0);
  CHECK(bom.out == plain.out);
  const auto cr = state({"--batch", write_file("cr.csv", "dry_bulb,rh\r75,50\r60,80\r")});
  CHECK(cr.rc == 0);
  CHECK(cr.out == plain.out);
  const auto crlf = state({"--batch", write_file("crlf.csv",
                                                 "\xEF\xBB\xBF"
                                                 "dry_bulb,rh\r\n75,50\r\n60,80")});
  CHECK(crlf.rc == 0);
  CHECK(crlf.out == plain.out);
  const auto cr_bad = state({"--batch", write_file("cr-bad.csv", "dry_bulb,rh\r75,50\r60,180\r")});
  check_rows_then_error(cr_bad, 1);
  CHECK(contains(cr_bad.err, "cr-bad.csv:3"));
}
