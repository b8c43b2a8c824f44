#pragma once
// Energy-code high-limit requirements (data/codes/*.toml) and compliance of strategies.
//
// The code tables are data: one TOML file per edition, loaded at run time, plus any number of
// extra files (a new edition, or an [amendment] whose rows replace an edition's rows for the
// zones they name). the README section 'Energy-code tables' describes the format. Every shipped
// value is recalled from memory and says so in its `provenance`; the tables must be verified before
// use.
//
// Compliance is judged per control type: a strategy's conditions are matched to a strategy
// preset, the edition's row for that preset in the zone says whether it is allowed and with
// which settings, and each setting is compared within a stated tolerance.
#include <limitline/model/airside.hpp>
#include <limitline/model/highlimit.hpp>
#include <limitline/model/units.hpp>

#include <cstdint>
#include <filesystem>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

namespace limitline::codes {

// --- Tolerances -------------------------------------------------------------------------

// A setting complies when it is within this of the required figure, in the units the verdict
// compares in: half the last digit of a controller set to one decimal (common practice).
inline constexpr double kTemperatureToleranceF = 0.05;      // °F, and °F of an offset
inline constexpr double kTemperatureToleranceK = 0.05;      // °C, and K of an offset
inline constexpr double kEnthalpyToleranceBtuPerLb = 0.05;  // Btu/lb, and of an offset
inline constexpr double kEnthalpyToleranceKjPerKg = 0.05;   // kJ/kg, and of an offset

// The IP and SI figures of a row must agree within this once converted (the SI figure may be
// rounded to a whole unit, as the SI edition of 90.1 prints them).
inline constexpr double kStoredAgreementK = 0.5;
inline constexpr double kStoredAgreementKjPerKg = 0.5;

// The altitude footnote of fixed enthalpy ("at altitudes substantially different from sea
// level") is applied when the site enthalpy of the footnote's state differs from its sea-level
// value by more than this (about 1,300 ft, 400 m, at 75 °F and 50 % RH by eqs. 3 and 6): half the
// table's whole-Btu/lb rounding.
inline constexpr double kAltitudeFootnoteThresholdBtuPerLb = 0.5;

// --- Climate zones ----------------------------------------------------------------------

enum class ZoneSystem { ashrae169, california };
std::string_view zone_system_name(ZoneSystem s);  // "ashrae-169", "california"

// Every zone of a zone system, in table order (ASHRAE 169: 0A, 0B, 1A … 8; California: CZ1 …
// CZ16). An edition lists the subset it has.
std::span<const std::string_view> all_zones(ZoneSystem s);

// The canonical spelling of a zone ("4a" → "4A"; "12", "cz 12" → "CZ12"), or InputError
// naming `origin` and what is allowed (zones 7 and 8 have no A/B/C split).
std::string normalise_zone(ZoneSystem s, std::string_view text, std::string_view origin);

// --- Tables -----------------------------------------------------------------------------

enum class Permission { allowed, prohibited };
std::string_view permission_name(Permission p);

// One setting a control type takes, as the row stores it in both systems. Fixed references
// are limits (°F/°C, Btu/lb/kJ/kg with their datums); return references are offsets added to
// the return-air value (°F/K, Btu/lb/kJ/kg of difference).
struct StoredLimit {
  highlimit::Quantity quantity;
  highlimit::Reference reference;
  double ip;
  double si;
};

// The altitude footnote: the fixed enthalpy limit at a site is the enthalpy of this state at
// the site pressure.
struct SiteEnthalpyRule {
  double dry_bulb_f;
  double dry_bulb_c;
  double relative_humidity;  // fraction
};

struct Row {
  std::string control;  // a strategy preset name; any name when !modelled
  bool modelled = true;
  Permission permission = Permission::allowed;
  std::vector<std::string> zones;
  std::vector<StoredLimit> limits;  // allowed, modelled rows: one per preset condition, in order
  std::optional<SiteEnthalpyRule> site_enthalpy;
  std::string description;
  std::string clause;
  std::string table;
  std::vector<std::string> footnotes;
  std::string provenance;
  std::string origin;  // "file:line" of the row
};

struct IntegrationRule {
  bool required = false;
  std::string clause;
  std::string requirement;
  std::string provenance;
  std::string origin;
};

// --- Whether an economizer is required ------------------------------------------------------

// The agreement the IP and SI capacity thresholds of a requirement must show (the SI edition
// of 90.1 prints 54,000 Btu/h, 15.8 kW, as a rounded figure): a twentieth of the threshold.
inline constexpr double kCapacityAgreementShare = 0.05;

// One group of zones of an edition's economizer requirement: exempt, or required from a
// cooling capacity on.
struct RequirementGroup {
  std::vector<std::string> zones;
  bool required = false;
  double capacity_ip = 0.0;  // kBtu/h, as stored (required groups)
  double capacity_si = 0.0;  // kW, as stored
  bool inclusive = true;     // required at the threshold itself ("at or above"), not only over it
  std::string note;
  std::string provenance;
  std::string origin;  // "file:line" of the group
  // The threshold in kW from the figure of `compare_in`.
  double threshold_kw(units::System compare_in) const;
};

// When an edition requires an air economizer on a cooling system: the groups cover every
// zone exactly once; the exceptions limitline cannot weigh (a water economizer instead, an
// efficiency trade-off, process humidification ...) are kept as text.
struct EconomizerRequirement {
  std::string clause;
  std::string table;
  std::string requirement;  // in our words
  std::vector<std::string> exceptions;
  std::string provenance;
  std::string origin;
  std::vector<RequirementGroup> groups;
  const RequirementGroup* group(std::string_view zone) const;
};

// The footnote of editions that let a device whose setpoints are selectable in steps, rather
// than adjustable, be set to the available setting nearest the listed one, within an
// allowance per quantity (fixed limits only: an offset from the return air has no listed
// setting to step around).
struct SelectableAllowance {
  highlimit::Quantity quantity;
  double ip;  // °F or Btu/lb of difference, as stored
  double si;  // K or kJ/kg of difference
};
struct SelectableSetpoints {
  std::string clause;
  std::string table;
  std::string note;  // in our words
  std::vector<SelectableAllowance> allowances;
  std::string provenance;
  std::string origin;
  // The allowance of a fixed limit of `quantity` (SI difference) from the figure of
  // `compare_in`, or none when the footnote does not cover the quantity.
  std::optional<double> allowance(highlimit::Quantity quantity, units::System compare_in) const;
};

// --- Economizer fault detection --------------------------------------------------------------
// The faults an economizer fault-detection requirement asks a unit to find, in limitline's own
// names; an edition's table quotes each in the code's own words beside it.
enum class Fault : std::uint8_t {
  sensor_fault,                  // an air-temperature sensor failed or reads wrong
  not_economizing_when_allowed,  // the high-limit allows outdoor air, the damper stays shut
  economizing_when_locked_out,   // the high-limit locks outdoor air out, the damper is open
  damper_not_modulating,         // the damper does not move as commanded
  outdoor_air_above_minimum,     // more outdoor air than the minimum while not economizing
};
inline constexpr std::size_t kFaultCount = 5;
std::string_view fault_name(Fault f);         // "sensor-fault", ... (the tables' spelling)
std::string_view fault_description(Fault f);  // one line, our words
std::optional<Fault> fault_from_name(std::string_view name);
std::string fault_names();  // for messages: "sensor-fault, not-economizing-when-allowed, ..."

struct RequiredFault {
  Fault fault;
  std::string code_term;  // the code's own words for it, quoted with the clause
};

// What an edition requires of economizer fault detection and diagnostics: which units, which
// sensors at what accuracy, what the controller shows, which faults it finds, how it reports.
struct FaultDetection {
  std::string clause;
  std::string applies_to;  // in our words
  // The cooling capacity from which it applies (kBtu/h and kW as stored); none: any size the
  // clause covers.
  std::optional<double> capacity_ip, capacity_si;
  std::vector<std::string> sensors;  // to be installed permanently
  // Accuracy of the air-temperature sensors (°F and K of difference); none: not stated.
  std::optional<double> sensor_accuracy_ip, sensor_accuracy_si;
  std::string accuracy_range;       // over which the accuracy holds, as text ("40–80 °F")
  std::vector<std::string> status;  // what the unit controller displays
  std::string testing;              // how each mode can be tested; empty: not stated
  std::string reporting;            // where faults are reported
  std::vector<RequiredFault> faults;
  std::string provenance;
  std::string origin;  // "file:line"
  [[nodiscard]] const RequiredFault* find(Fault f) const;
  // Whether a unit of this cooling capacity (kW) is large enough for the clause, compared
  // with the stored figure of `compare_in`; true when the clause has no threshold. Whether
  // the unit is of the type the clause covers (`applies_to`) is for the reader to judge.
  [[nodiscard]] bool covers_capacity(double capacity_kw, units::System compare_in) const;
  // The threshold (kW) and the sensor accuracy (K) from the stored figure of `compare_in`;
  // none where the clause states none.
  [[nodiscard]] std::optional<double> threshold_kw(units::System compare_in) const;
  [[nodiscard]] std::optional<double> sensor_accuracy_k(units::System compare_in) const;
};

struct Edition {
  std::string id;  // "ashrae-90.1-2019"
  std::string title;
  ZoneSystem zone_system = ZoneSystem::ashrae169;
  std::vector<std::string> zones;
  units::System governing_units = units::System::ip;
  std::string si_note;
  std::string provenance;
  IntegrationRule integration;
  std::optional<EconomizerRequirement> economizer_requirement;  // none: the file gives none
  std::optional<SelectableSetpoints> selectable;                // none: no such footnote
  std::optional<FaultDetection> fault_detection;                // none: the edition requires none
  std::vector<Row> rows;
  std::vector<std::string> sources;  // the edition's file, then each amendment applied

  // The row of a control type that covers a zone, or nullptr.
  const Row* row(std::string_view control, std::string_view zone) const;
  // Control types with rows: the presets in preset order, then the others in file order.
  std::vector<std::string> controls() const;
  bool has_zone(std::string_view zone) const;
};

class CodeTables {
 public:
  // Every *.toml in `dir` (in name order), then each extra file in the order given. Throws
  // InputError naming file, line and key for a malformed table, and for a zone not covered
  // exactly once by a control type.
  static CodeTables load(const std::filesystem::path& dir,
                         std::span<const std::filesystem::path> extra = {});
  // The same from the code-table folder of code_table_dir().
  static CodeTables load_installed(std::span<const std::filesystem::path> extra = {});
  // From TOML documents in memory: (origin name, text) pairs, in order. For tests and tools.
  static CodeTables from_documents(std::span<const std::pair<std::string, std::string>> documents);

  std::span<const Edition> editions() const { return editions_; }
  // InputError naming `origin` and listing the loaded editions when the id is unknown.
  const Edition& edition(std::string_view id, std::string_view origin = "--edition") const;
  const Edition* find(std::string_view id) const;

 private:
  std::vector<Edition> editions_;
};

// The folder holding the code tables: $LIMITLINE_DATA_DIR/codes when that variable is set
// (InputError when it has no such folder), else the installed data folder, else the source
// tree's data/codes.
std::filesystem::path code_table_dir();

// --- Requirements of a zone -------------------------------------------------------------

// Where and how a zone's requirements are evaluated.
struct SiteConditions {
  std::optional<double> pressure_kpa;  // none: sea level, the table's figures as printed
  // Which stored figure verdicts compare with; none: the edition's governing units.
  std::optional<units::System> compare_in;
};

// A setting as a strategy has it (SI; offsets as differences).
struct Setting {
  highlimit::Quantity quantity;
  highlimit::Reference reference;
  double value;
};

// A setting the code requires at this site.
struct RequiredSetting {
  highlimit::Quantity quantity;
  highlimit::Reference reference;
  double value;                 // SI, from the compared figure, after the altitude footnote
  double tabulated;             // SI, the compared figure before the altitude footnote
  bool site_adjusted;           // the altitude footnote set `value`
  double stored_ip, stored_si;  // the row's two figures
};

// One allowed control type in a zone.
struct AllowedControl {
  const Row* row;
  std::vector<RequiredSetting> settings;  // empty when the type is not modelled
  // The preset with the required settings (and the given deadbands); rows that are not
  // modelled have none.
  std::optional<highlimit::Strategy> strategy(
      const highlimit::PresetSettings& base = highlimit::preset_defaults()) const;
};

struct ZoneRequirements {
  const Edition* edition;
  std::string zone;
  std::optional<double> pressure_kpa;
  units::System compare_in;
  std::vector<AllowedControl> allowed;  // in Edition::controls() order
  std::vector<const Row*> prohibited;
};

// InputError when the zone is not one of the edition's (naming `origin`). `zone` may be in
// any spelling normalise_zone() accepts.
ZoneRequirements requirements(const Edition& edition, std::string_view zone,
                              const SiteConditions& site, std::string_view origin = "--zone");

// A unit's [site] energy_code and climate_zone checked against the installed tables, for the
// commands that do not otherwise look them up: both or neither, a loaded edition, a zone of
// it. Errors start with the origin of the key at fault ("FILE:LINE: site.energy_code"). No
// table is read when the site names neither.
void check_site_code(std::string_view edition, std::string_view edition_origin,
                     std::string_view zone, std::string_view zone_origin);

// The fixed enthalpy limit of the altitude footnote at a pressure: h(t, φ, p), kJ/kg.
double site_enthalpy_kj_per_kg(const SiteEnthalpyRule& rule, units::System compare_in,
                               double pressure_kpa);

// --- Matching a strategy to a control type ----------------------------------------------

struct MatchedSetting {
  Setting setting;
  int conditions = 1;                // how many of the strategy's conditions it stands for
  bool from_humidity_ratio = false;  // a fixed humidity-ratio limit read as a dew point
};

struct MatchedControl {
  std::string control;                   // preset name
  std::vector<MatchedSetting> settings;  // in the preset's condition order
};

// The preset a strategy's conditions are equivalent to, or none. Equivalences used: several
// conditions on the same quantity and reference act as the lowest limit (they are ORed); a
// fixed humidity-ratio limit equals the dew-point limit of that humidity ratio at
// `pressure_kpa`; deadbands do not change the type. Condition order does not matter.
std::optional<MatchedControl> match_control(const highlimit::Strategy& strategy,
                                            double pressure_kpa);

// --- Verdicts ---------------------------------------------------------------------------

enum class Verdict { complies, complies_if_selectable, not_allowed, set_wrong, not_evaluable };
// One word each: "complies", "complies-if-selectable", "not-allowed", "set-wrong",
// "not-evaluable". complies-if-selectable: off the listed setting by more than the tolerance
// but within the edition's selectable-setpoint allowance, so it complies only on a device
// whose setpoints come in steps and offers none nearer the listed one.
std::string_view verdict_word(Verdict v);

struct Deviation {
  highlimit::Quantity quantity;
  highlimit::Reference reference;
  double actual;                                           // SI
  double required;                                         // SI
  double difference() const { return actual - required; }  // > 0: above the requirement
};

struct StrategyCheck {
  Verdict verdict = Verdict::not_evaluable;
  std::optional<MatchedControl> matched;
  const Row* row = nullptr;  // the deciding row (allowed or prohibited); null when no match
  // set_wrong, complies_if_selectable: every setting off by more than the tolerance
  std::vector<Deviation> deviations;
  // complies_if_selectable: the footnote that allows it
  const SelectableSetpoints* selectable = nullptr;
  // Settings to use instead: the same type with the required settings when it is allowed,
  // otherwise every allowed type, those sharing the strategy's quantities first.
  std::vector<AllowedControl> instead;
};

StrategyCheck check_strategy(const ZoneRequirements& zone, const highlimit::Strategy& strategy);

// Tolerance for a setting of `quantity`, in the display units of `system`.
double tolerance(highlimit::Quantity quantity, units::System system);

struct IntegrationCheck {
  bool complies;
  const IntegrationRule* rule;
};
IntegrationCheck check_integration(const Edition& edition, airside::EconomizerType type);

// One word per strategy for the annual report's compliance column (verdict_word of each).
// An unknown edition or zone is an InputError starting with the matching origin.
std::vector<std::string> compliance_words(const CodeTables& tables, std::string_view edition,
                                          std::string_view zone, std::optional<double> pressure_kpa,
                                          std::span<const highlimit::Strategy> strategies,
                                          std::string_view edition_origin = "energy_code",
                                          std::string_view zone_origin = "climate_zone");
// The same for requirements already looked up.
std::vector<std::string> compliance_words(const ZoneRequirements& zone,
                                          std::span<const highlimit::Strategy> strategies);

// --- Economizer requirement of a unit ----------------------------------------------------

enum class Need { required, below_threshold, exempt_zone, no_table };
// "required", "not required (below the threshold)", "not required in this zone", "not
// stated (the edition's file has no requirement table)".
std::string_view need_text(Need n);

struct NeedCheck {
  Need need = Need::no_table;
  const EconomizerRequirement* table = nullptr;
  const RequirementGroup* group = nullptr;  // the zone's group (null with no_table)
  double threshold_kw = 0.0;                // required groups: in the compared figure
};
// The zone's answer alone (a required group gives `required`), or for a unit with its
// cooling capacity (kW): required when the capacity reaches the threshold.
NeedCheck economizer_need(const ZoneRequirements& zone,
                          std::optional<double> capacity_kw = std::nullopt);

// "an air economizer is required from 54.0 kBtu/h (at or above) of cooling capacity".
std::string threshold_text(const NeedCheck& n, units::System system);

// --- Preset settings from the code --------------------------------------------------------

// The settings each strategy left to its preset's default (SettingSource::common_practice)
// take the code's required value where the zone's row for that preset allows it; those
// settings become SettingSource::code and the strategy's code_source names the edition and
// zone. A preset the zone prohibits keeps its common-practice settings (its verdict says
// not-allowed). Custom conditions and written settings are never changed.
void apply_code_defaults(std::vector<highlimit::Strategy>& strategies,
                         const ZoneRequirements& zone);

// The code in words for SettingSource::code: "ANSI/ASHRAE/IES Standard 90.1-2019 zone 4A,
// Table 6.5.1.1.3, from memory" (the row's provenance up to its first ';').
std::string code_source_text(const ZoneRequirements& zone, const Row& row);

// --- Text -------------------------------------------------------------------------------

// Unit kind of a setting (temperature, enthalpy, or their differences for offsets).
units::Kind setting_kind(highlimit::Quantity q, highlimit::Reference r);
// Key stem + unit suffix, as in the TOML rows and JSON output: "dry_bulb_f",
// "enthalpy_kj_per_kg", "dry_bulb_offset_delta_f".
std::string setting_key(highlimit::Quantity q, highlimit::Reference r, units::System system);
// "outdoor dry-bulb > 75.0 °F", "outdoor enthalpy > return + 0.0 Btu/lb".
std::string setting_text(const Setting& s, units::System system);
// "outdoor enthalpy > 28.0 Btu/lb or outdoor dry-bulb > 75.0 °F" (or the row's description
// for a type that is not modelled).
std::string control_text(const AllowedControl& c, units::System system);
// "dry-bulb limit 75.0 °F is 5.0 °F above the required 70.0 °F".
std::string deviation_text(const Deviation& d, units::System system);
// One sentence: what the verdict is and why.
std::string verdict_text(const StrategyCheck& check, const ZoneRequirements& zone,
                         units::System system);

}  // namespace limitline::codes
