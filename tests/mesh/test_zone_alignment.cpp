// Grid alignment: impeller bands, tip radii, the sparger and the head seam are grid lines, so
// each impeller's swept volume is a set of whole zones and sparged gas enters known zones.
#include "mesh/zone_network.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <numbers>
#include <numeric>
#include <vector>

#include "grids.hpp"

namespace oxystrat::test {
namespace {

// Positions are copied into the line lists (grid_lines.cpp), so they match to round-off.
constexpr double kLineTol = 1e-12;  // [m]

bool has_line(const std::vector<double>& lines, double x) {
  return std::any_of(lines.begin(), lines.end(), [&](double l) { return std::abs(l - x) <= kLineTol; });
}

class ZoneAlignment : public testing::TestWithParam<BottomAndGrid> {
 protected:
  void SetUp() override {
    const auto& [bottom, grid] = GetParam();
    grid_ = grid;
    case_ = two_impeller_case(bottom, grid.radial, grid.axial);
    net_ = build_zone_geometry(case_);
  }
  GridSize grid_{};
  Case case_;
  ZoneNetwork net_;
};

//! Only grids with more than one cell both ways: there the swept volumes are resolved.
class ZoneAlignmentResolved : public ZoneAlignment {};

TEST_P(ZoneAlignment, RequestedCountsAreMetOrExceeded) {
  EXPECT_GE(net_.columns(), grid_.radial);
  EXPECT_GE(net_.rows(), grid_.axial);
  EXPECT_EQ(net_.r_lines.front(), 0.0);
  EXPECT_DOUBLE_EQ(net_.r_lines.back(), 1.0);
  EXPECT_EQ(net_.z_lines.front(), 0.0);
  EXPECT_DOUBLE_EQ(net_.z_lines.back(), 3.2);
  EXPECT_TRUE(std::is_sorted(net_.r_lines.begin(), net_.r_lines.end()));
  EXPECT_TRUE(std::is_sorted(net_.z_lines.begin(), net_.z_lines.end()));
}

TEST_P(ZoneAlignmentResolved, ImpellerBandsAndTipsAreGridLines) {
  for (const auto& imp : case_.impellers) {
    EXPECT_TRUE(has_line(net_.r_lines, 0.5 * imp.diameter_m)) << "tip radius";
    EXPECT_TRUE(has_line(net_.z_lines, imp.elevation_m - 0.5 * imp.blade_height_m)) << "band bottom";
    EXPECT_TRUE(has_line(net_.z_lines, imp.elevation_m + 0.5 * imp.blade_height_m)) << "band top";
  }
}

TEST_P(ZoneAlignmentResolved, SpargerAndHeadSeamAreGridLines) {
  EXPECT_TRUE(has_line(net_.r_lines, 0.5 * case_.sparger.diameter_m));
  EXPECT_TRUE(has_line(net_.z_lines, case_.sparger.elevation_m));
  EXPECT_TRUE(has_line(net_.z_lines, net_.shape.head_depth()));  // 0 (flat) is the first line anyway
}

TEST_P(ZoneAlignmentResolved, DischargeZonesLieInsideTheSweptVolume) {
  for (size_t m = 0; m < case_.impellers.size(); ++m) {
    const auto& imp = case_.impellers[m];
    const double tip = 0.5 * imp.diameter_m;
    const double lo = imp.elevation_m - 0.5 * imp.blade_height_m;
    const double hi = imp.elevation_m + 0.5 * imp.blade_height_m;
    double swept = 0.0;
    for (int k = 0; k < net_.size(); ++k) {
      if (net_.region[k].discharge != static_cast<int>(m)) continue;
      EXPECT_LE(net_.r1[k], tip + kLineTol);
      EXPECT_GE(net_.z0[k], lo - kLineTol);
      EXPECT_LE(net_.z1[k], hi + kLineTol);
      swept += net_.volume[k];
    }
    // The band lies above the head at r <= D/2 (the reader checks it), so its cells are whole
    // rings: pi (D/2)^2 x band height, to round-off over a few dozen cells.
    const double exact = std::numbers::pi * tip * tip * imp.blade_height_m;
    EXPECT_NEAR(swept, exact, 1e-12 * exact) << "impeller " << m;
  }
}

TEST_P(ZoneAlignmentResolved, EveryImpellerHasADischargeZone) {
  for (size_t m = 0; m < case_.impellers.size(); ++m) {
    const auto n = std::count_if(net_.region.begin(), net_.region.end(),
                                 [&](const ZoneRegion& r) { return r.discharge == static_cast<int>(m); });
    EXPECT_GE(n, 1) << "impeller " << m;
  }
}

TEST_P(ZoneAlignment, DomainsSplitHalfwayBetweenImpellers) {
  const double split = 0.5 * (0.8 + 2.2);
  for (int k = 0; k < net_.size(); ++k) EXPECT_EQ(net_.region[k].domain, net_.z[k] > split ? 1 : 0) << "zone " << k;
}

TEST_P(ZoneAlignment, SpargerSharesSumToOne) {
  const double sum = std::accumulate(net_.sparger_share.begin(), net_.sparger_share.end(), 0.0);
  EXPECT_NEAR(sum, 1.0, 1e-12);  // shares are normalised by their sum: round-off
  for (int k = 0; k < net_.size(); ++k) {
    EXPECT_GE(net_.sparger_share[k], 0.0);
    EXPECT_EQ(net_.region[k].sparger, net_.sparger_share[k] > 0.0);
  }
}

TEST_P(ZoneAlignmentResolved, SpargedZonesAreJustAboveTheSpargerWithinItsFootprint) {
  const double rs = 0.5 * case_.sparger.diameter_m;
  const double zs = case_.sparger.elevation_m;
  double footprint = 0.0;
  for (int k = 0; k < net_.size(); ++k) {
    if (net_.sparger_share[k] == 0.0) continue;
    EXPECT_NEAR(net_.z0[k], zs, kLineTol) << "zone " << k;
    EXPECT_LE(net_.r1[k], rs + kLineTol) << "zone " << k;
    // Each share is the zone's part of the footprint area pi rs^2.
    const double area = std::numbers::pi * (net_.r1[k] * net_.r1[k] - net_.r0[k] * net_.r0[k]);
    EXPECT_NEAR(net_.sparger_share[k], area / (std::numbers::pi * rs * rs), 1e-12);
    footprint += area;
  }
  EXPECT_NEAR(footprint, std::numbers::pi * rs * rs, 1e-12);
}

INSTANTIATE_TEST_SUITE_P(AllBottomsAndGrids, ZoneAlignment, all_bottoms_and_grids(), bottom_and_grid_name);
INSTANTIATE_TEST_SUITE_P(AllBottomsAndGrids, ZoneAlignmentResolved, all_bottoms_and_resolved_grids(),
                         bottom_and_grid_name);

TEST(ZoneAlignmentCoarse, OneCellDirectionIsNotAligned) {
  // The lumped limit in one direction: a single cell spans the vessel, whatever is inside.
  const auto column = build_zone_geometry(two_impeller_case(BottomShape::ellipsoidal, 1, 7));
  EXPECT_EQ(column.r_lines, (std::vector<double>{0.0, 1.0}));
  EXPECT_GE(column.rows(), 7);
  const auto row = build_zone_geometry(two_impeller_case(BottomShape::ellipsoidal, 7, 1));
  EXPECT_EQ(row.z_lines, (std::vector<double>{0.0, 3.2}));
  EXPECT_GE(row.columns(), 7);
}

TEST(ZoneAlignmentCoarse, OneZoneHoldsTheLowerImpellerAndAllTheGas) {
  const auto net = build_zone_geometry(two_impeller_case(BottomShape::ellipsoidal, 1, 1));
  EXPECT_EQ(net.region[0].discharge, 0);
  EXPECT_EQ(net.sparger_share[0], 1.0);
  EXPECT_TRUE(net.region[0].sparger);
}

TEST(ZoneAlignmentCoarse, NoSpargerNoShares) {
  Case c = two_impeller_case(BottomShape::flat, 5, 9);
  c.has_sparger = false;
  const auto net = build_zone_geometry(c);
  for (int k = 0; k < net.size(); ++k) {
    EXPECT_EQ(net.sparger_share[k], 0.0);
    EXPECT_FALSE(net.region[k].sparger);
  }
}

}  // namespace
}  // namespace oxystrat::test
