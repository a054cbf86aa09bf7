#include "upright/sim/random.hpp"

#include <cmath>

#include "upright/model/check.hpp"

namespace upright::sim {
namespace {

std::uint64_t Rotl(std::uint64_t x, int k) { return (x << k) | (x >> (64 - k)); }

}  // namespace

// splitmix64, to spread one 64-bit seed over the generator state (Vigna, public domain).
std::uint64_t SplitMix64(std::uint64_t* x) {
  std::uint64_t z = (*x += 0x9e3779b97f4a7c15ULL);
  z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ULL;
  z = (z ^ (z >> 27)) * 0x94d049bb133111ebULL;
  return z ^ (z >> 31);
}

Random::Random(std::uint64_t seed) {
  for (auto& s : s_) s = SplitMix64(&seed);
}

Random Random::FromState(const std::array<std::uint64_t, 4>& state) {
  UPRIGHT_CHECK((state[0] | state[1] | state[2] | state[3]) != 0,
                "xoshiro256++ has no all-zero state");
  Random r;
  for (int i = 0; i < 4; ++i) r.s_[i] = state[i];
  return r;
}

// xoshiro256++ (Blackman and Vigna, 2019).
std::uint64_t Random::NextU64() {
  const std::uint64_t result = Rotl(s_[0] + s_[3], 23) + s_[0];
  const std::uint64_t t = s_[1] << 17;
  s_[2] ^= s_[0];
  s_[3] ^= s_[1];
  s_[1] ^= s_[2];
  s_[0] ^= s_[3];
  s_[2] ^= t;
  s_[3] = Rotl(s_[3], 45);
  return result;
}

double Random::Uniform() { return static_cast<double>(NextU64() >> 11) * 0x1.0p-53; }

double Random::Gaussian() {
  if (has_spare_) {
    has_spare_ = false;
    return spare_;
  }
  double u, v, s;
  do {
    u = 2.0 * Uniform() - 1.0;
    v = 2.0 * Uniform() - 1.0;
    s = u * u + v * v;
  } while (s >= 1.0 || s == 0.0);
  const double scale = std::sqrt(-2.0 * std::log(s) / s);
  spare_ = v * scale;
  has_spare_ = true;
  return u * scale;
}

}  // namespace upright::sim
