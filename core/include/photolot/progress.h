// Callbacks for long steps. The library calls back; the front end decides how to show it.
#pragma once

#include <cstddef>
#include <functional>
#include <stop_token>

namespace photolot {

// Called with (done, total) from any worker thread, at most every few milliseconds.
using ProgressFn = std::function<void(std::size_t done, std::size_t total)>;

}  // namespace photolot
