// Work spread over threads: task indices 0..n−1 in, each handed once to a function on one of
// `jobs` threads (the caller's among them); an optional callback after each, one at a time.
#pragma once

#include <cstddef>
#include <functional>

namespace upright::runner {

// The threads a `jobs` option asks for: `jobs` when > 0, else one per hardware thread (at least
// one).
std::size_t JobsWanted(int jobs);

// Calls task(i) for every i in [0, n) on min(jobs, n) threads (at least one) and returns when all
// are done. `after_each` (may be empty) runs after every task under a lock. Tasks must not throw.
void ParallelFor(std::size_t n, std::size_t jobs, const std::function<void(std::size_t)>& task,
                 const std::function<void()>& after_each);

}  // namespace upright::runner
