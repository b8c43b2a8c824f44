#include <limitline/version.hpp>

namespace limitline {

const char* version() { return LIMITLINE_VERSION_STRING; }

}  // namespace limitline
