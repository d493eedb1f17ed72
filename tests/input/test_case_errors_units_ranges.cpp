// Errors about values: a wrong or missing unit, and values outside their allowed range. Each
// message names file:line, the key and value, and the accepted units or the range with its unit.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include "case_text.hpp"

namespace oxystrat::test {
namespace {

using testing::HasSubstr;

TEST(CaseUnit, WrongUnitListsTheAcceptedOnes) {
  const CaseText c = CaseText().replace("diameter = \"1.0 m\"", "diameter = \"1.0 kg\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("1.0 kg") + ": vessel.diameter = \"1.0 kg\""));
  EXPECT_THAT(msg, HasSubstr("unknown unit 'kg'; expected one of m, mm, cm, um, in, ft"));
  EXPECT_THAT(msg, HasSubstr("allowed 0.05 m to 20 m"));
}

TEST(CaseUnit, BareNumberIsAMissingUnit) {
  const CaseText c = CaseText().replace("diameter = \"1.0 m\"", "diameter = 1.0");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("diameter = 1.0") + ": vessel.diameter = 1.0"));
  EXPECT_THAT(msg, HasSubstr("missing unit: write it as a string with a unit, e.g. \"1 m\""));
}

TEST(CaseUnit, StringWithoutUnitIsAMissingUnit) {
  const CaseText c = CaseText().replace("speed = \"150 rpm\"", "speed = \"150\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("speed") + ": operation.speed = \"150\""));
  EXPECT_THAT(msg, HasSubstr("missing unit; expected one of rpm, rps, 1/s, 1/min, Hz"));
}

TEST(CaseUnit, PressureWithoutAbsoluteOrGauge) {
  const CaseText c = CaseText().replace("head_pressure = \"0.5 bar(g)\"", "head_pressure = \"1.5 bar\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("head_pressure") + ": vessel.head_pressure = \"1.5 bar\""));
  EXPECT_THAT(msg, HasSubstr("must say (a) for absolute or (g) for gauge"));
}

TEST(CaseUnit, TableWhereAQuantityIsExpected) {
  const CaseText c = CaseText().replace("diameter = \"1.0 m\"", "diameter = { value = 1 }");
  EXPECT_THAT(error_of(c), HasSubstr("must be a string with a unit in m, mm, cm, um, in, ft"));
}

TEST(CaseUnit, OxygenConcentrationUnit) {
  const CaseText c = CaseText().replace("k_o2 = \"0.002 mmol/L\"", "k_o2 = \"0.002 kg\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("k_o2") + ": culture.k_o2 = \"0.002 kg\""));
  EXPECT_THAT(msg, HasSubstr("unknown unit 'kg'"));
  EXPECT_THAT(msg, HasSubstr("or % air saturation"));
}

TEST(CaseUnit, OxygenConcentrationInMassAndSaturationUnits) {
  // mg/L through M(O2) = 31.9988 g/mol (see test_units_concentration.cpp); round-off tolerance.
  const auto c = load(CaseText().replace("critical_do = \"0.02 mmol/L\"", "critical_do = \"0.64 mg/L\"")).data;
  EXPECT_NEAR(c.culture.critical_do_mol_m3, 0.64 / 31.9988, 1e-12);
  const auto s = load(CaseText().replace("critical_do = \"0.02 mmol/L\"", "critical_do = \"10 % air saturation\"")).data;
  EXPECT_GT(s.culture.critical_do_mol_m3, 0.0);
}

struct RangeCase {
  const char* name;
  const char* old_line;
  const char* new_line;
  const char* key_and_value;  //!< as the message must quote it
  const char* range_text;     //!< the range with its unit
};

class CaseRange : public testing::TestWithParam<RangeCase> {};

TEST_P(CaseRange, OutOfRangeNamesLineKeyValueAndRange) {
  const auto& p = GetParam();
  const CaseText c = CaseText().replace(p.old_line, p.new_line);
  const auto msg = error_of(c);
  const std::string new_text = p.new_line;
  const auto last_line = new_text.substr(new_text.rfind('\n') + 1);  // the line that holds the key
  EXPECT_THAT(msg, HasSubstr(c.where(last_line) + ": " + p.key_and_value));
  EXPECT_THAT(msg, HasSubstr("out of range"));
  EXPECT_THAT(msg, HasSubstr(p.range_text));
}

INSTANTIATE_TEST_SUITE_P(
    Values, CaseRange,
    testing::Values(
        RangeCase{"VesselDiameterZero", "diameter = \"1.0 m\"", "diameter = \"0 m\"", "vessel.diameter = \"0 m\"",
                  "0 m is outside the allowed 0.05 m to 20 m"},
        RangeCase{"VesselDiameterHuge", "diameter = \"1.0 m\"", "diameter = \"25 m\"", "vessel.diameter = \"25 m\"",
                  "0.05 m to 20 m"},
        RangeCase{"LiquidHeightZero", "liquid_height = \"1.5 m\"", "liquid_height = \"0 m\"",
                  "vessel.liquid_height = \"0 m\"", "more than 0 m and at most 120 m"},
        RangeCase{"LiquidHeightNegative", "liquid_height = \"1.5 m\"", "liquid_height = \"-1.5 m\"",
                  "vessel.liquid_height = \"-1.5 m\"", "more than 0 m"},
        RangeCase{"WorkingVolumeNegative", "liquid_height = \"1.5 m\"", "working_volume = \"-300 L\"",
                  "vessel.working_volume = \"-300 L\"", "more than 0 m3 and at most 5000 m3"},
        RangeCase{"Baffles", "baffles = 4", "baffles = 9", "vessel.baffles = 9", "allowed 0 to 8"},
        RangeCase{"BaffleWidthOverFifthOfDiameter", "baffle_width = \"0.1 m\"", "baffle_width = \"0.25 m\"",
                  "vessel.baffle_width = \"0.25 m\"", "0.25 m is outside the allowed 0 m to 0.2 m"},
        RangeCase{"HeadPressure", "head_pressure = \"0.5 bar(g)\"", "head_pressure = \"25 bar(a)\"",
                  "vessel.head_pressure = \"25 bar(a)\"", "0.2 bar(a) to 20 bar(a)"},
        RangeCase{"Temperature", "temperature = \"30 degC\"", "temperature = \"90 degC\"",
                  "vessel.temperature = \"90 degC\"", "90 degC is outside the allowed 0 degC to 80 degC"},
        RangeCase{"ImpellerDiameterNegative", "diameter = \"0.35 m\"", "diameter = \"-0.35 m\"",
                  "impeller.0.diameter = \"-0.35 m\"", "more than 0 m and at most 1 m"},
        RangeCase{"ImpellerWiderThanVessel", "diameter = \"0.35 m\"", "diameter = \"1.2 m\"",
                  "impeller.0.diameter = \"1.2 m\"", "more than 0 m and at most 1 m"},
        // Above the liquid surface is check_geometry's (test_case_errors_geometry.cpp); without
        // vessel.straight_side the range ends at the tallest liquid allowed, H/T = 6.
        RangeCase{"ImpellerAboveTheTallestLiquid", "elevation = \"1.0 m\"", "elevation = \"7 m\"",
                  "impeller.1.elevation = \"7 m\"", "more than 0 m and at most 6 m"},
        RangeCase{"ImpellerBlades", "type = \"rushton\"", "type = \"rushton\"\nblades = 1", "impeller.0.blades = 1",
                  "allowed 2 to 12"},
        RangeCase{"BladeHeightZero", "type = \"rushton\"", "type = \"rushton\"\nblade_height = \"0 mm\"",
                  "impeller.0.blade_height = \"0 mm\"", "more than 0 m and at most 0.35 m"},
        RangeCase{"SpargerAboveLiquidSurface", "elevation = \"0.25 m\"", "elevation = \"1.6 m\"",
                  "sparger.elevation = \"1.6 m\"", "more than 0 m and at most 1.5 m"},
        RangeCase{"SpargerDiameterZero", "diameter = \"0.28 m\"", "diameter = \"0 m\"", "sparger.diameter = \"0 m\"",
                  "more than 0 m and at most 1 m"},
        RangeCase{"SpeedZero", "speed = \"150 rpm\"", "speed = \"0 rpm\"", "operation.speed = \"0 rpm\"",
                  "0 rpm is outside the allowed more than 0 rpm and at most 3000 rpm"},
        RangeCase{"GasFlowTooHigh", "gas_flow = \"0.5 vvm\"", "gas_flow = \"6 vvm\"", "operation.gas_flow = \"6 vvm\"",
                  "6 vvm (normal); allowed 0 to 5 vvm"},
        RangeCase{"GasFlowNegative", "gas_flow = \"0.5 vvm\"", "gas_flow = \"-1 Nm3/h\"",
                  "operation.gas_flow = \"-1 Nm3/h\"", "allowed 0 to 5 vvm"},
        RangeCase{"OxygenFraction", "gas_flow = \"0.5 vvm\"", "gas_flow = \"0.5 vvm\"\noxygen_fraction = \"120 %\"",
                  "operation.oxygen_fraction = \"120 %\"", "1.2 is outside the allowed 0 to 1"},
        RangeCase{"Density", "density = \"1030 kg/m3\"", "density = \"3 g/cm3\"", "broth.density = \"3 g/cm3\"",
                  "500 kg/m3 to 2000 kg/m3"},
        RangeCase{"Viscosity", "viscosity = \"2 mPa s\"", "viscosity = \"0.1 mPa s\"", "broth.viscosity = \"0.1 mPa s\"",
                  "0.2 mPa s to 10000 mPa s"},
        RangeCase{"Biomass", "biomass = \"20 g/L\"", "biomass = \"400 g/L\"", "culture.biomass = \"400 g/L\"",
                  "0 g/L to 300 g/L"},
        RangeCase{"UptakeRate", "q_o2_max = \"4 mmol/g/h\"", "q_o2_max = \"150 mmol/g/h\"",
                  "culture.q_o2_max = \"150 mmol/g/h\"", "0 mmol/g/h to 100 mmol/g/h"},
        RangeCase{"OxygenMonodConstant", "k_o2 = \"0.002 mmol/L\"", "k_o2 = \"2 mmol/L\"", "culture.k_o2 = \"2 mmol/L\"",
                  "allowed 0 to 1 mmol/L"},
        RangeCase{"GridAxialZero", "axial = 12", "axial = 0", "grid.axial = 0", "allowed 1 to 20000"},
        RangeCase{"GridRadialHuge", "radial = 6", "radial = 5000", "grid.radial = 5000", "allowed 1 to 2000"},
        RangeCase{"Sectors", "axial = 12", "axial = 12\n[output]\nsectors = 2", "output.sectors = 2",
                  "allowed 3 to 360"}),
    [](const testing::TestParamInfo<RangeCase>& info) { return std::string(info.param.name); });

TEST(CaseLimits, OxygenAndCarbonDioxideFractionsMustNotExceedOne) {
  const CaseText c = CaseText().insert_after("gas_flow", "oxygen_fraction = 0.9\nco2_fraction = 0.15");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("co2_fraction") + ": operation.co2_fraction = "));
  EXPECT_THAT(msg, HasSubstr("oxygen_fraction + co2_fraction must not exceed 1"));
}

// Regression test for a fixed bug (toml_source.cpp:34, value_text): a TOML float is quoted with 17 significant digits, so the
// user who wrote 0.15 reads "co2_fraction = 0.14999999999999999". Expected: the value as written
// (or its shortest round-trip form), "co2_fraction = 0.15".
TEST(CaseLimits, FloatValuesAreQuotedAsWritten) {
  const CaseText c = CaseText().insert_after("gas_flow", "oxygen_fraction = 0.9\nco2_fraction = 0.15");
  EXPECT_THAT(error_of(c), HasSubstr(c.where("co2_fraction") + ": operation.co2_fraction = 0.15:"));
}

TEST(CaseLimits, TooManyZones) {
  const CaseText c = CaseText().replace("radial = 6", "radial = 2000").replace("axial = 12", "axial = 20000");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("axial") + ": grid.axial = 20000"));
  EXPECT_THAT(msg, HasSubstr("at most 4,000,000"));
}

}  // namespace
}  // namespace oxystrat::test
