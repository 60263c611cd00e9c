// trivet three-moment method: a banded linear solve, Gaussian elimination
// with row pivoting, O(n (kl + ku) kl) for n unknowns.
//
// Private to methods/three_moment. Written for any number type R with
// + - * / and < (double, cpp_bin_float_50, cpp_rational): Eigen's LU does
// not take cpp_rational (DESIGN.md, "Numbers and precision").
//
// Storage: row i keeps the columns i - kl .. i + kl + ku (the upper band
// grows by kl through the row exchanges of partial pivoting: the U factor
// has bandwidth kl + ku, and a row moved up from at most kl rows below
// still fits, as in LAPACK's band LU). The right-hand side is eliminated
// with the matrix, so the factors are not kept.
#pragma once

#include <cstddef>
#include <optional>
#include <utility>
#include <vector>

#include "methods/three_moment/load_terms.h"

namespace trivet::three_moment::detail {

template <class R>
class BandSystem {
 public:
  // n unknowns, kl sub-diagonals and ku super-diagonals in the rows as given.
  BandSystem(std::size_t n, std::size_t kl, std::size_t ku)
      : n_(n), kl_(kl), ku_(ku), w_(2 * kl + ku + 1), a_(n * w_, R(0)), b_(n, R(0)) {}

  std::size_t size() const { return n_; }
  // Adds `v` to A(row, col); col must lie in row - kl .. row + ku.
  void add(std::size_t row, std::size_t col, const R& v) { a_[row * w_ + (col + kl_ - row)] += v; }
  void add_rhs(std::size_t row, const R& v) { b_[row] += v; }

  // Solves A x = b. On a zero (or non-finite) pivot returns the column where
  // elimination stopped in `bad_column` and no solution.
  std::optional<std::vector<R>> solve(std::size_t& bad_column) {
    const std::size_t reach = kl_ + ku_;  // last column of a pivot row, past the diagonal
    for (std::size_t j = 0; j < n_; ++j) {
      const std::size_t last = j + kl_ < n_ ? j + kl_ : n_ - 1;
      const std::size_t cend = j + reach < n_ ? j + reach : n_ - 1;
      std::size_t p = j;
      R best = magnitude(at(j, j));
      for (std::size_t r = j + 1; r <= last; ++r) {
        R m = magnitude(at(r, j));
        if (best < m) { best = std::move(m); p = r; }
      }
      if (!(R(0) < best) || !finite(best)) {
        bad_column = j;
        return std::nullopt;
      }
      if (p != j) {
        for (std::size_t c = j; c <= cend; ++c) std::swap(at(j, c), at(p, c));
        std::swap(b_[j], b_[p]);
      }
      const R& piv = at(j, j);
      for (std::size_t r = j + 1; r <= last; ++r) {
        if (is_zero(at(r, j))) continue;
        const R f = at(r, j) / piv;
        for (std::size_t c = j + 1; c <= cend; ++c)
          if (!is_zero(at(j, c))) at(r, c) -= f * at(j, c);
        b_[r] -= f * b_[j];
        at(r, j) = R(0);
      }
    }
    std::vector<R> x(n_, R(0));
    for (std::size_t j = n_; j-- > 0;) {
      const std::size_t cend = j + reach < n_ ? j + reach : n_ - 1;
      R s = b_[j];
      for (std::size_t c = j + 1; c <= cend; ++c)
        if (!is_zero(at(j, c))) s -= at(j, c) * x[c];
      x[j] = s / at(j, j);
      if (!finite(x[j])) {
        bad_column = j;
        return std::nullopt;
      }
    }
    return x;
  }

 private:
  R& at(std::size_t row, std::size_t col) { return a_[row * w_ + (col + kl_ - row)]; }
  static R magnitude(const R& v) { return v < R(0) ? R(-v) : v; }

  std::size_t n_, kl_, ku_, w_;
  std::vector<R> a_, b_;
};

}  // namespace trivet::three_moment::detail
