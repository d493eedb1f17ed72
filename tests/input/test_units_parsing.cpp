// Splitting "number unit" and the errors for text that is not a quantity.
#include "unit_check.hpp"

#include <gmock/gmock.h>
#include <gtest/gtest.h>

namespace oxystrat::test {
namespace {

using testing::HasSubstr;
using units::Dimension;

std::string unit_error(Dimension dim, const std::string& text) {
  try {
    units::parse(dim, text);
  } catch (const UnitError& e) {
    return e.what();
  }
  ADD_FAILURE() << "'" << text << "' was accepted";
  return "";
}

TEST(UnitsSplit, NumberAndUnit) {
  const auto q = units::split("  120   rpm ");
  EXPECT_EQ(q.value, 120.0);
  EXPECT_EQ(q.unit, "rpm");
  const auto bare = units::split("0.6");
  EXPECT_EQ(bare.value, 0.6);
  EXPECT_EQ(bare.unit, "");
}

TEST(UnitsSplit, NumberForms) {
  expect_si(Dimension::length, "+5 m", 5.0);
  expect_si(Dimension::length, "1e3 mm", 1.0);
  expect_si(Dimension::length, "2.5E-1 m", 0.25);
  expect_si(Dimension::length, "-0.5 m", -0.5);  // the sign is the range check's business
}

TEST(UnitsSplit, BadNumbersAreErrors) {
  for (const char* text : {"", "   ", "abc m", "m 5", "rpm", "--5 m"}) {
    EXPECT_THAT(unit_error(Dimension::length, text), HasSubstr("does not start with a number")) << text;
  }
  for (const char* text : {"nan m", "inf m", "1e999 m"}) {
    const auto msg = unit_error(Dimension::length, text);
    EXPECT_FALSE(msg.empty()) << text;
  }
  EXPECT_THAT(unit_error(Dimension::length, "nan m"), HasSubstr("not a finite number"));
}

TEST(UnitsSplit, TrailingJunkIsAnUnknownUnit) {
  EXPECT_THAT(unit_error(Dimension::length, "1.2.3 m"), HasSubstr("unknown unit '.3 m'"));
}

TEST(UnitsErrors, MissingUnitListsTheAcceptedOnes) {
  const auto msg = unit_error(Dimension::speed, "120");
  EXPECT_THAT(msg, HasSubstr("missing unit"));
  EXPECT_THAT(msg, HasSubstr("rpm, rps, 1/s, 1/min, Hz"));
}

TEST(UnitsErrors, UnknownUnitNamesItAndListsTheAcceptedOnes) {
  const auto msg = unit_error(Dimension::length, "3 furlong");
  EXPECT_THAT(msg, HasSubstr("unknown unit 'furlong'"));
  EXPECT_THAT(msg, HasSubstr("m, mm, cm, um, in, ft"));
}

TEST(UnitsErrors, UnitsAreCaseSensitive) {
  // "M" (mol/L) and "m" (metre) differ, so no case folding anywhere.
  EXPECT_THAT(unit_error(Dimension::speed, "120 RPM"), HasSubstr("unknown unit 'RPM'"));
  EXPECT_THAT(unit_error(Dimension::length, "1 M"), HasSubstr("unknown unit 'M'"));
}

TEST(UnitsErrors, UnitOfAnotherDimensionIsUnknown) {
  EXPECT_THAT(unit_error(Dimension::length, "1 kg"), HasSubstr("unknown unit 'kg'"));
  EXPECT_THAT(unit_error(Dimension::temperature, "30 C"), HasSubstr("degC, K"));
}

TEST(UnitsErrors, FractionRejectsOtherUnits) {
  EXPECT_THAT(unit_error(Dimension::fraction, "0.5 m"), HasSubstr("a plain number or %"));
}

TEST(UnitsAccepted, PressureSaysAbsoluteOrGauge) {
  EXPECT_THAT(units::accepted(Dimension::pressure), HasSubstr("(a) for absolute or (g) for gauge"));
}

TEST(UnitsDisplay, FirstUnitOfEachDimension) {
  EXPECT_EQ(units::display_unit(Dimension::length), "m");
  EXPECT_EQ(units::display_unit(Dimension::speed), "rpm");
  EXPECT_EQ(units::display_unit(Dimension::fraction), "");
  EXPECT_EQ(units::format(Dimension::speed, 2.0), "120 rpm");
  EXPECT_EQ(units::format(Dimension::fraction, 0.25), "0.25");
  EXPECT_EQ(units::format(Dimension::volume, 62.3456, 3), "62.3 m3");
}

}  // namespace
}  // namespace oxystrat::test
