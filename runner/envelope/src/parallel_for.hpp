// Work spread over threads: task indices 0..n−1 in, each handed once to a function on one of
// `jobs` threads (the caller's among them); an optional callback after each, one at a time.
#pragma once

#include <cstddef>
#include <functional>

namespace upright::runner::internal {

// Calls task(i) for every i in [0, n) on min(jobs, n) threads and returns when all are done.
// `after_each` (may be empty) runs after every task under a lock. Tasks must not throw.
void ParallelFor(std::size_t n, std::size_t jobs, const std::function<void(std::size_t)>& task,
                 const std::function<void()>& after_each);

}  // namespace upright::runner::internal
