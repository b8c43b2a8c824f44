#include <limitline/app/state_batch.hpp>

#include <limitline/io/csv.hpp>
#include <limitline/model/air_point.hpp>
#include <limitline/model/psychro.hpp>
#include <limitline/report/state.hpp>
#include <limitline/text.hpp>

#include <fmt/format.h>

#include <charconv>
#include <istream>
#include <optional>
#include <ostream>

namespace limitline {
namespace {

using psychro::HumidityInput;
using units::Kind;

struct HumidityColumn {
  std::string_view name;
  HumidityInput input;
};

constexpr HumidityColumn kHumidityColumns[] = {
    {"rh", HumidityInput::relative_humidity},
    {"relative_humidity", HumidityInput::relative_humidity},
    {"wet_bulb", HumidityInput::wet_bulb},
    {"dew_point", HumidityInput::dew_point},
    {"humidity_ratio", HumidityInput::humidity_ratio},
    {"enthalpy", HumidityInput::enthalpy},
};

// The next line without its end, which may be "\n", "\r\n" or a lone "\r" (old Mac
// exports), as the other readers take them; false at the end of the input.
bool next_line(std::istream& in, std::string& line) {
  line.clear();
  std::streambuf* sb = in.rdbuf();
  for (;;) {
    const auto c = sb->sbumpc();
    if (c == std::char_traits<char>::eof()) {
      in.setstate(std::ios::eofbit);
      return !line.empty();
    }
    if (c == '\n') return true;
    if (c == '\r') {
      if (sb->sgetc() == '\n') sb->sbumpc();
      return true;
    }
    line.push_back(static_cast<char>(c));
  }
}

void write_chunk(std::ostream& out, std::string& buffer) {
  out.write(buffer.data(), static_cast<std::streamsize>(buffer.size()));
  buffer.clear();
  if (!out) throw InputError("cannot write the batch output");
}

}  // namespace

std::size_t write_state_batch(std::istream& in, std::ostream& out, const StateBatchOptions& opt) {
  std::string line;
  std::size_t line_no = 0;
  // Header: the first non-blank line, after a UTF-8 byte-order mark if the file starts with one.
  while (next_line(in, line)) {
    if (++line_no == 1 && line.starts_with("\xEF\xBB\xBF")) line.erase(0, 3);
    if (line.find_first_not_of(" \t\r") != std::string::npos) break;
  }
  if (line_no == 0 || line.find_first_not_of(" \t\r") == std::string::npos)
    throw InputError(fmt::format("{}: no header line (expected e.g. dry_bulb,rh)", opt.origin));
  const char delim = csv::guess_delimiter(line);
  const auto header = csv::split_line(line, delim);
  std::optional<std::size_t> dry_bulb, pressure, elevation, humidity;
  const HumidityColumn* humidity_kind = nullptr;
  for (std::size_t i = 0; i < header.size(); ++i) {
    const std::string h = text::to_lower(header[i]);
    if (h == "dry_bulb") {
      dry_bulb = i;
      continue;
    }
    if (h == "pressure") {
      pressure = i;
      continue;
    }
    if (h == "elevation") {
      elevation = i;
      continue;
    }
    bool known = false;
    for (const HumidityColumn& c : kHumidityColumns) {
      if (c.name != h) continue;
      known = true;
      if (humidity)
        throw InputError(fmt::format("{}:{}: columns '{}' and '{}' both give humidity; keep one",
                                     opt.origin, line_no, header[*humidity], header[i]));
      humidity = i;
      humidity_kind = &c;
    }
    if (!known)
      throw InputError(
          fmt::format("{}:{}: column '{}' is not known (allowed: dry_bulb, rh, relative_humidity, "
                      "wet_bulb, dew_point, humidity_ratio, enthalpy, pressure, elevation)",
                      opt.origin, line_no, header[i]));
  }
  if (!dry_bulb) throw InputError(fmt::format("{}:{}: no dry_bulb column", opt.origin, line_no));
  if (!humidity)
    throw InputError(
        fmt::format("{}:{}: no humidity column (one of rh, wet_bulb, dew_point, "
                    "humidity_ratio, enthalpy)",
                    opt.origin, line_no));
  if (pressure && elevation)
    throw InputError(
        fmt::format("{}:{}: give pressure or elevation, not both", opt.origin, line_no));

  const auto fields = report::property_fields();
  std::string buffer;
  for (std::size_t i = 0; i < fields.size(); ++i)
    buffer += (i ? "," : "") + report::property_key(fields[i], opt.system);
  buffer += '\n';

  std::size_t rows = 0;
  // Every good row before a bad one is written out before its error: nothing computed is lost.
  try {
    while (next_line(in, line)) {
      ++line_no;
      if (line.find_first_not_of(" \t\r") == std::string::npos) continue;
      const auto cells = csv::split_line(line, delim);
      if (cells.size() != header.size())
        throw InputError(fmt::format("{}:{}: {} fields where the header has {}", opt.origin,
                                     line_no, cells.size(), header.size()));
      // The place is spelled out only when a cell is bad: formatting it for every cell of
      // every row cost more than the psychrometrics.
      auto cell = [&](Kind kind, std::size_t col) {
        try {
          return units::parse(kind, cells[col], opt.system, {});
        } catch (const InputError&) {
          return units::parse(kind, cells[col], opt.system,
                              fmt::format("{}:{} column {}", opt.origin, line_no, header[col]));
        }
      };
      try {
        const double t = cell(Kind::temperature, *dry_bulb);
        double p = opt.default_pressure_kpa;
        if (pressure) p = cell(Kind::pressure, *pressure);
        if (elevation) p = psychro::standard_pressure_kpa(cell(Kind::length, *elevation));
        const double h = cell(humidity_input_kind(humidity_kind->input), *humidity);
        const auto props = psychro::properties(psychro::state_from(t, humidity_kind->input, h, p));
        for (std::size_t i = 0; i < fields.size(); ++i) {
          if (i) buffer += ',';
          // Same text as printf's %.8g, at about half the cost of fmt's precision path.
          char text[32];
          const auto r = std::to_chars(text, text + sizeof text,
                                       report::property_value(fields[i], props, opt.system),
                                       std::chars_format::general, 8);
          buffer.append(text, r.ptr);
        }
        buffer += '\n';
      } catch (const RangeError& e) {
        throw InputError(fmt::format("{}:{}: {}", opt.origin, line_no, e.what()));
      }
      ++rows;
      if (buffer.size() > (1u << 16)) write_chunk(out, buffer);
    }
  } catch (const InputError&) {
    out.write(buffer.data(), static_cast<std::streamsize>(buffer.size()));
    out.flush();
    throw;
  }
  write_chunk(out, buffer);
  out.flush();
  if (!out) throw InputError("cannot write the batch output");
  return rows;
}

}  // namespace limitline
