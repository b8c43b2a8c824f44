// The study page's API: each endpoint assembles its answer from the calls the commands make.
#include <limitline/serve/api.hpp>

#include <limitline/analysis/point_check.hpp>
#include <limitline/app/report_job.hpp>
#include <limitline/app/year_job.hpp>
#include <limitline/error.hpp>
#include <limitline/io/codes.hpp>
#include <limitline/io/embedded.hpp>
#include <limitline/io/unit_edit.hpp>
#include <limitline/model/air_point.hpp>
#include <limitline/report/chart.hpp>
#include <limitline/report/json.hpp>
#include <limitline/report/point_check.hpp>
#include <limitline/report/year.hpp>

#include <fmt/format.h>

#include <filesystem>
#include <optional>

namespace limitline::serve {
namespace {

// A request that lacks a field the endpoint needs (400, not the user's input being wrong).
struct MissingField {
  std::string name;
};

const std::string& field(const Fields& f, const std::string& name) {
  const auto it = f.find(name);
  if (it == f.end()) throw MissingField{name};
  return it->second;
}

std::optional<std::string> optional_field(const Fields& f, const std::string& name) {
  const auto it = f.find(name);
  if (it == f.end() || it->second.empty()) return std::nullopt;
  return it->second;
}

Response json(std::string body, int status = 200) {
  return {status, "application/json", std::move(body), {}};
}

Response error(int status, std::string_view message) {
  report::Json j;
  j.begin_object().field("error", message).end_object();
  return json(j.str(), status);
}

// The unit system of the results: the request's "units" (ip or si), else the unit file's, as
// --units and the unit file's `units` decide for the commands.
units::System system_for(const Fields& f, const UnitFile& unit) {
  const auto u = optional_field(f, "units");
  if (!u) return unit.units;
  for (const auto s : {units::System::ip, units::System::si})
    if (*u == units::system_name(s)) return s;
  throw InputError(fmt::format("units: {} is not a unit system (ip or si)", echo(*u)));
}

// The name a request gives its upload ("office.toml", as the user picked it), for messages
// only: one line of printable text, at most 200 bytes; never opened.
std::string upload_name(const Fields& f, const std::string& key, std::string_view fallback) {
  const auto given = optional_field(f, key);
  if (!given) return std::string(fallback);
  std::string out;
  for (char c : *given)
    if (static_cast<unsigned char>(c) >= 0x20 && c != 0x7f && out.size() < 200) out += c;
  return out.empty() ? std::string(fallback) : out;
}

std::string unit_name(const Fields& f) { return upload_name(f, "unit_name", "uploaded unit file"); }

YearInputs inputs(const Fields& f) {
  TextSources src;
  src.unit_text = field(f, "unit");
  src.unit_name = unit_name(f);
  src.weather_text = field(f, "weather");
  src.weather_name = upload_name(f, "weather_name", "uploaded weather file");
  src.weather_by_header = optional_field(f, "weather_by_header").value_or("") == "1";
  return load_year_inputs(src);
}

// One year as the page shows it: the inputs, the prepared year, its results and context.
struct Study {
  YearInputs in;
  units::System system;
  annual::Prepared prepared;
  annual::YearResult year;
  report::YearContext context;

  explicit Study(const Fields& f)
      : in(inputs(f)),
        system(system_for(f, in.unit)),
        prepared(prepare_year(in)),
        year(annual::evaluate(in.strategies, prepared)),
        context(year_context(in, system)) {
    add_compliance(context, in, {});
  }
};

void start_json(report::Json& j, const StartState& s) {
  j.begin_object();
  j.field("unit", s.unit_text);
  j.field("unit_name", s.unit_name);
  j.field("weather", s.weather_text);
  j.field("weather_name", s.weather_name);
  j.field("weather_by_header", s.weather_by_header);
  j.field("demo", s.demo);
  j.field("weather_file", s.weather_file);
  j.field("units", s.units);
  j.strings("demos", demo_names());
  j.end_object();
}

Response start(const Api& api, const Fields&) {
  report::Json j;
  start_json(j, api.start());
  return json(j.str());
}

Response demo(const Api&, const Fields& f) {
  report::Json j;
  start_json(j, demo_start(field(f, "name")));
  return json(j.str());
}

Response fields(const Api&, const Fields& f) {
  const std::string& text = field(f, "unit");
  const std::string name = unit_name(f);
  const UnitFile unit = parse_unit_file(text, name);
  report::Json j;
  j.begin_object();
  j.field("units", units::system_name(unit.units));
  j.key("fields").begin_array();
  for (const UnitField& u : editable_fields(text, name))
    j.begin_object()
        .field("path", u.path)
        .field("label", u.label)
        .field("value", u.value)
        .end_object();
  j.end_array();
  j.strings("warnings", unit.warnings);
  j.end_object();
  return json(j.str());
}

// The edits are the request's "path" and "value" fields, paired in order.
Response edit(const Api&, const Fields& f) {
  const std::string& text = field(f, "unit");
  std::vector<UnitEdit> edits;
  const auto paths = f.equal_range("path");
  const auto values = f.equal_range("value");
  auto v = values.first;
  for (auto p = paths.first; p != paths.second; ++p) {
    if (v == values.second) throw MissingField{"value"};
    edits.push_back({p->second, v->second});
    ++v;
  }
  const std::string name = unit_name(f);
  std::string out = edit_unit_text(text, name, edits);
  // Validated as the commands read it: the same one-line errors.
  (void)parse_unit_file(out, name);
  report::Json j;
  j.begin_object().field("unit", out).end_object();
  return json(j.str());
}

// The unit file to download: the page's text, naming the uploaded weather file by its name
// (without any folder) when the page read one, so that the two saved side by side reproduce
// the page through `limitline year UNIT.toml`.
Response unit_download(const Api&, const Fields& f) {
  const std::string& text = field(f, "unit");
  const std::string name = unit_name(f);
  std::string out = text;
  if (const auto w = optional_field(f, "weather_file")) {
    const std::string file = std::filesystem::path(*w).filename().string();
    if (file.empty() || file == "." || file == "..")
      throw InputError(fmt::format("weather_file: {} is not a file name", echo(*w)));
    out = with_weather_file(text, name, file,
                            optional_field(f, "weather_by_header").value_or("") == "1");
  }
  (void)parse_unit_file(out, name);
  const std::string base = std::filesystem::path(name).filename().string();
  return {200, "application/toml", out, base.ends_with(".toml") ? base : "unit.toml"};
}

Response year(const Api&, const Fields& f) {
  const Study s(f);
  return json(report::year_json(s.year, s.context));
}

void axes_json(report::Json& j, const report::ChartGeometry& g) {
  j.begin_object();
  j.field("dry_bulb_min_c", g.dry_bulb_min_c(), 12);
  j.field("dry_bulb_max_c", g.dry_bulb_max_c(), 12);
  j.field("humidity_ratio_max", g.humidity_ratio_max(), 12);
  j.field("left", g.area().left, 12);
  j.field("top", g.area().top, 12);
  j.field("width", g.area().width, 12);
  j.field("height", g.area().height, 12);
  j.end_object();
}

// Everything the page shows for one state, from one prepared year: the annual results (the
// document of /api/year, embedded), the chart with the map of its axes, the monthly picture
// and the tuning plots of the study report.
Response study(const Api& api, const Fields& f) {
  const Study s(f);
  report::ReportDocument doc = report_document(s.in, s.prepared, s.year, s.system);
  doc.generator = api.generator();
  report::ChartInput chart = chart_input(s.in.unit, s.in.strategies, s.system);
  add_climate(chart, s.prepared, s.in.weather_label);
  report::Json j;
  j.begin_object();
  j.key("chart").begin_object();
  j.field("svg", doc.chart_svg);
  j.key("axes");
  axes_json(j, report::chart_geometry(chart));
  j.end_object();
  j.field("monthly_svg", doc.monthly_svg);
  j.key("tuning").begin_array();
  if (doc.tuning)
    for (const auto& [name, svg] : doc.tuning->plots)
      j.begin_object().field("strategy", name).field("svg", svg).end_object();
  j.end_array();
  j.field("year", "");  // replaced below by the year document itself
  j.end_object();
  // The year document goes in as it is, so that its numbers are byte for byte /api/year's.
  std::string body = j.str();
  const std::string marker = "\"year\": \"\"";
  const auto at = body.rfind(marker);
  body.replace(at, marker.size(), "\"year\": " + report::year_json(s.year, s.context));
  return json(body);
}

Response check(const Api&, const Fields& f) {
  const UnitFile unit = parse_unit_file(field(f, "unit"), unit_name(f));
  codes::check_site_code(unit.site.energy_code, unit.site.energy_code_origin,
                         unit.site.climate_zone, unit.site.climate_zone_origin);
  std::vector<std::string> warnings = unit.warnings;
  const units::System system = system_for(f, unit);
  const double p = unit.site.design_pressure_kpa();
  const std::string& outdoor_text = field(f, "outdoor");
  const AirPoint outdoor_point =
      parse_air_point(outdoor_text, system, "outdoor", AirRole::outdoor, warnings);
  const psychro::MoistAir outdoor = outdoor_point.state(p, fmt::format("outdoor {}", outdoor_text));
  (void)outdoor_point.properties(p, fmt::format("outdoor {}", outdoor_text));
  const PointCheck pc = check_point(unit.air_handler, unit.weights, strategies_or_presets(unit),
                                    outdoor, unit.return_air.state(p));
  const report::PointCheckContext context{
      &unit, "the point clicked on the chart", "unit file", warnings, system, report::kTextWidth};
  return json(report::point_check_json(pc, context));
}

Response study_report(const Api& api, const Fields& f) {
  const Study s(f);
  report::ReportDocument doc = report_document(s.in, s.prepared, s.year, s.system);
  doc.generator = api.generator();
  return {200, "text/html; charset=utf-8", report::report_html(s.year, doc),
          "limitline-study.html"};
}

struct Route {
  Endpoint endpoint;
  Response (*run)(const Api&, const Fields&);
};

const Route kRoutes[] = {
    {{"start", "GET", "the unit and weather the page starts with, and the demo names"}, start},
    {{"demo", "POST", "an embedded demo's unit and weather (field: name)"}, demo},
    {{"fields", "POST", "the settings of a unit file the form shows (field: unit)"}, fields},
    {{"edit", "POST", "a unit file with settings changed (fields: unit, path, value, ...)"}, edit},
    {{"unit", "POST",
      "the unit file of the page, as an attachment (fields: unit, weather_file, ...)"},
     unit_download},
    {{"year", "POST", "the annual results: year --format json (fields: unit, weather)"}, year},
    {{"study", "POST", "annual results, chart and its axes, monthly and tuning pictures"}, study},
    {{"check", "POST", "check --format json at one outdoor state (fields: unit, outdoor)"}, check},
    {{"report", "POST", "the study report as HTML, as an attachment (fields: unit, weather)"},
     study_report},
};

}  // namespace

StartState demo_start(std::string_view name) {
  const UnitSource src = demo_unit(name);
  const auto unit_text = embedded::find(src.path);
  if (!unit_text)
    throw InputError(fmt::format("embedded demo unit '{}' is missing from this build", src.path));
  const UnitFile unit = parse_unit_file(*unit_text, src.path);
  const std::string weather_file =
      unit.weather ? weather::read_mapping(*unit.weather, unit.path).file.value_or("") : "";
  const auto weather_text = embedded::find(weather_file);
  if (!weather_text)
    throw InputError(
        fmt::format("embedded demo weather '{}' is missing from this build", weather_file));
  return {std::string(*unit_text),
          src.path,
          std::string(*weather_text),
          weather_file + " (embedded invented demo climate)",
          false,
          true,
          "",
          ""};
}

std::vector<Endpoint> endpoints() {
  std::vector<Endpoint> out;
  for (const auto& r : kRoutes) out.push_back(r.endpoint);
  return out;
}

Api::Api(StartState start, std::string generator)
    : start_(std::move(start)), generator_(std::move(generator)) {}

Response Api::handle(std::string_view name, const Fields& f) const {
  for (const auto& r : kRoutes) {
    if (r.endpoint.name != name) continue;
    try {
      return r.run(*this, f);
    } catch (const MissingField& m) {
      return error(400, fmt::format("the request has no '{}' field", m.name));
    } catch (const InputError& e) {
      return error(422, e.what());
    } catch (const std::exception& e) {
      return error(500, fmt::format("internal error: {}", e.what()));
    }
  }
  return error(404, fmt::format("/api/{} is not an endpoint", name));
}

}  // namespace limitline::serve
