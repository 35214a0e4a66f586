#pragma once
/// \file
/// A block of doubles for large per-run caches, on transparent huge pages where the system offers
/// them: filling a fresh cache during a run's first cycle then costs one page fault per 2 MiB
/// instead of one per 4 kB, which otherwise dominates the first cycle of large runs.

#include <cstddef>
#include <cstdlib>
#include <memory>
#include <new>

#ifdef __linux__
#include <sys/mman.h>
#endif

namespace flapline {

class HugeBlock {
 public:
  /// At least `doubles` values; the current block is kept (contents not cleared) when it is
  /// large enough.
  double* reserve(std::size_t doubles) {
    if (doubles <= capacity_) return data_.get();
    constexpr std::size_t huge = std::size_t{2} << 20;
    const std::size_t bytes = (doubles * sizeof(double) + huge - 1) / huge * huge;
    data_.reset(static_cast<double*>(std::aligned_alloc(huge, bytes)));
    if (!data_) throw std::bad_alloc();
#ifdef MADV_HUGEPAGE
    madvise(data_.get(), bytes, MADV_HUGEPAGE);  // advice only: on failure 4 kB pages remain
#endif
    capacity_ = bytes / sizeof(double);
    return data_.get();
  }

 private:
  struct Free {
    void operator()(double* p) const { std::free(p); }
  };
  std::unique_ptr<double, Free> data_;
  std::size_t capacity_ = 0;
};

}  // namespace flapline
