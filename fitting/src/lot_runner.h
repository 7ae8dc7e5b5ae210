// Running a per-unit job over a lot on worker threads, shared by fit_lot and the extended lot
// fit. Private to fitting/.
#pragma once

#include <cstddef>
#include <functional>
#include <stop_token>

#include "photolot/fit_result.h"
#include "photolot/lot.h"
#include "photolot/progress.h"

namespace photolot::fitting::detail {

// A LotFit with one UnitFit per unit, in order: the id set, status solver_failed and message
// "stopped", which is what a unit not reached before a stop keeps.
LotFit start_lot_fit(const Lot& lot);

// Calls job(i) once for every i in [0, count) on up to `threads` workers (0: all cores). Each
// job must write only its own slot, so the results do not depend on the thread count. Stops
// taking new work when `stop` is requested. Progress is (done_before + done, total), serialised,
// at most every 20 ms and once at the end; `total` 0 means done_before + count.
void for_each_index(std::size_t count, int threads, const ProgressFn& progress,
                    std::stop_token stop, const std::function<void(std::size_t)>& job,
                    std::size_t done_before = 0, std::size_t total = 0);

}  // namespace photolot::fitting::detail
