// The zones partition the liquid: their volumes add up to the analytic liquid volume.
#include "mesh/zone_network.hpp"

#include <gtest/gtest.h>

#include <numbers>

#include "grids.hpp"

namespace oxystrat::test {
namespace {

class ZoneVolumes : public testing::TestWithParam<BottomAndGrid> {};

TEST_P(ZoneVolumes, SumToTheAnalyticLiquidVolume) {
  const auto& [bottom, grid] = GetParam();
  const auto net = build_zone_geometry(two_impeller_case(bottom, grid.radial, grid.axial));
  const double exact = analytic_liquid_volume(bottom, 2.0, 3.2);
  // Cut cells subtract nearly equal moments of the head profile; up to a few thousand cells are
  // summed. Round-off stays below 1e-12, so 1e-9 relative (the requirement) has a wide margin.
  EXPECT_NEAR(net.total_volume(), exact, 1e-9 * exact);
}

TEST_P(ZoneVolumes, EveryZoneHasLiquidAndItsCellHoldsIt) {
  const auto& [bottom, grid] = GetParam();
  const auto net = build_zone_geometry(two_impeller_case(bottom, grid.radial, grid.axial));
  for (int k = 0; k < net.size(); ++k) {
    EXPECT_GT(net.volume[k], 0.0);
    const double cell = std::numbers::pi * (net.r1[k] * net.r1[k] - net.r0[k] * net.r0[k]) * (net.z1[k] - net.z0[k]);
    EXPECT_LE(net.volume[k], cell * (1.0 + 1e-12));  // never more than the bounding ring
    EXPECT_EQ(net.zone_at(net.column[k], net.row[k]), k);
  }
}

TEST_P(ZoneVolumes, DryCellsAreNoZones) {
  const auto& [bottom, grid] = GetParam();
  const auto net = build_zone_geometry(two_impeller_case(bottom, grid.radial, grid.axial));
  int wet = 0;
  for (int j = 0; j < net.rows(); ++j) {
    for (int i = 0; i < net.columns(); ++i) {
      const double v = net.shape.annulus_volume(net.r_lines[i], net.r_lines[i + 1], net.z_lines[j], net.z_lines[j + 1]);
      EXPECT_EQ(net.zone_at(i, j) >= 0, v > 0.0) << "cell " << i << "," << j;
      wet += v > 0.0 ? 1 : 0;
    }
  }
  EXPECT_EQ(net.size(), wet);
}

INSTANTIATE_TEST_SUITE_P(AllBottomsAndGrids, ZoneVolumes, all_bottoms_and_grids(), bottom_and_grid_name);

TEST(ZoneVolumes, OneByOneGridIsOneZone) {
  for (const auto bottom : kAllBottoms) {
    const auto net = build_zone_geometry(two_impeller_case(bottom, 1, 1));
    ASSERT_EQ(net.size(), 1);
    EXPECT_EQ(net.columns(), 1);
    EXPECT_EQ(net.rows(), 1);
    EXPECT_TRUE(net.faces.empty());
    const double exact = analytic_liquid_volume(bottom, 2.0, 3.2);
    EXPECT_NEAR(net.volume[0], exact, 1e-12 * exact);  // one closed-form cell: round-off
  }
}

}  // namespace
}  // namespace oxystrat::test
