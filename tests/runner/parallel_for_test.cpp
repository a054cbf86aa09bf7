// ParallelFor: every index handed out exactly once whatever the number of threads, the callback
// after each task serialised, and JobsWanted's default. Also the ThreadSanitizer build's target.
#include "upright/runner/run/parallel_for.hpp"

#include <gtest/gtest.h>

#include <atomic>
#include <cstddef>
#include <thread>
#include <vector>

namespace upright::runner {
namespace {

TEST(ParallelFor, EachIndexRunsOnceWhateverTheJobs) {
  for (const std::size_t jobs : {1u, 2u, 4u, 64u}) {
    for (const std::size_t n : {0u, 1u, 3u, 1000u}) {
      std::vector<std::atomic<int>> calls(n);
      std::size_t after = 0;       // written only under ParallelFor's lock
      std::size_t sum_after = 0;
      ParallelFor(
          n, jobs, [&](std::size_t i) { calls[i].fetch_add(1); },
          [&] {
            ++after;
            sum_after += after;
          });
      for (std::size_t i = 0; i < n; ++i) EXPECT_EQ(calls[i].load(), 1) << i << " of " << n;
      EXPECT_EQ(after, n) << "jobs " << jobs;
      EXPECT_EQ(sum_after, n * (n + 1) / 2);  // 1 + 2 + … + n: each callback saw the one before
    }
  }
}

TEST(ParallelFor, TasksWriteTheirOwnSlotsWithoutALock) {
  // The pattern RunBatch uses: each task fills its own result slot.
  std::vector<double> out(4096, -1);
  ParallelFor(out.size(), 2, [&](std::size_t i) { out[i] = static_cast<double>(i) * 0.5; }, {});
  for (std::size_t i = 0; i < out.size(); ++i) ASSERT_EQ(out[i], static_cast<double>(i) * 0.5);
}

TEST(ParallelFor, JobsWantedIsTheAskOrOnePerHardwareThread) {
  EXPECT_EQ(JobsWanted(3), 3u);
  const std::size_t cores = std::thread::hardware_concurrency();
  EXPECT_EQ(JobsWanted(0), cores > 0 ? cores : 1u);
  EXPECT_GE(JobsWanted(-1), 1u);
}

}  // namespace
}  // namespace upright::runner
