#pragma once
// Small text helpers every layer shares: white space, ASCII case, and the forms names are
// compared in. ASCII only, whatever the locale: input files and options are read the same
// on every machine (the program never changes the "C" locale these mirror).
#include <string>
#include <string_view>

namespace limitline::text {

// White space as std::isspace has it in the "C" locale: space, \t, \n, \v, \f, \r.
[[nodiscard]] constexpr bool is_space(char c) { return c == ' ' || (c >= '\t' && c <= '\r'); }
// Blanks as std::isblank has it in the "C" locale: space and tab.
[[nodiscard]] constexpr bool is_blank(char c) { return c == ' ' || c == '\t'; }

// `s` without leading and trailing white space (is_space).
[[nodiscard]] std::string_view trim(std::string_view s);
// `s` without leading and trailing blanks (space, tab): a line's ends, kept otherwise.
[[nodiscard]] std::string_view trim_blanks(std::string_view s);
// `s` without leading and trailing spaces (' ' only): a tab stays, to be refused as written.
[[nodiscard]] std::string_view trim_spaces(std::string_view s);

// ASCII case: letters A-Z and a-z only; every other byte is kept.
[[nodiscard]] constexpr char to_lower(char c) {
  return c >= 'A' && c <= 'Z' ? static_cast<char>(c - 'A' + 'a') : c;
}
[[nodiscard]] std::string to_lower(std::string_view s);
// Equal, or `s` starts with / contains `part`, ignoring ASCII case.
[[nodiscard]] bool iequals(std::string_view a, std::string_view b);
[[nodiscard]] bool istarts_with(std::string_view s, std::string_view prefix);
[[nodiscard]] bool icontains(std::string_view s, std::string_view part);

// A name as tables compare it: no case, no white space, '_' the same as '-' ("Dew_Point" →
// "dew-point"), so a unit file, an option and a table row may each spell it their way.
[[nodiscard]] std::string normalise_name(std::string_view name);
// Lower case without white space ("kJ / kg" → "kj/kg"): '_' and '-' stay distinct, as unit
// spellings need.
[[nodiscard]] std::string lower_without_space(std::string_view s);

}  // namespace limitline::text
