// Random: a small seeded generator (xoshiro256++ seeded through splitmix64) with uniform and
// Gaussian draws. Same seed → same sequence on every platform and library; no global state.
#pragma once

#include <cstdint>

namespace upright::sim {

class Random {
 public:
  explicit Random(std::uint64_t seed);
  std::uint64_t NextU64();
  double Uniform();   // in [0, 1), 53 random bits
  double Gaussian();  // standard normal (Marsaglia polar method)

 private:
  std::uint64_t s_[4];
  double spare_ = 0;
  bool has_spare_ = false;
};

}  // namespace upright::sim
