// Sensor-error study: readings with persistent biases, many trials, sweeps and break-even.
#include <limitline/analysis/sensors.hpp>

#include <limitline/error.hpp>
#include <limitline/io/detail/raw_table.hpp>
#include <limitline/model/plausible.hpp>
#include <limitline/model/psychro.hpp>
#include <limitline/names.hpp>
#include <limitline/parallel.hpp>
#include <limitline/text.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <map>
#include <numeric>

namespace limitline::sensors {
namespace {

using highlimit::Quantity;
using units::Kind;

// --- Sensor table ---------------------------------------------------------------------------

constexpr double kFahrenheitK = 1.0 / 1.8;
constexpr double kBtuPerLbKjPerKg = 2.326;

// One row per sensor and (for the outdoor humidity sensor) kind: its [sensors] key, words,
// the kind of its accuracy, the typical commercial figure (common practice), the largest
// accuracy accepted, and how far the break-even search goes.
struct SensorRow {
  std::string_view key;
  std::string_view label;
  Sensor sensor;
  HumidityKind kind;  // meaningful for outdoor_humidity only
  Kind unit_kind;
  double typical;
  double max;
  double search_max;
};
constexpr SensorRow kRows[] = {
    {"outdoor_dry_bulb", "outdoor dry-bulb", Sensor::outdoor_dry_bulb,
     HumidityKind::relative_humidity, Kind::temperature_difference, 1.0 * kFahrenheitK, 10.0, 0},
    {"outdoor_rh", "outdoor RH", Sensor::outdoor_humidity, HumidityKind::relative_humidity,
     Kind::fraction, 0.05, 0.30, 0.25},
    {"outdoor_dew_point", "outdoor dew point", Sensor::outdoor_humidity, HumidityKind::dew_point,
     Kind::temperature_difference, 2.0 * kFahrenheitK, 10.0, 10.0 * kFahrenheitK},
    {"outdoor_enthalpy", "outdoor enthalpy", Sensor::outdoor_humidity, HumidityKind::enthalpy,
     Kind::enthalpy_difference, 1.0 * kBtuPerLbKjPerKg, 20.0, 5.0 * kBtuPerLbKjPerKg},
    {"return_dry_bulb", "return dry-bulb", Sensor::return_dry_bulb, HumidityKind::relative_humidity,
     Kind::temperature_difference, 1.0 * kFahrenheitK, 10.0, 0},
    {"return_rh", "return RH", Sensor::return_rh, HumidityKind::relative_humidity, Kind::fraction,
     0.05, 0.30, 0.25},
};

const SensorRow& row(Sensor s, HumidityKind k) {
  for (const SensorRow& r : kRows)
    if (r.sensor == s && (s != Sensor::outdoor_humidity || r.kind == k)) return r;
  throw std::logic_error("sensors: sensor missing from the table");
}

const SensorRow* row_by_key(std::string_view key) {
  for (const SensorRow& r : kRows)
    if (r.key == key) return &r;
  return nullptr;
}

constexpr Named<HumidityKind> kKindNames[] = {
    {"rh", HumidityKind::relative_humidity},
    {"relative-humidity", HumidityKind::relative_humidity},
    {"dew-point", HumidityKind::dew_point},
    {"enthalpy", HumidityKind::enthalpy},
};
constexpr Named<BiasDistribution> kDistributionNames[] = {
    {"uniform", BiasDistribution::uniform},
    {"normal", BiasDistribution::normal},
};
constexpr std::string_view kKindKey = "outdoor_humidity_kind";
constexpr std::string_view kDistributionKey = "distribution";

// --- Random numbers -----------------------------------------------------------------------

// SplitMix64 (Steele, Lea and Flood 2014): turns any 64-bit key into well-mixed state.
std::uint64_t splitmix64(std::uint64_t& x) {
  x += 0x9E3779B97F4A7C15ull;
  std::uint64_t z = x;
  z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ull;
  z = (z ^ (z >> 27)) * 0x94D049BB133111EBull;
  return z ^ (z >> 31);
}

// xoshiro256** (Blackman and Vigna 2018), seeded from SplitMix64 as its authors advise.
class Generator {
 public:
  Generator(std::uint64_t seed, std::uint64_t stream) {
    std::uint64_t key = seed;
    std::uint64_t x = splitmix64(key) ^ stream;
    for (auto& w : s_) w = splitmix64(x);
  }
  std::uint64_t next() {
    const std::uint64_t result = rotl(s_[1] * 5, 7) * 9;
    const std::uint64_t t = s_[1] << 17;
    s_[2] ^= s_[0];
    s_[3] ^= s_[1];
    s_[1] ^= s_[2];
    s_[0] ^= s_[3];
    s_[2] ^= t;
    s_[3] = rotl(s_[3], 45);
    return result;
  }
  // [0, 1) on the 2^-53 grid, the top 53 bits.
  double unit() { return static_cast<double>(next() >> 11) * 0x1.0p-53; }
  // (0, 1], for logarithms.
  double unit_open_low() { return static_cast<double>((next() >> 11) + 1) * 0x1.0p-53; }

 private:
  static std::uint64_t rotl(std::uint64_t x, int k) { return (x << k) | (x >> (64 - k)); }
  std::array<std::uint64_t, 4> s_{};
};

constexpr double kTwoPi = 6.283185307179586476925286766559;

// --- Readings -----------------------------------------------------------------------------

// A vapour pressure never exceeds this share of the total pressure: only a reading far above
// the boiling point could ask for more, and the humidity ratio of eq. 20 grows without bound.
constexpr double kMaxVapourShare = 0.99;

double min_dew_vapour_kpa() {
  static const double v = psychro::saturation_pressure_kpa(psychro::kMinTemperatureC);
  return v;
}

// Saturation pressure of a reading, which a biased sensor may place outside the fits' range.
double reading_saturation_kpa(double t_c, bool& clamped) {
  if (t_c < psychro::kMinTemperatureC || t_c > psychro::kMaxTemperatureC) {
    clamped = true;
    t_c = std::clamp(t_c, psychro::kMinTemperatureC, psychro::kMaxTemperatureC);
  }
  return psychro::saturation_pressure_kpa(t_c);
}

// Dew point of a vapour pressure, −100 °C for air drier than the fits reach (eq. 38 inverse).
double reading_dew_point_c(double pw_kpa) {
  if (pw_kpa < min_dew_vapour_kpa()) return psychro::kMinTemperatureC;
  return psychro::dew_point_from_vapor_pressure_c(pw_kpa);
}

// The derived reading; `pws_at_t` is the saturation pressure at the dry-bulb reading when the
// caller already has it (NaN otherwise).
Reading derive(double t_c, HumidityKind kind, double humidity, double p_kpa, bool with_dew,
               double pws_at_t) {
  Reading r;
  bool& clamped = r.clamped;
  auto pws_t = [&] {
    return std::isnan(pws_at_t) ? reading_saturation_kpa(t_c, clamped) : pws_at_t;
  };
  double pw = 0.0, w = 0.0, h = 0.0, dew = 0.0;
  bool dew_known = false;
  const double pw_max = kMaxVapourShare * p_kpa;
  switch (kind) {
    case HumidityKind::relative_humidity: {
      double rh = humidity;
      if (rh < 0.0 || rh > 1.0) {
        clamped = true;
        rh = std::clamp(rh, 0.0, 1.0);
      }
      pw = rh * pws_t();  // eq. 24
      if (pw > pw_max) {
        pw = pw_max;
        clamped = true;
      }
      w = psychro::humidity_ratio_from_vapor_pressure(pw, p_kpa);
      h = psychro::enthalpy_kj_per_kg(t_c, w);
      break;
    }
    case HumidityKind::dew_point: {
      double d = humidity;
      if (d > t_c) {  // no dew point above the dry-bulb
        d = t_c;
        clamped = true;
      }
      pw = reading_saturation_kpa(d, clamped);  // eq. 38
      if (pw > pw_max) {
        pw = pw_max;
        clamped = true;
      }
      w = psychro::humidity_ratio_from_vapor_pressure(pw, p_kpa);
      h = psychro::enthalpy_kj_per_kg(t_c, w);
      dew = d;
      dew_known = true;
      break;
    }
    case HumidityKind::enthalpy: {
      h = humidity;           // the controller compares the enthalpy reading itself
      if (h < 1.006 * t_c) {  // below dry air at this dry-bulb
        w = 0.0;
        clamped = true;
      } else {
        w = psychro::humidity_ratio_from_enthalpy(t_c, h);
      }
      const double pws = pws_t();
      if (pws < pw_max) {
        const double ws = psychro::humidity_ratio_from_vapor_pressure(pws, p_kpa);  // eq. 23
        if (w > ws) {
          w = ws;
          clamped = true;
        }
      }
      pw = std::min(psychro::vapor_pressure_from_humidity_ratio(w, p_kpa), pw_max);
      break;
    }
  }
  if (with_dew && !dew_known) dew = reading_dew_point_c(pw);
  r.values = highlimit::air_values(t_c, h, dew, w);
  return r;
}

bool any_condition(const highlimit::Strategy& s, bool (*pred)(const highlimit::Condition&)) {
  return std::any_of(s.conditions.begin(), s.conditions.end(), pred);
}
bool is_humidity(Quantity q) { return q != Quantity::dry_bulb; }

// --- Running in parallel ------------------------------------------------------------------

// The pool's run for one phase of the work: the control's threads and cancel flag, its
// progress labelled with `phase`.
ParallelRun parallel_run(const RunControl& control, std::string_view phase) {
  ParallelRun run{control.threads, control.cancel, nullptr};
  if (control.progress)
    run.progress = [&control, phase](std::size_t done, std::size_t total) {
      control.progress(phase, done, total);
    };
  return run;
}

bool all_done(const std::vector<std::uint8_t>& done) {
  return std::all_of(done.begin(), done.end(), [](std::uint8_t d) { return d != 0; });
}

}  // namespace

// --- Names and the sensor table ---------------------------------------------------------------

std::string_view humidity_kind_name(HumidityKind k) { return name_in(kKindNames, k); }

std::string_view distribution_name(BiasDistribution d) { return name_in(kDistributionNames, d); }

std::string_view sensor_key(Sensor s, HumidityKind k) { return row(s, k).key; }
std::string_view sensor_label(Sensor s, HumidityKind k) { return row(s, k).label; }
units::Kind bias_kind(Sensor s, HumidityKind k) { return row(s, k).unit_kind; }
double typical_accuracy(Sensor s, HumidityKind k) { return row(s, k).typical; }
double max_accuracy(Sensor s, HumidityKind k) { return row(s, k).max; }

SensorSet typical_sensors(HumidityKind kind) {
  SensorSet s;
  s.outdoor_humidity = kind;
  for (Sensor x : kSensors) at(s.accuracy, x) = typical_accuracy(x, kind);
  return s;
}

SensorSet read_sensors(const RawTable* raw, std::string_view file, units::System bare) {
  if (raw == nullptr) return typical_sensors();
  const toml::table* table = &detail::toml_table(*raw);
  auto origin = [&](const toml::source_region& where, std::string_view key) {
    return fmt::format("{}:{}: sensors.{}", file, where.begin.line, key);
  };
  auto fail = [&](const toml::source_region& where, std::string_view key, std::string_view msg) {
    throw InputError(fmt::format("{}: {}", origin(where, key), msg));
  };
  auto text_of = [&](const toml::node& n, std::string_view key, bool quantity) -> std::string {
    if (const auto* s = n.as_string()) return s->get();
    if (quantity) {
      if (const auto* i = n.as_integer()) return fmt::format("{}", i->get());
      if (const auto* f = n.as_floating_point()) return fmt::format("{}", f->get());
    }
    fail(n.source(), key,
         quantity ? "must be an accuracy such as \"1F\", \"0.5K\", \"5%\" or \"1btu/lb\""
                  : "must be a string in quotes");
    return {};
  };

  // The outdoor humidity kind: from outdoor_humidity_kind, or from the accuracy key given.
  const toml::node* kind_node = table->get(kKindKey);
  std::optional<HumidityKind> kind;
  if (kind_node) {
    const std::string name = text_of(*kind_node, kKindKey, false);
    kind = value_in(kKindNames, text::normalise_name(name));
    if (!kind)
      fail(kind_node->source(), kKindKey,
           fmt::format("{} is not allowed (allowed: {})", echo(name), names_in(kKindNames)));
  }
  // Keys in the order written (the table itself keeps them sorted by name), so that every
  // message is about the first offending line.
  struct Entry {
    std::string_view key;
    const toml::key* k;
    const toml::node* v;
  };
  std::vector<Entry> entries;
  for (auto&& [k, v] : *table) entries.push_back({k.str(), &k, &v});
  std::stable_sort(entries.begin(), entries.end(), [](const Entry& a, const Entry& b) {
    return a.k->source().begin.line < b.k->source().begin.line;
  });
  const SensorRow* humidity_row = nullptr;
  const toml::node* humidity_node = nullptr;
  for (const auto& [key, kp, vp] : entries) {
    const toml::key& k = *kp;
    const toml::node& v = *vp;
    const SensorRow* r = row_by_key(key);
    if (r == nullptr) {
      if (key == kKindKey || key == kDistributionKey) continue;
      std::string allowed;
      for (const SensorRow& x : kRows) allowed += std::string(x.key) + ", ";
      allowed += std::string(kKindKey) + ", " + std::string(kDistributionKey);
      fail(k.source(), k.str(), fmt::format("unknown key in [sensors] (allowed: {})", allowed));
    }
    if (r->sensor != Sensor::outdoor_humidity) continue;
    if (humidity_row)
      fail(k.source(), k.str(),
           fmt::format("give one outdoor humidity sensor; {} is already given on line {}",
                       humidity_row->key, humidity_node->source().begin.line));
    if (kind && *kind != r->kind)
      fail(k.source(), k.str(),
           fmt::format("outdoor_humidity_kind is \"{}\" (line {}); give {} instead, or change "
                       "the kind",
                       humidity_kind_name(*kind), kind_node->source().begin.line,
                       row(Sensor::outdoor_humidity, *kind).key));
    humidity_row = r;
    humidity_node = &v;
  }
  if (!kind) kind = humidity_row ? humidity_row->kind : HumidityKind::relative_humidity;
  SensorSet s = typical_sensors(*kind);
  s.from_file = true;

  for (const auto& [key, kp, vp] : entries) {
    const toml::key& k = *kp;
    const toml::node& v = *vp;
    const SensorRow* r = row_by_key(key);
    if (r == nullptr) continue;
    const std::string where = origin(v.source(), k.str());
    const std::string band = fmt::format("sensors.{}", r->key);
    double a = plausible::parse(*plausible::find(band), text_of(v, k.str(), true), bare,
                                {where, plausible::in_file(bare)}, s.warnings);
    // The largest accuracy is accepted as written in either system ("18F" for 10 K).
    if (!units::within(a, 0.0, r->max))
      fail(v.source(), k.str(),
           fmt::format("{} is outside the allowed range ({}; an accuracy is a ± half-width "
                       "or a standard deviation, never negative)",
                       units::format(r->unit_kind, bare, a, 2),
                       units::format_range(r->unit_kind, bare, 0.0, r->max)));
    a = units::held_within(a, 0.0, r->max);
    at(s.accuracy, r->sensor) = a;
    s.given[static_cast<std::size_t>(r->sensor)] = true;
  }
  if (const toml::node* d = table->get(kDistributionKey)) {
    const std::string name = text_of(*d, kDistributionKey, false);
    const auto distribution = value_in(kDistributionNames, text::normalise_name(name));
    if (!distribution)
      fail(d->source(), kDistributionKey,
           fmt::format("{} is not allowed (allowed: {}; with normal, each accuracy is the "
                       "standard deviation)",
                       echo(name), names_in(kDistributionNames)));
    s.distribution = *distribution;
  }
  return s;
}

// --- Draws ----------------------------------------------------------------------------------

Biases standard_draws(std::uint64_t seed, std::uint64_t trial, BiasDistribution d) {
  Generator g(seed, trial);
  Biases z{};
  if (d == BiasDistribution::uniform) {
    for (double& v : z) v = 2.0 * g.unit() - 1.0;
    return z;
  }
  // Box–Muller: each pair of uniforms gives two independent standard normals.
  for (std::size_t i = 0; i < kSensorCount; i += 2) {
    const double radius = std::sqrt(-2.0 * std::log(g.unit_open_low()));
    const double angle = kTwoPi * g.unit();
    z[i] = radius * std::cos(angle);
    if (i + 1 < kSensorCount) z[i + 1] = radius * std::sin(angle);
  }
  return z;
}

Biases draw_biases(const SensorSet& s, std::uint64_t seed, std::uint64_t trial) {
  Biases b = standard_draws(seed, trial, s.distribution);
  for (std::size_t i = 0; i < kSensorCount; ++i) b[i] *= s.accuracy[i];
  return b;
}

Reading derive_reading(double t_c, HumidityKind kind, double humidity, double p_kpa,
                       bool with_dew_point) {
  return derive(t_c, kind, humidity, p_kpa, with_dew_point, std::nan(""));
}

// --- Engine -----------------------------------------------------------------------------------

struct Engine::Hour {
  highlimit::AirValues outdoor, ret;  // the true state
  double outdoor_rh, outdoor_pws_kpa, return_rh, pressure_kpa;
  double disabled_kwh, enabled_kwh, hours;
  std::uint8_t month;  // 0–11
  bool harmful_if_enabled, missed_if_disabled;
};

bool uses_humidity(const highlimit::Strategy& s) {
  return any_condition(s, [](const highlimit::Condition& c) { return is_humidity(c.quantity); });
}
bool dry_bulb_only(const highlimit::Strategy& s) {
  return !s.conditions.empty() && !uses_humidity(s);
}

Engine::Engine(const annual::Prepared& p, std::span<const highlimit::Strategy> strategies,
               HumidityKind kind)
    : strategies_(strategies.begin(), strategies.end()), kind_(kind) {
  if (!p.has_dew_point)
    throw std::logic_error("sensors::Engine: the prepared year has no dew points");
  auto hours = std::make_shared<std::vector<Hour>>();
  hours->reserve(p.intervals.size());
  for (const annual::PreparedInterval& iv : p.intervals) {
    Hour h;
    h.outdoor = iv.outdoor;
    h.ret = iv.ret;
    h.pressure_kpa = iv.pressure_kpa;
    const double t_o = iv.outdoor[Quantity::dry_bulb];
    h.outdoor_pws_kpa = psychro::saturation_pressure_kpa(t_o);
    // eq. 24: φ = p_w/p_ws, with p_w from eq. 20.
    h.outdoor_rh = psychro::vapor_pressure_from_humidity_ratio(iv.outdoor[Quantity::humidity_ratio],
                                                               iv.pressure_kpa) /
                   h.outdoor_pws_kpa;
    h.return_rh = psychro::relative_humidity_from_humidity_ratio(
        iv.ret[Quantity::dry_bulb], iv.ret[Quantity::humidity_ratio], iv.pressure_kpa);
    h.disabled_kwh = iv.disabled.energy_kwh;
    h.enabled_kwh = iv.enabled.energy_kwh;
    h.hours = iv.hours;
    h.month = static_cast<std::uint8_t>(iv.month - 1);
    h.harmful_if_enabled = iv.cooling_needed && iv.enabling_hurts();
    h.missed_if_disabled = iv.enabling_pays();
    hours->push_back(h);
  }
  hours_ = std::move(hours);
  perfect_kwh_ = annual::run_reference(annual::Kind::perfect_changeover, p).annual.energy_kwh;
  none_kwh_ = annual::run_reference(annual::Kind::no_economizer, p).annual.energy_kwh;
  find_needs();
}

void Engine::find_needs() {
  need_ = {};
  for (const auto& s : strategies_)
    for (const auto& c : s.conditions) {
      const bool ret = c.reference == highlimit::Reference::return_air;
      if (is_humidity(c.quantity)) {
        need_.outdoor_humidity = true;
        if (ret) need_.return_humidity = true;
      }
      if (c.quantity == Quantity::dew_point) {
        need_.outdoor_dew_point = true;
        if (ret) need_.return_dew_point = true;
      }
    }
}

Engine Engine::subset(std::span<const std::size_t> indices) const {
  Engine e;
  e.hours_ = hours_;
  e.kind_ = kind_;
  e.perfect_kwh_ = perfect_kwh_;
  e.none_kwh_ = none_kwh_;
  for (std::size_t i : indices) e.strategies_.push_back(strategies_.at(i));
  e.find_needs();
  return e;
}

std::size_t Engine::intervals() const { return hours_->size(); }
double Engine::perfect_energy_kwh() const { return perfect_kwh_; }
double Engine::no_economizer_energy_kwh() const { return none_kwh_; }

Engine::Workspace Engine::workspace() const {
  Workspace ws;
  for (const auto& s : strategies_) ws.state.emplace_back(s);
  ws.monthly.resize(strategies_.size() * 12);
  return ws;
}

void Engine::run(const Biases& b, Workspace& ws, std::span<TrialOutcome> out, Clamps& clamps,
                 std::span<std::uint8_t> decisions) const {
  const std::size_t n_strategies = strategies_.size();
  if (out.size() != n_strategies || ws.state.size() != n_strategies ||
      ws.monthly.size() != n_strategies * 12 ||
      (!decisions.empty() && decisions.size() != n_strategies * hours_->size()))
    throw std::logic_error("sensors::Engine::run: buffers do not match the strategies");
  for (auto& st : ws.state) std::fill(st.tripped.begin(), st.tripped.end(), 0);
  std::fill(ws.monthly.begin(), ws.monthly.end(), TrialOutcome{});
  clamps = {};

  const double b_to = at(b, Sensor::outdoor_dry_bulb), b_ho = at(b, Sensor::outdoor_humidity);
  const double b_tr = at(b, Sensor::return_dry_bulb), b_hr = at(b, Sensor::return_rh);
  // A sensor with no bias reads the truth exactly, so exact sensors reproduce the year.
  const bool outdoor_biased = b_to != 0.0 || b_ho != 0.0;
  const bool return_biased = b_tr != 0.0 || b_hr != 0.0;
  const bool derive_outdoor = outdoor_biased && need_.outdoor_humidity;
  const bool derive_return = return_biased && need_.return_humidity;

  // The return air changes little (only its pressure, in most files): its reading is derived
  // again only when the true return state changes, and its saturation pressure only when the
  // return dry-bulb does.
  double last_p = std::nan(""), last_rh = std::nan(""), last_t = std::nan("");
  double return_pws = 0.0;
  bool return_t_clamped = false;
  Reading ret_reading{};

  const std::vector<Hour>& hours = *hours_;
  for (std::size_t i = 0; i < hours.size(); ++i) {
    const Hour& h = hours[i];
    highlimit::AirValues o = h.outdoor;
    if (derive_outdoor) {
      const double t = h.outdoor[Quantity::dry_bulb] + b_to;
      double hum = 0.0;
      switch (kind_) {
        case HumidityKind::relative_humidity: hum = h.outdoor_rh; break;
        case HumidityKind::dew_point: hum = h.outdoor[Quantity::dew_point]; break;
        case HumidityKind::enthalpy: hum = h.outdoor[Quantity::enthalpy]; break;
      }
      const Reading r = derive(t, kind_, hum + b_ho, h.pressure_kpa, need_.outdoor_dew_point,
                               b_to == 0.0 ? h.outdoor_pws_kpa : std::nan(""));
      o = r.values;
      clamps.outdoor += r.clamped;
    } else if (outdoor_biased) {
      o[Quantity::dry_bulb] += b_to;
    }
    const highlimit::AirValues* ret = &h.ret;
    if (derive_return) {
      const double t_true = h.ret[Quantity::dry_bulb];
      if (h.pressure_kpa != last_p || h.return_rh != last_rh || t_true != last_t) {
        if (t_true != last_t) {
          return_t_clamped = false;
          return_pws = reading_saturation_kpa(t_true + b_tr, return_t_clamped);
        }
        last_p = h.pressure_kpa;
        last_rh = h.return_rh;
        last_t = t_true;
        ret_reading = derive(t_true + b_tr, HumidityKind::relative_humidity, h.return_rh + b_hr,
                             h.pressure_kpa, need_.return_dew_point, return_pws);
        ret_reading.clamped = ret_reading.clamped || return_t_clamped;
      }
      clamps.ret += ret_reading.clamped;
      ret = &ret_reading.values;
    } else if (return_biased) {
      ret_reading.values = h.ret;
      ret_reading.values[Quantity::dry_bulb] += b_tr;
      ret = &ret_reading.values;
    }

    TrialOutcome* month = &ws.monthly[h.month];
    for (std::size_t s = 0; s < n_strategies; ++s, month += 12) {
      const bool enabled = highlimit::permits(strategies_[s], o, *ret, ws.state[s]);
      if (!decisions.empty()) decisions[i * n_strategies + s] = enabled;
      // The same sums, in the same order, as annual::run, so exact sensors match it exactly.
      month->energy_kwh += enabled ? h.enabled_kwh : h.disabled_kwh;
      if (enabled) {
        month->enabled_hours += h.hours;
        if (h.harmful_if_enabled) {
          month->harmful_hours += h.hours;
          month->harmful_kwh += h.enabled_kwh - h.disabled_kwh;
        }
      } else if (h.missed_if_disabled) {
        month->missed_hours += h.hours;
        month->missed_kwh += h.disabled_kwh - h.enabled_kwh;
      }
    }
  }

  for (std::size_t s = 0; s < n_strategies; ++s) {
    TrialOutcome t{};
    for (std::size_t m = 0; m < 12; ++m) {
      const TrialOutcome& x = ws.monthly[s * 12 + m];
      t.energy_kwh += x.energy_kwh;
      t.enabled_hours += x.enabled_hours;
      t.harmful_hours += x.harmful_hours;
      t.harmful_kwh += x.harmful_kwh;
      t.missed_hours += x.missed_hours;
      t.missed_kwh += x.missed_kwh;
    }
    t.shortfall_kwh = t.energy_kwh - perfect_kwh_;
    out[s] = t;
  }
}

// --- Study ------------------------------------------------------------------------------------

Stats summarise(std::vector<double> v) {
  Stats s;
  const std::size_t n = v.size();
  if (n == 0) return s;
  double sum = 0.0;
  for (double x : v) sum += x;
  s.mean = sum / static_cast<double>(n);
  if (n > 1) {
    double ss = 0.0;
    for (double x : v) ss += (x - s.mean) * (x - s.mean);
    s.std_error = std::sqrt(ss / static_cast<double>(n - 1) / static_cast<double>(n));
  }
  std::sort(v.begin(), v.end());
  // Linear interpolation between order statistics (the common "type 7" definition).
  auto quantile = [&](double q) {
    const double pos = q * static_cast<double>(n - 1);
    const std::size_t lo = static_cast<std::size_t>(pos);
    const std::size_t hi = std::min(lo + 1, n - 1);
    return v[lo] + (pos - static_cast<double>(lo)) * (v[hi] - v[lo]);
  };
  s.p10 = quantile(0.10);
  s.p50 = quantile(0.50);
  s.p90 = quantile(0.90);
  s.worst = v.back();
  return s;
}

StudyResult run_study(const Engine& engine, const SensorSet& sensors, const StudyOptions& opt,
                      const RunControl& control) {
  if (engine.outdoor_kind() != sensors.outdoor_humidity)
    throw std::logic_error("sensors::run_study: engine and sensors disagree on the humidity kind");
  const std::size_t n_s = engine.strategies().size();
  const std::size_t n = opt.trials;
  StudyResult r;
  r.sensors = sensors;
  r.seed = opt.seed;
  r.trials_requested = n;
  r.readings_per_trial = engine.intervals();
  for (const auto& s : engine.strategies()) r.names.push_back(s.name);

  std::vector<TrialOutcome> outcomes(n * n_s);
  std::vector<Biases> biases(n);
  std::vector<Clamps> clamps(n);
  const auto done = parallel_for(
      n, parallel_run(control, "trials"), [&] { return engine.workspace(); },
      [&](std::size_t k, Engine::Workspace& ws) {
        biases[k] = draw_biases(sensors, opt.seed, k);
        engine.run(biases[k], ws, std::span(outcomes).subspan(k * n_s, n_s), clamps[k]);
      });
  r.partial = !all_done(done);
  for (std::size_t k = 0; k < n; ++k) {
    if (!done[k]) continue;
    r.trial.push_back(static_cast<std::uint32_t>(k));
    r.trial_biases.push_back(biases[k]);
    r.trial_clamps.push_back(clamps[k]);
    r.trial_outcomes.insert(r.trial_outcomes.end(),
                            outcomes.begin() + static_cast<std::ptrdiff_t>(k * n_s),
                            outcomes.begin() + static_cast<std::ptrdiff_t>((k + 1) * n_s));
  }

  std::vector<TrialOutcome> exact(n_s);
  {
    auto ws = engine.workspace();
    Clamps none;
    engine.run(Biases{}, ws, exact, none);
  }
  const std::size_t m = r.trials_completed();
  for (std::size_t s = 0; s < n_s; ++s) {
    StrategySummary sum;
    sum.index = s;
    sum.name = r.names[s];
    sum.exact = exact[s];
    std::vector<double> shortfall(m), harmful(m), missed(m);
    for (std::size_t k = 0; k < m; ++k) {
      shortfall[k] = r.outcome(k, s).shortfall_kwh;
      harmful[k] = r.outcome(k, s).harmful_hours;
      missed[k] = r.outcome(k, s).missed_hours;
    }
    sum.shortfall_kwh = summarise(std::move(shortfall));
    sum.harmful_hours = summarise(std::move(harmful));
    sum.missed_hours = summarise(std::move(missed));
    r.ranked.push_back(std::move(sum));
  }
  // Equal means keep the unit file's order.
  std::stable_sort(r.ranked.begin(), r.ranked.end(), [](const auto& a, const auto& b) {
    return a.shortfall_kwh.mean < b.shortfall_kwh.mean;
  });

  // A strategy beats another in a trial when its shortfall is smaller by more than rounding.
  constexpr double kTieKwh = 1e-6;
  r.beats.assign(n_s, std::vector<double>(n_s, 0.0));
  if (m > 0)
    for (std::size_t a = 0; a < n_s; ++a)
      for (std::size_t b = 0; b < n_s; ++b) {
        if (a == b) continue;
        std::size_t wins = 0;
        for (std::size_t k = 0; k < m; ++k)
          wins += r.outcome(k, a).shortfall_kwh < r.outcome(k, b).shortfall_kwh - kTieKwh;
        r.beats[a][b] = static_cast<double>(wins) / static_cast<double>(m);
      }
  return r;
}

// --- Sweep ------------------------------------------------------------------------------------

SweepSpec sweep_spec(std::string_view sensor_key, const std::array<std::string_view, 3>& range,
                     HumidityKind configured, units::System bare, std::string_view origin) {
  std::string key = text::normalise_name(sensor_key);
  std::replace(key.begin(), key.end(), '-', '_');
  const SensorRow* r = row_by_key(key);
  if (r == nullptr) {
    std::string allowed;
    for (const SensorRow& x : kRows) allowed += (allowed.empty() ? "" : ", ") + std::string(x.key);
    throw InputError(
        fmt::format("{}: {} is not a sensor (allowed: {})", origin, echo(sensor_key), allowed));
  }
  SweepSpec spec;
  spec.sensor = r->sensor;
  spec.outdoor_kind = r->sensor == Sensor::outdoor_humidity ? r->kind : configured;
  const auto& parts = range;
  std::array<double, 3> v{};
  constexpr std::string_view kWhat[] = {"FROM", "TO", "STEP"};
  for (std::size_t i = 0; i < 3; ++i)
    v[i] = units::parse(r->unit_kind, parts[i], bare, fmt::format("{} {}", origin, kWhat[i]));
  const auto show = [&](double x) { return units::format(r->unit_kind, bare, x, 2); };
  if (!(v[2] > 0.0))
    throw InputError(fmt::format("{}: STEP {} must be more than 0", origin, show(v[2])));
  if (!(v[0] <= v[1]))
    throw InputError(fmt::format("{}: FROM {} is above TO {}", origin, show(v[0]), show(v[1])));
  for (double x : {v[0], v[1]})
    if (std::fabs(x) > r->max)
      throw InputError(fmt::format("{}: bias {} is outside the allowed range (-{} to {})", origin,
                                   show(x), show(r->max), show(r->max)));
  constexpr std::size_t kMaxPoints = 401;
  // A tiny STEP makes the count overflow any integer (or a double): it is compared as a
  // double and printed only when it is small enough to be a count.
  const double steps = std::floor((v[1] - v[0]) / v[2] + 1e-9);
  if (!(steps + 1.0 <= static_cast<double>(kMaxPoints)))
    throw InputError(fmt::format(
        "{}: {} biases asked for; at most {} (use a larger STEP)", origin,
        steps < 1e9 ? fmt::format("{:.0f}", steps + 1.0) : std::string("more than a billion"),
        kMaxPoints));
  for (std::size_t i = 0; i <= static_cast<std::size_t>(steps); ++i) {
    double x = v[0] + static_cast<double>(i) * v[2];
    // A point that is zero but for rounding is the exact-sensor point.
    if (std::fabs(x) < 1e-9 * v[2]) x = 0.0;
    spec.biases.push_back(x);
  }
  return spec;
}

SweepResult run_sweep(const annual::Prepared& p, std::span<const highlimit::Strategy> strategies,
                      const SweepSpec& spec, const RunControl& control) {
  const Engine engine(p, strategies, spec.outdoor_kind);
  const std::size_t n_s = strategies.size();
  SweepResult r;
  r.spec = spec;
  for (const auto& s : strategies) r.names.push_back(s.name);
  r.no_economizer_kwh = engine.no_economizer_energy_kwh();
  r.perfect_kwh = engine.perfect_energy_kwh();
  r.outcomes.assign(spec.biases.size(), std::vector<TrialOutcome>(n_s));
  r.clamps.resize(spec.biases.size());
  r.completed = parallel_for(
      spec.biases.size(), parallel_run(control, "sweep"), [&] { return engine.workspace(); },
      [&](std::size_t i, Engine::Workspace& ws) {
        Biases b{};
        at(b, spec.sensor) = spec.biases[i];
        engine.run(b, ws, r.outcomes[i], r.clamps[i]);
      });
  r.partial = !all_done(r.completed);

  const std::size_t n_b = spec.biases.size();
  for (std::size_t i = 1; i < n_b; ++i)
    if (std::fabs(spec.biases[i]) < std::fabs(spec.biases[r.reference])) r.reference = i;
  r.best_dry_bulb_only_kwh.resize(n_b);
  r.best.assign(n_b, 0);
  for (std::size_t i = 0; i < n_b; ++i) {
    if (!r.completed[i]) continue;
    for (std::size_t s = 0; s < n_s; ++s) {
      const double x = r.outcomes[i][s].shortfall_kwh;
      if (x < r.outcomes[i][r.best[i]].shortfall_kwh) r.best[i] = s;
      auto& best_db = r.best_dry_bulb_only_kwh[i];
      if (dry_bulb_only(strategies[s]) && (!best_db || x < *best_db)) best_db = x;
    }
  }
  // Walks away from the reference bias on each side to the first bias where `holds`.
  auto turn = [&](auto holds) {
    SweepTurn t;
    if (r.completed[r.reference]) t.at_reference = holds(r.reference);
    for (std::size_t i = r.reference; i-- > 0;)
      if (r.completed[i] && holds(i)) {
        t.below = spec.biases[i];
        break;
      }
    for (std::size_t i = r.reference + 1; i < n_b; ++i)
      if (r.completed[i] && holds(i)) {
        t.above = spec.biases[i];
        break;
      }
    return t;
  };
  for (std::size_t s = 0; s < n_s; ++s) {
    r.humidity_based.push_back(uses_humidity(strategies[s]));
    r.falls_behind.push_back(r.humidity_based[s] ? turn([&](std::size_t i) {
      const auto& best_db = r.best_dry_bulb_only_kwh[i];
      return best_db && r.outcomes[i][s].shortfall_kwh > *best_db;
    })
                                                 : SweepTurn{});
    r.stops_saving.push_back(
        turn([&](std::size_t i) { return r.outcomes[i][s].energy_kwh >= r.no_economizer_kwh; }));
  }
  return r;
}

// --- Break-even -------------------------------------------------------------------------------

std::string_view verdict_name(Verdict v) {
  switch (v) {
    case Verdict::crosses: return "crosses";
    case Verdict::always: return "always";
    case Verdict::never: return "never";
    case Verdict::not_run: return "not-run";
  }
  return "not-run";
}

namespace {

// Every pair of a strategy that reads humidity with one that reads only dry-bulb, and the
// strategies the pairs involve (`involved`, ascending).
std::vector<BreakEvenPair> humidity_pairs(const std::vector<highlimit::Strategy>& all,
                                          std::vector<std::size_t>& involved) {
  std::vector<BreakEvenPair> pairs;
  for (std::size_t h = 0; h < all.size(); ++h)
    for (std::size_t d = 0; d < all.size(); ++d)
      if (uses_humidity(all[h]) && dry_bulb_only(all[d])) {
        BreakEvenPair pair;
        pair.humid = h;
        pair.dry = d;
        pair.humid_name = all[h].name;
        pair.dry_name = all[d].name;
        pairs.push_back(pair);
        for (std::size_t x : {h, d})
          if (std::find(involved.begin(), involved.end(), x) == involved.end())
            involved.push_back(x);
      }
  std::sort(involved.begin(), involved.end());
  return pairs;
}

}  // namespace

BreakEvenResult break_even(const Engine& engine, const SensorSet& sensors,
                           const BreakEvenOptions& opt, const RunControl& control) {
  BreakEvenResult r;
  r.base = sensors;
  const HumidityKind kind = sensors.outdoor_humidity;
  // The humidity accuracies a scale multiplies; the typical ones when both are zero.
  if (at(r.base.accuracy, Sensor::outdoor_humidity) == 0.0 &&
      at(r.base.accuracy, Sensor::return_rh) == 0.0) {
    at(r.base.accuracy, Sensor::outdoor_humidity) =
        typical_accuracy(Sensor::outdoor_humidity, kind);
    at(r.base.accuracy, Sensor::return_rh) = typical_accuracy(Sensor::return_rh, kind);
  }
  const double base_o = at(r.base.accuracy, Sensor::outdoor_humidity);
  r.max_scale = base_o > 0.0 ? row(Sensor::outdoor_humidity, kind).search_max / base_o
                             : row(Sensor::return_rh, kind).search_max /
                                   at(r.base.accuracy, Sensor::return_rh);
  r.trials = std::max<std::size_t>(opt.trials, 1);

  std::vector<std::size_t> involved;
  r.pairs = humidity_pairs(engine.strategies(), involved);
  if (r.pairs.empty()) return r;

  // Progress counts bisection steps; the total is known once the ends of the search are.
  std::size_t total = 2 + r.pairs.size() * static_cast<std::size_t>(opt.bisection_steps);
  std::size_t steps_done = 0;
  auto step_done = [&] {
    if (control.progress) control.progress("break-even", ++steps_done, total);
  };
  RunControl inner = control;
  inner.progress = nullptr;
  // Mean shortfall of each strategy of `sub` with the humidity accuracies scaled; empty when
  // interrupted. Every scale uses the same trials, hence the same standard draws.
  auto means = [&](const Engine& sub, double scale) -> std::vector<double> {
    SensorSet s = r.base;
    at(s.accuracy, Sensor::outdoor_humidity) *= scale;
    at(s.accuracy, Sensor::return_rh) *= scale;
    const std::size_t n_s = sub.strategies().size();
    std::vector<TrialOutcome> out(r.trials * n_s);
    const auto done = parallel_for(
        r.trials, parallel_run(inner, "break-even"), [&] { return sub.workspace(); },
        [&](std::size_t k, Engine::Workspace& ws) {
          Clamps c;
          sub.run(draw_biases(s, opt.seed, k), ws, std::span(out).subspan(k * n_s, n_s), c);
        });
    if (!all_done(done)) return {};
    std::vector<double> m(n_s, 0.0);
    for (std::size_t k = 0; k < r.trials; ++k)
      for (std::size_t s2 = 0; s2 < n_s; ++s2) m[s2] += out[k * n_s + s2].shortfall_kwh;
    for (double& x : m) x /= static_cast<double>(r.trials);
    return m;
  };

  const Engine both = engine.subset(involved);
  const auto at_zero = means(both, 0.0);
  step_done();
  const auto at_max = at_zero.empty() ? std::vector<double>{} : means(both, r.max_scale);
  step_done();
  if (at_max.empty()) {
    r.partial = true;
    return r;
  }
  auto pos = [&](std::size_t engine_index) {
    return static_cast<std::size_t>(std::find(involved.begin(), involved.end(), engine_index) -
                                    involved.begin());
  };
  // A humidity strategy's mean at a scale, remembered: pairs with the same humidity strategy
  // share their first bisection steps.
  std::map<std::pair<std::size_t, double>, double> memo;
  std::size_t to_bisect = 0;
  for (BreakEvenPair& pair : r.pairs) {
    // The dry-bulb strategy reads no humidity sensor, so its mean is the same at every scale.
    pair.dry_mean_kwh = at_zero[pos(pair.dry)];
    pair.humid_mean_at_zero_kwh = at_zero[pos(pair.humid)];
    pair.humid_mean_at_max_kwh = at_max[pos(pair.humid)];
    if (!(pair.humid_mean_at_zero_kwh < pair.dry_mean_kwh)) {
      pair.verdict = Verdict::never;
    } else if (pair.humid_mean_at_max_kwh < pair.dry_mean_kwh) {
      pair.verdict = Verdict::always;
      pair.scale = pair.scale_low = pair.scale_high = r.max_scale;
    } else {
      ++to_bisect;
    }
  }
  total = 2 + to_bisect * static_cast<std::size_t>(opt.bisection_steps);
  for (BreakEvenPair& pair : r.pairs) {
    if (pair.verdict != Verdict::not_run) continue;
    const double f0 = pair.humid_mean_at_zero_kwh - pair.dry_mean_kwh;
    const double f_max = pair.humid_mean_at_max_kwh - pair.dry_mean_kwh;
    const std::array<std::size_t, 1> one = {pair.humid};
    const Engine single = engine.subset(one);
    double lo = 0.0, hi = r.max_scale, f_lo = f0, f_hi = f_max;
    bool interrupted = false;
    for (int step = 0; step < opt.bisection_steps; ++step) {
      const double mid = 0.5 * (lo + hi);
      auto it = memo.find({pair.humid, mid});
      if (it == memo.end()) {
        const auto m = means(single, mid);
        if (m.empty()) {
          interrupted = true;
          break;
        }
        it = memo.emplace(std::pair{pair.humid, mid}, m[0]).first;
      }
      step_done();
      const double f = it->second - pair.dry_mean_kwh;
      if (f < 0.0)
        lo = mid, f_lo = f;
      else
        hi = mid, f_hi = f;
    }
    if (interrupted) {
      r.partial = true;
      break;
    }
    pair.verdict = Verdict::crosses;
    pair.scale_low = lo;
    pair.scale_high = hi;
    // Within the last bracket the difference is taken as linear in the scale.
    pair.scale = lo + (hi - lo) * (-f_lo) / (f_hi - f_lo);
  }
  return r;
}

}  // namespace limitline::sensors
