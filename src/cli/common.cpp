#include "common.hpp"

#include <limitline/plausible.hpp>
#include <limitline/psychro.hpp>

#include <fmt/format.h>

#include <cstdio>
#include <iostream>
#include <sstream>

namespace limitline::cli {

namespace {
constexpr std::pair<Format, std::string_view> kFormats[] = {
    {Format::text, "text"}, {Format::json, "json"}, {Format::csv, "csv"}, {Format::md, "md"}};
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

void add_common_options(po::options_description& options, std::string_view formats) {
  options.add_options()
      ("units", po::value<std::string>()->default_value("ip"),
       "unit system for output and for bare numbers: ip or si")
      ("strict", "treat warnings (implausible values, inputs that disagree) as errors")
      ("format", po::value<std::string>()->default_value("text"),
       fmt::format("output format: {}", formats).c_str())
      ("help,h", "show this help");
}

bool parse_options(const std::vector<std::string>& args, const po::options_description& options,
                   const po::positional_options_description& positional, std::string_view usage,
                   std::string_view details, po::variables_map& vm) {
  try {
    po::store(po::command_line_parser(args)
                  .options(options)
                  .positional(positional)
                  .style(po::command_line_style::default_style &
                         ~po::command_line_style::allow_guessing)
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

Common read_common(const po::variables_map& vm, std::initializer_list<Format> allowed) {
  return {units::parse_system(vm["units"].as<std::string>()),
          parse_format(vm["format"].as<std::string>(), allowed), vm.count("strict") > 0};
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
    throw InputError(fmt::format("--elevation {}: {}", vm["elevation"].as<std::string>(), e.what()));
  }
}

namespace {
std::string g_command = "limitline";
}

void set_command_name(std::string_view name) { g_command = fmt::format("limitline {}", name); }

void report_warnings(const std::vector<std::string>& warnings, bool strict) {
  if (warnings.empty()) return;
  if (strict)
    throw InputError(fmt::format("{} (--strict makes warnings errors{})", warnings.front(),
                                 warnings.size() > 1
                                     ? fmt::format("; {} more", warnings.size() - 1)
                                     : std::string()));
  for (const auto& w : warnings) std::fprintf(stderr, "%s: warning: %s\n", g_command.c_str(), w.c_str());
}

void write_out(const std::string& text) {
  if (std::fwrite(text.data(), 1, text.size(), stdout) != text.size())
    throw std::runtime_error("cannot write to standard output");
}

}  // namespace limitline::cli
