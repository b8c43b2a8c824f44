#include <limitline/analysis/audit_timeline.hpp>

namespace limitline::audit {

Timeline timeline(const UnitFile& unit, const trend::TrendLog& log, const Options& options) {
  const SampleContext c = sample_context(unit, log, options);
  Timeline t;
  t.damper_from_signal = log.has(trend::Channel::damper);
  t.min_oa_fraction = unit.air_handler.min_oa_fraction;
  t.samples.reserve(log.size());
  highlimit::StrategyState state(options.strategy);
  for (std::size_t i = 0; i < log.size(); ++i) {
    const SampleVerdict v = judge_sample(c, i, state);
    TimelineSample s;
    s.time_s = log.time_s[i];
    s.use = v.use;
    s.outdoor_c = log.value(trend::Channel::outdoor_dry_bulb, i);
    if (t.damper_from_signal) {
      s.damper = log.value(trend::Channel::damper, i);
    } else {
      const auto o = log.value(trend::Channel::outdoor_dry_bulb, i);
      const auto r = log.value(trend::Channel::return_dry_bulb, i);
      const auto m = log.value(trend::Channel::mixed_air, i);
      if (o && r && m)
        if (const auto f = measured_fraction(*o, *r, *m, options.accuracy)) s.damper = f->fraction;
    }
    for (std::size_t k = 0; k < kFindingKindCount; ++k)
      if (v.findings[k]) s.kinds |= static_cast<std::uint16_t>(1u << k);
    t.samples.push_back(s);
  }
  return t;
}

}  // namespace limitline::audit
