#pragma once
// The JSON API of the study page (`limitline serve`), apart from HTTP: each endpoint takes the
// fields of one request (the unit file and weather as text, settings) and returns the
// response the server sends. Every result comes from the same library calls as the commands
// (app/year_job, report/year, report/chart, report/monthly, app/tune_job, analysis/point_check),
// so /api/year is `limitline year --format json` for the same unit and weather. Nothing here
// opens a file: a request carries its inputs.
#include <map>
#include <string>
#include <string_view>
#include <vector>

namespace limitline::serve {

// A request's form fields; a name may repeat (the edits of /api/edit), kept in order.
using Fields = std::multimap<std::string, std::string>;

struct Response {
  int status = 200;
  std::string content_type = "application/json";
  std::string body;
  std::string download_name;  // set: sent as an attachment with this file name
};

// What the page starts with: the unit file given to `limitline serve` (or the demo) and its
// weather, as text.
struct StartState {
  std::string unit_text;
  std::string unit_name;  // shown on the page and used in its messages
  std::string weather_text;
  std::string weather_name;
  bool weather_by_header = false;  // a demo unit: a file of the user's is read by its header
  bool demo = false;
  // The weather file the downloaded unit file names (a file the unit does not name itself),
  // or empty: the unit's own [weather] file.
  std::string weather_file;
  std::string units;  // "ip" or "si": the page's first choice; empty: the unit file's
};

// The start state of an embedded demo ("harbourside", "mesa-alta"); InputError for another name.
StartState demo_start(std::string_view demo_name);

// The endpoints, by name (the part after /api/), for the README and the router.
struct Endpoint {
  std::string_view name;
  std::string_view method;  // "GET" or "POST"
  std::string_view summary;
};
std::vector<Endpoint> endpoints();

class Api {
 public:
  Api(StartState start, std::string generator);
  // The response of endpoint `name` for `fields`. Bad input is a 422 whose JSON "error" is the
  // one-line message of the command; a missing field 400; an unknown endpoint 404. Never throws
  // for any input.
  Response handle(std::string_view name, const Fields& fields) const;

  const StartState& start() const { return start_; }
  const std::string& generator() const { return generator_; }

 private:
  StartState start_;
  std::string generator_;
};

}  // namespace limitline::serve
