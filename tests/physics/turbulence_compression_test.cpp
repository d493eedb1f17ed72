// Small-scale turbulence (Kolmogorov length and stress, impeller max/mean dissipation) and the
// work of compressing the air.
#include <gtest/gtest.h>

#include <cmath>

#include "physics/compression.hpp"
#include "physics/turbulence.hpp"

namespace oxystrat {
namespace {

TEST(Turbulence, KolmogorovLengthAndStressByDefinition) {
  // eta = (nu^3 / eps)^(1/4) (Kolmogorov 1941): water-like nu = 1e-6 m2/s at 1 W/kg gives
  // 10^-4.5 m = 31.62 um; tau = rho (eps nu)^(1/2) = 1000 x 1e-3 = 1 Pa. Round-off only.
  EXPECT_NEAR(physics::kolmogorov_length(1e-6, 1.0) / std::pow(10.0, -4.5), 1.0, 1e-12);
  EXPECT_NEAR(physics::kolmogorov_stress(1000.0, 1e-6, 1.0), 1.0, 1e-12);
  // Sixteen times the dissipation halves the length.
  EXPECT_NEAR(physics::kolmogorov_length(1e-6, 16.0) / physics::kolmogorov_length(1e-6, 1.0), 0.5, 1e-12);
}

TEST(Turbulence, MaxToMeanDissipationByType) {
  // Rushton 30-50 in its discharge (Zhou & Kresta 1996, from memory), narrow-blade hydrofoil
  // 10-15 (from memory); the radial disc turbine concentrates its power most.
  const double rushton = physics::dissipation_max_to_mean(ImpellerType::rushton);
  EXPECT_GE(rushton, 30.0);
  EXPECT_LE(rushton, 50.0);
  const double foil = physics::dissipation_max_to_mean(ImpellerType::hydrofoil_down);
  EXPECT_GE(foil, 10.0);
  EXPECT_LE(foil, 15.0);
  EXPECT_GT(rushton, physics::dissipation_max_to_mean(ImpellerType::pitched_blade_down));
  EXPECT_GT(physics::dissipation_max_to_mean(ImpellerType::pitched_blade_up), foil);
}

TEST(Compression, IsothermalFormula) {
  // P = p1 Q1 ln(p2/p1): 1 m3/s at 1 atm to 2 atm needs 101325 ln 2 = 70233.6 W [calc].
  EXPECT_NEAR(physics::isothermal_compression_power(101325.0, 1.0, 202650.0), 101325.0 * std::log(2.0), 1e-9);
  EXPECT_EQ(physics::isothermal_compression_power(101325.0, 1.0, 101325.0), 0.0);
}

TEST(Compression, AdiabaticAboveIsothermalAndEqualAtSmallRatios) {
  // Adiabatic 1 -> 2 atm, kappa 1.4: 101325 x 3.5 x (2^(2/7) - 1) = 77671 W [calc]; the
  // isothermal work is the least of any compression, and the two agree as p2/p1 -> 1.
  const double ad = physics::adiabatic_compression_power(101325.0, 1.0, 202650.0);
  EXPECT_NEAR(ad, 101325.0 * 3.5 * (std::pow(2.0, 2.0 / 7.0) - 1.0), 1e-6);
  EXPECT_GT(ad, physics::isothermal_compression_power(101325.0, 1.0, 202650.0));
  const double p2 = 101325.0 * 1.001;
  // The difference is second order in ln(p2/p1) = 1e-3: relative 2e-4 covers it.
  EXPECT_NEAR(physics::adiabatic_compression_power(101325.0, 1.0, p2) /
                  physics::isothermal_compression_power(101325.0, 1.0, p2),
              1.0, 2e-4);
}

}  // namespace
}  // namespace oxystrat
