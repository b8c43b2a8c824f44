#include <limitline/error.hpp>

#include <fmt/format.h>

namespace limitline {

std::string echo(std::string_view value) {
  constexpr std::size_t kShown = 40;
  std::string out = "'";
  std::size_t shown = 0, i = 0;
  for (; i < value.size() && shown < kShown; ++shown) {
    const auto c = static_cast<unsigned char>(value[i]);
    // A whole UTF-8 sequence (degree signs, superscripts) is kept as it is; a broken one is
    // escaped byte by byte.
    std::size_t len = c < 0x80           ? 1
                      : (c >> 5) == 0x6  ? 2
                      : (c >> 4) == 0xe  ? 3
                      : (c >> 3) == 0x1e ? 4
                                         : 0;
    bool valid = len > 1 && i + len <= value.size();
    for (std::size_t k = 1; valid && k < len; ++k)
      valid = (static_cast<unsigned char>(value[i + k]) >> 6) == 0x2;
    if (valid) {
      out.append(value.substr(i, len));
      i += len;
      continue;
    }
    switch (c) {
      case '\n': out += "\\n"; break;
      case '\r': out += "\\r"; break;
      case '\t': out += "\\t"; break;
      case '\\': out += "\\\\"; break;
      default:
        if (c < 0x20 || c >= 0x7f)
          out += fmt::format("\\x{:02x}", c);
        else
          out.push_back(static_cast<char>(c));
    }
    ++i;
  }
  if (i == value.size()) return out + "'";
  // Count what was cut in characters the reader sees, not bytes, when the text is UTF-8.
  std::size_t chars = 0;
  for (unsigned char c : value) chars += (c >> 6) != 0x2;
  return out + fmt::format("…' ({} characters)", chars);
}

}  // namespace limitline
