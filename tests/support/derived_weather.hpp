#pragma once
// Versions of the real weather files derived in a test (tests/data/SOURCES.md allows them to
// be produced by the test from the real file): every data row's fields edited in place.
#include <functional>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

namespace limitline::test {

// The text of the CSV `path` whose first `header_lines` lines are kept (the header replaced
// by `header` when given) and whose other lines have `edit` applied to their comma fields.
inline std::string edited_csv(const std::string& path, int header_lines,
                              const std::function<void(std::vector<std::string>&)>& edit,
                              const std::string& header = "") {
  std::ifstream file(path, std::ios::binary);
  std::string out, line;
  for (int n = 1; std::getline(file, line); ++n) {
    if (n < header_lines) {
      out += line + "\n";
      continue;
    }
    if (n == header_lines) {
      out += (header.empty() ? line : header) + "\n";
      continue;
    }
    std::vector<std::string> f(1);
    for (char c : line) {
      if (c == ',')
        f.emplace_back();
      else
        f.back().push_back(c);
    }
    edit(f);
    for (std::size_t k = 0; k < f.size(); ++k) out += (k ? "," : "") + f[k];
    out += "\n";
  }
  return out;
}

}  // namespace limitline::test
