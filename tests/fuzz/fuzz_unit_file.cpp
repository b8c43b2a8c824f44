// libFuzzer target: the unit-file reader (TOML) on arbitrary text.
#include <limitline/error.hpp>
#include <limitline/io/unit_file.hpp>

#include "support.hpp"

namespace {

// Deep nesting (tables, dotted keys, inline tables and arrays tens of thousands deep) is a
// known stack overflow inside the TOML parser, to be refused before the parser sees it. Until
// then this target leaves such inputs out: at most 256 brackets, braces and dots in all, a
// bound no real unit file comes near (the examples have about 40).
bool nesting_within_bound(std::string_view text) {
  std::size_t n = 0;
  for (char c : text) n += c == '[' || c == '{' || c == '.';
  return n <= 256;
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const auto text = limitline::fuzz::text(data, size);
  if (!nesting_within_bound(text)) return -1;  // not kept in the corpus
  try {
    const limitline::UnitFile unit = limitline::parse_unit_file(text, "fuzz.toml");
    limitline::fuzz::require_finite(unit.site.design_pressure_kpa(), "design pressure not finite");
    limitline::fuzz::require_finite(unit.air_handler.dry_air_mass_flow_kg_per_s(),
                                    "dry-air mass flow not finite");
  } catch (const limitline::InputError&) {
  }
  return 0;
}
