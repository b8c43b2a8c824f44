// libFuzzer target: the trend reader (trend::parse_trend) on arbitrary text, and the audit of
// whatever it accepts against an invented unit's two strategies. Readings are finite (or
// absent), times in order, and every figure of the audit is finite.
#include <limitline/analysis/audit.hpp>
#include <limitline/error.hpp>
#include <limitline/io/trend.hpp>
#include <limitline/io/unit_file.hpp>

#include "support.hpp"

namespace {

using limitline::fuzz::require;
using limitline::fuzz::require_finite;
namespace trend = limitline::trend;
namespace audit = limitline::audit;

// An invented unit (a test input): a fixed dry-bulb and a differential enthalpy strategy, so
// that both the temperature-only and the humidity paths of the audit run.
constexpr const char* kUnit = R"toml(
[site]
name = "fuzz unit (invented)"
elevation = "600ft"
[air_handler]
supply_airflow = "8000cfm"
supply_air_temp = "55F"
fan_heat = "1.5F"
min_outdoor_air = "20%"
return_air_temp = "74F"
return_air_rh = "45%"
[[strategy]]
name = "dry-bulb 70F"
preset = "fixed-dry-bulb"
dry_bulb_limit = "70F"
deadband = "2F"
[[strategy]]
name = "differential enthalpy"
preset = "differential-enthalpy"
)toml";

const limitline::UnitFile& unit() {
  static const limitline::UnitFile u = limitline::parse_unit_file(kUnit, "fuzz-unit.toml");
  return u;
}

void check_log(const trend::TrendLog& log) {
  require(log.size() >= 2 && log.line.size() == log.size(), "a log of fewer than two samples");
  for (std::size_t i = 0; i < log.size(); ++i) {
    require(i == 0 || log.time_s[i] > log.time_s[i - 1], "times not strictly increasing");
    for (std::size_t k = 0; k < trend::kChannelCount; ++k)
      if (auto v = log.value(static_cast<trend::Channel>(k), i))
        require_finite(*v, "a reading not finite");
    const double w = log.weight_s(i);
    require(std::isfinite(w) && w >= 0, "a weight not finite or negative");
  }
  require_finite(log.coverage.covered_s, "coverage not finite");
  require_finite(log.coverage.span_s, "span not finite");
}

void check_result(const audit::Result& r) {
  require_finite(r.operating_hours, "operating hours not finite");
  require_finite(r.covered_hours, "covered hours not finite");
  for (const auto& f : r.findings) {
    require_finite(f.hours, "finding hours not finite");
    require_finite(f.share_of_operating, "finding share not finite");
    require_finite(f.worst_excess, "finding excess not finite");
    if (f.energy_kwh) require_finite(*f.energy_kwh, "finding energy not finite");
  }
  for (const auto& sp : r.switch_points) {
    require_finite(sp.estimate, "switch point not finite");
    require_finite(sp.highest_open, "highest open not finite");
    require_finite(sp.lowest_closed, "lowest closed not finite");
  }
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const auto text = limitline::fuzz::text(data, size);
  trend::ReadOptions options;
  // The last byte chooses the system of temperature columns without a unit.
  options.bare =
      size > 0 && data[size - 1] % 2 ? limitline::units::System::si : limitline::units::System::ip;
  trend::TrendLog log;
  try {
    log = trend::parse_trend(text, "fuzz.csv", options);
  } catch (const limitline::InputError&) {
    return 0;
  }
  check_log(log);
  for (const auto& strategy : unit().strategies) {
    try {
      check_result(
          audit::run(unit(), log, audit::Options{strategy, {}, {}, audit::kSupplyToleranceK}));
    } catch (const limitline::InputError&) {
    }
  }
  return 0;
}
