#include <limitline/report/table.hpp>

#include <stdexcept>

namespace limitline::report {

std::size_t display_width(const std::string& s) {
  std::size_t n = 0;
  for (unsigned char c : s)
    if ((c & 0xC0) != 0x80) ++n;
  return n;
}

std::string markdown_escape(std::string_view s) {
  constexpr std::string_view kMarkup = "\\`*_[]<&|";
  std::string out;
  out.reserve(s.size());
  for (char c : s) {
    if (static_cast<unsigned char>(c) < 0x20 || c == 0x7f) {
      out += ' ';
      continue;
    }
    if (kMarkup.find(c) != std::string_view::npos) out += '\\';
    out += c;
  }
  return out;
}

std::string csv_field(const std::string& s) {
  if (s.find_first_of(",\"\r\n") == std::string::npos) return s;
  std::string out = "\"";
  for (char c : s) {
    if (c == '"') out += '"';
    out += c;
  }
  return out + '"';
}

void Table::add_row(std::vector<std::string> cells) {
  if (cells.size() != columns_.size())
    throw std::logic_error("report::Table: row has " + std::to_string(cells.size()) +
                           " cells for " + std::to_string(columns_.size()) + " columns");
  rows_.push_back(std::move(cells));
}

void Table::add_rule() { rows_.emplace_back(); }

std::string Table::text() const {
  std::vector<std::size_t> width(columns_.size());
  for (std::size_t c = 0; c < columns_.size(); ++c) width[c] = display_width(columns_[c].title);
  for (const auto& r : rows_)
    for (std::size_t c = 0; c < r.size(); ++c) width[c] = std::max(width[c], display_width(r[c]));
  auto pad = [&](const std::string& s, std::size_t c) {
    const std::string fill(width[c] - display_width(s), ' ');
    return columns_[c].align == Align::left ? s + fill : fill + s;
  };
  auto line = [&](const std::vector<std::string>& cells) {
    std::string out;
    for (std::size_t c = 0; c < cells.size(); ++c) {
      if (c) out += "  ";
      out += pad(cells[c], c);
    }
    while (!out.empty() && out.back() == ' ') out.pop_back();
    return out + '\n';
  };
  std::size_t total = 0;
  for (std::size_t c = 0; c < width.size(); ++c) total += width[c] + (c ? 2 : 0);
  std::string rule;
  for (std::size_t i = 0; i < total; ++i) rule += "─";
  rule += '\n';
  std::vector<std::string> titles;
  for (const auto& col : columns_) titles.push_back(col.title);
  std::string out = line(titles) + rule;
  for (const auto& r : rows_) out += r.empty() ? rule : line(r);
  return out;
}

std::string Table::csv() const {
  std::string out;
  for (std::size_t c = 0; c < columns_.size(); ++c)
    out += (c ? "," : "") + csv_field(columns_[c].title);
  out += '\n';
  for (const auto& r : rows_) {
    if (r.empty()) continue;
    for (std::size_t c = 0; c < r.size(); ++c) out += (c ? "," : "") + csv_field(r[c]);
    out += '\n';
  }
  return out;
}

std::string Table::markdown() const {
  const auto escape = markdown_escape;
  std::string out = "|";
  for (const auto& col : columns_) out += " " + escape(col.title) + " |";
  out += "\n|";
  for (const auto& col : columns_) out += col.align == Align::left ? ":---|" : "---:|";
  out += '\n';
  for (const auto& r : rows_) {
    if (r.empty()) continue;
    out += "|";
    for (const auto& cell : r) out += " " + escape(cell) + " |";
    out += '\n';
  }
  return out;
}

}  // namespace limitline::report
