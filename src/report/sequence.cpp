// The economizer sequence of operation: paragraphs generated from the unit, its high-limit
// strategy, the code tables and the annual results, in original wording.
#include <limitline/report/sequence.hpp>

#include <limitline/error.hpp>
#include <limitline/model/psychro.hpp>
#include <limitline/report/cautions.hpp>
#include <limitline/report/year.hpp>
#include <limitline/analysis/sensors.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

namespace limitline::sequence {
namespace {

using highlimit::Condition;
using highlimit::Quantity;
using highlimit::Reference;
using units::Kind;
using units::System;

// --- Numbers as a specifier writes them -----------------------------------------------------

// How each kind is written. A value is exact when some number of decimals up to `exact`
// states it (to floating-point noise); otherwise it is rounded to `rounded` decimals and the
// figure it came from follows. `step` is the resolution of figures this text chooses itself
// (the mixed-air low-limit, the freeze-protection example): whole °F and 0.5 °C, 0.5 Btu/lb
// and 1 kJ/kg, whole percent (common practice for written setpoints).
struct Precision {
  Kind kind;
  int exact_ip, exact_si;
  int rounded_ip, rounded_si;
  double step_ip, step_si;
};
constexpr Precision kPrecision[] = {
    {Kind::temperature, 2, 2, 1, 1, 1.0, 0.5},
    {Kind::temperature_difference, 2, 2, 1, 1, 1.0, 0.5},
    {Kind::enthalpy, 2, 2, 1, 1, 0.5, 1.0},
    {Kind::enthalpy_difference, 2, 2, 1, 1, 0.5, 1.0},
    {Kind::fraction, 2, 2, 0, 0, 1.0, 1.0},
    {Kind::airflow, 0, 3, 0, 2, 10.0, 0.01},
    {Kind::humidity_ratio, 5, 5, 4, 4, 0.0001, 0.0001},
    {Kind::pressure, 3, 3, 2, 1, 0.01, 0.1},
    {Kind::length, 0, 1, 0, 0, 1.0, 1.0},
    {Kind::power, 1, 1, 1, 1, 1.0, 0.1},
};

const Precision& precision(Kind k) {
  for (const auto& p : kPrecision)
    if (p.kind == k) return p;
  throw std::logic_error("sequence: kind missing from the precision table");
}

System other(System s) { return s == System::ip ? System::si : System::ip; }

// Digits with thousands grouped as each system's documents write them: "8,000" in IP, and in
// SI a narrow no-break space from five digits on ("57 561"), so a comma is never mistaken
// for a decimal mark.
std::string number_text(double v, int decimals, System s) {
  const double unit = std::pow(10.0, -decimals);
  if (std::fabs(v) < 0.5 * unit) v = 0.0;  // never "-0"
  const std::string t = fmt::format("{:.{}f}", v, decimals);
  const std::size_t start = t[0] == '-' ? 1 : 0;
  const std::size_t end = std::min(t.find('.'), t.size());
  const bool ip = s == System::ip;
  if (end - start < (ip ? 4u : 5u)) return t;
  std::string out = t.substr(0, start);
  for (std::size_t i = start; i < end; ++i) {
    if (i > start && (end - i) % 3 == 0) out += ip ? "," : "\u202f";
    out += t[i];
  }
  return out + t.substr(end);
}

std::string with_label(const std::string& number, Kind k, System s) {
  const std::string_view label = units::unit_label(k, s);
  return label == "%" ? number + "%" : fmt::format("{} {}", number, label);
}

// The fewest decimals (up to `max`) that state v exactly, or -1.
int exact_decimals(double v, int max) {
  for (int d = 0; d <= max; ++d) {
    const double scale = std::pow(10.0, d);
    if (std::fabs(v * scale - std::round(v * scale)) <= 1e-7 * std::max(1.0, std::fabs(v * scale)))
      return d;
  }
  return -1;
}

// The exact form of an SI value in a system, when there is one.
std::optional<std::string> exact_text(Kind k, System s, double si) {
  const Precision& p = precision(k);
  const double v = units::to_display(k, s, si);
  const int d = exact_decimals(v, s == System::ip ? p.exact_ip : p.exact_si);
  if (d < 0) return std::nullopt;
  return with_label(number_text(v, d, s), k, s);
}

std::string rounded_text(Kind k, System s, double si, int extra_decimals = 0) {
  const Precision& p = precision(k);
  return with_label(
      number_text(units::to_display(k, s, si),
                  (s == System::ip ? p.rounded_ip : p.rounded_si) + extra_decimals, s),
      k, s);
}

// The figure a rounded one stands for: exact in the other system if it is, else more digits.
std::string origin_text(Kind k, System s, double si) {
  if (auto e = exact_text(k, other(s), si)) return *e;
  return rounded_text(k, s, si, 2);
}

enum class Note { analysed, source, about };

std::string written(Kind k, System s, double si, Note note = Note::analysed) {
  if (auto e = exact_text(k, s, si)) return *e;
  const std::string r = rounded_text(k, s, si);
  switch (note) {
    case Note::analysed:
      return fmt::format("{} (rounded; the analysis used {})", r, origin_text(k, s, si));
    case Note::source: return fmt::format("{} (rounded from {})", r, origin_text(k, s, si));
    case Note::about: return "about " + r;
  }
  return r;
}

// A figure this text chooses: `si` moved down (floor) or to the nearest step of the system.
double design_value(Kind k, System s, double si, bool floor) {
  const Precision& p = precision(k);
  const double step = s == System::ip ? p.step_ip : p.step_si;
  const double v = units::to_display(k, s, si) / step;
  return units::from_display(k, s, (floor ? std::floor(v + 1e-9) : std::round(v)) * step);
}

// --- Words ----------------------------------------------------------------------------------

struct QuantityWords {
  Quantity quantity;
  std::string_view outdoor, ret;
};
constexpr QuantityWords kWords[] = {
    {Quantity::dry_bulb, "outdoor-air dry-bulb temperature", "return-air dry-bulb temperature"},
    {Quantity::enthalpy, "outdoor-air enthalpy", "return-air enthalpy"},
    {Quantity::dew_point, "outdoor-air dew point", "return-air dew point"},
    {Quantity::humidity_ratio, "outdoor-air humidity ratio", "return-air humidity ratio"},
};
const QuantityWords& words(Quantity q) {
  for (const auto& w : kWords)
    if (w.quantity == q) return w;
  return kWords[0];
}

std::string join(const std::vector<std::string>& items, std::string_view sep) {
  std::string out;
  for (const auto& i : items) out += (out.empty() ? "" : std::string(sep)) + i;
  return out;
}

// Figures of this text that are design choices or common practice, per system.
struct FixedFigure {
  std::string_view ip, si;
  std::string_view pick(System s) const { return s == System::ip ? ip : si; }
};
constexpr double kLowLimitMarginF = 3.0;  // "a few degrees" below the mixed-air setpoint
constexpr double kLowLimitMarginK = 1.5;
constexpr double kFreezeExampleF = 38.0;  // common practice for low-temperature detection
constexpr FixedFigure kSensorRange{"-40 °F or above 130 °F", "-40 °C or above 55 °C"};
// Below this outdoor-to-return difference the fraction from temperatures is mostly sensor error
// (common practice).
constexpr FixedFigure kFractionGate{"10 °F", "5 K"};

// --- Sensors, as data -------------------------------------------------------------------

enum class Need { always, outdoor_humidity, return_humidity };

// One sensor of the list. The four a high-limit reads take their accuracy from the sensor
// set of the sensor-error study (the unit's [sensors] table, else its typical figures), so
// the accuracy written is the one the study assumed; the others carry a common-practice one.
struct SensorRow {
  Need need;
  std::string_view name;
  std::string_view location;
  std::string_view type;  // for the outdoor humidity sensor, the RH kind; see kHumidityTypes
  bool studied;
  sensors::Sensor sensor;
  FixedFigure accuracy;  // when not studied
};
constexpr SensorRow kSensors[] = {
    {Need::always,
     "Outdoor-air temperature",
     "in the outdoor-air intake ahead of the outdoor damper, in a ventilated sun shield, clear "
     "of relief and exhaust outlets and of heat from the roof",
     "thermistor or platinum resistance element",
     true,
     sensors::Sensor::outdoor_dry_bulb,
     {}},
    {Need::outdoor_humidity,
     "Outdoor-air humidity",
     "beside the outdoor-air temperature sensor, in the same shield",
     "capacitive relative-humidity element",
     true,
     sensors::Sensor::outdoor_humidity,
     {}},
    {Need::always,
     "Return-air temperature",
     "in the return duct ahead of the return damper and of any relief or exhaust connection, "
     "where the return air is well mixed",
     "thermistor or platinum resistance element, matched in accuracy to the outdoor sensor "
     "because their errors add when the two are compared",
     true,
     sensors::Sensor::return_dry_bulb,
     {}},
    {Need::return_humidity,
     "Return-air humidity",
     "beside the return-air temperature sensor",
     "capacitive relative-humidity element of the same make and range as the outdoor one",
     true,
     sensors::Sensor::return_rh,
     {}},
    {Need::always,
     "Mixed-air temperature",
     "after the outdoor and return dampers and ahead of the first coil, strung across the "
     "whole cross-section, because outdoor and return air stratify",
     "averaging element",
     false,
     {},
     {"±1 °F as an average", "±0.5 K as an average"}},
    {Need::always,
     "Supply-air temperature",
     "in the supply duct after the supply fan and the last coil, far enough downstream for "
     "the air to be mixed",
     "thermistor or platinum resistance element",
     false,
     {},
     {"±0.5 °F", "±0.3 K"}},
    {Need::always,
     "Low-temperature detection",
     "across the full face of the first coil that can freeze, after the mixing section, so "
     "that any short length of element in cold air trips it",
     "averaging capillary thermostat, hard-wired, with manual reset and the setpoint of "
     "paragraph 6.2",
     false,
     {},
     {}},
    {Need::always,
     "Supply-fan status",
     "on the supply-fan motor circuit, or across the fan",
     "current-sensing relay or differential-pressure switch, set to prove airflow and not "
     "merely power",
     false,
     {},
     {}},
    {Need::always,
     "Outdoor-damper position",
     "on the outdoor-damper actuator or shaft",
     "actuator position feedback or shaft-mounted position transmitter, so the commanded and "
     "actual positions can be compared",
     false,
     {},
     {"±5% of stroke", "±5% of stroke"}},
};

// What the outdoor humidity sensor is, by the kind the sensor set names.
struct HumidityType {
  sensors::HumidityKind kind;
  std::string_view type;
  std::string_view unit_suffix;  // after the accuracy figure
};
constexpr HumidityType kHumidityTypes[] = {
    {sensors::HumidityKind::relative_humidity, "capacitive relative-humidity element", " RH"},
    {sensors::HumidityKind::dew_point, "dew-point transmitter", " dew point"},
    {sensors::HumidityKind::enthalpy,
     "enthalpy transmitter (temperature and humidity elements reporting enthalpy)", ""},
};
const HumidityType& humidity_type(sensors::HumidityKind k) {
  for (const auto& h : kHumidityTypes)
    if (h.kind == k) return h;
  return kHumidityTypes[0];
}

bool needs(const highlimit::Strategy& st, Need n) {
  if (n == Need::always) return true;
  for (const auto& c : st.conditions) {
    if (c.quantity == Quantity::dry_bulb) continue;
    if (n == Need::outdoor_humidity) return true;
    if (n == Need::return_humidity && c.reference == Reference::return_air) return true;
  }
  return false;
}

// --- The code basis -------------------------------------------------------------------------

struct CodeView {
  const codes::ZoneRequirements* zone = nullptr;
  codes::StrategyCheck check;
  const codes::AllowedControl* allowed = nullptr;  // the allowed row of the matched type

  std::string edition_title() const { return zone->edition->title; }
  std::string cite(const codes::Row& r) const {
    return r.table.empty() ? fmt::format("{}, {}", edition_title(), r.clause)
                           : fmt::format("{}, {} ({})", edition_title(), r.clause, r.table);
  }
  double pressure() const { return zone->pressure_kpa.value_or(psychro::kStandardPressureKpa); }
};

CodeView code_view(const codes::ZoneRequirements* zone, const highlimit::Strategy& st) {
  CodeView v;
  v.zone = zone;
  if (zone == nullptr) return v;
  v.check = codes::check_strategy(*zone, st);
  for (const auto& a : zone->allowed)
    if (a.row == v.check.row) v.allowed = &a;
  return v;
}

// --- Composition ----------------------------------------------------------------------------

// What every section reads. The numbers of paragraphs another section cites are fixed here,
// before any section is written, so a section never depends on the order they are built in.
struct Context {
  const Inputs& in;
  const UnitFile& unit;
  const highlimit::Strategy& st;
  System s;
  CodeView code;
  int rank = 0;            // the strategy's place among the annual results, 1 = best; 0: none
  std::string annual_ref;  // the number of section 3's annual-evaluation paragraph, or empty

  std::string site_title() const { return unit.site.name.empty() ? in.unit_label : unit.site.name; }
  bool integrated() const {
    return unit.air_handler.economizer == airside::EconomizerType::integrated;
  }
  const airside::AirHandler& ah() const { return unit.air_handler; }
  std::string t(double c) const { return written(Kind::temperature, s, c); }
  std::string dt(double k) const { return written(Kind::temperature_difference, s, k); }
};

Context make_context(const Inputs& in, System s) {
  Context ctx{in, *in.unit, *in.strategy, s, code_view(in.code, *in.strategy), 0, {}};
  if (in.annual) {
    const auto& rs = in.annual->year->strategies;
    for (std::size_t i = 0; i < rs.size(); ++i)
      if (rs[i].name == ctx.st.name) ctx.rank = static_cast<int>(i) + 1;
    if (ctx.rank == 0)
      throw InputError(fmt::format("strategy '{}' is not among the annual results", ctx.st.name));
    // Section 3 is the first paragraph, one per condition, the action at the limit, then this.
    ctx.annual_ref = fmt::format("3.{}", ctx.st.conditions.size() + 3);
  }
  return ctx;
}

void add(Section& sec, std::string text) {
  sec.paragraphs.push_back(
      {fmt::format("{}.{}", sec.number, sec.paragraphs.size() + 1), std::move(text)});
}

void header(const Context& ctx, Document& d) {
  d.header.push_back(fmt::format("Unit file: {}", ctx.in.unit_label));
  d.header.push_back(fmt::format("High-limit strategy: {}", ctx.st.name));
  if (ctx.code.zone)
    d.header.push_back(fmt::format("Energy code: {}, climate zone {}", ctx.code.edition_title(),
                                   ctx.code.zone->zone));
  else
    d.header.push_back("Energy code: none named in the unit file's [site]");
  if (ctx.in.annual)
    d.header.push_back(fmt::format("Annual evaluation: weather {}", ctx.in.annual->weather_label));
  else
    d.header.push_back("Annual evaluation: not run for this text");
}

void general(const Context& ctx, Section& sec) {
  add(sec,
      fmt::format("This part of the sequence covers the air-side economizer of {}: the outdoor, "
                  "return and relief dampers, the high-limit control, mixed-air control, and the "
                  "mixed-air low-limit and freeze protection that override them. It is generated "
                  "from the unit file {}, and every setpoint in it is the figure the energy "
                  "analysis used; change a setpoint in the unit file and generate the text again, "
                  "so that the written sequence and the analysis stay the same.",
                  ctx.site_title(), ctx.in.unit_label));
  const bool ip = ctx.s == System::ip;
  add(sec,
      fmt::format("Temperatures are in {}; enthalpy is in {} of dry air, referred to dry air at {} "
                  "(the {} datum). Outdoor-air fractions are shares of the supply airflow. Each "
                  "setpoint states its basis: an energy-code clause, a design choice, or common "
                  "practice. A figure marked \"rounded\" cannot be written exactly in these units; "
                  "the figure the analysis used follows it, and that one governs.",
                  ip ? "°F" : "°C", ip ? "Btu per pound" : "kJ per kilogram", ip ? "0 °F" : "0 °C",
                  ip ? "IP" : "SI"));
}

void enable(const Context&, Section& sec) {
  add(sec,
      "The economizer shall be enabled only while all of the following hold: (a) the supply "
      "fan is proven running by its status input; (b) the unit is in occupied mode, or in a "
      "purge mode commanded by the building automation system; (c) cooling is required, that "
      "is, the mixed air with the outdoor damper at its ventilation minimum would be warmer "
      "than the mixed-air setpoint of paragraph 4.1; and (d) no condition of the high-limit "
      "of section 3 has locked it out, and the sensors that high-limit reads are healthy "
      "(paragraph 8.2).");
  add(sec,
      "While the economizer is disabled and the supply fan runs in occupied mode, the outdoor "
      "damper shall hold the ventilation minimum of paragraph 5.1 and the return damper shall "
      "be open.");
  add(sec,
      "When the supply fan is off, or the unit is unoccupied and not in purge, the outdoor "
      "damper shall close fully and the return damper shall open.");
}

// --- Section 3 ---

// The annual result the setpoint stands on; a strategy that did not rank first is said so.
std::string annual_support(const Context& ctx) {
  if (!ctx.in.annual) return {};
  const std::size_t n = ctx.in.annual->year->strategies.size();
  if (ctx.rank == 1)
    return fmt::format(
        " The annual evaluation of paragraph {} supports it: this strategy "
        "ranked first of the {} evaluated.",
        ctx.annual_ref, n);
  return fmt::format(
      " The annual evaluation of paragraph {} ranks this strategy {} of {}; "
      "weigh that before adopting it.",
      ctx.annual_ref, ctx.rank, n);
}

// A figure the code requires, as this text writes setpoints.
std::string required_text(const Context& ctx, Quantity q, Reference r, double value) {
  const Kind k = codes::setting_kind(q, r);
  if (r == Reference::fixed) return written(k, ctx.s, value, Note::source);
  if (std::fabs(value) < 1e-12) return "the return-air value itself, with no offset";
  return fmt::format("the return-air value {} {}", value > 0 ? "plus" : "minus",
                     written(k, ctx.s, std::fabs(value), Note::source));
}

// "fixed-dry-bulb (outdoor-air dry-bulb temperature above 65 °F)".
std::string allowed_text(const Context& ctx, const codes::AllowedControl& a) {
  if (!a.row->modelled) return fmt::format("{} ({})", a.row->control, a.row->description);
  std::vector<std::string> parts;
  for (const auto& r : a.settings)
    parts.push_back(fmt::format("{} above {}", words(r.quantity).outdoor,
                                required_text(ctx, r.quantity, r.reference, r.value)));
  return fmt::format("{} ({})", a.row->control, join(parts, " or "));
}

std::size_t lowest_condition(const Context& ctx, Quantity q, Reference r) {
  std::size_t best = 0;
  double lowest = 0;
  bool any = false;
  for (std::size_t i = 0; i < ctx.st.conditions.size(); ++i) {
    const Condition& c = ctx.st.conditions[i];
    double v = c.limit;
    Quantity cq = c.quantity;
    if (cq == Quantity::humidity_ratio && c.reference == Reference::fixed) {
      cq = Quantity::dew_point;
      v = psychro::dew_point_from_humidity_ratio_c(c.limit, ctx.code.pressure());
    }
    if (cq != q || c.reference != r) continue;
    if (!any || v < lowest) best = i, lowest = v, any = true;
  }
  return best;
}

std::string code_type_sentence(const Context& ctx) {
  const auto& z = *ctx.code.zone;
  std::vector<std::string> provenance;
  auto note = [&](const codes::Row* r) {
    if (r && std::find(provenance.begin(), provenance.end(), r->provenance) == provenance.end())
      provenance.push_back(r->provenance);
  };
  std::string out;
  switch (ctx.code.check.verdict) {
    case codes::Verdict::complies:
    case codes::Verdict::complies_if_selectable:
    case codes::Verdict::set_wrong:
      out = fmt::format("{} allows this control type in climate zone {}.",
                        ctx.code.cite(*ctx.code.check.row), z.zone);
      note(ctx.code.check.row);
      break;
    case codes::Verdict::not_allowed: {
      std::vector<std::string> allowed;
      for (const auto& a : z.allowed) {
        allowed.push_back(allowed_text(ctx, a));
        note(a.row);
      }
      note(ctx.code.check.row);
      out = fmt::format(
          "{} does not allow this control type ({}) in climate zone {}; it allows {}. The "
          "setpoints below are therefore design choices, and this high-limit does not meet "
          "that code as written.",
          ctx.code.cite(*ctx.code.check.row), ctx.code.check.matched->control, z.zone,
          allowed.empty() ? std::string("no modelled type") : join(allowed, "; "));
      break;
    }
    case codes::Verdict::not_evaluable:
      out = fmt::format(
          "Its conditions match no control type of the {} tables, so they cannot be checked "
          "against that code; the setpoints below are design choices.",
          ctx.code.edition_title());
      break;
  }
  if (!provenance.empty())
    out += fmt::format(" The code figures come from limitline's code tables ({}).",
                       join(provenance, "; "));
  return out;
}

std::string condition_basis(const Context& ctx, std::size_t i) {
  const Condition& c = ctx.st.conditions[i];
  if (!ctx.code.zone)
    return "design choice; the unit file names no energy code and climate zone to check it "
           "against." +
           (ctx.in.annual ? annual_support(ctx)
                          : std::string(" No annual evaluation was run for this text."));
  switch (ctx.code.check.verdict) {
    case codes::Verdict::not_allowed:
      return "design choice; the control type is not allowed in this climate zone (paragraph "
             "3.1)." +
             annual_support(ctx);
    case codes::Verdict::not_evaluable:
      return "design choice; it cannot be checked against the code (paragraph 3.1)." +
             annual_support(ctx);
    case codes::Verdict::complies:
    case codes::Verdict::complies_if_selectable:
    case codes::Verdict::set_wrong: break;
  }
  // The setting this condition stands for in the code's terms: a fixed humidity ratio is
  // read as the dew point it fixes at the site pressure, as the verdict reads it.
  Quantity q = c.quantity;
  double value = c.limit;
  if (q == Quantity::humidity_ratio && c.reference == Reference::fixed) {
    q = Quantity::dew_point;
    value = psychro::dew_point_from_humidity_ratio_c(c.limit, ctx.code.pressure());
  }
  const codes::MatchedSetting* m = nullptr;
  for (const auto& ms : ctx.code.check.matched->settings)
    if (ms.setting.quantity == q && ms.setting.reference == c.reference) m = &ms;
  const codes::RequiredSetting* req = nullptr;
  for (const auto& r : ctx.code.allowed->settings)
    if (r.quantity == q && r.reference == c.reference) req = &r;
  if (m == nullptr || req == nullptr)
    return "design choice; the code row sets no figure for this condition." + annual_support(ctx);
  const std::string where =
      fmt::format("{}, climate zone {}", ctx.code.cite(*ctx.code.check.row), ctx.code.zone->zone);
  if (std::fabs(m->setting.value - value) > 1e-9)
    return fmt::format(
               "design choice; condition {} sets the lower limit on the same quantity, "
               "and that one is the one {} judges.",
               lowest_condition(ctx, q, c.reference) + 1, where) +
           annual_support(ctx);
  const Kind sk = codes::setting_kind(q, c.reference);
  std::string required = required_text(ctx, q, c.reference, req->value);
  if (req->site_adjusted)
    required += fmt::format(" at the site pressure, from {} at sea level",
                            written(sk, ctx.s, req->tabulated, Note::source));
  std::string read_as;
  if (q != c.quantity)
    read_as = fmt::format(
        " This humidity-ratio limit is read as a dew point of {} at the site "
        "pressure.",
        written(Kind::temperature, ctx.s, value, Note::source));
  for (const auto& d : ctx.code.check.deviations) {
    if (d.quantity != q || d.reference != c.reference) continue;
    const Kind dk = highlimit::quantity_difference_kind(q);
    const bool above = d.difference() > 0;
    if (ctx.code.check.verdict == codes::Verdict::complies_if_selectable) {
      const codes::SelectableSetpoints& sel = *ctx.code.check.selectable;
      return fmt::format(
                 "{} requires, for this control type, {}; this setpoint is {} {} it, within "
                 "the {} that code allows a device whose setpoints are selectable in steps "
                 "({}; {}). It meets that code only if the controller offers no step nearer "
                 "the listed setting; on an adjustable controller, set the listed figure.{}",
                 where, required, written(dk, ctx.s, std::fabs(d.difference()), Note::source),
                 above ? "above" : "below",
                 written(dk, ctx.s, *sel.allowance(q, ctx.code.zone->compare_in), Note::source),
                 sel.table.empty() ? sel.clause : sel.table, sel.provenance, read_as) +
             annual_support(ctx);
    }
    return fmt::format(
               "design choice. {} requires, for this control type, {}; this setpoint is {} "
               "{} it, so the economizer would {}, and it does not meet that code as written.{}",
               where, required, written(dk, ctx.s, std::fabs(d.difference()), Note::source),
               above ? "above" : "below",
               above ? "stay on in air the code excludes" : "shut off earlier than the code sets",
               read_as) +
           annual_support(ctx);
  }
  const std::string from_code =
      ctx.st.source(i) == highlimit::SettingSource::code
          ? " The unit file leaves this setting out, so it is that code's figure."
          : "";
  return fmt::format("{}, which requires {}; this setpoint meets it.{}{}", where, required, read_as,
                     from_code) +
         annual_support(ctx);
}

std::string condition_paragraph(const Context& ctx, std::size_t i) {
  const Condition& c = ctx.st.conditions[i];
  const QuantityWords& w = words(c.quantity);
  const Kind vk = highlimit::quantity_kind(c.quantity);
  const Kind dk = highlimit::quantity_difference_kind(c.quantity);
  std::string out = fmt::format("Condition {}: lock out the economizer when the {} rises above ",
                                i + 1, w.outdoor);
  if (c.reference == Reference::fixed) {
    out += written(vk, ctx.s, c.limit) + ".";
    if (c.deadband > 0.0)
      out += fmt::format(" Release this lockout only when it falls below {}, a deadband of {}.",
                         written(vk, ctx.s, c.limit - c.deadband), written(dk, ctx.s, c.deadband));
    else
      out += fmt::format(
          " Release it as soon as the {} is back at or below that limit (no "
          "deadband).",
          w.outdoor);
  } else {
    out += "the " + std::string(w.ret);
    if (std::fabs(c.limit) > 1e-12)
      out += fmt::format(" {} {}", c.limit > 0 ? "plus" : "minus",
                         written(dk, ctx.s, std::fabs(c.limit)));
    out += ".";
    if (c.deadband > 0.0)
      out += fmt::format(
          " Release this lockout only when it falls more than {} below that "
          "value (the deadband).",
          written(dk, ctx.s, c.deadband));
    else
      out += " Release it as soon as it is back at or below that value (no deadband).";
  }
  out += " Basis: " + condition_basis(ctx, i);
  if (c.deadband > 0.0)
    out +=
        " The deadband is a design choice that keeps the dampers from cycling at the limit; "
        "the code tables set none.";
  return out;
}

std::string energy(const Context& ctx, double v) {
  const report::Measure m(ctx.s, ctx.unit.plant);
  return fmt::format("{} {}", number_text(m.display(v), m.is_cost() ? 2 : 0, ctx.s), m.unit());
}
std::string hours(const Context& ctx, double h) {
  return fmt::format("{} h", number_text(h, 0, ctx.s));
}

std::string annual_paragraph(const Context& ctx) {
  const annual::YearResult& y = *ctx.in.annual->year;
  const annual::StrategyResult& r = y.strategies[static_cast<std::size_t>(ctx.rank - 1)];
  const double saved = r.savings_vs_no_economizer_kwh;
  std::string out = fmt::format(
      "Annual evaluation: with the weather of {} and this unit's occupancy schedule ({} of "
      "fan operation), this strategy ranked {} of the {} strategies evaluated for the unit. It "
      "falls {} short of the perfect changeover (the ideal high-limit, which enables the "
      "economizer in exactly the hours when that costs less) and {} {} against no economizer. "
      "It economized for {}, {} of them with mechanical cooling; it was enabled for {} when "
      "that cost more energy than not, and stayed off for {} when economizing would have "
      "saved energy.",
      ctx.in.annual->weather_label, hours(ctx, y.operating_hours), ctx.rank, y.strategies.size(),
      energy(ctx, std::max(0.0, r.shortfall_vs_perfect_kwh)), saved >= 0 ? "saves" : "costs",
      energy(ctx, std::fabs(saved)), hours(ctx, r.annual.hours_economizing),
      hours(ctx, r.annual.hours_integrated), hours(ctx, r.annual.harmful_hours),
      hours(ctx, r.annual.missed_hours));
  if (ctx.rank > 1)
    out +=
        fmt::format(" The best strategy evaluated, \"{}\", falls {} short.", y.strategies[0].name,
                    energy(ctx, std::max(0.0, y.strategies[0].shortfall_vs_perfect_kwh)));
  out += ctx.unit.plant
             ? " Figures are the cost of electricity for cooling and fuel for heating, at the "
               "plant efficiencies and prices of the unit file."
             : " Energy is cooling and heating at the coils, weighted as the unit file sets.";
  out += fmt::format(
      " The air handler was modelled at {}.",
      report::describe_model(ctx.unit.control, ctx.unit.space,
                             ctx.unit.loads_file ? ctx.unit.loads_file->path : "", ctx.s));
  return out;
}

void high_limit(const Context& ctx, Section& sec) {
  const std::size_t n = ctx.st.conditions.size();
  std::string first = fmt::format(
      "The high-limit is \"{}\"{}. {} The economizer shall be locked out while any "
      "condition below has tripped, and enabled again only when every condition has cleared; "
      "a reading exactly at its limit does not trip a condition.",
      ctx.st.name,
      ctx.st.preset.empty() ? ", with conditions set in the unit file"
                            : fmt::format(", of the {} type", ctx.st.preset),
      n == 1 ? std::string("It has one condition.")
             : fmt::format("It has {} conditions, joined by OR.", n));
  if (ctx.unit.strategies_defaulted)
    first += ctx.st.code_source.empty()
                 ? " The unit file names no strategy, so this is the first preset at "
                   "limitline's common-practice settings."
                 : fmt::format(
                       " The unit file names no strategy, so this is the first preset, "
                       "with the settings of {} (the code its site names).",
                       ctx.st.code_source);
  if (ctx.code.zone) first += " " + code_type_sentence(ctx);
  add(sec, first);
  for (std::size_t i = 0; i < n; ++i) add(sec, condition_paragraph(ctx, i));
  add(sec,
      "At the limit: when any condition trips, the outdoor damper shall return to the "
      "ventilation minimum of paragraph 5.1, the return damper shall open to match, and "
      "mechanical cooling shall carry the load to the supply-air setpoint. The economizer "
      "shall stay locked out until the tripped condition has cleared as stated above.");
  if (ctx.in.annual) add(sec, annual_paragraph(ctx));
}

// --- Section 4 ---

std::string integration_paragraph(const Context& ctx) {
  std::string out;
  if (ctx.integrated())
    out =
        "Integrated operation: when the outdoor damper is at the limit of paragraph 4.2 and "
        "the mixed air is still above the setpoint of paragraph 4.1, the outdoor damper shall "
        "stay at that limit and mechanical cooling shall make up the rest of the load to the "
        "supply-air setpoint. Running mechanical cooling shall neither lock out the "
        "economizer nor move the outdoor damper; only the high-limit of section 3, the "
        "protections of section 6 and the modes of section 2 take it off economizer "
        "operation.";
  else
    out =
        "Non-integrated operation: this unit does not run the economizer and mechanical "
        "cooling together. When the outdoor damper is at the limit of paragraph 4.2 and the "
        "mixed air is still above the setpoint of paragraph 4.1, the economizer shall be "
        "locked out, the outdoor damper shall return to the ventilation minimum of paragraph "
        "5.1, and mechanical cooling shall carry the whole load. The economizer shall be "
        "enabled again only when the outdoor-air dry-bulb temperature has fallen below the "
        "mixed-air setpoint of paragraph 4.1, after any minimum run time the compressor "
        "manufacturer sets.";
  if (!ctx.code.zone) {
    out += " Basis: design choice; no energy code is named to check it against.";
  } else {
    const auto ic =
        codes::check_integration(*ctx.code.zone->edition, ctx.unit.air_handler.economizer);
    if (!ic.rule->required)
      out += fmt::format(
          " Basis: design choice; limitline's tables for {} set no integration "
          "requirement.",
          ctx.code.edition_title());
    else if (ic.complies)
      out += fmt::format(
          " Basis: {}, {}, which requires an integrated economizer; this unit "
          "meets it.",
          ctx.code.edition_title(), ic.rule->clause);
    else
      out += fmt::format(
          " Basis: design choice. {}, {}, requires an integrated economizer, so "
          "this operation does not meet that code as written.",
          ctx.code.edition_title(), ic.rule->clause);
  }
  if (ctx.in.annual)
    out +=
        fmt::format(" The annual evaluation of paragraph {} used this operation.", ctx.annual_ref);
  return out;
}

void modulation(const Context& ctx, Section& sec) {
  const auto& a = ctx.ah();
  std::string out = fmt::format(
      "While the economizer is enabled, the outdoor and return dampers shall modulate in "
      "opposition to hold the mixed-air temperature at {}: ",
      ctx.t(a.mixed_air_target_c()));
  if (a.fan_heat_k > 0.0)
    out += fmt::format(
        "the supply-air setpoint of {} less {} for the heat of the {} supply "
        "fan{}.",
        ctx.t(a.supply_air_temp_c), ctx.dt(a.fan_heat_k),
        airside::fan_position_name(a.fan_position),
        a.fan_position == airside::FanPosition::draw_through
            ? ", which adds it after the cooling coil"
            : ", which adds it ahead of the cooling coil");
  else
    out += fmt::format("the supply-air setpoint of {}, with no supply-fan heat allowed for.",
                       ctx.t(a.supply_air_temp_c));
  if (const auto& r = ctx.unit.control.reset)
    out += fmt::format(
        " The supply-air setpoint shall be reset on outdoor dry-bulb: {} at or below {} "
        "outdoor, {} at or above {}, in a straight line between; the mixed-air setpoint "
        "follows it, less the fan heat.",
        ctx.t(r->supply_at_low_c), ctx.t(r->outdoor_low_c), ctx.t(r->supply_at_high_c),
        ctx.t(r->outdoor_high_c));
  out +=
      " Basis: design choice; the supply-air setpoint, its reset and the fan heat are the "
      "unit's, as the analysis used them.";
  add(sec, out);
  add(sec, fmt::format("The outdoor damper shall open no further than {} outdoor air{}. Basis: "
                       "design choice, set by the damper and relief capacity; the analysis used "
                       "this limit.",
                       written(Kind::fraction, ctx.s, a.max_oa_fraction),
                       a.max_oa_fraction >= 1.0 ? " (fully open)" : ""));
  add(sec, integration_paragraph(ctx));
  add(sec,
      "As the outdoor damper opens, relief dampers or a return or relief fan shall keep the "
      "building pressure the design sets; building pressurisation is the designer's "
      "responsibility.");
}

// --- Section 5 ---

void minimum(const Context& ctx, Section& sec) {
  const auto& a = ctx.ah();
  std::string amount;
  if (ctx.unit.min_outdoor_airflow_m3_per_s)
    amount = fmt::format("{} of outdoor air ({} of the design supply airflow of {})",
                         written(Kind::airflow, ctx.s, *ctx.unit.min_outdoor_airflow_m3_per_s),
                         written(Kind::fraction, ctx.s, a.min_oa_fraction, Note::about),
                         written(Kind::airflow, ctx.s, a.supply_airflow_m3_per_s));
  else
    amount = fmt::format(
        "{} outdoor air ({} at the design supply airflow of {})",
        written(Kind::fraction, ctx.s, a.min_oa_fraction),
        written(Kind::airflow, ctx.s, a.min_oa_fraction * a.supply_airflow_m3_per_s, Note::about),
        written(Kind::airflow, ctx.s, a.supply_airflow_m3_per_s));
  add(sec, fmt::format(
               "Whenever the supply fan runs in occupied mode, the outdoor damper shall admit at "
               "least the ventilation minimum of {}, whatever the economizer and the mixed-air "
               "low-limit call for; only the freeze protection of paragraph 6.2 may close it "
               "further. Where the supply airflow varies, the minimum position shall be reset, or "
               "the outdoor airflow measured, so that the airflow rather than the damper position "
               "is held. Basis: the ventilation minimum is the designer's responsibility, from the "
               "ventilation calculation the adopted mechanical code requires; this is the figure "
               "the analysis used.",
               amount));
}

// --- Section 6 ---

void protection(const Context& ctx, Section& sec) {
  const double target = ctx.ah().mixed_air_target_c();
  const double margin =
      units::from_display(Kind::temperature_difference, ctx.s,
                          ctx.s == System::ip ? kLowLimitMarginF : kLowLimitMarginK);
  const double low = design_value(Kind::temperature, ctx.s, target - margin, true);
  const double freeze = design_value(Kind::temperature, ctx.s,
                                     units::celsius_from_fahrenheit(kFreezeExampleF), false);
  const std::string clash =
      low <= freeze + 1e-9
          ? fmt::format(
                " At this supply-air setpoint the low-limit is not above the {} "
                "common-practice figure of paragraph 6.2; the designer must set the "
                "two apart.",
                ctx.t(freeze))
          : std::string();
  add(sec, fmt::format(
               "Mixed-air low-limit: if the mixed-air temperature falls below {}, a low-limit loop "
               "shall override the mixed-air control of paragraph 4.1 and move the outdoor damper "
               "towards the ventilation minimum of paragraph 5.1, never below it; heating, where "
               "fitted, then makes up the supply-air setpoint. Basis: design choice, {} below the "
               "mixed-air setpoint ({} below it is common practice); it guards the coils against "
               "stratified cold air and is not part of the annual evaluation. Keep it above the "
               "low-temperature detection setpoint of paragraph 6.2.{}",
               ctx.t(low), written(Kind::temperature_difference, ctx.s, target - low, Note::about),
               ctx.dt(margin), clash));

  add(sec, fmt::format(
               "Freeze protection: when the low-temperature detection of section 7 senses air "
               "below its setpoint along any part of its element, the outdoor damper shall close "
               "fully, overriding the ventilation minimum, the return damper shall open, and an "
               "alarm shall be raised (paragraph 8.7); fan and heating-valve actions follow the "
               "unit's freeze-protection design. The device shall act without the controller and "
               "reset only by hand. The setpoint is the designer's responsibility; {} is common "
               "practice.",
               ctx.t(freeze)));
}

// --- Section 7 ---

void sensor_list(const Context& ctx, Section& sec) {
  const sensors::SensorSet set = sensors::read_sensors(
      ctx.unit.sensors ? &*ctx.unit.sensors : nullptr, ctx.unit.path, ctx.unit.units);
  const bool derived = ctx.st.needs(Quantity::enthalpy) || ctx.st.needs(Quantity::humidity_ratio);
  for (const SensorRow& row : kSensors) {
    if (!needs(ctx.st, row.need)) continue;
    std::string type(row.type), accuracy;
    if (row.studied) {
      const sensors::HumidityKind kind = set.outdoor_humidity;
      std::string suffix;
      if (row.sensor == sensors::Sensor::outdoor_humidity) {
        type = humidity_type(kind).type;
        suffix = humidity_type(kind).unit_suffix;
      }
      if (row.sensor == sensors::Sensor::return_rh) suffix = " RH";
      const double a = sensors::at(set.accuracy, row.sensor);
      const std::string figure =
          written(sensors::bias_kind(row.sensor, kind), ctx.s, a, Note::source);
      accuracy = fmt::format("{} or better, the figure the sensor-error study assumes ({})",
                             set.distribution == sensors::BiasDistribution::normal
                                 ? fmt::format("{}{} as one standard deviation", figure, suffix)
                                 : fmt::format("±{}{}", figure, suffix),
                             set.given[static_cast<std::size_t>(row.sensor)]
                                 ? "from the unit file's [sensors] table"
                                 : "a typical commercial figure, common practice");
      if (row.sensor == sensors::Sensor::outdoor_humidity ||
          row.sensor == sensors::Sensor::return_rh)
        accuracy += "; check or replace it yearly, because humidity elements drift";
    } else if (!row.accuracy.pick(ctx.s).empty()) {
      accuracy = fmt::format("{} (common practice)", row.accuracy.pick(ctx.s));
    }
    std::string out = fmt::format("{}: {}; {}", row.name, row.location, type);
    out += accuracy.empty() ? "." : fmt::format("; accuracy {}.", accuracy);
    if (row.need == Need::outdoor_humidity && derived)
      out += fmt::format(
          " {} shall be computed, by the controller or the transmitter, at the site's design "
          "pressure of {}, as the analysis did; a sea-level calculation misstates it at "
          "altitude.",
          ctx.st.needs(Quantity::enthalpy) ? "Enthalpy" : "Humidity ratio",
          written(Kind::pressure, ctx.s, ctx.unit.site.design_pressure_kpa(), Note::about));
    add(sec, out);
  }
}

// --- Sections 8 and 9 ---

// The alarms of section 8 that find a fault of an energy code's fault-detection list, in this
// sequence's words; section 9 cites them by fault. Paragraph 8.1 introduces them, so the
// alarm at index i is paragraph 8.(i + 2); the low-temperature alarm follows them.
struct Alarm {
  codes::Fault fault;
  std::string (*text)(const Context&);
};
constexpr Alarm kAlarms[] = {
    {codes::Fault::sensor_fault,
     [](const Context& ctx) {
       return fmt::format(
           "Sensor out of range: raise an alarm when any sensor of section 7 reads outside its "
           "physical range (an open or short circuit, a temperature below {}, a humidity below "
           "0% or above 100% RH) or does not change at all for 24 hours. While a sensor the "
           "high-limit reads is in alarm, the economizer shall stay locked out.",
           kSensorRange.pick(ctx.s));
     }},
    {codes::Fault::damper_not_modulating,
     [](const Context&) {
       return std::string(
           "Damper not following command: raise an alarm when the outdoor-damper position "
           "differs from its command by more than 10% of stroke for more than 5 minutes.");
     }},
    {codes::Fault::economizing_when_locked_out,
     [](const Context&) {
       return std::string(
           "Damper open while locked out: raise an alarm when the outdoor damper stands more "
           "than 10% of stroke above its ventilation-minimum position for more than 15 minutes "
           "while (a) the high-limit of section 3 has locked the economizer out, or (b) the "
           "outdoor-air dry-bulb temperature is above the return-air dry-bulb temperature.");
     }},
    {codes::Fault::not_economizing_when_allowed,
     [](const Context&) {
       return std::string(
           "Damper shut while enabled: raise an alarm when the outdoor damper stays at its "
           "ventilation-minimum position for more than 15 minutes while paragraph 2.1 enables "
           "the economizer, or when the high-limit reports a lockout although the readings put "
           "every condition of section 3 below its limit.");
     }},
    {codes::Fault::outdoor_air_above_minimum,
     [](const Context& ctx) {
       return fmt::format(
           "Outdoor air above the minimum: while the economizer is disabled, compute the "
           "outdoor-air fraction from the outdoor, return and mixed-air temperatures, only "
           "while outdoor and return air differ by at least {}; raise an alarm when it exceeds "
           "the ventilation minimum of section 5 by more than 10 percentage points for more "
           "than 15 minutes.",
           kFractionGate.pick(ctx.s));
     }},
};

std::string alarm_paragraph(std::size_t index) { return fmt::format("8.{}", index + 2); }

void alarms(const Context& ctx, Section& sec) {
  add(sec,
      "The alarms below report faults that waste energy or starve the ventilation. Their "
      "thresholds and delays are design choices, to be tuned in commissioning.");
  for (const Alarm& a : kAlarms) add(sec, a.text(ctx));
  add(sec,
      "Low temperature: raise an alarm whenever the freeze protection of paragraph 6.2 acts; "
      "it shall stay in alarm until reset by hand.");
}

void fault_detection(const Context& ctx, Section& sec) {
  const codes::Edition* e = ctx.code.zone ? ctx.code.zone->edition : nullptr;
  if (!e || !e->fault_detection) {
    add(sec, e ? fmt::format("{} has no economizer fault-detection clause in limitline's code "
                             "tables (from memory). The alarms of section 8 are common "
                             "practice all the same.",
                             e->title)
               : std::string("The unit file names no energy code, so no fault-detection clause "
                             "is cited. The alarms of section 8 are common practice all the "
                             "same; where the adopted code requires economizer fault detection, "
                             "its clause governs."));
    return;
  }
  const codes::FaultDetection& d = *e->fault_detection;
  const System compare_in = ctx.code.zone->compare_in;
  const int last = 4 + (d.status.empty() ? 0 : 1) + (d.testing.empty() ? 0 : 1);
  std::string scope = fmt::format(
      "{}, {}, requires economizer fault detection and diagnostics (the clause is recalled "
      "from memory; the adopted edition governs). The units it covers: {}",
      e->title, d.clause, d.applies_to);
  if (const auto kw = d.threshold_kw(compare_in))
    scope +=
        fmt::format(" It applies from a cooling capacity of {}.", written(Kind::power, ctx.s, *kw));
  add(sec,
      scope + fmt::format(" Where this unit is one of them, paragraphs 9.2 to 9.{} apply.", last));
  std::string sensors = "Sensors: " + join(d.sensors, ", ") + " shall be installed permanently";
  if (const auto acc = d.sensor_accuracy_k(compare_in))
    sensors += fmt::format(", each accurate to within {}{}",
                           written(Kind::temperature_difference, ctx.s, *acc),
                           d.accuracy_range.empty() ? "" : " over " + d.accuracy_range);
  add(sec, sensors + "; where section 7 asks for better, section 7 governs.");
  if (!d.status.empty())
    add(sec, "Status: the unit controller shall show " + join(d.status, "; ") + ".");
  if (!d.testing.empty()) add(sec, "Testing: " + d.testing);
  std::string faults = "Faults: the controller shall detect and report";
  for (std::size_t k = 0; k < d.faults.size(); ++k) {
    const codes::RequiredFault& f = d.faults[k];
    std::string where;
    for (std::size_t i = 0; i < std::size(kAlarms); ++i)
      if (kAlarms[i].fault == f.fault) where = ", the alarm of paragraph " + alarm_paragraph(i);
    faults += fmt::format("{} ({}) {} (the code's \"{}\"{})", k == 0 ? ":" : ";",
                          static_cast<char>('a' + k), codes::fault_description(f.fault),
                          f.code_term, where);
  }
  add(sec, faults + ".");
  add(sec, "Reporting: " + d.reporting);
  // 9.1 cites the paragraphs just written.
  if (sec.paragraphs.size() != static_cast<std::size_t>(last))
    throw std::logic_error("sequence: section 9 has a paragraph 9.1 does not cite");
}

// The sections in their order: numbers, titles and the function that writes each.
struct SectionSpec {
  int number;
  std::string_view title;
  void (*write)(const Context&, Section&);
};
constexpr SectionSpec kSections[] = {
    {1, "General", general},
    {2, "Economizer enable", enable},
    {3, "High-limit control", high_limit},
    {4, "Damper modulation and mechanical cooling", modulation},
    {5, "Minimum outdoor air", minimum},
    {6, "Mixed-air low-limit and freeze protection", protection},
    {7, "Sensors", sensor_list},
    {8, "Alarms", alarms},
    {9, "Fault detection and diagnostics", fault_detection},
};

Document build(const Context& ctx) {
  Document d;
  d.title = fmt::format("Economizer sequence of operation: {}", ctx.site_title());
  header(ctx, d);
  for (const SectionSpec& spec : kSections) {
    Section& sec = d.sections.emplace_back(Section{spec.number, std::string(spec.title), {}});
    spec.write(ctx, sec);
  }
  d.cautions = report::cautions(report::CautionTopic::sequence);
  return d;
}

// --- Rendering ------------------------------------------------------------------------------

// Unit labels stay on the line of their number when text is wrapped.
constexpr std::string_view kUnitWords[] = {"°F",   "°C",   "K",   "Btu/lb", "kJ/kg", "cfm",
                                           "m³/s", "psia", "kPa", "lb/lb",  "kg/kg", "h",
                                           "kBtu", "kWh",  "RH",  "ft",     "m"};
bool is_unit_word(std::string_view w) {
  while (!w.empty() && std::string_view(".,;:)").find(w.back()) != std::string_view::npos)
    w.remove_suffix(1);
  return std::find(std::begin(kUnitWords), std::end(kUnitWords), w) != std::end(kUnitWords);
}

std::size_t display_width(std::string_view s) {
  std::size_t n = 0;
  for (unsigned char c : s)
    if ((c & 0xC0) != 0x80) ++n;
  return n;
}

// Words wrapped to `width` columns, each line after the first indented by `indent` spaces.
std::string wrap(std::string_view first_prefix, std::string_view text, std::size_t width) {
  const std::size_t indent = display_width(first_prefix);
  std::string out(first_prefix);
  std::size_t col = indent;
  bool line_empty = true;
  std::size_t pos = 0;
  while (pos < text.size()) {
    const std::size_t end = std::min(text.find(' ', pos), text.size());
    const std::string_view word = text.substr(pos, end - pos);
    pos = end + 1;
    if (word.empty()) continue;
    const std::size_t w = display_width(word);
    // A number and its unit move to the next line together.
    const std::size_t next = std::min(text.find(' ', pos), text.size());
    const std::size_t glued = pos < text.size() && is_unit_word(text.substr(pos, next - pos))
                                  ? 1 + display_width(text.substr(pos, next - pos))
                                  : 0;
    if (!line_empty && col + 1 + w + glued > width) {
      out += "\n" + std::string(indent, ' ');
      col = indent;
      line_empty = true;
    }
    if (!line_empty) {
      out += ' ';
      ++col;
    }
    out += word;
    col += w;
    line_empty = false;
  }
  return out + "\n";
}

constexpr std::size_t kTextWidth = 92;

}  // namespace

const Paragraph* Document::find(std::string_view number) const {
  for (const auto& s : sections)
    for (const auto& p : s.paragraphs)
      if (p.number == number) return &p;
  return nullptr;
}

std::string setpoint_text(units::Kind kind, units::System system, double si_value) {
  return written(kind, system, si_value);
}

Document compose(const Inputs& in, units::System units) {
  if (in.unit == nullptr || in.strategy == nullptr)
    throw std::logic_error("sequence::compose: unit and strategy are required");
  if (in.strategy->conditions.empty())
    throw InputError(
        fmt::format("{}: strategy '{}' has no conditions; a high-limit needs at "
                    "least one",
                    in.unit_label, in.strategy->name));
  if (in.annual && in.annual->year == nullptr)
    throw std::logic_error("sequence::compose: annual support without results");
  return build(make_context(in, units));
}

std::string to_text(const Document& d) {
  std::string out = d.title + "\n" + std::string(display_width(d.title), '=') + "\n\n";
  for (const auto& h : d.header) out += wrap("", h, kTextWidth);
  for (const auto& s : d.sections) {
    out += fmt::format("\n{}. {}\n\n", s.number, s.title);
    for (const auto& p : s.paragraphs) out += wrap(p.number + "  ", p.text, kTextWidth);
  }
  out += "\nCautions\n\n";
  for (const auto& c : d.cautions) out += wrap("- ", c, kTextWidth);
  return out;
}

std::string to_markdown(const Document& d) {
  std::string out = "# " + d.title + "\n\n";
  for (const auto& h : d.header) out += "- " + h + "\n";
  out += "\n";
  for (const auto& s : d.sections) {
    out += fmt::format("## {}. {}\n\n", s.number, s.title);
    for (const auto& p : s.paragraphs) out += fmt::format("**{}** {}\n\n", p.number, p.text);
  }
  out += "## Cautions\n\n";
  for (const auto& c : d.cautions) out += "- " + c + "\n";
  return out;
}

std::optional<codes::ZoneRequirements> site_requirements(const UnitFile& unit,
                                                         const codes::CodeTables& tables) {
  const Site& site = unit.site;
  if (site.energy_code.empty() && site.climate_zone.empty()) return std::nullopt;
  if (site.climate_zone.empty())
    throw InputError(
        fmt::format("{}: an energy code is named but no climate_zone; the sequence "
                    "cites both or neither (add climate_zone = \"4A\" to [site])",
                    site.energy_code_origin));
  if (site.energy_code.empty())
    throw InputError(
        fmt::format("{}: a climate zone is named but no energy_code; the sequence "
                    "cites both or neither (add energy_code = \"ashrae-90.1-2019\" "
                    "to [site])",
                    site.climate_zone_origin));
  std::optional<double> pressure;
  if (site.pressure_kpa || site.elevation_m) pressure = site.design_pressure_kpa();
  const codes::Edition& e = tables.edition(site.energy_code, site.energy_code_origin);
  return codes::requirements(e, site.climate_zone, {pressure, {}}, site.climate_zone_origin);
}

}  // namespace limitline::sequence
