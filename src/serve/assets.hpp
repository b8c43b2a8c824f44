#pragma once
// The study page's files (data/serve/*), compiled into the binary by cmake/embed.cmake as the
// demo data are: the page needs no network and no file beside the executable.
#include <limitline/io/embedded.hpp>

namespace limitline::serve::assets {

using embedded::File;

std::span<const File> files();

inline std::optional<std::string_view> find(std::string_view name) {
  return embedded::find_in(files(), name);
}

}  // namespace limitline::serve::assets
