#include <limitline/report/table.hpp>

#include <algorithm>
#include <cctype>
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

namespace {

// `s` in at most `width` display columns: its start and end with "…" between them, which
// keeps both a name's beginning and a file's extension.
std::string cut_to(const std::string& s, std::size_t width) {
  const std::size_t n = display_width(s);
  if (n <= width || width < 3) return s;
  std::vector<std::size_t> starts;  // byte offset of each code point
  for (std::size_t i = 0; i < s.size(); ++i)
    if ((static_cast<unsigned char>(s[i]) & 0xC0) != 0x80) starts.push_back(i);
  const std::size_t head = (width - 1) / 2, tail = width - 1 - head;
  return s.substr(0, starts[head]) + "…" + s.substr(starts[n - tail]);
}

}  // namespace

Table Table::select(const std::vector<std::size_t>& cols, std::size_t key_budget) const {
  std::vector<Column> c;
  for (auto k : cols) c.push_back(columns_[k]);
  Table t(c);
  for (const auto& r : rows_) {
    if (r.empty()) {
      t.add_rule();
      continue;
    }
    std::vector<std::string> cells;
    for (auto k : cols)
      cells.push_back(columns_[k].key && columns_[k].align == Align::left ? cut_to(r[k], key_budget)
                                                                          : r[k]);
    t.add_row(std::move(cells));
  }
  return t;
}

std::vector<std::size_t> Table::widths() const {
  std::vector<std::size_t> width(columns_.size());
  for (std::size_t c = 0; c < columns_.size(); ++c) width[c] = display_width(columns_[c].title);
  for (const auto& r : rows_)
    for (std::size_t c = 0; c < r.size(); ++c) width[c] = std::max(width[c], display_width(r[c]));
  return width;
}

std::vector<Table> Table::parts() const {
  std::vector<std::size_t> keys;
  std::vector<int> groups;
  for (std::size_t c = 0; c < columns_.size(); ++c) {
    if (columns_[c].key)
      keys.push_back(c);
    else if (std::find(groups.begin(), groups.end(), columns_[c].group) == groups.end())
      groups.push_back(columns_[c].group);
  }
  std::sort(groups.begin(), groups.end());
  std::vector<Table> out;
  for (int g : groups) {
    std::vector<std::size_t> cols = keys;
    for (std::size_t c = 0; c < columns_.size(); ++c)
      if (!columns_[c].key && columns_[c].group == g) cols.push_back(c);
    out.push_back(select(cols, kUnlimitedWidth));
  }
  if (out.empty()) out.push_back(*this);
  return out;
}

std::string Table::text(std::size_t limit) const {
  const std::vector<std::size_t> width = widths();
  std::size_t total = 0;
  for (std::size_t c = 0; c < width.size(); ++c) total += width[c] + (c ? 2 : 0);
  if (total > limit && columns_.size() > 1) {
    // Keys first, cut to half the width between them if need be; then each group in order,
    // columns added while the part still fits.
    std::vector<std::size_t> keys;
    std::size_t key_total = 0;
    for (std::size_t c = 0; c < columns_.size(); ++c)
      if (columns_[c].key) {
        keys.push_back(c);
        key_total += width[c] + 2;
      }
    if (keys.empty()) {
      keys.push_back(0);
      key_total = width[0] + 2;
    }
    std::size_t key_budget = kUnlimitedWidth;
    if (key_total > limit / 2) {
      std::size_t fixed = 0, left_keys = 0;
      for (auto k : keys)
        if (columns_[k].align == Align::left)
          ++left_keys;
        else
          fixed += width[k] + 2;
      if (left_keys > 0)
        key_budget =
            std::max<std::size_t>(8, (limit / 2 - std::min(fixed, limit / 2)) / left_keys - 2);
      key_total = fixed;
      for (auto k : keys)
        if (columns_[k].align == Align::left) key_total += std::min(width[k], key_budget) + 2;
    }
    std::vector<int> groups;
    for (std::size_t c = 0; c < columns_.size(); ++c)
      if (std::find(keys.begin(), keys.end(), c) == keys.end() &&
          std::find(groups.begin(), groups.end(), columns_[c].group) == groups.end())
        groups.push_back(columns_[c].group);
    std::sort(groups.begin(), groups.end());
    std::string out;
    for (int g : groups) {
      std::vector<std::size_t> cols = keys;
      std::size_t used = key_total;
      const auto flush = [&] {
        if (cols.size() == keys.size()) return;
        out += (out.empty() ? "" : "\n") + select(cols, key_budget).text(kUnlimitedWidth);
        cols = keys;
        used = key_total;
      };
      for (std::size_t c = 0; c < columns_.size(); ++c) {
        if (std::find(keys.begin(), keys.end(), c) != keys.end() || columns_[c].group != g)
          continue;
        if (used + width[c] > limit && cols.size() > keys.size()) flush();
        cols.push_back(c);
        used += width[c] + 2;
      }
      flush();
    }
    return out;
  }
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
  std::string rule;
  for (std::size_t i = 0; i < total; ++i) rule += "─";
  rule += '\n';
  std::vector<std::string> titles;
  for (const auto& col : columns_) titles.push_back(col.title);
  std::string out = line(titles) + rule;
  for (const auto& r : rows_) out += r.empty() ? rule : line(r);
  return out;
}

std::string fit_lines(std::string_view text, std::size_t width) {
  std::string out;
  std::size_t pos = 0;
  while (pos < text.size()) {
    std::size_t end = text.find('\n', pos);
    const bool newline = end != std::string_view::npos;
    if (!newline) end = text.size();
    const std::string line(text.substr(pos, end - pos));
    pos = end + 1;
    const std::size_t lead = line.find_first_not_of(' ');
    // Gaps of two or more spaces after the indent: two or more make a table row; one is the
    // gap between a label and its value, under which the value continues.
    std::size_t gaps = 0, value_at = std::string::npos;
    if (lead != std::string::npos)
      for (std::size_t g = line.find("  ", lead); g != std::string::npos; g = line.find("  ", g)) {
        g = line.find_first_not_of(' ', g);
        if (g == std::string::npos) break;
        ++gaps;
        value_at = g;
      }
    if (display_width(line) <= width || lead == std::string::npos || gaps >= 2) {
      out += line;
      if (newline) out += '\n';
      continue;
    }
    // Where the words start (bytes) and the continuation's indent: the line's own, past a
    // bullet or a number, or under a label's value.
    std::size_t hang = lead;
    if (gaps == 1) {
      hang = value_at;
    } else if (line.compare(lead, 2, "- ") == 0) {
      hang = lead + 2;
    } else {
      std::size_t d = lead;
      while (d < line.size() && std::isdigit(static_cast<unsigned char>(line[d]))) ++d;
      if (d > lead && d + 1 < line.size() && line[d] == '.' && line[d + 1] == ' ') hang = d + 2;
    }
    const std::size_t hang_cols = display_width(line.substr(0, hang));
    std::string current = line.substr(0, hang);
    std::size_t col = hang_cols;
    bool first_word = true;
    std::size_t p = hang;
    while (p < line.size()) {
      std::size_t q = line.find(' ', p);
      if (q == std::string::npos) q = line.size();
      const std::string word = line.substr(p, q - p);
      p = q + 1;
      if (word.empty()) continue;
      const std::size_t w = display_width(word);
      if (!first_word && col + 1 + w > width) {
        out += current + '\n';
        current = std::string(hang_cols, ' ');
        col = hang_cols;
        first_word = true;
      }
      if (!first_word) {
        current += ' ';
        ++col;
      }
      current += word;
      col += w;
      first_word = false;
    }
    out += current;
    if (newline) out += '\n';
  }
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
