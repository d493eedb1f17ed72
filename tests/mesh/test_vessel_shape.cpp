// Exact vessel geometry against analytic head formulas, and partitions of the liquid into cells.
#include "physics/vessel_shape.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <numbers>
#include <random>
#include <vector>

#include "mesh_cases.hpp"
#include "tests/round_off.hpp"

namespace oxystrat::test {
namespace {

// Closed-form expressions evaluated in double precision: round-off only (kRoundOff). Sums over
// partitions add a few hundred such terms, still far inside it.

TEST(VesselShape, HeadDepths) {
  EXPECT_EQ(VesselShape(2.0, BottomShape::flat).head_depth(), 0.0);
  EXPECT_DOUBLE_EQ(VesselShape(2.0, BottomShape::ellipsoidal).head_depth(), 0.5);    // T/4 for 2:1
  EXPECT_DOUBLE_EQ(VesselShape(2.0, BottomShape::hemispherical).head_depth(), 1.0);  // T/2
}

TEST(VesselShape, HeadVolumes) {
  // 2:1 ellipsoidal head pi T^3/24, hemispherical pi T^3/12 (standard vessel-head formulas,
  // Perry's Chemical Engineers' Handbook, 8th ed., section 10).
  for (const double t : {0.3, 1.0, 3.2}) {
    const VesselShape ell(t, BottomShape::ellipsoidal);
    const VesselShape hemi(t, BottomShape::hemispherical);
    EXPECT_NEAR(ell.volume_below(ell.head_depth()), std::numbers::pi * t * t * t / 24.0, kRoundOff * t * t * t);
    EXPECT_NEAR(hemi.volume_below(hemi.head_depth()), std::numbers::pi * t * t * t / 12.0, kRoundOff * t * t * t);
  }
}

TEST(VesselShape, VolumeInsideTheHeadIsACap) {
  // A hemispherical head filled to z is a spherical cap, pi z^2 (3R - z) / 3 (common practice).
  // The 2:1 head is that sphere (radius h = T/4) stretched radially by R/h, which multiplies
  // volumes by (R/h)^2.
  const double t = 2.0, r = 1.0;
  const VesselShape hemi(t, BottomShape::hemispherical);
  const VesselShape ell(t, BottomShape::ellipsoidal);
  const double h = ell.head_depth();
  for (const double f : {0.05, 0.3, 0.5, 0.77, 0.99}) {
    const double zh = f * r;
    EXPECT_NEAR(hemi.volume_below(zh), std::numbers::pi * zh * zh * (3.0 * r - zh) / 3.0, kRoundOff * r * r * r);
    const double ze = f * h;
    EXPECT_NEAR(ell.volume_below(ze), (r / h) * (r / h) * std::numbers::pi * ze * ze * (3.0 * h - ze) / 3.0, kRoundOff * r * r * r);
  }
}

TEST(VesselShape, VolumeAboveTheHeadAddsCylinder) {
  for (const auto bottom : kAllBottoms) {
    const VesselShape s(2.0, bottom);
    EXPECT_NEAR(s.volume_below(3.2), analytic_liquid_volume(bottom, 2.0, 3.2), kRoundOff * 10.0);
    EXPECT_EQ(s.volume_below(0.0), 0.0);
    EXPECT_EQ(s.volume_below(-1.0), 0.0);
  }
}

TEST(VesselShape, BottomHeightAndWettedRadiusAreInverse) {
  for (const auto bottom : {BottomShape::ellipsoidal, BottomShape::hemispherical}) {
    const VesselShape s(2.0, bottom);
    EXPECT_EQ(s.bottom_height(0.0), 0.0);
    EXPECT_NEAR(s.bottom_height(1.0), s.head_depth(), kRoundOff);
    EXPECT_NEAR(s.wetted_radius(s.head_depth()), 1.0, kRoundOff);
    for (const double r : {0.1, 0.4, 0.8, 0.95}) {
      // Near the wall the bottom is steep (dr/dz large), so compare heights, not radii.
      const double z = s.bottom_height(r);
      EXPECT_NEAR(s.bottom_height(s.wetted_radius(z)), z, kRoundOff);
    }
  }
}

TEST(VesselShape, HeightForVolumeRoundTrip) {
  for (const auto bottom : kAllBottoms) {
    const VesselShape s(2.0, bottom);
    for (const double z : {0.01, 0.2, 0.5, 0.999, 1.0, 1.7, 6.0}) {
      // Bisection inside the head stops at 1e-15 of the head depth; above it the inverse is linear.
      EXPECT_NEAR(s.height_for_volume(s.volume_below(z)), z, kRoundOff * 6.0) << "z = " << z;
    }
  }
}

TEST(VesselShape, AnnulusOfAnUncutCellIsAnExactRing) {
  const VesselShape s(2.0, BottomShape::ellipsoidal);
  const double v = s.annulus_volume(0.3, 0.6, 1.0, 1.4);
  EXPECT_NEAR(v, std::numbers::pi * (0.36 - 0.09) * 0.4, kRoundOff);
}

TEST(VesselShape, AnnulusBelowTheBottomIsDry) {
  const VesselShape s(2.0, BottomShape::hemispherical);
  // At r >= 0.9 the bottom is above 1 - sqrt(0.19) = 0.564 m.
  EXPECT_EQ(s.annulus_volume(0.9, 1.0, 0.0, 0.5), 0.0);
  EXPECT_EQ(s.annulus_volume(0.5, 0.5, 0.0, 1.0), 0.0);  // empty cell
}

TEST(VesselShape, AnnulusUnderTheBottomSurfaceIsTheCap) {
  // The liquid with r < r* and z < bottom_height(r*) is the whole cap of that height.
  for (const auto bottom : {BottomShape::ellipsoidal, BottomShape::hemispherical}) {
    const VesselShape s(2.0, bottom);
    for (const double r : {0.2, 0.6, 0.9}) {
      const double z = s.bottom_height(r);
      EXPECT_NEAR(s.annulus_volume(0.0, r, 0.0, z), s.volume_below(z), kRoundOff);
    }
  }
}

// Random grid lines over [lo, hi]: `n` interior points, sorted, plus the ends.
std::vector<double> random_lines(std::mt19937& rng, double lo, double hi, int n) {
  std::uniform_real_distribution<double> u(lo, hi);
  std::vector<double> x{lo, hi};
  for (int i = 0; i < n; ++i) x.push_back(u(rng));
  std::sort(x.begin(), x.end());
  return x;
}

double partition_sum(const VesselShape& s, const std::vector<double>& rs, const std::vector<double>& zs) {
  double sum = 0.0;
  for (size_t i = 0; i + 1 < rs.size(); ++i) {
    for (size_t j = 0; j + 1 < zs.size(); ++j) sum += s.annulus_volume(rs[i], rs[i + 1], zs[j], zs[j + 1]);
  }
  return sum;
}

TEST(VesselShape, RandomPartitionOfTheLiquidSumsToItsVolume) {
  std::mt19937 rng(20240601);  // fixed seed: the same cells every run
  for (const auto bottom : kAllBottoms) {
    const VesselShape s(2.0, bottom);
    for (int trial = 0; trial < 20; ++trial) {
      const auto rs = random_lines(rng, 0.0, 1.0, 1 + trial % 9);
      const auto zs = random_lines(rng, 0.0, 3.2, 1 + (3 * trial) % 17);
      const double total = s.volume_below(3.2);
      EXPECT_NEAR(partition_sum(s, rs, zs), total, kRoundOff * total);
    }
  }
}

TEST(VesselShape, RandomPartitionOfACellSumsToTheCell) {
  std::mt19937 rng(7);
  for (const auto bottom : {BottomShape::ellipsoidal, BottomShape::hemispherical}) {
    const VesselShape s(2.0, bottom);
    for (int trial = 0; trial < 20; ++trial) {
      const auto outer_r = random_lines(rng, 0.0, 1.0, 2);
      const auto outer_z = random_lines(rng, 0.0, 1.2, 2);  // inside or across the head
      const double r0 = outer_r[1], r1 = outer_r[2], z0 = outer_z[1], z1 = outer_z[2];
      const double whole = s.annulus_volume(r0, r1, z0, z1);
      const auto rs = random_lines(rng, r0, r1, 5);
      const auto zs = random_lines(rng, z0, z1, 5);
      EXPECT_NEAR(partition_sum(s, rs, zs), whole, kRoundOff * s.volume_below(1.2));
    }
  }
}

}  // namespace
}  // namespace oxystrat::test
