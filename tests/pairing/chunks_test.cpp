// The pairing's worker ranges (core/src/pairing/chunks.h): every index once, on any number of
// threads; a stop and a job's exception reach the caller.
#include "chunks.h"

#include <gtest/gtest.h>

#include <atomic>
#include <stdexcept>
#include <stop_token>
#include <vector>

using photolot::detail::for_each_range;

TEST(WorkerRanges, CoverEveryIndexOnceInRangesOfTheirOwn) {
  for (std::size_t count : {0u, 1u, 7u, 64u, 1000u, 4097u}) {
    for (int threads : {1, 2, 3, 5, 0}) {
      std::vector<std::atomic<int>> hits(count);
      std::vector<std::atomic<int>> range_calls(64);
      const bool ok = for_each_range(count, 64, threads, std::stop_token{},
                                     [&](std::size_t begin, std::size_t end, std::size_t k) {
                                       EXPECT_LE(begin, end);
                                       ++range_calls[k];
                                       for (std::size_t i = begin; i < end; ++i) ++hits[i];
                                       return true;
                                     });
      EXPECT_TRUE(ok);
      for (std::size_t i = 0; i < count; ++i)
        ASSERT_EQ(hits[i], 1) << "index " << i << " of " << count << ", " << threads << " threads";
      for (auto& c : range_calls) EXPECT_LE(c, 1);
    }
  }
}

TEST(WorkerRanges, AStopIsReportedAndAJobsExceptionIsThrownToTheCaller) {
  std::stop_source source;
  source.request_stop();
  int calls = 0;
  EXPECT_FALSE(
      for_each_range(100, 8, 2, source.get_token(), [&](std::size_t, std::size_t, std::size_t) {
        ++calls;
        return true;
      }));
  EXPECT_EQ(calls, 0);
  // A job that stops itself.
  EXPECT_FALSE(for_each_range(100, 8, 2, std::stop_token{},
                              [&](std::size_t, std::size_t, std::size_t k) { return k != 3; }));
  for (int threads : {1, 2, 4}) {
    EXPECT_THROW(for_each_range(100, 8, threads, std::stop_token{},
                                [&](std::size_t, std::size_t, std::size_t k) -> bool {
                                  if (k == 5) throw std::runtime_error("no memory");
                                  return true;
                                }),
                 std::runtime_error);
  }
}
