#pragma once
// What every picture of the report layer draws with: the house palette, numbers written for
// SVG, text with an optional paper halo, the document's opening tag and round tick steps.
// Private to the report layer (not installed).
#include <string>
#include <string_view>
#include <vector>

namespace limitline::report::svg {

// Warm drafting paper and blue-black ink; the three outcome colours match the chart's cells.
inline constexpr std::string_view kFont =
    "'DejaVu Sans', 'Segoe UI', 'Helvetica Neue', Arial, sans-serif";
inline constexpr std::string_view kPaper = "#fbf8f1";
inline constexpr std::string_view kInk = "#1f3347";
inline constexpr std::string_view kInkSoft = "#55606b";
inline constexpr std::string_view kGridMinor = "#ebe4d6";
inline constexpr std::string_view kGridMajor = "#d6ccb8";
inline constexpr std::string_view kEconomize = "#3d8f62";       // enabling pays
inline constexpr std::string_view kDoNotEconomize = "#c8623c";  // enabling costs energy
inline constexpr std::string_view kNoCooling = "#7288ad";       // minimum air is cool enough

// A coordinate with two decimals; std::logic_error when it is not finite (a NaN must never
// reach a picture).
[[nodiscard]] std::string num(double v);

// <text> with the content escaped; `halo` paints a paper-coloured stroke behind the glyphs so
// the text reads over lines and cells.
[[nodiscard]] std::string text(double x, double y, std::string_view content, std::string_view attrs,
                               bool halo = false);

// The opening <svg> of a standalone document of the given size, with its accessible label.
[[nodiscard]] std::string open(double width, double height, std::string_view label);

// The 1-2-5 step that divides [0, peak] into at most `max_steps` steps (1 when peak ≤ 0).
[[nodiscard]] double round_step(double peak, int max_steps);

// A tick value as text: whole numbers without decimals, others with one.
[[nodiscard]] std::string tick_label(double v);

}  // namespace limitline::report::svg
