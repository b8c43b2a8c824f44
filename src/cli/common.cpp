#include "common.hpp"

#include <limitline/report/table.hpp>

#include <limitline/io/output_file.hpp>
#include <limitline/model/plausible.hpp>
#include <limitline/model/psychro.hpp>
#include <limitline/io/unit_file.hpp>

#include <fmt/format.h>

#include <fcntl.h>
#include <malloc.h>
#include <unistd.h>

#include <cerrno>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <iostream>
#include <sstream>

namespace limitline::cli {

namespace {
constexpr std::pair<Format, std::string_view> kFormats[] = {{Format::text, "text"},
                                                            {Format::json, "json"},
                                                            {Format::csv, "csv"},
                                                            {Format::md, "md"},
                                                            {Format::html, "html"}};
}

std::string_view format_name(Format f) {
  for (auto [fmt, name] : kFormats)
    if (fmt == f) return name;
  return "text";
}

Format parse_format(std::string_view text, std::initializer_list<Format> allowed) {
  std::string list;
  for (Format f : allowed) {
    list += list.empty() ? "" : ", ";
    list += format_name(f);
    if (format_name(f) == text) return f;
  }
  throw UsageError(fmt::format("--format: '{}' is not a format of this command ({})", text, list));
}

const char* const kUnitsHelp =
    "unit system of the output and of bare numbers on the command line: ip or si (default: "
    "the unit file's units, else ip)";

void add_units_option(po::options_description& options) {
  options.add_options()("units", po::value<std::string>(), kUnitsHelp);
}

UnitsChoice::UnitsChoice(const po::variables_map& vm) {
  if (vm.count("units")) given_ = system_option(vm["units"].as<std::string>(), "--units");
}

units::System system_option(const std::string& text, std::string_view option) {
  try {
    return units::parse_system(text, option);
  } catch (const InputError& e) {
    throw UsageError(e.what());
  }
}

units::System UnitsChoice::resolve(const UnitFile& unit) const {
  return given_.value_or(unit.units);
}

void add_common_options(po::options_description& options, std::string_view formats) {
  add_units_option(options);
  options.add_options()("strict",
                        "treat warnings (implausible values, inputs that disagree) as errors")(
      "format", po::value<std::string>()->default_value("text"),
      fmt::format("output format: {}", formats).c_str())(
      "wide",
      "text output at full width (default: tables stacked and lines wrapped to fit 100 "
      "columns)")("help,h", "show this help");
}

bool parse_options(const std::vector<std::string>& args, const po::options_description& options,
                   const po::positional_options_description& positional, std::string_view usage,
                   std::string_view details, po::variables_map& vm) {
  try {
    po::store(
        po::command_line_parser(args)
            .options(options)
            .positional(positional)
            .style(po::command_line_style::default_style & ~po::command_line_style::allow_guessing)
            .run(),
        vm);
    if (vm.count("help")) {
      std::ostringstream os;
      os << "usage: " << usage << "\n\n" << options << "\n";
      if (!details.empty()) os << details << "\n";
      write_out(os.str());
      return false;
    }
    po::notify(vm);
  } catch (const po::error& e) {
    throw UsageError(e.what());
  }
  return true;
}

std::size_t Common::text_width() const {
  return wide ? report::kUnlimitedWidth : report::kTextWidth;
}

std::string terminal_text(const Common& common, const std::string& text) {
  return common.wide ? text : report::fit_lines(text, common.text_width());
}

Common read_common(const po::variables_map& vm, std::initializer_list<Format> allowed) {
  return {UnitsChoice(vm), parse_format(vm["format"].as<std::string>(), allowed),
          vm.count("strict") > 0, vm.count("wide") > 0};
}

double quantity(const po::variables_map& vm, const char* name, units::Kind kind,
                units::System system) {
  return units::parse(kind, vm[name].as<std::string>(), system, std::string("--") + name);
}

std::optional<double> site_pressure_option(const po::variables_map& vm, units::System system,
                                           std::vector<std::string>& warnings) {
  if (vm.count("pressure") && vm.count("elevation"))
    throw UsageError("give --pressure or --elevation, not both");
  // Each weighed against the plausible band of a site (plausible.hpp).
  const auto read = [&](const char* name, std::string_view band) {
    return plausible::parse(*plausible::find(band), vm[name].as<std::string>(), system,
                            {fmt::format("--{}", name), plausible::on_command_line(system)},
                            warnings);
  };
  if (vm.count("pressure")) {
    const double p = read("pressure", "site.pressure");
    psychro::check_pressure(p, "--pressure");
    return p;
  }
  if (!vm.count("elevation")) return std::nullopt;
  try {
    return psychro::standard_pressure_kpa(read("elevation", "site.elevation"));
  } catch (const RangeError& e) {
    throw InputError(
        fmt::format("--elevation {}: {}", vm["elevation"].as<std::string>(), e.what()));
  }
}

namespace {
std::string g_command = "limitline";
}

void set_command_name(std::string_view name) { g_command = fmt::format("limitline {}", name); }

void report_warnings(const std::vector<std::string>& warnings, bool strict) {
  if (warnings.empty()) return;
  if (strict)
    throw InputError(fmt::format(
        "{} (--strict makes warnings errors{})", warnings.front(),
        warnings.size() > 1 ? fmt::format("; {} more", warnings.size() - 1) : std::string()));
  for (const auto& w : warnings)
    std::fprintf(stderr, "%s: warning: %s\n", g_command.c_str(), w.c_str());
}

void write_out(const std::string& text) {
  if (std::fwrite(text.data(), 1, text.size(), stdout) != text.size())
    throw InputError(fmt::format("cannot write to standard output: {}", std::strerror(errno)));
}

int finish_output(int rc) {
  errno = 0;
  if (std::fflush(stdout) == 0 && !std::ferror(stdout)) return rc;
  const int error_number = errno ? errno : EIO;
  std::fprintf(stderr, "%s: error: cannot write to standard output: %s\n", g_command.c_str(),
               std::strerror(error_number));
  return 2;
}

void write_file(const std::string& path, const std::string& text, std::string_view option) {
  if (path == "-") {
    write_out(text);
    return;
  }
  write_output_file(path, text, std::string(option));
}

std::unique_ptr<OutputFile> open_side_output(const po::variables_map& vm, const char* name) {
  if (!vm.count(name)) return nullptr;
  const std::string path = vm[name].as<std::string>();
  if (path == "-")
    throw UsageError(
        fmt::format("--{} writes a file beside the report on standard output; give "
                    "a file name",
                    name));
  return std::make_unique<OutputFile>(path, std::string("--") + name);
}

namespace {

std::atomic<bool> g_interrupted{false};
static_assert(std::atomic<bool>::is_always_lock_free, "the signal handler needs a lock-free flag");

extern "C" void on_interrupt(int) {
  if (g_interrupted.exchange(true)) {
    remove_pending_outputs();
    _exit(kInterruptedExit);
  }
}

}  // namespace

void show_site_progress(std::size_t done, std::size_t total) {
  std::fprintf(stderr, "\r  %zu of %zu sites", done, total);
  if (done == total) std::fputc('\n', stderr);
}

void prepare_process() {
  // A site-year allocates a few vectors of about a megabyte and frees them; above the
  // default threshold each would be a fresh mmap whose pages fault in again, for every site
  // of a batch or survey (a fifth of a survey's time). Kept in the heap they are reused.
  mallopt(M_MMAP_THRESHOLD, 32 << 20);
  mallopt(M_TRIM_THRESHOLD, 64 << 20);
  for (int fd : {STDIN_FILENO, STDOUT_FILENO, STDERR_FILENO}) {
    if (fcntl(fd, F_GETFD) != -1 || errno != EBADF) continue;
    const int opened = open("/dev/null", O_RDONLY);
    if (opened >= 0 && opened != fd) {
      dup2(opened, fd);
      close(opened);
    }
  }
}

InterruptGuard::InterruptGuard() {
  g_interrupted = false;
  struct sigaction sa {};
  sa.sa_handler = on_interrupt;
  sigemptyset(&sa.sa_mask);
  sigaction(SIGINT, &sa, &old_);
}

InterruptGuard::~InterruptGuard() { sigaction(SIGINT, &old_, nullptr); }

const std::atomic<bool>& InterruptGuard::flag() { return g_interrupted; }

}  // namespace limitline::cli
