// Hourly loads import: the header that names the unit file's columns, their power units, the
// time axis when the file has one, and every cell read strictly; then the match to a weather
// series. The stages (lines, header fields, stamps, cells) are io/timeseries, shared with the
// weather and trend readers.
#include <limitline/io/loads_file.hpp>

#include <limitline/error.hpp>
#include <limitline/io/input_file.hpp>
#include <limitline/io/timeseries.hpp>
#include <limitline/text.hpp>

#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdint>
#include <optional>

namespace limitline::loads {
namespace {

namespace ts = timeseries;
using units::Kind;

// Wide bounds that catch a slip of units or a corrupt cell: no space one air handler serves
// comes near (the coefficients of [loads] are held to the same).
constexpr double kMaxLoadKw = 1e5;

[[noreturn]] void fail_at(std::string_view source, int line, const std::string& what) {
  throw InputError(fmt::format("{}:{}: {}", source, line, what));
}

std::string quoted_fields(const std::vector<ts::HeaderField>& fields) {
  std::string out;
  for (const ts::HeaderField& f : fields) out += (out.empty() ? "" : ", ") + echo(f.text);
  return out;
}

int find_field(const std::vector<ts::HeaderField>& fields, std::string_view column) {
  for (std::size_t i = 0; i < fields.size(); ++i)
    if (text::iequals(fields[i].text, text::trim(column))) return static_cast<int>(i);
  return -1;
}

// One value column: where it is, and the SI value of one of its unit.
struct Column {
  int index = -1;
  std::string header;
  std::string unit;
  double scale = 1.0;
  std::string_view what;  // "sensible", "latent"
};

// The unit of a column: the unit file's, else the power unit the header's brackets give. A
// header unit that is a power and disagrees with the unit file's is a contradiction.
Column resolve_column(std::string_view source, int header_line, const ts::HeaderField& field,
                      int index, const std::string& spec_unit, const std::string& origin,
                      std::string_view what) {
  Column c{index, field.text, spec_unit, 1.0, what};
  std::optional<double> header_scale;
  if (!field.unit_text.empty()) {
    try {
      header_scale = units::unit_scale(Kind::power, field.unit_text, "header");
    } catch (const InputError&) {
      // Brackets holding something else ("Sensible (zone 1)") say nothing about the unit.
    }
  }
  if (!spec_unit.empty()) {
    c.scale = units::unit_scale(Kind::power, spec_unit, origin);
    if (header_scale && *header_scale != c.scale)
      throw InputError(fmt::format(
          "{}.unit: {} contradicts the unit {} in the header of column {} of {} (line {}); "
          "give the column's own unit, or leave unit out to use the header's",
          origin, echo(spec_unit), echo(field.unit_text), echo(field.text), source, header_line));
    return c;
  }
  if (!header_scale)
    throw InputError(fmt::format(
        "{}: column {} of {} (line {}) gives no power unit in its header{}; give it in the "
        "unit file, unit = \"kW\" in loads.{} (allowed: kW, W, Btu/h, kBtu/h, ton)",
        origin, echo(field.text), source, header_line,
        field.unit_text.empty() ? std::string()
                                : fmt::format(" ({} is not one)", echo(field.unit_text)),
        what));
  c.unit = field.unit_text;
  c.scale = *header_scale;
  return c;
}

// Where the header is, and what its columns hold.
struct Header {
  std::size_t index = 0;  // into the lines
  int line = 0;
  char delimiter = ',';
  std::vector<ts::HeaderField> fields;
  Column sensible, latent;  // latent.index < 0: none
  ts::TimeColumns time;
  bool day_first = false;
  std::string time_columns;
};

// The first line that names the sensible column is the header: lines above it are the
// exporting program's title and notes.
Header find_header(std::string_view source, const std::vector<ts::Line>& lines,
                   const UnitFile::LoadsFile& spec) {
  Header h;
  bool found = false;
  int first_wide = 0;
  std::vector<ts::HeaderField> first_fields;
  for (std::size_t i = 0; i < lines.size() && !found; ++i) {
    if (ts::blank(lines[i].text)) continue;
    ts::HeaderLine l = ts::read_header_line(lines[i].text);
    if (l.fields.size() >= 2 && first_wide == 0) {
      first_wide = lines[i].number;
      first_fields = l.fields;
    }
    const int at = find_field(l.fields, spec.sensible_column);
    if (at < 0) continue;
    found = true;
    h.index = i;
    h.line = lines[i].number;
    h.delimiter = l.delimiter;
    h.fields = std::move(l.fields);
    h.sensible.index = at;
  }
  if (!found)
    throw InputError(fmt::format(
        "{}: column {} is not in {}: no line of it names that column{}", spec.sensible_origin,
        echo(spec.sensible_column), source,
        first_wide > 0 ? fmt::format(" (line {} has: {})", first_wide, quoted_fields(first_fields))
                       : std::string()));
  h.sensible =
      resolve_column(source, h.line, h.fields[static_cast<std::size_t>(h.sensible.index)],
                     h.sensible.index, spec.sensible_unit, spec.sensible_origin, "sensible");
  if (!spec.latent_column.empty()) {
    const int at = find_field(h.fields, spec.latent_column);
    if (at < 0)
      throw InputError(fmt::format("{}: column {} is not in the header of {} (line {}: {})",
                                   spec.latent_origin, echo(spec.latent_column), source, h.line,
                                   quoted_fields(h.fields)));
    if (at == h.sensible.index)
      throw InputError(fmt::format(
          "{}: column {} is the sensible column too ({}); give the latent loads their own column",
          spec.latent_origin, echo(spec.latent_column), spec.sensible_origin));
    h.latent = resolve_column(source, h.line, h.fields[static_cast<std::size_t>(at)], at,
                              spec.latent_unit, spec.latent_origin, "latent");
  }
  // Time columns by their common names, as in a weather file; the value columns are not.
  std::array<int, ts::kTimeRoleCount> roles;
  roles.fill(-1);
  for (std::size_t c = 0; c < h.fields.size(); ++c) {
    const int col = static_cast<int>(c);
    if (col == h.sensible.index || col == h.latent.index || h.fields[c].name.empty()) continue;
    for (std::size_t r = 0; r < ts::kTimeRoleCount; ++r)
      if (roles[r] < 0 && ts::in_list(ts::kTimeRoleAliases[r], h.fields[c].name)) roles[r] = col;
  }
  h.time = ts::resolve_time(roles);
  if (h.time.ok())
    for (int col : {h.time.stamp, h.time.date, h.time.year, h.time.month, h.time.day, h.time.clock,
                    h.time.hour, h.time.minute}) {
      if (col < 0) continue;
      const std::string& text = h.fields[static_cast<std::size_t>(col)].text;
      if (text::icontains(text, "dd/mm")) h.day_first = true;
      h.time_columns += (h.time_columns.empty() ? "" : " + ") + echo(text);
    }
  return h;
}

// A stamp as it was written, before the time convention moves it.
struct Stamped {
  ts::Stamp stamp;
  int line;
};

// One value cell, in kW; anything but a finite number in range is an error naming the cell.
double read_value(std::string_view source, int line, const Column& c, std::string_view cell,
                  bool decimal_comma) {
  double v = 0.0;
  bool used_comma = false;
  const auto allowed = [&] {
    return fmt::format("allowed: a number in {} (the {} load of the interval)", c.unit, c.what);
  };
  switch (ts::read_cell(cell, decimal_comma, v, used_comma)) {
    case ts::Cell::ok: break;
    case ts::Cell::empty:
      fail_at(source, line, fmt::format("column {} is empty; {}", echo(c.header), allowed()));
    case ts::Cell::marker:
    case ts::Cell::sentinel:
      fail_at(source, line,
              fmt::format("column {} value {} marks a missing value; {}", echo(c.header),
                          echo(cell), allowed()));
    case ts::Cell::not_number:
      fail_at(source, line,
              fmt::format("column {} value {} is not a number; {}", echo(c.header), echo(cell),
                          allowed()));
  }
  const double kw = v * c.scale;
  const bool latent = c.what == "latent";
  if (latent && kw < 0.0)
    fail_at(source, line,
            fmt::format("column {} value {} is negative; allowed: 0 or more (the space's "
                        "moisture is added, never removed)",
                        echo(c.header), echo(cell)));
  if (!(std::fabs(kw) <= kMaxLoadKw))
    fail_at(source, line,
            fmt::format("column {} value {} is {:.6g} kW, beyond any load of one air handler's "
                        "space; allowed: {}100,000 kW at most",
                        echo(c.header), echo(cell), kw, latent ? "" : "±"));
  return kw;
}

// The data rows: every non-blank line after the header, each with the header's fields.
std::vector<Row> read_rows(std::string_view source, const std::vector<ts::Line>& lines,
                           const Header& h, std::vector<Stamped>& stamps) {
  std::vector<Row> rows;
  rows.reserve(lines.size() - h.index);
  std::vector<std::string_view> f;
  const std::size_t width = h.fields.size();
  const bool decimal_comma = h.delimiter != ',';
  ts::StampReader reader(h.time, h.day_first);
  for (std::size_t i = h.index + 1; i < lines.size(); ++i) {
    const ts::Line& l = lines[i];
    if (ts::blank(l.text)) continue;
    ts::split_fields(l.text, h.delimiter, f);
    std::size_t used = f.size();
    while (used > width && f[used - 1].empty()) --used;
    if (used != width)
      fail_at(source, l.number,
              fmt::format("the row has {} fields but the header (line {}) has {}; allowed: one "
                          "value per header column",
                          used, h.line, width));
    Row r;
    r.line = l.number;
    if (h.time.ok()) {
      Stamped s{{}, l.number};
      ts::Zone zone;
      ts::StampForm form{};
      const ts::StampFault fault = reader.read(f, s.stamp, zone, form);
      if (fault.column >= 0)
        fail_at(source, l.number,
                fmt::format("column {} value {} is not readable as a time; allowed: {}",
                            echo(h.fields[static_cast<std::size_t>(fault.column)].text),
                            echo(f[static_cast<std::size_t>(fault.column)]), fault.allowed));
      stamps.push_back(s);
    }
    r.loads.sensible_kw = read_value(source, l.number, h.sensible,
                                     f[static_cast<std::size_t>(h.sensible.index)], decimal_comma);
    if (h.latent.index >= 0)
      r.loads.latent_kw = read_value(source, l.number, h.latent,
                                     f[static_cast<std::size_t>(h.latent.index)], decimal_comma);
    rows.push_back(r);
  }
  if (rows.empty()) fail_at(source, h.line, "the header is followed by no data rows");
  return rows;
}

// Minutes from the start of the stamp's month: rows within a month compare by it.
int month_minute(const ts::Stamp& s) { return (s.day - 1) * 1440 + s.minute; }

// The slot of an interval start in a year of `step`-minute intervals (month, day, time of
// day: the year is not compared).
std::size_t slot(int month, int day, int minute, int step) {
  return static_cast<std::size_t>(((month - 1) * 31 + (day - 1)) * (1440 / step) + minute / step);
}
std::size_t slot_count(int step) { return static_cast<std::size_t>(12 * 31 * (1440 / step)); }

std::string when(int month, int day, int minute) {
  return fmt::format("{:02}-{:02} {:02}:{:02}", month, day, minute / 60, minute % 60);
}

// The time axis of a timed file: its step, its convention, each row's interval start; two
// rows for one interval are an error.
void place_rows(std::string_view source, const std::vector<Stamped>& stamps,
                weather::TimeConvention convention, LoadsTable& t) {
  int step = 0;
  for (std::size_t i = 1; i < stamps.size(); ++i) {
    const ts::Stamp& p = stamps[i - 1].stamp;
    const ts::Stamp& s = stamps[i].stamp;
    if (s.year != p.year || s.month != p.month) continue;
    const int diff = month_minute(s) - month_minute(p);
    if (diff <= 0)
      fail_at(source, stamps[i].line,
              fmt::format("time {} {} the row at line {}; allowed: rows within a month in time "
                          "order, each time once",
                          ts::stamp_text(s), diff == 0 ? "repeats" : "comes before",
                          stamps[i - 1].line));
    if (step == 0 || diff < step) step = diff;
  }
  t.step_min = step == 0 ? 60 : step;
  if (60 % t.step_min != 0)
    throw InputError(fmt::format(
        "{}: time step {} min; allowed: 60 min or a whole fraction of an hour", source, step));

  const auto first = [&](int minute) {
    return std::find_if(stamps.begin(), stamps.end(),
                        [&](const Stamped& s) { return s.stamp.minute == minute; });
  };
  const auto at_24 = first(1440);
  switch (convention) {
    case weather::TimeConvention::automatic:
      t.hour_ending = at_24 != stamps.end();
      if (t.hour_ending && first(0) != stamps.end())
        fail_at(source, first(0)->line,
                fmt::format("time 00:00 in a file that also marks midnight as 24:00 (line {}); "
                            "allowed: one of the two",
                            at_24->line));
      break;
    case weather::TimeConvention::hour_beginning:
      if (at_24 != stamps.end())
        fail_at(source, at_24->line,
                "time 24:00 cannot start an interval (time_convention = \"hour-beginning\"); "
                "allowed: 00:00 to 23:59");
      break;
    case weather::TimeConvention::hour_ending: t.hour_ending = true; break;
  }

  std::vector<int> seen(slot_count(t.step_min), -1);
  for (std::size_t i = 0; i < stamps.size(); ++i) {
    const ts::Stamp s =
        t.hour_ending ? ts::minutes_earlier(stamps[i].stamp, t.step_min) : stamps[i].stamp;
    const int line = stamps[i].line;
    if (s.minute % t.step_min != 0)
      fail_at(source, line,
              fmt::format("the interval starting {} is off the file's {}-min grid; allowed: "
                          "intervals starting at whole steps from midnight",
                          when(s.month, s.day, s.minute), t.step_min));
    int& other = seen[slot(s.month, s.day, s.minute, t.step_min)];
    if (other >= 0)
      fail_at(source, line,
              fmt::format("the interval starting {} is already the row at line {}; allowed: one "
                          "row per interval of one year",
                          when(s.month, s.day, s.minute),
                          t.rows[static_cast<std::size_t>(other)].line));
    other = static_cast<int>(i);
    Row& r = t.rows[i];
    r.month = s.month;
    r.day = s.day;
    r.minute = s.minute;
  }
}

Matched match_by_row(const LoadsTable& t, const weather::WeatherSeries& w) {
  if (w.info.skipped() > 0)
    throw InputError(fmt::format(
        "{}: the rows are matched to the weather row by row (the file has no time columns), "
        "but the weather {} dropped {} bad row{}, so the two no longer line up; give the loads "
        "file time columns, or read the weather with on_bad_row = \"fill\"",
        t.source, w.info.source, w.info.skipped(), w.info.skipped() == 1 ? "" : "s"));
  if (t.rows.size() != w.hours.size())
    throw InputError(fmt::format(
        "{}: {} data rows (lines {} to {}), but the weather {} has {}; matched row by row (the "
        "file has no time columns), the counts must be equal",
        t.source, t.rows.size(), t.rows.front().line, t.rows.back().line, w.info.source,
        w.hours.size()));
  Matched m;
  m.hours.reserve(t.rows.size());
  for (const Row& r : t.rows) m.hours.push_back(r.loads);
  return m;
}

Matched match_by_time(const LoadsTable& t, const weather::WeatherSeries& w) {
  const int step = t.step_min, weather_step = w.info.time.step_min;
  if (step < weather_step || step % weather_step != 0)
    throw InputError(fmt::format(
        "{}: time step {} min, the weather {}'s {} min; allowed: the weather's step or a whole "
        "multiple of it (each weather interval takes the loads row its start falls in)",
        t.source, step, w.info.source, weather_step));
  std::vector<int> row_of(slot_count(step), -1);
  for (std::size_t i = 0; i < t.rows.size(); ++i)
    row_of[slot(t.rows[i].month, t.rows[i].day, t.rows[i].minute, step)] = static_cast<int>(i);
  std::vector<bool> used(t.rows.size(), false);
  Matched m;
  m.hours.reserve(w.hours.size());
  for (const weather::WeatherHour& h : w.hours) {
    const int minute = h.hour * 60 + h.minute;
    const int i = row_of[slot(h.month, h.day, minute, step)];
    if (i < 0) {
      const Row& a = t.rows.front();
      const Row& b = t.rows.back();
      throw InputError(fmt::format(
          "{}: no row for {}, the start of an interval of the weather {}; the file's rows start "
          "their intervals at {} (line {}) to {} (line {}){}; allowed: one row for each weather "
          "interval, matched by month, day and time of day",
          t.source, when(h.month, h.day, minute), w.info.source, when(a.month, a.day, a.minute),
          a.line, when(b.month, b.day, b.minute), b.line,
          t.hour_ending ? " (hour-ending stamps, moved to the interval's start)" : ""));
    }
    used[static_cast<std::size_t>(i)] = true;
    m.hours.push_back(t.rows[static_cast<std::size_t>(i)].loads);
  }
  const auto unused = std::find(used.begin(), used.end(), false);
  if (unused == used.end()) return m;
  const Row& r = t.rows[static_cast<std::size_t>(unused - used.begin())];
  const auto count = std::count(used.begin(), used.end(), false);
  const bool weather_gaps = w.info.skipped() > 0 || w.info.time.missing_steps > 0;
  const std::string what =
      count == 1 ? fmt::format("1 row of {} (line {}, {}) matches no interval of the weather {}",
                               t.source, r.line, when(r.month, r.day, r.minute), w.info.source)
                 : fmt::format(
                       "{} rows of {} (the first line {}, {}) match no interval of the "
                       "weather {}",
                       count, t.source, r.line, when(r.month, r.day, r.minute), w.info.source);
  if (!weather_gaps)
    throw InputError(fmt::format(
        "{}; allowed: rows for the weather's intervals only (loads of the same year as the "
        "weather, a leap day only when both have one)",
        what));
  m.warnings.push_back(fmt::format(
      "{}, which lacks intervals (skipped bad rows or missing time steps); their loads are not "
      "used",
      what));
  return m;
}

}  // namespace

LoadsTable read_text(std::string_view text, std::string_view source,
                     const UnitFile::LoadsFile& spec) {
  const std::vector<ts::Line> lines = ts::split_lines(text);
  if (std::all_of(lines.begin(), lines.end(), [](const ts::Line& l) { return ts::blank(l.text); }))
    throw InputError(fmt::format(
        "{}: the loads file is empty; allowed: a header line naming the columns and data rows",
        source));
  const Header h = find_header(source, lines, spec);
  LoadsTable t;
  t.source = std::string(source);
  t.header_line = h.line;
  t.timed = h.time.ok();
  t.time_columns = h.time_columns;
  t.sensible_header = h.sensible.header;
  t.sensible_unit = h.sensible.unit;
  if (h.latent.index >= 0) {
    t.latent_header = h.latent.header;
    t.latent_unit = h.latent.unit;
  }
  std::vector<Stamped> stamps;
  t.rows = read_rows(source, lines, h, stamps);
  if (t.timed) place_rows(source, stamps, spec.time_convention, t);
  return t;
}

LoadsTable read_file(const std::filesystem::path& path, const UnitFile::LoadsFile& spec) {
  // A year of one-minute loads with a few columns is about 40 MB; a larger file is not one
  // unit's loads.
  constexpr std::uintmax_t kMaxLoadsBytes = std::uintmax_t{64} << 20;
  return read_text(read_input_file(path, "the loads file", kMaxLoadsBytes),
                   path.filename().string(), spec);
}

Matched match(const LoadsTable& table, const weather::WeatherSeries& weather) {
  return table.timed ? match_by_time(table, weather) : match_by_row(table, weather);
}

std::string describe(const LoadsTable& t) {
  std::string columns = fmt::format("{} in {} sensible", echo(t.sensible_header), t.sensible_unit);
  columns += t.latent_header.empty()
                 ? ", no latent column"
                 : fmt::format(", {} in {} latent", echo(t.latent_header), t.latent_unit);
  const std::string matched =
      t.timed ? fmt::format("matched by time stamp ({}; {}-min step{})", t.time_columns, t.step_min,
                            t.hour_ending ? ", hour-ending" : "")
              : std::string("matched row by row (no time columns)");
  return fmt::format("{}: {}; {} rows {}", t.source, columns, t.rows.size(), matched);
}

}  // namespace limitline::loads
