// Every example of every `--help` text is a command that runs: each "Examples:" line of each
// command's help is run as written, in a fresh folder that holds the repository's examples/
// and tests/data, so a help text can only show files that exist and options that work.
#include "support/cli.hpp"

#include <algorithm>
#include <sstream>

using namespace limitline::test;

namespace fs = std::filesystem;

namespace {

// The lines after the line `heading` of a help text, for as long as they start with `prefix`.
std::vector<std::string> section(const std::string& text, const std::string& heading,
                                 const std::string& prefix) {
  std::vector<std::string> out;
  std::istringstream in(text);
  bool inside = false;
  for (std::string line; std::getline(in, line);) {
    if (!inside) {
      inside = line == heading;
    } else if (line.rfind(prefix, 0) == 0) {
      out.push_back(line);
    } else {
      break;
    }
  }
  return out;
}

std::string help(const std::vector<std::string>& args) {
  const CliRun r = run_cli(args, "help_cli");
  REQUIRE(r.rc == 0);
  return r.out;
}

// The command names listed under "commands:" in `limitline --help`.
std::vector<std::string> commands() {
  std::vector<std::string> out;
  for (const std::string& line : section(help({"--help"}), "commands:", "  ")) {
    std::istringstream words(line);
    std::string name;
    words >> name;
    out.push_back(name);
  }
  return out;
}

// The lines after "Examples:" in a command's help, each a command line "limitline ...".
std::vector<std::string> examples(const std::string& command) {
  std::vector<std::string> out;
  for (const std::string& line : section(help({command, "--help"}), "Examples:", "  limitline "))
    out.push_back(line.substr(2));
  return out;
}

// A fresh folder with examples/ and tests/data of the repository, and `limitline` on the PATH.
fs::path example_folder() {
  const fs::path dir = scratch_dir("help_examples");
  fs::remove_all(dir);
  fs::create_directories(dir / "tests");
  fs::create_directories(dir / "bin");
  const fs::path source(LIMITLINE_SOURCE_DIR);
  fs::create_directory_symlink(source / "examples", dir / "examples");
  fs::create_directory_symlink(source / "tests" / "data", dir / "tests" / "data");
  fs::create_symlink(LIMITLINE_EXE, dir / "bin" / "limitline");
  return dir;
}

// Runs one example line through the shell, as a user would type it. `limitline serve` runs
// until stopped: it is stopped with SIGTERM once its first line (the URL) is out, and must then
// end with exit 0.
CliRun run_example(const fs::path& dir, const std::string& example) {
  const std::string script =
      example.rfind("limitline serve", 0) == 0
          ? example +
                " & pid=$!; until grep -q 'token=' out.txt || ! kill -0 $pid; do sleep 0.1; "
                "done; kill -TERM $pid; wait $pid"
          : example;
  const std::string cmd =
      "cd " + shell_quote(dir.string()) + " && PATH=" + shell_quote((dir / "bin").string()) +
      ":\"$PATH\" LIMITLINE_DATA_DIR=" + shell_quote(std::string(LIMITLINE_SOURCE_DIR) + "/data") +
      " sh -c " + shell_quote(script) + " < /dev/null > out.txt 2> err.txt";
  const int status = std::system(cmd.c_str());
  REQUIRE(WIFEXITED(status));
  CliRun r{WEXITSTATUS(status), slurp(dir / "out.txt"), slurp(dir / "err.txt")};
  check_no_nan(r);
  return r;
}

}  // namespace

TEST_CASE("the top-level help lists every command") {
  const auto names = commands();
  for (const char* expected : {"state", "check", "year", "sequence", "code", "chart", "report",
                               "sensors", "audit", "serve"})
    CHECK(std::find(names.begin(), names.end(), expected) != names.end());
}

TEST_CASE("every command's help shows examples, and every example runs") {
  const fs::path dir = example_folder();
  for (const std::string& command : commands()) {
    CAPTURE(command);
    const auto lines = examples(command);
    CHECK_FALSE(lines.empty());
    for (const std::string& example : lines) {
      CAPTURE(example);
      const std::string self = "limitline " + command;
      CHECK((example == self || example.rfind(self + ' ', 0) == 0));
      const CliRun r = run_example(dir, example);
      CAPTURE(r.err);
      CHECK(r.rc == 0);
      // Something came out: on standard output, or in the file the example writes.
      const bool writes_file = example.find(" -o ") != std::string::npos ||
                               example.find(" > ") != std::string::npos ||
                               example.find("--hourly") != std::string::npos ||
                               example.find("--trials-csv") != std::string::npos;
      CHECK((writes_file || !r.out.empty()));
    }
  }
}
