// The DO controller: the cascade from speed to gas flow to O2 fraction, where it ends, the PID
// terms and the anti-windup, each against values worked out by hand.
#include <gtest/gtest.h>

#include "input/case.hpp"
#include "solver/oxygen/do_control.hpp"

namespace oxystrat {
namespace {

constexpr double kAirSat = 0.2;  // air saturation [mol/m3], a round number for hand values

Case controlled_case() {
  Case c;
  c.operation.speed_rps = 1.0;
  c.operation.gas_flow_normal_m3_s = 0.001;
  c.operation.oxygen_fraction = 0.21;
  auto& k = c.control;
  k.enabled = true;
  k.setpoint_mol_m3 = 0.5 * kAirSat;
  k.gain = 2.0;
  k.integral_time_s = 100.0;
  k.derivative_time_s = 0.0;
  k.interval_s = 10.0;
  k.speed_min_rps = 1.0;
  k.speed_max_rps = 2.0;
  k.gas_min_m3_s = 0.001;
  k.gas_max_m3_s = 0.003;
  k.oxygen_max = 0.5;
  return c;
}

// The operating point at cascade position u. Each actuator value is one multiply-add of exact
// inputs: equal to a few ulp.
void expect_actuators(const DoController& ctl, double u, double speed_rps, double gas_m3_s, double o2) {
  Case c = controlled_case();
  ctl.actuate(u, c);
  EXPECT_DOUBLE_EQ(c.operation.speed_rps, speed_rps) << "u = " << u;
  EXPECT_DOUBLE_EQ(c.operation.gas_flow_normal_m3_s, gas_m3_s) << "u = " << u;
  EXPECT_DOUBLE_EQ(c.operation.oxygen_fraction, o2) << "u = " << u;
}

TEST(DoController, CascadeMovesSpeedThenGasThenOxygen) {
  const DoController ctl(controlled_case(), kAirSat);
  EXPECT_EQ(ctl.max_output(), 3.0);
  expect_actuators(ctl, 0.0, 1.0, 0.001, 0.21);
  expect_actuators(ctl, 0.5, 1.5, 0.001, 0.21);
  expect_actuators(ctl, 1.5, 2.0, 0.002, 0.21);
  expect_actuators(ctl, 2.5, 2.0, 0.003, 0.355);
  expect_actuators(ctl, 3.0, 2.0, 0.003, 0.5);
}

TEST(DoController, CascadeEndsAtItsLastStageWithARange) {
  Case c = controlled_case();
  c.control.oxygen_max = -1.0;  // the O2 fraction stays the case's
  EXPECT_EQ(DoController(c, kAirSat).max_output(), 2.0);
  c.control.gas_min_m3_s = c.control.gas_max_m3_s = -1.0;  // so does the gas flow
  DoController ctl(c, kAirSat);
  EXPECT_EQ(ctl.max_output(), 1.0);
  // Far below the set-point the output stops at full speed; gas and O2 do not move.
  const double u = ctl.update(0.0);
  EXPECT_EQ(u, 1.0);
  ctl.actuate(u, c);
  EXPECT_DOUBLE_EQ(c.operation.speed_rps, 2.0);
  EXPECT_EQ(c.operation.gas_flow_normal_m3_s, 0.001);
  EXPECT_EQ(c.operation.oxygen_fraction, 0.21);
}

// Error 0.2 of air saturation, gain 2, T_i 100 s, interval 10 s: the integral gains 2 s per update,
// u = 2 (0.2 + 2 k / 100) after k updates. Tolerance 1e-12: round-off of a few operations.
TEST(DoController, ProportionalAndIntegralTerms) {
  Case c = controlled_case();
  DoController ctl(c, kAirSat);
  EXPECT_NEAR(ctl.update(0.3 * kAirSat), 0.44, 1e-12);
  EXPECT_NEAR(ctl.update(0.3 * kAirSat), 0.48, 1e-12);
  EXPECT_NEAR(ctl.update(0.3 * kAirSat), 0.52, 1e-12);
  // At the set-point only the integral remains: 2 x 6 s / 100 s.
  EXPECT_NEAR(ctl.update(0.5 * kAirSat), 0.12, 1e-12);
}

// The derivative acts on the measurement: none on the first update, then -T_d dDO/dt. With a rise
// of 0.1 of saturation per 10 s and T_d = 50 s that is -0.5. T_i is long, so the integral adds
// only (0.7 + 0.6) x 10 s / 1e6 s. Tolerance 1e-12: round-off.
TEST(DoController, DerivativeOnTheMeasurement) {
  Case c = controlled_case();
  c.control.setpoint_mol_m3 = 0.9 * kAirSat;
  c.control.gain = 1.0;
  c.control.integral_time_s = 1e6;
  c.control.derivative_time_s = 50.0;
  DoController ctl(c, kAirSat);
  EXPECT_NEAR(ctl.update(0.2 * kAirSat), 0.7 + 7e-6, 1e-12);
  EXPECT_NEAR(ctl.update(0.3 * kAirSat), 0.6 + 13e-6 - 0.5, 1e-12);
}

// While saturated the integral is held: back at the set-point after a long starvation the output
// is 0, not the wound-up integral (50 updates x 0.5 x 10 s / 100 s = 2.5 of gain-scaled output).
TEST(DoController, IntegralIsHeldWhileSaturated) {
  Case c = controlled_case();
  c.control.gain = 10.0;
  DoController ctl(c, kAirSat);
  for (int i = 0; i < 50; ++i) EXPECT_EQ(ctl.update(0.0), 3.0);
  EXPECT_EQ(ctl.update(0.5 * kAirSat), 0.0);
  // Above the set-point the output is clamped at 0, and again nothing winds up.
  for (int i = 0; i < 50; ++i) EXPECT_EQ(ctl.update(kAirSat), 0.0);
  EXPECT_NEAR(ctl.update(0.4 * kAirSat), 10.0 * (0.1 + 0.1 * 10.0 / 100.0), 1e-12);
}

}  // namespace
}  // namespace oxystrat
