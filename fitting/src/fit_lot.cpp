// The whole-lot fit: every unit on its own, spread over worker threads. Each unit's result
// depends only on that unit and the options, so the lot is identical whatever the thread count.
#include <fmt/format.h>

#include <algorithm>
#include <atomic>
#include <chrono>
#include <cmath>
#include <mutex>
#include <thread>
#include <vector>

#include "photolot/fitting/fit.h"

namespace photolot::fitting {

std::string describe(const FitOptions& o) {
  const double scale = std::log1p(o.meter_accuracy_pct / 100.0);
  std::string loss;
  switch (o.loss) {
    case Loss::huber:
    case Loss::cauchy:
      loss = fmt::format("{} loss, scale ln(1 + {:g} %) = {:.4g} in ln R, outliers beyond {:g} x scale",
                         to_string(o.loss), o.meter_accuracy_pct, scale, o.outlier_threshold);
      break;
    case Loss::none:
      loss = "ordinary least squares (no robust loss)";
      break;
  }
  return fmt::format(
      "power law ln R = ln R10 - gamma ln(E / 10 lx) per unit; {}; covariance {}; {:g} % "
      "intervals from Student t on n - 2 dof",
      loss, o.loss == Loss::none ? "s^2 (X'X)^-1" : "Huber's H1 estimate from psi",
      100.0 * o.confidence);
}

LotFit fit_lot(const Lot& lot, const FitOptions& options, const ProgressFn& progress,
               std::stop_token stop) {
  LotFit out;
  out.method = describe(options);
  const std::size_t total = lot.units.size();
  out.units.resize(total);
  for (std::size_t i = 0; i < total; ++i) {
    out.units[i].id = lot.units[i].id;
    out.units[i].status = FitStatus::solver_failed;
    out.units[i].message = "stopped";
  }
  if (total == 0) {
    if (progress) progress(0, 0);
    return out;
  }

  std::size_t threads = options.threads > 0 ? static_cast<std::size_t>(options.threads)
                                            : std::max(1u, std::thread::hardware_concurrency());
  threads = std::min(threads, total);

  std::atomic<std::size_t> next{0};
  std::atomic<std::size_t> done{0};
  std::mutex progress_mutex;
  using Clock = std::chrono::steady_clock;
  std::atomic<Clock::rep> last_report{Clock::now().time_since_epoch().count()};
  const Clock::rep report_every =
      std::chrono::duration_cast<Clock::duration>(std::chrono::milliseconds(20)).count();

  auto work = [&] {
    for (;;) {
      if (stop.stop_requested()) return;
      const std::size_t i = next.fetch_add(1, std::memory_order_relaxed);
      if (i >= total) return;
      out.units[i] = fit_unit(lot.units[i], options);
      const std::size_t finished = done.fetch_add(1, std::memory_order_relaxed) + 1;
      if (!progress) continue;
      const Clock::rep now = Clock::now().time_since_epoch().count();
      Clock::rep last = last_report.load(std::memory_order_relaxed);
      if (now - last >= report_every &&
          last_report.compare_exchange_strong(last, now, std::memory_order_relaxed)) {
        const std::lock_guard lock(progress_mutex);
        progress(finished, total);
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
  if (progress) progress(done.load(), total);
  return out;
}

}  // namespace photolot::fitting
