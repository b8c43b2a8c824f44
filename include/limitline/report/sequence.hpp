#pragma once
// The economizer part of a written sequence of operation, generated from the unit file so that
// the words a specifier pastes and the numbers the analysis used cannot drift apart.
//
// The document is built as data (numbered sections of numbered paragraphs) and only then
// rendered as plain text or Markdown, so tests can compare paragraphs and every format says
// the same thing. Each setpoint is written in the chosen units with the fewest decimals that
// state it exactly; a figure that cannot be written exactly (a converted value) is rounded and
// followed by the figure the analysis used.
#include <limitline/analysis/annual.hpp>
#include <limitline/io/codes.hpp>
#include <limitline/model/highlimit.hpp>
#include <limitline/io/unit_file.hpp>
#include <limitline/model/units.hpp>

#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

namespace limitline::sequence {

struct Paragraph {
  std::string number;  // "3.2"
  std::string text;    // one paragraph, no line breaks
};

struct Section {
  int number = 0;
  std::string title;
  std::vector<Paragraph> paragraphs;
};

struct Document {
  std::string title;
  std::vector<std::string> header;  // "Unit file: …", "High-limit: …", one fact each
  std::vector<Section> sections;
  std::vector<std::string> cautions;  // report::cautions(CautionTopic::sequence)

  // The paragraph with this number, or nullptr.
  const Paragraph* find(std::string_view number) const;
};

// The annual evaluation that supports the design-choice setpoints.
struct AnnualSupport {
  const annual::YearResult* year = nullptr;  // ranked results, the chosen strategy among them
  std::string weather_label;                 // where the weather came from
};

struct Inputs {
  const UnitFile* unit = nullptr;
  std::string unit_label;  // the path, or "embedded demo unit …"
  const highlimit::Strategy* strategy = nullptr;
  // The site's edition and climate zone, when [site] names both (see site_requirements()).
  const codes::ZoneRequirements* code = nullptr;
  std::optional<AnnualSupport> annual;
};

// Builds the sequence. The accuracies of the sensors a high-limit reads are those of the
// sensor-error study (the unit's [sensors] table, else typical figures). Throws InputError
// when the strategy has no conditions, when the [sensors] table is malformed, or when the
// strategy is missing from the annual results it is said to be supported by.
Document compose(const Inputs& in, units::System units);

std::string to_text(const Document& d);
std::string to_markdown(const Document& d);

// The requirements of the unit's [site] energy_code and climate_zone, at the site pressure
// when the site gives an elevation or pressure; none when the site names neither. Naming only
// one of the two is an InputError (a sequence cannot cite half a code reference); so are an
// unknown edition or zone (the messages name the file and line of the key).
std::optional<codes::ZoneRequirements> site_requirements(const UnitFile& unit,
                                                         const codes::CodeTables& tables);

// A configured value as a specifier writes it: "65 °F", "53.5 °F", "28 Btu/lb", "20%", or,
// when no short decimal states it exactly, "18.3 °C (rounded; the analysis used 65 °F)".
std::string setpoint_text(units::Kind kind, units::System system, double value_si);

}  // namespace limitline::sequence
