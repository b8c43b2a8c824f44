#include <limitline/parallel.hpp>

#include <algorithm>
#include <condition_variable>
#include <exception>
#include <limits>
#include <mutex>
#include <thread>

namespace limitline {

std::vector<std::uint8_t> parallel_for(std::size_t n, const ParallelRun& run,
                                       const std::function<ParallelWork()>& make_worker) {
  std::vector<std::uint8_t> done(n, 0);
  std::atomic<std::size_t> next{0};
  std::atomic<bool> failed{false};
  // Guarded by `m`: what the calling thread waits on.
  std::mutex m;
  std::condition_variable changed;
  std::size_t finished = 0;
  unsigned running = 0;
  std::exception_ptr error;

  auto stopped = [&] {
    return failed.load(std::memory_order_relaxed) ||
           (run.cancel && run.cancel->load(std::memory_order_relaxed));
  };
  auto worker = [&] {
    try {
      const ParallelWork work = make_worker();
      while (!stopped()) {
        const std::size_t i = next.fetch_add(1);
        if (i >= n) break;
        work(i);
        done[i] = 1;  // each index is written by one thread only
        {
          const std::lock_guard<std::mutex> lock(m);
          ++finished;
        }
        changed.notify_one();
      }
    } catch (...) {
      // An exception must never leave a worker thread: keep the first, stop the rest.
      const std::lock_guard<std::mutex> lock(m);
      if (!error) error = std::current_exception();
      failed = true;
    }
    {
      const std::lock_guard<std::mutex> lock(m);
      --running;
    }
    changed.notify_one();
  };

  unsigned threads = run.threads ? run.threads : std::thread::hardware_concurrency();
  threads = static_cast<unsigned>(std::clamp<std::size_t>(threads, 1, std::max<std::size_t>(n, 1)));
  running = threads;
  std::vector<std::thread> pool;
  pool.reserve(threads);
  for (unsigned t = 0; t < threads; ++t) pool.emplace_back(worker);

  constexpr std::size_t kNone = std::numeric_limits<std::size_t>::max();
  std::size_t reported = kNone;
  {
    std::unique_lock<std::mutex> lock(m);
    std::size_t seen = 0;
    for (;;) {
      changed.wait(lock, [&] { return finished != seen || running == 0; });
      seen = finished;
      if (running == 0) break;
      if (run.progress) {
        lock.unlock();
        run.progress(seen, n);
        reported = seen;
        lock.lock();
      }
    }
  }
  for (auto& t : pool) t.join();
  if (error) std::rethrow_exception(error);
  // The final count, unless it was the last one reported (the threads have joined: no lock).
  if (run.progress && reported != finished) run.progress(finished, n);
  return done;
}

}  // namespace limitline
