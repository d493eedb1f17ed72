// Dissolved-gas concentrations: molar units directly, mass units through the molar mass.
#include "unit_check.hpp"
#include "physics/solubility.hpp"

#include <gmock/gmock.h>
#include <gtest/gtest.h>

namespace oxystrat::test {
namespace {

using testing::HasSubstr;
using units::Dimension;

TEST(UnitsConcentration, EveryMolarUnit) {
  // mol/m3 = mmol/L = mM (1 L = 1e-3 m3, by definition).
  expect_si(Dimension::concentration, "0.2 mmol/L", 0.2);
  expect_si(Dimension::concentration, "0.2 mol/m3", 0.2);
  expect_si(Dimension::concentration, "0.2 mM", 0.2);
  expect_si(Dimension::concentration, "0.15 mol/L", 150.0);
  expect_si(Dimension::concentration, "0.15 M", 150.0);
  expect_si(Dimension::concentration, "200 umol/L", 0.2);
}

TEST(UnitsConcentration, MassUnitsOfOxygenUseItsMolarMass) {
  // 8 mg/L = 8 g/m3; divided by M(O2) = 31.9988 g/mol (IUPAC standard atomic weight of O,
  // 15.9994, common practice) gives mol/m3.
  const double m_o2 = 31.9988e-3;
  EXPECT_NEAR(physics::molar_mass_o2, m_o2, kRoundOff * m_o2);
  expect_si(Dimension::concentration, "8 mg/L", 8.0 / 31.9988, m_o2);
  expect_si(Dimension::concentration, "8 g/m3", 8.0 / 31.9988, m_o2);
}

TEST(UnitsConcentration, MassUnitsWithoutMolarMassAreAnError) {
  try {
    units::parse(Dimension::concentration, "8 mg/L");
    ADD_FAILURE() << "accepted mg/L without a molar mass";
  } catch (const UnitError& e) {
    EXPECT_THAT(e.what(), HasSubstr("molar mass"));
  }
}

TEST(UnitsConcentration, AcceptedListNamesMassUnits) {
  EXPECT_THAT(units::accepted(Dimension::concentration), HasSubstr("mmol/L"));
  EXPECT_THAT(units::accepted(Dimension::concentration), HasSubstr("mg/L"));
}

}  // namespace
}  // namespace oxystrat::test
