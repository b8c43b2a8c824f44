// Editing a unit file's text by key for the study page (see io/unit_edit.hpp).
#include <limitline/io/unit_edit.hpp>

#include <limitline/error.hpp>
#include <limitline/io/toml_depth.hpp>
#include <limitline/text.hpp>

#include <fmt/format.h>
#include <toml++/toml.h>

#include <charconv>
#include <optional>
#include <sstream>

namespace limitline {
namespace {

struct FieldSpec {
  std::string_view table;
  std::string_view key;
  std::string_view label;
};

// The settings a designer changes while comparing strategies, in the order the form shows
// them. [loads] and [plant] rows appear only when the file has those tables.
constexpr FieldSpec kFields[] = {
    {"air_handler", "supply_air_temp", "supply air setpoint"},
    {"air_handler", "fan_heat", "fan heat"},
    {"air_handler", "min_outdoor_air", "minimum outdoor air"},
    {"air_handler", "max_outdoor_air", "maximum outdoor air"},
    {"air_handler", "economizer", "economizer (integrated or non-integrated)"},
    {"air_handler", "supply_airflow", "supply airflow"},
    {"air_handler", "return_air_temp", "return air dry-bulb"},
    {"air_handler", "return_air_rh", "return air relative humidity"},
    {"loads", "space_temp", "space temperature"},
    {"loads", "internal_sensible", "internal sensible load"},
    {"loads", "envelope_ua", "envelope UA"},
    {"loads", "latent", "latent load"},
    {"plant", "cooling_cop", "cooling COP"},
    {"plant", "heating_efficiency", "heating efficiency"},
    {"plant", "electricity_price", "electricity price"},
    {"plant", "heating_price", "heating price"},
    {"site", "energy_code", "energy code"},
    {"site", "climate_zone", "climate zone"},
};
constexpr std::string_view kOptionalTables[] = {"loads", "plant"};

// The setting keys of a [[strategy]], with the words of a preset name that read each one.
struct StrategyKey {
  std::string_view key;
  std::string_view label;
  std::string_view preset_word;  // a preset whose name holds this reads the key
};
constexpr StrategyKey kStrategyKeys[] = {
    {"dry_bulb_limit", "dry-bulb limit", "dry-bulb"},
    {"dry_bulb_offset", "dry-bulb offset from return", "differential-dry-bulb"},
    {"enthalpy_limit", "enthalpy limit", "fixed-enthalpy"},
    {"enthalpy_offset", "enthalpy offset from return", "differential-enthalpy"},
    {"dew_point_limit", "dew point limit", "dew-point"},
    {"deadband", "deadband", ""},
    {"dry_bulb_deadband", "dry-bulb deadband", ""},
    {"enthalpy_deadband", "enthalpy deadband", ""},
    {"dew_point_deadband", "dew point deadband", ""},
};

toml::table parse(std::string_view text, std::string_view name) {
  check_toml_depth(text, name);
  try {
    return toml::parse(text, std::string(name));
  } catch (const toml::parse_error& e) {
    throw InputError(fmt::format("{}:{}: {}", name, e.source().begin.line, e.description()));
  }
}

std::string value_text(const toml::node* n) {
  if (!n) return "";
  if (auto s = n->value<std::string>()) return *s;
  // The shortest text that reads back as the same number ("3.2", not "3.2000000000000002").
  if (n->is_floating_point()) return fmt::format("{}", *n->value<double>());
  std::ostringstream out;
  out << toml::toml_formatter(*n);
  return out.str();
}

// Whether a [[strategy]] with this preset reads `k` (the preset's own settings; the
// differential dry-bulb preset also holds "dry-bulb", which its offset key serves).
bool preset_reads(std::string_view preset, const StrategyKey& k) {
  if (k.preset_word.empty()) return false;
  const std::string p = text::normalise_name(preset);
  if (k.key == "dry_bulb_limit")
    return p.find("fixed-dry-bulb") != std::string::npos ||
           p.find("+dry-bulb") != std::string::npos;
  return p.find(k.preset_word) != std::string::npos;
}

std::optional<double> as_number(std::string_view s) {
  double v = 0;
  const auto t = text::trim(s);
  if (t.empty()) return std::nullopt;
  const auto [p, ec] = std::from_chars(t.data(), t.data() + t.size(), v);
  if (ec != std::errc() || p != t.data() + t.size()) return std::nullopt;
  return v;
}

// Where a path points: the table holding the key, and the key.
struct Target {
  toml::table* table;
  std::string key;
};

Target locate(toml::table& root, std::string_view path, std::string_view name) {
  const auto bad = [&](std::string_view why) {
    return InputError(fmt::format("{}: {}: {}", name, echo(path), why));
  };
  const auto dot = path.rfind('.');
  if (dot == std::string_view::npos) throw bad("not a setting of the page's form");
  const std::string_view where = path.substr(0, dot), key = path.substr(dot + 1);
  if (where.starts_with("strategy[") && where.ends_with("]")) {
    const auto index = as_number(where.substr(9, where.size() - 10));
    auto* arr = root["strategy"].as_array();
    bool known = false;
    for (const auto& k : kStrategyKeys) known = known || k.key == key;
    if (!known || !index || *index < 1 || !arr || *index > static_cast<double>(arr->size()) ||
        *index != static_cast<double>(static_cast<std::size_t>(*index)))
      throw bad("not a setting of one of the file's [[strategy]] entries");
    auto* t = arr->get(static_cast<std::size_t>(*index) - 1)->as_table();
    if (!t) throw bad("that [[strategy]] entry is not a table");
    return {t, std::string(key)};
  }
  for (const auto& f : kFields) {
    if (f.table != where || f.key != key) continue;
    if (!root.contains(f.table)) root.insert(f.table, toml::table{});
    auto* t = root[f.table].as_table();
    if (!t) throw bad(fmt::format("[{}] is not a table in this file", f.table));
    return {t, std::string(key)};
  }
  throw bad("not a setting of the page's form");
}

}  // namespace

std::vector<UnitField> editable_fields(std::string_view text, std::string_view name) {
  toml::table root = parse(text, name);
  std::vector<UnitField> out;
  for (const auto& f : kFields) {
    const toml::table* t = root[f.table].as_table();
    bool optional = false;
    for (auto o : kOptionalTables) optional = optional || o == f.table;
    if (optional && !t) continue;
    out.push_back({fmt::format("{}.{}", f.table, f.key), std::string(f.label),
                   t ? value_text(t->get(f.key)) : ""});
  }
  if (const auto* arr = root["strategy"].as_array()) {
    for (std::size_t i = 0; i < arr->size(); ++i) {
      const auto* t = arr->get(i)->as_table();
      if (!t) continue;
      const std::string preset = value_text(t->get("preset"));
      const std::string title = value_text(t->get("name"));
      for (const auto& k : kStrategyKeys) {
        if (!t->contains(k.key) && (preset.empty() || !preset_reads(preset, k))) continue;
        out.push_back({fmt::format("strategy[{}].{}", i + 1, k.key),
                       fmt::format("{}: {}", title.empty() ? preset : title, k.label),
                       value_text(t->get(k.key))});
      }
    }
  }
  return out;
}

namespace {

std::string written(const toml::table& root) {
  std::ostringstream out;
  out << toml::toml_formatter(root) << '\n';
  return out.str();
}

}  // namespace

std::string with_weather_file(std::string_view text, std::string_view name,
                              std::string_view weather_file, bool columns_by_header) {
  toml::table root = parse(text, name);
  toml::table* w = root["weather"].as_table();
  if (!w || columns_by_header) {
    root.insert_or_assign("weather", toml::table{});
    w = root["weather"].as_table();
  }
  w->insert_or_assign("file", std::string(weather_file));
  return written(root);
}

std::string edit_unit_text(std::string_view text, std::string_view name,
                           std::span<const UnitEdit> edits) {
  if (edits.empty()) return std::string(text);
  toml::table root = parse(text, name);
  for (const UnitEdit& e : edits) {
    Target at = locate(root, e.path, name);
    const std::string v(text::trim(e.value));
    const toml::node* old = at.table->get(at.key);
    if (v.empty()) {
      at.table->erase(at.key);
      continue;
    }
    const auto number = as_number(v);
    const bool keep_string = old ? old->is_string() : !number;
    if (keep_string || !number) {
      at.table->insert_or_assign(at.key, v);
    } else if (old && old->is_integer() &&
               *number == static_cast<double>(static_cast<long long>(*number))) {
      at.table->insert_or_assign(at.key, static_cast<long long>(*number));
    } else {
      at.table->insert_or_assign(at.key, *number);
    }
  }
  return written(root);
}

}  // namespace limitline
