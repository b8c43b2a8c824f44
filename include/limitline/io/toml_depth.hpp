#pragma once
// A guard for the TOML readers (unit files, code tables): toml++ parses nested tables,
// dotted keys, inline tables and arrays by recursion, so a document nested tens of thousands
// deep overflows the stack. Every TOML document a user can name is measured first.
#include <string_view>

namespace limitline {

// No unit file or code table needs more than a handful of levels; 64 leaves room for any
// hand-written file and none for an attack.
inline constexpr int kMaxTomlDepth = 64;

// Throws InputError "NAME:LINE: TOML nested more than 64 levels deep ..." when `text` nests
// deeper than kMaxTomlDepth, counting the parts of a [table] header, the parts of a dotted
// key, and each inline table and array a value opens. Strings and comments are skipped; text
// that is not valid TOML is left for the parser to report.
void check_toml_depth(std::string_view text, std::string_view name);

}  // namespace limitline
