// Units and quantities with their own unit. Conversion factors are exact
// by definition: 1 in = 0.0254 m, 1 lbf = 4.4482216152605 N (NIST Special
// Publication 811, "Guide for the Use of the International System of
// Units", 2008 ed., appendix B.8).
#include <gtest/gtest.h>

#include <cmath>

#include "harness/input/units.h"

namespace trivet::input {
namespace {

Units kN_m() { return Units{}; }
Units kip_ft() {
  Units u;
  u.force = "kip"; u.length = "ft";
  u.newtons = *force_unit("kip"); u.metres = *length_unit("ft");
  return u;
}

TEST(Units, PlainNumberIsInFileUnits) {
  auto q = parse_quantity("12.5", {1, -1}, kN_m());
  ASSERT_TRUE(q.ok);
  EXPECT_DOUBLE_EQ(q.value, 12.5);
}

TEST(Units, ModulusInGigapascalToKilonewtonPerSquareMetre) {
  auto q = parse_quantity("200 GPa", {1, -2}, kN_m());
  ASSERT_TRUE(q.ok) << q.reason;
  EXPECT_NEAR(q.value, 2e8, 1e-6);
}

TEST(Units, SecondMomentOfAreaInMillimetres) {
  auto q = parse_quantity("8.6e7 mm^4", {0, 4}, kN_m());
  ASSERT_TRUE(q.ok) << q.reason;
  EXPECT_NEAR(q.value, 8.6e-5, 1e-18);
}

TEST(Units, SuperscriptPowersAndMiddleDot) {
  auto q = parse_quantity("52000 kN\xC2\xB7m\xC2\xB2", {1, 2}, kN_m());
  ASSERT_TRUE(q.ok) << q.reason;
  EXPECT_NEAR(q.value, 52000, 1e-9);
}

TEST(Units, KipPerFootInKipFootFile) {
  auto q = parse_quantity("1.5 kip/ft", {1, -1}, kip_ft());
  ASSERT_TRUE(q.ok) << q.reason;
  EXPECT_NEAR(q.value, 1.5, 1e-12);
}

TEST(Units, KsiToKipPerSquareFoot) {
  // 1 ksi = 144 kip/ft^2.
  auto q = parse_quantity("29000 ksi", {1, -2}, kip_ft());
  ASSERT_TRUE(q.ok) << q.reason;
  EXPECT_NEAR(q.value, 29000.0 * 144.0, 1e-6);
}

TEST(Units, RotationalSpringWithRadian) {
  auto q = parse_quantity("5000 kN*m/rad", {1, 1}, kN_m());
  ASSERT_TRUE(q.ok) << q.reason;
  EXPECT_NEAR(q.value, 5000, 1e-9);
}

TEST(Units, WrongDimensionIsRefused) {
  auto q = parse_quantity("3 kN", {0, 1}, kN_m());
  EXPECT_FALSE(q.ok);
  EXPECT_EQ(q.reason, "the unit of \"3 kN\" is force, but this field is length (for example m)");
}

TEST(Units, UnknownUnitIsRefused) {
  auto q = parse_quantity("3 furlong", {0, 1}, kN_m());
  EXPECT_FALSE(q.ok);
  EXPECT_EQ(q.reason.rfind("unknown unit 'furlong'", 0), 0u);
}

TEST(Units, NotANumber) {
  auto q = parse_quantity("abc", {0, 1}, kN_m());
  EXPECT_FALSE(q.ok);
}

TEST(Units, UnitNames) {
  EXPECT_EQ(kN_m().of({1, 1}), "kN*m");
  EXPECT_EQ(kN_m().of({1, -1}), "kN/m");
  EXPECT_EQ(kN_m().of({1, 2}), "kN*m^2");
  EXPECT_EQ(kN_m().of({0, 1}), "m");
}

}  // namespace
}  // namespace trivet::input

namespace trivet::input {
namespace {

// The spellings engineers type: kNm, kN-m, kN.m, mm4, in4, cm4, N/mm2,
// N/mm^2. Conversions by definition of the SI prefixes and of the inch
// (NIST Special Publication 811, 2008 ed., appendix B.8).
TEST(UnitSpellings, WrittenTogetherDottedDashedAndWithBarePowers) {
  const Units u = Units{};  // kN, m
  for (const char* t : {"12 kNm", "12 kN-m", "12 kN.m", "12 kN*m", "12 kN m", "12000 Nm", "12000000 Nmm"}) {
    auto q = parse_quantity(t, {1, 1}, u);
    ASSERT_TRUE(q.ok) << t << ": " << q.reason;
    EXPECT_NEAR(q.value, 12.0, 1e-12) << t;
  }
  for (const char* t : {"8.6e7 mm4", "8.6e7 mm^4", "8600 cm4"}) {
    auto q = parse_quantity(t, {0, 4}, u);
    ASSERT_TRUE(q.ok) << t << ": " << q.reason;
    EXPECT_NEAR(q.value, 8.6e-5, 1e-17) << t;
  }
  auto in4 = parse_quantity("100 in4", {0, 4}, u);
  ASSERT_TRUE(in4.ok) << in4.reason;
  EXPECT_NEAR(in4.value, 100 * std::pow(0.0254, 4), 1e-18);
  // 200 GPa = 200,000 N/mm^2 = 200 kN/mm^2 = 2e8 kN/m^2.
  for (const char* t : {"200000 N/mm2", "200000 N/mm^2", "200 GPa", "200 kN/mm2"}) {
    auto q = parse_quantity(t, {1, -2}, u);
    ASSERT_TRUE(q.ok) << t << ": " << q.reason;
    EXPECT_NEAR(q.value / 2e8, 1.0, 1e-12) << t;
  }
  auto kipft = parse_quantity("3 kipft", {1, 1}, kip_ft());
  ASSERT_TRUE(kipft.ok) << kipft.reason;
  EXPECT_NEAR(kipft.value, 3.0, 1e-12);
}

TEST(UnitSpellings, UnknownUnitsListWhatIsKnown) {
  auto q = parse_quantity("12 kNx", {1, 1}, Units{});
  EXPECT_FALSE(q.ok);
  EXPECT_NE(q.reason.find("unknown unit 'kNx'"), std::string::npos) << q.reason;
  EXPECT_NE(q.reason.find("known: N, kN, MN, lbf, kip, mm, cm, m, in, ft, Pa, kPa, MPa, GPa, psi, ksi, rad"), std::string::npos)
      << q.reason;
  // A separator must stand between two factors.
  EXPECT_FALSE(parse_quantity("12 kN-", {1, 0}, Units{}).ok);
  EXPECT_FALSE(parse_quantity("12 -kN", {1, 0}, Units{}).ok);
  // Written together, the dimension is still checked.
  auto d = parse_quantity("12 kNm", {1, 0}, Units{});
  EXPECT_FALSE(d.ok);
  EXPECT_NE(d.reason.find("force*length"), std::string::npos) << d.reason;
}

}  // namespace
}  // namespace trivet::input
