// Random: a small seeded generator (xoshiro256++ seeded through splitmix64) with uniform and
// Gaussian draws. Same seed → same sequence on every platform and library; no global state.
#pragma once

#include <array>
#include <cstdint>

namespace upright::sim {

// One splitmix64 step (Vigna): advances *state and returns the next output; Random's seeding.
std::uint64_t SplitMix64(std::uint64_t* state);

class Random {
 public:
  // The xoshiro256++ state is four SplitMix64 outputs from `seed`.
  explicit Random(std::uint64_t seed);
  // A generator started from a given xoshiro256++ state (not all zero), without the seeding.
  static Random FromState(const std::array<std::uint64_t, 4>& state);
  std::uint64_t NextU64();
  double Uniform();   // in [0, 1), 53 random bits
  double Gaussian();  // standard normal (Marsaglia polar method)

 private:
  Random() = default;
  std::uint64_t s_[4];
  double spare_ = 0;
  bool has_spare_ = false;
};

}  // namespace upright::sim
