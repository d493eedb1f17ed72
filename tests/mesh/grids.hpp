// The grids every zone-network property is checked on: the one-zone limit, single rows and
// columns, and ordinary grids, each with every bottom shape.
#pragma once

#include <gtest/gtest.h>

#include <string>
#include <tuple>

#include "mesh_cases.hpp"

namespace oxystrat::test {

struct GridSize {
  int radial;
  int axial;
};

inline const GridSize kGrids[] = {{1, 1}, {1, 7}, {7, 1}, {2, 2}, {5, 9}, {12, 40}, {3, 100}, {40, 12}};

//! Grids with more than one zone, so with faces.
inline const GridSize kMultiZoneGrids[] = {{1, 7}, {7, 1}, {2, 2}, {5, 9}, {12, 40}, {3, 100}, {40, 12}};

//! Grids with more than one cell in both directions, where alignment is applied.
inline const GridSize kResolvedGrids[] = {{2, 2}, {5, 9}, {12, 40}, {3, 100}, {40, 12}};

using BottomAndGrid = std::tuple<BottomShape, GridSize>;

inline std::string bottom_and_grid_name(const testing::TestParamInfo<BottomAndGrid>& info) {
  const auto& [bottom, grid] = info.param;
  return to_string(bottom) + "_" + std::to_string(grid.radial) + "x" + std::to_string(grid.axial);
}

inline auto all_bottoms_and_grids() {
  return testing::Combine(testing::ValuesIn(kAllBottoms), testing::ValuesIn(kGrids));
}

inline auto all_bottoms_and_multi_zone_grids() {
  return testing::Combine(testing::ValuesIn(kAllBottoms), testing::ValuesIn(kMultiZoneGrids));
}

inline auto all_bottoms_and_resolved_grids() {
  return testing::Combine(testing::ValuesIn(kAllBottoms), testing::ValuesIn(kResolvedGrids));
}

}  // namespace oxystrat::test
