// Control for the layering probes: a model source including model headers builds, so the
// probes below fail for the include alone.
#include <limitline/model/psychro.hpp>

double probe() { return limitline::psychro::kStandardPressureKpa; }
