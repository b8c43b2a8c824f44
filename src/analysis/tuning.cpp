#include <limitline/analysis/tuning.hpp>

#include <limitline/parallel.hpp>

#include <algorithm>
#include <array>
#include <cmath>
#include <stdexcept>

namespace limitline::tuning {
namespace {

using highlimit::Quantity;
using highlimit::Reference;

// Practical ranges of each setting (common practice: around the published code limits of
// 90.1, IECC and Title 24 — 65–75 °F, 22–28 Btu/lb, 55 °F dew point, offsets of a few
// degrees — and wide enough that the optimum of a real climate lies inside), in round
// numbers of each system. Points: 41 alone, 21 as the primary axis of a combined preset, 11
// as its secondary (the dry-bulb limit of "fixed-enthalpy+dry-bulb" and the like), whose
// range sits higher: a combined preset's dry-bulb limit is its outer bound.
struct RangeRow {
  Quantity quantity;
  Reference reference;
  bool secondary;  // the secondary axis's own range (otherwise the row serves every role)
  double ip_lo, ip_hi, si_lo, si_hi;
};
constexpr RangeRow kRanges[] = {
    {Quantity::dry_bulb, Reference::fixed, true, 65.0, 80.0, 18.0, 28.0},
    {Quantity::dry_bulb, Reference::fixed, false, 55.0, 75.0, 13.0, 25.0},
    {Quantity::enthalpy, Reference::fixed, false, 20.0, 32.0, 40.0, 70.0},
    {Quantity::dew_point, Reference::fixed, false, 45.0, 65.0, 7.0, 19.0},
    {Quantity::humidity_ratio, Reference::fixed, false, 0.006, 0.014, 0.006, 0.014},
    {Quantity::dry_bulb, Reference::return_air, false, -10.0, 10.0, -5.0, 5.0},
    {Quantity::enthalpy, Reference::return_air, false, -5.0, 5.0, -10.0, 10.0},
    {Quantity::dew_point, Reference::return_air, false, -10.0, 10.0, -5.0, 5.0},
    {Quantity::humidity_ratio, Reference::return_air, false, -0.003, 0.003, -0.003, 0.003},
};

std::size_t points_of(Role role) {
  switch (role) {
    case Role::only: return 41;
    case Role::primary: return 21;
    case Role::secondary: return 11;
  }
  return 41;
}

// One strategy over the packed year: the decisions and sums of annual::run, in the same order
// (monthly sums, then the months in turn), so every figure equals annual::run's exactly.
Point run_packed(const highlimit::Strategy& s, std::vector<double> values, const Baseline& ref) {
  std::array<double, 12> energy{}, harmful{}, missed{};
  highlimit::StrategyState state(s);
  for (const Baseline::Hour& h : ref.hours) {
    const bool enabled = highlimit::permits(s, h.outdoor, h.ret, state);
    energy[h.month] += enabled ? h.enabled_kwh : h.disabled_kwh;
    if (enabled ? h.harmful_if_enabled : h.missed_if_disabled)
      (enabled ? harmful : missed)[h.month] += h.hours;
  }
  Point p;
  p.values = std::move(values);
  for (std::size_t m = 0; m < 12; ++m) {
    p.energy_kwh += energy[m];
    p.harmful_hours += harmful[m];
    p.missed_hours += missed[m];
  }
  p.shortfall_kwh = p.energy_kwh - ref.perfect_kwh;
  p.savings_kwh = ref.none_kwh - p.energy_kwh;
  return p;
}

}  // namespace

Range practical_range(Quantity q, Reference r, Role role, units::System system) {
  const RangeRow* found = nullptr;
  for (const RangeRow& row : kRanges) {
    if (row.quantity != q || row.reference != r) continue;
    if (row.secondary && role != Role::secondary) continue;
    found = &row;
    break;
  }
  if (found == nullptr) throw std::logic_error("tuning::practical_range: no range");
  const bool ip = system == units::System::ip;
  return {ip ? found->ip_lo : found->si_lo, ip ? found->ip_hi : found->si_hi, points_of(role)};
}

Axis make_axis(std::size_t condition, Quantity q, Reference r, const Range& range,
               units::System system) {
  Axis a;
  a.condition = condition;
  a.quantity = q;
  a.reference = r;
  const units::Kind k = a.kind();
  a.values.reserve(range.points);
  for (std::size_t i = 0; i < range.points; ++i) {
    // Each value from its index, so the grid carries no accumulated rounding.
    const double display = range.points == 1
                               ? range.lo
                               : range.lo + (range.hi - range.lo) * static_cast<double>(i) /
                                                static_cast<double>(range.points - 1);
    a.values.push_back(units::from_display(k, system, display));
  }
  return a;
}

std::vector<Axis> default_axes(const highlimit::Strategy& s, units::System system) {
  std::vector<Axis> axes;
  const auto& c = s.conditions;
  if (c.empty()) return axes;
  if (c.size() == 1) {
    axes.push_back(make_axis(0, c[0].quantity, c[0].reference,
                             practical_range(c[0].quantity, c[0].reference, Role::only, system),
                             system));
    return axes;
  }
  // Two (or more: the first two are swept, the rest held): the fixed dry-bulb limit, when one
  // of them is, is the secondary axis.
  std::size_t primary = 0, secondary = 1;
  auto is_outer = [](const highlimit::Condition& x) {
    return x.quantity == Quantity::dry_bulb && x.reference == Reference::fixed;
  };
  if (is_outer(c[0]) && !is_outer(c[1])) std::swap(primary, secondary);
  axes.push_back(make_axis(
      primary, c[primary].quantity, c[primary].reference,
      practical_range(c[primary].quantity, c[primary].reference, Role::primary, system), system));
  axes.push_back(make_axis(
      secondary, c[secondary].quantity, c[secondary].reference,
      practical_range(c[secondary].quantity, c[secondary].reference, Role::secondary, system),
      system));
  return axes;
}

highlimit::Strategy at_setting(const highlimit::Strategy& s, std::span<const Axis> axes,
                               std::span<const double> values) {
  highlimit::Strategy out = s;
  for (std::size_t i = 0; i < axes.size() && i < values.size(); ++i)
    out.conditions.at(axes[i].condition).limit = values[i];
  return out;
}

Baseline baseline_of(const annual::Prepared& p) {
  Baseline r;
  r.perfect_kwh = annual::run_reference(annual::Kind::perfect_changeover, p).annual.energy_kwh;
  r.none_kwh = annual::run_reference(annual::Kind::no_economizer, p).annual.energy_kwh;
  r.hours.reserve(p.intervals.size());
  for (const annual::PreparedInterval& iv : p.intervals)
    r.hours.push_back({iv.outdoor, iv.ret, iv.disabled.energy_kwh, iv.enabled.energy_kwh, iv.hours,
                       static_cast<std::uint8_t>(iv.month - 1),
                       iv.cooling_needed && iv.enabling_hurts(), iv.enabling_pays()});
  return r;
}

Band band_of(const Curve& c, double share) {
  Band b;
  b.share = share;
  const Point& best = c.best_point();
  // Savings of at least (1 − share) of the best's; when the best saves nothing, within that
  // share of the no-economizer energy's scale.
  const double scale = std::max(std::fabs(best.savings_kwh), 1e-9);
  const double floor = best.savings_kwh - share * scale;
  const std::size_t n_axes = c.axes.size();
  b.lo.assign(n_axes, INFINITY);
  b.hi.assign(n_axes, -INFINITY);
  std::vector<std::size_t> in;
  for (std::size_t i = 0; i < c.grid.size(); ++i) {
    const Point& p = c.grid[i];
    if (p.savings_kwh < floor) continue;
    in.push_back(i);
    for (std::size_t a = 0; a < n_axes; ++a) {
      b.lo[a] = std::min(b.lo[a], p.values[a]);
      b.hi[a] = std::max(b.hi[a], p.values[a]);
    }
  }
  b.count = in.size();
  for (std::size_t k = 1; k < in.size(); ++k)
    if (in[k] != in[k - 1] + 1) b.contiguous = false;
  if (n_axes != 1) b.contiguous = false;
  if (in.empty())
    for (std::size_t a = 0; a < n_axes; ++a) b.lo[a] = b.hi[a] = best.values[a];
  return b;
}

std::optional<Curve> tune(const highlimit::Strategy& s, std::vector<Axis> axes,
                          std::span<const Extra> extras, const Baseline& ref, unsigned threads,
                          const std::atomic<bool>* cancel) {
  Curve c;
  c.strategy = s.name;
  c.axes = std::move(axes);
  std::size_t n = c.axes.empty() ? 0 : 1;
  for (const Axis& a : c.axes) n *= a.values.size();
  const std::size_t total = n + extras.size();

  // Every setting of the run, grid first (row-major: the last axis fastest), then the extras.
  std::vector<std::vector<double>> settings(total);
  for (std::size_t i = 0; i < n; ++i) {
    std::size_t rest = i;
    settings[i].resize(c.axes.size());
    for (std::size_t a = c.axes.size(); a-- > 0;) {
      const std::size_t m = c.axes[a].values.size();
      settings[i][a] = c.axes[a].values[rest % m];
      rest /= m;
    }
  }
  for (std::size_t e = 0; e < extras.size(); ++e) {
    if (extras[e].values.size() != c.axes.size())
      throw std::logic_error("tuning::tune: an extra setting does not match the axes");
    settings[n + e] = extras[e].values;
    c.extra_labels.push_back(extras[e].label);
  }

  std::vector<Point> points(total);
  const ParallelRun run{threads, cancel, nullptr};
  const auto done = parallel_for(total, run, [&]() -> ParallelWork {
    return [&](std::size_t i) {
      const highlimit::Strategy trial = at_setting(s, c.axes, settings[i]);
      points[i] = run_packed(trial, settings[i], ref);
    };
  });
  if (std::find(done.begin(), done.end(), 0) != done.end()) return std::nullopt;
  c.grid.assign(points.begin(), points.begin() + static_cast<std::ptrdiff_t>(n));
  c.extras.assign(points.begin() + static_cast<std::ptrdiff_t>(n), points.end());

  // The best: the least energy on the grid (the first of equals, so the lowest setting),
  // unless an extra is lower still beyond rounding.
  for (std::size_t i = 1; i < c.grid.size(); ++i)
    if (c.grid[i].energy_kwh < c.grid[c.best].energy_kwh) c.best = i;
  const double tie = 1e-9 * std::max(1.0, std::fabs(ref.none_kwh));
  double best = c.grid.empty() ? INFINITY : c.grid[c.best].energy_kwh;
  for (std::size_t e = 0; e < c.extras.size(); ++e) {
    if (c.extras[e].energy_kwh < best - tie) {
      c.best = e;
      c.best_is_extra = true;
      best = c.extras[e].energy_kwh;
    }
  }
  if (c.grid.empty() && c.extras.empty()) return c;
  c.within_1pct = band_of(c, 0.01);
  c.within_5pct = band_of(c, 0.05);
  return c;
}

}  // namespace limitline::tuning
