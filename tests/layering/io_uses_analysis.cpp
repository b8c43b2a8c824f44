// Must not build: readers may not depend on the analyses built on them.
#include <limitline/analysis/annual.hpp>
