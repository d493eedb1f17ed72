// Faces join neighbouring zones only, with their wetted areas; together they cover every
// internal surface of the liquid.
#include "mesh/zone_network.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <map>
#include <numbers>
#include <utility>
#include <vector>

#include "grids.hpp"
#include "tests/round_off.hpp"

namespace oxystrat::test {
namespace {

// Areas are closed-form products of grid coordinates: round-off only (kRoundOff; areas are O(1) m2).

class ZoneFaces : public testing::TestWithParam<BottomAndGrid> {
 protected:
  void SetUp() override {
    const auto& [bottom, grid] = GetParam();
    net_ = build_zone_geometry(two_impeller_case(bottom, grid.radial, grid.axial));
  }
  ZoneNetwork net_;
};

TEST_P(ZoneFaces, ConnectNeighboursOnly) {
  ASSERT_FALSE(net_.faces.empty());
  for (const auto& f : net_.faces) {
    ASSERT_GE(f.zone_a, 0);
    ASSERT_LT(f.zone_b, net_.size());
    if (f.orientation == FaceOrientation::radial) {
      EXPECT_EQ(net_.row[f.zone_a], net_.row[f.zone_b]);
      EXPECT_EQ(net_.column[f.zone_b], net_.column[f.zone_a] + 1);  // zone_a inside
    } else {
      EXPECT_EQ(net_.column[f.zone_a], net_.column[f.zone_b]);
      EXPECT_EQ(net_.row[f.zone_b], net_.row[f.zone_a] + 1);  // zone_a below
    }
  }
}

TEST_P(ZoneFaces, AreasAndSpacingsArePositive) {
  for (const auto& f : net_.faces) {
    EXPECT_GT(f.area, 0.0);
    EXPECT_GT(f.spacing, 0.0);
  }
}

TEST_P(ZoneFaces, AtMostOneFacePerPairOfZones) {
  std::map<std::pair<int, int>, int> seen;
  for (const auto& f : net_.faces) {
    const int count = ++seen[std::make_pair(f.zone_a, f.zone_b)];
    EXPECT_EQ(count, 1) << f.zone_a << "-" << f.zone_b;
  }
}

TEST_P(ZoneFaces, AxialFacesCoverEachWettedCrossSection) {
  // At an interior grid line z the liquid cross-section is a disc of radius wetted_radius(z);
  // the axial faces there must tile it exactly.
  for (int j = 1; j < net_.rows(); ++j) {
    const double z = net_.z_lines[j];
    double sum = 0.0;
    for (const auto& f : net_.faces) {
      if (f.orientation == FaceOrientation::axial && std::abs(f.za - z) <= kRoundOff) sum += f.area;
    }
    const double w = net_.shape.wetted_radius(z);
    EXPECT_NEAR(sum, std::numbers::pi * w * w, kRoundOff * std::numbers::pi) << "at z = " << z;
  }
  if (net_.rows() == 1) {  // a single row has no axial faces at all
    for (const auto& f : net_.faces) EXPECT_EQ(f.orientation, FaceOrientation::radial);
  }
}

TEST_P(ZoneFaces, RadialFacesCoverEachWettedCylinder) {
  // At an interior radius r the liquid occupies bottom_height(r) < z < H.
  for (int i = 1; i < net_.columns(); ++i) {
    const double r = net_.r_lines[i];
    double sum = 0.0;
    for (const auto& f : net_.faces) {
      if (f.orientation == FaceOrientation::radial && std::abs(f.ra - r) <= kRoundOff) sum += f.area;
    }
    const double exact = 2.0 * std::numbers::pi * r * (3.2 - net_.shape.bottom_height(r));
    EXPECT_NEAR(sum, exact, kRoundOff * exact) << "at r = " << r;
  }
  if (net_.columns() == 1) {  // a single column has no radial faces at all
    for (const auto& f : net_.faces) EXPECT_EQ(f.orientation, FaceOrientation::axial);
  }
}

INSTANTIATE_TEST_SUITE_P(MultiZoneGrids, ZoneFaces, all_bottoms_and_multi_zone_grids(), bottom_and_grid_name);

TEST(ZoneFacesUncut, HaveTheFullArea) {
  for (const auto bottom : kAllBottoms) {
    const auto net = build_zone_geometry(two_impeller_case(bottom, 12, 40));
    const auto uncut = [&](int k) { return net.shape.bottom_height(net.r1[k]) <= net.z0[k]; };
    int checked = 0;
    for (const auto& f : net.faces) {
      const int a = f.zone_a, b = f.zone_b;
      if (!uncut(a) || !uncut(b)) continue;
      ++checked;
      if (f.orientation == FaceOrientation::axial) {
        // A disc z = const between radii r0 and r1: pi (r1^2 - r0^2).
        const double exact = std::numbers::pi * (net.r1[a] * net.r1[a] - net.r0[a] * net.r0[a]);
        EXPECT_NEAR(f.area, exact, kRoundOff * exact);
      } else {
        // A cylinder r = r1 of the inner zone, over the cell height: 2 pi r1 (z1 - z0).
        const double exact = 2.0 * std::numbers::pi * net.r1[a] * (net.z1[a] - net.z0[a]);
        EXPECT_NEAR(f.area, exact, kRoundOff * exact);
      }
    }
    EXPECT_GT(checked, 100) << to_string(bottom);  // most of a 12 x 40 grid is above the head
  }
}

TEST(ZoneFacesEveryGrid, EachZoneHasAFace) {
  // Where the head just touches a cell's corner, the cell's volume and its faces' extents come
  // from different expressions and may round to opposite sides of zero (seen with fused
  // multiply-adds at 447 x 2237); such a cell must not become a zone without faces, which would
  // make every transport operator singular. Swept over many grids for both dished bottoms.
  for (const BottomShape bottom : {BottomShape::ellipsoidal, BottomShape::hemispherical}) {
    for (int radial = 2; radial <= 120; ++radial) {
      for (const int axial : {9, 50}) {
        const auto net = build_zone_geometry(two_impeller_case(bottom, radial, axial));
        std::vector<int> faces(net.size(), 0);
        for (const auto& f : net.faces) ++faces[f.zone_a], ++faces[f.zone_b];
        const auto lonely = std::find(faces.begin(), faces.end(), 0) - faces.begin();
        ASSERT_EQ(lonely, net.size()) << to_string(bottom) << " " << radial << " x " << axial;
      }
    }
  }
}

}  // namespace
}  // namespace oxystrat::test
