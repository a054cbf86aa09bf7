// UPRIGHT_CHECK: an internal-invariant check that stays on in release builds (unlike assert).
// A failure is a bug in upright, not bad input: it prints where and why, then aborts.
#pragma once

#include <cstdio>
#include <cstdlib>

#define UPRIGHT_CHECK(condition, ...)                                              \
  do {                                                                             \
    if (!(condition)) {                                                            \
      std::fprintf(stderr, "upright: internal check failed at %s:%d: %s: ", __FILE__, \
                   __LINE__, #condition);                                          \
      std::fprintf(stderr, __VA_ARGS__);                                           \
      std::fputc('\n', stderr);                                                    \
      std::abort();                                                                \
    }                                                                              \
  } while (false)
