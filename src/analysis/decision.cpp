#include <limitline/analysis/decision.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

namespace limitline::decision {

double tie_tolerance(double perfect_savings, bool cost) {
  return std::max(kTieShareOfSavings * std::fabs(perfect_savings),
                  cost ? kTieFloorCost : kTieFloorKwh);
}

Recommendation recommend(std::span<const Candidate> c, double tolerance) {
  Recommendation r;
  r.tolerance = tolerance;
  if (c.empty()) return r;
  r.code_known =
      std::any_of(c.begin(), c.end(), [](const Candidate& x) { return !x.compliance.empty(); });
  // The group tied with the first (least shortfall) of `pool`, in shortfall order.
  auto group = [&](std::vector<std::size_t> pool) {
    std::stable_sort(pool.begin(), pool.end(),
                     [&](std::size_t a, std::size_t b) { return c[a].shortfall < c[b].shortfall; });
    std::vector<std::size_t> g;
    for (std::size_t i : pool)
      if (c[i].shortfall - c[pool.front()].shortfall < tolerance) g.push_back(i);
    return g;
  };
  std::vector<std::size_t> all(c.size()), compliant;
  for (std::size_t i = 0; i < c.size(); ++i) {
    all[i] = i;
    if (c[i].compliance == "complies" || c[i].compliance == "complies-if-selectable")
      compliant.push_back(i);
  }
  r.best = group(all);
  if (!compliant.empty()) r.best_compliant = group(compliant);
  r.all_tied = c.size() > 1 && r.best.size() == c.size();
  return r;
}

std::string share_text(double share) {
  if (!std::isfinite(share)) return "-";
  if (share == 1.0) return "100%";
  if (share == 0.0) return "0%";
  const double pct = share * 100.0;
  // Toward zero at one decimal: 99.96 % is "99.9%", never "100.0%"; −0.04 % is "-0.0%".
  double shown = std::trunc(pct * 10.0) / 10.0;
  if (shown == 0.0) return pct > 0 ? "<0.1%" : ">-0.1%";
  return fmt::format("{:.1f}%", shown);
}

}  // namespace limitline::decision
