// Broth rheology: flow curves, the laminar power law of every impeller type, Metzner & Otto's
// effective Reynolds number, the shear rate a dissipation sustains, and Elson's caverns.
#include <gtest/gtest.h>

#include <cmath>
#include <numbers>

#include "physics/impeller_power.hpp"
#include "physics/rheology.hpp"

namespace oxystrat {
namespace {

Rheology power_law(double k, double n) { return {RheologyKind::power_law, 0.0, k, n, 0.0}; }

TEST(Rheology, FlowCurvesAndApparentViscosity) {
  const Rheology hb{RheologyKind::herschel_bulkley, 0.0, 2.0, 0.5, 10.0};
  EXPECT_NEAR(shear_stress(hb, 4.0), 10.0 + 2.0 * 2.0, 1e-12);  // tau_y + K gamma^n
  const Rheology casson{RheologyKind::casson, 0.01, 0.0, 1.0, 4.0};
  EXPECT_NEAR(shear_stress(casson, 100.0), std::pow(2.0 + 1.0, 2), 1e-12);  // (sqrt(tau_y) + sqrt(mu gamma))^2
  EXPECT_NEAR(apparent_viscosity(power_law(1.0, 0.5), 23.0), 1.0 / std::sqrt(23.0), 1e-12);
  const Rheology water{RheologyKind::newtonian, 1e-3, 0.0, 1.0, 0.0};
  EXPECT_EQ(apparent_viscosity(water, 1e-9), 1e-3);  // no floor for a Newtonian fluid
}

TEST(Rheology, LaminarPowerIsKpMuNSquaredDCubedForEveryType) {
  // Below Re = 10 the power curve is Np = Kp / Re, so P = Np rho N^3 D^5 = Kp mu N^2 D^3
  // (the laminar power law; Kp of each type from the type table). Round-off.
  const double mu = 50.0, rho = 1000.0, n = 1.0, d = 0.3;
  const double re = rho * n * d * d / mu;
  ASSERT_LT(re, 10.0);
  for (const auto& t : impeller_types()) {
    const double np = power_number(re, t.power_number, t.laminar_constant);
    EXPECT_NEAR(np * rho * n * n * n * std::pow(d, 5), t.laminar_constant * mu * n * n * d * d * d, 1e-9) << t.name;
  }
}

TEST(Rheology, MetznerOttoReynoldsNumber) {
  // k_s N = 11.5 x 2 = 23 1/s; K = 1 Pa s^0.5, n = 0.5: mu_a = 23^-0.5 = 0.2085 Pa s (computed);
  // Re = rho N D^2 / mu_a (Metzner & Otto 1957). Round-off.
  const double re = metzner_otto_reynolds(power_law(1.0, 0.5), 1000.0, 2.0, 0.3, 11.5);
  EXPECT_NEAR(re, 1000.0 * 2.0 * 0.09 / (1.0 / std::sqrt(23.0)), 1e-9);
  const Rheology water{RheologyKind::newtonian, 1e-3, 0.0, 1.0, 0.0};
  EXPECT_EQ(metzner_otto_reynolds(water, 1000.0, 2.0, 0.3, 11.5), 1000.0 * 2.0 * 0.09 / 1e-3);
}

TEST(Rheology, ShearRateFromDissipation) {
  // Camp & Stein (1943): sqrt(eps / nu) for a Newtonian fluid; for a power law (rho eps / K)^(1/(n+1)):
  // rho 1000, eps 1 W/kg, K 1, n 0.5 -> 100 1/s (computed). Herschel-Bulkley by bisection: tau gamma = rho eps.
  const Rheology water{RheologyKind::newtonian, 1e-3, 0.0, 1.0, 0.0};
  EXPECT_NEAR(dissipation_shear_rate(water, 1000.0, 1.0), 1000.0, 1e-9);
  EXPECT_NEAR(dissipation_shear_rate(power_law(1.0, 0.5), 1000.0, 1.0), 100.0, 1e-9);
  const Rheology hb{RheologyKind::herschel_bulkley, 0.0, 2.0, 0.5, 10.0};
  const double g = dissipation_shear_rate(hb, 1000.0, 1.0);
  EXPECT_NEAR(shear_stress(hb, g) * g, 1000.0, 1e-6);  // bisection to ~1e-12 in ln gamma
}

TEST(Rheology, CavernDiameterIsElsonsAtThreeSpeeds) {
  // Elson, Cheesman & Nienow (1986): (D_c/D)^3 = Np rho N^2 D^2 / (pi^2 tau_y (H_c/D_c + 1/3))
  // with H_c = 0.4 D_c, usually quoted as (1.36 / pi^2) Np rho N^2 D^2 / tau_y [mem form]; 1.36 is
  // 1 / (0.4 + 1/3) = 1.3636 rounded. Np 5, rho 1000, D 0.1 m, tau_y 5 Pa, 5 1/s: D_c/D = 3.257 with
  // the rounded constant (computed), 3.260 with the exact one.
  const double np = 5.0, rho = 1000.0, d = 0.1, tau = 5.0, t = 10.0;
  EXPECT_NEAR(cavern_diameter(np, rho, 5.0, d, tau, t) / d, 3.257, 0.005);
  for (double n : {2.0, 5.0, 8.0}) {
    const double elson = d * std::cbrt(np * rho * n * n * d * d /
                                       (std::numbers::pi * std::numbers::pi * tau * (0.4 + 1.0 / 3.0)));
    EXPECT_NEAR(cavern_diameter(np, rho, n, d, tau, t), elson, 1e-12 * elson) << n;
    EXPECT_NEAR(cavern_height(np, rho, n, d, tau, t), 0.4 * elson, 1e-12 * elson) << n;
  }
  // At the wall the cavern stops widening and grows along the axis, continuously.
  const double n_wall = 20.0, t_small = 0.4;
  EXPECT_EQ(cavern_diameter(np, rho, n_wall, d, tau, t_small), t_small);
  EXPECT_GT(cavern_height(np, rho, n_wall, d, tau, t_small), 0.4 * t_small);
  double n_reach = 1.0;
  while (cavern_diameter(np, rho, n_reach, d, tau, t_small) < t_small) n_reach *= 1.0001;
  EXPECT_NEAR(cavern_height(np, rho, n_reach, d, tau, t_small), 0.4 * t_small, 1e-3 * t_small);
}

}  // namespace
}  // namespace oxystrat
