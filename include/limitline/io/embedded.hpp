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

inline std::optional<std::string_view> find(std::string_view name) {
  for (const File& f : files())
    if (f.name == name) return f.contents;
  return std::nullopt;
}

}  // namespace limitline::embedded
