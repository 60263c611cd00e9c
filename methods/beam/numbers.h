// trivet: the number types the methods are instantiated on.
#pragma once

#include <boost/multiprecision/cpp_bin_float.hpp>
#include <boost/multiprecision/cpp_int.hpp>

namespace trivet {

// 50 decimal digits, for a reference answer far beyond double.
using Extended = boost::multiprecision::cpp_bin_float_50;
// Exact rationals, for the methods that need only + - * /.
using Exact = boost::multiprecision::cpp_rational;

}  // namespace trivet
