#pragma once
// Sensor-error study (docs/model.md §Sensor errors): how each high-limit strategy fares when its
// decisions are made on sensor readings instead of the true air.
//
// Four sensors feed a high-limit: outdoor dry-bulb, outdoor humidity (a relative-humidity, a
// dew-point or an enthalpy sensor), return dry-bulb and return relative humidity. A reading
// is the truth plus a persistent bias (drift) drawn once per trial from the sensor's stated
// accuracy. Decisions use the readings, with humidity ratio, enthalpy and dew point derived
// from the biased dry-bulb and biased humidity reading at the interval's true pressure; the
// energy of each decision is always that of the true state (annual::Prepared).
//
// Trials are independent: each one's random numbers come from (seed, trial index) alone, so
// the results are the same for a seed whatever the number of threads.
#include <limitline/analysis/annual.hpp>
#include <limitline/model/highlimit.hpp>
#include <limitline/model/units.hpp>

#include <limitline/io/raw_table.hpp>

#include <array>
#include <atomic>
#include <cstdint>
#include <functional>
#include <memory>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

namespace limitline::sensors {

enum class Sensor : std::uint8_t { outdoor_dry_bulb, outdoor_humidity, return_dry_bulb, return_rh };
inline constexpr std::size_t kSensorCount = 4;
inline constexpr std::array<Sensor, kSensorCount> kSensors = {
    Sensor::outdoor_dry_bulb, Sensor::outdoor_humidity, Sensor::return_dry_bulb, Sensor::return_rh};

// What the outdoor humidity sensor measures.
enum class HumidityKind : std::uint8_t { relative_humidity, dew_point, enthalpy };

// How a trial's bias is drawn from a sensor's accuracy a: uniform on [−a, a), or normal with
// standard deviation a.
enum class BiasDistribution : std::uint8_t { uniform, normal };

[[nodiscard]] std::string_view humidity_kind_name(HumidityKind k);  // "rh", "dew-point", "enthalpy"
[[nodiscard]] std::string_view distribution_name(BiasDistribution d);  // "uniform", "normal"

// Key of a sensor in the [sensors] table and in --sweep ("outdoor_dry_bulb", "outdoor_rh",
// "outdoor_dew_point", "outdoor_enthalpy", "return_dry_bulb", "return_rh").
[[nodiscard]] std::string_view sensor_key(Sensor s, HumidityKind outdoor_kind);
// Words for reports ("outdoor dry-bulb", "outdoor RH", "return RH").
[[nodiscard]] std::string_view sensor_label(Sensor s, HumidityKind outdoor_kind);
// The kind of a sensor's bias and accuracy: a temperature difference, a percentage (RH) or an
// enthalpy difference.
[[nodiscard]] units::Kind bias_kind(Sensor s, HumidityKind outdoor_kind);

// Biases (or accuracies) of the four sensors, SI: K, fraction / K / kJ/kg, K, fraction.
using Biases = std::array<double, kSensorCount>;
inline double& at(Biases& b, Sensor s) { return b[static_cast<std::size_t>(s)]; }
[[nodiscard]] inline double at(const Biases& b, Sensor s) { return b[static_cast<std::size_t>(s)]; }

struct SensorSet {
  HumidityKind outdoor_humidity = HumidityKind::relative_humidity;
  BiasDistribution distribution = BiasDistribution::uniform;
  Biases accuracy{};                       // uniform: half-width; normal: σ
  std::array<bool, kSensorCount> given{};  // accuracy written in the unit file
  bool from_file = false;                  // the unit file has a [sensors] table
  // Accuracies outside their plausible band, used as written ("FILE:LINE: sensors.KEY: ...").
  std::vector<std::string> warnings;
};

// Typical commercial figures (common practice): dry-bulb ±1 °F, RH ±5 % (an RH transmitter a
// few years into service; new ones are about ±2–3 %), dew point ±2 °F, enthalpy ±1 Btu/lb.
[[nodiscard]] double typical_accuracy(Sensor s, HumidityKind outdoor_kind);
[[nodiscard]] SensorSet typical_sensors(
    HumidityKind outdoor_kind = HumidityKind::relative_humidity);

// The largest accuracy (and bias) accepted for a sensor: beyond it the device is broken, not
// inaccurate (10 K, 30 %, 10 K dew point, 20 kJ/kg).
[[nodiscard]] double max_accuracy(Sensor s, HumidityKind outdoor_kind);

// Reads the unit file's [sensors] table (nullptr: typical sensors). Keys: outdoor_dry_bulb,
// outdoor_humidity_kind = "rh" | "dew-point" | "enthalpy", one of outdoor_rh /
// outdoor_dew_point / outdoor_enthalpy (it also sets the kind), return_dry_bulb, return_rh,
// distribution = "uniform" | "normal". Bare numbers are in `bare` units. Errors are
// InputErrors "FILE:LINE: sensors.KEY: ...".
[[nodiscard]] SensorSet read_sensors(const RawTable* table, std::string_view file_name,
                                     units::System bare);

// --- Random draws -------------------------------------------------------------------------

// The standardised draws of one trial, one per sensor: uniform on [−1, 1) or standard normal.
// They depend only on (seed, trial, distribution), never on the accuracies, so studies at
// different accuracies share their random numbers.
[[nodiscard]] Biases standard_draws(std::uint64_t seed, std::uint64_t trial, BiasDistribution d);
// accuracy × standard draw, per sensor.
[[nodiscard]] Biases draw_biases(const SensorSet& s, std::uint64_t seed, std::uint64_t trial);

// --- Readings -----------------------------------------------------------------------------

// What the controller sees of one air stream, and whether the humidity reading had to be
// clamped to something moist air can be (RH to 0–100 %, a dew point to the dry-bulb reading,
// a derived humidity ratio to 0–saturation). Never NaN.
struct Reading {
  highlimit::AirValues values;
  bool clamped = false;
};

// The derived reading from a dry-bulb reading and a humidity reading of `kind` (RH as a
// fraction, dew point °C, enthalpy kJ/kg) at the true pressure. Dew point only when
// `with_dew_point` (it costs a root solve); otherwise it is left 0.
[[nodiscard]] Reading derive_reading(double dry_bulb_c, HumidityKind kind, double humidity_reading,
                                     double pressure_kpa, bool with_dew_point);

// --- The engine: one trial over the prepared year ----------------------------------------

// One strategy's year in one trial (the energy is that of the true state).
struct TrialOutcome {
  double energy_kwh = 0;
  double shortfall_kwh = 0;  // energy − that of the perfect changeover
  double enabled_hours = 0;
  double harmful_hours = 0;
  double harmful_kwh = 0;
  double missed_hours = 0;
  double missed_kwh = 0;
};

// Readings clamped in a trial: one count per fan-on interval whose reading was clamped.
struct Clamps {
  std::uint32_t outdoor = 0;
  std::uint32_t ret = 0;
};

class Engine {
 public:
  // The prepared year must have dew points (annual::PrepareOptions::compute_dew_point).
  Engine(const annual::Prepared& prepared, std::span<const highlimit::Strategy> strategies,
         HumidityKind outdoor_kind);

  // The same truth with only some of the strategies (indices into strategies()).
  [[nodiscard]] Engine subset(std::span<const std::size_t> indices) const;

  [[nodiscard]] const std::vector<highlimit::Strategy>& strategies() const { return strategies_; }
  [[nodiscard]] HumidityKind outdoor_kind() const { return kind_; }
  [[nodiscard]] std::size_t intervals() const;
  [[nodiscard]] double perfect_energy_kwh() const;        // the perfect changeover, true state
  [[nodiscard]] double no_economizer_energy_kwh() const;  // always at the minimum
  [[nodiscard]] bool uses_humidity() const {
    return need_.outdoor_humidity || need_.return_humidity;
  }

  // Per-thread scratch (deadband state and monthly sums): made once, reused every trial, so
  // the hour loop never allocates.
  struct Workspace {
    std::vector<highlimit::StrategyState> state;
    std::vector<TrialOutcome> monthly;  // strategy × 12
  };
  [[nodiscard]] Workspace workspace() const;

  // One trial with the given biases. `out` has one element per strategy. When `decisions` is
  // not empty it receives, per interval and strategy (interval-major), 1 enabled, 0 disabled.
  void run(const Biases& biases, Workspace& ws, std::span<TrialOutcome> out, Clamps& clamps,
           std::span<std::uint8_t> decisions = {}) const;

  struct Hour;  // flat per-interval truth (defined in sensors.cpp)

 private:
  struct Needs {
    bool outdoor_humidity = false, outdoor_dew_point = false;
    bool return_humidity = false, return_dew_point = false;
  };
  Engine() = default;
  std::shared_ptr<const std::vector<Hour>> hours_;
  std::vector<highlimit::Strategy> strategies_;
  HumidityKind kind_ = HumidityKind::relative_humidity;
  Needs need_;
  double perfect_kwh_ = 0, none_kwh_ = 0;
  void find_needs();
};

// A strategy whose conditions use a humidity reading (enthalpy, dew point, humidity ratio),
// and one that uses dry-bulb only.
[[nodiscard]] bool uses_humidity(const highlimit::Strategy& s);
[[nodiscard]] bool dry_bulb_only(const highlimit::Strategy& s);

// --- Running many trials ------------------------------------------------------------------

// How long work runs: threads (0: all cores), a flag that stops it between trials (set from
// a signal handler, say), and progress reported on the calling thread.
struct RunControl {
  unsigned threads = 0;
  const std::atomic<bool>* cancel = nullptr;
  std::function<void(std::string_view phase, std::size_t done, std::size_t total)> progress;
};

// Mean (with its standard error), P10, P50, P90 (linear interpolation between order
// statistics) and the worst (largest) value over the trials.
struct Stats {
  double mean = 0, std_error = 0, p10 = 0, p50 = 0, p90 = 0, worst = 0;
};
[[nodiscard]] Stats summarise(std::vector<double> values);

struct StrategySummary {
  std::size_t index = 0;  // position in the engine's strategies
  std::string name;
  TrialOutcome exact;  // with exact sensors (every bias zero)
  Stats shortfall_kwh, harmful_hours, missed_hours;
};

struct StudyOptions {
  std::size_t trials = 1000;
  std::uint64_t seed = 1;
};

struct StudyResult {
  SensorSet sensors;
  std::uint64_t seed = 0;
  std::size_t trials_requested = 0;
  bool partial = false;                 // stopped before every trial finished
  std::vector<std::string> names;       // in the engine's order
  std::vector<StrategySummary> ranked;  // by mean shortfall, smallest first
  // beats[a][b]: share of trials in which strategy a (engine order) has a smaller shortfall
  // than strategy b in the same trial.
  std::vector<std::vector<double>> beats;
  // The finished trials, in trial order.
  std::vector<std::uint32_t> trial;
  std::vector<Biases> trial_biases;
  std::vector<Clamps> trial_clamps;
  std::vector<TrialOutcome> trial_outcomes;  // trial-major: [k × strategies + s]
  std::uint64_t readings_per_trial = 0;      // fan-on intervals
  [[nodiscard]] std::size_t trials_completed() const { return trial.size(); }
  [[nodiscard]] const TrialOutcome& outcome(std::size_t k, std::size_t s) const {
    return trial_outcomes[k * names.size() + s];
  }
};

[[nodiscard]] StudyResult run_study(const Engine& engine, const SensorSet& sensors,
                                    const StudyOptions& options, const RunControl& control = {});

// --- Bias sweep ---------------------------------------------------------------------------

struct SweepSpec {
  Sensor sensor = Sensor::outdoor_humidity;
  HumidityKind outdoor_kind = HumidityKind::relative_humidity;  // for outdoor_humidity
  std::vector<double> biases;                                   // SI
};

// The sweep of one sensor (key such as "outdoor_rh" or "return_dry_bulb") over the biases
// FROM, TO, STEP written as quantities ("-10%", "2F"); bare numbers in `bare` units. An
// outdoor humidity key of another kind than `configured` sweeps that kind of sensor.
// InputError naming `origin`.
[[nodiscard]] SweepSpec sweep_spec(std::string_view sensor_key,
                                   const std::array<std::string_view, 3>& from_to_step,
                                   HumidityKind configured, units::System bare,
                                   std::string_view origin);

// Where, moving away from the bias nearest zero, a condition first holds: the first bias
// below and the first above (none when it never holds in the range), or already at it.
struct SweepTurn {
  bool at_reference = false;
  std::optional<double> below, above;
};

struct SweepResult {
  SweepSpec spec;
  std::vector<std::string> names;
  std::vector<std::uint8_t> humidity_based;         // per strategy: reads a humidity sensor
  std::vector<std::vector<TrialOutcome>> outcomes;  // [bias][strategy]
  std::vector<Clamps> clamps;                       // per bias
  std::vector<std::uint8_t> completed;              // per bias: 1 when it ran
  double no_economizer_kwh = 0;
  double perfect_kwh = 0;
  bool partial = false;       // interrupted before every bias ran
  std::size_t reference = 0;  // index of the bias nearest zero
  // Per bias: the smallest shortfall of the strategies that read dry-bulb only (none when the
  // set has no such strategy), and the best strategy (index).
  std::vector<std::optional<double>> best_dry_bulb_only_kwh;
  std::vector<std::size_t> best;
  // Per strategy: where a humidity-based strategy falls behind the best dry-bulb-only one at
  // the same bias (it no longer pays for its humidity sensor), and where any strategy stops
  // saving energy against no economizer at all.
  std::vector<SweepTurn> falls_behind, stops_saving;
};

// One deterministic run per bias: the swept sensor reads truth + bias, every other sensor
// reads the truth.
[[nodiscard]] SweepResult run_sweep(const annual::Prepared& prepared,
                                    std::span<const highlimit::Strategy> strategies,
                                    const SweepSpec& spec, const RunControl& control = {});

// --- Break-even humidity-sensor accuracy -------------------------------------------------

enum class Verdict : std::uint8_t {
  crosses,  // beats the dry-bulb strategy up to `scale`, not beyond
  always,   // beats it at every accuracy searched
  never,    // does not beat it even with exact humidity sensors
  not_run,  // interrupted before this pair
};
[[nodiscard]] std::string_view verdict_name(Verdict v);

struct BreakEvenPair {
  std::size_t humid = 0, dry = 0;  // engine indices
  std::string humid_name, dry_name;
  Verdict verdict = Verdict::not_run;
  double scale = 0;                      // break-even multiple of the base accuracies
  double scale_low = 0, scale_high = 0;  // final bisection bracket: beats at low, not at high
  double dry_mean_kwh = 0;               // mean shortfall of the dry-bulb strategy
  double humid_mean_at_zero_kwh = 0;     // mean shortfall with exact humidity sensors
  double humid_mean_at_max_kwh = 0;      // at the largest accuracy searched
};

struct BreakEvenOptions {
  std::size_t trials = 200;
  std::uint64_t seed = 1;
  int bisection_steps = 7;
};

struct BreakEvenResult {
  SensorSet base;        // the humidity accuracies a scale multiplies
  double max_scale = 0;  // the search runs over [0, max_scale]
  std::size_t trials = 0;
  bool partial = false;
  std::vector<BreakEvenPair> pairs;
  // Accuracy of a humidity sensor (outdoor_humidity or return_rh) at a scale, SI.
  [[nodiscard]] double accuracy(Sensor s, double scale) const {
    return at(base.accuracy, s) * scale;
  }
};

// For every pair (a strategy that uses a humidity reading, one that uses dry-bulb only): the
// multiple of the humidity sensors' accuracies (outdoor humidity and return RH together, the
// dry-bulb sensors as given) at which the first stops beating the second in mean shortfall,
// by bisection over [0, max], with common random numbers at every accuracy.
[[nodiscard]] BreakEvenResult break_even(const Engine& engine, const SensorSet& sensors,
                                         const BreakEvenOptions& options,
                                         const RunControl& control = {});

}  // namespace limitline::sensors
