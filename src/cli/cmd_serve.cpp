// limitline serve: the study page in a browser, served from this machine (src/serve).
#include "common.hpp"

#include <limitline/app/year_job.hpp>
#include <limitline/io/embedded.hpp>
#include <limitline/io/input_file.hpp>
#include <limitline/serve/server.hpp>

#include <fmt/format.h>

#include <atomic>
#include <csignal>
#include <cstdio>
#include <pthread.h>
#include <thread>

namespace limitline::cli {
namespace {

constexpr std::string_view kDetails =
    "Starts a web server on this machine for the study page: load a unit file and a weather\n"
    "file (or a demo), change the settings and see the ranked table with code compliance, the\n"
    "chart, the month-by-month picture and the tuning curves follow; click the chart to check\n"
    "one outdoor state; download the unit file (TOML) of what is on the page, and the HTML\n"
    "report. The page calls the JSON API the README describes.\n\n"
    "The first line of standard output is the page's address with its token,\n"
    "  http://127.0.0.1:PORT/?token=...\n"
    "Open it in a browser on this machine. Requests without the token are refused (403), as are\n"
    "requests whose Host or Origin name another site; request bodies over --max-upload are\n"
    "refused (413). It listens on 127.0.0.1 only, unless --host names another address (a\n"
    "warning: there is no encryption). Ctrl-C stops it (exit 0).\n\n"
    "UNIT.toml, --demo and --weather choose what the page starts with, read as `limitline year`\n"
    "reads them; the page itself reads no file from disk.\n\n"
    "Examples:\n"
    "  limitline serve\n"
    "  limitline serve examples/office-humid-coast.toml --weather "
    "tests/data/greensboro-nc-tmy3.csv\n"
    "  limitline serve --demo mesa-alta --units si --max-upload 32";

constexpr unsigned kMaxWorkers = 16;
constexpr unsigned kMaxUploadMib = 256;

bool loopback(const std::string& host) {
  return host == "127.0.0.1" || host == "localhost" || host == "::1";
}

// What the page starts with, read as `limitline year` reads it (the same errors), then kept
// as text: the page sends it back with every request.
serve::StartState start_state(const UnitSource& source, const WeatherOverrides& overrides,
                              std::size_t max_upload) {
  const YearInputs in = load_year_inputs(source, overrides);
  report_warnings(in.warnings, false);
  if (source.embedded && !overrides.file) {
    const auto names = demo_names();
    for (const auto& n : names)
      if (demo_unit(n).path == source.path) return serve::demo_start(n);
  }
  serve::StartState s;
  s.demo = source.embedded;
  s.unit_name = source.path;
  s.unit_text = source.embedded ? std::string(embedded::find(source.path).value_or(""))
                                : read_input_file(source.path, "the unit file", 1u << 20);
  s.weather_name = in.weather_label;
  s.weather_text = read_input_file(in.weather_label, "the weather file", max_upload);
  s.weather_by_header = source.embedded;
  if (overrides.file) s.weather_file = *overrides.file;
  // What the page will send back must read as it did here (a [loads] file would not).
  TextSources check{s.unit_text, s.unit_name, s.weather_text, s.weather_name, s.weather_by_header};
  (void)load_year_inputs(check);
  if (s.unit_text.size() + s.weather_text.size() + 4096 > max_upload)
    throw InputError(fmt::format(
        "--max-upload: the unit and weather files ({} bytes) do not fit in {} bytes; raise it",
        s.unit_text.size() + s.weather_text.size(), max_upload));
  return s;
}

}  // namespace

int run_serve(const std::vector<std::string>& args) {
  po::options_description options("options");
  options.add_options()("unit", po::value<std::string>(),
                        "unit file the page starts with (TOML); omit for the demo")(
      "demo", po::value<std::string>(), "embedded demo to start with: harbourside or mesa-alta")(
      "weather", po::value<std::string>(), "weather CSV to start with (instead of the unit's)")(
      "units", po::value<std::string>(),
      "units the page starts in: ip or si (default: the unit file's)")(
      "host", po::value<std::string>()->default_value("127.0.0.1"),
      "address to listen on (another than 127.0.0.1 prints a warning)")(
      "port", po::value<int>()->default_value(0), "port (0: a free one)")(
      "threads", po::value<unsigned>()->default_value(4), "worker threads, 1 to 16")(
      "max-upload", po::value<unsigned>()->default_value(16),
      "largest request body, MiB (1 to 256); larger is refused with 413")("help,h",
                                                                          "show this help");
  po::positional_options_description pos;
  pos.add("unit", 1);
  po::variables_map vm;
  if (!parse_options(args, options, pos, "limitline serve [UNIT.toml] [options]", kDetails, vm))
    return 0;
  // Ctrl-C and SIGTERM are taken by one thread that stops the server; every other thread,
  // the workers and the library's thread pool included (they inherit
  // this mask, so it is set before any starts), leaves them alone.
  sigset_t stop_signals;
  sigemptyset(&stop_signals);
  sigaddset(&stop_signals, SIGINT);
  sigaddset(&stop_signals, SIGTERM);
  pthread_sigmask(SIG_BLOCK, &stop_signals, nullptr);

  serve::ServerOptions so;
  so.host = vm["host"].as<std::string>();
  so.port = bounded<int>(vm, "port", 0, 65535);
  so.threads = bounded<unsigned>(vm, "threads", 1, kMaxWorkers);
  so.max_upload_bytes = std::size_t{bounded<unsigned>(vm, "max-upload", 1, kMaxUploadMib)} << 20;

  if (vm.count("unit") && vm.count("demo"))
    throw UsageError("give a unit file or --demo, not both");
  const UnitSource source =
      vm.count("unit") ? UnitSource{vm["unit"].as<std::string>(), false}
                       : demo_unit(vm.count("demo") ? vm["demo"].as<std::string>() : "harbourside");
  WeatherOverrides overrides;
  if (vm.count("weather")) overrides.file = vm["weather"].as<std::string>();
  serve::StartState start = start_state(source, overrides, so.max_upload_bytes);
  if (vm.count("units"))
    start.units = units::system_name(system_option(vm["units"].as<std::string>(), "--units"));

  serve::Server server(serve::Api(std::move(start), "limitline " LIMITLINE_CLI_VERSION), so);
  if (!loopback(so.host))
    std::fprintf(stderr,
                 "limitline serve: warning: listening on %s: anyone who can reach this address "
                 "and learns the URL can use the server, and nothing is encrypted; use it only on "
                 "a network you trust\n",
                 so.host.c_str());
  write_out(server.url() + "\n");
  std::fflush(stdout);
  std::fprintf(stderr, "limitline serve: serving the study page; Ctrl-C stops it\n");

  std::atomic<bool> done{false};
  std::thread stopper([&] {
    int sig = 0;
    sigwait(&stop_signals, &sig);
    if (!done) server.stop();
  });
  server.run();
  done = true;
  pthread_kill(stopper.native_handle(), SIGTERM);  // wakes it when run() ended otherwise
  stopper.join();
  std::fprintf(stderr, "limitline serve: stopped\n");
  return 0;
}

}  // namespace limitline::cli
