// SHA-256 as specified in FIPS 180-4 (Secure Hash Standard), sections 4.1.2 (functions), 4.2.2
// (constants), 5.1.1 (padding), 5.3.3 (initial value) and 6.2.2 (computation).
#include "upright/runner/common/sha256.hpp"

#include <algorithm>
#include <array>
#include <cerrno>
#include <cstdint>
#include <cstdio>
#include <cstring>
#include <vector>

namespace upright::runner {
namespace {

// FIPS 180-4 §4.2.2: the first 32 bits of the fractional parts of the cube roots of the first 64
// primes.
constexpr std::array<std::uint32_t, 64> kRoundConstants = {
    0x428a2f98, 0x71374491, 0xb5c0fbcf, 0xe9b5dba5, 0x3956c25b, 0x59f111f1, 0x923f82a4, 0xab1c5ed5,
    0xd807aa98, 0x12835b01, 0x243185be, 0x550c7dc3, 0x72be5d74, 0x80deb1fe, 0x9bdc06a7, 0xc19bf174,
    0xe49b69c1, 0xefbe4786, 0x0fc19dc6, 0x240ca1cc, 0x2de92c6f, 0x4a7484aa, 0x5cb0a9dc, 0x76f988da,
    0x983e5152, 0xa831c66d, 0xb00327c8, 0xbf597fc7, 0xc6e00bf3, 0xd5a79147, 0x06ca6351, 0x14292967,
    0x27b70a85, 0x2e1b2138, 0x4d2c6dfc, 0x53380d13, 0x650a7354, 0x766a0abb, 0x81c2c92e, 0x92722c85,
    0xa2bfe8a1, 0xa81a664b, 0xc24b8b70, 0xc76c51a3, 0xd192e819, 0xd6990624, 0xf40e3585, 0x106aa070,
    0x19a4c116, 0x1e376c08, 0x2748774c, 0x34b0bcb5, 0x391c0cb3, 0x4ed8aa4a, 0x5b9cca4f, 0x682e6ff3,
    0x748f82ee, 0x78a5636f, 0x84c87814, 0x8cc70208, 0x90befffa, 0xa4506ceb, 0xbef9a3f7, 0xc67178f2,
};

// FIPS 180-4 §5.3.3: the first 32 bits of the fractional parts of the square roots of the first 8
// primes.
constexpr std::array<std::uint32_t, 8> kInitialHash = {
    0x6a09e667, 0xbb67ae85, 0x3c6ef372, 0xa54ff53a, 0x510e527f, 0x9b05688c, 0x1f83d9ab, 0x5be0cd19,
};

constexpr std::uint32_t RotateRight(std::uint32_t x, int n) { return (x >> n) | (x << (32 - n)); }

// Incremental hashing: Update() with the message in any pieces, then HexDigest() once.
class Sha256 {
 public:
  void Update(const unsigned char* data, std::size_t size) {
    length_bytes_ += size;
    while (size > 0) {
      const std::size_t take = std::min(size, block_.size() - block_used_);
      std::memcpy(block_.data() + block_used_, data, take);
      block_used_ += take;
      data += take;
      size -= take;
      if (block_used_ == block_.size()) {
        Compress();
        block_used_ = 0;
      }
    }
  }

  // §5.1.1: a 1 bit, zeros up to 56 bytes mod 64, then the message length in bits, big-endian.
  std::string HexDigest() {
    const std::uint64_t length_bits = length_bytes_ * 8;
    block_[block_used_++] = 0x80;
    if (block_used_ > 56) {
      std::memset(block_.data() + block_used_, 0, block_.size() - block_used_);
      Compress();
      block_used_ = 0;
    }
    std::memset(block_.data() + block_used_, 0, 56 - block_used_);
    for (int i = 0; i < 8; ++i) {
      block_[56 + i] = static_cast<unsigned char>(length_bits >> (56 - 8 * i));
    }
    Compress();
    static constexpr char kHex[] = "0123456789abcdef";
    std::string hex;
    hex.reserve(64);
    for (std::uint32_t word : hash_) {
      for (int shift = 28; shift >= 0; shift -= 4) hex += kHex[(word >> shift) & 0xf];
    }
    return hex;
  }

 private:
  // §6.2.2: one 512-bit block into the hash value.
  void Compress() {
    std::array<std::uint32_t, 64> w;
    for (int t = 0; t < 16; ++t) {
      w[t] = (std::uint32_t{block_[4 * t]} << 24) | (std::uint32_t{block_[4 * t + 1]} << 16) |
             (std::uint32_t{block_[4 * t + 2]} << 8) | std::uint32_t{block_[4 * t + 3]};
    }
    for (int t = 16; t < 64; ++t) {
      const std::uint32_t s0 =
          RotateRight(w[t - 15], 7) ^ RotateRight(w[t - 15], 18) ^ (w[t - 15] >> 3);
      const std::uint32_t s1 =
          RotateRight(w[t - 2], 17) ^ RotateRight(w[t - 2], 19) ^ (w[t - 2] >> 10);
      w[t] = s1 + w[t - 7] + s0 + w[t - 16];
    }
    std::uint32_t a = hash_[0], b = hash_[1], c = hash_[2], d = hash_[3];
    std::uint32_t e = hash_[4], f = hash_[5], g = hash_[6], h = hash_[7];
    for (int t = 0; t < 64; ++t) {
      const std::uint32_t big_s1 = RotateRight(e, 6) ^ RotateRight(e, 11) ^ RotateRight(e, 25);
      const std::uint32_t ch = (e & f) ^ (~e & g);
      const std::uint32_t t1 = h + big_s1 + ch + kRoundConstants[t] + w[t];
      const std::uint32_t big_s0 = RotateRight(a, 2) ^ RotateRight(a, 13) ^ RotateRight(a, 22);
      const std::uint32_t maj = (a & b) ^ (a & c) ^ (b & c);
      const std::uint32_t t2 = big_s0 + maj;
      h = g;
      g = f;
      f = e;
      e = d + t1;
      d = c;
      c = b;
      b = a;
      a = t1 + t2;
    }
    hash_[0] += a;
    hash_[1] += b;
    hash_[2] += c;
    hash_[3] += d;
    hash_[4] += e;
    hash_[5] += f;
    hash_[6] += g;
    hash_[7] += h;
  }

  std::array<std::uint32_t, 8> hash_ = kInitialHash;
  std::array<unsigned char, 64> block_{};
  std::size_t block_used_ = 0;
  std::uint64_t length_bytes_ = 0;
};

}  // namespace

std::string Sha256Hex(std::string_view bytes) {
  Sha256 sha;
  sha.Update(reinterpret_cast<const unsigned char*>(bytes.data()), bytes.size());
  return sha.HexDigest();
}

Result<std::string> Sha256OfFile(const std::string& path) {
  std::FILE* file = std::fopen(path.c_str(), "rb");
  if (file == nullptr) return Failure("cannot read " + path + ": " + std::strerror(errno));
  Sha256 sha;
  std::vector<unsigned char> buffer(1 << 16);
  std::size_t got = 0;
  while ((got = std::fread(buffer.data(), 1, buffer.size(), file)) > 0)
    sha.Update(buffer.data(), got);
  const bool failed = std::ferror(file) != 0;
  const int read_errno = errno;
  std::fclose(file);
  if (failed) return Failure("cannot read " + path + ": " + std::strerror(read_errno));
  return sha.HexDigest();
}

}  // namespace upright::runner
