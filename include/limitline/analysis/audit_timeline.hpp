#pragma once
// The audit sample by sample, as a picture of the log needs it: when, the outdoor dry-bulb, the
// damper's position and the rules each sample breaks. The same judgement as audit::run (one
// judge_sample per sample, the deadband carried between them), kept per sample instead of
// tallied.
#include <limitline/analysis/audit.hpp>

#include <cstdint>
#include <vector>

namespace limitline::audit {

struct TimelineSample {
  std::int64_t time_s = 0;
  std::optional<double> outdoor_c;  // outdoor dry-bulb, °C
  std::optional<double> damper;     // outdoor-air fraction 0–1: the signal, else the measured
  std::uint16_t kinds = 0;          // bit k: the sample breaks FindingKind k
  SampleUse use = SampleUse::incomplete;
  [[nodiscard]] bool breaks(FindingKind k) const {
    return (kinds >> static_cast<unsigned>(k)) & 1u;
  }
};
static_assert(kFindingKindCount <= 16);

struct Timeline {
  bool damper_from_signal = false;  // false: the measured fraction where it passed the gate
  double min_oa_fraction = 0;       // the unit's ventilation minimum
  std::vector<TimelineSample> samples;
};

// Throws InputError as run() does.
[[nodiscard]] Timeline timeline(const UnitFile& unit, const trend::TrendLog& log,
                                const Options& options);

}  // namespace limitline::audit
