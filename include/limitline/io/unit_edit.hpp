#pragma once
// Editing a unit file's text one setting at a time, for the study page: the page's form
// changes keys, and the edited text is what the user downloads, so it must reproduce the
// page's state exactly when run through any command. The result is re-validated by the caller
// with parse_unit_file, which gives the same one-line errors as for a file on disk.
#include <span>
#include <string>
#include <string_view>
#include <vector>

namespace limitline {

// A setting the page shows: its path ("air_handler.supply_air_temp", "strategy[2].dry_bulb_limit"),
// a label, and its value as written in the file ("" when the file leaves it out).
struct UnitField {
  std::string path;
  std::string label;
  std::string value;
};

// The settings of `text` worth a form: the air handler's, the loads and plant when the file
// has those tables, the site's energy code, and each [[strategy]]'s preset settings and
// deadbands (those it gives, and the ones its preset reads). InputError as parse_unit_file
// when the text is no valid TOML.
std::vector<UnitField> editable_fields(std::string_view text, std::string_view name);

struct UnitEdit {
  std::string path;   // as in UnitField
  std::string value;  // as typed: "55F", "20%", "3.2"; empty removes the key
};

// `text` with each edit applied, re-written by the TOML serializer (comments do not survive
// an edit; the file as uploaded is returned unchanged when `edits` is empty). A value takes
// the type of the key it replaces (string or number); a new key is a number when it reads as
// one, else a string. InputError naming the path when it is not one editable_fields offers.
std::string edit_unit_text(std::string_view text, std::string_view name,
                           std::span<const UnitEdit> edits);

// `text` naming `weather_file` in its [weather] table, so that the unit file saved beside that
// file reproduces a study run on it: with `columns_by_header` the table holds only the file (the
// weather was read by its own header), else its column settings stay. Re-written as
// edit_unit_text does; InputError as parse_unit_file when the text is no valid TOML.
std::string with_weather_file(std::string_view text, std::string_view name,
                              std::string_view weather_file, bool columns_by_header);

}  // namespace limitline
