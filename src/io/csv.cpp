#include <limitline/io/csv.hpp>

#include <limitline/text.hpp>

namespace limitline::csv {

std::vector<std::string> split_line(std::string_view line, char delimiter) {
  if (!line.empty() && line.back() == '\r') line.remove_suffix(1);
  std::vector<std::string> fields;
  std::string field;
  bool quoted = false, was_quoted = false;
  auto finish = [&] {
    if (!was_quoted) {
      field = std::string(text::trim(field));
    }
    fields.push_back(std::move(field));
    field.clear();
    was_quoted = false;
  };
  for (std::size_t i = 0; i < line.size(); ++i) {
    const char c = line[i];
    if (quoted) {
      if (c == '"') {
        if (i + 1 < line.size() && line[i + 1] == '"') {
          field += '"';
          ++i;
        } else {
          quoted = false;
        }
      } else {
        field += c;
      }
    } else if (c == '"') {
      quoted = true;
      was_quoted = true;
      // Text before the opening quote is kept only if it is not white space.
      if (text::trim(field).empty()) field.clear();
    } else if (c == delimiter) {
      finish();
    } else {
      field += c;
    }
  }
  finish();
  return fields;
}

char guess_delimiter(std::string_view line) {
  int comma = 0, semicolon = 0, tab = 0;
  bool quoted = false;
  for (char c : line) {
    if (c == '"') quoted = !quoted;
    if (quoted) continue;
    comma += c == ',';
    semicolon += c == ';';
    tab += c == '\t';
  }
  if (semicolon > comma && semicolon >= tab) return ';';
  if (tab > comma && tab > semicolon) return '\t';
  return ',';
}

}  // namespace limitline::csv
