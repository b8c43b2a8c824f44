// The shared text helpers: which bytes are white space or blanks, ASCII case, and the forms
// names are compared in. The character classes are checked against the C library's own
// <cctype> functions in the "C" locale (C17 §7.4.1, the classes the helpers promise to
// mirror), byte by byte, so a mistake in either shows.
#include <doctest/doctest.h>

#include <limitline/text.hpp>

#include <cctype>
#include <string>

namespace text = limitline::text;

TEST_CASE("white space and blanks are the C locale's isspace and isblank, byte by byte") {
  for (int b = 0; b < 256; ++b) {
    const char c = static_cast<char>(b);
    INFO("byte ", b);
    CHECK(text::is_space(c) == (std::isspace(b) != 0));
    CHECK(text::is_blank(c) == (std::isblank(b) != 0));
    CHECK(text::to_lower(c) == static_cast<char>(std::tolower(b)));
  }
}

TEST_CASE("the three trims differ only in what they strip") {
  const std::string s = "\t \r\n 68F/80% \v\f\t ";
  CHECK(text::trim(s) == "68F/80%");
  CHECK(text::trim_blanks(s) == "\r\n 68F/80% \v\f");
  CHECK(text::trim_spaces(s) == "\t \r\n 68F/80% \v\f\t");
  CHECK(text::trim_spaces("  08:00 ") == "08:00");
  SUBCASE("inner white space stays") { CHECK(text::trim(" a b ") == "a b"); }
  SUBCASE("all white space, or nothing, trims to empty") {
    CHECK(text::trim(" \t\n").empty());
    CHECK(text::trim_blanks(" \t").empty());
    CHECK(text::trim_spaces("   ").empty());
    CHECK(text::trim("").empty());
  }
}

TEST_CASE("case-insensitive comparison folds ASCII letters only") {
  CHECK(text::iequals("Dry_Bulb", "dry_bulb"));
  CHECK_FALSE(text::iequals("dry_bulb", "dry-bulb"));
  CHECK_FALSE(text::iequals("rh", "rh%"));
  CHECK(text::istarts_with("DP58F", "dp"));
  CHECK_FALSE(text::istarts_with("d", "dp"));
  CHECK(text::istarts_with("anything", ""));
  CHECK(text::icontains("Temp (DEG F)", "deg f"));
  CHECK_FALSE(text::icontains("deg", "degf"));
  // Bytes outside ASCII are compared as they are: "É" and "é" differ.
  CHECK_FALSE(text::iequals("\xc3\x89", "\xc3\xa9"));
  CHECK(text::to_lower("Dew-Point 2 \xc3\x89") == "dew-point 2 \xc3\x89");
}

TEST_CASE("names compare without case or white space, with '_' as '-'") {
  CHECK(text::normalise_name("Dew_Point") == "dew-point");
  CHECK(text::normalise_name(" Fixed Enthalpy\t+ Dry_Bulb ") == "fixedenthalpy+dry-bulb");
  CHECK(text::normalise_name("draw-through") == "draw-through");
  SUBCASE("unit spellings keep '_' and '-' apart") {
    CHECK(text::lower_without_space(" kJ / kg ") == "kj/kg");
    CHECK(text::lower_without_space("g_per_kg") == "g_per_kg");
  }
}
