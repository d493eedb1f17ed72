// Impeller power, gassed power, flooding criteria, exact zone balance and dissipation sums.
#include <gtest/gtest.h>

#include <cmath>
#include <filesystem>
#include <random>

#include "case_fixtures.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "physics/impeller_power.hpp"
#include "mesh/zone_network.hpp"

namespace oxystrat {
namespace {

TEST(ImpellerPower, TurbulentPowerIsNpRhoN3D5) {
  // P = Np rho N^3 D^5 (definition of the power number); Rushton Np = 5.0 (docs/method.md, section 3, [sec]).
  Case c = fixtures::single_impeller("rushton", 0.5, 4, 8, 60.0);  // N = 1 rps, D = 0.5 m
  const auto net = build_zone_geometry(c);
  const auto h = compute_hydrodynamics(c, net);
  EXPECT_GT(h.impellers[0].reynolds, 1e4);  // turbulent: rho N D^2 / mu = 2.5e5
  EXPECT_NEAR(h.impellers[0].power_ungassed_w, 5.0 * 1000.0 * std::pow(0.5, 5), 1e-9);  // round-off only
  EXPECT_NEAR(h.impellers[0].tip_speed_m_s, M_PI * 0.5, 1e-12);
}

TEST(ImpellerPower, LaminarAndTransitionalRegimes) {
  // Laminar Np = Kp / Re below Re = 10 (Kp = 70 for a Rushton, docs/method.md, section 3 [sec]); turbulent above 1e4;
  // monotone log-log interpolation between (our documented stand-in for the transitional curve).
  EXPECT_NEAR(power_number(1.0, 5.0, 70.0), 70.0, 1e-12);
  EXPECT_NEAR(power_number(1e5, 5.0, 70.0), 5.0, 1e-12);
  EXPECT_NEAR(power_number(10.0, 5.0, 70.0), 7.0, 1e-12);
  double last = power_number(10.0, 5.0, 70.0);
  for (double re = 20; re < 1e4; re *= 2) {
    const double np = power_number(re, 5.0, 70.0);
    EXPECT_LE(np, last);
    last = np;
  }
}

TEST(GassedPower, CuiEtAl1996WorkedPoints) {
  // Cui, van der Lans & Luyben (1996): Pg/P0 = 1 - 12.6 Fl_G (Fl_G < 0.035), 0.62 - 1.85 Fl_G above.
  EXPECT_NEAR(cui_gassed_power_ratio(0.0), 1.0, 1e-12);
  EXPECT_NEAR(cui_gassed_power_ratio(0.02), 1.0 - 0.252, 1e-12);
  EXPECT_NEAR(cui_gassed_power_ratio(0.10), 0.62 - 0.185, 1e-12);
  // The two branches nearly meet at 0.035 (0.559 vs 0.555): the jump is below 1 %.
  EXPECT_NEAR(cui_gassed_power_ratio(0.0349999), cui_gassed_power_ratio(0.035), 0.005);
}

TEST(Flooding, NienowEtAl1985WorkedPoints) {
  // Fl_G,F = 30 Fr (D/T)^3.5 and Fl_G,CD = 0.2 Fr^0.5 (D/T)^0.5 (Nienow, Warmoeskerken, Smith & Konno 1985).
  EXPECT_NEAR(flooding_aeration_number(1.0, 0.5), 30.0 * std::pow(0.5, 3.5), 1e-12);
  EXPECT_NEAR(flooding_aeration_number(0.312, 0.344), 30.0 * 0.312 * std::pow(0.344, 3.5), 1e-12);
  EXPECT_NEAR(complete_dispersion_aeration_number(1.0, 0.5), 0.2 * std::sqrt(0.5), 1e-12);
  EXPECT_EQ(gas_regime(0.0, 0.2, 0.05), GasRegime::ungassed);
  EXPECT_EQ(gas_regime(0.3, 0.2, 0.05), GasRegime::flooded);
  EXPECT_EQ(gas_regime(0.1, 0.2, 0.05), GasRegime::loaded);
  EXPECT_EQ(gas_regime(0.01, 0.2, 0.05), GasRegime::dispersed);
}

TEST(Flooding, LowSpeedFloodsTheLowestRushton) {
  Case c = fixtures::gassed_vessel();
  c.operation.speed_rps = 0.5;  // 30 rpm at 0.8 vvm: far below the flooding speed
  const auto net = build_zone_geometry(c);
  const auto h = compute_hydrodynamics(c, net);
  EXPECT_EQ(h.impellers[0].regime, GasRegime::flooded);
  c.operation.speed_rps = 5.0;
  EXPECT_NE(compute_hydrodynamics(c, net).impellers[0].regime, GasRegime::flooded);
}

// Every zone's convective in- and outflow balance to round-off: face flows are differences of
// one stream function (1e-12 relative: round-off of a few additions of O(1) numbers).
void expect_balanced(const Case& c) {
  const auto net = build_zone_geometry(c);
  const auto h = compute_hydrodynamics(c, net);
  EXPECT_LT(max_zone_imbalance(net, h.face_flow), 1e-12) << c.title;
  double total = 0.0;
  for (double q : h.face_flow) total += std::abs(q);
  EXPECT_GT(total, 0.0) << c.title;  // there is a flow to balance
}

TEST(LoopFlow, EveryBundledCaseBalancesExactly) {
  int cases = 0;
  for (const auto& e : std::filesystem::directory_iterator(fixtures::source_dir() + "/cases")) {
    if (e.path().extension() != ".toml") continue;
    expect_balanced(read_case_file(e.path().string()).data);
    ++cases;
  }
  EXPECT_GE(cases, 3);
}

TEST(LoopFlow, RandomImpellerStacksBalanceExactly) {
  std::mt19937 rng(12345);
  const char* types[] = {"rushton", "pitched-blade-down", "pitched-blade-up", "hydrofoil-down", "hydrofoil-up",
                         "hollow-blade"};
  const char* bottoms[] = {"flat", "ellipsoidal", "hemispherical"};
  for (int trial = 0; trial < 20; ++trial) {
    const int n = 1 + static_cast<int>(rng() % 4);
    const double h = 1.0 + n * 1.0;
    std::string text = fmt::format("[vessel]\ndiameter = \"1 m\"\nliquid_height = \"{} m\"\nbottom = \"{}\"\n", h,
                                   bottoms[rng() % 3]);
    for (int m = 0; m < n; ++m) {
      text += fmt::format("[[impeller]]\ntype = \"{}\"\ndiameter = \"{} m\"\nelevation = \"{} m\"\n", types[rng() % 6],
                          0.25 + 0.05 * (rng() % 5), 0.6 + m * 1.0);
    }
    text += fmt::format("[operation]\nspeed = \"100 rpm\"\n[grid]\nradial = {}\naxial = {}\n", 4 + rng() % 10, 8 + rng() % 40);
    expect_balanced(read_case_text(text, "random").data);
  }
}

TEST(Dissipation, SumsToTheGassedPower) {
  for (const auto& e : std::filesystem::directory_iterator(fixtures::source_dir() + "/cases")) {
    if (e.path().extension() != ".toml") continue;
    const Case c = read_case_file(e.path().string()).data;
    for (int coarse : {0, 1}) {
      Case cc = c;
      if (coarse) cc.grid.radial = cc.grid.axial = 1;
      const auto net = build_zone_geometry(cc);
      const auto h = compute_hydrodynamics(cc, net);
      double sum = 0.0;
      for (int k = 0; k < net.size(); ++k) sum += h.epsilon[k] * cc.broth.density_kg_m3 * net.volume[k];
      EXPECT_NEAR(sum / h.power_gassed_w, 1.0, 1e-12) << e.path();  // round-off of a weighted split
    }
  }
}

TEST(Dissipation, DischargeZonesDissipateMostPerVolume) {
  const Case c = fixtures::single_impeller("rushton", 1.0 / 3.0, 12, 24);
  const auto net = build_zone_geometry(c);
  const auto h = compute_hydrodynamics(c, net);
  const double mean = h.power_gassed_w / (c.broth.density_kg_m3 * net.total_volume());
  for (int k = 0; k < net.size(); ++k) {
    if (net.region[k].discharge == 0) {
      EXPECT_GT(h.epsilon[k], 10.0 * mean);  // swept volume: tens of times the mean
    }
  }
}

}  // namespace
}  // namespace oxystrat
