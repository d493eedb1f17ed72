// Hydrostatic pressure at each zone centroid, ungassed: p = p_head + rho g (H - z_c).
#include "mesh/zone_network.hpp"

#include <gtest/gtest.h>

#include <cmath>

#include "grids.hpp"

namespace oxystrat::test {
namespace {

// Standard gravity, by definition (3rd CGPM, 1901; SI Brochure 9th ed.).
constexpr double kStandardGravity = 9.80665;  // [m/s2]

class Hydrostatics : public testing::TestWithParam<BottomAndGrid> {
 protected:
  void SetUp() override {
    const auto& [bottom, grid] = GetParam();
    case_ = two_impeller_case(bottom, grid.radial, grid.axial);
    net_ = build_zone_geometry(case_);
  }
  Case case_;
  ZoneNetwork net_;
};

TEST_P(Hydrostatics, PressureAtTheCentroid) {
  const double head = case_.vessel.head_pressure_pa;
  const double rho = case_.broth.density_kg_m3;
  for (int k = 0; k < net_.size(); ++k) {
    const double expected = head + rho * kStandardGravity * (3.2 - net_.z[k]);
    EXPECT_NEAR(net_.pressure[k], expected, 1e-12 * expected) << "zone " << k;  // same formula: round-off
    EXPECT_NEAR(net_.depth[k], 3.2 - net_.z[k], 1e-12) << "zone " << k;
  }
}

TEST_P(Hydrostatics, CentroidLiesInTheWettedCell) {
  for (int k = 0; k < net_.size(); ++k) {
    EXPECT_GE(net_.r[k], net_.r0[k]);
    EXPECT_LE(net_.r[k], net_.r1[k]);
    EXPECT_GE(net_.z[k], std::min(net_.z_floor_inner[k], net_.z_floor_outer[k]));
    EXPECT_LE(net_.z[k], net_.z1[k]);
  }
}

TEST_P(Hydrostatics, VolumeWeightedCentroidHeightIsTheLiquids) {
  // The first moment of the liquid about z = 0: cylinder part pi R^2 (H^2 - h^2)/2 plus the head,
  // whose centroid is at 5h/8 for any head of semi-axis h with an elliptical section (from
  // integrating z A(z) with A = pi R^2 (2hz - z^2)/h^2). Cut-cell centroids come from a
  // 256-interval midpoint rule (zone_network.cpp), good to about 1e-5 relative; uncut cells are
  // exact.
  const auto bottom = case_.vessel.bottom;
  const double r = 1.0, h = net_.shape.head_depth(), big_h = 3.2;
  const double pi = std::numbers::pi;
  const double head_moment = (2.0 / 3.0) * pi * r * r * h * (5.0 / 8.0) * h;
  const double exact = head_moment + pi * r * r * (big_h * big_h - h * h) / 2.0;
  double moment = 0.0;
  for (int k = 0; k < net_.size(); ++k) moment += net_.volume[k] * net_.z[k];
  const double tol = bottom == BottomShape::flat ? 1e-12 : 1e-5;
  EXPECT_NEAR(moment, exact, tol * exact);
}

INSTANTIATE_TEST_SUITE_P(AllBottomsAndGrids, Hydrostatics, all_bottoms_and_grids(), bottom_and_grid_name);

TEST(HydrostaticsFlat, MeanPressureIsAtHalfDepth) {
  // Pressure is linear in z, so its volume average in a flat-bottomed cylinder is the value at
  // H/2, for any grid (round-off only).
  const Case c = two_impeller_case(BottomShape::flat, 5, 9);
  const auto net = build_zone_geometry(c);
  double pv = 0.0;
  for (int k = 0; k < net.size(); ++k) pv += net.pressure[k] * net.volume[k];
  const double expected = c.vessel.head_pressure_pa + c.broth.density_kg_m3 * kStandardGravity * 1.6;
  EXPECT_NEAR(pv / net.total_volume(), expected, 1e-12 * expected);
}

TEST(HydrostaticsFlat, UncutCentroidsInClosedForm) {
  // Centroid of an annulus r0..r1: r = 2/3 (r1^3 - r0^3)/(r1^2 - r0^2) (common practice).
  const auto net = build_zone_geometry(two_impeller_case(BottomShape::flat, 5, 9));
  for (int k = 0; k < net.size(); ++k) {
    const double r0 = net.r0[k], r1 = net.r1[k];
    EXPECT_NEAR(net.r[k], 2.0 / 3.0 * (r1 * r1 * r1 - r0 * r0 * r0) / (r1 * r1 - r0 * r0), 1e-12);
    EXPECT_NEAR(net.z[k], 0.5 * (net.z0[k] + net.z1[k]), 1e-12);
  }
}

}  // namespace
}  // namespace oxystrat::test
