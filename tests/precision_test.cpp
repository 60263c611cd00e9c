// Tests of extended and exact arithmetic (harness/precision).
//
// Exact rationals (trivet::Exact) are compared with == below: that is the
// point of them, an exact value either is the published fraction or is not.
// Doubles and Extended numbers are never compared with ==.
#include <gtest/gtest.h>

#include <algorithm>
#include <cfloat>
#include <cmath>
#include <cstdio>
#include <fstream>
#include <random>
#include <sstream>
#include <string>
#include <vector>

#include "harness/input/reader.h"
#include "harness/precision/exact_reader.h"
#include "harness/precision/precision.h"

namespace {

using namespace trivet;
using namespace trivet::precision;

std::string data_dir() {
  std::string f = __FILE__;
  return f.substr(0, f.find_last_of('/')) + "/data/precision/";
}

std::string slurp(const std::string& path) {
  std::ifstream in(path);
  std::stringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

struct Loaded {
  std::string text;
  input::BeamFile file;
  ExactBeamFile exact;
};

Loaded load_text(const std::string& text) {
  Loaded l;
  l.text = text;
  l.file = input::parse_beam_text(text, "test");
  if (l.file.ok()) l.exact = read_exact_beam(text, l.file);
  return l;
}
Loaded load(const std::string& name) { return load_text(slurp(data_dir() + name)); }

Exact frac(long p, long q) { return Exact(p) / Exact(q); }

// ---------------------------------------------------------------------------
// Published coefficients, exactly, from decimal input.
//
// Equal-span continuous beams under a uniform load w on every span
// (support moments hogging, so negative in trivet's sagging-positive sign):
//   2 spans: M_B = -wL^2/8,   R_A = 3wL/8,   R_B = 5wL/4
//   3 spans: M_B = -wL^2/10,  R_A = 2wL/5,   R_B = 11wL/10
//   4 spans: M_B = -3wL^2/28, M_C = -wL^2/14, R_A = 11wL/28, R_B = 8wL/7, R_C = 13wL/14
// T. G. Hicks, "Civil Engineering Formulas", 2nd ed., McGraw-Hill, 2010,
// Table 2.1, where the coefficients are printed as decimals (0.1071, 0.0714,
// 0.393, 1.143, 0.929 for four spans; 0.125, 0.375, 1.250 for two; 0.100,
// 0.400, 1.100 for three) -- from memory. The fractions are the exact values
// those decimals round.
// With w = 0.1 and L = 0.3 in the files, wL^2 = 9/1000 and wL = 3/100 only
// if the decimal text is read exactly (the doubles 0.1 and 0.3 are not).

const std::vector<std::string> kExactMethods = {"three-moment", "slope-deflection"};

BasicSolution<Exact> solve_file(const Loaded& l, const std::string& method) {
  const auto st = build_stations(l.exact.beam, l.exact.beam.stations_per_span);
  return solve_exact(method, l.exact.beam, st);
}

TEST(PrecisionPublished, TwoSpansExactly) {
  const Loaded l = load("two-span-udl.json");
  ASSERT_TRUE(l.file.ok());
  ASSERT_TRUE(l.exact.ok) << l.exact.error;
  const Exact w = frac(1, 10), L = frac(3, 10);
  for (const auto& m : kExactMethods) {
    SCOPED_TRACE(m);
    const auto s = solve_file(l, m);
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    ASSERT_TRUE(s.nodes[1].moment_left.has_value());
    EXPECT_TRUE(*s.nodes[1].moment_left == -w * L * L / 8) << fraction_text(*s.nodes[1].moment_left);
    EXPECT_TRUE(*s.nodes[1].moment_right == -w * L * L / 8);
    EXPECT_TRUE(s.nodes[0].reaction_force == frac(3, 8) * w * L) << fraction_text(s.nodes[0].reaction_force);
    EXPECT_TRUE(s.nodes[1].reaction_force == frac(5, 4) * w * L);
    EXPECT_TRUE(s.nodes[2].reaction_force == frac(3, 8) * w * L);
  }
}

TEST(PrecisionPublished, ThreeSpansExactly) {
  const Loaded l = load("three-span-udl.json");
  ASSERT_TRUE(l.exact.ok) << l.exact.error;
  const Exact w = frac(1, 10), L = frac(3, 10);
  for (const auto& m : kExactMethods) {
    SCOPED_TRACE(m);
    const auto s = solve_file(l, m);
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    EXPECT_TRUE(*s.nodes[1].moment_left == -w * L * L / 10) << fraction_text(*s.nodes[1].moment_left);
    EXPECT_TRUE(*s.nodes[2].moment_right == -w * L * L / 10);
    EXPECT_TRUE(s.nodes[0].reaction_force == frac(2, 5) * w * L);
    EXPECT_TRUE(s.nodes[1].reaction_force == frac(11, 10) * w * L) << fraction_text(s.nodes[1].reaction_force);
  }
}

TEST(PrecisionPublished, FourSpansExactly) {
  const Loaded l = load("four-span-udl.json");
  ASSERT_TRUE(l.exact.ok) << l.exact.error;
  const Exact w = frac(1, 10), L = frac(3, 10);
  // 1/10 * (3/10)^2 * 3/28 = 27/28000, exactly.
  EXPECT_TRUE(w * L * L * frac(3, 28) == frac(27, 28000));
  for (const auto& m : kExactMethods) {
    SCOPED_TRACE(m);
    const auto s = solve_file(l, m);
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    EXPECT_EQ(fraction_text(*s.nodes[1].moment_left), "-27/28000");
    EXPECT_TRUE(*s.nodes[1].moment_left == -frac(3, 28) * w * L * L);
    EXPECT_TRUE(*s.nodes[2].moment_left == -frac(1, 14) * w * L * L) << fraction_text(*s.nodes[2].moment_left);
    EXPECT_TRUE(*s.nodes[3].moment_right == -frac(3, 28) * w * L * L);
    EXPECT_TRUE(s.nodes[0].reaction_force == frac(11, 28) * w * L) << fraction_text(s.nodes[0].reaction_force);
    EXPECT_TRUE(s.nodes[1].reaction_force == frac(8, 7) * w * L);
    EXPECT_TRUE(s.nodes[2].reaction_force == frac(13, 14) * w * L);
  }
  // The printed decimals round the exact coefficients (Hicks, Table 2.1, from memory).
  EXPECT_EQ(decimal_text(frac(3, 28), 4), "1.071e-1");
  EXPECT_EQ(decimal_text(frac(1, 14), 4), "7.143e-2");
}

TEST(PrecisionPublished, RunReportsFractionsAndDecimals) {
  const Loaded l = load("four-span-udl.json");
  ASSERT_TRUE(l.exact.ok);
  Options o;
  o.arithmetic = Arithmetic::Exact;
  const auto set = run_load_set(l.exact, l.file, "loads", o);
  ASSERT_EQ(set.methods.size(), 3u);
  for (const auto& m : set.methods) {
    SCOPED_TRACE(m.name);
    ASSERT_EQ(m.status, MethodStatus::Ok) << m.reason;
    ASSERT_TRUE(m.nodes[1].moment_left.has_value());
    if (m.name == "stiffness") {
      EXPECT_EQ(m.used, Arithmetic::Extended);
      EXPECT_NE(m.note.find("Gauss-Legendre"), std::string::npos);
      EXPECT_TRUE(m.nodes[1].moment_left->fraction.empty());
      // 50 significant digits of -27/28000 = -9.642857142857...e-4
      EXPECT_EQ(m.nodes[1].moment_left->decimal.substr(0, 20), "-9.64285714285714285");
    } else {
      EXPECT_EQ(m.used, Arithmetic::Exact);
      EXPECT_EQ(m.nodes[1].moment_left->fraction, "-27/28000");
      EXPECT_EQ(m.nodes[1].moment_left->decimal, "-9.642857142857142857142857142857142857143e-4");
    }
    EXPECT_NEAR(m.nodes[1].moment_left->value, -27.0 / 28000.0, 1e-18);
    ASSERT_TRUE(m.rounding.has_value());
    ASSERT_TRUE(m.rounding->measured) << m.rounding->reason;
    EXPECT_GT(m.rounding->worst_digits, 13.0);
  }
}

// A settlement that names its case acts in that case only, in every
// arithmetic. Two equal spans L = 6, EI = 50000, the middle support settles
// d = 0.01 alone: M_B = 3 EI d / L^2 = 125/3 exactly (the three-moment
// equation with settlement terms, closed form); in the dead case it is absent.
TEST(ExactReader, ASettlementNamingItsCaseStaysInThatCase) {
  const Loaded l = load_text(R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 6, "EI": 50000}, {"length": 6, "EI": 50000}],
    "supports": ["pinned", {"type": "roller", "settlement": {"value": 0.01, "case": "imposed"}}, "roller"],
    "loads": [{"type": "udl", "span": 1, "w": 4, "case": "dead"}, {"type": "udl", "span": 2, "w": 4, "case": "dead"}]})");
  ASSERT_TRUE(l.file.ok());
  ASSERT_TRUE(l.exact.ok) << l.exact.error;
  Options o;
  o.arithmetic = Arithmetic::Exact;
  o.methods = {"three-moment"};
  const auto imposed = run_load_set(l.exact, l.file, "imposed", o);
  ASSERT_EQ(imposed.methods.size(), 1u);
  ASSERT_EQ(imposed.methods[0].status, MethodStatus::Ok) << imposed.methods[0].reason;
  EXPECT_EQ(imposed.methods[0].nodes[1].moment_left->fraction, "125/3");
  EXPECT_EQ(imposed.methods[0].nodes[1].deflection.fraction, "1/100");
  const auto dead = run_load_set(l.exact, l.file, "dead", o);
  ASSERT_EQ(dead.methods[0].status, MethodStatus::Ok) << dead.methods[0].reason;
  EXPECT_EQ(dead.methods[0].nodes[1].moment_left->fraction, "-18");  // -wL^2/8
  EXPECT_NEAR(dead.methods[0].nodes[1].deflection.value, 0.0, 1e-300);
}

// One unit grammar for both readers, and one list of symbols: every symbol
// the double reader knows has an exact factor, and the spellings engineers
// type (kNm, mm4, N/mm2) read the same exactly: 12 kNm is 12 kN*m, and
// 8.6e7 mm4 is 86/1000000 m^4, exactly.
TEST(ExactReader, SharesTheUnitGrammarAndSymbols) {
  for (const auto& u : input::unit_symbols()) EXPECT_TRUE(exact_unit_factor(u.symbol).has_value()) << u.symbol;
  const input::Units kn_m;
  auto m = parse_exact_quantity("12 kNm", {1, 1}, kn_m);
  ASSERT_TRUE(m.ok) << m.reason;
  EXPECT_EQ(m.value, Exact(12));
  auto i = parse_exact_quantity("8.6e7 mm4", {0, 4}, kn_m);
  ASSERT_TRUE(i.ok) << i.reason;
  EXPECT_EQ(i.value, frac(86, 1000000));
  auto e = parse_exact_quantity("200000 N/mm2", {1, -2}, kn_m);
  ASSERT_TRUE(e.ok) << e.reason;
  EXPECT_EQ(e.value, Exact(200000000));
}

// The one unit table's two columns agree: each symbol's double factor is
// within about one ulp of its exact num / den (the double reader's values
// are products of rounded constants), and the exact factors are the definitions: 1 lbf =
// 4.4482216152605 N and 1 in = 0.0254 m exactly (NIST Special Publication
// 811, 2008 ed., appendix B.8), 1 ft = 12 in, 1 psi = 1 lbf/in^2.
TEST(ExactReader, TheUnitTableHoldsBothColumnsOfOneFactor) {
  for (const auto& u : input::unit_symbols()) {
    const Exact exact = frac(u.num, u.den);
    EXPECT_EQ(*exact_unit_factor(u.symbol), exact) << u.symbol;
    const double nearest = static_cast<double>(exact);
    EXPECT_LE(std::abs(u.si - nearest), std::abs(nearest) * 2.3e-16) << u.symbol << ": " << u.si << " against " << nearest;
  }
  EXPECT_EQ(*exact_unit_factor("lbf"), frac(44482216152605, 10000000000000));
  EXPECT_EQ(*exact_unit_factor("ft"), 12 * *exact_unit_factor("in"));
  EXPECT_EQ(*exact_unit_factor("in"), frac(254, 10000));
  EXPECT_EQ(*exact_unit_factor("psi"), *exact_unit_factor("lbf") / (*exact_unit_factor("in") * *exact_unit_factor("in")));
  EXPECT_EQ(*exact_unit_factor("ksi"), 1000 * *exact_unit_factor("psi"));
  EXPECT_EQ(*exact_unit_factor("kip"), 1000 * *exact_unit_factor("lbf"));
}

// ---------------------------------------------------------------------------
// The exact reader.

TEST(ExactReader, DecimalTextIsExact) {
  EXPECT_TRUE(*parse_decimal("0.1") == frac(1, 10));
  EXPECT_TRUE(*parse_decimal("-1.5e-3") == frac(-3, 2000));
  EXPECT_TRUE(*parse_decimal("0.0160") == frac(2, 125));  // leading zeros are not octal
  EXPECT_TRUE(*parse_decimal("12.") == Exact(12));
  EXPECT_TRUE(*parse_decimal(".5") == frac(1, 2));
  EXPECT_TRUE(*parse_decimal("2E+3") == Exact(2000));
  EXPECT_FALSE(parse_decimal("1.5 kN").has_value());
  EXPECT_FALSE(parse_decimal("e3").has_value());
  EXPECT_FALSE(parse_decimal("").has_value());
}

TEST(ExactReader, PointOneBecomesOneTenth) {
  const Loaded l = load("two-span-udl.json");
  ASSERT_TRUE(l.exact.ok) << l.exact.error;
  EXPECT_TRUE(l.exact.beam.loads[0].w1 == frac(1, 10));
  EXPECT_TRUE(l.exact.beam.spans[0].length == frac(3, 10));
  EXPECT_TRUE(l.exact.beam.spans[0].EI == frac(27, 10));
  EXPECT_TRUE(l.exact.beam.loads[0].to == frac(3, 10));  // 'to' defaults to L, exactly
  // The double is not 1/10: exact_of gives its exact binary value.
  EXPECT_FALSE(exact_of(0.1) == frac(1, 10));
  EXPECT_TRUE(exact_of(to_double(frac(1, 10))) == exact_of(0.1));
}

TEST(ExactReader, UnitsConvertExactly) {
  const Loaded l = load("exact-units.json");
  ASSERT_TRUE(l.file.ok());
  ASSERT_TRUE(l.exact.ok) << l.exact.error;
  const auto& b = l.exact.beam;
  // 200 GPa * 8.6e7 mm^4 = 2e8 kN/m^2 * 8.6e-5 m^4 = 17200 kN*m^2, exactly.
  EXPECT_TRUE(b.spans[0].EI == Exact(17200)) << fraction_text(b.spans[0].EI);
  // 19.685 ft = 19.685 * 12 * 0.0254 m = 5.999988 m.
  EXPECT_TRUE(b.spans[1].length == *parse_decimal("19.685") * frac(3048, 10000));
  // 1.5 kip/ft in kN/m: 1.5 * 4448.2216152605 N / 0.3048 m / 1000
  // = 8896443230521/406400000000 kN/m (lbf and in exact by definition, NIST
  // SP 811, 2008, B.8; the fraction worked out by hand and by Python's
  // fractions module).
  EXPECT_TRUE(b.loads[0].w1 == Exact(8896443230521LL) / Exact(406400000000LL)) << fraction_text(b.loads[0].w1);
  EXPECT_TRUE(b.loads[0].w1 == frac(3, 2) * *parse_decimal("4448.2216152605") / *parse_decimal("304.8"));
  // 12.5 kip/in = 12.5 * 4448.2216152605 N / 0.0254 m = 12.5 * 4448.2216152605 / 25.4 kN/m.
  EXPECT_TRUE(b.supports[2].k == *parse_decimal("12.5") * *parse_decimal("4448.2216152605") / *parse_decimal("25.4"));
  EXPECT_TRUE(b.supports[2].settlement == frac(635, 100000));  // 0.25 in = 0.00635 m
  // -3 kip*ft = -3 * 4448.2216152605 N * 0.3048 m = -3 * 4.4482216152605 * 0.3048 kN*m.
  EXPECT_TRUE(b.loads[2].C == -3 * *parse_decimal("4.4482216152605") * *parse_decimal("0.3048"));
  EXPECT_TRUE(b.spans[1].length == frac(5999988, 1000000));
  EXPECT_EQ(b.loads[2].load_case, "wind");
  // The file's cases carry over.
  EXPECT_EQ(l.exact.cases, l.file.cases);
}

TEST(ExactReader, ImperialEIExactly) {
  // E = 29000 ksi, I = 1830 in^4 in kip and ft: 29000 * 1830 kip*in^2 / 144
  // = 1105625/3 kip*ft^2 exactly (not a terminating decimal: a double cannot hold it).
  const Loaded l = load_text(R"({"units": {"force": "kip", "length": "ft"},
    "spans": [{"length": 20, "E": "29000 ksi", "I": "1830 in^4"}],
    "supports": ["pinned", "roller"], "loads": [{"type": "udl", "span": 1, "w": 1.2}]})");
  ASSERT_TRUE(l.file.ok());
  ASSERT_TRUE(l.exact.ok) << l.exact.error;
  EXPECT_TRUE(l.exact.beam.spans[0].EI == frac(1105625, 3)) << fraction_text(l.exact.beam.spans[0].EI);
  EXPECT_TRUE(l.exact.beam.loads[0].w1 == frac(6, 5));
}

TEST(ExactReader, PointAtSpanEndMovesToNode) {
  const Loaded l = load_text(R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 4, "EI": 1000}, {"length": 5, "EI": 1000}],
    "supports": ["pinned", "pinned", "pinned"],
    "loads": [{"type": "point", "span": 1, "P": 3, "at": 4.0}, {"type": "point", "span": 2, "P": 2, "at": 0},
              {"type": "point", "span": 2, "P": 1.25, "at": 2.5}]})");
  ASSERT_TRUE(l.exact.ok) << l.exact.error;
  const auto& ld = l.exact.beam.loads;
  ASSERT_EQ(ld.size(), 3u);
  EXPECT_TRUE(ld[0].on_node);
  EXPECT_EQ(ld[0].index, 1u);
  EXPECT_TRUE(ld[1].on_node);
  EXPECT_EQ(ld[1].index, 1u);
  EXPECT_FALSE(ld[2].on_node);
  EXPECT_TRUE(ld[2].at == frac(5, 2));
}

TEST(ExactReader, FailsLoudlyWhenExactAndDoubleDisagree) {
  // 0.29999999999999999 rounds to the double of 0.3, so the double reader
  // moves the force onto node B; exactly, it is 1e-17 inside the span.
  const Loaded l = load_text(R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 0.3, "EI": 1000}, {"length": 5, "EI": 1000}],
    "supports": ["pinned", "pinned", "pinned"],
    "loads": [{"type": "point", "span": 1, "P": 3, "at": 0.29999999999999999}]})");
  ASSERT_TRUE(l.file.ok());
  EXPECT_FALSE(l.exact.ok);
  EXPECT_NE(l.exact.error.find("load 1"), std::string::npos) << l.exact.error;
  EXPECT_NE(l.exact.error.find("placed differently"), std::string::npos) << l.exact.error;
}

TEST(ExactReader, FailsLoudlyOnAPositionPastTheEnd) {
  // 0.30000000000000001 is the double 0.3 (inside the span in double) but
  // 1e-17 past the end of the span exactly.
  const Loaded l = load_text(R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 0.3, "EI": 1000}], "supports": ["pinned", "pinned"],
    "loads": [{"type": "udl", "span": 1, "w": 3, "to": 0.30000000000000001}]})");
  ASSERT_TRUE(l.file.ok());
  EXPECT_FALSE(l.exact.ok);
  EXPECT_NE(l.exact.error.find("outside the span"), std::string::npos) << l.exact.error;
}

// Moving loads are not (yet) run in exact arithmetic: a file with one and
// with combinations naming it reads exactly as without them, and the exact
// run covers its load cases only. Two equal spans L = 6 under w = 4:
// M_B = -wL^2/8 = -18 (the three-moment equation, closed form; the same
// value as in ASettlementNamingItsCaseStaysInThatCase).
TEST(ExactReader, SkipsMovingLoads) {
  const Loaded l = load_text(R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 6, "EI": 50000}, {"length": 6, "EI": 50000}],
    "supports": ["pinned", "roller", "roller"],
    "loads": [{"type": "udl", "span": 1, "w": 4, "case": "dead"}, {"type": "udl", "span": 2, "w": 4, "case": "dead"}],
    "moving_loads": [{"name": "trolley", "points": [{"P": "100 kN", "offset": 0}, {"P": 60.1, "offset": "3500 mm"}]}],
    "combinations": [{"name": "crane", "factors": {"dead": 1.2, "trolley": 1.6}},
                     {"name": "crane alone", "factors": {"trolley": 1.5}}]})");
  ASSERT_TRUE(l.file.ok()) << l.file.errors.front().format("test");
  ASSERT_EQ(l.file.moving_loads.size(), 1u);
  ASSERT_TRUE(l.exact.ok) << l.exact.error;
  EXPECT_EQ(l.exact.beam.loads.size(), 2u);
  EXPECT_EQ(l.exact.cases, std::vector<std::string>{"dead"});
  Options o;
  o.arithmetic = Arithmetic::Exact;
  o.methods = {"three-moment"};
  const FileNumbers run = run_file(l.text, l.file, o);
  ASSERT_TRUE(run.ok) << run.error;
  ASSERT_EQ(run.sets.size(), 1u);
  EXPECT_EQ(run.sets[0].load_case, "dead");
  ASSERT_EQ(run.sets[0].methods.size(), 1u);
  ASSERT_EQ(run.sets[0].methods[0].status, MethodStatus::Ok) << run.sets[0].methods[0].reason;
  EXPECT_EQ(run.sets[0].methods[0].nodes[1].moment_left->fraction, "-18");
}

TEST(ExactNumbers, CorrectRounding) {
  EXPECT_EQ(decimal_text(frac(1, 3), 5), "3.3333e-1");
  EXPECT_EQ(decimal_text(frac(2, 3), 5), "6.6667e-1");
  EXPECT_EQ(decimal_text(frac(1, 8), 2), "1.2e-1");        // tie: to even
  EXPECT_EQ(decimal_text(frac(27, 200), 2), "1.4e-1");     // 0.135: tie, to even
  EXPECT_EQ(decimal_text(frac(999995, 100000), 5), "1.0000e1");
  EXPECT_EQ(decimal_text(Exact(-7), 3), "-7.00e0");
  EXPECT_EQ(fraction_text(frac(6, 4)), "3/2");
  EXPECT_EQ(fraction_text(Exact(-5)), "-5");
  // 1 + 2^-53 is halfway between 1 and the next double: ties to even give 1.
  const Exact half_ulp = Exact(1) / Exact(boost::multiprecision::cpp_int(1) << 53);
  EXPECT_TRUE(exact_of(to_double(1 + half_ulp)) == Exact(1));
  EXPECT_TRUE(exact_of(to_double(1 + 3 * half_ulp)) == 1 + 4 * half_ulp);
  EXPECT_TRUE(exact_of(to_double(1 + half_ulp + half_ulp / 1024)) == 1 + 2 * half_ulp);
  // A subnormal: 2^-1074 exactly, and 3 * 2^-1076 rounds to 2^-1074.
  const Exact tiny = Exact(1) / Exact(boost::multiprecision::cpp_int(1) << 1074);
  EXPECT_TRUE(exact_of(to_double(tiny)) == tiny);
  EXPECT_TRUE(exact_of(to_double(3 * tiny / 4)) == tiny);
  EXPECT_TRUE(exact_of(to_double(frac(1, 10))) == exact_of(0.1));
}

// ---------------------------------------------------------------------------
// Seeded random beams: every support type, settlements, springs, every load.

std::string dec(std::mt19937& g, double lo, double hi, int places) {
  std::uniform_real_distribution<double> u(lo, hi);
  char b[64];
  std::snprintf(b, sizeof b, "%.*f", places, u(g));
  return b;
}

// `stiff_exponent` > 0 multiplies EI of every second span by 10^stiff_exponent.
std::string random_beam(std::mt19937& g, int stiff_exponent) {
  std::uniform_int_distribution<int> ns(1, 5), pick(0, 99);
  const int n = ns(g);
  std::vector<double> lengths;
  std::string t = R"({"units": {"force": "kN", "length": "m"}, "spans": [)";
  for (int i = 0; i < n; ++i) {
    const std::string len = dec(g, 1, 12, 2);
    lengths.push_back(std::stod(len));
    std::string ei = dec(g, 1000, 90000, 1);
    if (stiff_exponent > 0 && i % 2 == 1) ei += "e" + std::to_string(stiff_exponent);
    t += std::string(i ? ", " : "") + R"({"length": )" + len + R"(, "EI": )" + ei + "}";
  }
  t += R"(], "supports": [)";
  for (int i = 0; i <= n; ++i) {
    const int p = pick(g);
    std::string s;
    if (p < 25) s = R"("pinned")";
    else if (p < 42) s = R"("roller")";
    else if (p < 55) s = R"("fixed")";
    else if (p < 72) s = R"("free")";
    else if (p < 85) s = R"({"type": "spring", "k": )" + dec(g, 100, 50000, 1) + "}";
    else if (p < 93) s = R"({"type": "pinned", "settlement": )" + dec(g, -0.02, 0.02, 4) + "}";
    else s = R"({"type": "fixed", "settlement": )" + dec(g, -0.02, 0.02, 4) + "}";
    t += std::string(i ? ", " : "") + s;
  }
  t += R"(], "loads": [)";
  std::uniform_int_distribution<int> nl(1, 2 * n + 1), span(1, n), kind(0, 5);
  const int m = nl(g);
  for (int k = 0; k < m; ++k) {
    const int s = span(g);
    const double L = lengths[static_cast<std::size_t>(s - 1)];
    const std::string sp = std::to_string(s);
    std::string l;
    switch (kind(g)) {
      case 0: l = R"({"type": "point", "span": )" + sp + R"(, "P": )" + dec(g, -50, 100, 2) + R"(, "at": )" + dec(g, 0.05, L - 0.05, 2) + "}"; break;
      case 1: l = R"({"type": "udl", "span": )" + sp + R"(, "w": )" + dec(g, -10, 30, 2) + R"(, "from": )" + dec(g, 0, 0.3 * L, 2) + "}"; break;
      case 2: l = R"({"type": "linear", "span": )" + sp + R"(, "w1": )" + dec(g, -10, 30, 2) + R"(, "w2": )" + dec(g, -10, 30, 2) + R"(, "to": )" + dec(g, 0.6 * L, L, 2) + "}"; break;
      case 3: l = R"({"type": "couple", "span": )" + sp + R"(, "C": )" + dec(g, -40, 40, 2) + R"(, "at": )" + dec(g, 0.1, L - 0.1, 2) + "}"; break;
      case 4: l = R"({"type": "point", "node": )" + sp + R"(, "P": )" + dec(g, -50, 100, 2) + "}"; break;
      default: l = R"({"type": "couple", "node": )" + std::to_string(s + 1) + R"(, "C": )" + dec(g, -40, 40, 2) + "}"; break;
    }
    t += std::string(k ? ", " : "") + l;
  }
  return t + "]}";
}

// Up to `count` random beams the reader accepts (unstable ones are skipped).
std::vector<Loaded> random_beams(unsigned seed, int count, int stiff_exponent) {
  std::mt19937 g(seed);
  std::vector<Loaded> out;
  for (int tries = 0; static_cast<int>(out.size()) < count && tries < 20 * count; ++tries) {
    Loaded l = load_text(random_beam(g, stiff_exponent));
    if (l.file.ok()) out.push_back(std::move(l));
  }
  return out;
}

struct Measured {
  double estimate = 0;  // digits, from the beam
  double lost = 0;      // digits, measured
};

std::vector<Measured> measure_all(const std::vector<Loaded>& beams) {
  std::vector<Measured> out;
  Options o;
  o.arithmetic = Arithmetic::Exact;
  for (const auto& l : beams) {
    EXPECT_TRUE(l.exact.ok) << l.exact.error << "\n" << l.text;
    if (!l.exact.ok) continue;
    const auto set = run_load_set(l.exact, l.file, l.file.cases.front(), o);
    const double bound = 32 * estimated_relative_error(set.conditioning);
    for (const auto& m : set.methods) {
      if (m.status != MethodStatus::Ok || !m.rounding || !m.rounding->measured) continue;
      EXPECT_LE(m.rounding->worst_difference, bound)
          << m.name << " lost more than the estimate allows, at " << m.rounding->worst_where << " ("
          << m.rounding->worst_kind << ")\n" << l.text;
    }
    out.push_back({set.conditioning.estimated_digits_lost, set.conditioning.measured_digits_lost.value_or(0)});
  }
  return out;
}

TEST(PrecisionRandom, DoubleWithinEstimateOnOrdinaryBeams) {
  const auto beams = random_beams(20240611u, 60, 0);
  ASSERT_GE(beams.size(), 50u);
  const auto r = measure_all(beams);
  ASSERT_EQ(r.size(), beams.size());
  std::size_t exact_methods_ok = 0;
  for (const auto& l : beams) {
    const auto st = build_stations(l.exact.beam, 10);
    exact_methods_ok += solve_exact("slope-deflection", l.exact.beam, st).status == MethodStatus::Ok;
  }
  // Slope-deflection covers every beam the reader accepts (springs too).
  EXPECT_EQ(exact_methods_ok, beams.size());
  // Ordinary beams: no warning, and the double results keep >= 12 digits.
  for (const auto& m : r) EXPECT_LT(m.lost, 4.0);
}

TEST(PrecisionRandom, DoubleWithinEstimateOnStiffSpans) {
  for (int e : {4, 8, 11}) {
    SCOPED_TRACE("every second span 1e" + std::to_string(e) + " times stiffer");
    const auto beams = random_beams(7u + static_cast<unsigned>(e), 40, e);
    ASSERT_GE(beams.size(), 30u);
    const auto r = measure_all(beams);
    // The estimate is not wildly pessimistic: it is reached (to within 3
    // digits) on a good share of these beams, and the worst measured loss is
    // within 3 digits of the worst estimate.
    std::size_t reached = 0;
    double worst_est = 0, worst_lost = 0;
    for (const auto& m : r) {
      reached += m.lost >= m.estimate - 3;
      worst_est = std::max(worst_est, m.estimate);
      worst_lost = std::max(worst_lost, m.lost);
    }
    EXPECT_GE(4 * reached, r.size()) << reached << " of " << r.size();
    EXPECT_GE(worst_lost, worst_est - 3) << "worst estimate " << worst_est << ", worst loss " << worst_lost;
  }
}

// ---------------------------------------------------------------------------
// A deliberately ill-conditioned beam.

TEST(PrecisionConditioning, StiffSpanIsWarnedAboutAndLosesDigits) {
  const Loaded l = load("ill-conditioned.json");
  ASSERT_TRUE(l.file.ok());
  ASSERT_TRUE(l.exact.ok) << l.exact.error;
  // From the beam alone.
  const Conditioning c = estimate_conditioning(l.file.beam);
  ASSERT_FALSE(c.features.empty());
  EXPECT_GT(c.estimated_digits_lost, 10.0);
  ASSERT_FALSE(c.warnings.empty());
  EXPECT_NE(c.warnings.front().find("span 2 is 1e10 times stiffer than span 1 (EI/L^3)"), std::string::npos)
      << c.warnings.front();
  // The reference shows the digits lost.
  Options o;
  o.arithmetic = Arithmetic::Exact;
  const auto set = run_load_set(l.exact, l.file, "loads", o);
  ASSERT_TRUE(set.conditioning.measured_digits_lost.has_value());
  EXPECT_GT(*set.conditioning.measured_digits_lost, 6.0);
  bool some_method_lost = false;
  for (const auto& m : set.methods)
    if (m.rounding && m.rounding->measured && m.rounding->worst_digits < 9) some_method_lost = true;
  EXPECT_TRUE(some_method_lost);
  EXPECT_GE(set.conditioning.warnings.size(), 2u);  // the estimate's and the measurement's
}

TEST(PrecisionConditioning, PureFunctionOfTheBeam) {
  const Loaded l = load("ill-conditioned.json");
  ASSERT_TRUE(l.file.ok());
  const Conditioning a = estimate_conditioning(l.file.beam), b = estimate_conditioning(l.file.beam);
  EXPECT_EQ(a.warnings, b.warnings);
  EXPECT_NEAR(a.estimated_digits_lost, b.estimated_digits_lost, 1e-12);
  // Equal spans: no feature, no warning, one base digit.
  const Loaded e = load("four-span-udl.json");
  const Conditioning d = estimate_conditioning(e.file.beam);
  EXPECT_TRUE(d.features.empty());
  EXPECT_TRUE(d.warnings.empty());
  EXPECT_NEAR(d.estimated_digits_lost, kBaseDigitsLost, 1e-12);
  // A spring far stiffer than the beam is named.
  Beam s = e.file.beam;
  s.supports[2].type = SupportType::Spring;
  s.supports[2].k = 1e12 * s.spans[1].EI / std::pow(s.spans[1].length, 3);
  const Conditioning f = estimate_conditioning(s);
  ASSERT_FALSE(f.warnings.empty());
  EXPECT_NE(f.warnings.front().find("spring at node C"), std::string::npos) << f.warnings.front();
  // A spring so soft that its ratio to the beam leaves double's range (the
  // smallest subnormal) is the worst case, not none.
  for (double k : {1e-12, 5e-324}) {
    s.supports[2].k = k;
    const Conditioning g = estimate_conditioning(s);
    ASSERT_FALSE(g.warnings.empty()) << k;
    EXPECT_NE(g.warnings.front().find("spring at node C"), std::string::npos) << g.warnings.front();
    EXPECT_NE(g.warnings.front().find("softer"), std::string::npos) << g.warnings.front();
  }
}

// ---------------------------------------------------------------------------
// Extended against Exact.

// Largest |extended - exact| over a solution's node results and station
// values, each relative to the largest magnitude of its kind.
double extended_vs_exact(const BasicSolution<Extended>& e, const BasicSolution<Exact>& x,
                         const std::vector<BasicStation<Exact>>& xs,
                         const std::vector<BasicStation<Extended>>& es) {
  std::vector<std::pair<Extended, Extended>> kind[5];  // moment, shear, reaction, deflection, rotation
  for (std::size_t j = 0; j < x.nodes.size(); ++j) {
    const auto& a = e.nodes[j];
    const auto& b = x.nodes[j];
    if (a.moment_left && b.moment_left) kind[0].push_back({*a.moment_left, to_extended(*b.moment_left)});
    if (a.moment_right && b.moment_right) kind[0].push_back({*a.moment_right, to_extended(*b.moment_right)});
    kind[0].push_back({a.reaction_moment, to_extended(b.reaction_moment)});
    kind[2].push_back({a.reaction_force, to_extended(b.reaction_force)});
    kind[3].push_back({a.deflection, to_extended(b.deflection)});
    kind[4].push_back({a.rotation_left, to_extended(b.rotation_left)});
    kind[4].push_back({a.rotation_right, to_extended(b.rotation_right)});
  }
  for (std::size_t i = 0; i < xs.size(); ++i) {
    const auto a = e.at(es[i].span, es[i].local, es[i].after);
    const auto b = x.at(xs[i].span, xs[i].local, xs[i].after);
    kind[0].push_back({a.moment, to_extended(b.moment)});
    kind[1].push_back({a.shear, to_extended(b.shear)});
    kind[3].push_back({a.deflection, to_extended(b.deflection)});
    kind[4].push_back({a.rotation, to_extended(b.rotation)});
  }
  Extended worst = 0;
  for (const auto& k : kind) {
    Extended scale = 0, diff = 0;
    for (const auto& [a, b] : k) {
      scale = std::max(scale, Extended(abs(b)));
      diff = std::max(diff, Extended(abs(a - b)));
    }
    if (scale > 0) worst = std::max(worst, Extended(diff / scale));
  }
  return static_cast<double>(worst);
}

TEST(PrecisionExtended, AgreesWithExactTo45Digits) {
  // Ordinary beams (an ill-conditioned one loses the same digits in
  // Extended as in double: 1e10 costs 10 of the 50).
  auto beams = random_beams(99u, 40, 0);
  for (const char* f : {"four-span-udl.json", "exact-units.json"}) beams.push_back(load(f));
  std::size_t compared = 0;
  for (const auto& l : beams) {
    ASSERT_TRUE(l.exact.ok) << l.exact.error;
    const auto xs = build_stations(l.exact.beam, 10);
    const auto eb = to_extended(l.exact.beam);
    std::vector<BasicStation<Extended>> es;
    for (const auto& s : xs) es.push_back({to_extended(s.x), s.span, to_extended(s.local), s.after});
    for (const auto& m : kExactMethods) {
      const auto x = solve_exact(m, l.exact.beam, xs);
      const auto e = solve_extended(m, eb, es);
      ASSERT_EQ(x.status, e.status) << m << ": " << x.reason << " / " << e.reason << "\n" << l.text;
      if (x.status != MethodStatus::Ok) continue;
      ++compared;
      EXPECT_LE(extended_vs_exact(e, x, xs, es), 1e-45) << m << "\n" << l.text;
    }
  }
  EXPECT_GE(compared, 50u);
}

}  // namespace
