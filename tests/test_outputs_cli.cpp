// Every file the CLI writes is whole or absent: written beside the target and renamed on
// success; a full disk, a folder, a missing folder or Ctrl-C leaves an existing target as it
// was and no temporary file; an output that is also an input is refused; standard output is
// checked before exit. Weather: tests/data/greensboro-nc-tmy3.csv (open data set, see
// tests/data/SOURCES.md); the unit is the shared invented office of tests/support/office.hpp.
#include "support/cli.hpp"
#include "support/office.hpp"

#include <fcntl.h>
#include <signal.h>
#include <sys/mount.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <fstream>
#include <thread>

using limitline::test::CliRun;
using limitline::test::contains;
using limitline::test::run_cli;
using limitline::test::scratch_dir;
using limitline::test::shell_quote;
using limitline::test::slurp;

namespace fs = std::filesystem;

namespace {

const std::string kSuite = "outputs_cli";

std::string data(const std::string& f) { return std::string(LIMITLINE_TEST_DATA_DIR) + "/" + f; }

fs::path write_unit(const fs::path& dir, const std::string& name) {
  const auto p = dir / name;
  std::ofstream(p) << limitline::test::kOfficeUnit;
  return p;
}

fs::path fresh_dir(const std::string& name) {
  const auto d = scratch_dir(kSuite) / name;
  fs::remove_all(d);
  fs::create_directories(d);
  return d;
}

// Files of `dir` other than `keep`: a temporary file left behind shows up here.
std::vector<std::string> strays(const fs::path& dir, const std::vector<std::string>& keep) {
  std::vector<std::string> out;
  for (const auto& e : fs::directory_iterator(dir)) {
    const std::string n = e.path().filename().string();
    if (std::find(keep.begin(), keep.end(), n) == keep.end()) out.push_back(n);
  }
  return out;
}

// Runs limitline through the shell with its standard output sent where `redirect` says
// (e.g. "> /dev/full", ">&-").
CliRun run_redirected(const std::vector<std::string>& args, const std::string& redirect) {
  const auto dir = scratch_dir(kSuite);
  std::string cmd = "cd " + shell_quote(LIMITLINE_SOURCE_DIR) + " && LIMITLINE_DATA_DIR=" +
                    shell_quote(std::string(LIMITLINE_SOURCE_DIR) + "/data") + " " +
                    shell_quote(LIMITLINE_EXE);
  for (const auto& a : args) cmd += " " + shell_quote(a);
  cmd += " < /dev/null " + redirect + " 2> " + shell_quote((dir / "redirected-err").string());
  const int status = std::system(cmd.c_str());
  REQUIRE(WIFEXITED(status));
  return {WEXITSTATUS(status), "", slurp(dir / "redirected-err")};
}

// A small full file system: a 64 KiB tmpfs mounted for the test when it runs as root; none
// otherwise (the caller then writes to /dev/full).
struct SmallFileSystem {
  fs::path dir;
  bool mounted = false;
  SmallFileSystem() {
    dir = fresh_dir("tmpfs");
    if (geteuid() == 0) mounted = ::mount("tmpfs", dir.c_str(), "tmpfs", 0, "size=64k") == 0;
  }
  ~SmallFileSystem() {
    if (mounted) ::umount(dir.c_str());
  }
};

}  // namespace

TEST_CASE("a full file system leaves the existing target untouched, no temporary file, exit 2") {
  const auto work = fresh_dir("full");
  const auto unit = write_unit(work, "unit.toml");
  SmallFileSystem small;
  if (!small.mounted) {
    // Not root: /dev/full stands in; a device is written in place and the failure is reported.
    const auto r = run_cli(
        {"chart", unit.string(), "--weather", data("greensboro-nc-tmy3.csv"), "-o", "/dev/full"},
        kSuite);
    CHECK(r.rc == 2);
    CHECK(contains(r.err, "No space left on device"));
    return;
  }
  const std::string good = "the good file from an earlier run\n";
  struct Case {
    const char* what;
    std::vector<std::string> args;
    std::string target;
  };
  const std::string target = (small.dir / "out.file").string();
  const std::vector<Case> cases = {
      {"chart -o",
       {"chart", unit.string(), "--weather", data("greensboro-nc-tmy3.csv"), "-o", target},
       target},
      {"report -o (html)",
       {"report", unit.string(), "--weather", data("greensboro-nc-tmy3.csv"), "-o", target},
       target},
      {"year --hourly",
       {"year", unit.string(), "--weather", data("greensboro-nc-tmy3.csv"), "--hourly", target},
       target},
      {"sensors --trials-csv",
       {"sensors", unit.string(), "--weather", data("greensboro-nc-tmy3.csv"), "--trials", "400",
        "--break-even-trials", "0", "--trials-csv", target},
       target},
  };
  for (const auto& c : cases) {
    const std::string what = c.what;
    CAPTURE(what);
    std::ofstream(c.target, std::ios::binary) << good;
    const auto r = run_cli(c.args, kSuite);
    CHECK(r.rc == 2);
    CHECK(contains(r.err, "No space left on device"));
    CHECK(contains(r.err, "out.file"));
    CHECK(r.err.find('\n') == r.err.size() - 1);
    CHECK(slurp(c.target) == good);
    CHECK(strays(small.dir, {"out.file"}).empty());
  }
  {
    INFO("report --format md: none of its three files is left half-written");
    const auto md = small.dir / "study.md";
    std::ofstream(md, std::ios::binary) << good;
    const auto r = run_cli({"report", unit.string(), "--weather", data("greensboro-nc-tmy3.csv"),
                            "--format", "md", "-o", md.string()},
                           kSuite);
    CHECK(r.rc == 2);
    CHECK(contains(r.err, "No space left on device"));
    CHECK(slurp(md) == good);
    CHECK(strays(small.dir, {"out.file", "study.md"}).empty());
  }
}

TEST_CASE("a device stays a device: -o /dev/null writes through it") {
  const auto r = run_cli({"chart", "-o", "/dev/null"}, kSuite);
  CHECK(r.rc == 0);
  struct stat st {};
  REQUIRE(::stat("/dev/null", &st) == 0);
  CHECK(S_ISCHR(st.st_mode));
}

TEST_CASE("a written output replaces the target whole, through a link, keeping the link") {
  const auto dir = fresh_dir("link");
  const auto unit = write_unit(dir, "unit.toml");
  std::ofstream(dir / "chart.svg") << "old";
  fs::create_symlink("chart.svg", dir / "current.svg");
  const auto r = run_cli({"chart", unit.string(), "--weather", data("greensboro-nc-tmy3.csv"), "-o",
                          (dir / "current.svg").string()},
                         kSuite);
  REQUIRE(r.rc == 0);
  CHECK(fs::is_symlink(dir / "current.svg"));
  const std::string svg = slurp(dir / "chart.svg");
  CHECK(svg.starts_with("<svg"));
  CHECK(svg.find("</svg>") != std::string::npos);
  CHECK(strays(dir, {"unit.toml", "chart.svg", "current.svg"}).empty());
}

TEST_CASE("an output that is also an input is refused, and the input kept") {
  const auto dir = fresh_dir("same");
  const auto unit = write_unit(dir, "unit.toml");
  const auto weather = dir / "site.csv";
  fs::copy_file(data("greensboro-nc-tmy3.csv"), weather);
  fs::create_symlink("site.csv", dir / "alias.csv");
  const std::string before = slurp(weather), unit_before = slurp(unit);
  SUBCASE("--hourly onto the weather file, spelt another way") {
    const auto r = run_cli({"year", unit.string(), "--weather", weather.string(), "--hourly",
                            (dir / "." / "site.csv").string()},
                           kSuite);
    CHECK(r.rc == 2);
    CHECK(contains(r.err, "--hourly"));
    CHECK(contains(r.err, "is also an input"));
  }
  SUBCASE("chart -o through a link to the weather file") {
    const auto r = run_cli(
        {"chart", unit.string(), "--weather", weather.string(), "-o", (dir / "alias.csv").string()},
        kSuite);
    CHECK(r.rc == 2);
    CHECK(contains(r.err, "is also an input"));
  }
  SUBCASE("report -o onto the unit file") {
    const auto r = run_cli(
        {"report", unit.string(), "--weather", weather.string(), "-o", unit.string()}, kSuite);
    CHECK(r.rc == 2);
    CHECK(contains(r.err, "is also an input"));
  }
  SUBCASE("sensors --trials-csv onto the weather file") {
    const auto r = run_cli({"sensors", unit.string(), "--weather", weather.string(), "--trials",
                            "5", "--break-even-trials", "0", "--trials-csv", weather.string()},
                           kSuite);
    CHECK(r.rc == 2);
    CHECK(contains(r.err, "is also an input"));
  }
  CHECK(slurp(weather) == before);
  CHECK(slurp(unit) == unit_before);
  CHECK(strays(dir, {"unit.toml", "site.csv", "alias.csv"}).empty());
}

TEST_CASE("an output that cannot be created: exit 2 with the system's reason, before the work") {
  SUBCASE("a missing folder") {
    const auto r = run_cli({"year", "--hourly", "/nonexistent-folder/hours.csv"}, kSuite);
    CHECK(r.rc == 2);
    CHECK(contains(r.err, "--hourly"));
    CHECK(contains(r.err, "No such file or directory"));
    CHECK(r.out.empty());
  }
  SUBCASE("a folder") {
    const auto dir = fresh_dir("folder-target");
    const auto r = run_cli({"chart", "-o", dir.string()}, kSuite);
    CHECK(r.rc == 2);
    CHECK(contains(r.err, "is a folder"));
  }
  SUBCASE("standard output for a side file is a usage error") {
    const auto r = run_cli({"year", "--hourly", "-"}, kSuite);
    CHECK(r.rc == 1);
    CHECK(contains(r.err, "--hourly"));
  }
}

TEST_CASE("standard output is checked before exit: a full disk or a closed stdout is exit 2") {
  SUBCASE("a small output to /dev/full") {
    const auto r = run_redirected({"state", "--dry-bulb", "75F", "--rh", "50%"}, "> /dev/full");
    CHECK(r.rc == 2);
    CHECK(contains(r.err, "cannot write to standard output: No space left on device"));
    CHECK(r.err.find('\n') == r.err.size() - 1);
  }
  SUBCASE("a large output to /dev/full is bad output, not an internal error") {
    const auto r = run_redirected({"year", "--format", "json"}, "> /dev/full");
    CHECK(r.rc == 2);
    CHECK(contains(r.err, "No space left on device"));
    CHECK_FALSE(contains(r.err, "internal error"));
  }
  SUBCASE("state --batch to /dev/full") {
    const auto dir = fresh_dir("batch-full");
    std::ofstream(dir / "points.csv") << "dry_bulb,rh\n75,50\n80,40\n";
    const auto r =
        run_redirected({"state", "--batch", (dir / "points.csv").string()}, "> /dev/full");
    CHECK(r.rc == 2);
    CHECK(contains(r.err, "No space left on device"));
  }
  SUBCASE("a closed stdout") {
    const auto r = run_redirected({"state", "--dry-bulb", "75F", "--rh", "50%"}, ">&-");
    CHECK(r.rc == 2);
    CHECK(contains(r.err, "cannot write to standard output"));
    CHECK(r.err.find('\n') == r.err.size() - 1);
  }
}

TEST_CASE(
    "Ctrl-C while --hourly is open leaves no half file and the old one untouched (exit 130)") {
  // The weather comes through a named pipe: the command holds its --hourly output open while
  // it waits for the weather, so the interrupt lands at a known point.
  const auto dir = fresh_dir("interrupt");
  const auto unit = write_unit(dir, "unit.toml");
  const auto fifo = dir / "weather.csv";
  REQUIRE(::mkfifo(fifo.c_str(), 0600) == 0);
  const auto hours = dir / "hours.csv";
  std::ofstream(hours) << "an earlier run\n";
  const pid_t pid = limitline::test::spawn_cli(
      {"year", unit.string(), "--weather", fifo.string(), "--hourly", hours.string()});
  // Opening the pipe for writing returns once the command opened it for reading: by then its
  // temporary output exists.
  const int w = ::open(fifo.c_str(), O_WRONLY);
  REQUIRE(w >= 0);
  CHECK(strays(dir, {"unit.toml", "weather.csv", "hours.csv"}).size() == 1);
  kill(pid, SIGINT);
  ::close(w);  // the signal is already pending; closing only keeps a deaf command from hanging
  CHECK(limitline::test::wait_cli(pid) == 130);
  CHECK(slurp(hours) == "an earlier run\n");
  CHECK(strays(dir, {"unit.toml", "weather.csv", "hours.csv"}).empty());
}
