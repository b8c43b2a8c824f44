#pragma once
// `limitline tune`: every strategy of a unit swept over its practical setpoints on the year
// prepared once, with the settings a designer weighs beside the grid (the unit file's own,
// the common-practice default, the energy code's required value) and what the code says of
// each.
#include <limitline/analysis/tuning.hpp>
#include <limitline/app/year_job.hpp>

#include <atomic>
#include <optional>
#include <string>
#include <vector>

namespace limitline {

struct TuneOptions {
  units::System units = units::System::ip;  // the grids are round numbers of this system
  CodeSelection code;                       // as for the compliance column of `year`
  unsigned threads = 0;
  const std::atomic<bool>* cancel = nullptr;
};

struct StrategyTuning {
  highlimit::Strategy strategy;  // as the unit file (or the preset defaults) gives it
  tuning::Curve curve;
  // What the code says of this control type in the unit's zone, one sentence; empty without a
  // code.
  std::string code_note;
  // The compliance word of the best setting, and of each extra (same order); empty without
  // a code.
  std::string best_verdict;
  std::vector<std::string> extra_verdicts;
  bool code_allows = false;               // the control type is allowed in the zone
  std::optional<std::size_t> code_extra;  // index of the "code" extra, when there is one
};

struct TuneResult {
  std::vector<StrategyTuning> strategies;  // in the unit file's order
  std::string code_label;                  // "ANSI/ASHRAE/IES Standard 90.1-2019, climate zone 4A"
  bool partial = false;                    // interrupted: the strategies that finished
};

// Labels of the extras, as reports print them.
inline constexpr std::string_view kUnitSetting = "unit file";
inline constexpr std::string_view kDefaultSetting = "common practice";
inline constexpr std::string_view kCodeSetting = "code";

TuneResult run_tune(const YearInputs& in, const annual::Prepared& prepared,
                    const TuneOptions& options);

}  // namespace limitline
