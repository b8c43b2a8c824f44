#pragma once
// Demo data compiled into the binary (data/demo/*), so the demo runs without any file.
#include <optional>
#include <span>
#include <string_view>

namespace limitline::embedded {

struct File {
  std::string_view name;  // file name inside data/demo, e.g. "demo-unit.toml"
  std::string_view contents;
};

std::span<const File> files();

// The contents of the file of `all` named `name` (another set of embedded files, such as the
// study page's, looks its files up with this too).
inline std::optional<std::string_view> find_in(std::span<const File> all, std::string_view name) {
  for (const File& f : all)
    if (f.name == name) return f.contents;
  return std::nullopt;
}

inline std::optional<std::string_view> find(std::string_view name) {
  return find_in(files(), name);
}

}  // namespace limitline::embedded
