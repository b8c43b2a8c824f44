#pragma once
// Running the built `limitline` executable from a test: exit code, stdout and stderr, and the
// checks every output must pass (never NaN or inf).
#include <doctest/doctest.h>

#include <fcntl.h>
#include <sched.h>
#include <signal.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <regex>
#include <sstream>
#include <string>
#include <vector>

namespace limitline::test {

struct CliRun {
  int rc = -1;
  std::string out, err;
};

inline std::string slurp(const std::filesystem::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

inline std::string shell_quote(const std::string& a) {
  std::string out = "'";
  for (char c : a) out += c == '\'' ? std::string("'\\''") : std::string(1, c);
  return out + "'";
}

// A scratch folder for one suite, below the build folder.
inline std::filesystem::path scratch_dir(const std::string& suite) {
  auto d = std::filesystem::path(LIMITLINE_BINARY_DIR) / "test-scratch" / suite;
  std::filesystem::create_directories(d);
  return d;
}

// Every output of a run, standard output and error, is free of NaN and inf.
inline void check_no_nan(const CliRun& r) {
  static const std::regex bad(R"((^|[^a-z])(nan|inf)([^a-z]|$))", std::regex::icase);
  CHECK_FALSE(std::regex_search(r.out, bad));
  CHECK_FALSE(std::regex_search(r.err, bad));
}

// Runs `limitline ARGS...` in the source folder with the source tree's data (code tables).
inline CliRun run_cli(const std::vector<std::string>& args, const std::string& suite = "cli") {
  const auto dir = scratch_dir(suite);
  std::string cmd = "cd " + shell_quote(LIMITLINE_SOURCE_DIR) + " && LIMITLINE_DATA_DIR=" +
                    shell_quote(std::string(LIMITLINE_SOURCE_DIR) + "/data") + " " +
                    shell_quote(LIMITLINE_EXE);
  for (const auto& a : args) cmd += " " + shell_quote(a);
  cmd += " < /dev/null > " + shell_quote((dir / "out").string()) + " 2> " +
         shell_quote((dir / "err").string());
  const int status = std::system(cmd.c_str());
  REQUIRE(WIFEXITED(status));
  CliRun r{WEXITSTATUS(status), slurp(dir / "out"), slurp(dir / "err")};
  check_no_nan(r);
  return r;
}

// Starts `limitline ARGS...` without waiting, its standard output and error written to the
// files given (or /dev/null), for tests that signal a running command. Returns its pid.
inline pid_t spawn_cli(std::vector<std::string> args, const std::string& out = "/dev/null",
                       const std::string& err = "/dev/null") {
  const pid_t pid = fork();
  REQUIRE(pid >= 0);
  if (pid == 0) {
    dup2(::open("/dev/null", O_RDONLY), 0);
    dup2(::open(out.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0644), 1);
    dup2(::open(err.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0644), 2);
    args.insert(args.begin(), LIMITLINE_EXE);
    std::vector<char*> argv;
    for (auto& a : args) argv.push_back(a.data());
    argv.push_back(nullptr);
    execv(LIMITLINE_EXE, argv.data());
    _exit(127);
  }
  return pid;
}

// Waits for a spawned command; its exit code (128 + signal when a signal ended it).
// Sends `sig` to `pid` and returns once a thread of that process has taken it (it is no
// longer pending in /proc/PID/status), so a test can order what it does next after the
// handler started. No timer: it waits on the kernel's own record.
inline void signal_and_wait_taken(pid_t pid, int sig) {
  ::kill(pid, sig);
  const unsigned long long bit = 1ull << (sig - 1);
  for (;;) {
    std::ifstream status("/proc/" + std::to_string(pid) + "/status");
    bool pending = false, read_any = false;
    for (std::string line; std::getline(status, line);) {
      if (line.rfind("ShdPnd:", 0) != 0 && line.rfind("SigPnd:", 0) != 0) continue;
      read_any = true;
      pending = pending || (std::stoull(line.substr(7), nullptr, 16) & bit) != 0;
    }
    if (!read_any || !pending) return;  // taken, or the process is gone
    ::sched_yield();
  }
}

inline int wait_cli(pid_t pid) {
  int status = 0;
  waitpid(pid, &status, 0);
  return WIFEXITED(status) ? WEXITSTATUS(status) : 128 + WTERMSIG(status);
}

inline bool contains(const std::string& haystack, const std::string& needle) {
  return haystack.find(needle) != std::string::npos;
}

}  // namespace limitline::test
