// Must not build: the physics layer may not read files (docs/architecture.md §Layers).
#include <limitline/io/weather.hpp>
