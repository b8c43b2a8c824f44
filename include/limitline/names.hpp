#pragma once
// Enum ↔ name tables. Each enum that is read or written as text has one table beside it,
// the only place its names are spelt; lookups both ways and the list of allowed names in
// messages all read that table.
#include <iterator>
#include <optional>
#include <string>
#include <string_view>
#include <type_traits>

namespace limitline {

template <class E>
struct Named {
  std::string_view name;
  E value;
};

// The first name of `value` in `table` (later rows may be synonyms); empty when absent.
template <class Table, class E>
[[nodiscard]] constexpr std::string_view name_in(const Table& table, E value) {
  for (const auto& n : table)
    if (n.value == value) return n.name;
  return {};
}

// The value `name` spells exactly; nullopt when no row has it.
template <class Table>
[[nodiscard]] constexpr auto value_in(const Table& table, std::string_view name)
    -> std::optional<std::remove_cvref_t<decltype(std::begin(table)->value)>> {
  for (const auto& n : table)
    if (n.name == name) return n.value;
  return std::nullopt;
}

// The names of `table` for a message: "a, b, c", or "a or b" with `separator` " or ".
template <class Table>
[[nodiscard]] std::string names_in(const Table& table, std::string_view separator = ", ") {
  std::string out;
  for (const auto& n : table) {
    if (!out.empty()) out += separator;
    out += n.name;
  }
  return out;
}

}  // namespace limitline
