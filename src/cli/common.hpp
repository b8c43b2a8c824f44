#pragma once
// Shared plumbing of the command-line front end: option parsing, formats, exit codes.
// Commands only parse, call the library and format; nothing here knows physics.
#include <limitline/error.hpp>
#include <limitline/io/output_file.hpp>
#include <limitline/model/units.hpp>

#include <boost/program_options.hpp>
#include <fmt/format.h>

#include <atomic>
#include <csignal>
#include <filesystem>
#include <initializer_list>
#include <memory>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace limitline {
struct UnitFile;
struct UnitSource;
struct WeatherOverrides;
}  // namespace limitline

namespace limitline {

// Wrong use of the command line (exit code 1). The command line's own: the library reports
// bad values as InputError whatever their origin.
class UsageError : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

}  // namespace limitline

namespace limitline::cli {

// A unit system named on the command line (--units, --compare-in); a wrong name is a usage
// error.
units::System system_option(const std::string& text, std::string_view option);

namespace po = boost::program_options;

enum class Format { text, json, csv, md, html };

Format parse_format(std::string_view text, std::initializer_list<Format> allowed);
std::string_view format_name(Format f);

// One subcommand: `run` gets the arguments after the command name.
struct Command {
  std::string_view name;
  std::string_view summary;
  int (*run)(const std::vector<std::string>& args);
};

// Declared by each src/cli/cmd_*.cpp.
int run_state(const std::vector<std::string>& args);
int run_check(const std::vector<std::string>& args);
int run_year(const std::vector<std::string>& args);
int run_sequence(const std::vector<std::string>& args);
int run_code(const std::vector<std::string>& args);
int run_chart(const std::vector<std::string>& args);
int run_report(const std::vector<std::string>& args);
int run_sensors(const std::vector<std::string>& args);
int run_tune(const std::vector<std::string>& args);
int run_audit(const std::vector<std::string>& args);
int run_survey(const std::vector<std::string>& args);
int run_merge(const std::vector<std::string>& args);
int run_serve(const std::vector<std::string>& args);

// Parses `args` against `options` (and positionals). When --help is present it prints
// `usage`, the options and `details` and returns false; otherwise fills `vm` and returns true.
// Parse failures are UsageError.
bool parse_options(const std::vector<std::string>& args, const po::options_description& options,
                   const po::positional_options_description& positional, std::string_view usage,
                   std::string_view details, po::variables_map& vm);

// Adds --units, --strict, --format (with the formats this command accepts) and --help.
void add_common_options(po::options_description& options, std::string_view formats);
// Adds --units alone (for the commands whose --format is their own).
void add_units_option(po::options_description& options);
// The help text of --units, the same for every command.
extern const char* const kUnitsHelp;

// The unit system a command prints in and reads bare numbers in: --units when given, else
// the unit file's `units`, else IP. It is resolved once the unit file (if any) is read.
class UnitsChoice {
 public:
  explicit UnitsChoice(const po::variables_map& vm);
  units::System resolve() const { return given_.value_or(units::System::ip); }
  units::System resolve(const UnitFile& unit) const;
  bool given() const { return given_.has_value(); }

 private:
  std::optional<units::System> given_;
};

struct Common {
  UnitsChoice units;
  Format format;
  bool strict = false;  // --strict: warnings are errors
  bool wide = false;    // --wide: text tables and lines at full width
  // The width text output fits: report::kTextWidth, or no limit with --wide.
  std::size_t text_width() const;
};
// Text output as the terminal gets it: long prose lines wrapped to text_width() (tables are
// already laid out to it by their formatters).
std::string terminal_text(const Common& common, const std::string& text);
Common read_common(const po::variables_map& vm, std::initializer_list<Format> allowed);

// A whole-number option held to [lo, hi]; InputError naming the option outside it.
template <class T>
T bounded(const po::variables_map& vm, const char* name, T lo, T hi) {
  const T v = vm[name].as<T>();
  if (v < lo || v > hi)
    throw InputError(
        fmt::format("--{}: {} is outside the allowed range ({} to {})", name, v, lo, hi));
  return v;
}

// Reads option `name` as a quantity of `kind`, in `system` for bare numbers.
double quantity(const po::variables_map& vm, const char* name, units::Kind kind,
                units::System system);

// The unit-file and weather options of the commands that read a unit and its weather year
// (UNIT.toml positional, --demo, --weather, --column, --humidity, --on-bad-row,
// --time-convention), and what they select. Defined in job_options.cpp.
void add_job_options(po::options_description& options,
                     po::positional_options_description& positional);
limitline::UnitSource job_source(const po::variables_map& vm);
limitline::WeatherOverrides weather_overrides(const po::variables_map& vm);

// Writes text whole to a file (or stdout for "-") through limitline::OutputFile: a
// temporary file renamed on success. InputError naming `option` when it cannot.
void write_file(const std::string& path, const std::string& text, std::string_view option);

// The file output of option `name` (--hourly, --trials-csv), opened now; none when the option
// is absent. "-" is refused: the report itself goes to standard output.
std::unique_ptr<OutputFile> open_side_output(const po::variables_map& vm, const char* name);

// The files a job reads: the unit file (unless embedded), its weather file and the extra
// code tables, for refuse_input_as_output.
std::vector<std::filesystem::path> job_input_files(const po::variables_map& vm,
                                                   const std::string& weather_label);

// The site pressure from --pressure or --elevation (standard pressure, ASHRAE Fundamentals
// ch. 1 eq. 3); none when neither is given. Both at once is a UsageError. A value outside the
// plausible band of a site is refused when it is a bare number plausible only in the other
// unit system, else described in `warnings` (plausible.hpp).
std::optional<double> site_pressure_option(const po::variables_map& vm, units::System system,
                                           std::vector<std::string>& warnings);

// Prints each warning to stderr as "limitline COMMAND: warning: ..."; under --strict the
// first one is an InputError instead (exit 2), before any result is written.
void report_warnings(const std::vector<std::string>& warnings, bool strict);
// The command name main() dispatched to, for the prefix of warnings.
void set_command_name(std::string_view name);

// Writes text to stdout exactly (no added newline); InputError (exit 2) with the system's
// reason when stdout fails.
void write_out(const std::string& text);
// Flushes stdout at the end of a command: a failed write (a full disk, a closed stdout) turns
// `rc` into exit 2 with a one-line error.
int finish_output(int rc);

// "  N of M sites" on standard error, rewritten in place (for a terminal only).
void show_site_progress(std::size_t done, std::size_t total);

// 128 + SIGINT, as shells report an interrupted command.
constexpr int kInterruptedExit = 130;

// For main(): a closed standard descriptor is reopened on /dev/null (read-only, so writes to
// it fail with the system's reason instead of landing in the next file opened). Temporary
// output files are removed on Ctrl-C by OutputFile itself.
void prepare_process();

// For a long command that reports what finished when interrupted (sensors, year --batch):
// while it lives, the first Ctrl-C only sets the flag the work polls; a second one ends the
// process at once, temporary files removed (exit 130). Restores the previous handler after.
class InterruptGuard {
 public:
  InterruptGuard();
  ~InterruptGuard();
  InterruptGuard(const InterruptGuard&) = delete;
  InterruptGuard& operator=(const InterruptGuard&) = delete;

  static const std::atomic<bool>& flag();
  bool interrupted() const { return flag().load(); }

 private:
  struct sigaction old_ {};
};

}  // namespace limitline::cli
