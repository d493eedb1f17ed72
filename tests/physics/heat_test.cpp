// Heat: the metabolic heat yield, the latent heat of water, and a cooling surface whose coolant
// warms along it.
#include <gtest/gtest.h>

#include <cmath>

#include "physics/heat.hpp"

namespace oxystrat {
namespace {

TEST(Heat, MetabolicHeatYieldIsThePublishedValue) {
  // Cordier, Butsch, Birou & von Stockar 1987, Biotechnol. Bioeng. 30:650 (abstract): 440 kJ per
  // mol O2, constant over all their strains and substrates [pub]. Exact: it is the constant itself.
  EXPECT_DOUBLE_EQ(physics::metabolic_heat_per_o2_j_mol, 440e3);
  // Cooney, Wang & Mateles 1969: 0.12 kcal/mmol O2 (from memory) = 502 kJ/mol. The two published
  // values differ by 14 %, the spread this heat yield is known to; a case may set its own
  // (culture.heat_yield).
  const double cooney = 0.12 * 4.184e6;
  EXPECT_NEAR(physics::metabolic_heat_per_o2_j_mol / cooney, 1.0, 0.15);
}

TEST(Heat, LatentHeatOfWaterAgainstSteamTables) {
  // IAPWS-IF97 saturation tables (from memory): h_fg = 2453.5 kJ/kg at 20 degC, 2406.0 kJ/kg at
  // 40 degC. The fit is within 2e-5 of IAPWS-IF97 and the table values are rounded to 0.1 kJ/kg:
  // tolerance 1e-4. The comparison over 0-80 degC with the iapws library is in
  // tests/scripts/reference_libraries.py.
  EXPECT_NEAR(physics::water_latent_heat(293.15) / 2453.5e3, 1.0, 1e-4);
  EXPECT_NEAR(physics::water_latent_heat(313.15) / 2406.0e3, 1.0, 1e-4);
  EXPECT_GT(physics::water_latent_heat(283.15), physics::water_latent_heat(323.15));  // falls with temperature
}

TEST(Heat, CoolantDutyEqualsUaTimesLogMeanDifference) {
  // A well-mixed broth at 37 degC, coolant in at 10 degC: the effectiveness form must equal
  // U A x LMTD with the coolant's own outlet temperature (an identity; round-off only).
  const double ua = 40e3, cap = 25e3, tb = 310.15, tin = 283.15;
  const double q = physics::coolant_duty(ua, cap, tb, tin);
  const double tout = tin + q / cap;
  EXPECT_LT(tout, tb);
  EXPECT_NEAR(q / (ua * physics::log_mean_temperature_difference(tb - tin, tb - tout)), 1.0, 1e-12);
}

TEST(Heat, CoolantDutyLimits) {
  // Small U A: the coolant barely warms, Q -> U A (T_b - T_in). Large U A: the coolant leaves at the
  // broth temperature, Q -> m cp (T_b - T_in). Relative 1e-6: the first-order terms left out.
  EXPECT_NEAR(physics::coolant_duty(1.0, 1e6, 310.0, 290.0) / 20.0, 1.0, 1e-6);
  EXPECT_NEAR(physics::coolant_duty(1e9, 1e3, 310.0, 290.0) / 2e4, 1.0, 1e-6);
  EXPECT_EQ(physics::coolant_duty(1e3, 1e3, 290.0, 300.0), 0.0);  // coolant warmer than the broth
}

}  // namespace
}  // namespace oxystrat
