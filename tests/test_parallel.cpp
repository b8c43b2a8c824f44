// The one thread pool: every index once, results by index whatever the thread count,
// progress on the calling thread only, Ctrl-C (the cancel flag) and exceptions stop it
// between items.
#include <doctest/doctest.h>

#include <limitline/parallel.hpp>

#include <algorithm>
#include <atomic>
#include <numeric>
#include <stdexcept>
#include <thread>
#include <vector>

using limitline::ParallelRun;
using limitline::ParallelWork;

namespace {

// Sum of the squares of 0..i-1 at index i, with a per-thread scratch vector.
std::vector<long long> run_squares(std::size_t n, unsigned threads) {
  std::vector<long long> out(n, -1);
  ParallelRun run;
  run.threads = threads;
  const auto done = limitline::parallel_for(
      n, run, [] { return std::vector<long long>(); },
      [&](std::size_t i, std::vector<long long>& scratch) {
        scratch.assign(i, 0);
        std::iota(scratch.begin(), scratch.end(), 0LL);
        long long s = 0;
        for (long long v : scratch) s += v * v;
        out[i] = s;
      });
  for (std::uint8_t d : done) CHECK(d == 1);
  return out;
}

}  // namespace

TEST_CASE("every index runs once and results do not depend on the thread count") {
  const auto one = run_squares(200, 1);
  for (std::size_t i = 0; i < one.size(); ++i) {
    const long long k = static_cast<long long>(i);
    CHECK(one[i] == (k - 1) * k * (2 * k - 1) / 6);  // sum of squares 0..k-1, closed form
  }
  CHECK(run_squares(200, 3) == one);
  CHECK(run_squares(200, 0) == one);  // all cores
  CHECK(run_squares(3, 16) == std::vector<long long>(one.begin(), one.begin() + 3));
  CHECK(run_squares(0, 4).empty());
}

TEST_CASE("progress is reported on the calling thread, rising to the total once") {
  const auto caller = std::this_thread::get_id();
  std::vector<std::size_t> seen;
  bool other_thread = false;
  ParallelRun run;
  run.threads = 4;
  run.progress = [&](std::size_t done, std::size_t total) {
    other_thread = other_thread || std::this_thread::get_id() != caller;
    CHECK(total == 50);
    seen.push_back(done);
  };
  std::atomic<int> calls{0};
  const auto done = limitline::parallel_for(
      50, run, [&]() -> ParallelWork { return [&](std::size_t) { ++calls; }; });
  CHECK(calls == 50);
  CHECK_FALSE(other_thread);
  REQUIRE_FALSE(seen.empty());
  CHECK(seen.back() == 50);
  for (std::size_t i = 1; i < seen.size(); ++i) CHECK(seen[i] > seen[i - 1]);
}

TEST_CASE("once the cancel flag is set no further item starts") {
  std::atomic<bool> stop{false};
  ParallelRun run;
  run.threads = 2;
  run.cancel = &stop;
  run.progress = [&](std::size_t done, std::size_t) {
    if (done >= 5) stop = true;
  };
  // Items after the fifth wait for the flag, so the progress callback sees five done and
  // sets it: those then under way (one a thread) finish, and nothing else starts.
  const auto done = limitline::parallel_for(10000, run, [&]() -> ParallelWork {
    return [&](std::size_t i) {
      while (i >= 5 && !stop) std::this_thread::yield();
    };
  });
  const auto finished = std::count(done.begin(), done.end(), 1);
  CHECK(finished >= 5);
  CHECK(finished <= 5 + 2);
  SUBCASE("a flag set before the start runs nothing, and still reports the count") {
    std::vector<std::size_t> seen;
    run.progress = [&](std::size_t d, std::size_t) { seen.push_back(d); };
    const auto none =
        limitline::parallel_for(10, run, [&]() -> ParallelWork { return [](std::size_t) {}; });
    CHECK(std::count(none.begin(), none.end(), 1) == 0);
    CHECK(seen == std::vector<std::size_t>{0});
  }
}

TEST_CASE("the first exception stops the run and reaches the caller") {
  std::atomic<int> started{0};
  auto make = [&]() -> ParallelWork {
    return [&](std::size_t i) {
      ++started;
      if (i == 7) throw std::runtime_error("item 7 failed");
    };
  };
  ParallelRun run;
  run.threads = 3;
  CHECK_THROWS_WITH_AS((void)limitline::parallel_for(1000, run, make), "item 7 failed",
                       std::runtime_error);
  SUBCASE("on one thread, exactly the items before it and itself ran") {
    run.threads = 1;
    started = 0;
    CHECK_THROWS_AS((void)limitline::parallel_for(1000, run, make), std::runtime_error);
    CHECK(started == 8);
  }
}
