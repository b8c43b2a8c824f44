#pragma once
// Auditing a trend log against the unit file: what the economizer did, interval by interval,
// against what its high-limit says it should have done, with the energy the model puts on
// each difference. Physics and rules only; the report layer formats the result.
//
// Rules (each a named constant below, so the report can state them):
//  - The damper is "economizing" when its signal is above the minimum by kDamperMarginFraction
//    (or, with no damper column, when the measured fraction is above it by that margin plus
//    three standard uncertainties).
//  - The measured outdoor-air fraction x = (t_m − t_r)/(t_o − t_r) is used only where
//    |t_o − t_r| ≥ kFractionGateFactor · √(σ_o² + σ_r² + σ_m²); its standard uncertainty is
//    first-order: σ_x² = (σ_m² + x²·σ_o² + (1 − x)²·σ_r²)/(t_o − t_r)².
//  - A reading beyond a limit counts only when it is beyond it by three standard
//    uncertainties plus the margin the rule names.
//  - The damper is judged against the high-limit's decision only where that decision is
//    clear: every condition's value farther than its uncertainty (limit_uncertainty) from
//    both edges of its band, so a sample at the limit is no finding.
//  - A finding is reported only with more than Significance::min_samples samples and more
//    than Significance::min_hours hours; smaller ones are named in the notes.
#include <limitline/model/airside.hpp>
#include <limitline/model/highlimit.hpp>
#include <limitline/io/trend.hpp>
#include <limitline/io/unit_file.hpp>

#include <array>
#include <cstdint>
#include <optional>
#include <string>
#include <vector>

namespace limitline::audit {

inline constexpr double kDamperMarginFraction = 0.05;  // 5 % points above the minimum
inline constexpr double kFractionGateFactor = 4.0;
inline constexpr double kCoverageFactor = 3.0;         // standard uncertainties
inline constexpr double kDamperTrackingMargin = 0.15;  // measured vs commanded fraction
inline constexpr double kVentilationMargin = 0.05;     // fraction above/below the minimum
inline constexpr double kShouldOpenMargin = 0.10;      // model opens the damper by at least
// The humidity sensor's share of an enthalpy reading's uncertainty, which the stated
// temperature accuracies leave out: about 5 % RH at 24 °C, 0.47 kJ/kg per % RH from the
// saturation humidity ratio there (ASHRAE Fundamentals ch. 1 eq. 23, table 2), so 2.3 kJ/kg
// (about 1 Btu/lb). The same for a humidity-ratio limit: 0.0005 kg/kg (common practice).
inline constexpr double kEnthalpyHumidityPartKjPerKg = 2.3;
inline constexpr double kHumidityRatioUncertainty = 0.0005;
inline constexpr int kSwitchMinimumSamples = 4;  // each side of the switching point
// Supply air off its setpoint by more than this, beyond its sensor's uncertainty (common
// practice: a discharge loop holds about ±2 °F). Default of Options::supply_tolerance_k.
inline constexpr double kSupplyToleranceK = 1.0;
// Supply − mixed air with the coil idle may differ from the unit's fan heat by this, beyond
// the two sensors' combined uncertainty (duct gains and stratification, common practice).
inline constexpr double kFanHeatMarginK = 0.5;

// Stated accuracies of the temperature sensors, read as one standard uncertainty, K.
// Defaults: ±0.5 K, a common-practice figure for air-temperature sensors in a duct.
struct Accuracy {
  double outdoor_k = 0.5;
  double return_k = 0.5;
  double mixed_k = 0.5;
  double supply_k = 0.5;
};

// What a finding needs to be reported: more samples and more hours than these (defaults:
// 2 samples, 0.5 h, so a lone sample or two of noise is never a finding).
struct Significance {
  int min_samples = 2;
  double min_hours = 0.5;
};

// The expanded uncertainty of a condition's value against its limit: kCoverageFactor × the
// root-sum-square of the sensors it reads (outdoor; and return for a differential one), in
// the condition's quantity (an enthalpy adds kEnthalpyHumidityPartKjPerKg in quadrature; a
// humidity ratio is kHumidityRatioUncertainty). A dew point is read with the dry-bulb
// accuracies, as the log gives no dew-point sensor's.
[[nodiscard]] double limit_uncertainty(const highlimit::Condition& c, const Accuracy& a);

struct MeasuredFraction {
  double fraction;
  double sigma;
};
// The measured fraction and its first-order uncertainty, or none when |t_o − t_r| is below the
// gate. Temperatures °C.
[[nodiscard]] std::optional<MeasuredFraction> measured_fraction(double t_outdoor, double t_return,
                                                                double t_mixed, const Accuracy& a);

enum class FindingKind : std::uint8_t {
  economizing_when_disabled,     // strategy says off, damper open
  not_economizing_when_enabled,  // strategy says on and the model opens, damper at minimum
  damper_not_following,          // measured fraction far from the commanded one
  excess_outdoor_air,            // economizer off, measured fraction above the minimum
  below_minimum,                 // measured fraction below the ventilation minimum
  mixed_air_out_of_range,        // mixed air outside [min(t_o, t_r), max(t_o, t_r)]
  high_limit_elsewhere,          // switching point in the log ≠ the configured limit
  cooling_with_free_air,         // cooling on while outdoor air alone meets the target
  minimum_while_cooling,         // cooling on, damper at minimum, high-limit allows it
  supply_off_setpoint,           // supply air off its setpoint while the coil should hold it
  fan_heat_mismatch,             // supply − mixed with the coil idle ≠ the unit's fan heat
};
inline constexpr std::size_t kFindingKindCount = 11;
[[nodiscard]] std::string_view finding_key(FindingKind k);    // "economizing-when-disabled", ...
[[nodiscard]] std::string_view finding_title(FindingKind k);  // one line, for reports
[[nodiscard]] std::string_view finding_rule(FindingKind k);   // the rule, one sentence

struct Finding {
  FindingKind kind;
  int intervals = 0;
  double hours = 0;
  double share_of_operating = 0;  // hours / fan-on hours
  std::int64_t first_s = 0, last_s = 0, worst_s = 0;
  double worst_excess = 0;  // how far beyond the rule at the worst interval (rule's units)
  int first_line = 0, worst_line = 0;
  // Σ (E at the observed fraction − E of the expected operation)·ṁ·Δt, kWh; none where the
  // model cannot say (a mixed-air reading that is itself suspect).
  std::optional<double> energy_kwh;
};

// The switching point of one fixed or differential condition, from the log.
struct SwitchPoint {
  int condition;  // index in the strategy
  highlimit::Quantity quantity;
  highlimit::Reference reference;
  double configured;  // limit (fixed) or offset (return), SI
  double deadband;
  double estimate;       // SI: the split that misclassifies the fewest samples
  double highest_open;   // highest value with the damper open
  double lowest_closed;  // lowest value with the damper at minimum
  int open_samples, closed_samples, misclassified;
  double tolerance;  // limit_uncertainty of the condition
  // At least kSwitchMinimumSamples open above limit + tolerance, or closed below limit −
  // deadband − tolerance; otherwise the switching point is consistent with the configured
  // limit. (The estimate is not required beyond the band: in a log whose limit changed part
  // way, the split follows the longer setting.)
  bool differs;
};

struct Options {
  highlimit::Strategy strategy;
  Accuracy accuracy;
  Significance significance;
  double supply_tolerance_k = kSupplyToleranceK;
};

struct Result {
  std::string strategy_name;
  double operating_hours = 0;  // fan-on weight
  double covered_hours = 0;
  int operating_intervals = 0;
  int fraction_intervals = 0;               // where the measured fraction passed the gate
  std::vector<Finding> findings;            // significant kinds, in FindingKind order
  std::vector<Finding> below_significance;  // kinds seen, too few samples or hours
  std::vector<SwitchPoint> switch_points;
  std::vector<std::string>
      notes;  // assumptions taken (no fan column, return air from the unit file)
  [[nodiscard]] const Finding* find(FindingKind k) const;
};

// Throws InputError when the log lacks what the strategy needs (an outdoor humidity for an
// enthalpy or dew-point limit, a return reading for a differential one) or has no outdoor
// dry-bulb. The same as judging every sample with judge_sample() and adding each verdict to a
// FindingsTally.
[[nodiscard]] Result run(const UnitFile& unit, const trend::TrendLog& log, const Options& options);

// --- The audit in its two steps: one sample judged alone, then the verdicts tallied --------

// What judging any one sample of a log needs, derived once from the unit, log and options.
// The unit, log and options must outlive it.
struct SampleContext {
  const UnitFile* unit = nullptr;
  const trend::TrendLog* log = nullptr;
  const Options* options = nullptr;
  double pressure_kpa = 0;      // the site's design pressure
  double dry_air_kg_per_s = 0;  // at the supply airflow
  airside::CoilLimits coil{};
  airside::AirState design_return{};    // the unit file's return air, where the log has none
  bool outdoor_humidity = false;        // the log has an outdoor RH or dew point
  bool needs_outdoor_humidity = false;  // the strategy reads one
};
// Throws InputError as run() does when the log cannot be audited against the strategy.
[[nodiscard]] SampleContext sample_context(const UnitFile& unit, const trend::TrendLog& log,
                                           const Options& options);

// How a sample counts: without the readings a decision needs it is left out (and said so);
// with the fan off it is judged by nothing.
enum class SampleUse : std::uint8_t { incomplete, fan_off, operating };

// One rule broken in one sample: by how much (the rule's units, as Finding::worst_excess),
// and the energy of what happened against what should have, kWh (none where the model cannot
// say).
struct SampleFinding {
  double excess = 0;
  std::optional<double> energy_kwh;
};

struct SampleVerdict {
  SampleUse use = SampleUse::incomplete;
  bool fraction_measured = false;  // the measured outdoor-air fraction passed the gate
  // The rules the sample breaks, by FindingKind. high_limit_elsewhere is never set here: it
  // needs the switching points of the whole log (FindingsTally::finish).
  std::array<std::optional<SampleFinding>, kFindingKindCount> findings{};
  // Evidence of where the switching points lie: set, to whether the damper was open, when
  // cooling is needed, the model would open the damper and the damper's state is known.
  std::optional<bool> switch_open;
  double energy_kwh = 0;                  // what happened against the expected operation, kWh
  highlimit::AirValues outdoor{}, ret{};  // the values the strategy judged
  const std::optional<SampleFinding>& operator[](FindingKind k) const {
    return findings[static_cast<std::size_t>(k)];
  }
};

// Judges sample i of the context's log: the strategy's decision on its readings (advancing
// the deadband `state`, which carries from one sample to the next as in the controller), the
// measured fraction, and every rule of the header comment. Throws InputError naming
// FILE:LINE for a reading the psychrometrics refuse.
[[nodiscard]] SampleVerdict judge_sample(const SampleContext& c, std::size_t i,
                                         highlimit::StrategyState& state);

// The findings of a log, built up one verdict at a time in the log's order.
class FindingsTally {
 public:
  explicit FindingsTally(const SampleContext& c);
  void add(std::size_t i, const SampleVerdict& v);
  // The result: the findings with their shares of the operating time, the switching points
  // and the high-limit finding they give, coverage and notes. Call once, after the last
  // sample: it hands over the evidence it kept.
  Result finish();

 private:
  // A fan-on sample that tells where one condition's switching point lies; kept per
  // condition until finish(). 24 bytes, as a long log has many.
  struct Point {
    double v;  // the condition's quantity, less the return air's for a differential one
    double energy_kwh;
    std::uint32_t sample;  // a log within the reader's 1 GiB cap has fewer rows than 2^32
    bool open;
  };
  // A sample on the wrong side of a differing condition, for the high-limit finding.
  struct Beyond {
    std::size_t sample;
    double beyond;
    double energy_kwh;
  };
  void record(FindingKind k, std::size_t i, double excess, std::optional<double> energy_kwh);
  // The switching point of condition `index` from its evidence (none when there is too
  // little), adding the samples beyond it when it differs from the configured one.
  [[nodiscard]] static std::optional<SwitchPoint> switch_point(const highlimit::Condition& cond,
                                                               int index, std::vector<Point> points,
                                                               std::vector<Beyond>& beyond,
                                                               double tolerance);

  const SampleContext* c_;
  std::array<Finding, kFindingKindCount> findings_{};
  std::vector<std::vector<Point>> points_;  // per condition
  double operating_hours_ = 0;
  int operating_intervals_ = 0, fraction_intervals_ = 0, skipped_ = 0;
};

}  // namespace limitline::audit
