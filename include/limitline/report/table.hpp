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
  // A key column (the rank, the strategy) is repeated at the left of every stacked part of a
  // table too wide for its text width; the others go to the part of their `group` (0 first:
  // the figures a reader decides on; higher groups the secondary ones), a group still too wide
  // being split again in column order.
  bool key = false;
  int group = 0;
};

// The width text tables and lines fit by default (a common terminal), and "no limit".
inline constexpr std::size_t kTextWidth = 100;
inline constexpr std::size_t kUnlimitedWidth = static_cast<std::size_t>(-1);

class Table {
 public:
  explicit Table(std::vector<Column> columns) : columns_(std::move(columns)) {}

  // Adds a row; it must have one cell per column (std::logic_error otherwise).
  void add_row(std::vector<std::string> cells);
  // A horizontal rule between groups of rows (text and Markdown only).
  void add_rule();

  std::size_t rows() const { return rows_.size(); }

  // Aligned columns for a terminal, as one table when it fits `width` display columns, else as
  // stacked parts (see Column) separated by a blank line. Left-aligned key cells are cut in the
  // middle with "…" only when the keys alone would take more than half the width.
  std::string text(std::size_t width = kTextWidth) const;
  // The stacked parts by group, each with the key columns: for pages that show the first part
  // and fold the others away. One part when every column is in group 0.
  std::vector<Table> parts() const;
  std::string csv() const;       // RFC 4180: quoted where needed
  std::string markdown() const;  // pipe table

 private:
  // The table of some columns, left-aligned key cells cut to `key_budget` display columns.
  Table select(const std::vector<std::size_t>& cols, std::size_t key_budget) const;
  std::vector<std::size_t> widths() const;  // display width of each column

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

// Text laid out for a terminal `width` columns wide: each prose line longer than that is
// wrapped at spaces, its continuation indented like the line (past a leading "- " or "N. ").
// Lines with a run of two spaces after their indent are table rows and left alone, as are
// words longer than the width.
std::string fit_lines(std::string_view text, std::size_t width = kTextWidth);

}  // namespace limitline::report
