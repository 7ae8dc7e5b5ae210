// Work cut into ranges and shared among worker threads, for the pairing's passes over the lot
// (the candidate search and the certificate check, pairing.cpp). Each range is handed out
// once, to whichever worker asks first; what a range finds is kept by its number, so the
// caller merges in range order and the result does not depend on the number of threads.
#pragma once

#include <algorithm>
#include <atomic>
#include <cstddef>
#include <exception>
#include <mutex>
#include <stop_token>
#include <thread>
#include <vector>

namespace photolot::detail {

// How many workers `threads` asks for (0: one per core), at most `ranges`, at least one.
inline std::size_t worker_count(int threads, std::size_t ranges) {
  const std::size_t asked = threads > 0 ? static_cast<std::size_t>(threads)
                                        : std::max(1u, std::thread::hardware_concurrency());
  return std::max<std::size_t>(1, std::min(asked, ranges));
}

// Calls job(begin, end, k) for the k-th of `ranges` near-equal ranges of [0, count), on up to
// `threads` workers; job returns false when it stopped. Returns false when stopped (before
// or inside a job); then some ranges may not have run. An exception thrown by a job (out of
// memory, say) stops the others and is thrown again here, as if the work had run on one.
template <class Job>
bool for_each_range(std::size_t count, std::size_t ranges, int threads, const std::stop_token& stop,
                    Job&& job) {
  ranges = std::max<std::size_t>(1, std::min(ranges, count));
  std::atomic<std::size_t> next{0};
  std::atomic<bool> stopped{false};
  std::exception_ptr failure;
  std::mutex failure_mutex;
  auto run_ranges = [&] {
    for (;;) {
      if (stopped.load(std::memory_order_relaxed)) return;
      if (stop.stop_requested()) {
        stopped = true;
        return;
      }
      const std::size_t k = next.fetch_add(1, std::memory_order_relaxed);
      if (k >= ranges) return;
      const std::size_t begin = count * k / ranges, end = count * (k + 1) / ranges;
      if (!job(begin, end, k)) {
        stopped = true;
        return;
      }
    }
  };
  auto work = [&] {
    try {
      run_ranges();
    } catch (...) {
      const std::lock_guard lock(failure_mutex);
      if (!failure) failure = std::current_exception();
      stopped = true;
    }
  };
  const std::size_t workers = worker_count(threads, ranges);
  if (workers == 1) {
    work();
  } else {
    std::vector<std::jthread> pool;
    pool.reserve(workers - 1);
    for (std::size_t t = 1; t < workers; ++t) pool.emplace_back(work);
    work();
  }  // the pool joins here
  if (failure) std::rethrow_exception(failure);
  return !stopped.load();
}

}  // namespace photolot::detail
