#pragma once
// The recommendation (docs/model.md §Recommendation): the best strategy among those the
// unit's code allows, the best overall when it differs, and which strategies are tied.
//
// Two strategies are tied when their shortfalls differ by less than the tie tolerance: 0.5 %
// of the perfect changeover's savings, and never less than a floor (1 kBtu, or 0.01 in a
// currency), because a high-limit choice that moves the year by less than that is not a
// decision a sensor or a season can hold to.
#include <algorithm>
#include <optional>
#include <span>
#include <string>
#include <vector>

namespace limitline::decision {

inline constexpr double kTieShareOfSavings = 0.005;
inline constexpr double kTieFloorKwh = 1.0 / 3.412141633;  // 1 kBtu
inline constexpr double kTieFloorCost = 0.01;

// The tolerance for a year whose perfect changeover saves `perfect_savings` (in the
// ranking's measure; `cost` selects the floor).
[[nodiscard]] double tie_tolerance(double perfect_savings, bool cost);

struct Candidate {
  std::string name;
  double shortfall = 0;  // against the perfect changeover, in the ranking's measure
  // The code's word for it ("complies", "not-allowed", ...); empty when no code is known.
  std::string compliance;
};

struct Recommendation {
  double tolerance = 0;
  // Indices into the candidates, best first: the best overall and those tied with it.
  std::vector<std::size_t> best;
  // The same among the candidates that comply; empty when none does or no code is known.
  std::vector<std::size_t> best_compliant;
  bool code_known = false;
  // Every candidate is tied with every other: the choice of high-limit does not matter here.
  bool all_tied = false;
  // The best overall is not among the compliant ones (nor tied with the best compliant).
  [[nodiscard]] bool best_not_allowed() const {
    return code_known && !best.empty() &&
           (best_compliant.empty() ||
            std::find(best.begin(), best.end(), best_compliant.front()) == best.end());
  }
};

[[nodiscard]] Recommendation recommend(std::span<const Candidate> candidates, double tolerance);

// A share as a percentage that never rounds up to 100 % unless it is exactly 1, nor down to
// 0 % unless it is exactly 0: "99.7%", "99.9%" for 0.99996, "100%" for 1.
[[nodiscard]] std::string share_text(double share);

}  // namespace limitline::decision
