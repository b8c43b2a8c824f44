#pragma once
// A table of the unit file kept whole for the layer that owns its keys ([weather] for the
// weather reader, [schedule] for the schedule reader, [sensors] for the sensor study): the
// unit-file reader does not know those keys, their own readers validate them and report
// "FILE:LINE: KEY" from the lines the table keeps.
//
// Opaque on purpose: the TOML library stays out of the public headers, so a program using
// limitline needs neither its headers nor its version. Readers inside the library open it
// through io/detail/raw_table.hpp, which is not installed.
#include <memory>
#include <string_view>

namespace limitline {

class RawTable {
 public:
  struct Impl;  // defined in io/detail/raw_table.hpp
  explicit RawTable(std::shared_ptr<const Impl> impl);

  // Whether the table has `key` at its top level.
  [[nodiscard]] bool contains(std::string_view key) const;

  [[nodiscard]] const Impl& impl() const { return *impl_; }

 private:
  // Shared and immutable: a copy of a unit file keeps the source lines its messages name.
  std::shared_ptr<const Impl> impl_;
};

}  // namespace limitline
