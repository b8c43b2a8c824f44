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

using tuning::kCodeSetting;
using tuning::kDefaultSetting;
using tuning::kUnitSetting;
using tuning::StrategyTuning;
using tuning::TuneResult;

TuneResult run_tune(const YearInputs& in, const annual::Prepared& prepared,
                    const TuneOptions& options);

// One site of `tune --batch`: its tuning, or the one-line error that stopped it.
struct TuneSite {
  std::string weather_path;
  bool run = false;  // false: cancelled before it started
  bool ok = false;
  std::string error;
  TuneResult result;
  double perfect_savings = 0;  // the site's perfect changeover savings (tie tolerance)
};

// Every *.csv weather file of `dir` tuned with the unit of `base`, sites in parallel on
// `threads` threads (each site's points on one). Results in file order.
std::vector<TuneSite> run_tune_batch(const YearInputs& base, const std::string& dir,
                                     const WeatherOverrides& overrides, const TuneOptions& options,
                                     unsigned threads);

}  // namespace limitline
