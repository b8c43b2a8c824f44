#pragma once
// One thread pool for every job that runs independent items in parallel (sensor trials and
// sweeps, batch sites). Items are claimed by index and their results written by index, so a
// run gives the same results whatever the number of threads.
#include <atomic>
#include <cstddef>
#include <cstdint>
#include <functional>
#include <memory>
#include <vector>

namespace limitline {

// How a parallel run goes: on `threads` worker threads (0: all cores), stopped between items
// when `*cancel` turns true (set from a signal handler, say), with progress(done, total)
// reported on the calling thread only, so the callback needs no locking of its own.
struct ParallelRun {
  unsigned threads = 0;
  const std::atomic<bool>* cancel = nullptr;
  std::function<void(std::size_t done, std::size_t total)> progress;
};

// One worker thread's body: called with each index the thread takes.
using ParallelWork = std::function<void(std::size_t index)>;

// Runs every index of [0, n) at most once. Each worker thread calls make_worker() once (its
// per-thread scratch lives in what that returns) and then the worker for each index it takes.
// The calling thread waits, reporting progress whenever more items have finished and once at
// the end. No item starts once *cancel is true or an item has thrown; the items under way
// finish, and the first exception is rethrown here once every thread has stopped. Returns
// which indices finished (all of them unless cancelled).
[[nodiscard]] std::vector<std::uint8_t> parallel_for(
    std::size_t n, const ParallelRun& run, const std::function<ParallelWork()>& make_worker);

// The same with a workspace per thread: work(index, workspace) after make() once per thread.
template <class MakeWorkspace, class Work>
[[nodiscard]] std::vector<std::uint8_t> parallel_for(std::size_t n, const ParallelRun& run,
                                                     MakeWorkspace make, Work work) {
  return parallel_for(n, run, [&]() -> ParallelWork {
    auto ws = std::make_shared<decltype(make())>(make());
    return [ws, &work](std::size_t i) { work(i, *ws); };
  });
}

}  // namespace limitline
