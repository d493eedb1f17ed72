// Bubbles: surface tension and O2 diffusivity against published values, the Hinze break-up
// limit, bubbles formed at an orifice, and rise velocities.
#include <gtest/gtest.h>

#include <cmath>

#include "physics/bubbles.hpp"

namespace oxystrat::physics {
namespace {

TEST(Bubbles, SurfaceTensionOfWaterMatchesTheSteamTables) {
  // Steam-table values 74.22 / 72.74 / 71.20 / 69.60 mN/m at 10 / 20 / 30 / 40 degC, which the
  // IAPWS R1-76 form reproduces (IAPWS 2014 release, [mem] for the form, [sec] for the values);
  // tolerance: the table's last digit.
  EXPECT_NEAR(water_surface_tension(283.15), 74.22e-3, 0.01e-3);
  EXPECT_NEAR(water_surface_tension(293.15), 72.74e-3, 0.01e-3);
  EXPECT_NEAR(water_surface_tension(303.15), 71.20e-3, 0.015e-3);
  EXPECT_NEAR(water_surface_tension(313.15), 69.60e-3, 0.01e-3);
}

TEST(Bubbles, OxygenDiffusivityIsHanAndBartels) {
  // Han & Bartels (1996), J. Phys. Chem. 100:5597: 2.00e-9 m2/s at 25 degC, 2.62e-9 at 37 degC
  // (from their fit; 3 digits).
  EXPECT_NEAR(o2_diffusivity_water(298.15), 1.998e-9, 0.005e-9);
  EXPECT_NEAR(o2_diffusivity_water(310.15), 2.624e-9, 0.005e-9);
}

TEST(Bubbles, BreakUpSizeFallsWithDissipation) {
  // Hinze (1955): d_max = 0.725 (sigma / rho)^0.6 eps^-0.4 [mem]; computed check points for
  // sigma 0.072 N/m, rho 998 kg/m3 (round-off).
  EXPECT_NEAR(hinze_max_diameter(0.072, 998.0, 0.1), 5.96e-3, 0.01e-3);
  EXPECT_NEAR(hinze_max_diameter(0.072, 998.0, 1.0), 2.37e-3, 0.01e-3);
  EXPECT_NEAR(hinze_max_diameter(0.072, 998.0, 10.0), 9.45e-4, 0.01e-4);
  double last = 1.0;
  for (double eps : {0.01, 0.1, 1.0, 10.0, 100.0}) {
    const double d = hinze_max_diameter(0.072, 998.0, eps);
    EXPECT_LT(d, last);
    last = d;
  }
}

TEST(Bubbles, OrificeBubbleJoinsTheStaticViscousAndInertialLimits) {
  // Gaddis & Vogelpohl (1986) [mem]: a 1 mm orifice passing 1 mL/s in water forms 4.04 mm bubbles
  // (computed from the form; round-off); at no flow the static (Tate) size (6 d sigma / (rho g))^(1/3).
  EXPECT_NEAR(orifice_bubble_diameter(1e-3, 1e-6, 0.072, 998.0, 1e-3), 4.04e-3, 0.01e-3);
  EXPECT_NEAR(orifice_bubble_diameter(1e-3, 0.0, 0.072, 998.0, 1e-3), std::cbrt(6e-3 * 0.072 / (998.0 * 9.80665)), 1e-12);
  // A sintered element's 20 um pores form sub-millimetre bubbles; larger flows, larger bubbles.
  EXPECT_LT(orifice_bubble_diameter(20e-6, 0.0, 0.072, 998.0, 1e-3), 1e-3);
  EXPECT_GT(orifice_bubble_diameter(1e-3, 1e-5, 0.072, 998.0, 1e-3), orifice_bubble_diameter(1e-3, 1e-6, 0.072, 998.0, 1e-3));
}

TEST(Bubbles, RiseVelocityOfProcessBubbles) {
  // Clift, Grace & Weber (1978) [mem]: 3-5 mm bubbles in water rise at ~0.24-0.26 m/s (wave form,
  // computed 0.2575 at 3 mm); contaminated 1 mm bubbles like rigid spheres, ~0.1 m/s.
  EXPECT_NEAR(bubble_rise_velocity(4e-3, 0.072, 998.0, 1e-3), std::sqrt(2.14 * 0.072 / (998.0 * 4e-3) + 0.505 * 9.80665 * 4e-3), 1e-12);
  EXPECT_NEAR(bubble_rise_velocity(4e-3, 0.072, 998.0, 1e-3), 0.24, 0.02);
  EXPECT_NEAR(bubble_rise_velocity(1e-3, 0.072, 998.0, 1e-3), 0.11, 0.02);
  // Stokes limit for a very small rigid bubble: g d^2 rho / (18 mu), within the 15 % drag correction.
  const double d = 50e-6, stokes = 9.80665 * d * d * 998.0 / (18.0 * 1e-3);
  EXPECT_NEAR(bubble_rise_velocity(d, 0.072, 998.0, 1e-3) / stokes, 1.0, 0.05);
}

TEST(Bubbles, RigidRiseVelocityBalancesDragAndBuoyancy) {
  // Verification: the rigid-sphere velocity solves 24 Re (1 + 0.15 Re^0.687) = Ar to round-off
  // (1e-12 relative: the Newton iteration stops at 1e-15 of Re), from creeping flow (Re ~ 1e-4) to
  // the largest rigid bubble, in water and in a viscous broth.
  for (const double mu : {1e-3, 5e-2}) {
    for (const double d : {20e-6, 100e-6, 500e-6, 1e-3, 2e-3}) {
      const double u = bubble_rise_velocity(d, 0.072, 998.0, mu);
      const double wave = std::sqrt(2.14 * 0.072 / (998.0 * d) + 0.505 * 9.80665 * d);
      if (u >= wave) continue;  // the wave form governs: nothing to balance
      const double nu = mu / 998.0, re = u * d / nu;
      const double archimedes = 4.0 * 9.80665 * d * d * d / (3.0 * nu * nu);
      EXPECT_NEAR(24.0 * re * (1.0 + 0.15 * std::pow(re, 0.687)) / archimedes, 1.0, 1e-12) << d << " m, " << mu << " Pa s";
    }
  }
}

}  // namespace
}  // namespace oxystrat::physics
