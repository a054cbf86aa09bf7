#include "upright/runner/run/parallel_for.hpp"

#include <algorithm>
#include <atomic>
#include <mutex>
#include <thread>
#include <vector>

namespace upright::runner {

std::size_t JobsWanted(int jobs) {
  if (jobs > 0) return static_cast<std::size_t>(jobs);
  return std::max(1u, std::thread::hardware_concurrency());
}

void ParallelFor(std::size_t n, std::size_t jobs, const std::function<void(std::size_t)>& task,
                 const std::function<void()>& after_each) {
  std::atomic<std::size_t> next{0};
  std::mutex after_mutex;
  const auto work = [&] {
    for (std::size_t i = next++; i < n; i = next++) {
      task(i);
      if (after_each) {
        std::lock_guard<std::mutex> lock(after_mutex);
        after_each();
      }
    }
  };
  const std::size_t threads = std::max<std::size_t>(1, std::min(jobs, n));
  std::vector<std::thread> workers;
  for (std::size_t j = 1; j < threads; ++j) workers.emplace_back(work);
  work();
  for (auto& w : workers) w.join();
}

}  // namespace upright::runner
