// Cell-culture units at the edge: cells/mL with a cell dry mass become a dry biomass, an uptake per
// cell becomes an uptake per dry mass; and the refusals when the dry mass is missing or the result
// is out of range. The expected numbers are worked by hand in the comments.
#include "unit_check.hpp"  // first: see unit_check.hpp

#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include "case_text.hpp"

namespace oxystrat::test {
namespace {

using testing::HasSubstr;
using units::Dimension;

TEST(CellUnits, CountsMassesAndRatesPerCellParseToSi) {
  // 1 mL = 1e-6 m3, so 5e6 cells/mL = 5e6 / 1e-6 = 5e12 cells/m3; 1 uL = 1e-9 m3.
  expect_si(Dimension::cell_density, "5e6 cells/mL", 5e12);
  expect_si(Dimension::cell_density, "2e3 cells/uL", 2e12);
  expect_si(Dimension::cell_density, "4e9 cells/L", 4e12);
  // 1 pg = 1e-12 g = 1e-15 kg; 1 ng = 1e-12 kg.
  expect_si(Dimension::cell_mass, "350 pg", 350e-15);
  expect_si(Dimension::cell_mass, "0.35 ng", 350e-15);
  // 0.2 pmol/cell/h = 0.2e-12 mol / 3600 s = 5.5556e-17 mol/s per cell; a day is 86400 s.
  expect_si(Dimension::cell_specific_rate, "0.2 pmol/cell/h", 0.2e-12 / 3600.0);
  expect_si(Dimension::cell_specific_rate, "0.2 pmol/(cell h)", 0.2e-12 / 3600.0);
  expect_si(Dimension::cell_specific_rate, "4.8 pmol/cell/day", 4.8e-12 / 86400.0);
  expect_si(Dimension::cell_specific_rate, "4.8 pmol/(cell day)", 4.8e-12 / 86400.0);
  expect_si(Dimension::cell_specific_rate, "200 fmol/cell/h", 0.2e-12 / 3600.0);
}

TEST(CellUnits, CellDensityWithDryMassGivesTheBiomass) {
  const auto c = load(CaseText()
                          .replace("biomass = \"20 g/L\"", "cell_density = \"5e6 cells/mL\"")
                          .insert_after("q_o2_max", "cell_dry_mass = \"350 pg\""))
                     .data;
  // X = 5e12 cells/m3 x 350e-15 kg = 1.75 kg/m3 (= 1.75 g/L); one product: round-off only.
  EXPECT_NEAR(c.culture.biomass_kg_m3, 1.75, kRoundOff * 1.75);
  EXPECT_NEAR(c.culture.cell_dry_mass_kg, 350e-15, kRoundOff * 350e-15);
}

TEST(CellUnits, UptakePerCellBecomesUptakePerDryMass) {
  const auto c = load(CaseText()
                          .replace("q_o2_max = \"4 mmol/g/h\"", "q_o2_max = \"0.2 pmol/cell/h\"")
                          .insert_after("biomass", "cell_dry_mass = \"350 pg\""))
                     .data;
  // q = (0.2e-12 mol / 3600 s) / 350e-15 kg = 1.5873e-4 mol/(kg s) = 0.5714 mmol/g/h.
  const double expected = 0.2e-12 / 3600.0 / 350e-15;
  EXPECT_NEAR(c.culture.q_o2_max_mol_kg_s, expected, kRoundOff * expected);
  // The biomass keeps its own unit: 20 g/L.
  EXPECT_NEAR(c.culture.biomass_kg_m3, 20.0, kRoundOff * 20.0);
  // Per day: 4.8 pmol/cell/day is the same 0.2 pmol/cell/h.
  const auto d = load(CaseText()
                          .replace("q_o2_max = \"4 mmol/g/h\"", "q_o2_max = \"4.8 pmol/cell/day\"")
                          .insert_after("biomass", "cell_dry_mass = \"350 pg\""))
                     .data;
  EXPECT_NEAR(d.culture.q_o2_max_mol_kg_s, expected, 1e-9 * expected);  // 4.8/86400 vs 0.2/3600: a few ulps apart
}

TEST(CellUnits, TheBundledCellCultureKeepsItsNumbers) {
  // cases/cell-culture-2m3.toml: 1e7 cells/mL x 300 pg = 1e13 /m3 x 3e-13 kg = 3 kg/m3 (it said
  // "3 g/L" before), and 0.201 pmol/cell/h / 300 pg = 0.67 mol/(kg h) = 0.67 mmol/g/h as before.
  const auto c = read_case_file(std::string(OXYSTRAT_TEST_DATA_DIR) + "/../../cases/cell-culture-2m3.toml").data;
  EXPECT_NEAR(c.culture.biomass_kg_m3, 3.0, kRoundOff * 3.0);
  EXPECT_NEAR(c.culture.q_o2_max_mol_kg_s, 0.67 / 3600.0, kRoundOff * 0.67 / 3600.0);
}

TEST(CellUnitsErrors, CellDensityWithoutDryMassNamesTheMissingKey) {
  const CaseText c = CaseText().replace("biomass = \"20 g/L\"", "cell_density = \"5e6 cells/mL\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("cell_density") + ": culture.cell_density = \"5e6 cells/mL\""));
  EXPECT_THAT(msg, HasSubstr("culture.cell_dry_mass"));
  EXPECT_THAT(msg, HasSubstr("0.1 pg to 10000 pg"));
}

TEST(CellUnitsErrors, BiomassAndCellDensityTogetherAreRefused) {
  const CaseText c = CaseText().insert_after("biomass", "cell_density = \"5e6 cells/mL\"").insert_after(
      "q_o2_max", "cell_dry_mass = \"350 pg\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("cell_density") + ": culture.cell_density"));
  EXPECT_THAT(msg, HasSubstr("not both"));
}

TEST(CellUnitsErrors, UptakePerCellWithoutDryMassIsRefused) {
  const CaseText c = CaseText().replace("q_o2_max = \"4 mmol/g/h\"", "q_o2_max = \"0.2 pmol/cell/h\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("q_o2_max") + ": culture.q_o2_max = \"0.2 pmol/cell/h\""));
  EXPECT_THAT(msg, HasSubstr("culture.cell_dry_mass"));
}

TEST(CellUnitsErrors, CellsGivingTooMuchBiomassAreOutOfRange) {
  // 1e9 cells/mL (the count's own limit) x 1000 pg = 1e15 /m3 x 1e-12 kg = 1000 kg/m3 > 300 g/L.
  const CaseText c = CaseText()
                         .replace("biomass = \"20 g/L\"", "cell_density = \"1e9 cells/mL\"")
                         .insert_after("q_o2_max", "cell_dry_mass = \"1000 pg\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("cell_density") + ": culture.cell_density"));
  EXPECT_THAT(msg, HasSubstr("out of range"));
  EXPECT_THAT(msg, HasSubstr("1000 g/L"));
  EXPECT_THAT(msg, HasSubstr("300 g/L"));
}

TEST(CellUnitsErrors, DryMassOutOfRangeAndUnknownUnitsAreNamed) {
  const CaseText big = CaseText().insert_after("q_o2_max", "cell_dry_mass = \"50 ng\"");
  auto msg = error_of(big);
  EXPECT_THAT(msg, HasSubstr(big.where("cell_dry_mass") + ": culture.cell_dry_mass = \"50 ng\""));
  EXPECT_THAT(msg, HasSubstr("0.1 pg to 10000 pg"));
  const CaseText odd = CaseText().replace("biomass = \"20 g/L\"", "cell_density = \"5e6 cells/gallon\"")
                           .insert_after("q_o2_max", "cell_dry_mass = \"350 pg\"");
  msg = error_of(odd);
  EXPECT_THAT(msg, HasSubstr(odd.where("cell_density") + ": culture.cell_density"));
  EXPECT_THAT(msg, HasSubstr("unknown unit 'cells/gallon'"));
  EXPECT_THAT(msg, HasSubstr("cells/mL"));
  const CaseText rate = CaseText()
                            .replace("q_o2_max = \"4 mmol/g/h\"", "q_o2_max = \"0.2 pmol/cell/week\"")
                            .insert_after("biomass", "cell_dry_mass = \"350 pg\"");
  msg = error_of(rate);
  EXPECT_THAT(msg, HasSubstr(rate.where("q_o2_max") + ": culture.q_o2_max"));
  EXPECT_THAT(msg, HasSubstr("pmol/cell/day"));
}

TEST(CellUnitsErrors, MissingAmountMentionsBothWays) {
  const auto msg = error_of(CaseText().remove_line("biomass ="));
  EXPECT_THAT(msg, HasSubstr("missing key culture.biomass"));
  EXPECT_THAT(msg, HasSubstr("cell_density"));
}

}  // namespace
}  // namespace oxystrat::test
