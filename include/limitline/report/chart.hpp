#pragma once
// Pictures of the report layer as standalone SVG (no external references, no scripts):
//
// - the psychrometric chart at the site pressure, with each high-limit strategy's boundary
//   (the edge of the region where it lets the economizer run), the return air, the mixed-air
//   target, a climate's occupied hours binned and coloured by what the perfect changeover
//   does with them, and optionally one checked operating point;
//
// Everything is computed in SI and shown in the chosen unit system. The chart maps dry-bulb
// linearly to x and humidity ratio linearly to y; ChartGeometry is that map, exposed so that
// tests can read coordinates back out of the SVG.
#include <limitline/analysis/annual.hpp>
#include <limitline/model/highlimit.hpp>
#include <limitline/model/units.hpp>

#include <cstdint>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

namespace limitline::report {

// A state on the chart: dry-bulb °C, humidity ratio kg/kg (the chart's pressure fixes the rest).
struct ChartPoint {
  double dry_bulb_c = 0.0;
  double humidity_ratio = 0.0;
};

// The plot rectangle in SVG user units (y grows downwards).
struct PlotArea {
  double left = 0.0, top = 0.0, width = 0.0, height = 0.0;
};

// Linear map between (dry-bulb, humidity ratio) and SVG coordinates. Humidity ratio 0 is the
// bottom edge of the plot, `humidity_ratio_max` the top; the dry-bulb range spans the width.
class ChartGeometry {
 public:
  // std::invalid_argument when the ranges or the area are empty or not finite.
  ChartGeometry(double dry_bulb_min_c, double dry_bulb_max_c, double humidity_ratio_max,
                PlotArea area);

  double x(double dry_bulb_c) const;
  double y(double humidity_ratio) const;
  double dry_bulb_c(double x) const;
  double humidity_ratio(double y) const;

  double dry_bulb_min_c() const { return t_min_; }
  double dry_bulb_max_c() const { return t_max_; }
  double humidity_ratio_max() const { return w_max_; }
  const PlotArea& area() const { return area_; }

 private:
  double t_min_, t_max_, w_max_;
  PlotArea area_;
};

// What the perfect changeover does with an occupied hour.
enum class HourOutcome : std::uint8_t { economize, do_not_economize, no_cooling_needed };
inline constexpr std::size_t kHourOutcomeCount = 3;
std::string_view hour_outcome_name(HourOutcome o);  // "economize", "do not economize", ...

// One occupied interval of a climate: its true outdoor state, occupied hours and outcome.
struct ClimateHour {
  ChartPoint outdoor;
  double hours = 0.0;
  HourOutcome outcome = HourOutcome::no_cooling_needed;
};

// The fan-on intervals of a prepared year, classified: no cooling needed when the mixed air at
// the ventilation minimum is at or below target; otherwise economize when enabling pays (the
// perfect changeover's decision), do not economize when it does not.
std::vector<ClimateHour> climate_hours(const annual::Prepared& prepared);

// Size of one overlay cell in display units.
struct BinSize {
  double dry_bulb;               // °F or °C
  double humidity_ratio;         // gr/lb or g/kg
  double dry_bulb_origin = 0.0;  // a column edge, °F or °C: columns start here every dry_bulb
};

// The cell size the chart uses for `climate`: 1 °F × 5 gr/lb (IP) or 0.5 °C × 0.5 g/kg (SI).
// Dry-bulbs recorded in whole degrees (of either system, also when stored as tenths of the
// other) get columns one reading step wide, centred on the readings: 1 °F or 5/9 °C for whole
// °F, 1.8 °F or 1 °C for whole °C. Each side is then doubled (up to four times) while the data
// still leave empty stripes between filled cells, which would be an artefact of the
// recording, not of the climate.
BinSize overlay_bin_size(std::span<const ClimateHour> climate, units::System s);

// One operating point checked on its own: outdoor and return air and the mixed air the
// damper makes of them.
struct CheckMarks {
  ChartPoint outdoor;
  ChartPoint ret;
  ChartPoint mixed;
  double oa_fraction = 0.0;  // outdoor-air fraction of `mixed`
  std::string note;          // what the mixed point is, e.g. "perfect changeover: economize"
};

struct ChartInput {
  std::string title;  // the unit or site
  double pressure_kpa = 101.325;
  std::string pressure_basis;  // "standard pressure at 33 ft", "site pressure as given"
  units::System units = units::System::ip;
  std::vector<highlimit::Strategy> strategies;  // numbered and coloured in this order
  ChartPoint return_air;                        // differential limits are drawn against it
  double mixed_air_target_c = 12.8;
  std::vector<ClimateHour> climate;  // empty: no overlay
  std::string climate_label;         // where the hours came from
  std::optional<CheckMarks> check;
};

// The geometry psychrometric_chart_svg() draws with: a default range per unit system
// (20–110 °F, up to 180 gr/lb; −5–45 °C, up to 26 g/kg) widened to whole ticks so every
// climate hour, mark and fixed limit of `in` is on the chart.
ChartGeometry chart_geometry(const ChartInput& in);

// The chart as a standalone SVG document. Throws InputError (via psychro) when a state of the
// input is outside the range of the property equations.
std::string psychrometric_chart_svg(const ChartInput& in);

// Colour of the i-th strategy (cycles), shared by every picture and the HTML legend.
std::string_view strategy_colour(std::size_t index);

}  // namespace limitline::report
