#pragma once
// The hour-by-hour account of an annual run, as CSV: each interval's outdoor and return
// states, and for each strategy and reference its decision, damper position and loads.
#include <limitline/analysis/annual.hpp>
#include <limitline/model/units.hpp>

#include <iosfwd>
#include <span>

namespace limitline::report {

// Writes every interval of `weather` (fan-off intervals with fan_on = 0 and empty decision
// cells). `year` must come from annual::evaluate with RunOptions::keep_decisions. It stops at
// the first failed write; the caller reports the failure from the stream (OutputFile::commit).
void write_hourly_csv(std::ostream& out, std::span<const annual::OutdoorInterval> weather,
                      const annual::Prepared& prepared, const annual::YearResult& year,
                      units::System units);

}  // namespace limitline::report
