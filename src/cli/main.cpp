// limitline: economizer high-limit analysis. Dispatches to one subcommand per file.
#include "common.hpp"

#include <fmt/format.h>

#include <cstdio>
#include <exception>
#include <string>
#include <vector>

namespace {

using limitline::cli::Command;

// Every subcommand, in the order the help lists them.
const Command kCommands[] = {
    {"state", "properties of one moist-air state, or of every row of a CSV file",
     limitline::cli::run_state},
    {"check", "what each high-limit strategy decides and costs at one outdoor condition",
     limitline::cli::run_check},
    {"year", "annual evaluation of every high-limit strategy for a unit and a weather year",
     limitline::cli::run_year},
    {"sequence", "the economizer part of a sequence of operation, written from the unit file",
     limitline::cli::run_sequence},
    {"code", "what an energy code allows for the high-limit, and verdicts for a unit",
     limitline::cli::run_code},
    {"chart", "psychrometric chart (SVG) of a unit's high-limits and a climate's hours",
     limitline::cli::run_chart},
    {"report", "the study as one self-contained HTML page (or Markdown) for a client",
     limitline::cli::run_report},
    {"tune", "the best setpoint of each high-limit strategy, and the band of settings near it",
     limitline::cli::run_tune},
    {"sensors", "how each high-limit fares with biased sensors: trials, sweep, break-even accuracy",
     limitline::cli::run_sensors},
    {"audit", "a trend log checked against the unit's high-limit: findings for an inspector",
     limitline::cli::run_audit},
    {"survey", "one unit at many sites: the best high-limit and setpoint by climate zone",
     limitline::cli::run_survey},
    {"merge", "the partial results of a sharded survey combined into its report",
     limitline::cli::run_merge},
    {"serve", "the study page in a browser: a local web server with a JSON API",
     limitline::cli::run_serve},
};

void print_overview() {
  std::string out =
      "limitline: choose and check air-side economizer high-limit controls\n\n"
      "usage: limitline COMMAND [options]   (limitline COMMAND --help for details)\n\n"
      "commands:\n";
  for (const Command& c : kCommands) out += fmt::format("  {:<10} {}\n", c.name, c.summary);
  out +=
      "\nExit codes: 0 success, 1 usage error, 2 bad input or an output that could not be\n"
      "written, 130 interrupted (Ctrl-C).\n";
  std::fputs(out.c_str(), stdout);
}

}  // namespace

int main(int argc, char** argv) {
  limitline::cli::prepare_process();
  const std::vector<std::string> all(argv + 1, argv + argc);
  if (all.empty() || all[0] == "--help" || all[0] == "-h" || all[0] == "help") {
    print_overview();
    return limitline::cli::finish_output(all.empty() ? 1 : 0);
  }
  if (all[0] == "--version") {
    std::puts("limitline " LIMITLINE_CLI_VERSION);
    return limitline::cli::finish_output(0);
  }
  for (const Command& c : kCommands) {
    if (c.name != all[0]) continue;
    limitline::cli::set_command_name(c.name);
    try {
      return limitline::cli::finish_output(
          c.run(std::vector<std::string>(all.begin() + 1, all.end())));
    } catch (const limitline::UsageError& e) {
      std::fflush(stdout);
      std::fprintf(stderr, "limitline %s: %s (see limitline %s --help)\n", all[0].c_str(), e.what(),
                   all[0].c_str());
      return 1;
    } catch (const limitline::InputError& e) {
      // What was written before the error (the good rows of a batch) goes out first.
      std::fflush(stdout);
      std::fprintf(stderr, "limitline %s: error: %s\n", all[0].c_str(), e.what());
      return 2;
    } catch (const std::exception& e) {
      std::fflush(stdout);
      std::fprintf(stderr, "limitline %s: internal error: %s\n", all[0].c_str(), e.what());
      return 3;
    }
  }
  std::fprintf(stderr, "limitline: '%s' is not a command (see limitline --help)\n", all[0].c_str());
  return 1;
}
