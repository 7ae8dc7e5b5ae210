// The worker pool behind the lot fits (lot_runner.h).
#include "lot_runner.h"

#include <algorithm>
#include <atomic>
#include <chrono>
#include <mutex>
#include <thread>
#include <vector>

namespace photolot::fitting::detail {

LotFit start_lot_fit(const Lot& lot) {
  LotFit out;
  out.units.resize(lot.units.size());
  for (std::size_t i = 0; i < lot.units.size(); ++i) {
    out.units[i].id = lot.units[i].id;
    out.units[i].status = FitStatus::solver_failed;
    out.units[i].message = "stopped";
  }
  return out;
}

void for_each_index(std::size_t count, int threads_option, const ProgressFn& progress,
                    std::stop_token stop, const std::function<void(std::size_t)>& job,
                    std::size_t done_before, std::size_t total) {
  if (total == 0) total = done_before + count;
  if (count == 0) {
    if (progress) progress(done_before, total);
    return;
  }
  std::size_t threads = threads_option > 0 ? static_cast<std::size_t>(threads_option)
                                           : std::max(1u, std::thread::hardware_concurrency());
  threads = std::min(threads, count);

  std::atomic<std::size_t> next{0};
  std::atomic<std::size_t> done{0};
  std::mutex progress_mutex;
  using Clock = std::chrono::steady_clock;
  // Reports at most every 20 ms, the first one after the first unit.
  const Clock::rep report_every =
      std::chrono::duration_cast<Clock::duration>(std::chrono::milliseconds(20)).count();
  std::atomic<Clock::rep> last_report{Clock::now().time_since_epoch().count() - report_every};

  auto work = [&] {
    for (;;) {
      if (stop.stop_requested()) return;
      const std::size_t i = next.fetch_add(1, std::memory_order_relaxed);
      if (i >= count) return;
      job(i);
      const std::size_t finished = done.fetch_add(1, std::memory_order_relaxed) + 1;
      if (!progress) continue;
      const Clock::rep now = Clock::now().time_since_epoch().count();
      Clock::rep last = last_report.load(std::memory_order_relaxed);
      if (now - last >= report_every &&
          last_report.compare_exchange_strong(last, now, std::memory_order_relaxed)) {
        const std::lock_guard lock(progress_mutex);
        progress(done_before + finished, total);
      }
    }
  };

  if (threads == 1) {
    work();
  } else {
    std::vector<std::jthread> pool;
    pool.reserve(threads - 1);
    for (std::size_t t = 1; t < threads; ++t) pool.emplace_back(work);
    work();
  }  // the pool joins here
  if (progress) progress(done_before + done.load(), total);
}

}  // namespace photolot::fitting::detail
