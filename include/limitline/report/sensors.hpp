#pragma once
// The sensor-error report: distributions over trials, pairwise chances, break-even humidity
// accuracy and the bias sweep, in text and JSON, and the per-trial CSV. Formatting only:
// every number comes from the sensors library.
#include <limitline/report/year.hpp>
#include <limitline/analysis/sensors.hpp>

#include <ostream>
#include <string>

namespace limitline::report {

struct SensorsReport {
  const YearContext* context = nullptr;  // header lines and strategy descriptions
  const sensors::StudyResult* study = nullptr;
  const sensors::BreakEvenResult* break_even = nullptr;  // may be null (not asked for)
  const sensors::SweepResult* sweep = nullptr;           // may be null
  bool uses_humidity = false;                            // some strategy reads a humidity sensor
  std::string interrupted_note;                          // non-empty when Ctrl-C stopped the work
};

std::string sensors_text(const SensorsReport& r);
std::string sensors_json(const SensorsReport& r);

// One row per finished trial and strategy: the trial's biases, clamped readings and the
// strategy's year (RFC 4180).
void write_trials_csv(std::ostream& out, const sensors::StudyResult& study, units::System s);

// "±1.0 °F", "±5.0%", "±1.00 Btu/lb" (an accuracy) and "+2.0 °F" (a bias) for display.
std::string format_accuracy(sensors::Sensor s, sensors::HumidityKind k, double si, units::System u);
std::string format_bias(sensors::Sensor s, sensors::HumidityKind k, double si, units::System u);

}  // namespace limitline::report
