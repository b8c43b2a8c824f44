#pragma once
// The invented office air handler several suites and benchmarks run on (a test input, never a
// check value), with and without its weekday schedule, and the real Greensboro TMY3 year
// (NREL NSRDB via pvlib; tests/data/SOURCES.md) it is usually paired with.
#include <string>

namespace limitline::test {

inline constexpr const char* kOfficeUnit = R"toml(
[site]
name = "test office (invented)"
elevation = "897ft"
[air_handler]
supply_airflow = "10000cfm"
supply_air_temp = "55F"
fan_heat = "1.5F"
min_outdoor_air = "20%"
return_air_temp = "75F"
return_air_rh = "50%"
)toml";

inline constexpr const char* kOfficeSchedule = R"toml(
[schedule]
mon-fri = "06:00-19:00"
sat = "08:00-13:00"
)toml";

// The unit with its schedule.
inline std::string office_with_schedule() { return std::string(kOfficeUnit) + kOfficeSchedule; }

inline std::string greensboro_path() {
  return std::string(LIMITLINE_TEST_DATA_DIR) + "/greensboro-nc-tmy3.csv";
}

}  // namespace limitline::test
