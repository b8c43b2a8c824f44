#pragma once
// The TOML behind a RawTable, for the library's own readers only (.cpp files include this;
// it is not installed, and no public header includes it).
#include <limitline/io/raw_table.hpp>

#include <toml++/toml.h>

#include <string>
#include <string_view>

namespace limitline {

struct RawTable::Impl {
  toml::table table;
};

namespace detail {

// Takes the table over by move: a toml++ copy drops the source lines the owning layers report.
[[nodiscard]] RawTable make_raw_table(toml::table&& table);

[[nodiscard]] inline const toml::table& toml_table(const RawTable& raw) { return raw.impl().table; }

// "FILE:LINE: KEY" for a node read from a unit file, the prefix of every message about it.
[[nodiscard]] std::string source_origin(const toml::source_region& where, std::string_view key);

}  // namespace detail
}  // namespace limitline
