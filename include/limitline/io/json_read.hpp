#pragma once
// A small JSON reader for the files limitline writes itself and reads back (the partial
// results of a sharded survey): objects, arrays, strings with every escape of RFC 8259,
// numbers, booleans and null. A number is read with std::from_chars, so a double written in
// its shortest round-trip form comes back bit for bit.
#include <map>
#include <memory>
#include <string>
#include <string_view>
#include <variant>
#include <vector>

namespace limitline::json {

struct Value;
using Object = std::map<std::string, Value, std::less<>>;
using Array = std::vector<Value>;

struct Value {
  std::variant<std::nullptr_t, bool, double, std::string, Array, Object> v;

  [[nodiscard]] bool is_null() const { return std::holds_alternative<std::nullptr_t>(v); }
  // Each accessor throws InputError "WHERE: KEY: expected a number" (and so on) when the
  // value is of another kind; `where` names the file and line, `key` the member.
  [[nodiscard]] double number(std::string_view where, std::string_view key) const;
  [[nodiscard]] bool boolean(std::string_view where, std::string_view key) const;
  [[nodiscard]] const std::string& string(std::string_view where, std::string_view key) const;
  [[nodiscard]] const Array& array(std::string_view where, std::string_view key) const;
  [[nodiscard]] const Object& object(std::string_view where, std::string_view key) const;
};

// The member `key` of `o`; InputError "WHERE: KEY: missing" when absent.
[[nodiscard]] const Value& member(const Object& o, std::string_view key, std::string_view where);
// The member, or nullptr when absent.
[[nodiscard]] const Value* find(const Object& o, std::string_view key);

// One JSON value, the whole of `text` (white space around it allowed). InputError
// "WHERE: column N: ..." for anything else; nesting deeper than 64 levels is refused.
[[nodiscard]] Value parse(std::string_view text, std::string_view where);

}  // namespace limitline::json
