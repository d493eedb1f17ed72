// Every unit of the mechanical dimensions converts to SI by its defining factor.
#include "unit_check.hpp"

#include <gtest/gtest.h>

namespace oxystrat::test {
namespace {

using units::Dimension;

// Definitions used below (by definition, SI Brochure 9th ed. / NIST SP 811, 2008 ed., App. B):
//   inch = 0.0254 m and foot = 0.3048 m exactly (international yard and pound, 1959);
//   pound (mass) = 0.45359237 kg exactly; standard gravity g_n = 9.80665 m/s^2 (CGPM 1901);
//   litre = 1e-3 m^3 (CGPM 1964); minute = 60 s, hour = 3600 s, day = 86400 s;
//   poise = 0.1 Pa s, so centipoise = 1 mPa s.
constexpr double kInch = 0.0254;
constexpr double kFoot = 12.0 * kInch;
constexpr double kPoundForce = 0.45359237 * 9.80665;  // N
// Mechanical horsepower = 550 ft lbf/s (by definition, NIST SP 811 App. B.8).
constexpr double kHorsepower = 550.0 * kFoot * kPoundForce;  // W

TEST(UnitsLength, EveryUnit) {
  expect_si(Dimension::length, "2.5 m", 2.5);
  expect_si(Dimension::length, "250 mm", 0.25);
  expect_si(Dimension::length, "25 cm", 0.25);
  expect_si(Dimension::length, "10 in", 10.0 * kInch);
  expect_si(Dimension::length, "3 ft", 3.0 * kFoot);
}

TEST(UnitsLength, FootIsTwelveInches) {
  // The table's ft factor must equal 12 x its in factor (both exact definitions).
  EXPECT_NEAR(units::parse(Dimension::length, "1 ft"), 12.0 * units::parse(Dimension::length, "1 in"), kRoundOff);
}

TEST(UnitsVolume, EveryUnit) {
  expect_si(Dimension::volume, "60 m3", 60.0);
  expect_si(Dimension::volume, "60 m^3", 60.0);
  expect_si(Dimension::volume, "300 L", 0.3);
  expect_si(Dimension::volume, "300 l", 0.3);
  expect_si(Dimension::volume, "250 mL", 250e-6);
}

TEST(UnitsSpeed, EveryUnit) {
  expect_si(Dimension::speed, "120 rpm", 2.0);  // 1 r/min = 1/60 s^-1
  expect_si(Dimension::speed, "120 1/min", 2.0);
  expect_si(Dimension::speed, "2.5 rps", 2.5);
  expect_si(Dimension::speed, "2.5 1/s", 2.5);
  expect_si(Dimension::speed, "2.5 Hz", 2.5);
}

TEST(UnitsTime, EveryUnit) {
  expect_si(Dimension::time, "45 s", 45.0);
  expect_si(Dimension::time, "250 ms", 0.25);
  expect_si(Dimension::time, "1.5 min", 90.0);
  expect_si(Dimension::time, "2 h", 7200.0);
  expect_si(Dimension::time, "1 d", 86400.0);
}

TEST(UnitsVelocity, EveryUnit) {
  expect_si(Dimension::velocity, "0.25 m/s", 0.25);
  expect_si(Dimension::velocity, "25 cm/s", 0.25);
  expect_si(Dimension::velocity, "250 mm/s", 0.25);
}

TEST(UnitsPower, EveryUnit) {
  expect_si(Dimension::power, "75 kW", 75e3);
  expect_si(Dimension::power, "750 W", 750.0);
  expect_si(Dimension::power, "1.2 MW", 1.2e6);
  expect_si(Dimension::power, "100 hp", 100.0 * kHorsepower);
}

TEST(UnitsPowerDensity, EveryUnit) {
  expect_si(Dimension::power_density, "2 kW/m3", 2000.0);
  expect_si(Dimension::power_density, "2000 W/m3", 2000.0);
  expect_si(Dimension::power_density, "2 W/L", 2000.0);
}

TEST(UnitsViscosity, EveryUnit) {
  expect_si(Dimension::viscosity, "2 mPa s", 2e-3);
  expect_si(Dimension::viscosity, "2 mPa.s", 2e-3);
  expect_si(Dimension::viscosity, "2 cP", 2e-3);
  expect_si(Dimension::viscosity, "0.5 Pa s", 0.5);
  expect_si(Dimension::viscosity, "0.5 Pa.s", 0.5);
}

TEST(UnitsViscosity, RunsOfBlanksInsideAUnitCountAsOne) {
  expect_si(Dimension::viscosity, "2 mPa   s", 2e-3);
  expect_si(Dimension::viscosity, "  2   mPa s  ", 2e-3);
}

TEST(UnitsSymbols, TypographicFormsAreTheirPlainOnes) {
  // As data sheets print them: a middle dot (or dot operator) for the product, superscript powers,
  // the micro sign or the Greek mu.
  expect_si(Dimension::viscosity, "1.1 mPa\u00b7s", 1.1e-3);
  expect_si(Dimension::viscosity, "1.1 mPa\u22c5s", 1.1e-3);
  expect_si(Dimension::volume, "2 m\u00b3", 2.0);
  expect_si(Dimension::area, "60 m\u00b2", 60.0);
  expect_si(Dimension::length, "20 \u00b5m", 20e-6);
  expect_si(Dimension::length, "20 \u03bcm", 20e-6);
}

TEST(UnitsDensity, EveryUnit) {
  expect_si(Dimension::density, "1030 kg/m3", 1030.0);
  expect_si(Dimension::density, "1030 g/L", 1030.0);
  expect_si(Dimension::density, "1.03 g/cm3", 1030.0);
  expect_si(Dimension::density, "1.03 kg/L", 1030.0);
}

TEST(UnitsBiomass, EveryUnit) {
  expect_si(Dimension::biomass, "30 g/L", 30.0);
  expect_si(Dimension::biomass, "30 kg/m3", 30.0);
  expect_si(Dimension::biomass, "500 mg/L", 0.5);
}

TEST(UnitsSpecificRate, EveryUnit) {
  // 1 mmol/(g h) = 1e-3 mol / (1e-3 kg x 3600 s) = 1/3600 mol/(kg s).
  expect_si(Dimension::specific_rate, "4 mmol/g/h", 4.0 / 3600.0);
  expect_si(Dimension::specific_rate, "4 mmol/(g h)", 4.0 / 3600.0);
  expect_si(Dimension::specific_rate, "4 mol/kg/h", 4.0 / 3600.0);
  expect_si(Dimension::specific_rate, "0.002 mol/kg/s", 0.002);
}

TEST(UnitsFraction, PlainNumberAndPercent) {
  expect_si(Dimension::fraction, "0.2095", 0.2095);
  expect_si(Dimension::fraction, "20.95 %", 0.2095);
  expect_si(Dimension::fraction, "20.95%", 0.2095);
}

}  // namespace
}  // namespace oxystrat::test
