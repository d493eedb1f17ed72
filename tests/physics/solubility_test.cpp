// O2 and CO2 solubility, water vapour pressure, salting-out, kLa correlations.
#include <gtest/gtest.h>

#include <cmath>

#include "physics/mass_transfer.hpp"
#include "physics/solubility.hpp"

namespace oxystrat {
namespace {

TEST(Solubility, BensonKrause1984TableValues) {
  // Benson & Krause (1984), Limnol. Oceanogr. 29:620, APHA form; values computed from the equation
  // (docs/method.md, section 8 [calc]; Garcia & Gordon 1992 agree to 0.001 mg/L). Tolerance 0.003 mg/L:
  // the table is rounded to 0.001 mg/L and the coefficients to 7 digits.
  const std::pair<double, double> table[] = {{0, 14.621}, {10, 11.288}, {20, 9.092}, {25, 8.263},
                                             {30, 7.559}, {35, 6.949},  {37, 6.727}, {40, 6.413}};
  for (const auto& [t_c, mg_l] : table) {
    const double c = physics::o2_saturation_air_1atm(t_c + 273.15) * physics::molar_mass_o2 * 1e3;
    EXPECT_NEAR(c, mg_l, 0.003) << t_c << " degC";
  }
}

TEST(Solubility, WaterVapourPressureIapwsIf97) {
  // IAPWS-IF97 region 4 check value (Wagner et al. 2000, table 35): T = 300 K -> 3.53658941e-3 MPa;
  // 500 K -> 2.63889776 MPa. Round-off of the closed form: 1e-8 relative.
  EXPECT_NEAR(physics::water_vapour_pressure(300.0) / 3.53658941e3, 1.0, 1e-8);
  EXPECT_NEAR(physics::water_vapour_pressure(500.0) / 2.63889776e6, 1.0, 1e-8);
}

TEST(Solubility, HenryScalingWithPressureAndOxygenFraction) {
  // C* = H y (p - p_w): moist air at 1 atm gives Benson-Krause by construction; doubling the dry O2
  // partial pressure doubles C* (Henry's law). Round-off tolerance.
  const double t = 303.15;
  const double pw = physics::water_vapour_pressure(t);
  const double air = physics::henry_o2(t) * physics::air_o2_fraction * (101325.0 - pw);
  EXPECT_NEAR(air / physics::o2_saturation_air_1atm(t), 1.0, 1e-12);
  const double p2 = 2.0 * (101325.0 - pw) + pw;  // twice the dry-gas pressure
  EXPECT_NEAR(physics::henry_o2(t) * physics::air_o2_fraction * (p2 - pw) / air, 2.0, 1e-12);
  EXPECT_NEAR(physics::henry_o2(t) * 0.4 * (101325.0 - pw) / air, 0.4 / physics::air_o2_fraction, 1e-12);
}

TEST(Solubility, Co2HenryAt25C) {
  // Sander (2023) compilation: 3.3e-4 mol/(m3 Pa) at 298.15 K; solubility falls with temperature.
  EXPECT_NEAR(physics::henry_co2(298.15), 3.3e-4, 1e-15);
  EXPECT_LT(physics::henry_co2(310.15), physics::henry_co2(298.15));
}

TEST(Solubility, SaltingOutWeisenbergerSchumpe1996) {
  // 0.15 M NaCl at 25 degC: log10(c0/c) = 0.15 (0.1143 + 0.0318) -> c/c0 = 0.9508, i.e. 4.9 % less O2
  // (Weisenberger & Schumpe 1996; docs/method.md, section 8 [calc]).
  const double f = physics::salting_out_factor(physics::Gas::o2, 298.15, {{"Na+", 150.0}, {"Cl-", 150.0}});
  EXPECT_NEAR(f, std::pow(10.0, -0.15 * (0.1143 + 0.0318)), 1e-12);
  EXPECT_NEAR(1.0 - f, 0.049, 0.001);
  EXPECT_DOUBLE_EQ(physics::salting_out_factor(physics::Gas::o2, 298.15, {}), 1.0);
}

TEST(MassTransfer, VantRiet1979WorkedPoints) {
  // van 't Riet (1979): coalescing 0.026 (P/V)^0.4 vs^0.5; non-coalescing 0.002 (P/V)^0.7 vs^0.2 (SI).
  const auto coal = vant_riet_constants(Coalescence::coalescing);
  const auto non = vant_riet_constants(Coalescence::non_coalescing);
  EXPECT_NEAR(vant_riet_kla(coal, 1000.0, 0.01), 0.026 * std::pow(1000.0, 0.4) * 0.1, 1e-15);
  EXPECT_NEAR(vant_riet_kla(non, 1000.0, 0.01), 0.002 * std::pow(1000.0, 0.7) * std::pow(0.01, 0.2), 1e-15);
  EXPECT_NEAR(vant_riet_kla(coal, 1000.0, 0.01) * 3600.0, 148.3, 0.1);  // 148 1/h: a typical microbial value
  EXPECT_EQ(vant_riet_kla(coal, 1000.0, 0.0), 0.0);  // no gas, no transfer
}

TEST(MassTransfer, HoldupAndTemperatureFactor) {
  EXPECT_NEAR(kla_temperature_factor(293.15), 1.0, 1e-15);
  EXPECT_NEAR(kla_temperature_factor(303.15), std::pow(1.024, 10.0), 1e-12);  // common practice, theta = 1.024
}

TEST(MassTransfer, EddyModelOrderOfMagnitude) {
  // Linek et al. (2004) eddy model: at eps = 1 W/kg in water, kL is a few 1e-4 m/s (from memory).
  const double kl = eddy_model_kl(1.0, 1e-6, 1e-6 / 2.1e-9);
  EXPECT_GT(kl, 3e-4);
  EXPECT_LT(kl, 1.5e-3);
}

}  // namespace
}  // namespace oxystrat
