// The table units of compare, sweep and the reports against their SI units: each factor is the
// definition of the unit, so the checks are exact up to one rounding.
#include "input/display_units.hpp"

#include <gtest/gtest.h>

#include <stdexcept>

namespace oxystrat::test {
namespace {

using units::display_per_si;
using units::display_scale;

TEST(DisplayUnits, TableUnitsMapToTheirSiUnitWithTheirDefinition) {
  // 1 kW = 1e3 W; 1 h = 3600 s; 1 mmol/L = 1 mol/m3; 1 % = 0.01; 1 mmHg = 133.322387415 Pa
  // (conventional); 1 um = 1e-6 m; 1 kg/h = 1/3600 kg/s.
  EXPECT_EQ(display_scale("kW").si_unit, "W");
  EXPECT_DOUBLE_EQ(display_scale("kW").per_si, 1e-3);
  EXPECT_EQ(display_scale("1/h").si_unit, "1/s");
  EXPECT_DOUBLE_EQ(display_scale("1/h").per_si, 3600.0);
  EXPECT_EQ(display_scale("mmol/L").si_unit, "mol/m3");
  EXPECT_DOUBLE_EQ(display_scale("mmol/L").per_si, 1.0);
  EXPECT_EQ(display_scale("%").si_unit, "1");
  EXPECT_DOUBLE_EQ(display_scale("%").per_si, 100.0);
  EXPECT_EQ(display_scale("mmHg").si_unit, "Pa");
  EXPECT_DOUBLE_EQ(display_scale("mmHg").per_si * 133.322387415, 1.0);
  EXPECT_EQ(display_scale("mmol/(L h)").si_unit, "mol/(m3 s)");
  EXPECT_DOUBLE_EQ(display_scale("mmol/(L h)").per_si, 3600.0);
  EXPECT_EQ(display_scale("um").si_unit, "m");
  EXPECT_DOUBLE_EQ(display_scale("um").per_si, 1e6);
  EXPECT_DOUBLE_EQ(display_per_si("kg/s", "kg/h"), 3600.0);
  EXPECT_DOUBLE_EQ(display_per_si("kg/m3", "g/L"), 1.0);
}

TEST(DisplayUnits, SiUnitsMapToThemselves) {
  for (const char* u : {"1", "W", "W/kg", "Pa", "m/s", "s", "mol/m3"}) {
    EXPECT_EQ(display_scale(u).si_unit, u);
    EXPECT_EQ(display_scale(u).per_si, 1.0);
  }
}

TEST(DisplayUnits, UnknownOrMismatchedUnitsAreRefused) {
  // A unit nobody listed must not reach a file unconverted.
  EXPECT_THROW(display_scale("furlong/fortnight"), std::invalid_argument);
  EXPECT_THROW(display_per_si("W", "1/h"), std::invalid_argument);
}

}  // namespace
}  // namespace oxystrat::test
