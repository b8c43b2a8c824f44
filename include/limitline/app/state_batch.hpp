#pragma once
// Properties of every row of a CSV of states, streamed: constant memory whatever the size.
#include <limitline/model/units.hpp>

#include <iosfwd>
#include <string>

namespace limitline {

struct StateBatchOptions {
  units::System system = units::System::ip;  // output units and bare-number units
  double default_pressure_kpa = 101.325;     // when the file has no pressure/elevation column
  std::string origin;                        // file name for error messages
};

// Reads a header naming the columns (dry_bulb and exactly one of rh / relative_humidity,
// wet_bulb, dew_point, humidity_ratio, enthalpy; optional pressure or elevation) and writes
// one CSV row of properties per input row, with the JSON key names as column names. Cells
// are bare numbers in `system` or carry their unit. Blank lines are skipped; a bad row is an
// InputError naming the file and line. Returns the number of rows written.
std::size_t write_state_batch(std::istream& in, std::ostream& out,
                              const StateBatchOptions& options);

}  // namespace limitline
