#pragma once
// A climate survey: the designer's question (which high-limit, at what setpoint) asked for
// many sites at once, and answered by climate zone. This header holds what one site
// contributes (a SiteRecord, in SI and in the ranking's measure) and the summary of a zone
// built from records; reading manifests, running the sites and the partial-result files are
// the app layer's (app/survey.hpp), formatting the report layer's (report/survey.hpp).
#include <limitline/model/units.hpp>

#include <cstddef>
#include <optional>
#include <string>
#include <vector>

namespace limitline::survey {

// What every site of one survey shares: its inputs and the settings it ran with. Shards of
// one survey carry the same SurveyInfo; only those can be merged.
struct SurveyInfo {
  std::string manifest;     // the manifest (or folder) as given
  std::string unit;         // the template unit file, or "embedded demo unit NAME"
  std::string fingerprint;  // of the manifest's bytes, the unit's and the settings below
  std::size_t rows = 0;     // sites in the whole manifest (every shard)
  units::System units = units::System::ip;  // of the tuning grids and of the reports
  bool tune = false;                        // best setpoints swept per site
  std::string currency;  // the [plant]'s: the ranking's measure is a cost; empty: energy
  std::vector<std::string> unit_warnings;  // of the template unit file, once for all sites
  std::string version;                     // of limitline
};

// One setting of a tuned strategy: a condition's limit or offset (SI: °C, K, kJ/kg, kg/kg).
struct Setting {
  std::string condition;  // "dry-bulb limit", "enthalpy offset", ...
  units::Kind kind = units::Kind::temperature;
  double value = 0;
};

// One strategy's year at one site.
struct StrategyFigures {
  std::string name;
  std::string compliance;  // the code's word ("complies", ...); empty when no code is known
  double shortfall = 0;    // against the perfect changeover, in the ranking's measure
  double savings = 0;      // against no economizer, same measure
  double harmful_hours = 0, missed_hours = 0;
  // With tuning: the best setting over the swept grid, what it falls short by, its verdict.
  std::vector<Setting> best_setting;
  std::optional<double> tuned_shortfall;
  std::string tuned_compliance;
};

struct SiteRecord {
  std::size_t row = 0;  // 0-based data row of the manifest (the shard key)
  int line = 0;         // the manifest line (1-based; 0 for a folder entry)
  std::string site;     // as named in the manifest, else the weather file's stem
  std::string weather;  // the weather file as the manifest names it
  std::string zone;     // climate zone as written; empty when none is known
  std::string code;     // energy-code edition as written; empty when none
  bool ok = false;
  std::string error;                  // the one-line error of a failed site
  std::vector<std::string> warnings;  // implausible values and mismatches, one line each
  // Whether the site's code requires an economizer on this unit (its cooling capacity in
  // its zone): codes::need_text, "required", "not required in this zone", ...; empty
  // without a code.
  std::string economizer;
  double operating_hours = 0;
  double perfect_savings = 0;  // the perfect changeover's savings (the tie tolerance's scale)
  double tolerance = 0;        // the tie tolerance (analysis/decision.hpp)
  std::vector<StrategyFigures> strategies;  // best first (ranked by shortfall)
  std::vector<std::string> best;            // the best and those tied with it
  std::vector<std::string> best_compliant;  // the same among those that comply
};

// The summary of one strategy over the sites of a zone that evaluated it.
struct StrategySummary {
  std::string name;
  int sites = 0;           // sites of the zone where the strategy was evaluated
  int wins = 0;            // best, or tied with the best
  int compliant_wins = 0;  // best among the compliant, or tied with it
  int compliant = 0;       // sites where the code allows it as set (complies*)
  double median_shortfall = 0, worst_shortfall = 0;
  // Shortfall as a share of the site's perfect-changeover savings (sites with savings only).
  std::optional<double> median_share, worst_share;
  std::vector<double> shares;  // one per such site, in manifest order (for the picture)
  // With tuning: the median best setting of each condition over the zone's sites.
  std::vector<Setting> median_best_setting;
};

struct ZoneSummary {
  std::string zone;  // as the first site wrote it; "" for sites with no zone
  int sites_ok = 0, sites_failed = 0;
  int economizer_required = 0, economizer_judged = 0;  // sites whose code says, of this unit
  std::vector<std::string> codes;                      // the editions its sites name, in order seen
  std::vector<StrategySummary> strategies;             // by median shortfall, then first seen
};

// Accumulates records (any order) into one summary per zone. Zones are compared without
// case or spaces ("4a" is "4A"); they are listed in natural order (2A before 10), the sites
// with no zone last. Memory: a few numbers per site and strategy.
class SummaryBuilder {
 public:
  void add(const SiteRecord& r);
  [[nodiscard]] std::vector<ZoneSummary> zones() const;

 private:
  struct Values {
    std::string name;
    int wins = 0, compliant_wins = 0, compliant = 0;
    std::vector<double> shortfall, share;
    std::vector<std::string> conditions;
    std::vector<units::Kind> kinds;
    std::vector<std::vector<double>> settings;  // per condition
  };
  struct Zone {
    std::string key, zone;
    int ok = 0, failed = 0, required = 0, judged = 0;
    std::vector<std::string> codes;
    std::vector<Values> strategies;
  };
  std::vector<Zone> zones_;
};

// The median of `v` (the mean of the middle two for an even count); 0 for none.
[[nodiscard]] double median(std::vector<double> v);

}  // namespace limitline::survey
