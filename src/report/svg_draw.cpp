#include "svg_draw.hpp"

#include <limitline/report/html.hpp>

#include <fmt/format.h>

#include <cmath>
#include <stdexcept>

namespace limitline::report::svg {

std::string num(double v) {
  if (!std::isfinite(v)) throw std::logic_error("picture: non-finite coordinate");
  if (std::fabs(v) < 0.005) v = 0.0;
  return fmt::format("{:.2f}", v);
}

std::string text(double x, double y, std::string_view content, std::string_view attrs, bool halo) {
  return fmt::format(
      "<text x=\"{}\" y=\"{}\" {}{}>{}</text>\n", num(x), num(y), attrs,
      halo ? fmt::format(" stroke=\"{}\" stroke-width=\"3\" stroke-linejoin=\"round\" "
                         "paint-order=\"stroke\"",
                         kPaper)
           : "",
      html_escape(content));
}

std::string open(double width, double height, std::string_view label) {
  return fmt::format(
      "<svg xmlns=\"http://www.w3.org/2000/svg\" viewBox=\"0 0 {0} {1}\" width=\"{0}\" "
      "height=\"{1}\" font-family=\"{2}\" role=\"img\" aria-label=\"{3}\">\n",
      num(width), num(height), html_escape(kFont), html_escape(label));
}

double round_step(double peak, int max_steps) {
  if (!(peak > 0) || max_steps < 1) return 1.0;
  const double raw = peak / max_steps;
  const double mag = std::pow(10.0, std::floor(std::log10(raw)));
  for (double f : {1.0, 2.0, 5.0, 10.0})
    if (f * mag >= raw * (1 - 1e-12)) return f * mag;
  return 10.0 * mag;
}

std::string tick_label(double v) {
  if (std::fabs(v) < 1e-9) v = 0.0;
  return std::fabs(v - std::round(v)) < 1e-9 ? fmt::format("{:.0f}", v) : fmt::format("{:.1f}", v);
}

}  // namespace limitline::report::svg
