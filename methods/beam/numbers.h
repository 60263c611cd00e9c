// trivet: the number types the methods are instantiated on.
#pragma once

// GCC 12 warns falsely ("may be used uninitialized") inside Boost's
// rational arithmetic; the warning is about Boost's code, not ours.
#if defined(__GNUC__) && !defined(__clang__)
#pragma GCC diagnostic push
#pragma GCC diagnostic ignored "-Wmaybe-uninitialized"
#endif
#include <boost/multiprecision/cpp_bin_float.hpp>
#include <boost/multiprecision/cpp_int.hpp>
#if defined(__GNUC__) && !defined(__clang__)
#pragma GCC diagnostic pop
#endif

namespace trivet {

// 50 decimal digits, for a reference answer far beyond double.
using Extended = boost::multiprecision::cpp_bin_float_50;
// Exact rationals, for the methods that need only + - * /.
using Exact = boost::multiprecision::cpp_rational;

}  // namespace trivet
