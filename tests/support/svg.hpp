#pragma once
// Reading SVG written by the report layer back in tests: path coordinates, element attributes,
// and the checks every picture must pass (parses with xmllint, renders with rsvg-convert to a
// picture that is not blank, standalone with no URL but its namespace, no NaN or inf).
// Include after the limitline headers and support/cli.hpp.
#include "cli.hpp"

#include <cctype>
#include <cmath>
#include <fstream>
#include <regex>
#include <string>
#include <vector>

namespace limitline::test::svg {

struct Xy {
  double x, y;
};

// Coordinates of an SVG path written as "M x y L x y ...".
inline std::vector<Xy> path_points(const std::string& d) {
  static const std::regex pair(R"([ML]\s*(-?[0-9.]+)[ ,]\s*(-?[0-9.]+))");
  std::vector<Xy> out;
  for (auto it = std::sregex_iterator(d.begin(), d.end(), pair); it != std::sregex_iterator(); ++it)
    out.push_back({std::stod((*it)[1]), std::stod((*it)[2])});
  return out;
}

// Every element opening tag that carries all the attribute fragments, e.g. class="boundary".
// A plain scan, not std::regex: libstdc++'s regex recurses per character and overflows the
// stack on the long path data of a picture (under the sanitizers first).
inline std::vector<std::string> tags_with(const std::string& svg,
                                          const std::vector<std::string>& fragments) {
  std::vector<std::string> out;
  for (std::size_t at = svg.find('<'); at != std::string::npos; at = svg.find('<', at + 1)) {
    std::size_t name_end = at + 1;
    while (name_end < svg.size() && svg[name_end] >= 'a' && svg[name_end] <= 'z') ++name_end;
    if (name_end == at + 1 || name_end >= svg.size() ||
        !std::isspace(static_cast<unsigned char>(svg[name_end])))
      continue;
    const std::size_t close = svg.find('>', name_end);
    if (close == std::string::npos) break;
    const std::string t = svg.substr(at, close - at + 1);
    bool all = true;
    for (const auto& f : fragments) all = all && contains(t, f);
    if (all) out.push_back(t);
  }
  return out;
}

inline std::string attr(const std::string& tag, const std::string& name) {
  for (std::size_t at = tag.find(name + "=\""); at != std::string::npos;
       at = tag.find(name + "=\"", at + 1)) {
    if (at == 0 || !std::isspace(static_cast<unsigned char>(tag[at - 1]))) continue;
    const std::size_t from = at + name.size() + 2, to = tag.find('"', from);
    if (to == std::string::npos) return {};
    return tag.substr(from, to - from);
  }
  return {};
}

inline int sh(const std::string& cmd) {
  const int status = std::system(cmd.c_str());
  return WIFEXITED(status) ? WEXITSTATUS(status) : -1;
}

// Parses with xmllint, renders with rsvg-convert and checks the picture is not blank.
inline void check_svg_renders(const std::string& svg, const std::string& suite,
                              const std::string& name) {
  const auto dir = scratch_dir(suite);
  const auto file = dir / (name + ".svg"), png = dir / (name + ".png"),
             stats = dir / (name + ".json");
  std::ofstream(file, std::ios::binary) << svg;
  CHECK_MESSAGE(sh("xmllint --noout " + shell_quote(file.string()) + " 2>/dev/null") == 0, name);
  REQUIRE_MESSAGE(
      sh("rsvg-convert " + shell_quote(file.string()) + " -o " + shell_quote(png.string())) == 0,
      name);
  REQUIRE(sh("node " +
             shell_quote(std::string(LIMITLINE_SOURCE_DIR) + "/tests/tools/png_stats.js") + " " +
             shell_quote(png.string()) + " > " + shell_quote(stats.string())) == 0);
  const std::string s = slurp(stats);
  std::smatch m;
  REQUIRE(std::regex_search(s, m, std::regex(R"("distinct":(\d+),"non_dominant":([0-9.e-]+))")));
  // A chart has lines, text and cells in many colours, and a good part of it is not paper.
  CHECK_MESSAGE(std::stoi(m[1]) > 200, name);
  CHECK_MESSAGE(std::stod(m[2]) > 0.05, name);
}

inline void check_standalone(const std::string& svg) {
  CHECK(svg.starts_with("<svg xmlns=\"http://www.w3.org/2000/svg\" viewBox=\"0 0 "));
  CHECK_FALSE(contains(svg, "href"));
  CHECK_FALSE(contains(svg, "url("));
  CHECK_FALSE(contains(svg, "<script"));
  CHECK_FALSE(contains(svg, "<image"));
  // The namespace is the only URL.
  CHECK(svg.find("http") == svg.find("http://www.w3.org/2000/svg"));
  CHECK(svg.find("http", svg.find("http") + 1) == std::string::npos);
  static const std::regex bad(R"((^|[^a-z])(nan|inf)([^a-z]|$))", std::regex::icase);
  CHECK_FALSE(std::regex_search(svg, bad));
}

}  // namespace limitline::test::svg
