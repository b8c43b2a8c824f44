#pragma once
// A table of already-formatted cells, rendered as aligned text, CSV or Markdown.
#include <string>
#include <string_view>
#include <vector>

namespace limitline::report {

enum class Align { left, right };

struct Column {
  std::string title;
  Align align = Align::right;
};

class Table {
 public:
  explicit Table(std::vector<Column> columns) : columns_(std::move(columns)) {}

  // Adds a row; it must have one cell per column (std::logic_error otherwise).
  void add_row(std::vector<std::string> cells);
  // A horizontal rule between groups of rows (text and Markdown only).
  void add_rule();

  std::size_t rows() const { return rows_.size(); }

  std::string text() const;      // aligned columns for a terminal
  std::string csv() const;       // RFC 4180: quoted where needed
  std::string markdown() const;  // pipe table

 private:
  std::vector<Column> columns_;
  std::vector<std::vector<std::string>> rows_;  // an empty row is a rule
};

// Text from the user (a site, unit, strategy or file name) as literal Markdown: the
// characters Markdown or the HTML inside it would read as markup (< & | * _ ` [ ] \)
// are backslash-escaped, and line breaks and other control characters become spaces, so a
// name can neither inject raw HTML nor break a table or a list.
std::string markdown_escape(std::string_view text);

// Quotes a CSV field when it holds a comma, quote or line break (RFC 4180).
std::string csv_field(const std::string& s);

// Display width of UTF-8 text in terminal columns (code points; our text has no wide glyphs).
std::size_t display_width(const std::string& s);

}  // namespace limitline::report
