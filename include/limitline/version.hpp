#pragma once
// The library's version: the one place it is written (CMakeLists.txt reads it from here).
#define LIMITLINE_VERSION_MAJOR 0
#define LIMITLINE_VERSION_MINOR 2
#define LIMITLINE_VERSION_PATCH 0
#define LIMITLINE_VERSION_STRING "0.2.0"

namespace limitline {

// The version of the library linked in, which may differ from the headers compiled against.
[[nodiscard]] const char* version();

}  // namespace limitline
