#pragma once
/// \file
/// The allocation check of the per-step loop (DEVELOPERS.md, FLAPLINE_CHECK_NO_MALLOC).
///
/// Eigen's own run-time switch (set_is_malloc_allowed) is one process-wide flag: with several
/// threads, one thread's step would forbid another thread's legitimate allocation. This build
/// therefore keeps Eigen's flag on and routes Eigen's assertions through `eigen_assert` below
/// (force-included before every Eigen header of the check build): Eigen's allocation check is an
/// assertion whose text names the heap, and it fails here when the *calling thread* is inside a
/// NoMallocScope. Outside the check build NoMallocScope is empty and costs nothing.

#ifdef FLAPLINE_CHECK_NO_MALLOC
#include <cstdio>
#include <cstdlib>
#include <cstring>

namespace flapline::no_malloc {

/// Depth of NoMallocScopes on this thread.
inline int& depth() noexcept {
  thread_local int d = 0;
  return d;
}

/// Eigen's assertion: the usual check, plus the allocation check for this thread.
inline void check(bool ok, const char* expr, const char* file, int line) noexcept {
  if (ok && !(depth() > 0 && std::strstr(expr, "heap allocation") != nullptr)) return;
  std::fprintf(stderr, "%s:%d: Eigen assertion failed%s: %s\n", file, line,
               ok ? " (heap allocation inside a NoMallocScope)" : "", expr);
  std::abort();
}

}  // namespace flapline::no_malloc

#ifndef eigen_assert
#define eigen_assert(x) ::flapline::no_malloc::check(static_cast<bool>(x), #x, __FILE__, __LINE__)
#endif
#endif

namespace flapline {

/// While alive, any Eigen heap allocation on this thread aborts (check build only).
class NoMallocScope {
 public:
#ifdef FLAPLINE_CHECK_NO_MALLOC
  NoMallocScope() noexcept {
    ++no_malloc::depth();
  }
  ~NoMallocScope() {
    --no_malloc::depth();
  }
#else
  NoMallocScope() noexcept {}  // NOLINT: an empty scope outside the check build
#endif
  NoMallocScope(const NoMallocScope&) = delete;
  NoMallocScope& operator=(const NoMallocScope&) = delete;
};

}  // namespace flapline
