#include <limitline/text.hpp>

namespace limitline::text {
namespace {

template <class Pred>
std::string_view trim_if(std::string_view s, Pred strip) {
  while (!s.empty() && strip(s.front())) s.remove_prefix(1);
  while (!s.empty() && strip(s.back())) s.remove_suffix(1);
  return s;
}

}  // namespace

std::string_view trim(std::string_view s) { return trim_if(s, is_space); }
std::string_view trim_blanks(std::string_view s) { return trim_if(s, is_blank); }
std::string_view trim_spaces(std::string_view s) {
  return trim_if(s, [](char c) { return c == ' '; });
}

std::string to_lower(std::string_view s) {
  std::string out(s);
  for (char& c : out) c = to_lower(c);
  return out;
}

bool iequals(std::string_view a, std::string_view b) {
  return a.size() == b.size() && istarts_with(a, b);
}

bool istarts_with(std::string_view s, std::string_view prefix) {
  if (s.size() < prefix.size()) return false;
  for (std::size_t i = 0; i < prefix.size(); ++i)
    if (to_lower(s[i]) != to_lower(prefix[i])) return false;
  return true;
}

bool icontains(std::string_view s, std::string_view part) {
  if (part.size() > s.size()) return false;
  for (std::size_t i = 0; i + part.size() <= s.size(); ++i)
    if (istarts_with(s.substr(i), part)) return true;
  return false;
}

std::string normalise_name(std::string_view name) {
  std::string out;
  out.reserve(name.size());
  for (char c : name)
    if (!is_space(c)) out.push_back(c == '_' ? '-' : to_lower(c));
  return out;
}

std::string lower_without_space(std::string_view s) {
  std::string out;
  out.reserve(s.size());
  for (char c : s)
    if (!is_space(c)) out.push_back(to_lower(c));
  return out;
}

}  // namespace limitline::text
