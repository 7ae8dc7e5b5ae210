// Test seams of the pairing: switches that only tests set, to reach paths that correct
// inputs do not take. Internal header (core/src/pairing); nothing outside the tests reads it.
#pragma once

#include <atomic>

namespace photolot::detail {

// While above zero, each warm repair round fails (and counts this down) as though the
// matching had found its state other than expected, so that the fallback to solving every
// component from scratch runs. Zero in every program but the tests.
inline std::atomic<int> fail_warm_repairs_for_tests{0};

}  // namespace photolot::detail
