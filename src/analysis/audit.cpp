#include <limitline/analysis/audit.hpp>

#include <limitline/error.hpp>
#include <limitline/model/psychro.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

namespace limitline::audit {
namespace {

using trend::Channel;

struct KindText {
  std::string_view key, title, rule;
};
// Titles and rules in limitline's own words (no energy code's fault list is quoted here);
// the keys are stable, as JSON and CSV carry them.
constexpr KindText kKinds[kFindingKindCount] = {
    {"economizing-when-disabled", "Damper opened past the minimum against the high-limit",
     "fan on, the high-limit clearly locks the economizer out, and the damper is open more "
     "than 5 % points above the minimum"},
    {"not-economizing-when-enabled", "Damper held at minimum though the high-limit allows it",
     "fan on, no cooling logged running, the high-limit clearly allows the economizer and the "
     "model opens the damper at least 10 % points above the minimum, but the damper stays "
     "within 5 % points of the minimum"},
    {"damper-not-following", "Measured outdoor air unlike the damper command",
     "the measured outdoor-air fraction differs from the commanded one by more than 3σ + 0.15 "
     "(the damper signal read as the fraction it commands)"},
    {"excess-outdoor-air", "More outdoor air than the minimum with the damper at minimum",
     "damper signal at the minimum (or the strategy off, with no damper column) and the "
     "measured fraction above the minimum by more than 3σ + 0.05"},
    {"below-minimum", "Outdoor air short of the ventilation minimum",
     "the measured fraction below the minimum by more than 3σ + 0.05"},
    {"mixed-air-out-of-range", "Mixed-air reading outside the outdoor–return span",
     "the mixed-air reading below the lower or above the higher of outdoor and return by more "
     "than 3 combined standard uncertainties: a sensor fault or stratification"},
    {"high-limit-elsewhere", "Switching point away from the configured high-limit",
     "at least 4 samples (cooling needed, the other conditions clear) with the damper open "
     "above the configured limit, or at minimum below limit − deadband, by more than the "
     "condition's expanded uncertainty; hours are the samples on the wrong side of the configured "
     "limit or band (they "
     "overlap the first two findings)"},
    {"cooling-while-outdoor-air-would-do",
     "Mechanical cooling while outdoor air alone could meet the mixed-air target",
     "fan on, cooling logged running, and outdoor air at the damper's maximum would mix below "
     "the mixed-air target (supply setpoint − fan heat) by more than 3σ; energy is the cooling "
     "the model puts on the observed damper position"},
    {"minimum-outdoor-air-while-cooling",
     "Economizer at minimum while cooling runs and the high-limit allows it",
     "fan on, cooling logged running, the high-limit clearly allows the economizer, the model "
     "opens the damper at least 10 % points above the minimum, and the damper stays within "
     "5 % points of the minimum (such samples do not move the switching point)"},
    {"supply-air-off-setpoint", "Supply air persistently off its setpoint",
     "fan on, cooling logged running (without a cooling column: the model needs cooling), and "
     "the supply reading off the unit's supply setpoint by more than the supply tolerance + "
     "3σ_supply; persistent means more samples and hours than the significance minimum"},
    {"fan-heat-unlike-the-unit", "Supply minus mixed air unlike the unit's fan heat",
     "fan on, the coil idle (cooling logged off, or the model needs none; mixed air not below "
     "the target by more than 3σ_mix, so no heating), and supply − mixed differs from the "
     "unit's fan heat by more than 0.5 K + 3·√(σ_supply² + σ_mix²)"},
};

}  // namespace

double limit_uncertainty(const highlimit::Condition& c, const Accuracy& a) {
  const bool differential = c.reference == highlimit::Reference::return_air;
  const double t =
      kCoverageFactor * (differential ? std::hypot(a.outdoor_k, a.return_k) : a.outdoor_k);
  switch (c.quantity) {
    // dh/dt at constant W is c_p of moist air, 1.006 + 1.86·W kJ/(kg·K) (ASHRAE Fundamentals
    // ch. 1 eq. 32), taken at W = 0.010 as an air handler's usual humidity.
    case highlimit::Quantity::enthalpy:
      return std::hypot((1.006 + 1.86 * 0.010) * t, kEnthalpyHumidityPartKjPerKg);
    case highlimit::Quantity::humidity_ratio: return kHumidityRatioUncertainty;
    default: return t;
  }
}

std::string_view finding_key(FindingKind k) { return kKinds[static_cast<std::size_t>(k)].key; }
std::string_view finding_title(FindingKind k) { return kKinds[static_cast<std::size_t>(k)].title; }
std::string_view finding_rule(FindingKind k) { return kKinds[static_cast<std::size_t>(k)].rule; }

std::optional<MeasuredFraction> measured_fraction(double t_o, double t_r, double t_m,
                                                  const Accuracy& a) {
  const double d = t_o - t_r;
  const double gate =
      kFractionGateFactor *
      std::sqrt(a.outdoor_k * a.outdoor_k + a.return_k * a.return_k + a.mixed_k * a.mixed_k);
  if (std::abs(d) < gate || d == 0.0) return std::nullopt;
  const double x = (t_m - t_r) / d;
  // ∂x/∂t_m = 1/d, ∂x/∂t_o = −x/d, ∂x/∂t_r = (x − 1)/d.
  const double var = (a.mixed_k * a.mixed_k + x * x * a.outdoor_k * a.outdoor_k +
                      (1 - x) * (1 - x) * a.return_k * a.return_k) /
                     (d * d);
  return MeasuredFraction{x, std::sqrt(var)};
}

const Finding* Result::find(FindingKind k) const {
  for (const auto& f : findings)
    if (f.kind == k) return &f;
  return nullptr;
}

namespace {

// What the report should know about what the log lacks, and what the audit assumed instead.
std::vector<std::string> log_notes(const SampleContext& c) {
  const trend::TrendLog& log = *c.log;
  const auto& s = c.options->strategy;
  std::vector<std::string> notes;
  bool differential = false;
  for (const auto& cond : s.conditions)
    differential = differential || cond.reference == highlimit::Reference::return_air;
  if (!c.outdoor_humidity)
    notes.push_back(
        "no outdoor humidity in the log: the energy model takes the outdoor air at "
        "the return air's humidity ratio");
  if (!log.has(Channel::return_dry_bulb))
    notes.push_back(
        "no return dry-bulb in the log: decisions and energy use the unit file's "
        "design return air, and no outdoor-air fraction can be measured");
  else if (!log.has(Channel::return_rh) && !log.has(Channel::return_dew_point))
    notes.push_back(
        "no return humidity in the log: the return air takes the unit file's "
        "design humidity ratio");
  if (differential && !log.has(Channel::return_dry_bulb))
    notes.push_back(
        "differential strategy judged against the design return air, not a "
        "measured one");
  if (!log.has(Channel::fan))
    notes.push_back("no supply-fan status in the log: every sample is taken as fan on");
  if (!log.has(Channel::damper))
    notes.push_back("no damper column: economizing is judged from the measured fraction");
  if (!log.has(Channel::mixed_air))
    notes.push_back("no mixed-air temperature: no outdoor-air fraction can be measured");
  return notes;
}

}  // namespace

SampleContext sample_context(const UnitFile& unit, const trend::TrendLog& log,
                             const Options& options) {
  const auto& s = options.strategy;
  SampleContext c;
  c.unit = &unit;
  c.log = &log;
  c.options = &options;
  c.pressure_kpa = unit.site.design_pressure_kpa();
  c.dry_air_kg_per_s = unit.air_handler.dry_air_mass_flow_kg_per_s();
  c.coil = airside::coil_limits(unit.air_handler, c.pressure_kpa);
  if (!log.has(Channel::outdoor_dry_bulb))
    throw InputError(
        fmt::format("{}: no outdoor dry-bulb column; the audit needs one (set it "
                    "with --column outdoor-dry-bulb=HEADER[:UNIT])",
                    log.path));
  c.outdoor_humidity = log.has(Channel::outdoor_rh) || log.has(Channel::outdoor_dew_point);
  c.needs_outdoor_humidity = s.needs(highlimit::Quantity::enthalpy) ||
                             s.needs(highlimit::Quantity::dew_point) ||
                             s.needs(highlimit::Quantity::humidity_ratio);
  if (c.needs_outdoor_humidity && !c.outdoor_humidity)
    throw InputError(
        fmt::format("{}: strategy {} needs the outdoor humidity, and the log has "
                    "no outdoor RH or dew-point column",
                    log.path, echo(s.name)));
  c.design_return = unit.return_air.at(c.pressure_kpa);
  return c;
}

namespace {

// Humidity ratio of a logged point from its RH or dew point (capped at saturation), or
// `fallback` when the log has neither for it; none then when `fallback` is negative.
std::optional<double> logged_humidity_ratio(const trend::Sample& smp, const char* point, double t,
                                            Channel rh_ch, Channel dp_ch, double fallback,
                                            double p) {
  double w = fallback;
  if (auto rh = smp[rh_ch]) {
    w = psychro::humidity_ratio_from_relative_humidity(t, *rh, p);
  } else if (auto dp = smp[dp_ch]) {
    if (*dp > t + 0.05)
      throw InputError(fmt::format("{} dew point {:.1f} °C above the {} dry-bulb {:.1f} °C", point,
                                   *dp, point, t));
    w = psychro::humidity_ratio_from_dew_point(*dp, p);
  } else if (fallback < 0) {
    return std::nullopt;
  }
  return std::min(w, psychro::saturation_humidity_ratio(t, p));
}

// The high-limit's decision is clear when every condition's value lies farther than its
// expanded uncertainty from both edges of its band (limit, and limit − deadband): nearer,
// the controller's sensors may have read the other side, and the damper's state is no
// evidence of a fault.
bool decision_clear(const highlimit::Strategy& s, const highlimit::AirValues& out,
                    const highlimit::AirValues& ret, const Accuracy& a) {
  for (const auto& cond : s.conditions) {
    const double u = limit_uncertainty(cond, a);
    const double v = out[cond.quantity], limit = cond.effective_limit(ret);
    if (!(std::abs(v - limit) > u) || !(std::abs(v - (limit - cond.deadband)) > u)) return false;
  }
  return true;
}

// The rules on a fan-on sample, given the air and the strategy's decision on it.
void judge_operation(const SampleContext& c, const trend::Sample& smp, double w_s,
                     const airside::AirState& out, const airside::AirState& ret, bool enabled,
                     bool clear, SampleVerdict& v) {
  const auto& ah = c.unit->air_handler;
  const Accuracy& acc = c.options->accuracy;
  auto found = [&](FindingKind k, double excess, std::optional<double> energy_kwh) {
    v.findings[static_cast<std::size_t>(k)] = SampleFinding{excess, energy_kwh};
  };

  const airside::HourChoice choice =
      airside::choose(ah, {out, ret, c.coil, std::nullopt, std::nullopt}, c.unit->weights);
  const airside::Operation& expected = enabled ? choice.enabled : choice.disabled;
  const double x_min = ah.min_oa_fraction;

  // Mixed air against the range outdoor and return span.
  const auto t_o = smp[Channel::outdoor_dry_bulb];
  const auto t_r = smp[Channel::return_dry_bulb];
  const auto t_m = smp[Channel::mixed_air];
  bool mixed_bad = false;
  std::optional<MeasuredFraction> meas;
  if (t_m && t_r) {
    const bool out_low = *t_o < *t_r;
    const double lo = std::min(*t_o, *t_r), hi = std::max(*t_o, *t_r);
    const double s_lo = std::hypot(acc.mixed_k, out_low ? acc.outdoor_k : acc.return_k);
    const double s_hi = std::hypot(acc.mixed_k, out_low ? acc.return_k : acc.outdoor_k);
    const double excess =
        std::max(lo - *t_m - kCoverageFactor * s_lo, *t_m - hi - kCoverageFactor * s_hi);
    if (excess > 0) {
      mixed_bad = true;
      found(FindingKind::mixed_air_out_of_range, excess, std::nullopt);
    }
    if (!mixed_bad) {
      meas = measured_fraction(*t_o, *t_r, *t_m, acc);
      v.fraction_measured = meas.has_value();
    }
  }
  const auto damper = smp[Channel::damper];
  std::optional<bool> observed;
  if (damper)
    observed = *damper > x_min + kDamperMarginFraction;
  else if (meas)
    observed = meas->fraction > x_min + kDamperMarginFraction + kCoverageFactor * meas->sigma;

  // Energy of what happened against what should have: at the measured fraction when there
  // is one, else the commanded one.
  const double x_obs = meas     ? std::clamp(meas->fraction, 0.0, 1.0)
                       : damper ? std::clamp(*damper, x_min, ah.max_oa_fraction)
                                : expected.oa_fraction;
  const airside::CoilLoads loads = airside::coil_loads(ah, c.coil, airside::mix(out, ret, x_obs));
  const double e_obs = c.unit->weights.cooling * loads.cooling_kj_per_kg +
                       c.unit->weights.heating * loads.heating_kj_per_kg;
  const double kwh_per_kj_per_kg = c.dry_air_kg_per_s * w_s / 3600.0;
  const double impact = (e_obs - expected.weighted_kj_per_kg) * kwh_per_kj_per_kg;
  v.energy_kwh = impact;

  // Cooling as the log has it; without a cooling column, as the model expects it.
  const auto cooling_logged = smp[Channel::cooling];
  const bool cooling = cooling_logged ? *cooling_logged >= 0.5 : expected.mechanical_cooling;
  const bool model_opens = choice.enabled.oa_fraction > x_min + kShouldOpenMargin;
  const bool at_minimum = observed && !*observed;
  // Cooling running with the damper at minimum while it may open is the economizer yielding
  // to cooling: its own finding, and no evidence of where the high-limit switches.
  const bool yields_to_cooling =
      cooling_logged && cooling && at_minimum && enabled && clear && model_opens;

  if (observed && *observed && !enabled && clear)
    found(FindingKind::economizing_when_disabled, (damper ? *damper : x_obs) - x_min, impact);
  if (yields_to_cooling)
    found(FindingKind::minimum_while_cooling, choice.enabled.oa_fraction - x_obs, impact);
  else if (at_minimum && enabled && clear && model_opens)
    found(FindingKind::not_economizing_when_enabled, choice.enabled.oa_fraction - x_obs, impact);
  if (meas && damper) {
    const double dev = std::abs(meas->fraction - *damper) -
                       (kCoverageFactor * meas->sigma + kDamperTrackingMargin);
    if (dev > 0) found(FindingKind::damper_not_following, dev, impact);
  }
  if (meas) {
    const bool economizer_off = damper ? *damper <= x_min + kDamperMarginFraction : !enabled;
    const double band = kCoverageFactor * meas->sigma + kVentilationMargin;
    const double above = meas->fraction - (x_min + band);
    if (economizer_off && above > 0) found(FindingKind::excess_outdoor_air, above, impact);
    const double below = x_min - band - meas->fraction;
    if (below > 0) found(FindingKind::below_minimum, below, impact);
  }
  if (observed && choice.cooling_needed && model_opens && !yields_to_cooling)
    v.switch_open = *observed;

  // Outdoor air alone carries the load when it mixes below the target at the damper's
  // maximum, beyond the uncertainty of that mix.
  const double target = ah.mixed_air_target_c();
  if (cooling_logged && cooling) {
    const double x = ah.max_oa_fraction;
    const double t_mix_max = airside::mix(out, ret, x).dry_bulb_c;
    const double u = kCoverageFactor * std::hypot(x * acc.outdoor_k, (1 - x) * acc.return_k);
    if (target - t_mix_max > u)
      found(FindingKind::cooling_with_free_air, target - t_mix_max - u,
            loads.cooling_kj_per_kg * kwh_per_kj_per_kg);
  }
  const auto t_s = smp[Channel::supply_air];
  if (!t_s) return;
  if (cooling) {
    const double off = std::abs(*t_s - ah.supply_air_temp_c) -
                       (c.options->supply_tolerance_k + kCoverageFactor * acc.supply_k);
    if (off > 0) found(FindingKind::supply_off_setpoint, off, std::nullopt);
  } else if (t_m && !mixed_bad && *t_m >= target - kCoverageFactor * acc.mixed_k) {
    const double off = std::abs(*t_s - *t_m - ah.fan_heat_k) -
                       (kFanHeatMarginK + kCoverageFactor * std::hypot(acc.supply_k, acc.mixed_k));
    if (off > 0) found(FindingKind::fan_heat_mismatch, off, std::nullopt);
  }
}

}  // namespace

SampleVerdict judge_sample(const SampleContext& c, std::size_t i, highlimit::StrategyState& state) {
  const trend::TrendLog& log = *c.log;
  const double p = c.pressure_kpa;
  SampleVerdict v;
  const trend::Sample smp = log.sample(i);
  const auto t_o = smp[Channel::outdoor_dry_bulb];
  if (!t_o) return v;
  // Return air: logged when there, design otherwise.
  airside::AirState ret = c.design_return;
  const auto t_r = smp[Channel::return_dry_bulb];
  try {
    if (t_r)
      ret = airside::air_state(*t_r, *logged_humidity_ratio(smp, "return", *t_r, Channel::return_rh,
                                                            Channel::return_dew_point,
                                                            c.design_return.humidity_ratio, p));
    const auto w_found =
        logged_humidity_ratio(smp, "outdoor", *t_o, Channel::outdoor_rh, Channel::outdoor_dew_point,
                              c.needs_outdoor_humidity ? -1.0 : ret.humidity_ratio, p);
    if (!w_found) return v;
    double w_o = *w_found;
    w_o = std::min(w_o, psychro::saturation_humidity_ratio(*t_o, p));
    const airside::AirState out = airside::air_state(*t_o, w_o);
    auto values = [&](const airside::AirState& a) {
      return highlimit::air_values(a.dry_bulb_c, a.enthalpy_kj_per_kg,
                                   psychro::dew_point_from_humidity_ratio_c(a.humidity_ratio, p),
                                   a.humidity_ratio);
    };
    v.outdoor = values(out);
    v.ret = values(ret);
    // The deadband state follows every sample with readings, fan on or off, as a controller's.
    const bool enabled = highlimit::permits(c.options->strategy, v.outdoor, v.ret, state);
    const bool clear = decision_clear(c.options->strategy, v.outdoor, v.ret, c.options->accuracy);

    const auto fan = smp[Channel::fan];
    if (log.has(Channel::fan) && !fan) return v;
    if (fan && *fan < 0.5) {
      v.use = SampleUse::fan_off;
      return v;
    }
    v.use = SampleUse::operating;
    judge_operation(c, smp, log.weight_s(i), out, ret, enabled, clear, v);
  } catch (const RangeError& e) {
    throw InputError(fmt::format("{}:{}: {}", log.path, smp.line, e.what()));
  } catch (const InputError& e) {
    if (std::string_view(e.what()).starts_with(log.path)) throw;
    throw InputError(fmt::format("{}:{}: {}", log.path, smp.line, e.what()));
  }
  return v;
}

FindingsTally::FindingsTally(const SampleContext& c)
    : c_(&c), points_(c.options->strategy.conditions.size()) {
  for (std::size_t k = 0; k < kFindingKindCount; ++k)
    findings_[k].kind = static_cast<FindingKind>(k);
}

void FindingsTally::record(FindingKind k, std::size_t i, double excess,
                           std::optional<double> energy_kwh) {
  Finding& f = findings_[static_cast<std::size_t>(k)];
  const std::int64_t t = c_->log->time_s[i];
  const int line = c_->log->line[i];
  if (f.intervals == 0) {
    f.first_s = t, f.first_line = line;
    f.energy_kwh = 0.0;
  }
  if (f.intervals == 0 || excess > f.worst_excess)
    f.worst_excess = excess, f.worst_s = t, f.worst_line = line;
  ++f.intervals;
  f.hours += c_->log->weight_s(i) / 3600.0;
  f.last_s = t;
  if (!energy_kwh)
    f.energy_kwh.reset();
  else if (f.energy_kwh)
    *f.energy_kwh += *energy_kwh;
}

void FindingsTally::add(std::size_t i, const SampleVerdict& v) {
  if (v.use == SampleUse::incomplete) ++skipped_;
  if (v.use != SampleUse::operating) return;
  operating_hours_ += c_->log->weight_s(i) / 3600.0;
  ++operating_intervals_;
  if (v.fraction_measured) ++fraction_intervals_;
  for (std::size_t k = 0; k < kFindingKindCount; ++k)
    if (const auto& f = v.findings[k])
      record(static_cast<FindingKind>(k), i, f->excess, f->energy_kwh);
  if (!v.switch_open) return;
  // Evidence for one condition's switching point only where the other conditions are clear.
  const auto& s = c_->options->strategy;
  for (std::size_t c = 0; c < s.conditions.size(); ++c) {
    bool others_clear = true;
    for (std::size_t o = 0; o < s.conditions.size(); ++o)
      if (o != c && v.outdoor[s.conditions[o].quantity] > s.conditions[o].effective_limit(v.ret))
        others_clear = false;
    if (!others_clear) continue;
    const auto& cond = s.conditions[c];
    const double ref =
        cond.reference == highlimit::Reference::return_air ? v.ret[cond.quantity] : 0.0;
    points_[c].push_back({v.outdoor[cond.quantity] - ref, v.energy_kwh,
                          static_cast<std::uint32_t>(i), *v.switch_open});
  }
}

std::optional<SwitchPoint> FindingsTally::switch_point(const highlimit::Condition& cond, int index,
                                                       std::vector<Point> pts,
                                                       std::vector<Beyond>& beyond, double tol) {
  int n_open = 0;
  for (const auto& q : pts) n_open += q.open;
  const int n_closed = static_cast<int>(pts.size()) - n_open;
  if (n_open < kSwitchMinimumSamples || n_closed < kSwitchMinimumSamples) return std::nullopt;
  std::sort(pts.begin(), pts.end(), [](const Point& a, const Point& b) { return a.v < b.v; });
  // Split index k: pts[0..k) below. Errors = closed below + open above.
  int closed_below = 0, open_above = n_open, best = -1, best_err = 0;
  for (std::size_t k = 0; k <= pts.size(); ++k) {
    if (k > 0) (pts[k - 1].open ? open_above-- : closed_below++);
    if (k > 0 && k < pts.size() && pts[k].v == pts[k - 1].v) continue;
    const int err = closed_below + open_above;
    if (best < 0 || err < best_err) best = static_cast<int>(k), best_err = err;
  }
  // The estimate is the split that misclassifies fewest samples; the verdict rests on the
  // samples themselves: enough of them open above the limit, or closed below the band.
  double below_open = -1e300, above_closed = 1e300, hi_open = -1e300, lo_closed = 1e300;
  int open_beyond = 0, closed_beyond = 0;
  for (std::size_t k = 0; k < pts.size(); ++k) {
    if (pts[k].open)
      hi_open = std::max(hi_open, pts[k].v);
    else
      lo_closed = std::min(lo_closed, pts[k].v);
    if (static_cast<int>(k) < best && pts[k].open) below_open = std::max(below_open, pts[k].v);
    if (static_cast<int>(k) >= best && !pts[k].open)
      above_closed = std::min(above_closed, pts[k].v);
    open_beyond += pts[k].open && pts[k].v > cond.limit + tol;
    closed_beyond += !pts[k].open && pts[k].v < cond.limit - cond.deadband - tol;
  }
  const double estimate = below_open > -1e299 && above_closed < 1e299
                              ? (below_open + above_closed) / 2
                          : below_open > -1e299 ? below_open
                                                : above_closed;
  SwitchPoint sp{index,    cond.quantity, cond.reference, cond.limit, cond.deadband,
                 estimate, hi_open,       lo_closed,      n_open,     n_closed,
                 best_err, tol,           false};
  sp.differs = open_beyond >= kSwitchMinimumSamples || closed_beyond >= kSwitchMinimumSamples;
  if (sp.differs)
    for (const auto& q : pts) {
      const double by = q.open ? q.v - cond.limit : (cond.limit - cond.deadband) - q.v;
      if (by > 0) beyond.push_back({q.sample, by, q.energy_kwh});
    }
  return sp;
}

Result FindingsTally::finish() {
  const auto& s = c_->options->strategy;
  const trend::TrendLog& log = *c_->log;
  Result r;
  r.strategy_name = s.name;
  r.notes = log_notes(*c_);
  if (skipped_ > 0)
    r.notes.push_back(
        fmt::format("{} sample(s) without the readings a decision needs (outdoor "
                    "air, or fan status) were left out",
                    skipped_));
  r.operating_hours = operating_hours_;
  r.operating_intervals = operating_intervals_;
  r.fraction_intervals = fraction_intervals_;

  // Switching points, one condition at a time, where the others are clear and the
  // economizer, if enabled, would open the damper.
  // The wrong-side intervals of every differing condition, added afterwards in time order.
  std::vector<Beyond> hl_beyond;
  for (std::size_t c = 0; c < s.conditions.size(); ++c)
    if (auto sp =
            switch_point(s.conditions[c], static_cast<int>(c), std::move(points_[c]), hl_beyond,
                         limit_uncertainty(s.conditions[c], c_->options->accuracy)))
      r.switch_points.push_back(*sp);
  // In time order, a sample beyond two conditions once, by the farther.
  std::sort(hl_beyond.begin(), hl_beyond.end(),
            [](const Beyond& a, const Beyond& b) { return a.sample < b.sample; });
  for (std::size_t j = 0; j < hl_beyond.size();) {
    Beyond b = hl_beyond[j];
    for (++j; j < hl_beyond.size() && hl_beyond[j].sample == b.sample; ++j)
      b.beyond = std::max(b.beyond, hl_beyond[j].beyond);
    record(FindingKind::high_limit_elsewhere, b.sample, b.beyond, b.energy_kwh);
  }

  const Significance& sig = c_->options->significance;
  for (auto& f : findings_) {
    if (f.intervals == 0) continue;
    f.share_of_operating = r.operating_hours > 0 ? f.hours / r.operating_hours : 0.0;
    const bool significant = f.intervals > sig.min_samples && f.hours > sig.min_hours;
    (significant ? r.findings : r.below_significance).push_back(f);
  }
  if (!r.below_significance.empty()) {
    std::string seen;
    for (const auto& f : r.below_significance)
      seen += fmt::format("{}{} ({} sample(s), {:.2f} h)", seen.empty() ? "" : "; ",
                          finding_key(f.kind), f.intervals, f.hours);
    r.notes.push_back(
        fmt::format("seen in too few samples or hours to report (a finding needs more than {} "
                    "sample(s) and more than {:.2f} h): {}",
                    sig.min_samples, sig.min_hours, seen));
  }
  for (std::size_t i = 0; i < log.size(); ++i) r.covered_hours += log.weight_s(i) / 3600.0;
  return r;
}

Result run(const UnitFile& unit, const trend::TrendLog& log, const Options& options) {
  const SampleContext c = sample_context(unit, log, options);
  FindingsTally tally(c);
  highlimit::StrategyState state(options.strategy);
  for (std::size_t i = 0; i < log.size(); ++i) tally.add(i, judge_sample(c, i, state));
  return tally.finish();
}

}  // namespace limitline::audit
