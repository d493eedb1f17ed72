// Gas flow: the unit decides the basis (input/case_quantities.cpp). vvm and N-units are normal volumes at
// 0 degC and 101325 Pa (the normal state of DIN 1343, common practice); plain volume units are
// actual volumes at the head-space pressure and broth temperature, converted with the ideal-gas
// law V_n = V p / p_n * T_n / T.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <string>

#include "case_text.hpp"
#include "tests/round_off.hpp"

namespace oxystrat::test {
namespace {

using testing::HasSubstr;

// A handful of multiplications: round-off tolerance (kRoundOff).
// The base case: head pressure 0.5 bar(g), broth at 30 degC.
constexpr double kHeadPa = 0.5e5 + 101325.0;
constexpr double kBrothK = 303.15;
constexpr double kActualToNormal = kHeadPa / 101325.0 * 273.15 / kBrothK;

Case with_gas_flow(const std::string& flow) {
  return load(CaseText().replace("gas_flow = \"0.5 vvm\"", "gas_flow = \"" + flow + "\"")).data;
}

void expect_normal_flow(const std::string& flow, double expected_m3_s) {
  SCOPED_TRACE(flow);
  const double got = with_gas_flow(flow).operation.gas_flow_normal_m3_s;
  EXPECT_NEAR(got, expected_m3_s, kRoundOff * expected_m3_s);
}

TEST(CaseGasFlow, VvmIsNormalVolumePerLiquidVolumePerMinute) {
  const double v = with_gas_flow("0.5 vvm").vessel.working_volume_m3;
  expect_normal_flow("0.5 vvm", 0.5 * v / 60.0);
}

TEST(CaseGasFlow, NormalUnits) {
  expect_normal_flow("2 Nm3/h", 2.0 / 3600.0);
  expect_normal_flow("0.02 Nm3/min", 0.02 / 60.0);
  expect_normal_flow("0.004 Nm3/s", 0.004);
  expect_normal_flow("20 NL/min", 20e-3 / 60.0);
}

TEST(CaseGasFlow, ActualUnitsAtHeadPressureAndBrothTemperature) {
  expect_normal_flow("2 m3/h", 2.0 / 3600.0 * kActualToNormal);
  expect_normal_flow("0.02 m3/min", 0.02 / 60.0 * kActualToNormal);
  expect_normal_flow("0.004 m3/s", 0.004 * kActualToNormal);
  expect_normal_flow("20 L/min", 20e-3 / 60.0 * kActualToNormal);
}

TEST(CaseGasFlow, ActualFlowFollowsTheHeadPressure) {
  // Same actual flow at twice the absolute head pressure is twice the normal flow.
  const auto at = [](const char* pressure) {
    return load(CaseText()
                    .replace("head_pressure = \"0.5 bar(g)\"", std::string("head_pressure = \"") + pressure + "\"")
                    .replace("gas_flow = \"0.5 vvm\"", "gas_flow = \"20 L/min\""))
        .data.operation.gas_flow_normal_m3_s;
  };
  EXPECT_NEAR(at("2 bar(a)"), 2.0 * at("1 bar(a)"), kRoundOff * at("2 bar(a)"));
}

TEST(CaseGasFlow, AbsentMeansNoGas) {
  const auto c = load(CaseText().remove_line("gas_flow")).data;
  EXPECT_EQ(c.operation.gas_flow_normal_m3_s, 0.0);
}

TEST(CaseGasFlow, UnknownUnitListsBothBases) {
  const CaseText c = CaseText().replace("gas_flow = \"0.5 vvm\"", "gas_flow = \"0.5 m3\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("gas_flow") + ": operation.gas_flow = \"0.5 m3\": unknown unit 'm3'"));
  EXPECT_THAT(msg, HasSubstr("vvm, Nm3/h"));
  EXPECT_THAT(msg, HasSubstr("actual, at head pressure and broth temperature"));
}

// Regression test for a fixed bug (input/case_quantities.cpp, read_gas_flow): the unknown-unit check runs only for values >= 0, so
// "-1 furlong" falls through to the range check with the sentinel normal_m3_s = -1 and reports
// "out of range: -53.93 vvm (normal)", a number computed from nothing the user wrote. Expected:
// the unknown-unit message, as for "1 furlong".
TEST(CaseGasFlow, NegativeValueWithUnknownUnitNamesTheUnit) {
  const CaseText c = CaseText().replace("gas_flow = \"0.5 vvm\"", "gas_flow = \"-1 furlong\"");
  EXPECT_THAT(error_of(c), HasSubstr("unknown unit 'furlong'"));
}

TEST(CaseGasFlow, MissingUnit) {
  const CaseText c = CaseText().replace("gas_flow = \"0.5 vvm\"", "gas_flow = \"0.5\"");
  EXPECT_THAT(error_of(c), HasSubstr(c.where("gas_flow") + ": operation.gas_flow = \"0.5\": missing unit"));
}

TEST(CaseGasFlow, NotANumber) {
  const CaseText c = CaseText().replace("gas_flow = \"0.5 vvm\"", "gas_flow = \"lots\"");
  EXPECT_THAT(error_of(c), HasSubstr(c.where("gas_flow") + ": operation.gas_flow = \"lots\": 'lots' does not start with a number"));
}

TEST(CaseGasFlow, BareNumberIsNotAccepted) {
  const CaseText c = CaseText().replace("gas_flow = \"0.5 vvm\"", "gas_flow = 0.5");
  EXPECT_THAT(error_of(c), HasSubstr(c.where("gas_flow") + ": operation.gas_flow = 0.5: must be a string"));
}

TEST(CaseGasFlow, OverrideChangesTheBasis) {
  const auto c = load(CaseText(), {"operation.gas_flow=2 Nm3/h"}).data;
  EXPECT_NEAR(c.operation.gas_flow_normal_m3_s, 2.0 / 3600.0, kRoundOff * 2.0 / 3600.0);
}

}  // namespace
}  // namespace oxystrat::test
