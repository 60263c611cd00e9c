// trivet: plumbing of the three-moment method that is not mechanics
// (inlining, comparisons, finiteness, fresh arrays). Private: included by
// three_moment.cpp only.
#pragma once

#include <cmath>
#include <cstddef>
#include <cstdint>
#include <memory>
#include <type_traits>
#include <vector>

#if defined(__linux__)
#include <sys/mman.h>
#endif

namespace trivet::three_moment {
namespace {

// The per-span helpers of solve() are lambdas called from a few places;
// GCC otherwise keeps them out of line, and the calls (arguments through
// memory) cost more than their bodies on a long beam.
#if defined(__GNUC__)
#define TM_INLINE __attribute__((always_inline))
#else
#define TM_INLINE
#endif
// The fast path is kept out of line: inlined into solve(), GCC allocates
// its registers worse (measured: about 20% slower per span on the
// benchmark's beam).
#if defined(__GNUC__)
#define TM_NOINLINE __attribute__((noinline))
#else
#define TM_NOINLINE
#endif

template <class R>
TM_INLINE inline bool same(const R& a, const R& b) {
  return !(a < b) && !(b < a);
}
template <class R>
TM_INLINE inline bool is_zero(const R& a) {
  return same(a, R(0));
}
// False for NaN and infinities (x - x is NaN there; NaN compares false).
// Built-in floats ask std::isfinite (the same answer, without the
// subtraction and two compares).
template <class R>
TM_INLINE inline bool finite(const R& a) {
  if constexpr (std::is_floating_point_v<R>) {
    return std::isfinite(a);
  } else {
    const R d = a - a;
    return d <= R(0) && d >= R(0);
  }
}

// An array written once by index straight after it is allocated. Unlike
// std::vector::resize, the elements are default-initialised, so the
// memory of an array of built-in numbers is not zeroed first and then
// written again (on a long beam the arrays do not stay in cache, and the
// zeroing doubles their memory traffic). Large arrays are advised onto
// transparent huge pages, as reserve_fresh does.
template <class T>
class FreshArray {
 public:
  void allocate(std::size_t count) {
    p_.reset(new T[count]);
    n_ = count;
    advise_huge(p_.get(), count * sizeof(T));
  }
  void shrink(std::size_t count) { n_ = count < n_ ? count : n_; }  // keeps the memory
  void release() { p_.reset(); n_ = 0; }
  T& operator[](std::size_t i) { return p_[i]; }
  const T& operator[](std::size_t i) const { return p_[i]; }
  T* data() { return p_.get(); }
  const T* data() const { return p_.get(); }
  std::size_t size() const { return n_; }

 private:
  static void advise_huge(void* data, std::size_t bytes) {
#if defined(__linux__) && defined(MADV_HUGEPAGE)
    constexpr std::uintptr_t huge = std::uintptr_t(1) << 21;
    if (bytes < 4 * huge) return;
    const auto p = reinterpret_cast<std::uintptr_t>(data);
    const std::uintptr_t b = (p + huge - 1) & ~(huge - 1), e = (p + bytes) & ~(huge - 1);
    if (e > b) (void)madvise(reinterpret_cast<void*>(b), e - b, MADV_HUGEPAGE);
#else
    (void)data;
    (void)bytes;
#endif
  }
  std::unique_ptr<T[]> p_;
  std::size_t n_ = 0;
};

// Reserves `count` elements of `v`. The big arrays here are written once,
// front to back, straight after they are allocated, so at a million spans
// most of their cost is the page faults of the fresh memory (about 7 ns a
// byte on 4 KiB pages on the benchmark machine). On Linux, ask for
// transparent huge pages on such an array before its first write: one fault
// per 2 MiB. Only a hint to the kernel: nothing depends on it.
template <class T>
void reserve_fresh(std::vector<T>& v, std::size_t count) {
  v.reserve(count);
#if defined(__linux__) && defined(MADV_HUGEPAGE)
  constexpr std::uintptr_t huge = std::uintptr_t(1) << 21;
  const std::size_t bytes = count * sizeof(T);
  if (bytes < 4 * huge) return;
  const auto p = reinterpret_cast<std::uintptr_t>(v.data());
  const std::uintptr_t b = (p + huge - 1) & ~(huge - 1), e = (p + bytes) & ~(huge - 1);
  if (e > b) (void)madvise(reinterpret_cast<void*>(b), e - b, MADV_HUGEPAGE);
#endif
}

}  // namespace
}  // namespace trivet::three_moment
