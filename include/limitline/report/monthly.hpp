#pragma once
// The year month by month as small multiples: one panel per strategy on one shared scale,
// each against the perfect changeover, so a reader sees at a glance which months a strategy
// gets right and where its wrong decisions fall.
#include <limitline/analysis/annual.hpp>

#include <span>
#include <string>
#include <string_view>

namespace limitline::report {

// One panel per strategy, in the order of `order` (the unit file's, so number and colour match
// the psychrometric chart), then any strategy `order` does not name. Per month, above the
// panel's baseline: the hours the strategy economizes (a bar in its colour) inside the outline
// of the hours the perfect changeover economizes; below it, on the same scale, the wrong
// decisions: hours it economizes although that costs energy (harmful), then hours it holds
// the minimum although outdoor air would have saved (missed). Each panel's heading gives its
// number, name, wrong hours and the share of the perfect changeover's savings it captures.
// Elements carry data-strategy, data-month (1–12) and data-hours for tests and tools.
std::string monthly_hours_svg(const annual::YearResult& year, std::span<const std::string> order,
                              std::string_view title);

}  // namespace limitline::report
